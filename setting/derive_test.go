package setting

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// leadsIn returns the front and back leads in full gear running dir.
func leadsIn(t *testing.T, s EngineSpec, dir Direction) (front, back float64) {
	t.Helper()
	g, err := s.Gear.Gear()
	if err != nil {
		t.Fatal(err)
	}
	r := Reverser(1)
	if dir == Backward {
		r = -1
	}
	set, err := Events(s.Engine, s.Valve, func(th float64) (float64, error) { return g.Valve(s.Engine, th, r) }, dir)
	if err != nil {
		t.Fatal(err)
	}
	return set.Front.Lead, set.Back.Lead
}

// C3 with the product's own derivation: C. A. Purinton, "Lap and Lead in
// Slide Valves", The Live Steamer, Mar-Apr 1950: lap 1/8 in, travel 1/2 in:
// advance 30.00 deg with lead 0, 32.68 deg with lead 0.010 in.
func TestAdvanceForPurinton(t *testing.T) {
	for _, c := range []struct{ lead, want float64 }{{0, 30.00}, {0.010 * inch, 32.68}} {
		got, err := AdvanceFor(inch/8+c.lead, inch/4)
		if err != nil {
			t.Fatal(err)
		}
		near(t, "advance", got, c.want, 0.005)
	}
	var fe *Error
	if _, err := AdvanceFor(inch/4, inch/4); !errors.As(err, &fe) || fe.Field != "throw" {
		t.Errorf("lap + lead equal to the throw: got %v, want an error naming the throw", err)
	}
}

// A Stephenson engine whose setter knows only throws, laps and the lead
// the drawing asks for: the derivation gives that lead at both ends in full
// forward and in full back on the finite linkage, and full gear puts the
// die where asked (common practice, no source: the valve centred at the
// mean of its dead-centre places, the advance from lap + lead).
func TestDeriveStephenson(t *testing.T) {
	s := DemoStephenson()
	g := s.Gear.Stephenson
	g.Forward.Advance, g.Backward.Advance = 10, 40 // nothing like right
	g.ValveCentreU += 6
	g.Backward.Rod = g.Forward.Rod
	const lead = 0.3
	if err := Derive(&s, Aims{Lead: lead}); err != nil {
		t.Fatal(err)
	}
	for _, dir := range []Direction{Forward, Backward} {
		f, b := leadsIn(t, s, dir)
		near(t, dir.String()+" mean lead", (f+b)/2, lead, 1e-5)
		// Equal laps, the valve centred on full forward and the backward
		// rod set for equal leads in full back (C5, E. L. Ahrons, "Steam
		// Locomotive Construction and Maintenance", p. 104: the rod's
		// length shares the lead between the ends).
		tol := 1e-5
		near(t, dir.String()+" lead difference", f-b, 0, tol)
	}
	for _, c := range []struct {
		r    Reverser
		want float64
	}{{0, 0}, {1, 1}} {
		got, err := g.meanShare(s.Engine, c.r)
		if err != nil {
			t.Fatal(err)
		}
		near(t, "die share over a turn", got, c.want, 1e-5)
	}
	if errs := s.Works(); len(errs) > 0 {
		t.Errorf("the derived engine does not work: %v", errs)
	}
}

// C4. L. V. Ludy, "Locomotive Boilers and Engines", 1920, p. 88 and C. H.
// Peabody, "Valve-Gears for Steam-Engines", ch. IV: in Walschaerts gear the
// lead comes from the combination lever and is the same in every reverser
// position; mid-gear travel is 2 x (lap + lead). A Walschaerts engine
// designed from lap and lead alone shows both.
func TestDeriveWalschaerts(t *testing.T) {
	s := DemoWalschaerts()
	w := s.Gear.Walschaerts
	w.ReturnAngle += 8
	w.EccentricRod += 5
	w.ValveCentreU -= 4
	const lead = 0.25
	if err := Derive(&s, Aims{Lead: lead}); err != nil {
		t.Fatal(err)
	}
	lap := (s.Valve.Front.SteamLap + s.Valve.Back.SteamLap) / 2
	for _, dir := range []Direction{Forward, Backward} {
		f, b := leadsIn(t, s, dir)
		near(t, dir.String()+" mean lead", (f+b)/2, lead, 0.03)
	}
	g, _ := s.Gear.Gear()
	lo, hi := math.Inf(1), math.Inf(-1)
	for th := 0.0; th < 360; th += 1 {
		x, err := g.Valve(s.Engine, th, 0)
		if err != nil {
			t.Fatal(err)
		}
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	near(t, "mid-gear travel", hi-lo, 2*(lap+lead), 0.03*(lap+lead))
	if errs := s.Works(); len(errs) > 0 {
		t.Errorf("the derived engine does not work: %v", errs)
	}
}

// The derived valve centre of a single eccentric gives equal leads; a lap
// too big for the throw is named as the dimension to check.
func TestWorksNamesTheDimension(t *testing.T) {
	s := DemoSlipEccentric()
	s.Gear.SingleEccentric.ValveCentreU += 3
	if _, err := CentreValve(&s); err != nil {
		t.Fatal(err)
	}
	f, b := leadsIn(t, s, Forward)
	near(t, "lead difference with the valve centred", f-b, 0, 1e-6)
	if errs := s.Works(); len(errs) > 0 {
		t.Fatalf("the demo engine centred does not work: %v", errs)
	}
	s.Valve.Front.SteamLap = s.Gear.SingleEccentric.Eccentric.Throw + 1
	errs := s.Works()
	if len(errs) == 0 {
		t.Fatal("a front lap longer than the throw passed")
	}
	var fe *Error
	if !errors.As(errs[0], &fe) || !strings.Contains(fe.Message, "front steam lap") {
		t.Errorf("got %v, want the front steam lap named", errs)
	}
}

// A part the setter gave (not listed as derived) is kept; the derived
// parts are set around it: here a single eccentric's advance as measured,
// with the valve still centred on it.
func TestDeriveKeepsWhatWasGiven(t *testing.T) {
	s := DemoSlipEccentric()
	s.Gear.SingleEccentric.Eccentric.Advance = 27
	s.Gear.SingleEccentric.ValveCentreU += 2
	d := Design{Lead: 0.3, Derived: []string{"gear.single_eccentric.valve_centre_u"}}
	if err := Derive(&s, d.Aims()); err != nil {
		t.Fatal(err)
	}
	if a := s.Gear.SingleEccentric.Eccentric.Advance; a != 27 {
		t.Errorf("the advance given was changed to %g", a)
	}
	f, b := leadsIn(t, s, Forward)
	near(t, "lead difference", f-b, 0, 1e-6)
	d.Derived = DerivableKeys(KindSingleEccentric)
	if err := Derive(&s, d.Aims()); err != nil {
		t.Fatal(err)
	}
	f, b = leadsIn(t, s, Forward)
	near(t, "mean lead with the advance derived", (f+b)/2, 0.3, 1e-6)
	var fe *Error
	s.Gear.SingleEccentric = nil
	if err := Derive(&s, d.Aims()); !errors.As(err, &fe) || fe.Field != "gear" {
		t.Errorf("no gear dimensions: got %v, want an error naming the gear", err)
	}
}
