package render

import (
	"image/color"
	"math"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// StepSketch draws a small picture of a plan step in the square r: the
// part as the setter sees it from the engine's right-hand side (front to
// the right, as in the motion drawing, so running forward turns the
// wheels clockwise), the part to turn in the accent colour and the way it
// goes:
//
//   - the valve on its spindle between its two nuts, the nut that pushes
//     it filled, an arrow toward the front (right) or the back;
//   - a rod with its lock nut and fork end, the fork filled, an arrow out
//     (longer) or in (shorter);
//   - an eccentric sheave on its axle with the mark scribed across them,
//     turned clockwise (as running forward) or anticlockwise;
//   - the return crank on the crankpin, turned the same way.
func StepSketch(c Canvas, r Rect, s plan.Step, th Theme) {
	u := r.W() / iconSide
	at := func(x, y float64) Point { return Point{(r.Min.X+r.Max.X)/2 + x*u, (r.Min.Y+r.Max.Y)/2 + y*u} }
	part := LineStyle{Color: th.Ink, Width: 3 * u}
	way := LineStyle{Color: th.Accent, Width: 3.5 * u}
	fill := func(p Path, col color.RGBA) { c.Fill(p, FillStyle{Color: col}) }
	box := func(x0, y0, x1, y1 float64) Path { return RectPath(Rect{at(x0, y0), at(x1, y1)}) }
	switch s.Kind {
	case session.ValveOnSpindle:
		dir := math.Copysign(1, s.Amount) // +1: toward the front (right)
		c.Stroke(segment(at(-28, 10), at(28, 10)), part)
		fill(box(-9, 2, 9, 18), th.Ink)
		// The nut behind the way it goes pushes; the other is backed off.
		fill(box(-dir*17, 3, -dir*11, 17), th.Accent)
		c.Stroke(box(dir*15, 3, dir*21, 17), LineStyle{Color: th.Muted, Width: 2 * u})
		arrow(c, at(-dir*16, -12), at(dir*16, -12), way)
	case session.EccentricAngle, session.ReturnCrankAngle:
		cw := s.Amount > 0
		if s.Kind == session.EccentricAngle && s.Eccentric == session.BackwardEccentric {
			cw = !cw
		}
		if s.Kind == session.EccentricAngle {
			c.Stroke(Circle(at(4, 2), 15*u), part)
			c.Stroke(segment(at(4, -13), at(4, -4)), LineStyle{Color: th.Muted, Width: 2 * u}) // the scribed mark
			fill(Circle(at(0, 2), 5*u), th.Ink)
		} else {
			fill(Circle(at(0, 2), 6*u), th.Ink)
			c.Stroke(segment(at(0, 2), at(12, -8)), LineStyle{Color: th.Accent, Width: 4 * u})
			c.Stroke(Circle(at(12, -8), 3.5*u), part)
		}
		turnArrow(c, at(2, 2), 25*u, cw, way)
	default:
		// A rod: its lock nut, then the fork end, pinned; the fork goes
		// out to lengthen and in to shorten.
		c.Stroke(segment(at(-28, 10), at(4, 10)), LineStyle{Color: th.Ink, Width: 4 * u})
		c.Stroke(box(-8, 4, -2, 16), LineStyle{Color: th.Muted, Width: 2 * u})
		var fork Path
		fork.MoveTo(at(26, 3))
		fork.LineTo(at(6, 3))
		fork.LineTo(at(6, 17))
		fork.LineTo(at(26, 17))
		c.Stroke(fork, LineStyle{Color: th.Accent, Width: 3 * u})
		c.Stroke(Circle(at(20, 10), 3*u), part)
		if s.Amount > 0 {
			arrow(c, at(-4, -12), at(26, -12), way)
		} else {
			arrow(c, at(26, -12), at(-4, -12), way)
		}
	}
}

// segment is the path from a to b.
func segment(a, b Point) Path {
	var p Path
	p.MoveTo(a)
	p.LineTo(b)
	return p
}

// arrow strokes a straight arrow from a to b with a filled head at b.
func arrow(c Canvas, a, b Point, s LineStyle) {
	dx, dy := b.X-a.X, b.Y-a.Y
	n := math.Hypot(dx, dy)
	if !(n > 0) {
		return
	}
	ux, uy := dx/n, dy/n
	head := 3 * s.Width
	c.Stroke(segment(a, Point{b.X - ux*head*0.8, b.Y - uy*head*0.8}), s)
	arrowHead(c, b, ux, uy, head, s.Color)
}

// arrowHead fills a head of length h pointing along (ux, uy) with its tip
// at tip.
func arrowHead(c Canvas, tip Point, ux, uy, h float64, col color.RGBA) {
	var p Path
	p.MoveTo(tip)
	p.LineTo(Point{tip.X - ux*h - uy*h*0.6, tip.Y - uy*h + ux*h*0.6})
	p.LineTo(Point{tip.X - ux*h + uy*h*0.6, tip.Y - uy*h - ux*h*0.6})
	p.Close()
	c.Fill(p, FillStyle{Color: col})
}

// turnArrow strokes three quarters of a circle about ctr with a head at
// its end, turning clockwise on screen when cw.
func turnArrow(c Canvas, ctr Point, r float64, cw bool, s LineStyle) {
	start, sweep := -200.0, 250.0
	if !cw {
		start, sweep = 20, -250
	}
	var p Path
	Arc(&p, ctr, r, start, sweep*0.92)
	c.Stroke(p, s)
	end := (start + sweep) * math.Pi / 180
	tip := Point{ctr.X + r*math.Cos(end), ctr.Y + r*math.Sin(end)}
	// Tangent along the sweep.
	sg := math.Copysign(1, sweep)
	ux, uy := -math.Sin(end)*sg, math.Cos(end)*sg
	arrowHead(c, tip, ux, uy, 3*s.Width, s.Color)
}
