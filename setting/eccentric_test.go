package setting

import (
	"math"
	"testing"
)

// eventsOf runs Events on a gear in one reverser position.
func eventsOf(t *testing.T, e Engine, v Valve, g Gear, r Reverser, dir Direction) EventSet {
	t.Helper()
	set, err := Events(e, v, func(th float64) (float64, error) { return g.Valve(e, th, r) }, dir)
	if err != nil {
		t.Fatalf("%s, reverser %v, %v: %v", g.Kind(), r, dir, err)
	}
	return set
}

func lapValve(lap float64, a Admission) Valve {
	end := End{SteamLap: lap, PortWidth: 10}
	return Valve{Admission: a, Front: end, Back: end}
}

// With long rods a single eccentric puts the valve r sin(delta) from
// central at each dead centre, so lead = r sin(delta) - lap at both ends,
// for either admission and through a rocker (times its ratio). The relation
// is the textbook one behind published-checks C1 (A. Sinclair, Locomotive
// Engine Running and Management, 10th ed., 1888, p. 78: lap + lead =
// r sin(delta)). Tolerance 5e-4 mm: a 1e5 mm rod still tilts by r^2/(2l).
func TestSingleEccentricLongRodLead(t *testing.T) {
	e := Engine{CrankRadius: 22, RodLength: 132}
	const throw, advance, lap, rod = 5.0, 30.0, 2.0, 1e5
	// A rocker at the far end of the rod, its drive arm square to the
	// cylinder line at the sheave's mean height in mid position.
	rocker := func(drive, valve float64) *Rocker {
		return &Rocker{Pivot: Point{rod, -drive}, DriveArm: drive, ValveArm: valve, ValveRod: rod}
	}
	for _, c := range []struct {
		name   string
		adm    Admission
		rocker *Rocker
		ratio  float64
	}{
		{"external, direct", External, nil, 1},
		{"internal, direct", Internal, nil, 1},
		{"external, reversing rocker", External, rocker(-20, 20), 1},
		{"internal, reversing rocker", Internal, rocker(20, -20), 1},
		{"external, rocker 1.5:1 not reversing", External, rocker(-20, -30), 1.5},
	} {
		g := SingleEccentric{Eccentric: Eccentric{Throw: throw, Advance: advance, Rod: rod}, Admission: c.adm, Rocker: c.rocker, ValveCentreU: rod}
		if c.rocker != nil {
			g.ValveCentreU = 2 * rod
			g.Guide = c.rocker.Pivot.W + c.rocker.ValveArm
		}
		if err := g.Validate(e); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		want := c.ratio * throw * math.Sin(advance*math.Pi/180)
		// The valve at each dead centre, directly; the sign opens the port.
		s := c.adm.sense()
		v0, _ := g.Valve(e, 0, 1)
		v180, _ := g.Valve(e, 180, 1)
		if math.Abs(s*v0-want) > 5e-4 || math.Abs(-s*v180-want) > 5e-4 {
			t.Errorf("%s: valve at dead centres %.5f, %.5f; want %s%.5f, %s%.5f", c.name, v0, v180, sgn(s), want, sgn(-s), want)
		}
		set := eventsOf(t, e, lapValve(lap, c.adm), g, 1, Forward)
		for _, end := range []CylinderEnd{Front, Back} {
			if got := set.End(end).Lead; math.Abs(got-(want-lap)) > 5e-4 {
				t.Errorf("%s %v: lead %.5f, want r sin(delta) - lap = %.5f", c.name, end, got, want-lap)
			}
		}
	}
}

func sgn(s float64) string {
	if s < 0 {
		return "-"
	}
	return "+"
}

