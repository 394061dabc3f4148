package render

// Plot helpers shared by the diagrams: a frame of axes with grid and tick
// labels, curves sampled into it, and a legend. Each diagram lays out its
// own box and then draws through these, so every plot reads the same way.

// LegendRow is the height of one legend row in logical units.
const LegendRow = legendRow

// Axes is a plot's frame: the plotting area, the scales mapping data onto
// it, and the tick values. Use NewAxes.
type Axes struct {
	Plot           Rect  // plotting area; the axes run along its left and bottom
	X, Y           Scale // data to logical units
	XTicks, YTicks []float64
	// YLabel writes a y tick's label; nil writes the value (FormatTick).
	// A length plotted in mm and read in inches labels its ticks so.
	YLabel func(v float64) string
}

// NewAxes maps the data ranges [x0, x1] and [y0, y1] onto plot, with y
// growing upward as on paper.
func NewAxes(plot Rect, x0, x1, y0, y1 float64, xticks, yticks []float64) Axes {
	return Axes{
		Plot:   plot,
		X:      Scale{Min: x0, Max: x1, A: plot.Min.X, B: plot.Max.X},
		Y:      Scale{Min: y0, Max: y1, A: plot.Max.Y, B: plot.Min.Y},
		XTicks: xticks,
		YTicks: yticks,
	}
}

// At returns the logical point of data (x, y).
func (a Axes) At(x, y float64) Point { return Point{a.X.At(x), a.Y.At(y)} }

// Draw draws the grid at the ticks, the two axes with tick marks, the y
// tick labels right-aligned left of the axis and the x tick labels centred
// under their ticks with their tops at xLabelsTop.
func (a Axes) Draw(c Canvas, xLabelsTop float64, th Theme) {
	p := a.Plot
	var grid, ticks Path
	for _, v := range a.XTicks {
		x := a.X.At(v)
		grid.MoveTo(Point{x, p.Min.Y})
		grid.LineTo(Point{x, p.Max.Y})
		ticks.MoveTo(Point{x, p.Max.Y})
		ticks.LineTo(Point{x, p.Max.Y + tickLen})
		c.Text(Point{x, xLabelsTop}, FormatTick(v), TextStyle{Color: th.Ink, Size: BodySize, HAlign: Center, VAlign: Top})
	}
	for _, v := range a.YTicks {
		y := a.Y.At(v)
		grid.MoveTo(Point{p.Min.X, y})
		grid.LineTo(Point{p.Max.X, y})
		ticks.MoveTo(Point{p.Min.X - tickLen, y})
		ticks.LineTo(Point{p.Min.X, y})
		c.Text(Point{p.Min.X - tickLen - 3, y}, a.yLabel(v), TextStyle{Color: th.Ink, Size: BodySize, HAlign: Right, VAlign: Middle})
	}
	c.Stroke(grid, th.GridLine())
	var axes Path
	axes.MoveTo(p.Min)
	axes.LineTo(Point{p.Min.X, p.Max.Y})
	axes.LineTo(p.Max)
	c.Stroke(axes, th.AxisLine())
	c.Stroke(ticks, th.AxisLine())
}

// yLabel is the label of y tick v.
func (a Axes) yLabel(v float64) string {
	if a.YLabel != nil {
		return a.YLabel(v)
	}
	return FormatTick(v)
}

// Curve samples f at x0, x0+step, ... up to x1 (inclusive when it lands on
// a step) and returns the polyline through the points in logical units.
// A step that is not positive gives an empty path.
func (a Axes) Curve(x0, x1, step float64, f func(x float64) float64) Path {
	var p Path
	if !(step > 0) {
		return p
	}
	n := int((x1-x0)/step + 1e-9)
	for i := 0; i <= n; i++ {
		x := x0 + float64(i)*step
		pt := a.At(x, f(x))
		if i == 0 {
			p.MoveTo(pt)
		} else {
			p.LineTo(pt)
		}
	}
	return p
}

// VLine returns a vertical line across the plot at data x.
func (a Axes) VLine(x float64) Path {
	var p Path
	p.MoveTo(Point{a.X.At(x), a.Plot.Min.Y})
	p.LineTo(Point{a.X.At(x), a.Plot.Max.Y})
	return p
}

// LegendEntry is one row of a legend: a short line sample, a marker, or a
// marker on a line, then the label.
type LegendEntry struct {
	Line  *LineStyle               // line sample; nil for none
	Mark  func(c Canvas, at Point) // marker drawn at the sample's middle; nil for none
	Label string
}

// DrawLegend draws entries one per LegendRow from the top-left at, and
// returns the height used.
func DrawLegend(c Canvas, at Point, entries []LegendEntry, th Theme) float64 {
	tx := at.X + legendLineW + 10
	y := at.Y + legendRow/2
	for _, e := range entries {
		if e.Line != nil {
			var p Path
			p.MoveTo(Point{at.X, y})
			p.LineTo(Point{at.X + legendLineW, y})
			c.Stroke(p, *e.Line)
		}
		if e.Mark != nil {
			e.Mark(c, Point{at.X + legendLineW/2, y})
		}
		c.Text(Point{tx, y}, e.Label, TextStyle{Color: th.Ink, Size: BodySize, VAlign: Middle})
		y += legendRow
	}
	return float64(len(entries)) * legendRow
}
