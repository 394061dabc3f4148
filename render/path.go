package render

import "math"

// Arc appends to p a circular arc of radius r about c, as cubic Béziers of
// at most a quarter turn each (radial error under 0.03 % of r). Angles are
// degrees measured from +x toward +y, which is clockwise on screen because
// y points down; a positive sweep turns clockwise. The arc starts with a
// MoveTo when p is empty or its last sub-path is closed, otherwise with a
// LineTo to the arc's start. A radius or angle that is not finite, or a
// radius that is not positive, appends nothing.
func Arc(p *Path, c Point, r, startDeg, sweepDeg float64) {
	if !(r > 0) || math.IsInf(r, 0) || math.IsNaN(startDeg) || math.IsInf(startDeg, 0) ||
		math.IsNaN(sweepDeg) || math.IsInf(sweepDeg, 0) || !finite(c) {
		return
	}
	a0 := startDeg * math.Pi / 180
	sweep := sweepDeg * math.Pi / 180
	start := Point{c.X + r*math.Cos(a0), c.Y + r*math.Sin(a0)}
	if n := len(*p); n == 0 || (*p)[n-1].Kind == Close {
		p.MoveTo(start)
	} else {
		p.LineTo(start)
	}
	pieces := int(math.Ceil(math.Abs(sweep) / (math.Pi / 2)))
	if pieces == 0 {
		return
	}
	step := sweep / float64(pieces)
	k := 4.0 / 3 * math.Tan(step/4) * r // control-arm length
	for i := 0; i < pieces; i++ {
		t0 := a0 + step*float64(i)
		t1 := t0 + step
		s0, c0 := math.Sincos(t0)
		s1, c1 := math.Sincos(t1)
		p.CubeTo(
			Point{c.X + r*c0 - k*s0, c.Y + r*s0 + k*c0},
			Point{c.X + r*c1 + k*s1, c.Y + r*s1 - k*c1},
			Point{c.X + r*c1, c.Y + r*s1},
		)
	}
}

// Circle returns a closed circle of radius r about c made of four cubic
// arcs.
func Circle(c Point, r float64) Path {
	var p Path
	Arc(&p, c, r, 0, 360)
	if len(p) > 0 {
		p.Close()
	}
	return p
}

// RectPath returns the closed outline of r, clockwise on screen.
func RectPath(r Rect) Path {
	var p Path
	p.MoveTo(r.Min)
	p.LineTo(Point{r.Max.X, r.Min.Y})
	p.LineTo(r.Max)
	p.LineTo(Point{r.Min.X, r.Max.Y})
	p.Close()
	return p
}

// RoundRect returns the closed outline of r with corners rounded to radius
// (clamped to half the shorter side), clockwise on screen.
func RoundRect(r Rect, radius float64) Path {
	radius = math.Min(radius, math.Min(r.W(), r.H())/2)
	if !(radius > 0) {
		return RectPath(r)
	}
	var p Path
	p.MoveTo(Point{r.Min.X + radius, r.Min.Y})
	Arc(&p, Point{r.Max.X - radius, r.Min.Y + radius}, radius, -90, 90)
	Arc(&p, Point{r.Max.X - radius, r.Max.Y - radius}, radius, 0, 90)
	Arc(&p, Point{r.Min.X + radius, r.Max.Y - radius}, radius, 90, 90)
	Arc(&p, Point{r.Min.X + radius, r.Min.Y + radius}, radius, 180, 90)
	p.Close()
	return p
}

// Inset returns r shrunk by d on every side (grown when d is negative).
func (r Rect) Inset(d float64) Rect {
	return Rect{Point{r.Min.X + d, r.Min.Y + d}, Point{r.Max.X - d, r.Max.Y - d}}
}

// Contains reports whether pt lies in r, edges included.
func (r Rect) Contains(pt Point) bool {
	return pt.X >= r.Min.X && pt.X <= r.Max.X && pt.Y >= r.Min.Y && pt.Y <= r.Max.Y
}

// ContainsRect reports whether s lies wholly inside r, edges included.
func (r Rect) ContainsRect(s Rect) bool {
	return r.Contains(s.Min) && r.Contains(s.Max)
}

// Overlaps reports whether r and s share any area (touching edges do not
// count).
func (r Rect) Overlaps(s Rect) bool {
	return r.Min.X < s.Max.X && s.Min.X < r.Max.X && r.Min.Y < s.Max.Y && s.Min.Y < r.Max.Y
}

// usable reports whether a diagram can be laid out in r: finite corners and
// a positive width and height. Diagrams given anything else draw nothing.
func usable(r Rect) bool {
	return finite(r.Min) && finite(r.Max) && r.W() > 0 && r.H() > 0
}
