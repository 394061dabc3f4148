package render_test

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/setting"
)

func BenchmarkTmpFrame(b *testing.B) {
	c := raster.New(1170, 2532, 3)
	th := render.Light()
	box := render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 828}}
	for b.Loop() {
		c.Clear(th.Background)
		render.PistonCurve(c, setting.Engine{CrankRadius: 38, RodLength: 190}, box, th)
		render.Cautions(c, box, th)
	}
}
