package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
)

// PortState is what a port is open to at one instant.
type PortState uint8

// Port states. Drawn by pattern as well as colour: open to steam a solid
// warm fill, open to exhaust hatched, closed left empty.
const (
	Closed PortState = iota
	OpenToSteam
	OpenToExhaust
)

// String names the state for labels.
func (s PortState) String() string {
	switch s {
	case OpenToSteam:
		return "steam"
	case OpenToExhaust:
		return "exhaust"
	}
	return "closed"
}

// PortStateAt returns what the given end's port is open to with the valve
// at displacement x (mm, + toward the front cover).
func PortStateAt(v setting.Valve, end setting.CylinderEnd, x float64) PortState {
	if v.SteamOpening(end, x) > 0 {
		return OpenToSteam
	}
	if v.ExhaustOpening(end, x) > 0 {
		return OpenToExhaust
	}
	return Closed
}

// MotionGeometry is the scale drawing's frame for a model: the reach of
// every joint over a turn in every position, and the cylinder drawn ahead
// of it, all in mm in the cylinder-line frame (u forward, w up). It is
// worked out once per model (see Model.Geometry), so frames share one scale.
type MotionGeometry struct {
	Min, Max     setting.Point // the box every part stays in
	CylBack      float64       // u of the cylinder's back cover (inside face)
	CylFront     float64       // u of the front cover (inside face)
	Bore         float64       // cylinder bore as drawn
	PistonOffset float64       // piston centre u minus crosshead u
	PistonThick  float64
	ChestLow     float64 // w of the steam chest's floor (the port face)
	ChestHigh    float64 // w of the chest's top
	ChestMid     float64 // u of the chest's middle (the valve's central place)
}

// geometry works out the drawing frame from poses at every 30 degrees.
func (m *Model) geometry() MotionGeometry {
	var g MotionGeometry
	e := m.Spec.Engine
	s := m.Crank.Stroke()
	lo := setting.Point{U: -e.CrankRadius, W: math.Min(-e.CrankRadius, e.Offset)}
	hi := setting.Point{U: m.Crank.DeadCentreU(setting.Front), W: math.Max(e.CrankRadius, e.Offset)}
	for i := range m.Positions {
		for a := 0.0; a < 360; a += 30 {
			p, ok := m.Pose(i, a)
			if !ok {
				continue
			}
			for _, j := range p.Joints {
				lo = setting.Point{U: math.Min(lo.U, j.At.U), W: math.Min(lo.W, j.At.W)}
				hi = setting.Point{U: math.Max(hi.U, j.At.U), W: math.Max(hi.W, j.At.W)}
			}
		}
	}
	g.Bore = 0.9 * s
	g.PistonThick = 0.22 * s
	clear := 0.06 * s
	g.CylBack = hi.U + 0.2*s
	g.CylFront = g.CylBack + s + g.PistonThick + 2*clear
	uBack := m.Crank.DeadCentreU(setting.Back)
	g.PistonOffset = g.CylBack + clear + g.PistonThick/2 - uBack
	g.ChestLow = e.Offset + g.Bore/2 + 0.1*s
	g.ChestHigh = g.ChestLow + 0.45*s
	g.ChestMid = (g.CylBack + g.CylFront) / 2
	wall := 0.1 * s
	g.Min = setting.Point{U: lo.U - 4, W: math.Min(lo.W, e.Offset-g.Bore/2-wall) - 4}
	g.Max = setting.Point{U: g.CylFront + wall + 4, W: math.Max(hi.W, g.ChestHigh+wall) + 4}
	return g
}

// MotionLayout is where the motion card puts each part in its box.
type MotionLayout struct {
	Inner    Rect
	Title    []string
	TitleY   float64
	Sub      []string
	SubY     float64
	Drawing  Rect    // the scale drawing of cylinder and gear
	Scale    float64 // logical units per mm in the drawing
	Origin   Point   // where (Min.U, Max.W) of the geometry lands
	Inset    Rect    // the enlarged valve and ports
	InsetLab float64 // top of the inset's port labels
	Legend   Point
	NeedH    float64
}

const insetH = 64

// motionMinH is the least height of the motion drawing.
const motionMinH = 120

// legendColW is the width of the motion legend beside the inset: the
// swatch and its longest label.
const legendColW = legendLineW + 10 + 270

// MotionSub is the figures line of the motion card.
func MotionSub(m *Model, i int, crankDeg float64) string {
	return fmt.Sprintf("Crank at %.0f°, %s. To scale, cylinder line level; valve and ports enlarged below.", normDeg(crankDeg), m.Positions[i].Notch.Name)
}

func normDeg(d float64) float64 {
	d = math.Mod(d, 360)
	if d < 0 {
		d += 360
	}
	return d
}

// MotionTitle is the motion card's title: the gear in the trade's words.
func MotionTitle(m *Model) string {
	if m.gear != nil {
		return "Motion: " + m.gear.Kind() + " gear"
	}
	return "Motion"
}

// LayoutMotion lays out the motion card in box. The title and figures
// line are sized for the longest crank angle text, so the layout does not
// move from frame to frame.
func LayoutMotion(box Rect, m *Model, i int) MotionLayout {
	var l MotionLayout
	l.Inner = box.Inset(cardPad)
	w := l.Inner.W()
	l.Title = Wrap(MotionTitle(m), w, TitleSize, true)
	l.TitleY = l.Inner.Min.Y
	y := l.TitleY + float64(len(l.Title))*lineStep(TitleSize)
	l.SubY = y
	l.Sub = Wrap(MotionSub(m, i, 288), w, BodySize, false)
	y += float64(len(l.Sub))*lineStep(BodySize) + gap
	g := m.Geometry()
	spanU, spanW := g.Max.U-g.Min.U, g.Max.W-g.Min.W
	legendH := 3.0 * legendRow
	side := w >= sideColumnFrom // legend beside the inset, not under it
	below := gap + insetH + lineStep(BodySize) + gap + legendH
	if side {
		below = gap + math.Max(insetH+lineStep(BodySize)+2, legendH)
	}
	// The drawing fills the height left, but never less than
	// motionMinH: a box too short for that makes the card taller
	// (NeedH), for the screen to scroll.
	availH := math.Max(l.Inner.Max.Y-y-below, motionMinH)
	k := math.Min(w/spanU, availH/spanW)
	if !(k > 0) || math.IsInf(k, 0) {
		k = 1
	}
	l.Scale = k
	dw, dh := spanU*k, spanW*k
	l.Drawing = Rect{Point{l.Inner.Min.X + (w-dw)/2, y}, Point{l.Inner.Min.X + (w+dw)/2, y + dh}}
	l.Origin = l.Drawing.Min
	y = l.Drawing.Max.Y + gap
	insetR := l.Inner.Max.X
	if side {
		insetR = l.Inner.Max.X - legendColW - 2*gap
	}
	l.Inset = Rect{Point{l.Inner.Min.X, y}, Point{insetR, y + insetH}}
	l.InsetLab = l.Inset.Max.Y + 2
	if side {
		l.Legend = Point{insetR + 2*gap, y}
		y = math.Max(l.InsetLab+lineStep(BodySize), y+legendH)
	} else {
		y = l.InsetLab + lineStep(BodySize) + gap
		l.Legend = Point{l.Inner.Min.X, y}
		y += legendH
	}
	l.NeedH = y + cardPad - box.Min.Y
	return l
}

// toScreen maps a point of the cylinder-line frame onto the drawing.
func (l MotionLayout) toScreen(g MotionGeometry, p setting.Point) Point {
	return Point{l.Origin.X + (p.U-g.Min.U)*l.Scale, l.Origin.Y + (g.Max.W-p.W)*l.Scale}
}

// fixedJoint reports whether a joint is fixed to the frame (drawn as an
// anchor).
func fixedJoint(name string) bool {
	switch name {
	case "axle", "weighshaft", "link trunnion", "rocker pivot":
		return true
	}
	return false
}

