package setting

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// Published checks for the core (see the team's published-checks list).
// Each check names its source beside it. Inches are the sources' unit; the
// tests convert to mm.

const inch = 25.4

// longRod is the rod-to-crank ratio standing in for the textbooks' infinite
// connecting rod. The piston fraction then differs from (1 - cos t)/2 by
// less than R/(4L) = 2.5e-7 of the stroke, far inside every tolerance below.
const longRod = 1e6

// textbookMotion returns the textbooks' valve motion r sin(theta + delta)
// ("displacement toward opening the end whose piston is at dead centre") in
// this package's convention (positive forward) for the given admission:
// internal admission opens the front port to steam moving forward, external
// moving back, so the external curve is the mirror image.
func textbookMotion(r, deltaDeg float64, adm Admission) Motion {
	s := adm.sense()
	return func(t float64) (float64, error) {
		return s * r * math.Sin((t+deltaDeg)*math.Pi/180), nil
	}
}

// slideValve returns an equal-ended valve with the given laps and port width.
func slideValve(adm Admission, lap, exLap, port float64) Valve {
	e := End{SteamLap: lap, ExhaustLap: exLap, PortWidth: port}
	return Valve{Admission: adm, Front: e, Back: e}
}

func near(t *testing.T, name string, got, want, tol float64) {
	t.Helper()
	if !(math.Abs(got-want) <= tol) {
		t.Errorf("%s = %.6g, want %.6g +/- %g", name, got, want, tol)
	}
}

// C1. Angus Sinclair, "Locomotive Engine Running and Management", 10th ed.,
// 1888, p. 78 ("Valve-motion of a fast passenger locomotive"): travel 5 in,
// lap 1 in, exhaust lap 0, lead 1/16 in, stroke 24 in. Expected values
// computed with the textbook relation lap + lead = r sin(delta), infinite rod.
func TestPublishedSinclairSingleEccentric(t *testing.T) {
	r := 2.5 * inch
	lap, lead := 1*inch, inch/16
	delta, err := AdvanceFor(lap+lead, r)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "angle of advance", delta, 25.15, 0.05)
	for _, adm := range []Admission{Internal, External} {
		v := slideValve(adm, lap, 0, 1.5*inch)
		e := Engine{CrankRadius: 12 * inch, RodLength: longRod * 12 * inch}
		set, err := Events(e, v, textbookMotion(r, delta, adm), Forward)
		if err != nil {
			t.Fatal(err)
		}
		for _, end := range []CylinderEnd{Front, Back} {
			ev := set.End(end)
			name := adm.String() + " " + end.String()
			near(t, name+" lead mm", ev.Lead, lead, 1e-9)
			near(t, name+" admission before dead centre deg", ev.LeadAngle, 1.57, 0.01)
			near(t, name+" cut-off crank from dead centre deg", mod360(ev.CutOff.CrankDeg-set.BackDeadCentre*float64(end)), 131.27, 0.01)
			near(t, name+" cut-off %", ev.CutOff.StrokePercent, 82.98, 0.01)
			near(t, name+" cut-off in", ev.CutOff.StrokePercent/100*24, 19.9, 0.05)
			near(t, name+" release crank from dead centre deg", mod360(ev.Release.CrankDeg-set.BackDeadCentre*float64(end)), 154.85, 0.01)
			near(t, name+" release in", ev.Release.StrokePercent/100*24, 22.9, 0.05)
		}
	}
	// With rod/crank = 7.5: cut-off 20.4 in front stroke, 19.5 in back.
	e := Engine{CrankRadius: 12 * inch, RodLength: 7.5 * 12 * inch}
	v := slideValve(External, lap, 0, 1.5*inch)
	set, err := Events(e, v, textbookMotion(r, delta, External), Forward)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "front cut-off in, rod 7.5 cranks", set.Front.CutOff.StrokePercent/100*24, 20.4, 0.1)
	near(t, "back cut-off in, rod 7.5 cranks", set.Back.CutOff.StrokePercent/100*24, 19.5, 0.1)
}

