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
// way only and once round.
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
	sign, turned := 0.0, 0.0
	for i := range q {
		a, b, c := q[i], q[(i+1)%len(q)], q[(i+2)%len(q)]
		e1 := Point{b.X - a.X, b.Y - a.Y}
		e2 := Point{c.X - b.X, c.Y - b.Y}
		cross := e1.X*e2.Y - e1.Y*e2.X
		dot := e1.X*e2.X + e1.Y*e2.Y
		// Straight on counts as no turn; straight back is a fold, never convex.
		scale := math.Hypot(e1.X, e1.Y) * math.Hypot(e2.X, e2.Y)
		if math.Abs(cross) <= 1e-9*scale {
			if dot < 0 {
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
		turned += math.Atan2(cross, dot)
	}
	// Once round: 2 pi; a star that turns one way goes round twice or more.
	return sign != 0 && math.Abs(math.Abs(turned)-2*math.Pi) < 1e-6
}
