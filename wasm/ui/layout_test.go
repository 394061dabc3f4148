package ui

import (
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
)

// TestScreensFit draws every screen of the flow on a small and a common
// phone and checks that the text is at least 14 units, nothing reaches off
// the screen's width, no two labels of the app's own screens overlap, and
// every target is a fingertip tall.
func TestScreensFit(t *testing.T) {
	for _, sz := range [][2]float64{{360, 740}, {390, 844}, {844, 390}} {
		st := newMemStore()
		a := newTestApp(t, st)
		a.Resize(sz[0], sz[1])
		check := func(what string) { t.Helper(); checkFits(t, a, sz, what) }
		check("engines")
		tap(t, a, "New engine")
		check("gear")
		tap(t, a, "Stephenson")
		check("units")
		tap(t, a, "Next")
		check("sizes, a question with buttons and its sketch")
		answers := kestrel()
		for n := 0; a.Screen() == Sizes; n++ {
			f := a.fields[a.fi]
			if n > 100 {
				t.Fatalf("stuck at %q: %s", f.Label, a.Note())
			}
			if len(f.Choices) > 0 {
				tap(t, a, answers[f.Label])
				continue
			}
			typeKeys(t, a, answers[f.Label])
			check("sizes, a length on the keypad")
			tap(t, a, "Next")
		}
		check("the engine's sheet")
		tap(t, a, "Next: start measuring")
		check("cautions")
		tap(t, a, render.AckLabel)
		check("measure")
		a.setCylinders(3)
		a.SetUpdateReady(true)
		check("measure, three cylinders, update banner")
		a.SetUpdateReady(false)
		typeKeys(t, a, "129")
		check("measure, implausible")
		tap(t, a, "Where")
		check("where")
		if !a.Back() || a.Screen() != Measure || a.text != "129" {
			t.Fatalf("Back from where: %s", a.Screen())
		}
		tap(t, a, "Menu")
		check("menu")
		tap(t, a, "All readings")
		check("readings")
		tap(t, a, "Menu")
		tap(t, a, "History")
		check("history")
		p := planApp(t)
		p.Resize(sz[0], sz[1])
		a = p
		for _, tab := range planTabNames() {
			tap(t, a, tab)
			check("plan " + tab)
		}
	}
}

// checkFits draws the screen shown at size sz and checks that the text is
// at least 14 units, nothing reaches off the screen's width, no two labels
// of the app's own screens overlap, and every target is a fingertip tall
// and clear of the others.
func checkFits(t *testing.T, a *App, sz [2]float64, what string) {
	t.Helper()
	c := recorder.New(sz[0], sz[1])
	a.Draw(c)
	if err := c.CheckTextSize(14); err != nil {
		t.Errorf("%v %s: %v", sz, what, err)
	}
	if err := c.CheckInside(render.Rect{Max: render.Point{X: sz[0], Y: 1e6}}); err != nil {
		t.Errorf("%v %s: %v", sz, what, err)
	}
	if a.Screen() != Plan && a.Screen() != Cautions {
		if err := c.CheckLabels(); err != nil {
			t.Errorf("%v %s: %v", sz, what, err)
		}
	}
	tgs := a.Targets()
	for i, tg := range tgs {
		for _, o := range tgs[i+1:] {
			if tg.Rect.Overlaps(o.Rect) {
				t.Errorf("%v %s: targets %q and %q overlap", sz, what, tg.Label, o.Label)
			}
		}
		if tg.Rect.H() < render.HitMin || tg.Rect.W() < render.HitMin {
			t.Errorf("%v %s: target %q is %.0f x %.0f", sz, what, tg.Label, tg.Rect.W(), tg.Rect.H())
		}
	}
}

// TestFitLabelKeepsTheValue: a reading's row too long for its button
// loses letters from its name, never from its value; other labels are cut
// at the end; a label that fits is left alone.
func TestFitLabelKeepsTheValue(t *testing.T) {
	long := "Front dead centre turning backward, second mark: 13.7402 in"
	got := fitLabel(long, 16, 300)
	if !strings.HasSuffix(got, "...: 13.7402 in") || render.TextWidth(got, 16, true) > 300 {
		t.Errorf("fitLabel(%q) = %q", long, got)
	}
	plain := "Round 1, 2026-11-21: front lead 0.003 in, back lead 0.013 in"
	if got := fitLabel(plain, 16, 200); !strings.HasPrefix(got, "Round 1, 2026") || !strings.HasSuffix(got, "...") {
		t.Errorf("fitLabel(%q) = %q", plain, got)
	}
	if got := fitLabel("Next", 16, 300); got != "Next" {
		t.Errorf("fitLabel(Next) = %q", got)
	}
}
