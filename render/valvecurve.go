package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Edges are the valve displacements (mm, + toward the front cover) at
// which each port edge is line-on-line with the valve: past FrontSteam in
// the direction of OpenFront the front port is open to steam, and so on.
type Edges struct {
	FrontSteam, BackSteam     float64
	FrontExhaust, BackExhaust float64
	// Sign is +1 when the valve opens the front port to steam by moving
	// forward (internal admission), -1 when by moving back (external).
	Sign float64
}

// ValveEdges returns the port edges of a valve in valve-displacement
// terms (see setting.Admission for the derivation of the signs).
func ValveEdges(v setting.Valve) Edges {
	s := -1.0
	if v.Admission == setting.Internal {
		s = 1
	}
	return Edges{
		FrontSteam: s * v.Front.SteamLap, BackSteam: -s * v.Back.SteamLap,
		FrontExhaust: -s * v.Front.ExhaustLap, BackExhaust: s * v.Back.ExhaustLap,
		Sign: s,
	}
}

// ValveRange returns the displacement range a valve-curve plot of position
// i shows: both curves and every port edge, with a margin, rounded out to
// whole ticks.
func ValveRange(m *Model, i int) (lo, hi float64, ticks []float64) {
	e := ValveEdges(m.Valve)
	lo = math.Min(math.Min(e.FrontSteam, e.BackSteam), math.Min(e.FrontExhaust, e.BackExhaust))
	hi = math.Max(math.Max(e.FrontSteam, e.BackSteam), math.Max(e.FrontExhaust, e.BackExhaust))
	if i >= 0 && i < len(m.Positions) {
		p := m.Positions[i]
		for _, c := range [][]float64{p.Now, p.After} {
			for _, v := range c {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	pad := 0.08 * (hi - lo)
	if !(pad > 0) {
		pad = 1
	}
	lo, hi = lo-pad, hi+pad
	ticks = m.lengthTicks(lo, hi, 5)
	if len(ticks) > 1 {
		step := ticks[1] - ticks[0]
		lo, hi = math.Floor(lo/step+1e-9)*step, math.Ceil(hi/step-1e-9)*step
		ticks = m.lengthTicks(lo, hi, 5)
	}
	return lo, hi, ticks
}

// lengthTicks returns ticks for lengths from lo to hi mm at round values
// of the display unit (in mm).
func (m *Model) lengthTicks(lo, hi float64, n int) []float64 {
	if m.Unit != session.UnitInch {
		return Ticks(lo, hi, n)
	}
	ts := Ticks(lo/25.4, hi/25.4, n)
	for k := range ts {
		ts[k] *= 25.4
	}
	return ts
}

// LengthLabel writes a length tick (mm) in the display unit, without the
// unit: the axis label names it.
func (m *Model) LengthLabel(mm float64) string {
	if m.Unit == session.UnitInch {
		return FormatTick(math.Round(mm/25.4*1e6) / 1e6)
	}
	return FormatTick(mm)
}

// residualStripH is the height of the residual strip under a valve curve.
const residualStripH = 56

// ValveCurveTitle returns the valve curve card's title for position i.
func ValveCurveTitle(m *Model, i int) string {
	return "Valve travel, " + m.Positions[i].Notch.Name + " (" + m.Positions[i].Direction.String() + ")"
}

// LayoutValveCurve lays out the valve curve card of position i in box.
func LayoutValveCurve(box Rect, m *Model, i int) CardLayout {
	_, _, ticks := ValveRange(m, i)
	return LayoutCard(box, CardSpec{
		Title: ValveCurveTitle(m, i), Sub: valveCurveSub(m, i), Caption: valveCurveCaption(m, i),
		LegendRows: len(valveCurveLegend(m, i, Light())), YTickWidth: yTickWidth(ticks, m.LengthLabel),
		StripH: stripH(m, i),
	})
}

func stripH(m *Model, i int) float64 {
	if len(readingsAt(m, i)) > 0 {
		return residualStripH
	}
	return 0
}

func valveCurveSub(m *Model, i int) string {
	s := "Valve from central, " + unitName(m) + " (+ toward the front cover), against crank angle."
	if m.Title != "" {
		s = m.Title + ". " + s
	}
	return s
}

func valveCurveCaption(m *Model, i int) string {
	p := m.Positions[i]
	f, b := p.NowEvents.Front, p.NowEvents.Back
	s := fmt.Sprintf("Today: lead front %s, back %s; cut-off front %s %%, back %s %%.",
		m.length(f.Lead), m.length(b.Lead), pct(f.CutOff.StrokePercent), pct(b.CutOff.StrokePercent))
	if p.HasAfter {
		f, b = p.AfterEvents.Front, p.AfterEvents.Back
		s += fmt.Sprintf(" After the plan: lead front %s, back %s; cut-off front %s %%, back %s %%.",
			m.length(f.Lead), m.length(b.Lead), pct(f.CutOff.StrokePercent), pct(b.CutOff.StrokePercent))
	}
	return s
}

// readingsAt returns the readings taken in position i.
func readingsAt(m *Model, i int) []Reading {
	var out []Reading
	if i < 0 || i >= len(m.Positions) {
		return nil
	}
	for _, r := range m.Readings {
		if math.Abs(float64(r.Reverser-m.Positions[i].Notch.Reverser)) < 1e-9 {
			out = append(out, r)
		}
	}
	return out
}

// afterLine is the style of a curve after the plan: ink, long dashes.
func afterLine(th Theme) LineStyle {
	return LineStyle{Color: th.Ink, Width: 2, Dashes: []float64{8, 4}}
}

// edgeLine is the style of a port edge line of an end: the end's pattern.
func edgeLine(th Theme, back bool) LineStyle {
	if back {
		return LineStyle{Color: th.Back, Width: 1.5, Dashes: []float64{6, 4}}
	}
	return LineStyle{Color: th.Front, Width: 1.5}
}

// lapBand draws a band from 0 to edge across the plot in an end's colour;
// the back's is hatched as well.
func lapBand(c Canvas, ax Axes, edge float64, back bool, th Theme) {
	if edge == 0 {
		return
	}
	y0, y1 := ax.Y.At(0), ax.Y.At(edge)
	r := Rect{Point{ax.Plot.Min.X, math.Min(y0, y1)}, Point{ax.Plot.Max.X, math.Max(y0, y1)}}
	col := th.Front
	if back {
		col = th.Back
	}
	c.Fill(RectPath(r), FillStyle{Color: tint(col, 0.10)})
	if back {
		c.Stroke(hatch(r, 9), LineStyle{Color: tint(col, 0.35), Width: 1})
	}
}

// openArea returns the area between curve and the edge line where the
// curve lies beyond the edge in direction dir (+1 above, -1 below).
func openArea(ax Axes, curve []float64, edge, dir float64) Path {
	pts := make([]Point, 0, len(curve)+2)
	for k, v := range curve {
		if (v-edge)*dir < 0 {
			v = edge
		}
		pts = append(pts, ax.At(float64(k*CurveStep), v))
	}
	pts = append(pts, ax.At(360, edge), ax.At(0, edge))
	p := polyline(pts)
	p.Close()
	return p
}

func valveCurveLegend(m *Model, i int, th Theme) []LegendEntry {
	today, after := th.CurveLine(), afterLine(th)
	fe, be := edgeLine(th, false), edgeLine(th, true)
	var es []LegendEntry
	es = append(es, LegendEntry{Line: &today, Label: "valve today"})
	if m.Positions[i].HasAfter {
		es = append(es, LegendEntry{Line: &after, Label: "after the plan"})
	}
	if len(readingsAt(m, i)) > 0 {
		es = append(es, LegendEntry{Mark: func(c Canvas, at Point) { diamond(c, at, th.Ink, th.Surface) }, Label: "gauge readings"})
	}
	es = append(es,
		LegendEntry{Line: &fe, Mark: func(c Canvas, at Point) { th.FrontMark(c, at) }, Label: "front: lap, admission, cut-off"},
		LegendEntry{Line: &be, Mark: func(c Canvas, at Point) { th.BackMark(c, at) }, Label: "back: lap, admission, cut-off"},
		exhaustLegend(th),
	)
	return es
}

// ValveCurve draws the valve curve card of position i of m in box: valve
// displacement against crank angle, each end's steam lap as a band (front
// plain, back hatched) bounded by its steam edge, the exhaust edges, the
// steam openings shaded, the four events of each end marked (front round,
// back square; steam events filled, exhaust events hollow), both dead
// centres, the curve after the plan (dashed) when there is one, and the
// readings as diamonds with their fit residuals in a strip below.
func ValveCurve(c Canvas, m *Model, i int, box Rect, th Theme) {
	if !usable(box) {
		return
	}
	if m == nil || i < 0 || i >= len(m.Positions) {
		cardMessage(c, box, "Valve travel", "There is no valve curve to draw for this position.", th)
		return
	}
	l := LayoutValveCurve(box, m, i)
	drawCard(c, box, l, th)
	p := m.Positions[i]
	ax, e := valvePlot(c, m, i, l, 360, AngleTicks(0, 360, 4), "crank angle, degrees", p.Now, th)

	hline := func(v float64) Path {
		var q Path
		q.MoveTo(ax.At(0, v))
		q.LineTo(ax.At(360, v))
		return q
	}
	exh := LineStyle{Color: th.Muted, Width: 1, Dashes: []float64{2, 3}}
	c.Stroke(hline(e.FrontExhaust), exh)
	if e.BackExhaust != e.FrontExhaust {
		c.Stroke(hline(e.BackExhaust), exh)
	}

	// Dead centres.
	bdc := m.Crank.BackDeadCentre()
	dc := LineStyle{Color: th.Muted, Width: 1}
	c.Stroke(ax.VLine(bdc), dc)
	c.Stroke(ax.VLine(360), dc)
	lab := TextStyle{Color: th.Muted, Size: BodySize, VAlign: Top}
	c.Text(Point{l.Plot.Min.X + 4, l.Plot.Min.Y + 2}, "front DC", lab)
	lab.HAlign = Center
	c.Text(Point{ax.X.At(bdc), l.Plot.Min.Y + 2}, "back DC", lab)

	curve := func(v []float64) Path {
		pts := make([]Point, len(v))
		for k, y := range v {
			pts[k] = ax.At(float64(k*CurveStep), y)
		}
		return polyline(pts)
	}
	c.Stroke(curve(p.Now), th.CurveLine())
	if p.HasAfter {
		c.Stroke(curve(p.After), afterLine(th))
	}

	// Events on today's curve.
	eventMarks(c, p.NowEvents, func(d float64) Point { return ax.At(d, interp(p.Now, d)) }, th)

	// Readings and their residuals.
	rs := readingsAt(m, i)
	for _, r := range rs {
		col := th.Ink
		if !r.Used {
			col = th.Warn
		}
		diamond(c, ax.At(r.CrankDeg, r.ValveMM), col, th.Surface)
	}
	if len(rs) > 0 {
		residualStrip(c, l.Strip, ax, rs, m, th)
	}
	DrawLegend(c, l.Legend, valveCurveLegend(m, i, th), th)
}

// ResidualRange returns the half-height, in mm, of the residual strip for
// readings rs: the largest residual with a fifth to spare, at least 0.02.
func ResidualRange(rs []Reading) float64 {
	r := 0.02
	for _, x := range rs {
		r = math.Max(r, 1.2*math.Abs(x.ResidualMM))
	}
	return r
}

// residualStrip draws each reading's residual as a stem from the zero line.
func residualStrip(c Canvas, box Rect, ax Axes, rs []Reading, m *Model, th Theme) {
	c.Stroke(RectPath(box), th.GridLine())
	rr := ResidualRange(rs)
	ys := Scale{Min: -rr, Max: rr, A: box.Max.Y, B: box.Min.Y}
	var zero Path
	zero.MoveTo(Point{box.Min.X, ys.At(0)})
	zero.LineTo(Point{box.Max.X, ys.At(0)})
	c.Stroke(zero, th.AxisLine())
	for _, r := range rs {
		x := ax.X.At(r.CrankDeg)
		col := th.Ink
		if !r.Used {
			col = th.Warn
		}
		var s Path
		s.MoveTo(Point{x, ys.At(0)})
		s.LineTo(Point{x, ys.At(math.Max(-rr, math.Min(rr, r.ResidualMM)))})
		c.Stroke(s, LineStyle{Color: col, Width: 2})
		diamond(c, Point{x, ys.At(math.Max(-rr, math.Min(rr, r.ResidualMM)))}, col, th.Surface)
	}
	c.Text(Point{box.Max.X - 3, box.Min.Y + 1}, "off the fit, ±"+m.LengthLabel(rr)+" "+unitName(m), TextStyle{Color: th.Muted, Size: BodySize, HAlign: Right, VAlign: Top})
}

// valvePlot sets up a plot of valve displacement (y) against x from 0 to
// x1 on a card: the lap bands under the grid, the axes, both axis labels,
// the steam openings of curve (sampled every CurveStep degrees against
// crank angle; nil for none) shaded past each steam edge, and each end's
// steam edge on top. It returns the axes and the edges.
func valvePlot(c Canvas, m *Model, i int, l CardLayout, x1 float64, xticks []float64, xlabel string, curve []float64, th Theme) (Axes, Edges) {
	lo, hi, ticks := ValveRange(m, i)
	ax := NewAxes(l.Plot, 0, x1, lo, hi, xticks, ticks)
	ax.YLabel = m.LengthLabel
	e := ValveEdges(m.Valve)
	lapBand(c, ax, e.FrontSteam, false, th)
	lapBand(c, ax, e.BackSteam, true, th)
	ax.Draw(c, l.XTicksY, th)
	c.Text(Point{l.Inner.Min.X, l.YLabelY}, "valve, "+unitName(m), TextStyle{Color: th.Muted, Size: BodySize, VAlign: Top})
	c.Text(Point{(l.Plot.Min.X + l.Plot.Max.X) / 2, l.XLabelY}, xlabel, TextStyle{Color: th.Muted, Size: BodySize, HAlign: Center, VAlign: Top})
	if curve != nil {
		c.Fill(openArea(ax, curve, e.FrontSteam, e.Sign), FillStyle{Color: tint(th.Front, 0.30)})
		c.Fill(openArea(ax, curve, e.BackSteam, -e.Sign), FillStyle{Color: tint(th.Back, 0.30)})
	}
	for k, y := range []float64{e.FrontSteam, e.BackSteam} {
		var q Path
		q.MoveTo(ax.At(0, y))
		q.LineTo(ax.At(x1, y))
		c.Stroke(q, edgeLine(th, k == 1))
	}
	return ax, e
}

// eventMarks marks the four events of each end at the points at gives for
// a crank angle: front round, back square; steam events (admission,
// cut-off) filled, exhaust events (release, compression) hollow.
func eventMarks(c Canvas, set setting.EventSet, at func(deg float64) Point, th Theme) {
	for _, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
		ev := set.End(end)
		back := end == setting.Back
		col := th.Front
		if back {
			col = th.Back
		}
		if !ev.NeverOpens && !ev.NeverCloses {
			for _, d := range []float64{ev.Admission.CrankDeg, ev.CutOff.CrankDeg} {
				if back {
					th.BackMark(c, at(d))
				} else {
					th.FrontMark(c, at(d))
				}
			}
		}
		if !ev.ExhaustNeverOpens && !ev.ExhaustNeverCloses {
			for _, d := range []float64{ev.Release.CrankDeg, ev.Compression.CrankDeg} {
				ring(c, at(d), back, col, th.Surface)
			}
		}
	}
}

// exhaustLegend is the legend row of the hollow exhaust-event markers.
func exhaustLegend(th Theme) LegendEntry {
	return LegendEntry{Mark: func(c Canvas, at Point) {
		ring(c, Point{at.X - 8, at.Y}, false, th.Front, th.Surface)
		ring(c, Point{at.X + 8, at.Y}, true, th.Back, th.Surface)
	}, Label: "release, compression"}
}
