package render

import (
	"math"
	"testing"
)

// winding returns the non-zero winding number of pt in the flattened path
// p, so a test can ask "is this point painted?" without a rasterizer.
func winding(p Path, pt Point) int {
	w := 0
	for _, sp := range flatten(p) {
		pts := sp.pts
		for i := range pts {
			a, b := pts[i], pts[(i+1)%len(pts)]
			if a.Y <= pt.Y {
				if b.Y > pt.Y && cross(a, b, pt) > 0 {
					w++
				}
			} else if b.Y <= pt.Y && cross(a, b, pt) < 0 {
				w--
			}
		}
	}
	return w
}

func cross(a, b, p Point) float64 { return (b.X-a.X)*(p.Y-a.Y) - (p.X-a.X)*(b.Y-a.Y) }

func painted(p Path, pt Point) bool { return winding(p, pt) != 0 }

func line(pts ...Point) Path {
	var p Path
	for i, pt := range pts {
		if i == 0 {
			p.MoveTo(pt)
		} else {
			p.LineTo(pt)
		}
	}
	return p
}

type probe struct {
	name string
	at   Point
	want bool
}

func checkProbes(t *testing.T, out Path, probes []probe) {
	t.Helper()
	for _, pr := range probes {
		if got := painted(out, pr.at); got != pr.want {
			t.Errorf("%s: painted(%v) = %v, want %v (winding %d)", pr.name, pr.at, got, pr.want, winding(out, pr.at))
		}
	}
}

func TestOutlineStraightLine(t *testing.T) {
	out := Outline(line(Point{10, 10}, Point{30, 10}), LineStyle{Width: 2})
	checkProbes(t, out, []probe{
		{"middle", Point{20, 10}, true},
		{"just inside the edge", Point{20, 10.95}, true},
		{"just outside the edge", Point{20, 11.05}, false},
		{"round cap tip", Point{9.05, 10}, true},
		{"beyond the cap", Point{8.95, 10}, false},
		{"cap corner is round, not square", Point{9.1, 10.9}, false},
		{"far end cap", Point{30.9, 10}, true},
	})
}

func TestOutlineZeroWidthMeansOne(t *testing.T) {
	out := Outline(line(Point{0, 0}, Point{10, 0}), LineStyle{})
	checkProbes(t, out, []probe{
		{"inside half a unit", Point{5, 0.45}, true},
		{"outside half a unit", Point{5, 0.55}, false},
	})
}

// A sharp turn must leave no notch at the outer corner (the round join fills
// it) and no hole where the two segments overlap on the inner side.
func TestOutlineSharpTurn(t *testing.T) {
	out := Outline(line(Point{0, 0}, Point{20, 0}, Point{0, 2}), LineStyle{Width: 4})
	checkProbes(t, out, []probe{
		{"vertex", Point{20, 0}, true},
		{"outer round join", Point{21.9, 0}, true},
		{"outside the join", Point{22.1, 0}, false},
		{"inner overlap", Point{15, 1}, true},
	})
}

// Pieces overlapping in every direction stay painted: all are wound the same
// way, so non-zero never cancels.
func TestOutlineSelfCrossing(t *testing.T) {
	out := Outline(line(Point{0, 0}, Point{10, 10}, Point{10, 0}, Point{0, 10}), LineStyle{Width: 3})
	for _, pt := range []Point{{5, 5}, {10, 5}, {2, 2}, {8, 2}, {10, 10}} {
		if w := winding(out, pt); w == 0 {
			t.Errorf("point %v not painted", pt)
		} else if w < 0 {
			t.Errorf("point %v painted with negative winding %d: pieces wound inconsistently", pt, w)
		}
	}
}

func TestOutlineClosedSquareHasHole(t *testing.T) {
	var p Path
	p.MoveTo(Point{0, 0})
	p.LineTo(Point{20, 0})
	p.LineTo(Point{20, 20})
	p.LineTo(Point{0, 20})
	p.Close()
	out := Outline(p, LineStyle{Width: 2})
	checkProbes(t, out, []probe{
		{"centre stays empty", Point{10, 10}, false},
		{"top edge", Point{10, 0.5}, true},
		{"closing edge", Point{0.5, 10}, true},
		{"closing corner, outer round join", Point{-0.65, -0.65}, true},
		{"beyond the closing corner", Point{-0.8, -0.8}, false},
	})
}

func TestOutlineDashes(t *testing.T) {
	out := Outline(line(Point{0, 0}, Point{100, 0}), LineStyle{Width: 2, Dashes: []float64{10, 5}})
	checkProbes(t, out, []probe{
		{"first dash", Point{5, 0}, true},
		{"first gap, clear of the round caps", Point{12.5, 0}, false},
		{"second dash", Point{20, 0}, true},
		{"dash over a vertex-free stretch", Point{95, 0}, true},
		{"gap 85..90 (pattern 0-10 on, 10-15 off, period 15)", Point{87.5, 0}, false},
	})
	// An odd pattern repeats: {10} means 10 on, 10 off.
	odd := Outline(line(Point{0, 0}, Point{40, 0}), LineStyle{Width: 1, Dashes: []float64{10}})
	checkProbes(t, odd, []probe{
		{"odd: on", Point{5, 0}, true},
		{"odd: off", Point{15, 0}, false},
		{"odd: on again", Point{25, 0}, true},
	})
	// Dashes continue round corners.
	bent := Outline(line(Point{0, 0}, Point{8, 0}, Point{8, 20}), LineStyle{Width: 1, Dashes: []float64{10, 4}})
	checkProbes(t, bent, []probe{
		{"dash turning the corner", Point{8, 1}, true},
		{"gap after the corner (10..14 along: y 2..6)", Point{8, 4}, false},
		{"next dash", Point{8, 10}, true},
	})
}