// textbookSet returns the events of an equal-ended slide valve driven by the
// textbook motion r sin(theta + delta), running forward.
func textbookSet(t *testing.T, rodCranks, r, delta, lap float64) EventSet {
	t.Helper()
	e := Engine{CrankRadius: 12 * inch, RodLength: rodCranks * 12 * inch}
	set, err := Events(e, slideValve(External, lap, 0, 2*r), textbookMotion(r, delta, External), Forward)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// advanceFor returns the angle of advance for lap + lead = r sin(delta).
func advanceFor(r, lap, lead float64) float64 {
	a, err := AdvanceFor(lap+lead, r)
	if err != nil {
		panic(err)
	}
	return a
}

// C2. John Bourne, "A Catechism of the Steam Engine" (first published
// 1847; year from memory, the edition not checked), Q. 189-190 (Bourne's
// rule): lap = (travel/2) sqrt(1 - f) - lead/2, exact for zero lead with
// infinite rods. The exact lap is found here by solving for the lap whose
// events give the cut-off f.
func TestPublishedBourneLapForCutOff(t *testing.T) {
	cases := []struct {
		name              string
		travel, f, lead   float64 // inches, fraction, inches
		rule, exact, tolI float64 // inches
	}{
		{"travel 5, 75 %, no lead", 5, 0.75, 0, 1.2500, 1.2500, 0.001},
		{"travel 5, 75 %, lead 1/16", 5, 0.75, 1.0 / 16, 1.2188, 1.2186, 0.001},
		{"travel 5, 50 %, no lead", 5, 0.5, 0, 1.7678, 1.7678, 0.001},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			r := c.travel / 2 * inch
			rule := (r*math.Sqrt(1-c.f) - c.lead*inch/2) / inch
			near(t, "Bourne's rule, in", rule, c.rule, c.tolI)
			// bisect on the lap: a larger lap (same lead) cuts off earlier
			cutOff := func(lapIn float64) float64 {
				lap := lapIn * inch
				set := textbookSet(t, longRod, r, advanceFor(r, lap, c.lead*inch), lap)
				return set.Front.CutOff.StrokePercent / 100
			}
			lo, hi := 0.01, c.travel/2-c.lead-0.01
			for range 60 {
				m := (lo + hi) / 2
				if cutOff(m) > c.f {
					lo = m
				} else {
					hi = m
				}
			}
			near(t, "exact lap, in", (lo+hi)/2, c.exact, c.tolI)
		})
	}
}

// C3. C. A. Purinton, "Lap and Lead in Slide Valves", The Live Steamer,
// Mar-Apr 1950: full-gear travel = 2 x (lap + steam port width); lap 1/8,
// port 1/8 -> travel 1/2 in. With lead 0 and infinite rods: advance 30.00
// deg, cut-off 75.00 % (+/- 0.01 %); with rod/crank = 6: front 78.1 %,
// back 71.9 %. With lead 0.010 in: advance 32.68 deg, cut-off 72.95 %.
func TestPublishedPurintonTravel(t *testing.T) {
	lap, port := inch/8, inch/8
	travel := 2 * (lap + port)
	near(t, "travel in", travel/inch, 0.5, 1e-12)
	r := travel / 2
	e := Engine{CrankRadius: 12 * inch, RodLength: longRod * 12 * inch}
	delta := advanceFor(r, lap, 0)
	near(t, "advance, lead 0", delta, 30.00, 0.005)
	set, err := Events(e, slideValve(External, lap, 0, port), textbookMotion(r, delta, External), Forward)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "cut-off %, lead 0", set.Front.CutOff.StrokePercent, 75.00, 0.01)
	near(t, "back cut-off %, lead 0", set.Back.CutOff.StrokePercent, 75.00, 0.01)
	// the travel is chosen so that full gear just opens the port fully
	near(t, "max opening = port width", set.Front.MaxOpening, port, 1e-9)

	set6 := textbookSet(t, 6, r, delta, lap)
	near(t, "front cut-off %, rod 6 cranks", set6.Front.CutOff.StrokePercent, 78.1, 0.05)
	near(t, "back cut-off %, rod 6 cranks", set6.Back.CutOff.StrokePercent, 71.9, 0.05)

	lead := 0.010 * inch
	delta = advanceFor(r, lap, lead)
	near(t, "advance, lead 0.010", delta, 32.68, 0.005)
	setL := textbookSet(t, longRod, r, delta, lap)
	near(t, "cut-off %, lead 0.010", setL.Front.CutOff.StrokePercent, 72.95, 0.01)
	near(t, "lead, lead 0.010", setL.Front.Lead, lead, 1e-9)
}

