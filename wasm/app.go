package main

import (
	"math"

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
	card   render.Rect // the cautions card, before scrolling: taller than the screen when it must be
	ack    render.Rect // its acknowledgement button, before scrolling
	scroll float64     // how far the cautions are scrolled up, 0 to maxScroll
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
	// On a screen too short for the card at its smallest text, the card
	// gets the height it needs and scrolls.
	a.card = a.content()
	if !render.LayoutCautions(a.card, setting.Cautions()).Fits {
		a.card.Max.Y = a.card.Min.Y + render.CautionsHeight(a.card.W())
	}
	// The card's layout is a function of the box: lay it out on a canvas
	// that draws nothing to learn where its button is.
	a.ack = render.Cautions(measure{w, h}, a.card, a.theme)
	a.scroll = math.Min(a.scroll, a.maxScroll())
	a.dirty = true
}

// maxScroll is how far the cautions can scroll: enough to show the card's
// bottom edge and margin.
func (a *app) maxScroll() float64 {
	return math.Max(0, a.card.Max.Y+margin-a.h)
}

// AckButton returns the acknowledgement button where it is on the screen
// now (scrolled).
func (a *app) AckButton() render.Rect {
	r := a.ack
	r.Min.Y -= a.scroll
	r.Max.Y -= a.scroll
	return r
}

// Handle acts on one intent; it reports whether the user just acknowledged
// the cautions (the caller saves that).
func (a *app) Handle(in intent) (acknowledged bool) {
	if a.screen != screenCautions {
		return false
	}
	if in.Kind == intentScroll {
		s := math.Max(0, math.Min(a.maxScroll(), a.scroll-in.Delta.Y))
		if s != a.scroll {
			a.scroll, a.dirty = s, true
		}
		return false
	}
	tapped := in.Kind == intentTap && contains(a.AckButton(), in.At)
	if !tapped && in.Kind != intentConfirm {
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
		render.Cautions(shifted{c, -a.scroll}, a.card, a.theme)
	case screenDiagram:
		render.PistonCurve(c, a.engine, a.content(), a.theme)
	}
}

// shifted draws on c moved down by dy logical units (up when negative).
type shifted struct {
	c  render.Canvas
	dy float64
}

func (s shifted) Size() (w, h float64) { return s.c.Size() }

func (s shifted) Fill(p render.Path, st render.FillStyle) { s.c.Fill(s.move(p), st) }

func (s shifted) Stroke(p render.Path, st render.LineStyle) { s.c.Stroke(s.move(p), st) }

func (s shifted) Text(at render.Point, text string, st render.TextStyle) {
	at.Y += s.dy
	s.c.Text(at, text, st)
}

func (s shifted) move(p render.Path) render.Path {
	if s.dy == 0 {
		return p
	}
	out := make(render.Path, len(p))
	for i, seg := range p {
		for j := range seg.Pts {
			seg.Pts[j].Y += s.dy
		}
		out[i] = seg
	}
	return out
}

// measure is a Canvas that only has a size: drawing on it computes layout.
type measure struct{ w, h float64 }

func (m measure) Size() (w, h float64)                      { return m.w, m.h }
func (measure) Fill(render.Path, render.FillStyle)          {}
func (measure) Stroke(render.Path, render.LineStyle)        {}
func (measure) Text(render.Point, string, render.TextStyle) {}
