package render_test

import (
	"fmt"

	"evenbeat/render"
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
