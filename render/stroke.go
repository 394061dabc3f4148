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
// per cap. github.com/golang/freetype/raster has a stroker too; measured on
// the piston curve's 181-point polyline (BenchmarkStrokeOwn against
// BenchmarkStrokeFreetype) it is about six times faster and gives half the
// segments, because it offsets the line instead of uniting pieces. It was
// not chosen: it panics on cubic segments, has no dashes and no miter join,
// and works in 26.6 fixed point; and an offset outline needs care where
// short segments turn sharply, which a union of same-wound pieces does not
// (TestOutlineSelfCrossing). At about 0.1 ms per phone-wide curve the union
// is cheap enough.

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
	subs := flatten(p)
	// About 5 segments per quad and 4 per join; dashes add caps, and
	// append grows the rest.
	n := 0
	for _, sp := range subs {
		n += 10*len(sp.pts) + 16
	}
	out := make(Path, 0, n)
	for _, sp := range subs {
		if dashes == nil {
			strokePolyline(&out, sp.pts, sp.closed, hw)
			continue
		}
		pts := sp.pts
		if sp.closed && len(pts) > 1 {
			pts = append(pts[:len(pts):len(pts)], pts[0])
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

// minDashPeriod is the shortest dash pattern followed, in logical units: a
// finer one cannot be seen at any phone scale, and would only multiply the
// pieces.
const minDashPeriod = 0.05

// cleanDashes returns an even-length copy of a dash pattern (an odd one is
// repeated, as SVG does), or nil (solid) when the pattern cannot be
// followed: empty, a negative, NaN or infinite length, or a total under
// minDashPeriod.
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
	if !(sum >= minDashPeriod) {
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

// stroker appends the pieces of one stroke's outline to out.
type stroker struct {
	out  *Path
	hw   float64 // half the line width
	maxA float64 // largest angle (radians) one chord of a round part may span
}

func newStroker(out *Path, hw float64) stroker {
	// A chord over angle a strays hw(1-cos(a/2)) from the arc.
	maxA := 2 * math.Acos(math.Max(-1, 1-flatness/hw))
	if !(maxA > 0) {
		maxA = math.Pi / 2
	}
	return stroker{out: out, hw: hw, maxA: math.Min(maxA, math.Pi/4)}
}

// strokePolyline appends the outline of one polyline to out.
func strokePolyline(out *Path, pts []Point, closed bool, hw float64) {
	k := newStroker(out, hw)
	k.polyline(pts, closed)
}

func (k stroker) polyline(pts []Point, closed bool) {
	if len(pts) == 0 {
		return
	}
	if len(pts) == 1 || allSame(pts) {
		k.pie(pts[0], 0, 2*math.Pi)
		return
	}
	n := len(pts)
	segs := n - 1
	if closed {
		segs = n
	}
	hw := k.hw
	var first, prev Point // unit directions of the first and previous segments
	have := false
	for i := 0; i < segs; i++ {
		a, b := pts[i], pts[(i+1)%n]
		l := math.Hypot(b.X-a.X, b.Y-a.Y)
		if l == 0 {
			continue
		}
		d := Point{(b.X - a.X) / l, (b.Y - a.Y) / l}
		// The quad is wound clockwise on screen (positive shoelace area, y
		// down), as pie winds every round piece.
		nx, ny := -d.Y*hw, d.X*hw
		k.out.MoveTo(Point{a.X + nx, a.Y + ny})
		k.out.LineTo(Point{a.X - nx, a.Y - ny})
		k.out.LineTo(Point{b.X - nx, b.Y - ny})
		k.out.LineTo(Point{b.X + nx, b.Y + ny})
		k.out.Close()
		if have {
			k.join(a, prev, d)
		} else {
			first, have = d, true
		}
		prev = d
	}
	if closed {
		k.join(pts[0], prev, first)
		return
	}
	// Round caps: half discs beyond each end.
	k.pie(pts[0], math.Atan2(-first.Y, -first.X)-math.Pi/2, math.Pi)
	k.pie(pts[n-1], math.Atan2(prev.Y, prev.X)-math.Pi/2, math.Pi)
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
func (k stroker) join(v, d0, d1 Point) {
	cross := d0.X*d1.Y - d0.Y*d1.X
	dot := d0.X*d1.X + d0.Y*d1.Y
	turn := math.Atan2(cross, dot) // radians; + turns clockwise on screen (y down)
	if math.Abs(turn) < 1e-9 {
		return
	}
	// The gap between the two segments' quads is on the side away from the
	// turn: 90 degrees anticlockwise of d0 for a clockwise turn.
	k.pie(v, math.Atan2(d0.Y, d0.X)-math.Copysign(math.Pi/2, turn), turn)
}

// pie appends the closed pie slice of the circle about c of radius hw from
// angle a0 (radians, measured from +x toward +y) sweeping by sweep
// radians; a sweep of a full turn gives a disc. Every piece of an outline
// is wound the same way (positive shoelace area in y-down coordinates,
// clockwise as seen on screen), so the non-zero rule fills their union with
// no holes where they overlap: a negative sweep is emitted backwards.
func (k stroker) pie(c Point, a0, sweep float64) {
	if sweep < 0 {
		a0, sweep = a0+sweep, -sweep
	}
	steps := int(math.Ceil(sweep / k.maxA))
	full := sweep >= 2*math.Pi
	if full {
		steps = max(steps, 8)
	}
	steps = min(max(steps, 1), 256)
	r := k.hw
	at := func(i int) Point {
		s, co := math.Sincos(a0 + sweep*float64(i)/float64(steps))
		return Point{c.X + r*co, c.Y + r*s}
	}
	if full {
		k.out.MoveTo(at(0))
	} else {
		k.out.MoveTo(c)
		k.out.LineTo(at(0))
	}
	for i := 1; i <= steps; i++ {
		k.out.LineTo(at(i))
	}
	k.out.Close()
}
