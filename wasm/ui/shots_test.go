package ui

import (
	"os"
	"path/filepath"
	"testing"

	"evenbeat/render/raster"
	"evenbeat/render/report"
)

// TestShots writes PNGs of some screens to $EVENBEAT_UI_SHOTS for a look
// by eye; it does nothing without it.
func TestShots(t *testing.T) {
	dir := os.Getenv("EVENBEAT_UI_SHOTS")
	if dir == "" {
		t.Skip("set EVENBEAT_UI_SHOTS to a directory to write the screens")
	}
	shot := func(a *App, name string) {
		c := raster.New(int(a.w), int(a.h), 1)
		a.Draw(c)
		f, err := os.Create(filepath.Join(dir, name+".png"))
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		if err := report.EncodePNG(f, c); err != nil {
			t.Fatal(err)
		}
	}
	st := newMemStore()
	a := newTestApp(t, st)
	shot(a, "engines")
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	tap(t, a, "2")
	shot(a, "units")
	tap(t, a, "Next")
	shot(a, "sizes")
	for a.Field() != "Eccentric rods" {
		tap(t, a, "Next")
	}
	shot(a, "sizes-gear")
	a.Resize(844, 390)
	shot(a, "sizes-landscape")
	a.Resize(phoneW, phoneH)
	// A new engine of the setter's own, in inches.
	own := newTestApp(t, newMemStore())
	tap(t, own, "New engine")
	shot(own, "new-gear")
	tap(t, own, "Stephenson")
	tap(t, own, "inch")
	tap(t, own, "Next")
	shot(own, "new-gauge-grows")
	tap(t, own, "As the valve moves back")
	tap(t, own, "Slide valve")
	typeKeys(t, own, "1 3")
	shot(own, "new-stroke-fraction")
	own = newTestApp(t, newMemStore())
	setUpOwnTo(t, own, "Stephenson", false, kestrel(), EngineSheet)
	shot(own, "new-sheet")
	own.scroll = 600
	shot(own, "new-sheet-given")
	a = newTestApp(t, st)
	setUpDemo(t, a, st)
	typeKeys(t, a, "129.1")
	shot(a, "measure")
	tap(t, a, "Where")
	shot(a, "where")
	a.Back()
	p := planApp(t)
	shot(p, "plan")
	tap(t, p, "Balanced")
	shot(p, "plan-balanced")
	p.Resize(844, 390)
	shot(p, "plan-balanced-landscape")
	p.Resize(phoneW, phoneH)
	tap(t, p, "Equal leads")
	tap(t, p, "Balance")
	shot(p, "balance")
	p.Resize(844, 390)
	shot(p, "balance-landscape")
	p.Resize(phoneW, phoneH)
	tap(t, p, "Next round")
	shot(p, "measure-round2")
	tap(t, p, "Menu")
	tap(t, p, "History of rounds")
	tap(t, p, "Round 1")
	shot(p, "round1-readings")
}
