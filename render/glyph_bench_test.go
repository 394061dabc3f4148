package render_test

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/setting/cpubench"
)

// textOnly passes a screen's text to a canvas and drops its fills and
// strokes, so a benchmark counts the text alone.
type textOnly struct{ render.Canvas }

func (textOnly) Fill(render.Path, render.FillStyle)   {}
func (textOnly) Stroke(render.Path, render.LineStyle) {}

// BenchmarkScreenText is the cost of drawing one phone screen's text
// natively (PNG backend, 3x), glyph masks cached after the first frame as
// in the app, for each diagram screen of the demo session (the diagram
// code's own layout work included; BenchmarkScreenRecorder alone is that).
func BenchmarkScreenText(b *testing.B) {
	m := sessionModel(b)
	th := render.Light()
	for _, d := range []struct {
		name string
		d    render.Diagram
	}{{"valve_curve", render.ValveCurveDiagram}, {"balance", render.BalanceDiagram}, {"plan", render.PlanDiagram}, {"motion", render.MotionDiagram}} {
		b.Run(d.name, func(b *testing.B) {
			rc := raster.New(1170, 2532, 3)
			c := textOnly{rc}
			s := render.Screen{Diagram: d.d, Position: 0, CrankDeg: 75}
			rec := recorder.New(390, 844)
			render.DrawScreen(textOnly{rec}, m, s, portrait, th)
			defer cpubench.Report(b, cpubench.Now())
			for b.Loop() {
				render.DrawScreen(c, m, s, portrait, th)
			}
			b.ReportMetric(float64(len(rec.Ops())), "texts/op")
		})
	}
}
