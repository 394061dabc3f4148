package render

import "math"

// Stroking: Outline is the one place a stroked path becomes a filled one, so
// every backend (raster, browser) draws identical lines.
//
// Choice: round joins and round caps. They never spike at the sharp turns a
// valve curve or a marker makes (a miter join would need a limit and a
// fallback), and a round join is what a pen draws. The outline is built as
// a union of simple pieces, all wound the same way, which the non-zero rule
// fills as one shape with no seams: a quadrilateral per flattened segment,
// a pie slice of a circle on the outer side of every join, and a half disc
// per cap. github.com/golang/freetype/raster has a stroker too, but it
// panics on cubic segments, has no dashes and no miter join, and works in
// 26.6 fixed point; this one handles all three segment kinds in float64.

// flatness is the largest distance, in logical units, between a curve and
// the polyline that replaces it (0.02 CSS px: under a tenth of a device
// pixel at scale 3).
const flatness = 0.02

// Outline returns the outline of p stroked with s as a path to fill with
// the non-zero winding rule: width s.Width (0 means 1), dashes applied along
// each sub-path (restarting at each MoveTo), round joins and round caps. A
// closed sub-path is joined at its start, not capped. Points that are NaN or
// infinite are skipped. A sub-path of zero length gives a dot as wide as
// the line.
func Outline(p Path, s LineStyle) Path {
	hw := s.Width / 2
	if !(hw > 0) || math.IsInf(hw, 0) {
		hw = 0.5
	}
	dashes := cleanDashes(s.Dashes)
	var out Path
	for _, sp := range flatten(p) {
		if dashes == nil {
			strokePolyline(&out, sp.pts, sp.closed, hw)
			continue
		}
		pts := sp.pts
		if sp.closed && len(pts) > 1 {
			pts = append(pts, pts[0])
		}
		for _, d := range dash(pts, dashes) {
			strokePolyline(&out, d, false, hw)
		}
	}
	return out
}

// subpath is one flattened sub-path.
type subpath struct {
	pts    []Point
	closed bool
}

func finite(pt Point) bool {
	return !math.IsNaN(pt.X) && !math.IsNaN(pt.Y) && !math.IsInf(pt.X, 0) && !math.IsInf(pt.Y, 0)
}

// flatten turns p into polylines, replacing each cubic by enough straight
// pieces that none strays more than flatness from the curve. Repeated
// points are dropped.
func flatten(p Path) []subpath {
	var subs []subpath
	var cur *subpath
	var last Point
	add := func(pt Point) {
		if cur == nil {
			subs = append(subs, subpath{})
			cur = &subs[len(subs)-1]
			cur.pts = append(cur.pts, last)
		}
		if n := len(cur.pts); n == 0 || cur.pts[n-1] != pt {
			cur.pts = append(cur.pts, pt)
		} else if n == 1 {
			// A zero-length segment still makes the sub-path a dot.
			cur.pts = append(cur.pts, pt)
		}
	}
	for _, seg := range p {
		switch seg.Kind {
		case MoveTo:
			if !finite(seg.Pts[0]) {
				continue
			}
			cur, last = nil, seg.Pts[0]
		case LineTo:
			if finite(seg.Pts[0]) {
				add(seg.Pts[0])
				last = seg.Pts[0]
			}
		case CubeTo:
			if !finite(seg.Pts[0]) || !finite(seg.Pts[1]) || !finite(seg.Pts[2]) {
				continue
			}
			p0, c1, c2, p3 := last, seg.Pts[0], seg.Pts[1], seg.Pts[2]
			n := cubicPieces(p0, c1, c2, p3)
			for i := 1; i <= n; i++ {
				add(cubicAt(p0, c1, c2, p3, float64(i)/float64(n)))
			}
			last = p3
		case Close:
			if cur != nil {
				cur.closed = true
				if n := len(cur.pts); n > 2 && cur.pts[n-1] == cur.pts[0] {
					cur.pts = cur.pts[:n-1]
				}
				last = cur.pts[0]
				cur = nil
			}
		}
	}
	return subs
}