// C4 (the part that needs only the event code). L. V. Ludy, "Locomotive
// Boilers and Engines", 1920, p. 88: the valve positions at the two dead
// centres differ by 2 x (lap + lead), fixed by the combination lever, so
// the lead is the same in every reverser position; C. H. Peabody,
// "Valve-Gears for Steam-Engines" (1892; year from memory), ch. IV: the
// crosshead motion acts as an eccentric of 90 degrees advance and amplitude
// lap + lead, so the mid-gear travel is 2 x (lap + lead). The motion here
// is built that way: the lever's share is the exact crosshead displacement
// scaled to lap + lead at the dead centres, the link's share a swing of
// amplitude proportional to the reverser that is zero at both dead
// centres. The engine is offset, so the dead centres are not 180 degrees
// apart.
func TestPublishedWalschaertsLeadFromCrosshead(t *testing.T) {
	e := Engine{CrankRadius: 1.5 * inch, RodLength: 9 * inch, Offset: 0.3 * inch}
	c, err := e.Prepare()
	if err != nil {
		t.Fatal(err)
	}
	lap, lead := inch/8, inch/64
	bdc := c.BackDeadCentre()
	mid := (c.DeadCentreU(Front) + c.DeadCentreU(Back)) / 2
	motion := func(link float64) Motion {
		return func(th float64) (float64, error) {
			lever := (lap + lead) * (c.CrossheadU(th) - mid) / (c.Stroke() / 2)
			// a swing through zero at both dead centres, wherever they are
			swing := math.Sin(th*math.Pi/180) * math.Sin((th-bdc)*math.Pi/180) / math.Sin(bdc/2*math.Pi/180)
			// internal admission: forward displacement opens the front port
			return lever + link*swing*(lap+lead), nil
		}
	}
	v := slideValve(Internal, lap, 0, 0.2*inch)
	for _, link := range []float64{0, 0.5, 1, 2, 3} {
		set, err := Events(e, v, motion(link), Forward)
		if err != nil {
			t.Fatal(err)
		}
		near(t, fmt.Sprintf("front lead, link %g", link), set.Front.Lead, lead, 1e-12)
		near(t, fmt.Sprintf("back lead, link %g", link), set.Back.Lead, lead, 1e-12)
		if link == 0 {
			near(t, "mid-gear travel", set.ValveTravel(), 2*(lap+lead), 1e-9)
		}
	}
}

// C6. The standard slider-crank relation ("Piston motion equations" in any
// mechanics reference): x = R(1 - cos t) + L - sqrt(L^2 - R^2 sin^2 t).
// Fraction of stroke from front dead centre with L/R = 6; mid-stroke at
// 85.22 deg.
func TestPublishedPistonPosition(t *testing.T) {
	e := Engine{CrankRadius: 50, RodLength: 300}
	for _, c := range []struct{ deg, frac float64 }{
		{30, 0.0774}, {60, 0.2814}, {90, 0.5420}, {120, 0.7814}, {150, 0.9434},
	} {
		near(t, fmt.Sprintf("fraction at %g deg", c.deg), e.PistonFraction(c.deg), c.frac, 1e-4)
		// the back stroke lags: from back dead centre the same crank angle
		// gives less travel
		if back := e.TravelFrom(Back, 180+c.deg); !(back < e.PistonFraction(c.deg)) {
			t.Errorf("at %g deg the back stroke (%g) is not behind the front stroke (%g)", c.deg, back, e.PistonFraction(c.deg))
		}
	}
	th, err := e.CrankAngleAt(0.5, Front, Forward)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "mid-stroke crank angle", th, 85.22, 0.005)
}

// C7. Typical values, as plausibility checks: lead on full-size engines of
// the 1880s 1/16 in (Sinclair 1888, p. 78); full-gear cut-off at least 75 %
// in miniature (common practice); a rod about 6 cranks long is ordinary
// (J. Rose, "Modern Machine Shop Practice", 1888); exhaust clearance seldom
// more than 1/16 in (common practice). The Sinclair engine of C1 is
// plausible; a three-crank rod and a 1/8 in exhaust clearance draw warnings.
func TestPublishedTypicalValues(t *testing.T) {
	spec := testSingle(t)
	if w := spec.Warnings(); len(w) != 0 {
		t.Errorf("plausible engine warned: %q", w)
	}
	odd := spec
	odd.Engine.RodLength = 3 * odd.Engine.CrankRadius
	odd.Valve.Front.ExhaustLap = -inch / 8
	w := odd.Warnings()
	if len(w) != 2 || !strings.Contains(w[0], "rod") || !strings.Contains(w[1], "exhaust clearance") {
		t.Errorf("warnings %q, want one on the rod and one on the front exhaust clearance", w)
	}
}
