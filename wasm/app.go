package main

import (
	"evenbeat/render"
	"evenbeat/setting"
)

// screen is which page the app shows.
type screen uint8

// Screens.
const (
	screenCautions screen = iota // first run: the safety card, acknowledged with a tap
	screenDiagram                // the piston curve of the demo engine
)

// String names the screen as the page reports it (window.evenbeatState).
func (s screen) String() string {
	if s == screenDiagram {
		return "diagram"
	}
	return "cautions"
}

// margin is the space (logical units) between the screen edge and content.
const margin = 16

// demoEngine is the engine the skeleton draws: the crank and cylinder of
// setting's invented demo engine (Brackenfold, 5 in gauge; not a real
// locomotive).
func demoEngine() setting.Engine {
	return setting.DemoStephenson().Engine
}

// app is the screens and their logic, free of ebiten and the browser so it
// is tested natively. Update-side methods change state and mark it dirty;
// Draw only draws.
type app struct {
	engine setting.Engine
	theme  render.Theme
	screen screen
	w, h   float64     // screen size in logical units
	ack    render.Rect // the acknowledgement button of the cautions card
	dirty  bool
}

// newApp starts on the cautions card unless they were acknowledged before.
func newApp(e setting.Engine, th render.Theme, acked bool) *app {
	a := &app{engine: e, theme: th, dirty: true}
	if acked {
		a.screen = screenDiagram
	}
	return a
}

// content is the box screens draw in.
func (a *app) content() render.Rect {
	return render.Rect{Min: render.Point{X: margin, Y: margin}, Max: render.Point{X: a.w - margin, Y: a.h - margin}}
}

// Resize sets the screen size in logical units and lays the screen out
// again.
func (a *app) Resize(w, h float64) {
	if w == a.w && h == a.h {
		return
	}
	a.w, a.h = w, h
	// The card's layout is a function of the box: lay it out on a canvas
	// that draws nothing to learn where its button is.
	a.ack = render.Cautions(measure{w, h}, a.content(), a.theme)
	a.dirty = true
}

// Handle acts on one intent; it reports whether the user just acknowledged
// the cautions (the caller saves that).
func (a *app) Handle(in intent) (acknowledged bool) {
	if in.Kind != intentTap || a.screen != screenCautions || !contains(a.ack, in.At) {
		return false
	}
	a.screen = screenDiagram
	a.dirty = true
	return true
}

// Draw draws the current screen on c.
func (a *app) Draw(c render.Canvas) {
	var bg render.Path
	bg.MoveTo(render.Point{})
	bg.LineTo(render.Point{X: a.w})
	bg.LineTo(render.Point{X: a.w, Y: a.h})
	bg.LineTo(render.Point{Y: a.h})
	bg.Close()
	c.Fill(bg, render.FillStyle{Color: a.theme.Background})
	switch a.screen {
	case screenCautions:
		render.Cautions(c, a.content(), a.theme)
	case screenDiagram:
		render.PistonCurve(c, a.engine, a.content(), a.theme)
	}
}

// measure is a Canvas that only has a size: drawing on it computes layout.
type measure struct{ w, h float64 }

func (m measure) Size() (w, h float64)                      { return m.w, m.h }
func (measure) Fill(render.Path, render.FillStyle)          {}
func (measure) Stroke(render.Path, render.LineStyle)        {}
func (measure) Text(render.Point, string, render.TextStyle) {}
