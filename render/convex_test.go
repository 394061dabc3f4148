package render

import (
	"math"
	"math/rand/v2"
	"testing"
)

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

// TestConvexAgainstTurning: on random polygons round a centre (convex or
// not, once round or, stepping two points at a time, twice), convexPolygon
// agrees with adding up the turning angles.
func TestConvexAgainstTurning(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	convex, not := 0, 0
	for trial := 0; trial < 3000; trial++ {
		n := 3 + rng.IntN(9)
		pts := make([]Point, n)
		for i := range pts {
			a := 2 * math.Pi * (float64(i) + 0.8*rng.Float64()) / float64(n)
			r := 10 + rng.Float64()*[3]float64{0, 1, 10}[trial%3] // circles, near circles, stars
			pts[i] = Point{50 + r*math.Cos(a), 50 + r*math.Sin(a)}
		}
		if trial%7 == 0 && n%2 == 1 { // visit every other point: round twice
			q := make([]Point, 0, n)
			for i := 0; i < n; i++ {
				q = append(q, pts[(2*i)%n])
			}
			pts = q
		}
		want := turnsOnceOneWay(pts)
		if got := convexPolygon(pts); got != want {
			t.Fatalf("polygon %v: convexPolygon %v, turning says %v", pts, got, want)
		}
		if want {
			convex++
		} else {
			not++
		}
	}
	if convex < 300 || not < 300 {
		t.Fatalf("%d convex and %d other polygons: the test draws too few of one kind", convex, not)
	}
}

// turnsOnceOneWay is the plain definition: every turn the same way and
// the turning angles adding up to one turn.
func turnsOnceOneWay(q []Point) bool {
	sign, turned := 0.0, 0.0
	for i := range q {
		a, b, c := q[i], q[(i+1)%len(q)], q[(i+2)%len(q)]
		e1, e2 := Point{b.X - a.X, b.Y - a.Y}, Point{c.X - b.X, c.Y - b.Y}
		cross, dot := e1.X*e2.Y-e1.Y*e2.X, e1.X*e2.X+e1.Y*e2.Y
		if math.Abs(cross) <= 1e-9*math.Hypot(e1.X, e1.Y)*math.Hypot(e2.X, e2.Y) {
			if dot < 0 {
				return false
			}
			continue
		}
		if s := math.Copysign(1, cross); sign == 0 {
			sign = s
		} else if s != sign {
			return false
		}
		turned += math.Atan2(cross, dot)
	}
	return sign != 0 && math.Abs(math.Abs(turned)-2*math.Pi) < 1e-6
}
