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
	intentTap intentKind = iota // a short press and release in one place
)

// intent is one user action for the screens to handle.
type intent struct {
	Kind intentKind
	At   render.Point
}

// tapSlop is how far (logical units) a finger may drift between press and
// release and still count as a tap: about a third of a fingertip.
const tapSlop = 16

// tapper folds presses and releases into taps. Each pointer is followed by
// its ID, so a second finger does not disturb the first; a tap is reported
// at the release, where the finger was last seen, when it stayed near where
// it went down.
type tapper struct {
	down map[int]render.Point
}

// Feed takes one event and returns a tap when the event completes one.
func (t *tapper) Feed(ev pointerEvent) (intent, bool) {
	if t.down == nil {
		t.down = map[int]render.Point{}
	}
	switch ev.Kind {
	case pointerDown:
		t.down[ev.ID] = ev.At
	case pointerUp:
		start, ok := t.down[ev.ID]
		delete(t.down, ev.ID)
		if ok && math.Hypot(ev.At.X-start.X, ev.At.Y-start.Y) <= tapSlop {
			return intent{Kind: intentTap, At: ev.At}, true
		}
	case pointerCancel:
		delete(t.down, ev.ID)
	}
	return intent{}, false
}

// contains reports whether r holds pt (edges included).
func contains(r render.Rect, pt render.Point) bool {
	return pt.X >= r.Min.X && pt.X <= r.Max.X && pt.Y >= r.Min.Y && pt.Y <= r.Max.Y
}
