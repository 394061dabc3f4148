package setting

import (
	"fmt"
	"math"
	"testing"
)

// zeunerGear is a Stephenson gear laid out for the textbook analysis: equal
// eccentrics and rods of length l, a link curved to radius l, hung by its
// middle from a long lifting link that is upright in mid gear, and a reverse
// arm that lowers or raises the link by half the pin spacing in full gear.
func zeunerGear(throw, advance, l, c float64, crossed bool, a Admission) Stephenson {
	const arm, lift, guide = 60.0, 300.0, 0.0
	g := Stephenson{
		Forward:      Eccentric{Throw: throw, Advance: advance, Rod: l},
		Backward:     Eccentric{Throw: throw, Advance: advance, Rod: l},
		Crossed:      crossed,
		Admission:    a,
		Link:         ExpansionLink{Radius: l, PinSpacing: 2 * c},
		Weighshaft:   Point{l - arm, guide + lift},
		ReverseArm:   arm,
		LiftingLink:  lift,
		Guide:        guide,
		ValveCentreU: l,
	}
	// Full forward brings the forward rod's end of the link to the die.
	g.ArmSwing = -g.forwardSide() * math.Asin(c/arm) * 180 / math.Pi
	return g
}

// deadCentreOpening is the mean over the two dead centres of the valve's
// displacement toward opening its port to steam: lead + lap, whatever the
// spindle length.
func deadCentreOpening(t *testing.T, e Engine, g Stephenson, r Reverser) float64 {
	t.Helper()
	s := g.Admission.sense()
	v0, err0 := g.Valve(e, 0, r)
	vb, errb := g.Valve(e, e.BackDeadCentre(), r)
	if err0 != nil || errb != nil {
		t.Fatal(err0, errb)
	}
	return (s*v0 - s*vb) / 2
}

// Zeuner's approximation for the Stephenson link motion (G. Zeuner,
// Treatise on Valve-Gears, 1869, the chapter on the link motion; the page is
// not checked here): from full gear to mid gear the lead grows by
// r cos(delta) c / l with open rods and falls by as much with crossed rods,
// c being half the pin spacing and l the rod length, the link curved to
// radius l. (The general form at die offset u, r sin(delta) +
// r cos(delta) (c^2 - u^2)/(c l) at dead centre, is from memory; the test
// uses only its two ends.) For long rods (l = 600,
// c = 18, r = 5: 0.136 mm) the exact linkage must agree within 2 %, for
// either admission; with the demo's short rods (l = 130, c/l = 0.14) within
// 5 %.
func TestStephensonLeadAcrossGearFollowsZeuner(t *testing.T) {
	e := Engine{CrankRadius: 22, RodLength: 132}
	const throw, advance, c = 5.0, 25.0, 18.0
	for _, tc := range []struct {
		l       float64
		crossed bool
		adm     Admission
		tol     float64 // fraction of the predicted change
	}{
		{600, false, External, 0.02},
		{600, true, External, 0.02},
		{600, false, Internal, 0.02},
		{600, true, Internal, 0.02},
		{130, false, External, 0.05},
		{130, true, External, 0.05},
	} {
		name := fmt.Sprintf("rods %g mm, crossed %v, %v admission", tc.l, tc.crossed, tc.adm)
		g := zeunerGear(throw, advance, tc.l, c, tc.crossed, tc.adm)
		if err := g.Validate(e); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		want := throw * math.Cos(advance*math.Pi/180) * c / tc.l
		if tc.crossed {
			want = -want
		}
		full, half, mid := deadCentreOpening(t, e, g, 1), deadCentreOpening(t, e, g, 0.5), deadCentreOpening(t, e, g, 0)
		t.Logf("%s: lead change full to mid gear %.4f mm, Zeuner %.4f", name, mid-full, want)
		if got := mid - full; math.Abs(got-want) > tc.tol*math.Abs(want) {
			t.Errorf("%s: lead change full to mid gear %.4f mm, Zeuner %.4f", name, got, want)
		}
		if (half-full)*want <= 0 || (mid-half)*want <= 0 {
			t.Errorf("%s: lead not monotonic toward mid gear: %.4f, %.4f, %.4f", name, full, half, mid)
		}
		back := deadCentreOpening(t, e, g, -1)
		if math.Abs(back-full) > 0.02*math.Abs(want) {
			t.Errorf("%s: full back %.4f and full forward %.4f differ with equal eccentrics", name, back, full)
		}
	}
}

