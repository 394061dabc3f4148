package setting

import (
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

func nearPt(p, q Point, tol float64) bool { return p.Sub(q).Len() <= tol }

func TestCirclesPicksTheSide(t *testing.T) {
	// 3-4-5 triangles: circles of radius 5 about (0,0) and (8,0) meet at (4, +-3).
	for _, c := range []struct {
		name string
		side float64
		want Point
	}{{"left of c1->c2", 1, Point{4, 3}}, {"right of c1->c2", -1, Point{4, -3}}} {
		got, ok := circles(Point{}, 5, Point{8, 0}, 5, c.side)
		if !ok || !nearPt(got, c.want, 1e-12) {
			t.Errorf("%s: got %v %v, want %v", c.name, got, ok, c.want)
		}
	}
	// Unequal radii, reversed order: circle 5 about (8,0) and 3 about (4,0)
	// meet at (4, +-3)... only if 4^2+3^2 = 5^2 from (8,0): yes.
	got, ok := circles(Point{8, 0}, 5, Point{4, 0}, 3, 1)
	if !ok || !nearPt(got, Point{4, -3}, 1e-12) {
		t.Errorf("reversed: got %v %v, want (4,-3)", got, ok)
	}
	if _, ok := circles(Point{}, 1, Point{5, 0}, 1, 1); ok {
		t.Error("circles 5 apart with radii 1 met")
	}
	if _, ok := circles(Point{}, 1, Point{}, 1, 1); ok {
		t.Error("concentric circles met")
	}
	// Touching circles meet once, at the touching point, on either side.
	got, ok = circles(Point{}, 2, Point{5, 0}, 3, -1)
	if !ok || !nearPt(got, Point{2, 0}, 1e-7) {
		t.Errorf("touching: got %v %v, want (2,0)", got, ok)
	}
}

func TestCircleLineAndNearSide(t *testing.T) {
	for _, c := range []struct {
		side float64
		want Point
	}{{1, Point{4, 3}}, {-1, Point{-4, 3}}} {
		got, ok := circleLine(Point{}, 5, Point{-10, 3}, Point{1, 0}, c.side)
		if !ok || !nearPt(got, c.want, 1e-12) {
			t.Errorf("side %v: got %v %v, want %v", c.side, got, ok, c.want)
		}
	}
	if _, ok := circleLine(Point{}, 2, Point{0, 3}, Point{1, 0}, 1); ok {
		t.Error("line 3 from the centre cut a circle of radius 2")
	}
	if sideOf(Point{}, Point{8, 0}, Point{3.5, -2}) != -1 || sideOf(Point{}, Point{8, 0}, Point{3.5, 2}) != 1 {
		t.Error("sideOf wrong")
	}
}

func TestPointAlgebra(t *testing.T) {
	p := Point{3, 4}
	if p.Len() != 5 || p.Dot(Point{1, 1}) != 7 || p.Cross(Point{1, 0}) != -4 {
		t.Errorf("Len, Dot or Cross wrong for %v", p)
	}
	if q := (Point{1, 0}).Rotate(math.Pi / 2); !nearPt(q, Point{0, 1}, 1e-15) {
		t.Errorf("quarter turn of +U gave %v, want +W", q)
	}
	if q := p.Left(); q != (Point{-4, 3}) {
		t.Errorf("Left(%v) = %v", p, q)
	}
	if (Point{math.NaN(), 0}).Finite() || !p.Finite() {
		t.Error("Finite wrong")
	}
}

// The gears' crank position must agree with Engine's own, offset cylinder
// or not.
func TestCrankRotationMatchesEngine(t *testing.T) {
	for _, e := range []Engine{{CrankRadius: 22, RodLength: 132}, {CrankRadius: 22, RodLength: 132, Offset: 15}, {CrankRadius: 50, RodLength: 180, Offset: -40}} {
		for th := 0.0; th < 360; th += 17 {
			u, w := e.CrankPin(th)
			if got := onAxle(e.CrankRadius, crankRotation(e, th)); !nearPt(got, Point{u, w}, 1e-9) {
				t.Errorf("%+v at %v deg: gear crank pin %v, engine %v", e, th, got, Point{u, w})
			}
		}
	}
}

// wantFieldError checks that err is an *Error naming field, and that its
// message contains every fragment.
func wantFieldError(t *testing.T, name string, err error, field string, fragments ...string) {
	t.Helper()
	var fe *Error
	if !errors.As(err, &fe) {
		t.Errorf("%s: got %v, want an *Error naming %q", name, err, field)
		return
	}
	if fe.Field != field {
		t.Errorf("%s: field %q, want %q (%s)", name, fe.Field, field, fe.Message)
	}
	for _, f := range fragments {
		if !strings.Contains(fe.Message, f) {
			t.Errorf("%s: message %q lacks %q", name, fe.Message, f)
		}
	}
}

// checkPose checks that every bar of a pose keeps its design length
// wherever the gear is solved, i.e. the linkage really closed.
func checkPose(t *testing.T, g PosedGear, e Engine, lengths map[string]float64) {
	t.Helper()
	for _, r := range []Reverser{1, 0.3, 0, -0.6, -1} {
		for th := 0.0; th < 360; th += 23 {
			p, err := g.Pose(e, th, r)
			if err != nil {
				t.Fatalf("%s pose at %v deg, reverser %v: %v", g.Kind(), th, r, err)
			}
			v, err := g.Valve(e, th, r)
			if err != nil || v != p.Valve {
				t.Errorf("%s at %v deg: Valve %v (%v), Pose.Valve %v", g.Kind(), th, v, err, p.Valve)
			}
			seen := map[string]bool{}
			for _, b := range p.Bars {
				want, ok := lengths[b.Name]
				if !ok {
					continue
				}
				seen[b.Name] = true
				if got := p.Joints[b.From].At.Sub(p.Joints[b.To].At).Len(); math.Abs(got-want) > 1e-6 {
					t.Errorf("%s at %v deg, reverser %v: %s is %.9f mm, want %.9f", g.Kind(), th, r, b.Name, got, want)
				}
			}
			if len(seen) != len(lengths) {
				t.Fatalf("%s: pose has bars %v, want all of %v", g.Kind(), seen, lengths)
			}
		}
	}
}

// checkReverserDirection checks that full forward gear drives the engine
// forward and full back gear backward: cut-off in the working range (55-95
// %) only when gear and running direction agree.
func checkReverserDirection(t *testing.T, name string, e Engine, v Valve, g Gear) {
	t.Helper()
	for _, c := range []struct {
		r    Reverser
		dir  Direction
		good bool
	}{{1, Forward, true}, {-1, Backward, true}, {1, Backward, false}, {-1, Forward, false}} {
		cut := eventsOf(t, e, v, g, c.r, c.dir).Front.CutOff.StrokePercent
		if works := cut > 55 && cut < 95; works != c.good {
			t.Errorf("%s, reverser %v running %v: cut-off %.1f %%", name, c.r, c.dir, cut)
		}
	}
}

// demoGears returns the demo engines' gears with their engines.
func demoGears(t testing.TB) ([]Engine, []PosedGear) {
	var es []Engine
	var gs []PosedGear
	for _, s := range DemoEngines() {
		g, err := s.Gear.Gear()
		if err != nil {
			t.Fatal(err)
		}
		es = append(es, s.Engine)
		gs = append(gs, g.(PosedGear))
	}
	return es, gs
}

// Each Valve call stands alone: solving the angles in a scrambled order
// gives exactly what solving them in turn gives.
func TestValveIsStateless(t *testing.T) {
	es, gs := demoGears(t)
	for i, g := range gs {
		var inTurn []float64
		for th := 0; th < 360; th++ {
			v, err := g.Valve(es[i], float64(th), 0.6)
			if err != nil {
				t.Fatal(err)
			}
			inTurn = append(inTurn, v)
		}
		for k := 0; k < 360; k++ {
			th := (k * 137) % 360 // 137 and 360 are coprime: every angle once
			v, _ := g.Valve(es[i], float64(th), 0.6)
			if v != inTurn[th] {
				t.Errorf("%s at %d deg: %v scrambled, %v in turn", g.Kind(), th, v, inTurn[th])
			}
		}
	}
}

// Bad and odd dimensions never panic and never give NaN or infinity: every
// call returns a finite displacement or an *Error (the rules' bad-input
// contract). The gears' dimensions are scaled at random, each by 0 to 3
// times, negated or made NaN or infinite, with a fixed seed; the crank
// angle NaN must be refused too.
func TestGearsNeverPanicOrGiveNaN(t *testing.T) {
	es, gs := demoGears(t)
	rng := rand.New(rand.NewPCG(1, 2))
	for i, g := range gs {
		for trial := 0; trial < 300; trial++ {
			bad := scaleFloats(g, rng)
			e := es[i]
			if err := bad.Validate(e); err != nil {
				var fe *Error
				if !errors.As(err, &fe) || fe.Field == "" {
					t.Fatalf("%s: Validate gave %v, not an *Error with a field", g.Kind(), err)
				}
			}
			if _, err := bad.Valve(e, math.NaN(), 0); err == nil {
				t.Fatalf("%s: a NaN crank angle gave no error", g.Kind())
			}
			for th := 0.0; th < 360; th += 45 {
				for _, r := range []Reverser{1, 0, -1} {
					v, err := bad.Valve(e, th, r)
					var fe *Error
					switch {
					case err != nil && !errors.As(err, &fe):
						t.Fatalf("%s: Valve error %v is not an *Error", g.Kind(), err)
					case err == nil && !finiteNum(v):
						t.Fatalf("%s %+v: Valve gave %v at %v deg", g.Kind(), bad, v, th)
					}
					if p, err := bad.Pose(e, th, r); err == nil {
						for _, j := range p.Joints {
							if !j.At.Finite() {
								t.Fatalf("%s %+v: joint %s at %v", g.Kind(), bad, j.Name, j.At)
							}
						}
					}
				}
			}
		}
	}
}

// scaleFloats returns a copy of g with every float64 field scaled by a
// random factor in [0, 3), negated, or set to NaN or infinity.
func scaleFloats(g PosedGear, rng *rand.Rand) PosedGear {
	v := reflect.New(reflect.TypeOf(g)).Elem()
	v.Set(reflect.ValueOf(g))
	var walk func(reflect.Value)
	walk = func(f reflect.Value) {
		switch f.Kind() {
		case reflect.Float64:
			switch rng.IntN(40) {
			case 0, 1, 2, 3, 4:
				f.SetFloat(f.Float() * 3 * rng.Float64())
			case 5, 6, 7:
				f.SetFloat(-f.Float())
			case 8:
				f.SetFloat(math.NaN())
			case 9:
				f.SetFloat(math.Inf(1))
			}
		case reflect.Struct:
			for i := 0; i < f.NumField(); i++ {
				walk(f.Field(i))
			}
		}
	}
	walk(v)
	return v.Interface().(PosedGear)
}
