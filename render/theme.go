package render

import "image/color"

// Theme is a palette and the line and marker styles built from it. Every
// diagram takes one, so light and dark screens and the printed report draw
// from the same code. Front and back ends of the cylinder differ by line
// pattern and marker shape as well as colour (front: solid line, round
// markers; back: dashed line, square markers), so a reader who cannot tell
// the two colours apart still can tell the ends apart.
//
// The colours are opaque; color.RGBA values are alpha-premultiplied as in
// image/color.
type Theme struct {
	Background color.RGBA // page
	Surface    color.RGBA // cards and plot areas, a step off the page
	Ink        color.RGBA // text, axes, the main curve's outline
	Muted      color.RGBA // secondary text, comparison curves
	Grid       color.RGBA // grid lines, card borders
	Front      color.RGBA // the front (cover) end of the cylinder
	Back       color.RGBA // the back (crank) end of the cylinder
	Accent     color.RGBA // the main curve, buttons
	OnAccent   color.RGBA // text on an Accent fill
	Warn       color.RGBA // cautions and out-of-tolerance marks
}

func rgb(r, g, b uint8) color.RGBA { return color.RGBA{r, g, b, 0xff} }

// Light returns the light theme: dark ink on warm paper, for daylight and
// printing.
func Light() Theme {
	return Theme{
		Background: rgb(0xf7, 0xf5, 0xef),
		Surface:    rgb(0xff, 0xff, 0xff),
		Ink:        rgb(0x1c, 0x22, 0x2b),
		Muted:      rgb(0x5f, 0x67, 0x73),
		Grid:       rgb(0xd6, 0xd9, 0xde),
		Front:      rgb(0x0a, 0x5e, 0xb8),
		Back:       rgb(0xc2, 0x4a, 0x0e),
		Accent:     rgb(0x0d, 0x6e, 0x5a),
		OnAccent:   rgb(0xff, 0xff, 0xff),
		Warn:       rgb(0xa8, 0x1f, 0x1f),
	}
}

// Dark returns the dark theme: light ink on a blue-black ground, for the
// shed and the evening.
func Dark() Theme {
	return Theme{
		Background: rgb(0x11, 0x15, 0x1b),
		Surface:    rgb(0x1b, 0x21, 0x2a),
		Ink:        rgb(0xe9, 0xec, 0xf0),
		Muted:      rgb(0x9b, 0xa5, 0xb2),
		Grid:       rgb(0x34, 0x3d, 0x4a),
		Front:      rgb(0x6c, 0xb4, 0xff),
		Back:       rgb(0xff, 0xa0, 0x5c),
		Accent:     rgb(0x42, 0xc9, 0xa4),
		OnAccent:   rgb(0x0b, 0x1a, 0x16),
		Warn:       rgb(0xff, 0x7a, 0x6e),
	}
}

// Line widths in logical units.
const (
	// CurveWidth is the width of a plotted curve.
	CurveWidth = 2.5
	// AxisWidth is the width of axes and tick marks.
	AxisWidth = 1.25
	// GridWidth is the width of grid lines.
	GridWidth = 1
	// MarkerRadius is the half-size of a curve marker (circle radius, half
	// the square's side).
	MarkerRadius = 5
)

// FrontLine returns the style of a front-end curve: solid.
func (t Theme) FrontLine() LineStyle { return LineStyle{Color: t.Front, Width: CurveWidth} }

// BackLine returns the style of a back-end curve: dashed.
func (t Theme) BackLine() LineStyle {
	return LineStyle{Color: t.Back, Width: CurveWidth, Dashes: []float64{9, 5}}
}

// CurveLine returns the style of a diagram's main curve when it belongs to
// neither end: solid, in the accent colour.
func (t Theme) CurveLine() LineStyle { return LineStyle{Color: t.Accent, Width: CurveWidth + 0.5} }

// CompareLine returns the style of a comparison or reference curve: thin,
// muted and finely dashed, so it reads as "for reference" next to the main
// curve.
func (t Theme) CompareLine() LineStyle {
	return LineStyle{Color: t.Muted, Width: 1.75, Dashes: []float64{4, 4}}
}

// AxisLine returns the style of axes and ticks.
func (t Theme) AxisLine() LineStyle { return LineStyle{Color: t.Ink, Width: AxisWidth} }

// GridLine returns the style of grid lines.
func (t Theme) GridLine() LineStyle { return LineStyle{Color: t.Grid, Width: GridWidth} }

// Text returns a text style in the ink colour at size (0 means 14).
func (t Theme) Text(size float64) TextStyle { return TextStyle{Color: t.Ink, Size: size} }

// FrontMark draws the front-end marker, a filled circle with a ring of the
// surface colour so it stays visible on top of a curve.
// Its 1.5-wide halo in the card colour is drawn as two fills, a disc to
// the halo's outer edge and the marker's colour within its inner edge:
// the pixels of a stroke round the filled circle, as two convex fills a
// backend draws cheaply (a marker is drawn dozens of times a frame while
// the what-if is dragged).
func (t Theme) FrontMark(c Canvas, at Point) {
	c.Fill(Circle(at, MarkerRadius+markHalo/2), FillStyle{Color: t.Surface})
	c.Fill(Circle(at, MarkerRadius-markHalo/2), FillStyle{Color: t.Front})
}

// markHalo is the width of the card-coloured ring round a marker.
const markHalo = 1.5

// BackMark draws the back-end marker, a filled square of the same area as
// FrontMark's circle would cover at a glance.
// Its halo is two fills as FrontMark's; the halo's outer corners are
// rounded, as a stroke's round joins would make them.
func (t Theme) BackMark(c Canvas, at Point) {
	r := MarkerRadius * 0.9
	box := Rect{Point{at.X - r, at.Y - r}, Point{at.X + r, at.Y + r}}
	c.Fill(RoundRect(box.Inset(-markHalo/2), markHalo/2), FillStyle{Color: t.Surface})
	c.Fill(RectPath(box.Inset(markHalo/2)), FillStyle{Color: t.Back})
}
