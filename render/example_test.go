package render_test

import (
	"fmt"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting"
)

// Outline turns a stroke into a path any backend can fill with the
// non-zero rule; every backend strokes through it, so lines look the same
// in the browser and in a PNG.
func ExampleOutline() {
	var p render.Path
	p.MoveTo(render.Point{X: 10, Y: 10})
	p.LineTo(render.Point{X: 100, Y: 10})
	out := render.Outline(p, render.LineStyle{Width: 4, Dashes: []float64{20, 10}})
	dashes := 0
	for _, s := range out {
		if s.Kind == render.MoveTo {
			dashes++
		}
	}
	// The line is 90 long: dashes at 0-20, 30-50 and 60-80 along it, each
	// a quad and two round caps.
	fmt.Println(dashes / 3)
	// Output: 3
}

// Text is measured in logical units with the embedded font; TextBox gives
// the box a label occupies after alignment, for layout and overlap checks.
func ExampleTextBox() {
	s := render.TextStyle{Size: 14, HAlign: render.Center, VAlign: render.Top}
	b := render.TextBox(render.Point{X: 195, Y: 100}, "back dead centre", s)
	fmt.Printf("%.1f wide, %.1f tall, top %.0f, centred on %.0f\n", b.W(), b.H(), b.Min.Y, (b.Min.X+b.Max.X)/2)
	// Output: 107.5 wide, 16.2 tall, top 100, centred on 195
}

// Wrap breaks a paragraph to a width, here a phone card's text column.
func ExampleWrap() {
	for _, line := range render.Wrap("Never test the setting on steam or air while anyone is near the motion.", 200, 14, false) {
		fmt.Println(line)
	}
	// Output:
	// Never test the setting on steam
	// or air while anyone is near the
	// motion.
}

// A phone screen of the Walschaerts demo engine's motion at a crank angle,
// drawn into the recorder: DrawScreen returns the position tabs' hit boxes
// for the app's taps.
func ExampleDrawScreen() {
	m, err := render.NewEngineModel(setting.DemoWalschaerts())
	if err != nil {
		fmt.Println(err)
		return
	}
	c := recorder.New(390, 844)
	box := render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 828}}
	hits := render.DrawScreen(c, m, render.Screen{Diagram: render.MotionDiagram, Position: 1, CrankDeg: 45}, box, render.Light())
	for i, r := range hits.Positions {
		fmt.Printf("%s: %.0f px tall\n", m.Positions[i].Notch.Name, r.H())
	}
	// Output:
	// full forward: 48 px tall
	// running notch: 48 px tall
	// full back: 48 px tall
}

// What a port is open to follows from the valve's displacement and laps:
// an outside-admission slide valve moved back past its lap opens the front
// port to steam and the back port to exhaust.
func ExamplePortStateAt() {
	v := setting.DemoStephenson().Valve
	for _, x := range []float64{-3, 0, 3} {
		fmt.Printf("valve %+.0f mm: front %v, back %v\n", x, render.PortStateAt(v, setting.Front, x), render.PortStateAt(v, setting.Back, x))
	}
	// Output:
	// valve -3 mm: front steam, back exhaust
	// valve +0 mm: front closed, back closed
	// valve +3 mm: front exhaust, back steam
}
