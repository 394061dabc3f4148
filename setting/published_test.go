package setting

import (
	"math"
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
	delta := math.Asin((lap+lead)/r) * 180 / math.Pi
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
