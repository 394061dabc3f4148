//go:build js

// Command bare is the yardstick for the browser app's figures: the least an
// ebiten app in the page can be. It fills the screen, draws one vector
// rectangle and redraws every frame, at the device's full resolution as the
// app does, and counts the frames it drew in window.evenbeatDraws (the name
// the app uses, so one figure reads both). The figures build it with the
// app's flags:
//
//	GOOS=js GOARCH=wasm go build -trimpath -ldflags='-s -w' ./cmd/evenbeat/testdata/bare
package main

import (
	"image/color"
	"math"
	"syscall/js"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/vector"
)

// bare draws the same two things every frame and counts the frames.
type bare struct {
	scale float64
	draws int
}

func (g *bare) Update() error { return nil }

func (g *bare) Draw(screen *ebiten.Image) {
	screen.Fill(color.RGBA{0xf7, 0xf5, 0xef, 0xff})
	w, h := screen.Bounds().Dx(), screen.Bounds().Dy()
	// The rectangle moves a pixel a frame, so every frame differs.
	x := float32(g.draws % max(1, w/2))
	vector.DrawFilledRect(screen, x, float32(h)/4, float32(w)/2, float32(h)/2, color.RGBA{0x2a, 0x6f, 0xb0, 0xff}, true)
	g.draws++
	js.Global().Set("evenbeatDraws", g.draws)
}

// Layout gives the screen as many pixels as the device has, as the app's.
func (g *bare) Layout(outW, outH int) (int, int) {
	g.scale = ebiten.Monitor().DeviceScaleFactor()
	return int(math.Ceil(float64(outW) * g.scale)), int(math.Ceil(float64(outH) * g.scale))
}

func main() {
	if err := ebiten.RunGame(&bare{}); err != nil {
		println(err.Error())
	}
}
