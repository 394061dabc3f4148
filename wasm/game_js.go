//go:build js

package main

import (
	"log"
	"math"
	"syscall/js"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/inpututil"

	"evenbeat/render"
)

// noScreen is no screen at all: nothing has been published yet.
const noScreen screen = 255

// ackKey is the store key of the cautions acknowledgement.
const ackKey = "cautions-acknowledged"

// game is the ebiten side of the app: it turns ticks, input and the screen
// size into calls on app, and draws app through the ebiten canvas only when
// something changed.
type game struct {
	app    *app
	canvas *ebitenCanvas
	queue  *pointerQueue
	taps   tapper
	store  *store // nil when the browser gives no storage

	outW, outH int     // outside size (CSS px) from Layout
	scale      float64 // device pixels per CSS px
	events     []pointerEvent
	touches    []ebiten.TouchID
	held       map[ebiten.TouchID]render.Point

	window       js.Value
	published    screen
	publishedAck render.Rect
	drawn        bool
}

func newGame(a *app, st *store) *game {
	return &game{
		app:       a,
		canvas:    newEbitenCanvas(),
		queue:     newPointerQueue(),
		store:     st,
		held:      map[ebiten.TouchID]render.Point{},
		window:    js.Global(),
		published: noScreen,
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

// Update runs the logic of one tick: size, input, saving, state for the page.
func (g *game) Update() error {
	if g.scale > 0 {
		g.app.Resize(float64(g.outW), float64(g.outH))
	}
	g.feed(g.handle)
	g.publish()
	return nil
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

// handle passes one intent to the app and saves what it asks to save.
func (g *game) handle(in intent) {
	if g.app.Handle(in) {
		g.saveAck()
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

// saveAck stores the acknowledgement; window.evenbeatAckSaved turns true
// when the browser has it on disk.
func (g *game) saveAck() {
	if g.store == nil {
		return
	}
	g.store.Put(ackKey, "yes", func(err error) {
		if err != nil {
			log.Print(err)
			return
		}
		g.window.Set("evenbeatAckSaved", true)
	})
}

// publish tells the page (and tests) which screen shows and where the
// acknowledgement button is, in CSS px.
func (g *game) publish() {
	ack := g.app.AckButton()
	if g.app.screen == g.published && ack == g.publishedAck {
		return
	}
	g.published, g.publishedAck = g.app.screen, ack
	g.window.Set("evenbeatState", g.app.screen.String())
	g.window.Set("evenbeatAck", jsRect(ack))
	g.window.Set("evenbeatBox", jsRect(g.app.content()))
}

// Draw draws the app when it changed; otherwise the last frame stays (the
// screen is not cleared between frames).
func (g *game) Draw(screen *ebiten.Image) {
	if !g.app.dirty || g.app.w == 0 {
		return
	}
	g.canvas.Begin(screen, g.scale)
	g.app.Draw(g.canvas)
	g.app.dirty = false
	// For tests and the page: what the last drawn frame shows.
	g.window.Set("evenbeatDrawn", g.app.screen.String())
	if !g.drawn {
		g.drawn = true
		g.window.Set("evenbeatFirstFrame", g.window.Get("performance").Call("now"))
		g.window.Set("evenbeatFirstScreen", g.app.screen.String())
		if el := g.window.Get("document").Call("getElementById", "loading"); el.Truthy() {
			el.Get("style").Set("display", "none")
		}
	}
}

// jsRect is r as a plain object {x, y, w, h} in CSS px.
func jsRect(r render.Rect) map[string]any {
	return map[string]any{"x": r.Min.X, "y": r.Min.Y, "w": r.W(), "h": r.H()}
}
