package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// LayoutValvePiston lays out the valve-against-piston card of position i.
func LayoutValvePiston(box Rect, m *Model, i int) CardLayout {
	_, _, ticks := ValveRange(m, i)
	return LayoutCard(box, CardSpec{
		Title: "Valve against piston, " + m.Positions[i].Notch.Name,
		Sub:   "Valve from central, " + unitName(m) + ", against the piston's place in the cylinder, % of stroke from the front.",
		Caption: "Each stroke traces one side of the loop. Where the loop crosses an end's steam edge, that port opens or closes to steam; " +
			"a loop even about the middle means an even beat.",
		LegendRows: 4, YTickWidth: yTickWidth(ticks, m.LengthLabel), MaxPlotH: 0.9 * box.W(),
	})
}

// ValvePiston draws the valve against the piston for position i: the
// closed loop a setter's indicator-style diagram shows, the front stroke
// (piston leaving the front end) solid in the front colour and the back
// stroke dashed in the back colour, with each end's steam edge, the events
// marked, and the loop after the plan when there is one.
func ValvePiston(c Canvas, m *Model, i int, box Rect, th Theme) {
	if !usable(box) {
		return
	}
	if m == nil || i < 0 || i >= len(m.Positions) {
		cardMessage(c, box, "Valve against piston", "There is no valve curve to draw for this position.", th)
		return
	}
	l := LayoutValvePiston(box, m, i)
	drawCard(c, box, l, th)
	p := m.Positions[i]
	ax, _ := valvePlot(c, m, i, l, 100, Ticks(0, 100, 4), "piston, % of stroke from the front", nil, th)
	bdc := m.Crank.BackDeadCentre()
	loop := func(curve []float64, from, to float64) Path {
		var pts []Point
		for a := from; a <= to+1e-9; a += CurveStep {
			pts = append(pts, ax.At(100*m.Crank.PistonFraction(a), interp(curve, a)))
		}
		pts = append(pts, ax.At(100*m.Crank.PistonFraction(to), interp(curve, to)))
		return polyline(pts)
	}
	if p.HasAfter {
		c.Stroke(loop(p.After, 0, 360), LineStyle{Color: th.Muted, Width: 1.75, Dashes: []float64{2, 3}})
	}
	c.Stroke(loop(p.Now, 0, bdc), th.FrontLine())
	c.Stroke(loop(p.Now, bdc, 360), th.BackLine())
	eventMarks(c, p.NowEvents, func(d float64) Point { return ax.At(100*m.Crank.PistonFraction(d), interp(p.Now, d)) }, th)
	fl, bl := th.FrontLine(), th.BackLine()
	after := LineStyle{Color: th.Muted, Width: 1.75, Dashes: []float64{2, 3}}
	entries := []LegendEntry{
		{Line: &fl, Mark: th.FrontMark, Label: "front stroke; front events"},
		{Line: &bl, Mark: th.BackMark, Label: "back stroke; back events"},
		exhaustLegend(th),
	}
	if p.HasAfter {
		entries = append(entries, LegendEntry{Line: &after, Label: "after the plan"})
	} else {
		entries = append(entries, LegendEntry{Label: fmt.Sprintf("valve travel %s", m.length(p.NowEvents.ValveTravel()))})
	}
	DrawLegend(c, l.Legend, entries, th)
}

// PortSample is a port's opening at one crank angle.
type PortSample struct {
	CrankDeg            float64
	Front, Back         float64 // linear steam opening, mm
	FrontArea, BackArea float64 // open area, mm^2
	FrontSlot, BackSlot float64 // area a slot of the same width and edge length would give, mm^2
}

// PortOpenings samples both steam ports of position i every CurveStep
// degrees: the linear opening, the open area, and the area of a slot of
// the same width and edge length, which shows what a ring of holes loses
// at the first crack.
func PortOpenings(m *Model, i int) []PortSample {
	if i < 0 || i >= len(m.Positions) {
		return nil
	}
	p := m.Positions[i]
	out := make([]PortSample, len(p.Now))
	for k, x := range p.Now {
		s := PortSample{CrankDeg: float64(k * CurveStep)}
		s.Front = m.Valve.SteamOpening(setting.Front, x)
		s.Back = m.Valve.SteamOpening(setting.Back, x)
		s.FrontArea = m.Valve.PortArea(setting.Front, s.Front)
		s.BackArea = m.Valve.PortArea(setting.Back, s.Back)
		s.FrontSlot = s.Front * m.Valve.FullPortLength(setting.Front)
		s.BackSlot = s.Back * m.Valve.FullPortLength(setting.Back)
		out[k] = s
	}
	return out
}

// holes reports whether either port is a ring of holes.
func holes(v setting.Valve) bool { return v.Front.Holes > 0 || v.Back.Holes > 0 }

// LayoutPortOpening lays out the port-opening card of position i.
func LayoutPortOpening(box Rect, m *Model, i int) CardLayout {
	w := math.Max(m.Valve.Front.Width(), m.Valve.Back.Width())
	cap := "A slot opens in proportion to the valve's movement."
	if holes(m.Valve) {
		cap = "The ports are rings of drilled holes: a round hole passes far less than a slot of the same width when the valve first cracks it, and about four fifths (pi/4) when fully open."
	}
	return LayoutCard(box, CardSpec{
		Title:   "Port opening, " + m.Positions[i].Notch.Name,
		Sub:     "Top: opening in " + unitName(m) + ". Below: open area in " + unitName(m) + "², against crank angle.",
		Caption: cap, LegendRows: 3, YTickWidth: yTickWidth(m.lengthTicks(0, math.Max(w, 1)*1.1, 3), m.LengthLabel) + 8,
		StripH: math.Min(160, math.Max(60, 0.22*box.H())), MaxPlotH: 200,
	})
}

