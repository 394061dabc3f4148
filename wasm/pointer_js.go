//go:build js

package main

import (
	"sync"
	"syscall/js"

	"evenbeat/render"
)

// pointerQueue collects pointer events from JavaScript listeners as they
// happen. Ebiten polls input once per tick, so a press and release inside
// one slow frame would be lost; the queue keeps both, and Update drains it.
type pointerQueue struct {
	mu     sync.Mutex
	events []pointerEvent
	seen   bool // any event has arrived: the listeners work
	funcs  []js.Func
	downAt map[int]render.Point // where each pointer now down went down
	// onUp, when set, is called inside the browser's pointerup event (a
	// user gesture, as iOS wants for raising the keyboard) with where the
	// pointer went down and came up.
	onUp func(down, up render.Point)
}

// newPointerQueue listens on the document (capture phase, passive), so it
// hears the canvas ebiten adds later too; events on a DOM box shown over
// the canvas (class overClass) are not the app's.
func newPointerQueue() *pointerQueue {
	q := &pointerQueue{downAt: map[int]render.Point{}}
	doc := js.Global().Get("document")
	opts := map[string]any{"capture": true, "passive": true}
	for name, kind := range map[string]pointerKind{
		"pointerdown":   pointerDown,
		"pointermove":   pointerMove,
		"pointerup":     pointerUp,
		"pointercancel": pointerCancel,
	} {
		kind := kind
		f := js.FuncOf(func(this js.Value, args []js.Value) any {
			ev := args[0]
			if onOverlay(ev.Get("target")) {
				return nil // a DOM box over the canvas has it
			}
			pe := pointerEvent{
				Kind: kind,
				ID:   ev.Get("pointerId").Int(),
				At:   render.Point{X: ev.Get("clientX").Float(), Y: ev.Get("clientY").Float()},
			}
			q.push(pe)
			q.gesture(pe)
			return nil
		})
		q.funcs = append(q.funcs, f)
		doc.Call("addEventListener", name, f, opts)
	}
	return q
}

func (q *pointerQueue) push(ev pointerEvent) {
	q.mu.Lock()
	q.events = append(q.events, ev)
	q.seen = true
	q.mu.Unlock()
}

// gesture keeps where each pointer went down and, when one comes up,
// calls onUp, still inside the browser's event.
func (q *pointerQueue) gesture(pe pointerEvent) {
	q.mu.Lock()
	down, ok := q.downAt[pe.ID]
	switch pe.Kind {
	case pointerDown:
		q.downAt[pe.ID] = pe.At
	case pointerUp, pointerCancel:
		delete(q.downAt, pe.ID)
	}
	f := q.onUp
	q.mu.Unlock()
	if pe.Kind == pointerUp && ok && f != nil {
		f(down, pe.At)
	}
}

// Drain appends the queued events to dst in arrival order and empties the
// queue; it also reports whether the listeners have ever delivered one.
func (q *pointerQueue) Drain(dst []pointerEvent) ([]pointerEvent, bool) {
	q.mu.Lock()
	defer q.mu.Unlock()
	dst = append(dst, q.events...)
	q.events = q.events[:0]
	return dst, q.seen
}

// onOverlay reports whether an event's target lies inside a DOM box shown
// over the canvas.
func onOverlay(target js.Value) bool {
	if target.Type() != js.TypeObject || target.Get("closest").Type() != js.TypeFunction {
		return false
	}
	return target.Call("closest", "."+overClass).Truthy()
}
