package ui

import (
	"image/color"
	"strings"

	"evenbeat/render"
)

// Draw draws the screen shown on c; it only draws.
func (a *App) Draw(c render.Canvas) {
	a.dirty = false
	th := a.theme
	v := a.layout()
	c.Fill(render.RectPath(rect(0, 0, a.w, a.h)), render.FillStyle{Color: th.Background})
	switch a.screen {
	case Cautions:
		render.Cautions(c, v.body, th)
	case Where:
		render.Motion(c, a.engine, a.wherePosition(), a.crankDeg, v.body, th)
	case History:
		render.HistoryCard(c, v.body, a.history(), rowH, th)
	case Plan:
		if m := a.shownModel(); m != nil {
			render.DrawScreen(c, m, a.renderScreen(), v.body, th)
		}
		a.drawnPlan = a.PlanPending()
	case Whole:
		a.drawWhole(c, v)
	case Listen:
		a.drawListen(c, v)
	}
	for _, p := range v.paras {
		col := th.Ink
		if p.warn {
			col = th.Warn
		} else if p.muted {
			col = th.Muted
		}
		st := render.TextStyle{Color: col, Size: p.size, Bold: p.bold, VAlign: render.Top}
		for i, line := range p.lines {
			c.Text(render.Point{X: p.at.X, Y: p.at.Y + float64(i)*p.size*render.LineHeight}, line, st)
		}
	}
	if v.sketch.W() > 0 {
		render.DimensionSketch(c, v.sketch, a.fields[a.fi].Key, th)
	}
	if v.entry.W() > 0 {
		a.drawEntry(c, v.entry)
	}
	if v.slider.W() > 0 {
		a.drawSlider(c, v.slider)
	}
	for _, t := range v.targets {
		if !t.bar && !t.over && !t.track && !(t.Label == render.AckLabel && a.screen == Cautions) { // the card draws its own
			a.drawTarget(c, t)
		}
	}
	a.drawUndo(c, v)
	// The top bar last, over anything scrolled under it.
	c.Fill(render.RectPath(rect(0, 0, a.w, barH+margin)), render.FillStyle{Color: th.Background})
	c.Text(render.Point{X: a.w / 2, Y: margin/2 + barH/2}, a.shortStatus(), render.TextStyle{Color: a.statusColour(), Size: legibleSize, HAlign: render.Center, VAlign: render.Middle})
	for _, t := range v.targets {
		if t.bar {
			a.drawTarget(c, t)
		}
	}
}

// drawTarget draws a button: a chosen option filled and marked, others
// framed on the card colour.
func (a *App) drawTarget(c render.Canvas, t Target) {
	if t.On {
		render.Button(c, t.Rect, "* "+t.Label, a.theme)
		return
	}
	a.drawPlain(c, t)
}

// drawPlain draws a target as a framed button on the card colour, so the
// chosen option (filled) stands out.
func (a *App) drawPlain(c render.Canvas, t Target) {
	th := a.theme
	// The frame, 1.5 wide on the button's edge, as two fills: the frame's
	// outer edge in the frame colour, then its inner edge in the (opaque)
	// card colour. The same pixels as a stroke, but two convex shapes a
	// backend fills cheaply, where a stroke's outline of rounded corners
	// is worked out and filled with a winding count every frame.
	const frame, radius = 1.5, 10
	c.Fill(a.roundRect(t.Rect.Inset(-frame/2), radius+frame/2), render.FillStyle{Color: th.Grid})
	c.Fill(a.roundRect(t.Rect.Inset(frame/2), radius-frame/2), render.FillStyle{Color: th.Surface})
	label := t.Label
	if t.caption != "" {
		label = t.caption
	}
	lines, size := render.ButtonLines(label, t.Rect.W()-16, t.Rect.H()-4)
	if len(lines) == 1 {
		lines[0] = fitLabel(label, size, t.Rect.W()-16) // too long for two lines: shortened, its value kept
	}
	render.DrawButtonLines(c, t.Rect, lines, size, render.TextStyle{Color: th.Ink, Bold: true})
}

// shortStatus is the saving state in the top bar; a failure's sentence
// is shown in full under it.
func (a *App) shortStatus() string {
	if a.saveErr != "" {
		return "Not saved"
	}
	return a.status
}

