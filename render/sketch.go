package render

import "math"

// Set-up sketches: small schematic drawings, one per set-up value, that
// show the setter which part the value belongs to and between which points
// it is taken. They are not to scale and take no figures from the engine:
// each is drawn in a fixed design frame and scaled, aspect kept, into the
// box it is given.

// Smallest box a sketch is drawn in, in logical units. A smaller box draws
// nothing: the one-line label (14 units, the smallest text a phone reader
// is given) would leave no room for the drawing.
const (
	SketchMinW = 120 // narrowest box DimensionSketch draws in
	SketchMinH = 80  // shortest box DimensionSketch draws in
)

// The design frame every sketch is drawn in: sketchW by sketchH design
// units, y down. Its aspect suits the boxes of the set-up screens (120x80
// up to 390x200 less the label row).
const (
	sketchW = 220
	sketchH = 100
	// sketchPad is the margin, in logical units, kept clear round the
	// frame for what reaches past a design point: stroke half-widths,
	// pins, arrowheads.
	sketchPad = 6
	// sketchHead is the length of a dimension arrowhead in logical units.
	sketchHead = 7
)

// DimensionSketch draws, inside box, a small schematic of what the set-up
// value named by key is and where to measure it; it returns false (and
// draws nothing) for a key it has no sketch for. key is the value's path in
// the session file ("engine.engine.crank_radius",
// "engine.valve.front.steam_lap", "measuring.wheel_diameter_mm",
// "engine.gear.stephenson.link.radius", ...). The drawing keeps its aspect
// and is centred in box above a one-line label in workshop words, which
// wraps in a narrow box; the part is drawn in the theme's ink and muted
// colours and the measured distance or angle as a dimension in its accent
// colour. A box smaller than SketchMinW by SketchMinH, or not finite,
// draws nothing and still returns true for a known key, so a screen can
// ask with the zero Rect whether to make room for a sketch.
func DimensionSketch(c Canvas, box Rect, key string, th Theme) bool {
	label, draw, ok := sketchFor(key)
	if !ok {
		return false
	}
	if !usable(box) || box.W() < SketchMinW || box.H() < SketchMinH {
		return true
	}
	l := layoutSketch(box, label)
	c.Fill(RoundRect(box, gap), FillStyle{Color: th.Surface})
	// Lines, pins and arrowheads thin down a little in a small box, so
	// they do not crowd the drawing.
	u := math.Max(0.7, math.Min(1, l.scale/0.9))
	draw(sketch{c: c, th: th, o: l.origin, k: l.scale, u: u})
	st := TextStyle{Color: th.Accent, Size: BodySize, HAlign: Center, VAlign: Top}
	mid := (box.Min.X + box.Max.X) / 2
	for i, ln := range l.label {
		c.Text(Point{mid, l.labelY + float64(i)*lineStep(BodySize)}, ln, st)
	}
	return true
}

// sketchLayout is where a sketch's drawing and label go in its box.
type sketchLayout struct {
	origin Point   // where the design frame's top-left lands
	scale  float64 // logical units per design unit
	label  []string
	labelY float64 // top of the label's first line
}

// layoutSketch fits the design frame, aspect kept, into box above the
// wrapped label, centred across and down the room left.
func layoutSketch(box Rect, label string) sketchLayout {
	var l sketchLayout
	in := box.Inset(sketchPad)
	// Text reaches no further than its box, so the label may use all
	// but a hair of the box's width.
	l.label = Wrap(label, box.W()-2, BodySize, false)
	l.labelY = in.Max.Y - float64(len(l.label))*lineStep(BodySize)
	room := Rect{in.Min, Point{in.Max.X, l.labelY - sketchPad}}
	l.scale = math.Max(0, math.Min(room.W()/sketchW, room.H()/sketchH))
	l.origin = Point{
		(room.Min.X + room.Max.X - sketchW*l.scale) / 2,
		(room.Min.Y + room.Max.Y - sketchH*l.scale) / 2,
	}
	return l
}

// sketchEntry ties a set-up value's full path in the session file to its
// label and drawing.
type sketchEntry struct {
	key, label string
	draw       func(sketch)
}

// sketchTable lists every set-up value that has a sketch. Keys are matched
// whole, so a longer or shorter path never borrows another value's sketch.
func sketchTable() []sketchEntry {
	eccentric := func(path string, forward bool) []sketchEntry {
		return []sketchEntry{
			{path + ".throw", "centre to centre", sketch.eccentricThrow},
			{path + ".advance", "angle of advance", func(s sketch) { s.eccentricAdvance(forward) }},
			{path + ".rod", "centre to pin", sketch.eccentricRod},
		}
	}
	valve := func(end string, front bool) []sketchEntry {
		return []sketchEntry{
			{"engine.valve." + end + ".steam_lap", "valve central", func(s sketch) { s.valveLap(front, true) }},
			{"engine.valve." + end + ".exhaust_lap", "valve central", func(s sketch) { s.valveLap(front, false) }},
			{"engine.valve." + end + ".port_width", "edge to edge", func(s sketch) { s.portWidth(front) }},
		}
	}
	const st, wa = "engine.gear.stephenson.", "engine.gear.walschaerts."
	t := []sketchEntry{
		{"engine.engine.crank_radius", "stroke / 2", sketch.crankRadius},
		{"engine.engine.rod_length", "centre to centre", sketch.rodLength},
		{"engine.engine.offset", "to cylinder line", sketch.cylinderOffset},
		{"measuring.wheel_diameter_mm", "on the tread", sketch.wheelDiameter},
		{"measuring.gauge_increases", "valve forward: plunger in, reading up", sketch.gaugePlunger},
		{st + "link.radius", "to slot centre line", func(s sketch) { s.linkRadius(false) }},
		{st + "link.pin_spacing", "pin to pin, straight", sketch.linkPinSpacing},
		{st + "lifting_link", "centre to centre", func(s sketch) { s.reverser(false) }},
		{st + "reverse_arm", "shaft centre to pin", func(s sketch) { s.reverser(true) }},
		{wa + "return_crank", "crank pin to pin", func(s sketch) { s.returnCrank(false) }},
		{wa + "return_angle", "from crank line", func(s sketch) { s.returnCrank(true) }},
		{wa + "eccentric_rod", "centre to centre", sketch.walschaertsRod},
		{wa + "link_radius", "to slot centre line", func(s sketch) { s.linkRadius(true) }},
		{wa + "radius_rod", "die centre to pin", sketch.radiusRod},
		{wa + "lever.valve_pin", "along the lever", func(s sketch) { s.lever(false) }},
		{wa + "lever.union_pin", "along the lever", func(s sketch) { s.lever(true) }},
		{wa + "union_link", "centre to centre", sketch.unionLink},
	}
	t = append(t, valve("front", true)...)
	t = append(t, valve("back", false)...)
	t = append(t, eccentric("engine.gear.single_eccentric.eccentric", true)...)
	t = append(t, eccentric(st+"forward", true)...)
	return append(t, eccentric(st+"backward", false)...)
}

// sketchFor returns the label and drawing of the set-up value at key.
func sketchFor(key string) (label string, draw func(sketch), ok bool) {
	for _, e := range sketchTable() {
		if e.key == key {
			return e.label, e.draw, true
		}
	}
	return "", nil, false
}

// sketch draws in a design frame placed on the canvas: design point p
// lands at o + k*p. Line widths, pin sizes and arrowheads are in logical
// units times u (0.7 to 1).
type sketch struct {
	c  Canvas
	th Theme
	o  Point
	k  float64
	u  float64
}

// at maps a design point onto the canvas.
func (s sketch) at(p Point) Point { return Point{s.o.X + p.X*s.k, s.o.Y + p.Y*s.k} }

// polar returns the design point r from c at deg degrees (clockwise on
// screen from +x, as Arc).
func polar(c Point, r, deg float64) Point {
	sn, cs := math.Sincos(deg * math.Pi / 180)
	return Point{c.X + r*cs, c.Y + r*sn}
}

// line strokes the polyline through design points pts.
func (s sketch) line(st LineStyle, pts ...Point) {
	var p Path
	for i, q := range pts {
		if i == 0 {
			p.MoveTo(s.at(q))
		} else {
			p.LineTo(s.at(q))
		}
	}
	s.c.Stroke(p, st)
}

// Styles of a sketch's parts.
func (s sketch) heavy() LineStyle { return LineStyle{Color: s.th.Ink, Width: 4.5 * s.u} }
func (s sketch) part() LineStyle  { return LineStyle{Color: s.th.Ink, Width: 3 * s.u} }
func (s sketch) other() LineStyle { return LineStyle{Color: s.th.Muted, Width: 2.5 * s.u} }
func (s sketch) thin() LineStyle  { return LineStyle{Color: s.th.Muted, Width: 1.25 * s.u} }

// centreLine is the dash-dot line the trade draws through centres.
func (s sketch) centreLine() LineStyle {
	return LineStyle{Color: s.th.Muted, Width: 1, Dashes: []float64{9, 3, 2, 3}}
}

// circle strokes a circle of design radius r about c.
func (s sketch) circle(c Point, r float64, st LineStyle) {
	s.c.Stroke(Circle(s.at(c), r*s.k), st)
}

// rect fills (and outlines in ink) the design rectangle r.
func (s sketch) rect(r Rect, fill bool) {
	p := RectPath(Rect{s.at(r.Min), s.at(r.Max)})
	if fill {
		s.c.Fill(p, FillStyle{Color: tint(s.th.Muted, 0.35)})
	}
	s.c.Stroke(p, LineStyle{Color: s.th.Ink, Width: 1.5 * s.u})
}

// pin draws a moving joint: a ring.
func (s sketch) pin(p Point) {
	c := Circle(s.at(p), 3.5*s.u)
	s.c.Fill(c, FillStyle{Color: s.th.Surface})
	s.c.Stroke(c, LineStyle{Color: s.th.Ink, Width: 1.5 * s.u})
}

// fixed draws a centre fixed to the frame (axle, shaft, trunnion): a solid
// dot in a ring.
func (s sketch) fixed(p Point) {
	c := Circle(s.at(p), 4.5*s.u)
	s.c.Fill(c, FillStyle{Color: s.th.Surface})
	s.c.Stroke(c, LineStyle{Color: s.th.Ink, Width: 1.5 * s.u})
	s.c.Fill(Circle(s.at(p), 2*s.u), FillStyle{Color: s.th.Ink})
}

// rod draws a bar between two joints with a pin at each end.
func (s sketch) rod(a, b Point) {
	s.line(s.part(), a, b)
	s.pin(a)
	s.pin(b)
}

// centreMark draws a small cross at a centre that is not a part (a
// sheave's centre, a link's centre of curvature).
func (s sketch) centreMark(p Point) {
	q, d := s.at(p), 4*s.u
	var m Path
	m.MoveTo(Point{q.X - d, q.Y})
	m.LineTo(Point{q.X + d, q.Y})
	m.MoveTo(Point{q.X, q.Y - d})
	m.LineTo(Point{q.X, q.Y + d})
	s.c.Stroke(m, LineStyle{Color: s.th.Ink, Width: 1.5 * s.u})
}

// dimStyle is the dimension line; extStyle its extension lines.
func (s sketch) dimStyle() LineStyle { return LineStyle{Color: s.th.Accent, Width: 1.75 * s.u} }
func (s sketch) extStyle() LineStyle { return LineStyle{Color: s.th.Accent, Width: s.u} }

// head is the length of an arrowhead in logical units.
func (s sketch) head() float64 { return sketchHead * s.u }

// dim draws the distance from a to b (design points) as a dimension line
// parallel to a->b, off design units to its left on screen (up for a
// rightward line), with extension lines from a and b when off is not
// zero. A dimension too short for two arrowheads between its ends has them
// outside, pointing in, as on a workshop drawing.
func (s sketch) dim(a, b Point, off float64) {
	dx, dy := b.X-a.X, b.Y-a.Y
	n := math.Hypot(dx, dy)
	if !(n > 0) {
		return
	}
	ux, uy := dx/n, dy/n
	nx, ny := uy, -ux // left of a->b on screen
	pa := Point{a.X + nx*off, a.Y + ny*off}
	pb := Point{b.X + nx*off, b.Y + ny*off}
	if off != 0 {
		sg := math.Copysign(1, off)
		clear, over := 2*sg, 3*sg
		for _, q := range []Point{a, b} {
			s.line(s.extStyle(), Point{q.X + nx*clear, q.Y + ny*clear}, Point{q.X + nx*(off+over), q.Y + ny*(off+over)})
		}
	}
	s.arrows(s.at(pa), s.at(pb))
}

