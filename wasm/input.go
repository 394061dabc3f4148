package main

import (
	"math"

	"evenbeat/render"
)

// pointerKind says what happened to a pointer.
type pointerKind uint8

// Pointer event kinds.
const (
	pointerDown pointerKind = iota
	pointerMove
	pointerUp
	pointerCancel
)

// pointerEvent is one press or release of a finger, pen or mouse button, in
// logical units. ID tells simultaneous fingers apart.
type pointerEvent struct {
	Kind pointerKind
	ID   int
	At   render.Point
}

// intentKind is what the user means, whatever the device.
type intentKind uint8

// Intent kinds.
const (
	intentTap     intentKind = iota // a short press and release in one place
	intentScroll                    // a finger dragging the content by Delta (or arrow keys)
	intentConfirm                   // Enter or Space: the screen's main button
)

// intent is one user action for the screens to handle.
type intent struct {
	Kind  intentKind
	At    render.Point // where the finger is
	Delta render.Point // for intentScroll: movement since the last intent
}

// tapSlop is how far (logical units) a finger may drift between press and
// release and still count as a tap: about a third of a fingertip.
const tapSlop = 16

// tapper folds presses, moves and releases into taps and drags. Each
// pointer is followed by its ID, so a second finger does not disturb the
// first. A pointer that stays within tapSlop of where it went down makes a
// tap at its release; once it goes further it drags (scroll intents) and
// makes no tap.
type tapper struct {
	down map[int]*press
}

// press is one pointer that is down.
type press struct {
	start, last render.Point
	dragging    bool
}

// Feed takes one event and returns the intent it completes, if any.
func (t *tapper) Feed(ev pointerEvent) (intent, bool) {
	if t.down == nil {
		t.down = map[int]*press{}
	}
	p := t.down[ev.ID]
	switch ev.Kind {
	case pointerDown:
		t.down[ev.ID] = &press{start: ev.At, last: ev.At}
	case pointerMove:
		if p == nil {
			return intent{}, false // a hovering mouse
		}
		if !p.dragging && math.Hypot(ev.At.X-p.start.X, ev.At.Y-p.start.Y) > tapSlop {
			p.dragging = true
		}
		if p.dragging {
			d := render.Point{X: ev.At.X - p.last.X, Y: ev.At.Y - p.last.Y}
			p.last = ev.At
			return intent{Kind: intentScroll, At: ev.At, Delta: d}, true
		}
	case pointerUp:
		delete(t.down, ev.ID)
		if p != nil && !p.dragging && math.Hypot(ev.At.X-p.start.X, ev.At.Y-p.start.Y) <= tapSlop {
			return intent{Kind: intentTap, At: ev.At}, true
		}
	case pointerCancel:
		delete(t.down, ev.ID)
	}
	return intent{}, false
}