// statusColour is the saving state's colour: a failure in the warning
// colour.
func (a *App) statusColour() color.RGBA {
	if a.saveErr != "" {
		return a.theme.Warn
	}
	return a.theme.Muted
}

// drawEntry draws the typed entry, or the value kept when nothing is
// typed.
func (a *App) drawEntry(c render.Canvas, r render.Rect) {
	th := a.theme
	rr := a.roundRect(r, 8)
	c.Fill(rr, render.FillStyle{Color: th.Surface})
	c.Stroke(rr, render.LineStyle{Color: th.Accent, Width: 2})
	text, col := a.text, th.Ink
	if !a.typed || a.text == "" {
		f := a.fields[a.fi]
		if v, ok := f.get(a.Session()); ok {
			text, col = a.showValue(f, v), th.Muted
		} else {
			text, col = "", th.Muted
		}
	}
	mid := (r.Min.Y + r.Max.Y) / 2
	c.Text(render.Point{X: r.Max.X - 16, Y: mid}, a.fieldUnit(a.fields[a.fi]), render.TextStyle{Color: th.Muted, Size: 18, HAlign: render.Right, VAlign: render.Middle})
	c.Text(render.Point{X: r.Min.X + 16, Y: mid}, text, render.TextStyle{Color: col, Size: 30, Bold: true, VAlign: render.Middle})
}

// drawSlider draws the what-if track with the amount's knob and the
// plan's amount marked.
func (a *App) drawSlider(c render.Canvas, r render.Rect) {
	th := a.theme
	mid := (r.Min.Y + r.Max.Y) / 2
	var track render.Path
	track.MoveTo(render.Point{X: r.Min.X, Y: mid})
	track.LineTo(render.Point{X: r.Max.X, Y: mid})
	c.Stroke(track, render.LineStyle{Color: th.Grid, Width: 6})
	at := func(v float64) float64 {
		if a.what.hi <= a.what.lo {
			return (r.Min.X + r.Max.X) / 2
		}
		return r.Min.X + (v-a.what.lo)/(a.what.hi-a.what.lo)*r.W()
	}
	if a.plan != nil {
		x := at(a.planAmount())
		var tick render.Path
		tick.MoveTo(render.Point{X: x, Y: r.Min.Y + 8})
		tick.LineTo(render.Point{X: x, Y: r.Max.Y - 8})
		c.Stroke(tick, render.LineStyle{Color: th.Muted, Width: 2})
	}
	c.Fill(render.Circle(render.Point{X: at(a.what.amounts[a.what.adj]), Y: mid}, 16), render.FillStyle{Color: th.Accent})
}

// fitLabel shortens a button's label to width w at size: a label "what:
// value" with a short value (a number and its unit) loses letters from
// what, so the value stays whole; any other from its end. The cut is
// marked "...".
func fitLabel(label string, size, w float64) string {
	fits := func(s string) bool { return render.TextWidth(s, size, true) <= w }
	if fits(label) {
		return label
	}
	head, tail := []rune(label), ""
	if i := strings.LastIndex(label, ": "); i > 0 && len(label)-i <= 18 && fits("...: "+label[i+2:]) { // a value with its unit
		head, tail = []rune(label[:i]), ": "+label[i+2:]
	}
	for len(head) > 1 && !fits(string(head)+"..."+tail) {
		head = head[:len(head)-1]
	}
	return strings.TrimRight(string(head), " ,") + "..." + tail
}

// roundRect returns render.RoundRect(r, rad), kept from frame to frame:
// the buttons stand still while the what-if is dragged, so their outlines
// are built once. The paths are never changed after they are built.
func (a *App) roundRect(r render.Rect, rad float64) render.Path {
	k := pathKey{r, rad}
	if p, ok := a.paths[k]; ok {
		return p
	}
	if a.paths == nil || len(a.paths) >= maxPaths {
		a.paths = map[pathKey]render.Path{} // a new screen: start afresh
	}
	p := render.RoundRect(r, rad)
	a.paths[k] = p
	return p
}

// maxPaths bounds the outlines kept: more than any screen has buttons.
const maxPaths = 96

// pathKey is what a kept outline was built for.
type pathKey struct {
	r   render.Rect
	rad float64
}