// Full forward drives the engine forward and full back drives it backward:
// cut-off in the working range only when the gear and the running direction
// agree (common practice, no source).
func TestStephensonReverserDirection(t *testing.T) {
	e := Engine{CrankRadius: 22, RodLength: 132}
	for _, crossed := range []bool{false, true} {
		for _, adm := range []Admission{External, Internal} {
			g := zeunerGear(5, 25, 130, 18, crossed, adm)
			v := lapValve(5*math.Sin(25*math.Pi/180)-0.2, adm)
			checkReverserDirection(t, fmt.Sprintf("crossed %v, %v", crossed, adm), e, v, g)
		}
	}
}

func TestStephensonPoseKeepsLengths(t *testing.T) {
	s := DemoStephenson()
	g := *s.Gear.Stephenson
	checkPose(t, g, s.Engine, map[string]float64{
		"crank":                  s.Engine.CrankRadius,
		"forward eccentric":      g.Forward.Throw,
		"backward eccentric":     g.Backward.Throw,
		"forward eccentric rod":  g.Forward.Rod,
		"backward eccentric rod": g.Backward.Rod,
		"reverse arm":            g.ReverseArm,
		"lifting link":           g.LiftingLink,
	})
	p, err := g.Pose(s.Engine, 40, 0.4)
	if err != nil {
		t.Fatal(err)
	}
	f, _ := p.Joint("forward rod pin")
	b, _ := p.Joint("backward rod pin")
	if d := f.Sub(b).Len(); math.Abs(d-g.Link.PinSpacing) > 1e-9 {
		t.Errorf("pin spacing %.9f, want %g", d, g.Link.PinSpacing)
	}
	// The die lies on the link's arc: radius from the centre of curvature.
	die, _ := p.Joint("die block")
	mid, _ := p.Joint("link middle")
	centre := mid.Add(f.Sub(b).Scale(1 / g.Link.PinSpacing).Rotate(math.Pi / 2).Scale(g.Link.Radius))
	if d := die.Sub(centre).Len(); math.Abs(d-g.Link.Radius) > 1e-9 {
		t.Errorf("die %.9f mm from the link's centre of curvature, want %g", d, g.Link.Radius)
	}
}

func TestStephensonErrorsNameTheField(t *testing.T) {
	s := DemoStephenson()
	e, good := s.Engine, *s.Gear.Stephenson
	for _, c := range []struct {
		name, field string
		change      func(*Stephenson)
	}{
		{"no forward throw", "forward.throw", func(g *Stephenson) { g.Forward.Throw = 0 }},
		{"backward rod shorter than throw", "backward.rod", func(g *Stephenson) { g.Backward.Rod = 3 }},
		{"advance NaN", "backward.advance", func(g *Stephenson) { g.Backward.Advance = math.NaN() }},
		{"link radius zero", "link.radius", func(g *Stephenson) { g.Link.Radius = 0 }},
		{"pins wider than the link's circle", "link.pin_spacing", func(g *Stephenson) { g.Link.PinSpacing = 300 }},
		{"reverse arm negative", "reverse_arm", func(g *Stephenson) { g.ReverseArm = -30 }},
		{"lifting link NaN", "lifting_link", func(g *Stephenson) { g.LiftingLink = math.NaN() }},
		{"arm swing infinite", "arm_swing", func(g *Stephenson) { g.ArmSwing = math.Inf(-1) }},
		{"admission unset", "admission", func(g *Stephenson) { g.Admission = 0 }},
		{"weighshaft NaN", "weighshaft", func(g *Stephenson) { g.Weighshaft.U = math.NaN() }},
		{"die behind the axle", "valve_centre_u", func(g *Stephenson) { g.ValveCentreU = -5 }},
		{"lifting link far too long", "lifting_link", func(g *Stephenson) { g.LiftingLink = 400 }},
		{"forward rod far too long", "forward.rod", func(g *Stephenson) { g.Forward.Rod = 250 }},
		{"backward rod far too short", "backward.rod", func(g *Stephenson) { g.Backward.Rod = 40 }},
	} {
		g := good
		c.change(&g)
		wantFieldError(t, c.name, g.Validate(e), c.field)
	}
	g := good
	g.LiftingLink = 400
	_, err := g.Valve(e, 212, 0)
	wantFieldError(t, "long lifting link, Valve", err, "lifting_link", "The lifting link cannot hold the expansion link", "crank angle 212 deg")
	g = good
	g.Link.Radius, g.Guide = 20, 30
	_, err = g.Valve(e, 30, 0)
	wantFieldError(t, "guide beyond the link", err, "guide", "crank angle 30 deg")
	g = good
	g.ArmSwing = -80
	wantFieldError(t, "reverser swings the die off the link", g.Validate(e), "arm_swing", "runs off the end")
}

