package render

import (
	"fmt"
	"math"
	"strconv"

	"evenbeat/setting"
)

// Text sizes of the diagrams, in logical units (CSS px). Nothing is drawn
// below 14, the least a phone reader should be asked to read.
const (
	TitleSize   = 18 // card titles, bold
	BodySize    = 14 // labels, ticks, captions
	ButtonSize  = 18 // button labels, bold
	cardPad     = 14 // inner padding of a card
	cardRadius  = 12 // corner radius of a card
	gap         = 8  // space between blocks
	tickLen     = 5  // length of a tick mark
	legendRow   = 22 // height of one legend row
	legendLineW = 30 // length of a legend line sample
)

// pistonStep is the crank-angle step, in degrees, between the points of
// the piston curve: 2 degrees is under 2 px across a phone-wide plot.
const pistonStep = 2

// PistonLayout is where PistonCurve puts each part inside its box. It is a
// plain function of the box and the texts, so it is tested with numbers.
type PistonLayout struct {
	Inner    Rect     // the box less the card padding
	Title    []string // wrapped title lines
	Sub      []string // wrapped figures lines
	TitleY   float64  // top of the first title line
	SubY     float64  // top of the first figures line
	YLabelY  float64  // top of the y-axis label line
	Plot     Rect     // the plotting area (axes at its left and bottom)
	XTicksY  float64  // top of the x tick labels
	XLabelY  float64  // top of the x-axis label
	Legend   Point    // top-left of the first legend row
	Caption  []string // wrapped caption lines
	CaptionX float64  // left of the caption lines
	CaptionY float64  // top of the first caption line
}

// sideColumnFrom is the inner width from which the legend and caption move
// beside the plot instead of under it (a phone on its side, a report).
const sideColumnFrom = 600

// lineStep returns the baseline-to-baseline distance of text of a size.
func lineStep(size float64) float64 { return size * LineHeight }

// LayoutPiston lays out the piston diagram in box for the given title,
// figures and caption texts. Narrow boxes stack legend and caption under
// the plot; boxes at least sideColumnFrom wide inside put them in a column
// on the right. The plot takes whatever height is left, but never less
// than 40 units (on a box too small for that the diagram overflows at the
// bottom rather than squash the plot to nothing).
func LayoutPiston(box Rect, title, sub, caption string) PistonLayout {
	var l PistonLayout
	l.Inner = box.Inset(cardPad)
	w := l.Inner.W()
	l.Title = Wrap(title, w, TitleSize, true)
	l.Sub = Wrap(sub, w, BodySize, false)
	y := l.Inner.Min.Y
	l.TitleY = y
	y += float64(len(l.Title)) * lineStep(TitleSize)
	l.SubY = y
	y += float64(len(l.Sub))*lineStep(BodySize) + gap
	l.YLabelY = y
	y += lineStep(BodySize) + gap
	top := y
	left := l.Inner.Min.X + TextWidth("100", BodySize, false) + tickLen + 4
	right := l.Inner.Max.X - TextWidth("360", BodySize, false)/2
	axisBelow := tickLen + 2 + 2*lineStep(BodySize) // tick labels and axis label
	legendH := 4.0 * legendRow
	var below float64
	if w >= sideColumnFrom {
		side := math.Min(300, 0.38*w)
		l.Legend = Point{l.Inner.Max.X - side, l.YLabelY}
		l.Caption = Wrap(caption, side, BodySize, false)
		l.CaptionX = l.Legend.X
		l.CaptionY = l.Legend.Y + legendH + gap
		right = l.Legend.X - 2*gap - TextWidth("360", BodySize, false)/2
		below = axisBelow
	} else {
		l.Caption = Wrap(caption, w, BodySize, false)
		below = axisBelow + gap + legendH + gap + float64(len(l.Caption))*lineStep(BodySize)
	}
	bottom := math.Max(l.Inner.Max.Y-below, top+40)
	l.Plot = Rect{Point{left, top}, Point{right, bottom}}
	y = bottom + tickLen + 2
	l.XTicksY = y
	y += lineStep(BodySize)
	l.XLabelY = y
	if w < sideColumnFrom {
		y += lineStep(BodySize) + gap
		l.Legend = Point{l.Inner.Min.X, y}
		l.CaptionX = l.Inner.Min.X
		l.CaptionY = y + legendH + gap
	}
	return l
}