// PortOpening draws the steam opening of both ports of position i against
// crank angle: linear opening above, open area below with the area a slot
// of the same width would give as a thin reference, front solid and back
// dashed (and coloured).
func PortOpening(c Canvas, m *Model, i int, box Rect, th Theme) {
	if !usable(box) {
		return
	}
	if m == nil || i < 0 || i >= len(m.Positions) {
		cardMessage(c, box, "Port opening", "There is no valve curve to draw for this position.", th)
		return
	}
	l := LayoutPortOpening(box, m, i)
	drawCard(c, box, l, th)
	ss := PortOpenings(m, i)
	wmax := math.Max(m.Valve.Front.Width(), m.Valve.Back.Width())
	amax := 0.0
	for _, s := range ss {
		amax = math.Max(amax, math.Max(math.Max(s.FrontSlot, s.BackSlot), math.Max(s.FrontArea, s.BackArea)))
	}
	if !(wmax > 0) {
		wmax = 1
	}
	ax := NewAxes(l.Plot, 0, 360, 0, wmax*1.1, AngleTicks(0, 360, 4), m.lengthTicks(0, wmax*1.1, 3))
	ax.YLabel = m.LengthLabel
	ax.Draw(c, l.XTicksY, th)
	c.Text(Point{l.Inner.Min.X, l.YLabelY}, "opening, "+unitName(m), TextStyle{Color: th.Muted, Size: BodySize, VAlign: Top})
	c.Text(Point{(l.Plot.Min.X + l.Plot.Max.X) / 2, l.XLabelY}, "crank angle, degrees", TextStyle{Color: th.Muted, Size: BodySize, HAlign: Center, VAlign: Top})
	curve := func(a Axes, f func(s PortSample) float64) Path {
		pts := make([]Point, len(ss))
		for k, s := range ss {
			pts[k] = a.At(s.CrankDeg, f(s))
		}
		return polyline(pts)
	}
	c.Stroke(curve(ax, func(s PortSample) float64 { return s.Front }), th.FrontLine())
	c.Stroke(curve(ax, func(s PortSample) float64 { return s.Back }), th.BackLine())

	// Area strip: its own y scale, the same x.
	if !(amax > 0) {
		amax = 1
	}
	// Areas in the display unit's square (645.16 mm² to the square inch).
	sq := 1.0
	if m.Unit == session.UnitInch {
		sq = 25.4 * 25.4
	}
	at := Ticks(0, amax*1.1/sq, 2)
	for k := range at {
		at[k] *= sq
	}
	area := NewAxes(l.Strip, 0, 360, 0, amax*1.1, ax.XTicks, at)
	var grid Path
	for _, v := range at {
		y := area.Y.At(v)
		grid.MoveTo(Point{l.Strip.Min.X, y})
		grid.LineTo(Point{l.Strip.Max.X, y})
	}
	for _, v := range ax.XTicks {
		x := area.X.At(v)
		grid.MoveTo(Point{x, l.Strip.Min.Y})
		grid.LineTo(Point{x, l.Strip.Max.Y})
	}
	c.Stroke(grid, th.GridLine())
	var frame Path
	frame.MoveTo(l.Strip.Min)
	frame.LineTo(Point{l.Strip.Min.X, l.Strip.Max.Y})
	frame.LineTo(l.Strip.Max)
	c.Stroke(frame, th.AxisLine())
	c.Text(Point{l.Strip.Min.X - tickLen - 3, area.Y.At(at[len(at)-1])}, FormatTick(math.Round(at[len(at)-1]/sq*1e6)/1e6), TextStyle{Color: th.Ink, Size: BodySize, HAlign: Right, VAlign: Top})
	c.Text(Point{l.Strip.Min.X + 4, l.Strip.Min.Y + 2}, "area, "+unitName(m)+"²", TextStyle{Color: th.Muted, Size: BodySize, VAlign: Top})
	if holes(m.Valve) {
		cmp := th.CompareLine()
		c.Stroke(curve(area, func(s PortSample) float64 { return s.FrontSlot }), cmp)
		c.Stroke(curve(area, func(s PortSample) float64 { return s.BackSlot }), cmp)
	}
	c.Stroke(curve(area, func(s PortSample) float64 { return s.FrontArea }), th.FrontLine())
	c.Stroke(curve(area, func(s PortSample) float64 { return s.BackArea }), th.BackLine())

	fl, bl, cmp := th.FrontLine(), th.BackLine(), th.CompareLine()
	entries := []LegendEntry{{Line: &fl, Label: "front port"}, {Line: &bl, Label: "back port"}}
	if holes(m.Valve) {
		entries = append(entries, LegendEntry{Line: &cmp, Label: "a slot of the same width"})
	} else {
		entries = append(entries, LegendEntry{Label: fmt.Sprintf("largest opening %s", m.length(math.Max(m.Positions[i].NowEvents.Front.MaxOpening, m.Positions[i].NowEvents.Back.MaxOpening)))})
	}
	DrawLegend(c, l.Legend, entries, th)
}
