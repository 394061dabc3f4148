package render_test

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/setting/cpubench"
)

// Phone frame benchmarks: the piston card and the cautions card, each on a
// full 390x844 CSS px portrait screen, at scale 3 (1170x2532 device px) for
// the raster, and into the recorder (the cost of the diagram code alone).
// Issue goal: a full phone frame under 4 ms of CPU natively.

func BenchmarkPhoneFrameRaster(b *testing.B) {
	c := raster.New(1170, 2532, 3)
	th := render.Light()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Clear(th.Background)
		render.PistonCurve(c, testEngine, portrait, th)
		render.Cautions(c, portrait, th)
	}
}

func BenchmarkPistonCurveRaster(b *testing.B) {
	c := raster.New(1170, 2532, 3)
	th := render.Light()
	for b.Loop() {
		render.PistonCurve(c, testEngine, portrait, th)
	}
}

func BenchmarkCautionsRaster(b *testing.B) {
	c := raster.New(1170, 2532, 3)
	th := render.Light()
	for b.Loop() {
		render.Cautions(c, portrait, th)
	}
}

func BenchmarkPhoneFrameRecorder(b *testing.B) {
	c := recorder.New(390, 844)
	th := render.Light()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Reset()
		render.PistonCurve(c, testEngine, portrait, th)
		render.Cautions(c, portrait, th)
	}
}

func BenchmarkOutlinePistonCurve(b *testing.B) {
	var p render.Path
	for a := 0; a <= 360; a += 2 {
		pt := render.Point{X: 16 + float64(a), Y: 300 + 100*float64(a%7)}
		if a == 0 {
			p.MoveTo(pt)
		} else {
			p.LineTo(pt)
		}
	}
	s := render.LineStyle{Width: 3}
	for b.Loop() {
		render.Outline(p, s)
	}
}

func BenchmarkIcon512(b *testing.B) {
	c := raster.New(512, 512, 1)
	for b.Loop() {
		render.Icon(c, 512)
	}
}