// cubicPieces returns how many equal steps in t keep a cubic within
// flatness of its chords (Wang's bound: n >= sqrt(3/4 * L / tol), L the
// largest second difference of the control points).
func cubicPieces(p0, c1, c2, p3 Point) int {
	d1 := math.Hypot(p0.X-2*c1.X+c2.X, p0.Y-2*c1.Y+c2.Y)
	d2 := math.Hypot(c1.X-2*c2.X+p3.X, c1.Y-2*c2.Y+p3.Y)
	n := math.Ceil(math.Sqrt(0.75 * math.Max(d1, d2) / flatness))
	switch {
	case !(n >= 1):
		return 1
	case n > 1000:
		return 1000
	}
	return int(n)
}

func cubicAt(p0, c1, c2, p3 Point, t float64) Point {
	u := 1 - t
	a, b, c, d := u*u*u, 3*u*u*t, 3*u*t*t, t*t*t
	return Point{a*p0.X + b*c1.X + c*c2.X + d*p3.X, a*p0.Y + b*c1.Y + c*c2.Y + d*p3.Y}
}

// cleanDashes returns an even-length copy of a dash pattern (an odd one is
// repeated, as SVG does), or nil when the pattern cannot be followed: empty,
// a negative, NaN or infinite length, or a total of zero.
func cleanDashes(d []float64) []float64 {
	if len(d) == 0 {
		return nil
	}
	sum := 0.0
	for _, v := range d {
		if !(v >= 0) || math.IsInf(v, 0) {
			return nil
		}
		sum += v
	}
	if !(sum > 0) {
		return nil
	}
	out := append([]float64(nil), d...)
	if len(out)%2 == 1 {
		out = append(out, d...)
	}
	return out
}

// dash cuts a polyline into the "on" pieces of a dash pattern.
func dash(pts []Point, pattern []float64) [][]Point {
	var out [][]Point
	i, left, on := 0, pattern[0], true
	var cur []Point
	if on {
		cur = []Point{pts[0]}
	}
	for k := 1; k < len(pts); k++ {
		a, b := pts[k-1], pts[k]
		segLen := math.Hypot(b.X-a.X, b.Y-a.Y)
		pos := 0.0
		for segLen-pos > left {
			pos += left
			t := pos / segLen
			q := Point{a.X + (b.X-a.X)*t, a.Y + (b.Y-a.Y)*t}
			if on {
				cur = append(cur, q)
				out = append(out, cur)
				cur = nil
			} else {
				cur = []Point{q}
			}
			on = !on
			i = (i + 1) % len(pattern)
			left = pattern[i]
		}
		left -= segLen - pos
		if on {
			cur = append(cur, b)
		}
	}
	if on && len(cur) > 1 {
		out = append(out, cur)
	}
	return out
}

// strokePolyline appends the outline of one polyline to out.
func strokePolyline(out *Path, pts []Point, closed bool, hw float64) {
	if len(pts) == 0 {
		return
	}
	if len(pts) == 1 || allSame(pts) {
		circle(out, pts[0], hw)
		return
	}
	n := len(pts)
	segs := n - 1
	if closed {
		segs = n
	}
	var dirs []Point
	for i := 0; i < segs; i++ {
		a, b := pts[i], pts[(i+1)%n]
		l := math.Hypot(b.X-a.X, b.Y-a.Y)
		if l == 0 {
			continue
		}
		d := Point{(b.X - a.X) / l, (b.Y - a.Y) / l}
		dirs = append(dirs, d)
		// Wound clockwise on screen (positive shoelace area, y down), as
		// polygon winds every other piece.
		nx, ny := -d.Y*hw, d.X*hw
		out.MoveTo(Point{a.X + nx, a.Y + ny})
		out.LineTo(Point{a.X - nx, a.Y - ny})
		out.LineTo(Point{b.X - nx, b.Y - ny})
		out.LineTo(Point{b.X + nx, b.Y + ny})
		out.Close()
	}
	// Joins at inner vertices (and at the start of a closed path).
	k := 0
	for i := 0; i < segs; i++ {
		a, b := pts[i], pts[(i+1)%n]
		if a == b {
			continue
		}
		if k > 0 {
			join(out, a, dirs[k-1], dirs[k], hw)
		}
		k++
	}
	if closed {
		join(out, pts[0], dirs[len(dirs)-1], dirs[0], hw)
		return
	}
	// Round caps: half discs beyond each end.
	d0, d1 := dirs[0], dirs[len(dirs)-1]
	halfDisc(out, pts[0], Point{-d0.X, -d0.Y}, hw)
	halfDisc(out, pts[n-1], d1, hw)
}