// valvePins are the joint names, in order of preference, where the valve
// rod leaves the gear toward the steam chest.
func valvePins() [4]string {
	return [4]string{"valve spindle pin", "die block", "rocker valve-arm pin", "eccentric rod pin"}
}

// Motion draws the engine at crank angle crankDeg in position i, to scale:
// the cylinder with its piston and the steam in each end (by port state:
// steam solid, exhaust hatched, closed empty), the steam chest with the
// valve, the crank, connecting rod and every link of the gear from its
// solved pose, and below it the valve and ports enlarged. Frames of an
// animation call it with successive angles; the layout and scale do not
// move between frames.
func Motion(c Canvas, m *Model, i int, crankDeg float64, box Rect, th Theme) {
	if !usable(box) {
		return
	}
	if m == nil || i < 0 || i >= len(m.Positions) || math.IsNaN(crankDeg) || math.IsInf(crankDeg, 0) {
		cardMessage(c, box, "Motion", "There is no motion to draw for this position.", th)
		return
	}
	l := LayoutMotion(box, m, i)
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	drawLines(c, Point{l.Inner.Min.X, l.TitleY}, l.Title, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
	drawLines(c, Point{l.Inner.Min.X, l.SubY}, Wrap(MotionSub(m, i, crankDeg), l.Inner.W(), BodySize, false), TextStyle{Color: th.Muted, Size: BodySize})
	g := m.Geometry()
	e := m.Spec.Engine
	at := func(p setting.Point) Point { return l.toScreen(g, p) }
	k := l.Scale
	x := m.ValveAt(i, crankDeg, false)
	pose, posed := m.Pose(i, crankDeg)
	if posed {
		x = pose.Valve
	}
	fs, bs := PortStateAt(m.Valve, setting.Front, x), PortStateAt(m.Valve, setting.Back, x)

	// Cylinder, chest and the steam in each end.
	wall := 0.1 * m.Crank.Stroke()
	cu := m.Crank.CrossheadU(crankDeg)
	pu := cu + g.PistonOffset
	top, bot := e.Offset+g.Bore/2, e.Offset-g.Bore/2
	body := Rect{at(setting.Point{U: g.CylBack - wall, W: g.ChestHigh + wall}), at(setting.Point{U: g.CylFront + wall, W: bot - wall})}
	c.Fill(RectPath(body), FillStyle{Color: tint(th.Muted, 0.35)})
	bore := Rect{at(setting.Point{U: g.CylBack, W: top}), at(setting.Point{U: g.CylFront, W: bot})}
	c.Fill(RectPath(bore), FillStyle{Color: th.Surface})
	backSpace := Rect{bore.Min, Point{at(setting.Point{U: pu - g.PistonThick/2}).X, bore.Max.Y}}
	frontSpace := Rect{Point{at(setting.Point{U: pu + g.PistonThick/2}).X, bore.Min.Y}, bore.Max}
	steamFill(c, backSpace, bs, th)
	steamFill(c, frontSpace, fs, th)
	chest := Rect{at(setting.Point{U: g.CylBack, W: g.ChestHigh}), at(setting.Point{U: g.CylFront, W: g.ChestLow})}
	c.Fill(RectPath(chest), FillStyle{Color: th.Surface})
	// Passages from the chest floor to each end of the bore.
	pw := math.Max(4, 0.08*m.Crank.Stroke()*k)
	bp := Rect{Point{bore.Min.X + 2, chest.Max.Y}, Point{bore.Min.X + 2 + pw, bore.Min.Y}}
	fp := Rect{Point{bore.Max.X - 2 - pw, chest.Max.Y}, Point{bore.Max.X - 2, bore.Min.Y}}
	steamFill(c, bp, bs, th)
	steamFill(c, fp, fs, th)
	// The valve, to scale, in the chest.
	vw := 0.45 * (g.CylFront - g.CylBack)
	vr := Rect{at(setting.Point{U: g.ChestMid + x - vw/2, W: g.ChestLow + 0.45*(g.ChestHigh-g.ChestLow)}), at(setting.Point{U: g.ChestMid + x + vw/2, W: g.ChestLow})}
	c.Fill(RoundRect(vr, 2), FillStyle{Color: th.Ink})
	// Piston and rod.
	pr := Rect{at(setting.Point{U: pu - g.PistonThick/2, W: top}), at(setting.Point{U: pu + g.PistonThick/2, W: bot})}
	c.Fill(RectPath(pr), FillStyle{Color: th.Ink})
	ink := LineStyle{Color: th.Ink, Width: 3}
	cross := setting.Point{U: cu, W: e.Offset}
	var rod Path
	rod.MoveTo(at(cross))
	rod.LineTo(at(setting.Point{U: pu, W: e.Offset}))
	c.Stroke(rod, ink)
	// Crosshead block.
	ch := at(cross)
	c.Fill(RectPath(Rect{Point{ch.X - 7, ch.Y - 5}, Point{ch.X + 7, ch.Y + 5}}), FillStyle{Color: th.Muted})

	// Crank circle, connecting rod and the gear's links.
	c.Stroke(Circle(at(setting.Point{}), e.CrankRadius*k), LineStyle{Color: th.Grid, Width: 1.5, Dashes: []float64{4, 4}})
	cpU, cpW := m.Crank.CrankPin(crankDeg)
	crankPin := setting.Point{U: cpU, W: cpW}
	if posed {
		if p, ok := pose.Joint("crank pin"); ok {
			crankPin = p
		}
	}
	hasRod := false
	if posed {
		for _, b := range pose.Bars {
			if b.Name == "connecting rod" {
				hasRod = true
			}
		}
	}
	if !hasRod {
		var cr Path
		cr.MoveTo(at(crankPin))
		cr.LineTo(at(cross))
		c.Stroke(cr, LineStyle{Color: th.Ink, Width: 4})
	}
	var crank Path
	crank.MoveTo(at(setting.Point{}))
	crank.LineTo(at(crankPin))
	c.Stroke(crank, LineStyle{Color: th.Ink, Width: 5})
	if posed {
		link := LineStyle{Color: th.Accent, Width: 3}
		for _, b := range pose.Bars {
			if b.From < 0 || b.To < 0 || b.From >= len(pose.Joints) || b.To >= len(pose.Joints) {
				continue
			}
			a, z := pose.Joints[b.From].At, pose.Joints[b.To].At
			switch {
			case b.Name == "crank":
				continue
			case b.Name == "connecting rod":
				var p Path
				p.MoveTo(at(a))
				p.LineTo(at(z))
				c.Stroke(p, LineStyle{Color: th.Ink, Width: 4})
			case b.Radius != 0:
				c.Stroke(arcPath(a, z, b.Radius, at), LineStyle{Color: th.Muted, Width: 6})
			default:
				var p Path
				p.MoveTo(at(a))
				p.LineTo(at(z))
				c.Stroke(p, link)
			}
		}
		// Valve rod to the chest.
		for _, name := range valvePins() {
			if p, ok := pose.Joint(name); ok {
				var vrod Path
				vrod.MoveTo(at(p))
				vrod.LineTo(Point{vr.Min.X, (vr.Min.Y + vr.Max.Y) / 2})
				c.Stroke(vrod, LineStyle{Color: th.Ink, Width: 2})
				break
			}
		}
		for _, j := range pose.Joints {
			pt := at(j.At)
			if fixedJoint(j.Name) {
				anchor(c, pt, th)
				continue
			}
			c.Fill(Circle(pt, 3.5), FillStyle{Color: th.Surface})
			c.Stroke(Circle(pt, 3.5), LineStyle{Color: th.Ink, Width: 1.5})
		}
	} else {
		anchor(c, at(setting.Point{}), th)
	}

	valveInset(c, l, m, x, fs, bs, th)
	DrawLegend(c, l.Legend, []LegendEntry{
		{Mark: func(c Canvas, at Point) { steamFill(c, swatch(at), OpenToSteam, th) }, Label: "open to steam"},
		{Mark: func(c Canvas, at Point) { steamFill(c, swatch(at), OpenToExhaust, th) }, Label: "open to exhaust"},
		{Mark: func(c Canvas, at Point) { steamFill(c, swatch(at), Closed, th) }, Label: "closed (expansion, compression)"},
	}, th)
}

func swatch(at Point) Rect { return Rect{Point{at.X - 13, at.Y - 8}, Point{at.X + 13, at.Y + 8}} }

// steamFill fills r by port state: steam solid and warm, exhaust hatched,
// closed empty with a thin outline.
func steamFill(c Canvas, r Rect, s PortState, th Theme) {
	if !(r.W() > 0) || !(r.H() > 0) {
		return
	}
	switch s {
	case OpenToSteam:
		c.Fill(RectPath(r), FillStyle{Color: tint(th.Warn, 0.75)})
	case OpenToExhaust:
		c.Fill(RectPath(r), FillStyle{Color: tint(th.Muted, 0.15)})
		c.Stroke(hatch(r, 6), LineStyle{Color: th.Muted, Width: 1.5})
	default:
		c.Stroke(RectPath(r.Inset(0.75)), LineStyle{Color: th.Muted, Width: 1.5})
	}
}

// anchor draws a joint fixed to the frame: a ring on a small hatched base.
func anchor(c Canvas, at Point, th Theme) {
	var p Path
	p.MoveTo(at)
	p.LineTo(Point{at.X - 6, at.Y + 9})
	p.LineTo(Point{at.X + 6, at.Y + 9})
	p.Close()
	c.Fill(p, FillStyle{Color: th.Muted})
	c.Fill(Circle(at, 4), FillStyle{Color: th.Surface})
	c.Stroke(Circle(at, 4), LineStyle{Color: th.Ink, Width: 2})
}

// arcPath returns a curved link from a to z of radius r (mm), its centre
// to the left of a->z when r is positive, as a polyline on screen.
func arcPath(a, z setting.Point, r float64, at func(setting.Point) Point) Path {
	d := z.Sub(a)
	ch := d.Len()
	var p Path
	if !(ch > 0) || math.Abs(r) < ch/2 {
		p.MoveTo(at(a))
		p.LineTo(at(z))
		return p
	}
	mid := a.Add(d.Scale(0.5))
	h := math.Sqrt(r*r - ch*ch/4)
	n := d.Scale(1 / ch).Left()
	if r < 0 {
		n = n.Scale(-1)
	}
	ctr := mid.Add(n.Scale(h))
	a0 := math.Atan2(a.W-ctr.W, a.U-ctr.U)
	a1 := math.Atan2(z.W-ctr.W, z.U-ctr.U)
	sw := a1 - a0
	for sw > math.Pi {
		sw -= 2 * math.Pi
	}
	for sw < -math.Pi {
		sw += 2 * math.Pi
	}
	R := math.Abs(r)
	const steps = 10
	for s := 0; s <= steps; s++ {
		t := a0 + sw*float64(s)/steps
		pt := at(setting.Point{U: ctr.U + R*math.Cos(t), W: ctr.W + R*math.Sin(t)})
		if s == 0 {
			p.MoveTo(pt)
		} else {
			p.LineTo(pt)
		}
	}
	return p
}

// InsetPorts returns where the enlarged drawing puts the ports, in mm
// along the port face from the valve's central place (+ toward the front):
// each port's back and front edge, and the valve's parts at displacement x
// as spans. Exhaust is the middle port of an external-admission valve; an
// internal-admission valve exhausts past its ends.
type InsetPorts struct {
	Front, Back, Exhaust [2]float64 // port spans; Exhaust zero for internal admission
	Valve                [][2]float64
	Half                 float64 // half the span to show
}

// Ports returns the enlarged port face and valve at displacement x, worked
// out from the laps so the drawing opens each port at the valve's true
// displacement (see setting.Admission for the edges); travel is twice the
// furthest the valve goes from central either way.
func Ports(v setting.Valve, x float64, travel float64) InsetPorts {
	wf, wb := v.Front.Width(), v.Back.Width()
	w := math.Max(math.Max(wf, wb), 0.5)
	var ip InsetPorts
	pf, pb := 3*w, 3*w // outer edge of each port from the middle
	ip.Front = [2]float64{pf - wf, pf}
	ip.Back = [2]float64{-pb, -pb + wb}
	if v.Admission == setting.Internal {
		ip.Valve = [][2]float64{
			{x + pf - wf - v.Front.SteamLap, x + pf + v.Front.ExhaustLap},
			{x - pb - v.Back.ExhaustLap, x - pb + wb + v.Back.SteamLap},
		}
	} else {
		ip.Exhaust = [2]float64{-w, w}
		ip.Valve = [][2]float64{
			{x - pb - v.Back.SteamLap, x - (pb - wb - v.Back.ExhaustLap)},
			{x + pf - wf - v.Front.ExhaustLap, x + pf + v.Front.SteamLap},
		}
	}
	ip.Half = pf + math.Max(v.Front.SteamLap, v.Back.SteamLap) + w + travel/2
	return ip
}

// valveInset draws the valve over its ports, enlarged.
func valveInset(c Canvas, l MotionLayout, m *Model, x float64, fs, bs PortState, th Theme) {
	r := l.Inset
	c.Fill(RoundRect(r, 6), FillStyle{Color: th.Background})
	// The valve's furthest excursion either way, today and after, in
	// any position (a valve off centre on its spindle goes further one
	// way than half its travel), so that it stays on its port face.
	reach := math.Abs(x)
	for _, p := range m.Positions {
		for _, ev := range eventSets(p) {
			reach = math.Max(reach, math.Max(math.Abs(ev.ValveMin), math.Abs(ev.ValveMax)))
		}
	}
	ip := Ports(m.Valve, x, 2*reach)
	k := (r.W() - 16) / (2 * ip.Half)
	mid := (r.Min.X + r.Max.X) / 2
	sx := func(u float64) float64 { return mid + u*k }
	face := r.Min.Y + r.H()*0.55
	// Port face and ports.
	var f Path
	f.MoveTo(Point{r.Min.X + 8, face})
	f.LineTo(Point{r.Max.X - 8, face})
	c.Stroke(f, LineStyle{Color: th.Ink, Width: 2})
	port := func(span [2]float64, s PortState) {
		pr := Rect{Point{sx(span[0]), face}, Point{sx(span[1]), r.Max.Y - 4}}
		c.Fill(RectPath(pr), FillStyle{Color: th.Surface})
		steamFill(c, pr, s, th)
	}
	port(ip.Front, fs)
	port(ip.Back, bs)
	if ip.Exhaust != [2]float64{} {
		ex := Rect{Point{sx(ip.Exhaust[0]), face}, Point{sx(ip.Exhaust[1]), r.Max.Y - 4}}
		c.Fill(RectPath(ex), FillStyle{Color: tint(th.Muted, 0.15)})
		c.Stroke(hatch(ex, 6), LineStyle{Color: th.Muted, Width: 1.5})
	}
	vh := face - r.Min.Y - 8
	clip := func(u float64) float64 { return math.Max(-ip.Half, math.Min(ip.Half, u)) }
	for _, s := range ip.Valve {
		c.Fill(RoundRect(Rect{Point{sx(clip(s[0])), face - vh}, Point{sx(clip(s[1])), face - 1}}, 2), FillStyle{Color: th.Ink})
	}
	if len(ip.Valve) == 2 && m.Valve.Admission == setting.Internal {
		var sp Path
		sp.MoveTo(Point{sx(clip(ip.Valve[1][1])), face - vh/2})
		sp.LineTo(Point{sx(clip(ip.Valve[0][0])), face - vh/2})
		c.Stroke(sp, LineStyle{Color: th.Ink, Width: 3})
	}
	st := TextStyle{Color: th.Ink, Size: BodySize, VAlign: Top}
	c.Text(Point{r.Min.X, l.InsetLab}, "back port: "+bs.String(), st)
	st.HAlign = Right
	c.Text(Point{r.Max.X, l.InsetLab}, "front port: "+fs.String(), st)
}
