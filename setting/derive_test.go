package setting

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"reflect"
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

// withoutKeys returns spec's engine file as JSON with a design of the
// given lead and the keys at the given paths taken out.
func withoutKeys(t *testing.T, spec EngineSpec, lead float64, keys []string) []byte {
	t.Helper()
	spec.Design = nil
	raw, err := spec.AppendJSON(nil)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(raw, &m); err != nil {
		t.Fatal(err)
	}
	m["design"] = map[string]any{"lead": lead}
	for _, key := range keys {
		parts := strings.Split(key, ".")
		at := m
		for _, p := range parts[:len(parts)-1] {
			at = at[p].(map[string]any)
		}
		delete(at, parts[len(parts)-1])
	}
	out, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// usualKeys returns the keys of DefaultKeys whose value in spec is the
// usual one, so that leaving them out changes nothing.
func usualKeys(spec EngineSpec) []string {
	var keys []string
	for _, key := range DefaultKeys(spec.Gear.Kind) {
		usual := true
		switch key {
		case "invented":
			usual = !spec.Invented
		case "gear.single_eccentric.slip":
			usual = !spec.Gear.SingleEccentric.Slip
		case "gear.stephenson.crossed":
			usual = !spec.Gear.Stephenson.Crossed
		case "gear.single_eccentric.admission", "gear.stephenson.admission":
		case "gear.stephenson.link.suspension":
			usual = spec.Gear.Stephenson.Link.Suspension == Point{}
		default:
			usual = *spec.Number(key) == 0
		}
		if usual {
			keys = append(keys, key)
		}
	}
	return keys
}

// An engine file with a design may leave out every part its gear derives
// and the keys with a usual value: what is left out is derived (and
// listed as derived) so that the gear as designed gives the design's lead
// and works (both ports open in full gear, cut-off in the band), the same
// as the reference decoder reads it. Each demo gear, with everything left
// out and with each part left out alone (the rest kept as given).
func TestEngineFileLeavesOutWhatIsDerived(t *testing.T) {
	for _, demo := range DemoEngines() {
		demo.Invented = false
		kind := demo.Gear.Kind
		const lead = 0.25
		all := append(DerivableKeys(kind), usualKeys(demo)...)
		data := withoutKeys(t, demo, lead, all)
		compareWithReference(t, data)
		spec, err := DecodeEngineSpec(bytes.NewReader(data))
		if err != nil {
			t.Fatalf("%s with every derivable part left out: %v\n%s", kind, err, data)
		}
		if !reflect.DeepEqual(spec.Design.Derived, DerivableKeys(kind)) {
			t.Errorf("%s: derived %v, want %v", kind, spec.Design.Derived, DerivableKeys(kind))
		}
		f, b := leadsIn(t, spec, Forward)
		near(t, kind+" mean lead in full forward", (f+b)/2, lead, 0.03)
		if errs := spec.Works(); len(errs) > 0 {
			t.Errorf("%s derived from what a setter knows does not work: %v", kind, errs)
		}
		if kind == KindStephenson && spec.Gear.Stephenson.Admission != spec.Valve.Admission {
			t.Errorf("the gear's admission left out is %v, the valve's %v", spec.Gear.Stephenson.Admission, spec.Valve.Admission)
		}
		for _, key := range DerivableKeys(kind) {
			data := withoutKeys(t, demo, lead, []string{key})
			compareWithReference(t, data)
			one, err := DecodeEngineSpec(bytes.NewReader(data))
			if err != nil {
				t.Errorf("%s without %s: %v", kind, key, err)
				continue
			}
			if !reflect.DeepEqual(one.Design.Derived, []string{key}) {
				t.Errorf("%s without %s: derived %v", kind, key, one.Design.Derived)
			}
			for _, other := range DerivableKeys(kind) {
				if other != key && *one.Number(other) != *demo.Number(other) {
					t.Errorf("%s without %s: %s given as %v became %v", kind, key, other, *demo.Number(other), *one.Number(other))
				}
			}
		}
	}
}

// Parts given are kept as written, even when the design lists them as
// derived (a file the app wrote); without a design every key is asked
// for, the refusal saying that a design would derive it.
func TestEngineFileKeepsWhatIsGiven(t *testing.T) {
	spec := DemoStephenson()
	spec.Design = &Design{Lead: 0.25, Derived: DerivableKeys(KindStephenson)}
	var buf bytes.Buffer
	if err := spec.Encode(&buf); err != nil {
		t.Fatal(err)
	}
	got, err := DecodeEngineSpec(&buf)
	if err != nil || !reflect.DeepEqual(got, spec) {
		t.Fatalf("a designed engine with every part given read back as %+v, %v", got.Gear.Stephenson, err)
	}
	var m map[string]any
	if err := json.Unmarshal(withoutKeys(t, DemoStephenson(), 0.25, []string{"gear.stephenson.arm_swing"}), &m); err != nil {
		t.Fatal(err)
	}
	delete(m, "design")
	data, _ := json.Marshal(m)
	compareWithReference(t, data)
	_, err = DecodeEngineSpec(bytes.NewReader(data))
	var e *Error
	if !errors.As(err, &e) || e.Field != "gear.stephenson.arm_swing" || !strings.Contains(e.Message, `give the engine's "design"`) {
		t.Errorf("the arm swing missing without a design: got %v", err)
	}
}

// What cannot be derived is refused naming the dimension to check: a lap
// and lead beyond the eccentric's throw; a crank that is no crank is
// named as such before anything is derived.
func TestEngineFileDerivationRefused(t *testing.T) {
	demo := DemoSlipEccentric()
	demo.Valve.Front.SteamLap, demo.Valve.Back.SteamLap = 6, 6
	data := withoutKeys(t, demo, 0.25, DerivableKeys(KindSingleEccentric))
	compareWithReference(t, data)
	_, err := DecodeEngineSpec(bytes.NewReader(data))
	var e *Error
	if !errors.As(err, &e) || !strings.HasPrefix(e.Field, "gear.single_eccentric.eccentric") || !strings.Contains(e.Message, "throw") {
		t.Errorf("laps beyond the throw: got %v", err)
	}
	demo = DemoSlipEccentric()
	demo.Engine.RodLength = 10
	data = withoutKeys(t, demo, 0.25, DerivableKeys(KindSingleEccentric))
	compareWithReference(t, data)
	if _, err := DecodeEngineSpec(bytes.NewReader(data)); !errors.As(err, &e) || e.Field != "engine.rod_length" {
		t.Errorf("a rod shorter than the crank: got %v", err)
	}
}

// WorkChecks tells a port that never opens (the engine could not run: a
// refusal) from a cut-off outside the usual band (a warning), each on the
// steam lap of its end, and Warnings says both, leaving out its own
// easy-starting check then (common practice, no source: 65-85 % full-gear
// cut-off, the primer's section 9).
func TestWorkChecksWeighs(t *testing.T) {
	s := DemoSlipEccentric()
	if r, w := s.WorkChecks(); len(r)+len(w) > 0 {
		t.Fatalf("the demo engine: refusals %v, warnings %v", r, w)
	}
	s.Valve.Front.SteamLap = s.Gear.SingleEccentric.Eccentric.Throw + 1
	r, w := s.WorkChecks()
	var fe *Error
	if len(r) == 0 || !errors.As(r[0], &fe) || fe.Field != "valve.front.steam_lap" || !strings.Contains(fe.Message, "never opens") {
		t.Errorf("a front lap beyond the throw: refusals %v, warnings %v", r, w)
	}
	if got := strings.Join(s.Warnings(), "\n"); !strings.Contains(got, "front port never opens") {
		t.Errorf("the engine's warnings do not say the front port never opens:\n%s", got)
	}
	s = DemoSlipEccentric()
	s.Gear.SingleEccentric.Eccentric.Throw = 3.2 // travel short for 2.4 mm laps
	if _, err := CentreValve(&s); err != nil {
		t.Fatal(err)
	}
	r, w = s.WorkChecks()
	if len(r) != 0 || len(w) == 0 || !errors.As(w[0], &fe) || !strings.Contains(fe.Message, "65 to 85 %") {
		t.Fatalf("a short travel: refusals %v, warnings %v", r, w)
	}
	got := strings.Join(s.Warnings(), "\n")
	if !strings.Contains(got, "65 to 85 %") || strings.Contains(got, "starts easily") {
		t.Errorf("the engine's warnings for a short travel:\n%s", got)
	}
	if n := len(s.Works()); n != len(r)+len(w) {
		t.Errorf("Works gives %d failures, WorkChecks %d", n, len(r)+len(w))
	}
}