// Published-checks C1: A. Sinclair, Locomotive Engine Running and
// Management, 10th ed., 1888, p. 78. Travel 5 in, lap 1 in, lead 1/16 in,
// stroke 24 in. With infinite rods (here a connecting rod 10^4 cranks long, an eccentric
// rod 10^6 throws) the advance
// is 25.15 deg and cut-off falls at crank 131.27 deg = 82.98 % of stroke;
// with rod/crank 7.5, cut-off at 20.4 in (front stroke) and 19.5 in (back)
// +-0.1 in. The gear, solved as a linkage, must give the same events.
func TestSingleEccentricSinclairC1(t *testing.T) {
	const in = 25.4
	r := 2.5 * in
	lap, lead := 1*in, in/16
	advance := math.Asin((lap+lead)/r) * 180 / math.Pi
	if math.Abs(advance-25.15) > 0.05 {
		t.Fatalf("advance %.3f deg, want 25.15 +-0.05", advance)
	}
	g := SingleEccentric{Eccentric: Eccentric{Throw: r, Advance: advance, Rod: 1e6 * r}, Admission: External, ValveCentreU: 1e6 * r}
	v := lapValve(lap, External)
	long := Engine{CrankRadius: 12 * in, RodLength: 1e4 * 12 * in}
	set := eventsOf(t, long, v, g, 1, Forward)
	if c := set.Front.CutOff; math.Abs(c.CrankDeg-131.27) > 0.05 || math.Abs(c.StrokePercent-82.98) > 0.05 {
		t.Errorf("long rods: cut-off at %.2f deg, %.2f %%; want 131.27 deg, 82.98 %%", c.CrankDeg, c.StrokePercent)
	}
	if l := set.Front.Lead; math.Abs(l-lead) > 1e-3 {
		t.Errorf("long rods: lead %.4f mm, want %.4f", l, lead)
	}
	rod75 := Engine{CrankRadius: 12 * in, RodLength: 7.5 * 12 * in}
	set = eventsOf(t, rod75, v, g, 1, Forward)
	front := set.Front.CutOff.StrokePercent / 100 * 24
	back := set.Back.CutOff.StrokePercent / 100 * 24
	if math.Abs(front-20.4) > 0.1 || math.Abs(back-19.5) > 0.1 {
		t.Errorf("rod 7.5 cranks: cut-off %.2f in front, %.2f in back; want 20.4 and 19.5 +-0.1", front, back)
	}
}

// A slip eccentric in back gear stands at the mirror of its forward position
// about the crank, so running backward it repeats the forward events at
// each end (common practice, no source: what a slip eccentric is for).
// A fixed eccentric ignores the reverser.
func TestSlipEccentricMirrorsForBackRunning(t *testing.T) {
	s := DemoSlipEccentric()
	g := *s.Gear.SingleEccentric
	fwd := eventsOf(t, s.Engine, s.Valve, g, 1, Forward)
	back := eventsOf(t, s.Engine, s.Valve, g, -1, Backward)
	for _, end := range []CylinderEnd{Front, Back} {
		f, b := fwd.End(end), back.End(end)
		if math.Abs(f.Lead-b.Lead) > 1e-9 || math.Abs(f.CutOff.StrokePercent-b.CutOff.StrokePercent) > 1e-6 {
			t.Errorf("%v: forward lead %.4f cut-off %.3f %%, backward %.4f, %.3f %%", end, f.Lead, f.CutOff.StrokePercent, b.Lead, b.CutOff.StrokePercent)
		}
	}
	// Running backward on the forward setting is wrong: cut-off far off.
	wrong := eventsOf(t, s.Engine, s.Valve, g, 1, Backward)
	if c := wrong.Front.CutOff.StrokePercent; c > 50 && c < 90 {
		t.Errorf("forward-set slip eccentric running backward cut off at %.1f %%, like a working gear", c)
	}
	g.Slip = false
	for th := 0.0; th < 360; th += 30 {
		a, _ := g.Valve(s.Engine, th, 1)
		b, _ := g.Valve(s.Engine, th, -1)
		if a != b {
			t.Errorf("fixed eccentric at %v deg moves with the reverser: %v, %v", th, a, b)
		}
	}
}

