package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// BalanceLayout is where the balance card puts each part in its box: a
// row per reverser position, each with a lane for today and one for after
// the plan, in two columns (lead, cut-off). Each lane shows the front end
// (circle) and the back end (square) on the column's scale, joined by a
// bar, and a verdict mark: a tick when the two are within the tolerance,
// a cross when not.
type BalanceLayout struct {
	Inner    Rect
	Title    []string
	TitleY   float64
	HeadY    float64    // top of the column heads
	Cols     [2]Rect    // value extent of the lead and cut-off columns (x), whole rows (y)
	Verdict  [2]float64 // x centre of each column's verdict mark
	LabelX   float64    // right edge of the lane labels
	Rows     []BalanceRow
	TicksY   float64 // top of the tick labels
	Legend   Point
	Caption  []string
	CaptionX float64
	CaptionY float64
	NeedH    float64 // the box height the card needs
}

// BalanceRow is one reverser position's place in the balance card.
type BalanceRow struct {
	NameY float64   // top of the position's name
	Lanes []float64 // centre y of each lane: today, then after the plan
}

const (
	laneH    = 26 // height of a lane's bar
	valuesH  = 18 // height of the line of values under each lane's bar
	verdictW = 22 // room for a verdict mark
)

// BalanceCaption is the balance card's caption for m.
func BalanceCaption(m *Model) string {
	what := ""
	if m.WhatIf != "" {
		what = "After includes the what-if: " + m.WhatIf + ". "
	}
	return what + fmt.Sprintf("A tick: front and back within %s of lead and %s %% of cut-off; a cross: not yet.",
		m.length(m.LeadTolMM), FormatTick(m.CutOffTolPct))
}

// LayoutBalance lays out the balance card of m in box.
func LayoutBalance(box Rect, m *Model) BalanceLayout {
	var l BalanceLayout
	l.Inner = box.Inset(cardPad)
	w := l.Inner.W()
	l.Title = Wrap("Front against back: are we there?", w, TitleSize, true)
	y := l.Inner.Min.Y
	l.TitleY = y
	y += float64(len(l.Title))*lineStep(TitleSize) + gap
	l.HeadY = y
	y += lineStep(BodySize) + gap/2
	labelW := math.Max(TextWidth("today", BodySize, false), TextWidth("after", BodySize, false))
	l.LabelX = l.Inner.Min.X + labelW
	x0 := l.LabelX + gap + 8
	right := l.Inner.Max.X
	side := w >= sideColumnFrom
	if side {
		right = l.Inner.Max.X - math.Min(300, 0.38*w) - 2*gap
	}
	colW := (right - x0 - gap) / 2
	lanes := 1
	if len(m.Positions) > 0 && m.Positions[0].HasAfter {
		lanes = 2
	}
	top := y
	for range m.Positions {
		r := BalanceRow{NameY: y}
		y += lineStep(BodySize)
		for k := 0; k < lanes; k++ {
			r.Lanes = append(r.Lanes, y+laneH/2)
			y += laneH + valuesH
		}
		y += gap
		l.Rows = append(l.Rows, r)
	}
	for k := 0; k < 2; k++ {
		left := x0 + float64(k)*(colW+gap)
		l.Cols[k] = Rect{Point{left + 8, top}, Point{left + colW - verdictW - 4, y}}
		l.Verdict[k] = left + colW - verdictW/2
	}
	l.TicksY = y + tickLen
	y = l.TicksY + lineStep(BodySize) + gap
	l.CaptionX = l.Inner.Min.X
	cw := w
	if side {
		l.CaptionX = right + 2*gap
		cw = l.Inner.Max.X - l.CaptionX
		y = l.HeadY
	}
	l.Legend = Point{l.CaptionX, y}
	y += 3 * legendRow
	l.Caption = Wrap(BalanceCaption(m), cw, BodySize, false)
	l.CaptionY = y + gap
	y = l.CaptionY + float64(len(l.Caption))*lineStep(BodySize)
	if side {
		y = math.Max(y, l.TicksY+lineStep(BodySize))
	}
	l.NeedH = y + cardPad - box.Min.Y
	return l
}

// leadIn converts a lead in mm to the display unit.
func leadIn(m *Model, mm float64) float64 {
	if m.Unit == "inch" {
		return mm / 25.4
	}
	return mm
}

