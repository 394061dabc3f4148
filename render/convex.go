package render

import "math"

// Convex reports whether every sub-path of p, taken as the polygon of its
// points with the Bézier control points among them, is convex: at least
// three distinct points, every turn the same way (straight runs allowed),
// and one turn round in all. A cubic whose control polygon is convex is a
// convex curve inside it (the variation-diminishing property of Bézier
// curves), so the filled sub-path is then the convex region the polygon
// bounds, and a triangle fan from any of its points covers it exactly once:
// a backend may then fill it without a winding count. n is how many
// sub-paths p has.
func Convex(p Path) (ok bool, n int) {
	var pts []Point
	end := func() bool {
		if len(pts) == 0 {
			return true
		}
		n++
		return convexPolygon(pts)
	}
	for _, s := range p {
		switch s.Kind {
		case MoveTo:
			if !end() {
				return false, n
			}
			pts = append(pts[:0], s.Pts[0])
		case Close:
		default:
			if len(pts) == 0 {
				return false, n
			}
			pts = append(pts, s.Pts[:s.Kind.NumPoints()]...)
		}
	}
	return end(), n
}

// convexPolygon reports whether the closed polygon through pts turns one
// way only and once round. Turning one way, the edges' direction rotates
// steadily, so a polygon that goes round k times changes the sign of its
// edges' x (and y) parts 2k times: once round is at most two changes each.
// No trigonometry: this runs for every fill of every frame.
func convexPolygon(pts []Point) bool {
	// Drop repeated points (zero-length edges have no direction).
	q := pts[:0:0]
	for i, pt := range pts {
		if !finite(pt) {
			return false
		}
		if i == 0 || pt != q[len(q)-1] {
			q = append(q, pt)
		}
	}
	for len(q) > 1 && q[len(q)-1] == q[0] {
		q = q[:len(q)-1]
	}
	if len(q) < 3 {
		return false
	}
	sign := 0.0
	var xs, ys [2]float64 // the last non-zero sign of the edges' x and y parts, and the changes of it
	change := func(v float64, last *[2]float64) {
		if v == 0 {
			return
		}
		s := math.Copysign(1, v)
		if last[0] != 0 && s != last[0] {
			last[1]++
		}
		last[0] = s
	}
	n := len(q)
	for i := 0; i <= n; i++ { // one edge past the last, to count a change across the start
		a, b, c := q[i%n], q[(i+1)%n], q[(i+2)%n]
		e1 := Point{b.X - a.X, b.Y - a.Y}
		change(e1.X, &xs)
		change(e1.Y, &ys)
		if i == n {
			break
		}
		e2 := Point{c.X - b.X, c.Y - b.Y}
		cross := e1.X*e2.Y - e1.Y*e2.X
		// Straight on counts as no turn; straight back is a fold, never convex.
		if cross*cross <= 1e-18*(e1.X*e1.X+e1.Y*e1.Y)*(e2.X*e2.X+e2.Y*e2.Y) {
			if e1.X*e2.X+e1.Y*e2.Y < 0 {
				return false
			}
			continue
		}
		s := math.Copysign(1, cross)
		if sign == 0 {
			sign = s
		} else if s != sign {
			return false
		}
	}
	return sign != 0 && xs[1] <= 2 && ys[1] <= 2
}
