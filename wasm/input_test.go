package main

import (
	"testing"

	"evenbeat/render"
)

func TestTapper(t *testing.T) {
	pt := func(x, y float64) render.Point { return render.Point{X: x, Y: y} }
	tests := []struct {
		name   string
		events []pointerEvent
		taps   []render.Point
	}{
		{"press and release in place", []pointerEvent{{pointerDown, 1, pt(10, 10)}, {pointerUp, 1, pt(12, 11)}}, []render.Point{pt(12, 11)}},
		{"drag is no tap", []pointerEvent{{pointerDown, 1, pt(10, 10)}, {pointerUp, 1, pt(10, 40)}}, nil},
		{"release without press", []pointerEvent{{pointerUp, 1, pt(10, 10)}}, nil},
		{"cancelled", []pointerEvent{{pointerDown, 1, pt(10, 10)}, {pointerCancel, 1, pt(10, 10)}, {pointerUp, 1, pt(10, 10)}}, nil},
		{"two fingers each tap", []pointerEvent{
			{pointerDown, 1, pt(10, 10)}, {pointerDown, 2, pt(200, 300)},
			{pointerUp, 2, pt(201, 300)}, {pointerUp, 1, pt(10, 12)},
		}, []render.Point{pt(201, 300), pt(10, 12)}},
		{"second finger far away does not spoil the first", []pointerEvent{
			{pointerDown, 1, pt(10, 10)}, {pointerDown, 2, pt(300, 700)}, {pointerUp, 1, pt(10, 10)},
		}, []render.Point{pt(10, 10)}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var tp tapper
			var got []render.Point
			for _, ev := range tc.events {
				if in, ok := tp.Feed(ev); ok {
					if in.Kind != intentTap {
						t.Errorf("intent kind %v; want a tap", in.Kind)
					}
					got = append(got, in.At)
				}
			}
			if len(got) != len(tc.taps) {
				t.Fatalf("taps %v; want %v", got, tc.taps)
			}
			for i := range got {
				if got[i] != tc.taps[i] {
					t.Errorf("tap %d at %v; want %v", i, got[i], tc.taps[i])
				}
			}
		})
	}
}

// TestQuickTapInOneFrame is the case that made the app queue pointer events
// from the page: a press and a release arriving within one tick still make
// a tap, because the queue keeps both events in order.
func TestQuickTapInOneFrame(t *testing.T) {
	var tp tapper
	queued := []pointerEvent{{pointerDown, 7, render.Point{X: 50, Y: 50}}, {pointerUp, 7, render.Point{X: 50, Y: 50}}}
	n := 0
	for _, ev := range queued {
		if _, ok := tp.Feed(ev); ok {
			n++
		}
	}
	if n != 1 {
		t.Errorf("%d taps from a press and release in one tick; want 1", n)
	}
}

func TestDragScrollsAndIsNoTap(t *testing.T) {
	var tp tapper
	var got []intent
	for _, ev := range []pointerEvent{
		{pointerMove, 9, render.Point{X: 5, Y: 5}}, // hovering mouse: nothing
		{pointerDown, 1, render.Point{X: 100, Y: 400}},
		{pointerMove, 1, render.Point{X: 100, Y: 390}}, // within the slop: still a tap candidate
		{pointerMove, 1, render.Point{X: 100, Y: 380}}, // beyond: a drag from the start
		{pointerMove, 1, render.Point{X: 100, Y: 350}},
		{pointerUp, 1, render.Point{X: 100, Y: 400}}, // back where it began: still no tap
	} {
		if in, ok := tp.Feed(ev); ok {
			got = append(got, in)
		}
	}
	want := []float64{-20, -30}
	if len(got) != len(want) {
		t.Fatalf("intents %+v; want two scrolls", got)
	}
	for i, in := range got {
		if in.Kind != intentScroll || in.Delta.Y != want[i] {
			t.Errorf("intent %d = %+v; want a scroll by %v", i, in, want[i])
		}
	}
}