// BalanceRanges returns the half-width of the lead column (in the
// display unit) and of the cut-off column (% of stroke), and the ticks of
// each. Each lane is drawn about the middle of its two ends, so a column
// shows how far each end lies from that middle: the tolerance band is
// plus or minus half the tolerance, and the half-width is the larger of
// one and a half tolerances and the widest pair's half-difference, with a
// tenth to spare, rounded out to a tick. A model with a Scale takes that
// model's ranges.
func BalanceRanges(m *Model) (lead, cut float64, leadTicks, cutTicks []float64) {
	if m.Scale != nil && m.Scale != m {
		s := *m.Scale
		s.Unit = m.Unit
		return BalanceRanges(&s)
	}
	lead, cut = 1.5*leadIn(m, m.LeadTolMM), 1.5*m.CutOffTolPct
	for _, p := range m.Positions {
		for _, ev := range eventSets(p) {
			lead = math.Max(lead, 1.1*math.Abs(leadIn(m, ev.Front.Lead-ev.Back.Lead))/2)
			cut = math.Max(cut, 1.1*math.Abs(ev.Front.CutOff.StrokePercent-ev.Back.CutOff.StrokePercent)/2)
		}
	}
	round := func(h float64) (float64, []float64) {
		h = NiceCeil(h)
		return h, []float64{-h, 0, h}
	}
	lead, leadTicks = round(lead)
	cut, cutTicks = round(cut)
	return
}

// NiceCeil returns the least of 1, 2, 2.5 and 5 times a power of ten that
// is at least v (v itself when not positive and finite: 1).
func NiceCeil(v float64) float64 {
	if !(v > 0) || math.IsInf(v, 0) {
		return 1
	}
	p := math.Pow(10, math.Floor(math.Log10(v)))
	for _, k := range []float64{1, 2, 2.5, 5, 10} {
		if k*p >= v*(1-1e-12) {
			return k * p
		}
	}
	return 10 * p
}

// eventSets returns today's events and, when there is a plan, those after.
func eventSets(p Position) []setting.EventSet {
	if p.HasAfter {
		return []setting.EventSet{p.NowEvents, p.AfterEvents}
	}
	return []setting.EventSet{p.NowEvents}
}

