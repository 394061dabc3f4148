package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/beat"
)

// beatTitle is the beat card's title for position pos.
func beatTitle(pos beat.Position) string { return "The beat, " + pos.Name }

// BeatFigures is the beat card's figures line: the evenness (largest gap
// over smallest) today and after the plan, and what was heard.
func BeatFigures(pos beat.Position, heard []float64) string {
	s := fmt.Sprintf("Largest gap over smallest: %.2f today, %.2f after the plan.", pos.Now.Evenness(), pos.After.Evenness())
	if len(heard) > 1 {
		s += fmt.Sprintf(" Heard: %.2f.", gapEvenness(heard))
	}
	return s
}

// gapEvenness is the largest of gaps over the smallest.
func gapEvenness(gaps []float64) float64 {
	lo, hi := math.Inf(1), 0.0
	for _, g := range gaps {
		lo, hi = math.Min(lo, g), math.Max(hi, g)
	}
	if !(lo > 0) {
		return 0
	}
	return hi / lo
}

// LayoutBeat lays out the beat card for pos in box: a square plot for the
// circle.
func LayoutBeat(box Rect, pos beat.Position, heard []float64) CardLayout {
	legend := 3
	if len(heard) > 0 {
		legend = 4
	}
	return LayoutCard(box, CardSpec{
		Title: beatTitle(pos),
		Sub:   BeatFigures(pos, heard),
		Caption: "One turn of the wheel, running " + pos.Direction.String() + " clockwise from the top. Each dot is an exhaust, named by its cylinder and end; " +
			"the figures between them are the gaps in degrees of crank. An even beat has every gap alike; the dashed spokes mark where it would fall.",
		LegendRows: legend, MaxPlotH: math.Min(0.85*box.W(), 380),
	})
}

// BeatCard draws the whole engine's beat in one position: a clock face
// for one turn of the wheel, every exhaust today (hollow) and after the
// plan (filled) at its crank angle, the gaps between them in degrees, the
// even beat's places as ticks, and, when heard is given (the gaps a
// recording found, in the same order from the first exhaust), those too.
func BeatCard(c Canvas, box Rect, pos beat.Position, heard []float64, th Theme) {
	if !usable(box) {
		return
	}
	if len(pos.Now.Exhausts) == 0 {
		cardMessage(c, box, beatTitle(pos), "No exhaust opens in this position, so there is no beat to draw.", th)
		return
	}
	l := LayoutBeat(box, pos, heard)
	drawCard(c, box, l, th)
	// Labels take two lines (cylinder, end) beside the circle, one above
	// and below it.
	labelW := 0.0
	for _, e := range pos.Now.Exhausts {
		labelW = math.Max(labelW, math.Max(TextWidth(e.Cylinder, BodySize, false), TextWidth(e.End.String(), BodySize, false)))
	}
	r := math.Min(l.Plot.W()/2-labelW-14, l.Plot.H()/2-lineStep(BodySize)-14)
	if r < 40 {
		r = math.Min(l.Plot.W(), l.Plot.H())/2 - 4
	}
	centre := Point{(l.Plot.Min.X + l.Plot.Max.X) / 2, (l.Plot.Min.Y + l.Plot.Max.Y) / 2}
	first := pos.Now.Exhausts[0].Deg
	sign := 1.0
	if pos.Direction == setting.Backward {
		sign = -1
	}
	// at places crank angle deg (the first cylinder's) on the face: the
	// first exhaust today at the top, turning clockwise as the wheel runs.
	at := func(deg, rad float64) Point {
		a := sign * (deg - first) * math.Pi / 180
		return Point{centre.X + rad*math.Sin(a), centre.Y - rad*math.Cos(a)}
	}
	c.Stroke(Circle(centre, r), th.AxisLine())
	// The even beat: spokes where its exhausts would fall.
	n := len(pos.Now.Exhausts)
	for k := 0; k < n; k++ {
		d := first + sign*float64(k)*360/float64(n)
		var p Path
		p.MoveTo(at(d, 0.12*r))
		p.LineTo(at(d, r))
		c.Stroke(p, LineStyle{Color: th.Grid, Width: AxisWidth, Dashes: []float64{4, 3}})
	}
	dot := func(p Point, filled bool, col LineStyle) {
		if filled {
			c.Fill(Circle(p, 4), FillStyle{Color: col.Color})
			return
		}
		c.Fill(Circle(p, 6.5), FillStyle{Color: th.Surface})
		c.Stroke(Circle(p, 6.5), col)
	}
	for i, e := range pos.Now.Exhausts {
		col := th.FrontLine()
		if e.End == setting.Back {
			col = th.BackLine()
		}
		dot(at(e.Deg, r), false, col)
		// The label outside, clear of the circle on its side: two lines
		// beside it, one line above or below.
		lp := at(e.Deg, r+12)
		ts := TextStyle{Color: th.Ink, Size: BodySize, VAlign: Middle}
		lines := []string{e.Cylinder, e.End.String()}
		switch dx := lp.X - centre.X; {
		case dx > r/3:
			ts.HAlign = Left
		case dx < -r/3:
			ts.HAlign = Right
		default:
			ts.HAlign = Center
			lines = []string{e.Label()}
			if lp.Y < centre.Y {
				ts.VAlign = Bottom
			} else {
				ts.VAlign = Top
			}
		}
		step := lineStep(BodySize)
		y0 := lp.Y - float64(len(lines)-1)*step/2
		if ts.VAlign != Middle {
			y0 = lp.Y
		}
		for k, ln := range lines {
			c.Text(Point{lp.X, y0 + float64(k)*step}, ln, ts)
		}
		// The gap to the next one, inside at the middle of its arc:
		// today, and under it after the plan where that differs.
		mid := at(e.Deg+sign*pos.Now.Gaps[i]/2, 0.6*r)
		now := fmt.Sprintf("%.1f", pos.Now.Gaps[i])
		if i < len(pos.After.Gaps) && math.Abs(pos.After.Gaps[i]-pos.Now.Gaps[i]) >= 0.05 {
			c.Text(Point{mid.X, mid.Y - step/2}, now, TextStyle{Color: th.Ink, Size: BodySize, HAlign: Center, VAlign: Middle})
			c.Text(Point{mid.X, mid.Y + step/2}, fmt.Sprintf("%.1f", pos.After.Gaps[i]), TextStyle{Color: th.Accent, Size: BodySize, HAlign: Center, VAlign: Middle, Bold: true})
		} else {
			c.Text(mid, now, TextStyle{Color: th.Ink, Size: BodySize, HAlign: Center, VAlign: Middle})
		}
	}
	for _, e := range pos.After.Exhausts {
		dot(at(e.Deg, r), true, LineStyle{Color: th.Accent, Width: CurveWidth})
	}
	if len(heard) > 0 {
		d := first
		for _, g := range heard {
			p := at(d, r-18)
			c.Fill(RectPath(Rect{Point{p.X - 4, p.Y - 4}, Point{p.X + 4, p.Y + 4}}), FillStyle{Color: th.Ink})
			d += sign * g
		}
	}
	entries := []LegendEntry{
		{Mark: func(c Canvas, p Point) { dot(p, false, th.FrontLine()) }, Label: "today, front end"},
		{Mark: func(c Canvas, p Point) { dot(p, false, th.BackLine()) }, Label: "today, back end"},
		{Mark: func(c Canvas, p Point) { dot(p, true, LineStyle{Color: th.Accent, Width: CurveWidth}) }, Label: "after the plan (gaps in bold)"},
	}
	if len(heard) > 0 {
		entries = append(entries, LegendEntry{Mark: func(c Canvas, p Point) {
			c.Fill(RectPath(Rect{Point{p.X - 4, p.Y - 4}, Point{p.X + 4, p.Y + 4}}), FillStyle{Color: th.Ink})
		}, Label: "heard"})
	}
	DrawLegend(c, l.Legend, entries, th)
}