func TestSingleEccentricErrorsNameTheField(t *testing.T) {
	e := demoEngine()
	good := *DemoSlipEccentric().Gear.SingleEccentric
	if err := good.Validate(e); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name, field string
		change      func(*SingleEccentric, *Engine)
	}{
		{"no throw", "eccentric.throw", func(g *SingleEccentric, _ *Engine) { g.Eccentric.Throw = 0 }},
		{"NaN throw", "eccentric.throw", func(g *SingleEccentric, _ *Engine) { g.Eccentric.Throw = math.NaN() }},
		{"rod shorter than throw", "eccentric.rod", func(g *SingleEccentric, _ *Engine) { g.Eccentric.Rod = 4 }},
		{"advance past 90", "eccentric.advance", func(g *SingleEccentric, _ *Engine) { g.Eccentric.Advance = 95 }},
		{"admission unset", "admission", func(g *SingleEccentric, _ *Engine) { g.Admission = 0 }},
		{"rocker arm zero", "rocker.drive_arm", func(g *SingleEccentric, _ *Engine) { g.Rocker = &Rocker{ValveArm: 10} }},
		{"rocker valve rod negative", "rocker.valve_rod", func(g *SingleEccentric, _ *Engine) {
			g.Rocker = &Rocker{DriveArm: 10, ValveArm: 10, ValveRod: -1}
		}},
		{"guide infinite", "guide", func(g *SingleEccentric, _ *Engine) { g.Guide = math.Inf(1) }},
		{"engine rod too short", "engine.rod_length", func(_ *SingleEccentric, e *Engine) { e.RodLength = 10 }},
	} {
		g, en := good, e
		c.change(&g, &en)
		wantFieldError(t, c.name, g.Validate(en), c.field)
	}
	// A rod that cannot reach the guide line is named with the angle.
	g := good
	g.Guide = 200
	wantFieldError(t, "guide out of reach", g.Validate(e), "eccentric.rod", "cannot reach", "crank angle 0 deg")
	_, err := g.Valve(e, 212, 1)
	wantFieldError(t, "guide out of reach, Valve", err, "eccentric.rod", "crank angle 212 deg")
	_, err = good.Valve(e, 10, 1.5)
	wantFieldError(t, "reverser past full gear", err, "reverser")
}

func TestSingleEccentricPoseKeepsLengths(t *testing.T) {
	e := demoEngine()
	g := *DemoSlipEccentric().Gear.SingleEccentric
	checkPose(t, g, e, map[string]float64{"crank": e.CrankRadius, "eccentric": g.Eccentric.Throw, "eccentric rod": g.Eccentric.Rod})
	k := &Rocker{Pivot: Point{110, 30}, DriveArm: -25, ValveArm: 30, ValveRod: 60}
	g.Rocker, g.Guide, g.ValveCentreU = k, 60, 170
	if err := g.Validate(e); err != nil {
		t.Fatal(err)
	}
	checkPose(t, g, e, map[string]float64{"eccentric rod": g.Eccentric.Rod, "rocker drive arm": 25, "rocker valve arm": 30, "valve rod": 60})
}

// BenchmarkSingleEccentricValve is one Valve evaluation of the demo slip
// eccentric (goal: about 250 ns or less, so that the event table of three
// gears in nine positions stays under 2 ms).
func BenchmarkSingleEccentricValve(b *testing.B) {
	s := DemoSlipEccentric()
	benchValve(b, s.Engine, *s.Gear.SingleEccentric)
}

func benchValve(b *testing.B, e Engine, g Gear) {
	b.ReportAllocs()
	th, r := 0.0, Reverser(0.75)
	for i := 0; i < b.N; i++ {
		if _, err := g.Valve(e, th, r); err != nil {
			b.Fatal(err)
		}
		th += 7.3
		if th >= 360 {
			th -= 360
		}
	}
}