// Balance draws the balance card: for each reverser position, the front
// and back leads and cut-offs today and after the plan, each pair placed
// about its own middle on one scale per column, the tolerance band shaded
// about that middle (both ends inside it: even), and a tick or a cross
// saying whether the two ends are within the tolerance.
func Balance(c Canvas, m *Model, box Rect, th Theme) {
	if !usable(box) {
		return
	}
	if m == nil || len(m.Positions) == 0 {
		cardMessage(c, box, "Front against back", "There are no reverser positions to compare.", th)
		return
	}
	l := LayoutBalance(box, m)
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	drawLines(c, Point{l.Inner.Min.X, l.TitleY}, l.Title, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
	lr, cr, lt, ct := BalanceRanges(m)
	scales := [2]Scale{
		{Min: -lr, Max: lr, A: l.Cols[0].Min.X, B: l.Cols[0].Max.X},
		{Min: -cr, Max: cr, A: l.Cols[1].Min.X, B: l.Cols[1].Max.X},
	}
	heads := [2]string{"lead", "cut-off"}
	units := [2]string{" " + unitName(m), " %"}
	halves := [2]float64{lr, cr}
	tol := [2]float64{leadIn(m, m.LeadTolMM), m.CutOffTolPct}
	for k, ticks := range [][]float64{lt, ct} {
		col := l.Cols[k]
		c.Text(Point{(col.Min.X + col.Max.X) / 2, l.HeadY}, heads[k], TextStyle{Color: th.Muted, Size: BodySize, HAlign: Center, VAlign: Top})
		var grid Path
		for _, v := range ticks {
			x := scales[k].At(v)
			grid.MoveTo(Point{x, col.Min.Y})
			grid.LineTo(Point{x, col.Max.Y})
		}
		c.Stroke(grid, th.GridLine())
		// The scale's half-width, once, under the column: the ends lie
		// either side of their middle.
		c.Text(Point{(col.Min.X + col.Max.X) / 2, l.TicksY}, "±"+FormatTick(halves[k])+units[k], TextStyle{Color: th.Ink, Size: BodySize, HAlign: Center, VAlign: Top})
	}
	laneNames := []string{"today", "after"}
	for i, row := range l.Rows {
		p := m.Positions[i]
		c.Text(Point{l.Inner.Min.X, row.NameY}, p.Notch.Name, TextStyle{Color: th.Ink, Size: BodySize, Bold: true, VAlign: Top})
		for j, ev := range eventSets(p) {
			if j >= len(row.Lanes) {
				break
			}
			y := row.Lanes[j]
			c.Text(Point{l.LabelX, y}, laneNames[j], TextStyle{Color: th.Muted, Size: BodySize, HAlign: Right, VAlign: Middle})
			vals := [2][2]float64{
				{leadIn(m, ev.Front.Lead), leadIn(m, ev.Back.Lead)},
				{ev.Front.CutOff.StrokePercent, ev.Back.CutOff.StrokePercent},
			}
			for k := 0; k < 2; k++ {
				f, b := vals[k][0], vals[k][1]
				mean := (f + b) / 2
				f, b = f-mean, b-mean
				band := Rect{Point{scales[k].At(-tol[k] / 2), y - laneH/2 + 3}, Point{scales[k].At(tol[k] / 2), y + laneH/2 - 3}}
				c.Fill(RoundRect(band, 4), FillStyle{Color: tint(th.Accent, 0.22)})
				ok := math.Abs(f-b) <= tol[k]+1e-12
				barCol := th.Accent
				if !ok {
					barCol = th.Warn
				}
				// Beyond a kept scale an end is drawn at its edge; the
				// values under the bar say where it is.
				fx, bx := scales[k].At(clampAbs(f, halves[k])), scales[k].At(clampAbs(b, halves[k]))
				var bar Path
				bar.MoveTo(Point{fx, y})
				bar.LineTo(Point{bx, y})
				c.Stroke(bar, LineStyle{Color: barCol, Width: 3})
				th.FrontMark(c, Point{fx, y})
				th.BackMark(c, Point{bx, y})
				verdict(c, Point{l.Verdict[k], y}, ok, th)
				// The two values themselves, the front end's at the
				// left of the column in its colour, the back's at the
				// right in its.
				vy := y + laneH/2 + valuesH/2
				fs := TextStyle{Color: th.Front, Size: BodySize, VAlign: Middle}
				c.Text(Point{l.Cols[k].Min.X - 6, vy}, balanceValue(m, k, vals[k][0]), fs)
				fs.HAlign, fs.Color = Right, th.Back
				c.Text(Point{l.Cols[k].Max.X + 6, vy}, balanceValue(m, k, vals[k][1]), fs)
			}
		}
	}
	frontBack := LineStyle{Color: th.Accent, Width: 3}
	DrawLegend(c, l.Legend, []LegendEntry{
		{Mark: th.FrontMark, Label: "front end"},
		{Mark: th.BackMark, Label: "back end"},
		{Line: &frontBack, Mark: func(c Canvas, at Point) {
			c.Fill(RoundRect(Rect{Point{at.X - 12, at.Y - 9}, Point{at.X + 12, at.Y + 9}}, 4), FillStyle{Color: tint(th.Accent, 0.22)})
		}, Label: "tolerance band about the middle"},
	}, th)
	drawLines(c, Point{l.CaptionX, l.CaptionY}, l.Caption, TextStyle{Color: th.Ink, Size: BodySize})
}

// balanceValue writes a value of column k (0 lead in the display unit, 1
// cut-off in %) as the balance card shows it.
func balanceValue(m *Model, k int, v float64) string {
	if k == 1 {
		return fmt.Sprintf("%.1f", v)
	}
	if m.Unit == session.UnitInch {
		return fmt.Sprintf("%.4f", v)
	}
	return fmt.Sprintf("%.2f", v)
}

// clampAbs limits v to [-h, h].
func clampAbs(v, h float64) float64 { return math.Max(-h, math.Min(h, v)) }

// verdict draws a tick (ok) in the accent colour or a cross in the warning
// colour, centred on at: told apart by shape as well as colour.
func verdict(c Canvas, at Point, ok bool, th Theme) {
	var p Path
	s := 6.0
	if ok {
		p.MoveTo(Point{at.X - s, at.Y})
		p.LineTo(Point{at.X - s/3, at.Y + s*0.8})
		p.LineTo(Point{at.X + s, at.Y - s*0.9})
		c.Stroke(p, LineStyle{Color: th.Accent, Width: 3})
		return
	}
	p.MoveTo(Point{at.X - s*0.8, at.Y - s*0.8})
	p.LineTo(Point{at.X + s*0.8, at.Y + s*0.8})
	p.MoveTo(Point{at.X + s*0.8, at.Y - s*0.8})
	p.LineTo(Point{at.X - s*0.8, at.Y + s*0.8})
	c.Stroke(p, LineStyle{Color: th.Warn, Width: 3})
}

// unitName names the model's display unit for axis heads.
func unitName(m *Model) string { return unitShort(m.Unit) }
