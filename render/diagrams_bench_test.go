package render_test

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/setting/cpubench"
)

// Benchmarks of the diagrams on the demo data. Issue goal: a full phone
// frame of the busiest screen under 4 ms of CPU natively (the diagram code
// alone, measured through the recorder); the raster figure shows what
// painting 1170x2532 device pixels adds.

// allScreens draws every diagram of the demo session as its own phone
// screen, one after the other, on c.
func allScreens(c render.Canvas, m *render.Model, th render.Theme) {
	for _, d := range []render.Diagram{render.ValveCurveDiagram, render.BalanceDiagram, render.ValvePistonDiagram,
		render.PortOpeningDiagram, render.MotionDiagram, render.PlanDiagram} {
		render.DrawScreen(c, m, render.Screen{Diagram: d, Position: 1, CrankDeg: 75}, portrait, th)
	}
}

func BenchmarkAllDiagramsRecorder(b *testing.B) {
	m := sessionModel(b)
	c := recorder.New(390, 844)
	th := render.Light()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Reset()
		allScreens(c, m, th)
	}
}

func BenchmarkAllDiagramsRaster(b *testing.B) {
	m := sessionModel(b)
	c := raster.New(1170, 2532, 3)
	th := render.Light()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Clear(th.Background)
		allScreens(c, m, th)
	}
}

// benchScreen is one screen as a full phone frame.
func benchScreen(b *testing.B, d render.Diagram, rast bool) {
	m := sessionModel(b)
	th := render.Light()
	s := render.Screen{Diagram: d, Position: 0, CrankDeg: 75}
	var c render.Canvas
	var clear func()
	if rast {
		rc := raster.New(1170, 2532, 3)
		c, clear = rc, func() { rc.Clear(th.Background) }
	} else {
		rc := recorder.New(390, 844)
		c, clear = rc, rc.Reset
	}
	defer cpubench.Report(b, cpubench.Now())
	a := 0.0
	for b.Loop() {
		clear()
		s.CrankDeg = a // an animation: a new crank angle every frame
		a += 6
		render.DrawScreen(c, m, s, portrait, th)
	}
}

func BenchmarkScreenRecorder(b *testing.B) {
	for _, d := range []struct {
		name string
		d    render.Diagram
	}{{"valve_curve", render.ValveCurveDiagram}, {"balance", render.BalanceDiagram}, {"valve_piston", render.ValvePistonDiagram},
		{"port_opening", render.PortOpeningDiagram}, {"motion", render.MotionDiagram}, {"plan", render.PlanDiagram}} {
		b.Run(d.name, func(b *testing.B) { benchScreen(b, d.d, false) })
	}
}

func BenchmarkScreenRaster(b *testing.B) {
	for _, d := range []struct {
		name string
		d    render.Diagram
	}{{"valve_curve", render.ValveCurveDiagram}, {"motion", render.MotionDiagram}, {"port_opening", render.PortOpeningDiagram}} {
		b.Run(d.name, func(b *testing.B) { benchScreen(b, d.d, true) })
	}
}

// BenchmarkSessionModel is the work done once when readings change: fit,
// plan and every position's curves and events.
func BenchmarkSessionModel(b *testing.B) {
	s := demoSession(b)
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		if _, err := render.NewSessionModel(s, planOptions()); err != nil {
			b.Fatal(err)
		}
	}
}
