//go:build js

package main

import (
	"math"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/inpututil"

	"evenbeat/render"
)

// game is the ebiten plumbing the app runs on: the screen size, the
// pointer queue, taps folded from pointer events or ebiten's polled touches
// and mouse, the keys, and the ebiten canvas.
type game struct {
	canvas *ebitenCanvas
	queue  *pointerQueue
	taps   tapper

	outW, outH int     // outside size (CSS px) from Layout
	scale      float64 // device pixels per CSS px
	events     []pointerEvent
	touches    []ebiten.TouchID
	held       map[ebiten.TouchID]render.Point
	drawn      bool // the first frame is drawn
}

// newGame returns the plumbing for a new app.
func newGame() *game {
	return &game{
		canvas: newEbitenCanvas(),
		queue:  newPointerQueue(),
		held:   map[ebiten.TouchID]render.Point{},
	}
}

// Layout makes the screen as many pixels as the device has: the outside
// size in CSS px times the device scale factor, so lines are sharp on a 3x
// phone.
func (g *game) Layout(outW, outH int) (int, int) {
	g.outW, g.outH = outW, outH
	g.scale = ebiten.Monitor().DeviceScaleFactor()
	return int(math.Ceil(float64(outW) * g.scale)), int(math.Ceil(float64(outH) * g.scale))
}

// feed passes this tick's input to handle as intents: the pointer events
// the page queued (or ebiten's polled touches and mouse), then the keys.
func (g *game) feed(handle func(intent)) {
	var fromPage bool
	g.events, fromPage = g.queue.Drain(g.events[:0])
	if !fromPage {
		// The page's listeners have delivered nothing yet: fall back on
		// ebiten's polled touches and mouse.
		g.events = g.polled(g.events)
	}
	for _, ev := range g.events {
		if in, ok := g.taps.Feed(ev); ok {
			handle(in)
		}
	}
	for _, in := range keyIntents() {
		handle(in)
	}
}

// keyStep is how far (CSS px) an arrow key scrolls.
const keyStep = 40

// keyIntents folds the keys pressed this tick into intents: Enter or Space
// confirms, the arrow keys scroll.
func keyIntents() []intent {
	var ins []intent
	if inpututil.IsKeyJustPressed(ebiten.KeyEnter) || inpututil.IsKeyJustPressed(ebiten.KeySpace) {
		ins = append(ins, intent{Kind: intentConfirm})
	}
	if inpututil.IsKeyJustPressed(ebiten.KeyArrowDown) {
		ins = append(ins, intent{Kind: intentScroll, Delta: render.Point{Y: -keyStep}})
	}
	if inpututil.IsKeyJustPressed(ebiten.KeyArrowUp) {
		ins = append(ins, intent{Kind: intentScroll, Delta: render.Point{Y: keyStep}})
	}
	return ins
}

// polled reads touches (by touch ID) and the left mouse button as pointer
// events, in CSS px.
func (g *game) polled(dst []pointerEvent) []pointerEvent {
	at := func(x, y int) render.Point {
		return render.Point{X: float64(x) / g.scale, Y: float64(y) / g.scale}
	}
	g.touches = inpututil.AppendJustPressedTouchIDs(g.touches[:0])
	for _, id := range g.touches {
		p := at(ebiten.TouchPosition(id))
		g.held[id] = p
		dst = append(dst, pointerEvent{Kind: pointerDown, ID: int(id), At: p})
	}
	for id := range g.held {
		if inpututil.IsTouchJustReleased(id) {
			// A released touch has no position any more: use its last one.
			dst = append(dst, pointerEvent{Kind: pointerUp, ID: int(id), At: g.held[id]})
			delete(g.held, id)
		} else if p := at(ebiten.TouchPosition(id)); p != g.held[id] {
			g.held[id] = p
			dst = append(dst, pointerEvent{Kind: pointerMove, ID: int(id), At: p})
		}
	}
	const mouseID = -1
	if inpututil.IsMouseButtonJustPressed(ebiten.MouseButtonLeft) {
		dst = append(dst, pointerEvent{Kind: pointerDown, ID: mouseID, At: at(ebiten.CursorPosition())})
	}
	if inpututil.IsMouseButtonJustReleased(ebiten.MouseButtonLeft) {
		dst = append(dst, pointerEvent{Kind: pointerUp, ID: mouseID, At: at(ebiten.CursorPosition())})
	}
	return dst
}