func TestOutlineBadDashesAreSolid(t *testing.T) {
	for _, d := range [][]float64{{0, 0}, {-1, 5}, {math.NaN(), 2}, {math.Inf(1)}, {1e-9, 1e-9}} {
		out := Outline(line(Point{0, 0}, Point{100, 0}), LineStyle{Width: 2, Dashes: d})
		for x := 1.0; x < 100; x += 3 {
			if !painted(out, Point{x, 0}) {
				t.Errorf("dashes %v: x=%g not painted, want a solid line", d, x)
				break
			}
		}
	}
}

func TestOutlineCircleWithinFlatness(t *testing.T) {
	out := Outline(Circle(Point{100, 100}, 50), LineStyle{Width: 2})
	for a := 0.0; a < 360; a += 7 {
		s, c := math.Sincos(a * math.Pi / 180)
		at := func(r float64) Point { return Point{100 + r*c, 100 + r*s} }
		// Arc error (0.03 %) plus flatness: well under 0.1 units.
		if !painted(out, at(50.9)) || !painted(out, at(49.1)) {
			t.Errorf("angle %g: ring not painted just inside its edges", a)
		}
		if painted(out, at(51.1)) || painted(out, at(48.9)) || painted(out, at(0)) {
			t.Errorf("angle %g: painted outside the ring", a)
		}
	}
}

func TestOutlineDegenerateInput(t *testing.T) {
	nan := math.NaN()
	cases := []struct {
		name string
		p    Path
		s    LineStyle
	}{
		{"empty", nil, LineStyle{}},
		{"move only", line(Point{1, 1}), LineStyle{}},
		{"NaN points skipped", line(Point{0, 0}, Point{nan, 5}, Point{10, 0}), LineStyle{Width: 2}},
		{"infinite width means 1", line(Point{0, 0}, Point{10, 0}), LineStyle{Width: math.Inf(1)}},
		{"NaN width means 1", line(Point{0, 0}, Point{10, 0}), LineStyle{Width: nan}},
		{"zero-length line", line(Point{5, 5}, Point{5, 5}), LineStyle{Width: 4}},
		{"close with nothing", Path{{Kind: Close}}, LineStyle{}},
	}
	for _, tc := range cases {
		out := Outline(tc.p, tc.s)
		for _, seg := range out {
			for _, pt := range seg.Pts {
				if !finite(pt) {
					t.Errorf("%s: outline has a non-finite point %v", tc.name, pt)
				}
			}
		}
	}
	if out := Outline(line(Point{5, 5}, Point{5, 5}), LineStyle{Width: 4}); !painted(out, Point{5, 6.9}) || painted(out, Point{5, 7.1}) {
		t.Error("a zero-length line should paint a dot as wide as the line")
	}
	if out := Outline(line(Point{0, 0}, Point{nan, 5}, Point{10, 0}), LineStyle{Width: 2}); !painted(out, Point{5, 0}) {
		t.Error("skipping a NaN point should join its neighbours")
	}
}

func TestArcEndsAndRadius(t *testing.T) {
	var p Path
	Arc(&p, Point{0, 0}, 100, 0, 90)
	if len(p) != 2 || p[0].Kind != MoveTo || p[1].Kind != CubeTo {
		t.Fatalf("a quarter arc should be one MoveTo and one CubeTo, got %v", p)
	}
	end := p[1].Pts[2]
	if math.Abs(end.X) > 1e-9 || math.Abs(end.Y-100) > 1e-9 {
		t.Errorf("0 to 90 degrees should end at (0, 100) (clockwise on screen, y down), got %v", end)
	}
	// The midpoint of a cubic quarter circle lies 0.027 % outside the true
	// radius (the classic 4/3 tan(theta/4) construction).
	mid := cubicAt(p[0].Pts[0], p[1].Pts[0], p[1].Pts[1], p[1].Pts[2], 0.5)
	if r := math.Hypot(mid.X, mid.Y); math.Abs(r-100) > 0.03 {
		t.Errorf("arc midpoint radius %g, want 100 within 0.03", r)
	}
	var q Path
	q.MoveTo(Point{-50, 0})
	Arc(&q, Point{0, 0}, 10, 180, -270)
	if q[1].Kind != LineTo || len(q) != 5 {
		t.Errorf("an arc after a point should start with a LineTo and use 3 cubics for 270 degrees, got %d segments", len(q))
	}
	var none Path
	Arc(&none, Point{0, 0}, -1, 0, 90)
	Arc(&none, Point{0, 0}, 5, math.NaN(), 90)
	if len(none) != 0 {
		t.Errorf("bad radius or angle should add nothing, got %v", none)
	}
}

func TestRoundRectCorners(t *testing.T) {
	r := Rect{Point{0, 0}, Point{100, 40}}
	out := Outline(RoundRect(r, 10), LineStyle{Width: 1})
	checkProbes(t, out, []probe{
		{"top edge", Point{50, 0}, true},
		{"square corner is cut away", Point{0.5, 0.5}, false},
		{"rounded corner passes 45 degrees in", Point{10 - 10*math.Sqrt2/2, 10 - 10*math.Sqrt2/2}, true},
	})
	if len(RoundRect(r, 0)) != 5 {
		t.Error("radius 0 should give the plain rectangle")
	}
}
