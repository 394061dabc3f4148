package ui

import (
	"os"
	"path/filepath"
	"testing"

	"evenbeat/render/raster"
)

// TestShots writes PNGs of some screens to $EVENBEAT_UI_SHOTS for a look
// by eye; it does nothing without it.
func TestShots(t *testing.T) {
	dir := os.Getenv("EVENBEAT_UI_SHOTS")
	if dir == "" {
		t.Skip("set EVENBEAT_UI_SHOTS to a directory to write the screens")
	}
	shot := func(a *App, name string) {
		c := raster.New(phoneW, phoneH, 1)
		a.Draw(c)
		f, err := os.Create(filepath.Join(dir, name+".png"))
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		if err := c.WritePNG(f); err != nil {
			t.Fatal(err)
		}
	}
	st := newMemStore()
	a := newTestApp(t, st)
	shot(a, "engines")
	setUpDemo(t, a, st)
	typeKeys(t, a, "129.1")
	shot(a, "measure")
	tap(t, a, "Where")
	shot(a, "where")
	a.Back()
	p := planApp(t)
	shot(p, "plan")
	tap(t, p, "Balance")
	shot(p, "balance")
}