// arrows draws a dimension line between logical points a and b with a head
// at each end: inside when there is room, else outside pointing in.
func (s sketch) arrows(a, b Point) {
	dx, dy := b.X-a.X, b.Y-a.Y
	n := math.Hypot(dx, dy)
	if !(n > 0) {
		return
	}
	ux, uy := dx/n, dy/n
	h := s.head()
	var p Path
	if n >= 2*h+4 {
		p.MoveTo(Point{a.X + ux*h*0.8, a.Y + uy*h*0.8})
		p.LineTo(Point{b.X - ux*h*0.8, b.Y - uy*h*0.8})
		s.c.Stroke(p, s.dimStyle())
		arrowHead(s.c, a, -ux, -uy, h, s.th.Accent)
		arrowHead(s.c, b, ux, uy, h, s.th.Accent)
		return
	}
	tail := h + 8*s.u
	ta, tb := s.reach(a, -ux, -uy, tail), s.reach(b, ux, uy, tail)
	p.MoveTo(Point{a.X - ux*ta, a.Y - uy*ta})
	p.LineTo(Point{b.X + ux*tb, b.Y + uy*tb})
	s.c.Stroke(p, s.dimStyle())
	arrowHead(s.c, a, ux, uy, h, s.th.Accent)
	arrowHead(s.c, b, -ux, -uy, h, s.th.Accent)
}

// reach returns how far, up to most, a line may run from the logical point
// p along (ux, uy) and stay within the design frame and its margin, so a
// dimension's outside tails never leave the box however small the drawing.
func (s sketch) reach(p Point, ux, uy, most float64) float64 {
	m := float64(sketchPad - 1)
	lo := Point{s.o.X - m, s.o.Y - m}
	hi := Point{s.o.X + sketchW*s.k + m, s.o.Y + sketchH*s.k + m}
	t := most
	for _, ax := range [][3]float64{{p.X, ux, lo.X}, {p.X, ux, hi.X}, {p.Y, uy, lo.Y}, {p.Y, uy, hi.Y}} {
		if d := (ax[2] - ax[0]) / ax[1]; ax[1] != 0 && d >= 0 {
			t = math.Min(t, d)
		}
	}
	return math.Max(0, t)
}

// radius draws a radius dimension from the centre c to the point on the
// arc at end (design points): a line with one head, on the arc.
func (s sketch) radius(c, end Point) {
	a, b := s.at(c), s.at(end)
	dx, dy := b.X-a.X, b.Y-a.Y
	n := math.Hypot(dx, dy)
	if !(n > 0) {
		return
	}
	ux, uy := dx/n, dy/n
	var p Path
	h := s.head()
	p.MoveTo(a)
	p.LineTo(Point{b.X - ux*h*0.8, b.Y - uy*h*0.8})
	s.c.Stroke(p, s.dimStyle())
	arrowHead(s.c, b, ux, uy, h, s.th.Accent)
}

// angle draws an angle about the design point c as an arc of design
// radius r from fromDeg turning sweepDeg (clockwise on screen when
// positive), with a head at each end: inside when the arc has room, else
// outside pointing in.
func (s sketch) angle(c Point, r, fromDeg, sweepDeg float64) {
	ctr, rr := s.at(c), r*s.k
	if !(rr > 0) || sweepDeg == 0 {
		return
	}
	h := s.head()
	sg := math.Copysign(1, sweepDeg)
	toDeg := fromDeg + sweepDeg
	length := math.Abs(sweepDeg) * math.Pi / 180 * rr
	// tangent returns the unit direction of increasing angle at deg.
	tangent := func(deg float64) (float64, float64) {
		sn, cs := math.Sincos(deg * math.Pi / 180)
		return -sn * sg, cs * sg
	}
	tip := func(deg float64) Point { return polar(ctr, rr, deg) }
	var p Path
	t0x, t0y := tangent(fromDeg)
	t1x, t1y := tangent(toDeg)
	if length >= 2*h+4 {
		trim := h * 0.8 / rr * 180 / math.Pi * sg
		Arc(&p, ctr, rr, fromDeg+trim, sweepDeg-2*trim)
		s.c.Stroke(p, s.dimStyle())
		arrowHead(s.c, tip(fromDeg), -t0x, -t0y, h, s.th.Accent)
		arrowHead(s.c, tip(toDeg), t1x, t1y, h, s.th.Accent)
		return
	}
	tail := (h + 8) / rr * 180 / math.Pi * sg
	Arc(&p, ctr, rr, fromDeg-tail, sweepDeg+2*tail)
	s.c.Stroke(p, s.dimStyle())
	arrowHead(s.c, tip(fromDeg), t0x, t0y, h, s.th.Accent)
	arrowHead(s.c, tip(toDeg), -t1x, -t1y, h, s.th.Accent)
}

// crankRadius: the crank, axle centre to crank-pin centre, half the
// piston's stroke.
func (s sketch) crankRadius() {
	a := Point{80, 52}
	s.line(s.centreLine(), Point{a.X - 50, a.Y}, Point{215, a.Y})
	p := s.crank(a, 40, -40)
	s.dim(a, p, 16)
}

// crank draws the crank turning about the axle at a: its circle dashed,
// the arm to the crank pin r away at deg, the axle and the pin. It returns
// the pin.
func (s sketch) crank(a Point, r, deg float64) Point {
	p := polar(a, r, deg)
	s.circle(a, r, s.centreLine())
	s.line(s.heavy(), a, p)
	s.fixed(a)
	s.pin(p)
	return p
}

// rodLength: the connecting rod, crank-pin centre to crosshead-pin centre.
func (s sketch) rodLength() {
	x := Point{180, 62}
	s.line(s.other(), Point{148, 52}, Point{215, 52})
	s.line(s.other(), Point{148, 72}, Point{215, 72})
	s.rect(Rect{Point{168, 54}, Point{192, 70}}, true)
	p := s.crank(Point{35, 62}, 22, -60)
	s.rod(p, x)
	s.dim(p, x, 18)
}

// cylinderOffset: the height of the cylinder line above the axle centre,
// square to the line.
func (s sketch) cylinderOffset() {
	a := Point{50, 78}
	foot := Point{a.X, 28}
	s.line(s.centreLine(), Point{8, 28}, Point{215, 28})
	s.line(s.centreLine(), Point{8, a.Y}, Point{120, a.Y})
	s.rect(Rect{Point{140, 10}, Point{210, 46}}, true)
	s.circle(a, 16, s.thin())
	s.fixed(a)
	s.dim(a, foot, -50)
}

// valveFace is the design of the valve sketches: a port face with three
// ports (back, exhaust, front) and a slide valve sitting central on it.
// Screen right is the front (cover) end, as in the motion drawing.
type valveFace struct {
	face         float64    // y of the port face
	bottom       float64    // y of the block's underside
	back, front  [2]float64 // port edges, back to front
	outer, inner [2]float64 // valve's steam edges and cavity edges, back to front
}

// sketchValveFace returns the one valve design all valve sketches share.
func sketchValveFace() valveFace {
	return valveFace{
		face: 56, bottom: 84,
		back: [2]float64{50, 74}, front: [2]float64{146, 170},
		outer: [2]float64{36, 184}, inner: [2]float64{82, 138},
	}
}

