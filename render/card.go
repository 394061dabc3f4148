package render

import (
	"image/color"
	"math"
)

// CardLayout is where a plot card puts each part inside its box: title,
// figures line, y-axis label, the plot, an optional strip under the plot
// sharing its x axis (residuals), tick labels, the x-axis label, a legend
// and a caption. Narrow boxes stack legend and caption under the plot;
// boxes at least sideColumnFrom wide inside put them in a column on the
// right. It is a plain function of the box and the texts (LayoutCard), so
// it is tested with numbers.
type CardLayout struct {
	Inner    Rect     // the box less the card padding
	Title    []string // wrapped title lines
	Sub      []string // wrapped figures lines
	TitleY   float64  // top of the first title line
	SubY     float64  // top of the first figures line
	YLabelY  float64  // top of the y-axis label line
	Plot     Rect     // the plotting area
	Strip    Rect     // the strip under the plot (zero height when not asked)
	XTicksY  float64  // top of the x tick labels
	XLabelY  float64  // top of the x-axis label
	Legend   Point    // top-left of the first legend row
	Caption  []string // wrapped caption lines
	CaptionX float64  // left of the caption lines
	CaptionY float64  // top of the first caption line
	NeedH    float64  // the box height the card needs with a plot of minPlotH
}

// minPlotH is the least plot height a card keeps; a box too short for it
// overflows at the bottom rather than squash the plot.
const minPlotH = 100

// CardSpec says what a plot card holds, for LayoutCard.
type CardSpec struct {
	Title, Sub, Caption string
	LegendRows          int     // rows of the legend
	YTickWidth          float64 // widest y tick label
	StripH              float64 // height of the strip under the plot; 0 for none
	MaxPlotH            float64 // the plot's greatest height; 0 for no limit
}

// LayoutCard lays out a plot card in box.
func LayoutCard(box Rect, s CardSpec) CardLayout {
	var l CardLayout
	l.Inner = box.Inset(cardPad)
	w := l.Inner.W()
	l.Title = Wrap(s.Title, w, TitleSize, true)
	if s.Sub != "" {
		l.Sub = Wrap(s.Sub, w, BodySize, false)
	}
	y := l.Inner.Min.Y
	l.TitleY = y
	y += float64(len(l.Title)) * lineStep(TitleSize)
	l.SubY = y
	if len(l.Sub) > 0 {
		y += float64(len(l.Sub)) * lineStep(BodySize)
	}
	y += gap
	l.YLabelY = y
	// Room for the top tick label, centred on the plot's top edge.
	y += lineStep(BodySize) + BodySize*0.65
	top := y
	left := l.Inner.Min.X + s.YTickWidth + tickLen + 4
	right := l.Inner.Max.X - TextWidth("360", BodySize, false)/2
	stripH := 0.0
	if s.StripH > 0 {
		stripH = s.StripH + gap
	}
	axisBelow := stripH + tickLen + 2 + 2*lineStep(BodySize)
	legendH := float64(s.LegendRows) * legendRow
	var below float64
	side := w >= sideColumnFrom
	if side {
		sw := math.Min(300, 0.38*w)
		l.Legend = Point{l.Inner.Max.X - sw, l.YLabelY}
		l.Caption = wrapSome(s.Caption, sw)
		l.CaptionX = l.Legend.X
		l.CaptionY = l.Legend.Y + legendH + gap
		right = l.Legend.X - 2*gap - TextWidth("360", BodySize, false)/2
		below = axisBelow
	} else {
		l.Caption = wrapSome(s.Caption, w)
		below = axisBelow + gap + legendH + gap + float64(len(l.Caption))*lineStep(BodySize)
	}
	bottom := math.Max(l.Inner.Max.Y-below, top+minPlotH)
	if s.MaxPlotH > 0 {
		bottom = math.Min(bottom, top+math.Max(s.MaxPlotH, minPlotH))
	}
	l.Plot = Rect{Point{left, top}, Point{right, bottom}}
	y = bottom
	if s.StripH > 0 {
		l.Strip = Rect{Point{left, bottom + gap}, Point{right, bottom + gap + s.StripH}}
		y = l.Strip.Max.Y
	} else {
		l.Strip = Rect{Point{left, bottom}, Point{right, bottom}}
	}
	y += tickLen + 2
	l.XTicksY = y
	y += lineStep(BodySize)
	l.XLabelY = y
	y += lineStep(BodySize)
	if !side {
		y += gap
		l.Legend = Point{l.Inner.Min.X, y}
		l.CaptionX = l.Inner.Min.X
		l.CaptionY = y + legendH + gap
		y = l.CaptionY + float64(len(l.Caption))*lineStep(BodySize)
	} else {
		y = math.Max(y, l.CaptionY+float64(len(l.Caption))*lineStep(BodySize))
	}
	l.NeedH = y + cardPad - box.Min.Y
	if s.MaxPlotH == 0 {
		// With no limit the plot grows into any height; NeedH is with
		// the least plot.
		l.NeedH -= l.Plot.H() - minPlotH
	}
	return l
}

// wrapSome wraps body text, giving no lines for none.
func wrapSome(text string, w float64) []string {
	if text == "" {
		return nil
	}
	return Wrap(text, w, BodySize, false)
}

// drawCard fills the card's ground and draws its title, figures line and
// caption.
func drawCard(c Canvas, box Rect, l CardLayout, th Theme) {
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	drawLines(c, Point{l.Inner.Min.X, l.TitleY}, l.Title, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
	drawLines(c, Point{l.Inner.Min.X, l.SubY}, l.Sub, TextStyle{Color: th.Muted, Size: BodySize})
	drawLines(c, Point{l.CaptionX, l.CaptionY}, l.Caption, TextStyle{Color: th.Ink, Size: BodySize})
}

// cardMessage draws a card holding only a title and a message (a model
// that cannot be drawn).
func cardMessage(c Canvas, box Rect, title, msg string, th Theme) {
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	in := box.Inset(cardPad)
	lines := Wrap(title, in.W(), TitleSize, true)
	drawLines(c, in.Min, lines, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
	y := in.Min.Y + float64(len(lines))*lineStep(TitleSize) + gap
	drawLines(c, Point{in.Min.X, y}, Wrap(msg, in.W(), BodySize, false), TextStyle{Color: th.Muted, Size: BodySize})
}

// tint returns col at opacity a (0 to 1), alpha-premultiplied.
func tint(col color.RGBA, a float64) color.RGBA {
	a = math.Max(0, math.Min(1, a))
	return color.RGBA{uint8(float64(col.R)*a + 0.5), uint8(float64(col.G)*a + 0.5), uint8(float64(col.B)*a + 0.5), uint8(255*a + 0.5)}
}

// hatch returns diagonal lines (rising to the right) spaced step apart,
// clipped to r: the pattern that marks the back end's areas, so they differ
// from the front's by more than colour.
func hatch(r Rect, step float64) Path {
	var p Path
	if !(step > 0) || !(r.W() > 0) || !(r.H() > 0) {
		return p
	}
	// Lines x + y = k for k across the box.
	for k := r.Min.X + r.Min.Y + step/2; k < r.Max.X+r.Max.Y; k += step {
		// Entry and exit of the line through the box.
		x0 := math.Max(r.Min.X, k-r.Max.Y)
		x1 := math.Min(r.Max.X, k-r.Min.Y)
		if x1 <= x0 {
			continue
		}
		p.MoveTo(Point{x0, k - x0})
		p.LineTo(Point{x1, k - x1})
	}
	return p
}

// yTickWidth returns the width of the widest tick label, written by
// label (nil: FormatTick).
func yTickWidth(ticks []float64, label func(float64) string) float64 {
	if label == nil {
		label = FormatTick
	}
	w := 0.0
	for _, v := range ticks {
		w = math.Max(w, TextWidth(label(v), BodySize, false))
	}
	return w
}

// polyline returns the path through pts.
func polyline(pts []Point) Path {
	p := make(Path, 0, len(pts))
	for i, pt := range pts {
		if i == 0 {
			p.MoveTo(pt)
		} else {
			p.LineTo(pt)
		}
	}
	return p
}

// ring draws a hollow marker: the end's shape outlined, for exhaust events.
func ring(c Canvas, at Point, back bool, col, ground color.RGBA) {
	var p Path
	if back {
		r := MarkerRadius * 0.9
		p = RectPath(Rect{Point{at.X - r, at.Y - r}, Point{at.X + r, at.Y + r}})
	} else {
		p = Circle(at, MarkerRadius)
	}
	c.Fill(p, FillStyle{Color: ground})
	c.Stroke(p, LineStyle{Color: col, Width: 2})
}

// diamond draws a reading's marker: a small diamond, a shape neither end
// uses.
func diamond(c Canvas, at Point, col, ground color.RGBA) {
	r := MarkerRadius * 0.95
	var p Path
	p.MoveTo(Point{at.X, at.Y - r})
	p.LineTo(Point{at.X + r, at.Y})
	p.LineTo(Point{at.X, at.Y + r})
	p.LineTo(Point{at.X - r, at.Y})
	p.Close()
	c.Fill(p, FillStyle{Color: col})
	c.Stroke(p, LineStyle{Color: ground, Width: 1})
}