// TestStephensonValveCurveIsValve: the curve made in one call, each angle
// started from the last ones' links, gives Valve's values angle by angle
// (to well within the 1e-9 mm the events are found to), on the demo gear
// and on textbook gears with open and crossed rods, both admissions, at
// the sample counts the plan uses and at an uneven set of angles.
func TestStephensonValveCurveIsValve(t *testing.T) {
	demo := DemoStephenson()
	type gearCase struct {
		name string
		e    Engine
		g    Stephenson
	}
	cases := []gearCase{{"demo", demo.Engine, *demo.Gear.Stephenson}}
	for _, crossed := range []bool{false, true} {
		for _, adm := range []Admission{External, Internal} {
			cases = append(cases, gearCase{fmt.Sprintf("crossed %v %v", crossed, adm), Engine{CrankRadius: 22, RodLength: 132}, zeunerGear(5, 25, 130, 18, crossed, adm)})
		}
	}
	uneven := []float64{0, 0.5, 1, 179, 181, 90, 270, 359.9, 3}
	for _, c := range cases {
		for _, n := range []int{24, 72, 0} {
			th := uneven
			if n > 0 {
				th = make([]float64, n)
				for i := range th {
					th[i] = 360 * float64(i) / float64(n)
				}
			}
			for _, r := range []Reverser{1, 0.6, 0, -0.4, -1} {
				out := make([]float64, len(th))
				if err := c.g.ValveCurve(c.e, th, r, out); err != nil {
					t.Fatalf("%s n=%d r=%g: %v", c.name, n, r, err)
				}
				for i, a := range th {
					v, err := c.g.Valve(c.e, a, r)
					if err != nil {
						t.Fatal(err)
					}
					if d := math.Abs(out[i] - v); d > 1e-10 {
						t.Errorf("%s r=%g at %g deg: curve %.12f, Valve %.12f mm", c.name, r, a, out[i], v)
					}
				}
			}
		}
	}
	if err := (Stephenson{}).ValveCurve(demo.Engine, []float64{0}, 2, []float64{0}); err == nil {
		t.Error("reverser 2 accepted")
	}
}

// BenchmarkStephensonValve is one Valve evaluation of the demo Stephenson
// gear (goal: about 250 ns or less).
func BenchmarkStephensonValve(b *testing.B) {
	s := DemoStephenson()
	benchValve(b, s.Engine, *s.Gear.Stephenson)
}

// BenchmarkStephensonValveCurve is the demo Stephenson gear's valve at 72
// crank angles in one ValveCurve call (compare 72 BenchmarkStephensonValve).
func BenchmarkStephensonValveCurve(b *testing.B) {
	s := DemoStephenson()
	g := *s.Gear.Stephenson
	th := make([]float64, 72)
	for i := range th {
		th[i] = 5 * float64(i)
	}
	out := make([]float64, len(th))
	b.ReportAllocs()
	for b.Loop() {
		if err := g.ValveCurve(s.Engine, th, 0.75, out); err != nil {
			b.Fatal(err)
		}
	}
}
