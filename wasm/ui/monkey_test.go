package ui

import (
	"math/rand/v2"
	"strings"
	"testing"

	"evenbeat/render"
)

// TestRandomTapsNeverPanic taps, drags, types and goes back at random
// (a fixed seed) from the engines list and from a planned session, on an
// upright and a sideways phone: the app never panics and never draws NaN
// or Inf.
func TestRandomTapsNeverPanic(t *testing.T) {
	for seed := range uint64(8) {
		r := rand.New(rand.NewPCG(seed, 7))
		var a *App
		if seed%2 == 0 {
			a = newTestApp(t, newMemStore())
		} else {
			a = planApp(t)
		}
		a.opt.OnName = func(string) { _ = a.Rename("Renamed") }
		a.opt.OnShare = func(string, render.ReportModel) {}
		a.opt.OnUpdate = func() {}
		if seed%4 >= 2 {
			a.Resize(844, 390)
		}
		for step := range 300 {
			ts := a.Targets()
			switch k := r.IntN(10); {
			case k == 0:
				a.Back()
			case k == 1:
				a.Handle(Intent{Kind: Drag, At: render.Point{X: r.Float64() * a.w, Y: r.Float64() * a.h}, Delta: render.Point{X: r.NormFloat64() * 40, Y: r.NormFloat64() * 200}})
			case k == 2:
				a.Handle(Intent{Kind: Confirm})
			case k == 3:
				a.SetUpdateReady(r.IntN(2) == 0)
			case len(ts) > 0:
				tg := ts[r.IntN(len(ts))]
				a.Handle(Intent{Kind: Tap, At: render.Point{X: (tg.Rect.Min.X + tg.Rect.Max.X) / 2, Y: (tg.Rect.Min.Y + tg.Rect.Max.Y) / 2}})
			}
			if step%10 == 0 {
				_, c := drawText(a)
				if s := c.String(); strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
					t.Fatalf("seed %d step %d on %s: NaN or Inf drawn", seed, step, a.Screen())
				}
			}
		}
	}
}