func allSame(pts []Point) bool {
	for _, p := range pts[1:] {
		if p != pts[0] {
			return false
		}
	}
	return true
}

// join fills the wedge on the outer side of a turn from direction d0 to d1
// at vertex v with a pie slice of the round join.
func join(out *Path, v, d0, d1 Point, hw float64) {
	cross := d0.X*d1.Y - d0.Y*d1.X
	dot := d0.X*d1.X + d0.Y*d1.Y
	turn := math.Atan2(cross, dot) // radians; + turns clockwise on screen (y down)
	if math.Abs(turn) < 1e-9 {
		return
	}
	// The gap between the two segments' quads is on the side away from the
	// turn: 90 degrees anticlockwise of d0 for a clockwise turn.
	a0 := math.Atan2(d0.Y, d0.X) - math.Copysign(math.Pi/2, turn)
	pie(out, v, hw, a0, turn)
}

// halfDisc fills the half disc of radius r centred on c bulging toward the
// unit direction d: from 90 degrees one side of d round to the other.
func halfDisc(out *Path, c, d Point, r float64) {
	pie(out, c, r, math.Atan2(d.Y, d.X)-math.Pi/2, math.Pi)
}

// pie appends the closed pie slice of the circle (c, r) from angle a0
// (radians, measured from +x toward +y) sweeping by sweep radians.
func pie(out *Path, c Point, r, a0, sweep float64) {
	steps := arcSteps(r, math.Abs(sweep))
	pts := make([]Point, 0, steps+2)
	pts = append(pts, c)
	for i := 0; i <= steps; i++ {
		a := a0 + sweep*float64(i)/float64(steps)
		pts = append(pts, Point{c.X + r*math.Cos(a), c.Y + r*math.Sin(a)})
	}
	polygon(out, pts)
}

// arcSteps returns how many chords approximate an arc of radius r and
// angle sweep (radians) within flatness.
func arcSteps(r, sweep float64) int {
	// A chord over angle a strays r(1-cos(a/2)) from the arc.
	maxA := 2 * math.Acos(math.Max(-1, 1-flatness/r))
	if !(maxA > 0) {
		return 1
	}
	n := int(math.Ceil(sweep / maxA))
	if n < 1 {
		n = 1
	}
	if n > 256 {
		n = 256
	}
	return n
}

// circle appends a full disc as a polygon.
func circle(out *Path, c Point, r float64) {
	steps := max(arcSteps(r, 2*math.Pi), 8)
	pts := make([]Point, steps)
	for i := range pts {
		a := 2 * math.Pi * float64(i) / float64(steps)
		pts[i] = Point{c.X + r*math.Cos(a), c.Y + r*math.Sin(a)}
	}
	polygon(out, pts)
}

// polygon appends a closed polygon wound like the segment quads of
// strokePolyline (positive shoelace area in y-down coordinates, clockwise
// as seen on screen), reversing pts if needed. Every piece of an outline
// winds the same way, so the non-zero rule fills their union with no holes
// where they overlap.
func polygon(out *Path, pts []Point) {
	area := 0.0
	for i := range pts {
		a, b := pts[i], pts[(i+1)%len(pts)]
		area += a.X*b.Y - b.X*a.Y
	}
	if area < 0 {
		for i, j := 0, len(pts)-1; i < j; i, j = i+1, j-1 {
			pts[i], pts[j] = pts[j], pts[i]
		}
	}
	out.MoveTo(pts[0])
	for _, p := range pts[1:] {
		out.LineTo(p)
	}
	out.Close()
}
