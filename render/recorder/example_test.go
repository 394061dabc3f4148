package recorder_test

import (
	"fmt"
	"image/color"

	"evenbeat/render"
	"evenbeat/render/recorder"
)

// A diagram draws through render.Canvas; the recorder turns the calls into
// text for a golden file and checks the layout.
func Example() {
	c := recorder.New(390, 844)
	ink := color.RGBA{0x1c, 0x22, 0x2b, 0xff}
	var axis render.Path
	axis.MoveTo(render.Point{X: 40, Y: 300})
	axis.LineTo(render.Point{X: 360, Y: 300})
	c.Stroke(axis, render.LineStyle{Color: ink, Width: 1.25})
	c.Text(render.Point{X: 200, Y: 310}, "crank angle, degrees", render.TextStyle{Color: ink, HAlign: render.Center, VAlign: render.Top})
	fmt.Print(c.String())
	fmt.Println(c.CheckInside(render.Rect{Max: render.Point{X: 390, Y: 844}}), c.CheckLabels())
	// Output:
	// size 390.00 844.00
	// stroke #1c222bff w 1.25 M 40.00 300.00 L 360.00 300.00
	// text #1c222bff 0.00 regular center top 200.00 310.00 "crank angle, degrees"
	// <nil> <nil>
}