// PistonCurve draws the piston's position (per cent of stroke from front
// dead centre) against crank angle, 0 to 360 degrees, for engine e in box,
// as a card: the exact curve for the finite connecting rod, the same curve
// for an infinitely long rod (a pure cosine) for comparison so the rod's
// angularity shows, both dead centres marked (front: round marker, back:
// square), axes with round ticks, and a title with the engine's figures.
// An engine that fails Validate gets the card with the validation message
// in place of the plot. A box that is empty or not finite draws nothing. The curves use setting.Engine.Prepare's exact
// slider-crank.
func PistonCurve(c Canvas, e setting.Engine, box Rect, th Theme) {
	if !usable(box) {
		return
	}
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	const title = "Piston position against crank angle"
	crank, err := e.Prepare()
	if err != nil {
		in := box.Inset(cardPad)
		drawLines(c, Point{in.Min.X, in.Min.Y}, Wrap(title, in.W(), TitleSize, true), TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
		y := in.Min.Y + lineStep(TitleSize) + gap
		drawLines(c, Point{in.Min.X, y}, Wrap(err.Error(), in.W(), BodySize, false), TextStyle{Color: th.Warn, Size: BodySize})
		return
	}
	bdc := crank.BackDeadCentre()
	sub := fmt.Sprintf("Crank radius %s mm, connecting rod %s mm, stroke %s mm. Back dead centre at %s°.",
		mm(e.CrankRadius), mm(e.RodLength), mm(crank.Stroke()), deg(bdc))
	at90 := 100 * crank.PistonFraction(90)
	caption := fmt.Sprintf("At 90° the piston has gone %s %% of its stroke, not 50 %%: the slant of the connecting rod holds it nearer the back end than a pure cosine would.", pct(at90))
	l := LayoutPiston(box, title, sub, caption)

	ink := TextStyle{Color: th.Ink, Size: BodySize}
	muted := TextStyle{Color: th.Muted, Size: BodySize}
	drawLines(c, Point{l.Inner.Min.X, l.TitleY}, l.Title, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
	drawLines(c, Point{l.Inner.Min.X, l.SubY}, l.Sub, muted)
	c.Text(Point{l.Inner.Min.X, l.YLabelY}, "piston, % of stroke", TextStyle{Color: th.Muted, Size: BodySize, VAlign: Top})

	ax := NewAxes(l.Plot, 0, 360, 0, 100, AngleTicks(0, 360, 4), Ticks(0, 100, 4))
	ax.Draw(c, l.XTicksY, th)
	c.Text(Point{(l.Plot.Min.X + l.Plot.Max.X) / 2, l.XLabelY}, "crank angle, degrees", TextStyle{Color: th.Muted, Size: BodySize, HAlign: Center, VAlign: Top})

	// Curves: the infinitely long rod first, so the real one lies on top.
	c.Stroke(ax.Curve(0, 360, pistonStep, func(a float64) float64 { return 50 * (1 - math.Cos(a*math.Pi/180)) }), th.CompareLine())
	c.Stroke(ax.Curve(0, 360, pistonStep, func(a float64) float64 { return 100 * crank.PistonFraction(a) }), th.CurveLine())

	// Dead centres: front at 0 and 360, back at its own angle.
	c.Stroke(ax.VLine(bdc), LineStyle{Color: th.Back, Width: 1, Dashes: []float64{3, 3}})
	th.FrontMark(c, ax.At(0, 0))
	th.FrontMark(c, ax.At(360, 0))
	th.BackMark(c, ax.At(bdc, 100))

	curveLine, compareLine := th.CurveLine(), th.CompareLine()
	DrawLegend(c, l.Legend, []LegendEntry{
		{Line: &curveLine, Label: "connecting rod " + mm(e.RodLength) + " mm"},
		{Line: &compareLine, Label: "infinitely long rod (pure cosine)"},
		{Mark: th.FrontMark, Label: "front dead centre, 0°"},
		{Mark: th.BackMark, Label: "back dead centre, " + deg(bdc) + "°"},
	}, th)

	drawLines(c, Point{l.CaptionX, l.CaptionY}, l.Caption, ink)
}

// drawLines draws lines of text downward from top-left at, one line step
// apart, each line's box top on its row.
func drawLines(c Canvas, at Point, lines []string, s TextStyle) {
	size := textSize(s)
	s.VAlign = Top
	for i, ln := range lines {
		if ln == "" {
			continue
		}
		c.Text(Point{at.X, at.Y + float64(i)*lineStep(size)}, ln, s)
	}
}

// mm formats a length in millimetres to at most one decimal.
func mm(v float64) string { return strconv.FormatFloat(math.Round(v*10)/10, 'f', -1, 64) }

// deg formats an angle in degrees to one decimal.
func deg(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }

// pct formats a percentage to one decimal.
func pct(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }
