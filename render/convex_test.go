package render

import "testing"

// TestConvex: the shapes the app fills most (rectangles, rounded
// rectangles, dots, single straight strokes) are convex; an L, a star, a
// fold, a crescent and a zero-area path are not.
func TestConvex(t *testing.T) {
	box := Rect{Point{10, 20}, Point{110, 60}}
	var l Path
	for _, pt := range []Point{{0, 0}, {10, 0}, {10, 5}, {5, 5}, {5, 10}, {0, 10}} {
		if len(l) == 0 {
			l.MoveTo(pt)
		} else {
			l.LineTo(pt)
		}
	}
	l.Close()
	var star Path
	for i, pt := range []Point{{50, 0}, {79, 90}, {2, 35}, {98, 35}, {21, 90}} {
		if i == 0 {
			star.MoveTo(pt)
		} else {
			star.LineTo(pt)
		}
	}
	star.Close()
	var fold Path
	fold.MoveTo(Point{0, 0})
	fold.LineTo(Point{10, 0})
	fold.LineTo(Point{5, 0})
	fold.LineTo(Point{5, 5})
	fold.Close()
	var crescent Path
	Arc(&crescent, Point{50, 50}, 40, 0, 180)
	Arc(&crescent, Point{50, 70}, 40, 180, -180) // back along a bulge the other way
	crescent.Close()
	var flat Path
	flat.MoveTo(Point{0, 0})
	flat.LineTo(Point{10, 0})
	flat.LineTo(Point{20, 0})
	flat.Close()
	var repeated Path // a repeated point and a straight run along an edge
	repeated.MoveTo(Point{0, 0})
	repeated.LineTo(Point{0, 0})
	repeated.LineTo(Point{5, 0})
	repeated.LineTo(Point{10, 0})
	repeated.LineTo(Point{10, 10})
	repeated.LineTo(Point{0, 10})
	repeated.LineTo(Point{0, 0})
	repeated.Close()
	two := append(RectPath(box), Circle(Point{200, 200}, 5)...)
	line := Path{{Kind: MoveTo, Pts: [3]Point{{10, 10}}}, {Kind: LineTo, Pts: [3]Point{{100, 40}}}}
	for _, c := range []struct {
		name string
		p    Path
		ok   bool
		n    int
	}{
		{"rectangle", RectPath(box), true, 1},
		{"rounded rectangle", RoundRect(box, 8), true, 1},
		{"rounded to a pill", RoundRect(box, 100), true, 1},
		{"dot", Circle(Point{5, 5}, 3), true, 1},
		{"straight stroke", Outline(line, LineStyle{Width: 3}), true, -1}, // pieces that overlap: opaque colours only
		{"two apart", two, true, 2},
		{"repeated point, straight run", repeated, true, 1},
		{"L", l, false, 1},
		{"star", star, false, 1},
		{"fold", fold, false, 1},
		{"crescent", crescent, false, 1},
		{"flat", flat, false, 1},
		{"empty", nil, true, 0},
	} {
		if ok, n := Convex(c.p); ok != c.ok || (ok && c.n >= 0 && n != c.n) {
			t.Errorf("%s: Convex = %v, %d sub-paths; want %v, %d", c.name, ok, n, c.ok, c.n)
		}
	}
}
