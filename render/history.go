package render

import (
	"fmt"
	"math"
	"strings"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// History is what the history of one cylinder's rounds shows: each round
// in order with the changes made before it and its leads and cut-offs as
// that round's readings give them.
type History struct {
	Unit      session.Unit
	LeadTolMM float64 // the band of the chart: front and back even within it
	Rounds    []HistoryRound
}

// HistoryRound is one round of a History.
type HistoryRound struct {
	// Before are the changes made before the round, in words.
	Before []string
	// Now are the round's events per position (plan.Plan.Now of a plan
	// made from that round); nil when its readings give none, and Note
	// says why.
	Now  []plan.PositionState
	Note string
}

// HistoryLayout is where the history puts each part in its box: the chart
// of the lead differences round by round, then per round a row the app
// fills with the round's button, and under it the changes made before it
// and a table of its leads and cut-offs.
type HistoryLayout struct {
	Chart CardLayout
	Box   Rect   // the chart card's box; zero without a chart
	Rows  []Rect // per round, the row for the app's button
	Texts []PlacedText
	Rules []Rect
	NeedH float64
}

// historyChartH is the chart's greatest plot height: a glance, not a
// study.
const historyChartH = 150

// LayoutHistory lays out h in box, each round's row rowH tall.
func LayoutHistory(box Rect, h History, rowH float64) HistoryLayout {
	var l HistoryLayout
	y := box.Min.Y
	if ps := historyPositions(h); len(ps) > 0 && len(h.Rounds) > 0 {
		spec := historyChartSpec(h, ps)
		l.Box = Rect{box.Min, Point{box.Max.X, box.Min.Y + 400}}
		l.Chart = LayoutCard(l.Box, spec)
		l.Box.Max.Y = box.Min.Y + l.Chart.NeedH
		l.Chart = LayoutCard(l.Box, spec)
		y = l.Box.Max.Y + 2*gap
	}
	pl := planLayouter{y: y}
	for _, r := range h.Rounds {
		l.Rows = append(l.Rows, Rect{Point{box.Min.X, pl.y}, Point{box.Max.X, pl.y + rowH}})
		pl.y += rowH + gap/2
		roundTexts(&pl, r, h.Unit, box.Min.X, box.W())
		pl.y += gap
	}
	l.Texts, l.Rules = pl.Texts, pl.Rules
	l.NeedH = pl.y - box.Min.Y
	return l
}

// roundTexts lays out one round's changes before it and its table of
// leads and cut-offs, front and back, per position, in the width w from
// x0; a position's name goes on a line of its own when the numbers need
// the width.
func roundTexts(l *planLayouter, r HistoryRound, unit session.Unit, x0, w float64) {
	before := "Nothing changed before it."
	if len(r.Before) > 0 {
		before = "Before it: " + joinWords(r.Before) + "."
	}
	l.para(before, x0, w, planSmall, false, MutedText)
	if r.Now == nil {
		l.para(r.Note, x0, w, planSmall, false, InkText)
		return
	}
	width := func(s string) float64 { return TextWidth(s, planSmall, false) }
	cells := make([][4]string, len(r.Now))
	name, num := 0.0, width("front")
	for i, p := range r.Now {
		name = math.Max(name, TextWidth(p.Notch, planSmall, true))
		for k, e := range []plan.EndState{p.Front, p.Back} {
			cells[i][k] = bareLength(e.LeadMM, unit)
			cells[i][2+k] = CutOffState(e)
		}
		for _, c := range cells[i] {
			num = math.Max(num, width(c))
		}
	}
	sp := width("  ")
	// The right edges of the columns: lead front and back, a gap, cut-off
	// front and back.
	var colR [4]float64
	for k := range colR {
		colR[k] = x0 + w - float64(3-k)*(num+sp)
		if k < 2 {
			colR[k] -= sp
		}
	}
	side := x0+name+sp <= colR[0]-num
	step := lineStep(planSmall)
	l.put(colR[1], l.y, "lead, "+unitShort(unit), planSmall, false, true, MutedText)
	l.put(colR[3], l.y, "cut-off, %", planSmall, false, true, MutedText)
	l.y += step
	for k, r := range colR {
		l.put(r, l.y, endName(k%2), planSmall, false, true, MutedText)
	}
	l.y += step
	for i, p := range r.Now {
		l.put(x0, l.y, p.Notch, planSmall, true, false, InkText)
		if !side {
			l.y += step
		}
		for k, c := range cells[i] {
			l.put(colR[k], l.y, c, planSmall, false, true, InkText)
		}
		l.y += step
	}
}

// CutOffState is an end's cut-off in % of the stroke as a bare number, or
// why it has none ("never opens", "never closes").
func CutOffState(e plan.EndState) string {
	switch {
	case e.NeverOpens:
		return "never opens"
	case e.NeverCloses:
		return "never closes"
	}
	return fmt.Sprintf("%.*f", cutOffDigits, e.CutOffPercent+0)
}

// joinWords joins a list of phrases with commas and a final "and".
func joinWords(ws []string) string {
	switch len(ws) {
	case 0:
		return ""
	case 1:
		return ws[0]
	}
	out := ws[0]
	for _, w := range ws[1 : len(ws)-1] {
		out += ", " + w
	}
	return out + " and " + ws[len(ws)-1]
}

// historyPositions are the positions the history's rounds give events
// in, in the order of the first round that gives each.
func historyPositions(h History) []string {
	var out []string
	seen := map[string]bool{}
	for _, r := range h.Rounds {
		for _, p := range r.Now {
			if !seen[p.Notch] {
				seen[p.Notch] = true
				out = append(out, p.Notch)
			}
		}
	}
	return out
}

// historyChartSpec is the chart card's texts and sizes.
func historyChartSpec(h History, ps []string) CardSpec {
	_, yt := historyRange(h)
	return CardSpec{
		Title:      "Lead, front less back, round by round",
		Sub:        fmt.Sprintf("In %s; the band: within %s of even.", unitWordsOf(h.Unit), session.FormatLength(h.LeadTolMM, h.Unit)),
		LegendRows: len(ps),
		YTickWidth: yTickWidth(yt, nil),
		MaxPlotH:   historyChartH,
	}
}

// historyRange returns the chart's half-range of lead differences in the
// display unit, the band and every round's difference inside it, and its
// ticks.
func historyRange(h History) (half float64, ticks []float64) {
	half = inUnit(h.LeadTolMM, h.Unit) * 1.5
	for _, r := range h.Rounds {
		for _, p := range r.Now {
			half = math.Max(half, math.Abs(inUnit(p.Front.LeadMM-p.Back.LeadMM, h.Unit)))
		}
	}
	half = NiceCeil(half * 1.1)
	return half, Ticks(-half, half, 5)
}

// inUnit turns mm into the display unit.
func inUnit(mm float64, unit session.Unit) float64 {
	if unit == session.UnitInch {
		return mm / session.MMPerInch
	}
	return mm
}

// HistoryCard draws h in box (see LayoutHistory): the chart of the lead
// differences, front less back, round by round per position in the
// display unit with the band of even, and each round's changes and table.
// The app draws each round's button over its row.
func HistoryCard(c Canvas, box Rect, h History, rowH float64, th Theme) {
	if !usable(box) {
		return
	}
	l := LayoutHistory(box, h, rowH)
	if l.Box.H() > 0 {
		historyChart(c, l, h, th)
	}
	for _, r := range l.Rules {
		c.Stroke(segment(r.Min, r.Max), th.GridLine())
	}
	DrawTexts(c, l.Texts, th)
}

// historyChart draws the chart card of l.
func historyChart(c Canvas, l HistoryLayout, h History, th Theme) {
	drawCard(c, l.Box, l.Chart, th)
	half, yt := historyRange(h)
	n := len(h.Rounds)
	var xt []float64
	for k := 1; k <= n; k++ {
		xt = append(xt, float64(k))
	}
	ax := NewAxes(l.Chart.Plot, 0.5, float64(n)+0.5, -half, half, xt, yt)
	tol := inUnit(h.LeadTolMM, h.Unit)
	c.Fill(RectPath(Rect{ax.At(0.5, tol), ax.At(float64(n)+0.5, -tol)}), FillStyle{Color: tint(th.Accent, 0.18)})
	ax.Draw(c, l.Chart.XTicksY, th)
	c.Text(Point{l.Chart.Plot.Min.X, l.Chart.YLabelY}, "front less back, "+unitShort(h.Unit), TextStyle{Color: th.Muted, Size: BodySize, VAlign: Top})
	c.Text(Point{(l.Chart.Plot.Min.X + l.Chart.Plot.Max.X) / 2, l.Chart.XLabelY}, "round", TextStyle{Color: th.Muted, Size: BodySize, HAlign: Center, VAlign: Top})
	styles := historyStyles(th)
	var legend []LegendEntry
	for i, name := range historyPositions(h) {
		st := styles[i%len(styles)]
		var pts []Point
		for k, r := range h.Rounds {
			for _, p := range r.Now {
				if p.Notch == name {
					pts = append(pts, ax.At(float64(k+1), clampAbs(inUnit(p.Front.LeadMM-p.Back.LeadMM, h.Unit), half)))
				}
			}
		}
		c.Stroke(polyline(pts), st.line)
		for _, pt := range pts {
			st.mark(c, pt)
		}
		line := st.line
		legend = append(legend, LegendEntry{Line: &line, Mark: st.mark, Label: name})
	}
	DrawLegend(c, l.Chart.Legend, legend, th)
}

// historyStyle is how the chart draws one position: its line and marker.
type historyStyle struct {
	line LineStyle
	mark func(c Canvas, at Point)
}

// historyStyles are the chart's positions' styles in turn, told apart by
// marker shape as well as colour.
func historyStyles(th Theme) []historyStyle {
	return []historyStyle{
		{LineStyle{Color: th.Accent, Width: 2.5}, func(c Canvas, at Point) { c.Fill(Circle(at, MarkerRadius), FillStyle{Color: th.Accent}) }},
		{LineStyle{Color: th.Ink, Width: 2}, func(c Canvas, at Point) { diamond(c, at, th.Ink, th.Surface) }},
		{LineStyle{Color: th.Muted, Width: 2}, func(c Canvas, at Point) { ring(c, at, true, th.Muted, th.Surface) }},
	}
}

// bareLength writes a length in the display unit without the unit, as the
// plan's words round it.
func bareLength(mm float64, unit session.Unit) string {
	s := session.FormatLength(mm, unit)
	return s[:strings.LastIndexByte(s, ' ')]
}

// unitShort is the display unit's short name: "in" or "mm".
func unitShort(unit session.Unit) string {
	if unit == session.UnitInch {
		return "in"
	}
	return "mm"
}

// unitWordsOf names the display unit in a sentence: "inches" or "mm".
func unitWordsOf(unit session.Unit) string {
	if unit == session.UnitInch {
		return "inches"
	}
	return "mm"
}