// drawValveFace draws the block with its ports cut through, then the
// valve on the face.
func (s sketch) drawValveFace(v valveFace) {
	s.rect(Rect{Point{10, v.face}, Point{210, v.bottom}}, true)
	for _, port := range [][2]float64{v.back, {98, 122}, v.front} {
		s.c.Fill(RectPath(Rect{s.at(Point{port[0], v.face}), s.at(Point{port[1], v.bottom})}), FillStyle{Color: s.th.Surface})
	}
	var body Path
	for i, q := range []Point{
		{v.outer[0], v.face}, {v.outer[0], 26}, {v.outer[1], 26}, {v.outer[1], v.face},
		{v.inner[1], v.face}, {v.inner[1], 40}, {v.inner[0], 40}, {v.inner[0], v.face},
	} {
		if i == 0 {
			body.MoveTo(s.at(q))
		} else {
			body.LineTo(s.at(q))
		}
	}
	body.Close()
	s.c.Fill(body, FillStyle{Color: s.th.Muted})
	s.c.Stroke(body, LineStyle{Color: s.th.Ink, Width: 1.5})
}

// valveLap: with the valve central, the overlap of its steam edge past
// the port's outer edge (steam lap) or of its cavity edge past the port's
// inner edge (exhaust lap), at the front (right) or back end.
func (s sketch) valveLap(front, steam bool) {
	v := sketchValveFace()
	s.drawValveFace(v)
	const up = 44 // dimension line at y = 12
	switch {
	case steam && front:
		s.dim(Point{v.front[1], v.face}, Point{v.outer[1], v.face}, up)
	case steam:
		s.dim(Point{v.outer[0], v.face}, Point{v.back[0], v.face}, up)
	case front:
		s.dim(Point{v.inner[1], v.face}, Point{v.front[0], v.face}, up)
	default:
		s.dim(Point{v.back[1], v.face}, Point{v.inner[0], v.face}, up)
	}
}

// portWidth: the port's width along the face, edge to edge.
func (s sketch) portWidth(front bool) {
	v := sketchValveFace()
	s.drawValveFace(v)
	port := v.back
	if front {
		port = v.front
	}
	s.dim(Point{port[0], v.bottom}, Point{port[1], v.bottom}, -10)
}

// wheelDiameter: the wheel's diameter on the tread, where it runs on the
// rail, not over the flange.
func (s sketch) wheelDiameter() {
	c := Point{110, 48}
	const tread, flange = 42, 48
	s.rect(Rect{Point{52, c.Y + tread}, Point{168, 99}}, true)
	s.circle(c, flange, s.thin())
	for a := 0.0; a < 360; a += 60 {
		s.line(s.thin(), polar(c, 6, a+30), polar(c, 34, a+30))
	}
	s.circle(c, 34, s.thin())
	s.circle(c, tread, LineStyle{Color: s.th.Ink, Width: 3.5})
	s.fixed(c)
	s.dim(Point{c.X - tread, c.Y}, Point{c.X + tread, c.Y}, 0)
}

// sheave draws an eccentric sheave about sc in its strap, on the axle at
// a, with the rod from the strap to the pin at end and the centre line on
// from the sheave's centre.
func (s sketch) sheave(a, sc Point, r float64, end Point) {
	strap := r + 6
	s.circle(sc, strap, s.thin())
	s.circle(sc, r, s.part())
	s.line(s.centreLine(), sc, end)
	if d := math.Hypot(end.X-sc.X, end.Y-sc.Y); d > strap {
		s.line(s.part(), Point{sc.X + (end.X-sc.X)*strap/d, sc.Y + (end.Y-sc.Y)*strap/d}, end)
	}
	s.fixed(a)
	s.centreMark(sc)
	s.pin(end)
}

// eccentricThrow: axle centre to sheave centre.
func (s sketch) eccentricThrow() {
	a := Point{70, 62}
	sc := polar(a, 30, -35)
	s.sheave(a, sc, 34, Point{205, sc.Y})
	s.dim(a, sc, 0)
}

// eccentricRod: sheave centre to the pin at the rod's far end.
func (s sketch) eccentricRod() {
	sc := Point{50, 56}
	s.sheave(Point{40, 64}, sc, 30, Point{200, sc.Y})
	s.dim(sc, Point{200, sc.Y}, 46)
}

// eccentricAdvance: the crank at front dead centre (pointing at the
// cylinder, screen right), the position 90 degrees from it in the running
// direction, and the sheave centre's line ahead of that by the angle of
// advance. Forward running turns the wheel clockwise on screen; the
// backward eccentric is drawn for back running, the other way.
func (s sketch) eccentricAdvance(forward bool) {
	sg := 1.0
	if !forward {
		sg = -1
	}
	a := Point{100, 50}
	const arm, adv = 46, 30
	s.line(s.heavy(), a, Point{190, a.Y})
	s.pin(Point{190, a.Y})
	s.line(s.centreLine(), a, polar(a, arm, sg*90))
	// Right-angle mark between the crank and the 90-degree line.
	q := 9.0
	s.line(s.thin(), polar(a, q, 0), Point{a.X + q, a.Y + sg*q}, polar(a, q, sg*90))
	sc := polar(a, arm, sg*(90+adv))
	s.line(s.part(), a, sc)
	s.centreMark(sc)
	s.fixed(a)
	s.angle(a, 36, sg*90, sg*adv)
}

// expansionLink draws the link's band about its slot's centre line, an arc
// of design radius r about o between angles from and from+sweep.
func (s sketch) expansionLink(o Point, r, from, sweep float64) {
	half := 8.0
	var band Path
	Arc(&band, s.at(o), (r+half)*s.k, from, sweep)
	Arc(&band, s.at(o), (r-half)*s.k, from+sweep, -sweep)
	band.Close()
	s.c.Fill(band, FillStyle{Color: tint(s.th.Muted, 0.35)})
	s.c.Stroke(band, LineStyle{Color: s.th.Ink, Width: 1.5})
	var slot Path
	Arc(&slot, s.at(o), r*s.k, from, sweep)
	s.c.Stroke(slot, s.centreLine())
}

// linkRadius: the radius of the slot's centre line from its centre of
// curvature. Stephenson's centre lies behind the link (toward the axle,
// screen left); Walschaerts' lies forward (toward the lever, screen right).
func (s sketch) linkRadius(centreForward bool) {
	o, dir := Point{30, 50}, 0.0
	if centreForward {
		o, dir = Point{190, 50}, 180
	}
	const r = 160
	s.expansionLink(o, r, dir-17, 34)
	s.line(s.centreLine(), o, polar(o, r-20, dir))
	s.centreMark(o)
	s.radius(o, polar(o, r, dir-8))
}

// linkPinSpacing: the straight distance between the eccentric-rod pins,
// both on the slot's centre line.
func (s sketch) linkPinSpacing() {
	o := Point{30, 50}
	const r = 160
	s.expansionLink(o, r, -17, 34)
	p1, p2 := polar(o, r, -13), polar(o, r, 13)
	s.line(s.other(), Point{60, 22}, p1)
	s.line(s.other(), Point{60, 78}, p2)
	s.pin(p1)
	s.pin(p2)
	s.dim(p1, p2, 18)
}

// reverser: the reverse arm from the weighshaft to the lifting-link pin,
// and the lifting link from that pin down to the expansion link's
// suspension pin. arm picks which of the two is dimensioned.
func (s sketch) reverser(arm bool) {
	w, q, l := Point{50, 36}, Point{115, 22}, Point{150, 74}
	s.rect(Rect{Point{143, 50}, Point{157, 98}}, true)
	s.line(s.heavy(), w, q)
	s.fixed(w)
	s.rod(q, l)
	if arm {
		s.dim(w, q, 14)
		return
	}
	s.dim(q, l, 16)
}

// returnCrank: the main crank and the return crank on its pin. With angle
// false the return crank's length, crank-pin centre to its pin; with angle
// true the angle from the crank line (axle to crank pin, carried on past
// the pin) to the return crank, in the forward running sense (clockwise on
// screen).
func (s sketch) returnCrank(angle bool) {
	const crankDeg, ret = -30, 140
	a := Point{50, 60}
	r := polar(polar(a, 36, crankDeg), 30, crankDeg+ret)
	s.line(s.other(), r, Point{205, r.Y})
	p := s.crank(a, 36, crankDeg)
	s.rod(p, r)
	if angle {
		s.line(s.centreLine(), p, polar(p, 44, crankDeg))
		s.angle(p, 22, crankDeg, ret)
		return
	}
	s.dim(p, r, -12)
}

// walschaertsRod: the eccentric rod, return-crank pin to the link-foot pin
// below the link's trunnion.
func (s sketch) walschaertsRod() {
	t, f := Point{180, 34}, Point{180, 86}
	s.rect(Rect{Point{173, 6}, Point{187, 62}}, true)
	s.line(s.part(), t, f)
	p := s.crank(Point{30, 64}, 22, -50)
	r := polar(p, 16, -140)
	s.rod(p, r)
	s.rod(r, f)
	s.fixed(t)
	s.dim(r, f, 16)
}

// radiusRod: the radius rod, die-block centre in the link's slot to the
// combination lever's radius-rod pin.
func (s sketch) radiusRod() {
	d, q := Point{40, 36}, Point{170, 30}
	s.rect(Rect{Point{33, 8}, Point{47, 92}}, true)
	s.c.Fill(RectPath(Rect{s.at(Point{34, 30}), s.at(Point{46, 42})}), FillStyle{Color: s.th.Ink})
	s.line(s.other(), Point{170, 44}, Point{215, 44})
	s.line(s.part(), q, Point{170, 94})
	s.rod(d, q)
	s.pin(Point{170, 44})
	s.dim(d, q, 14)
}

// lever: the combination lever hanging from the valve-spindle pin, the
// radius-rod pin at its top and the union-link pin at its foot; the
// distance along it from the radius-rod pin to the spindle pin or to the
// union-link pin.
func (s sketch) lever(union bool) {
	q, v, u := Point{120, 34}, Point{120, 60}, Point{120, 94}
	s.line(s.other(), Point{20, q.Y}, q)
	s.line(s.other(), v, Point{215, v.Y})
	s.line(s.other(), u, Point{205, u.Y})
	s.line(s.part(), q, u)
	s.pin(q)
	s.pin(v)
	s.pin(u)
	if union {
		s.dim(q, u, -22)
		return
	}
	s.dim(q, v, -22)
}

// unionLink: the union link, the crosshead arm's pin to the lever's
// union-link pin.
func (s sketch) unionLink() {
	c, u := Point{80, 82}, Point{180, 82}
	s.line(s.other(), Point{10, 12}, Point{140, 12})
	s.line(s.other(), Point{10, 36}, Point{140, 36})
	s.rect(Rect{Point{56, 14}, Point{104, 34}}, true)
	s.line(s.heavy(), Point{80, 34}, c)
	s.line(s.part(), Point{180, 8}, u)
	s.rod(c, u)
	s.dim(c, u, -12)
}

// gaugePlunger: a dial gauge mounted ahead of the valve spindle's end,
// its plunger on the end (the front cover to the right, as in every
// drawing here): the valve moving forward pushes the plunger in, and a
// dial gauge's reading grows as its plunger goes in.
func (s sketch) gaugePlunger() {
	const y = 56.0
	gauge := Point{178, y}
	s.line(s.heavy(), Point{12, y}, Point{118, y})         // the valve spindle
	s.line(s.part(), Point{118, y - 9}, Point{118, y + 9}) // its end
	s.line(s.other(), Point{121, y}, Point{gauge.X - 26, y})
	s.rect(Rect{Point{gauge.X - 27, y - 5}, Point{gauge.X - 21, y + 5}}, true) // the stem
	s.circle(gauge, 21, s.part())
	s.circle(gauge, 16, s.thin())
	s.line(s.part(), gauge, polar(gauge, 14, -60)) // the needle
	s.fixed(gauge)
	// The valve's way and the plunger's, in the accent colour.
	push := func(from, to Point) {
		a, b := s.at(from), s.at(to)
		var p Path
		p.MoveTo(a)
		p.LineTo(b)
		s.c.Stroke(p, s.dimStyle())
		n := math.Hypot(b.X-a.X, b.Y-a.Y)
		arrowHead(s.c, b, (b.X-a.X)/n, (b.Y-a.Y)/n, s.head(), s.th.Accent)
	}
	push(Point{40, y - 22}, Point{100, y - 22})
	push(Point{150, y + 22}, Point{126, y + 22})
	s.line(s.centreLine(), polar(gauge, 26, -90), polar(gauge, 12, -90))
}
