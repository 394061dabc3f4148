package recorder

import (
	"image/color"
	"strings"
	"testing"

	"evenbeat/render"
)

func TestStringRoundsAndFormats(t *testing.T) {
	c := New(390, 844)
	var p render.Path
	p.MoveTo(render.Point{X: 1.004, Y: -0.001})
	p.LineTo(render.Point{X: 2.006, Y: 3})
	p.CubeTo(render.Point{X: 1, Y: 2}, render.Point{X: 3, Y: 4}, render.Point{X: 5, Y: 6})
	p.Close()
	c.Fill(p, render.FillStyle{Color: color.RGBA{0x12, 0x34, 0x56, 0xff}})
	c.Stroke(p, render.LineStyle{Width: 2.5, Dashes: []float64{9, 5}})
	c.Text(render.Point{X: 10, Y: 20}, `say "hi"`, render.TextStyle{Size: 18, Bold: true, HAlign: render.Center, VAlign: render.Middle})
	want := `size 390.00 844.00
fill #123456ff M 1.00 0.00 L 2.01 3.00 C 1.00 2.00 3.00 4.00 5.00 6.00 Z
stroke #00000000 w 2.50 dash [9.00 5.00] M 1.00 0.00 L 2.01 3.00 C 1.00 2.00 3.00 4.00 5.00 6.00 Z
text #00000000 18.00 bold center middle 10.00 20.00 "say \"hi\""
`
	got := c.String()
	if got != want {
		t.Errorf("log:\n%s\nwant:\n%s", got, want)
	}
	if strings.Contains(got, "-0.00") {
		t.Error("negative zero in the log")
	}
}

func TestRecorderKeepsCopies(t *testing.T) {
	c := New(10, 10)
	var p render.Path
	p.MoveTo(render.Point{X: 1, Y: 1})
	dashes := []float64{1, 2}
	c.Stroke(p, render.LineStyle{Dashes: dashes})
	p[0].Pts[0].X = 9
	dashes[0] = 7
	if op := c.Ops()[0]; op.Path[0].Pts[0].X != 1 || op.Line.Dashes[0] != 1 {
		t.Error("the recorder must copy paths and dashes, not alias the caller's")
	}
	c.Reset()
	if len(c.Ops()) != 0 {
		t.Error("Reset should forget the calls")
	}
}

func TestCheckInside(t *testing.T) {
	box := render.Rect{Max: render.Point{X: 100, Y: 100}}
	c := New(200, 200)
	var p render.Path
	p.MoveTo(render.Point{X: 2, Y: 50})
	p.LineTo(render.Point{X: 98, Y: 50})
	c.Stroke(p, render.LineStyle{Width: 4})
	if err := c.CheckInside(box); err != nil {
		t.Errorf("a line 2 units in with half-width 2 is inside: %v", err)
	}
	c.Stroke(p, render.LineStyle{Width: 6})
	if err := c.CheckInside(box); err == nil {
		t.Error("a line whose half-width crosses the edge should be reported")
	}
	c.Reset()
	c.Text(render.Point{X: 95, Y: 50}, "label", render.TextStyle{})
	if err := c.CheckInside(box); err == nil || !strings.Contains(err.Error(), "label") {
		t.Errorf("text running past the right edge should be reported by name, got %v", err)
	}
	if b := c.Bounds(); b.Min.X != 95 || b.Max.X <= 100 {
		t.Errorf("bounds %v should start at the text and run past 100", b)
	}
}

func TestCheckLabels(t *testing.T) {
	c := New(200, 200)
	c.Text(render.Point{X: 10, Y: 20}, "front", render.TextStyle{})
	c.Text(render.Point{X: 10, Y: 40}, "back", render.TextStyle{})
	if err := c.CheckLabels(); err != nil {
		t.Errorf("labels 20 units apart at 14 units do not overlap: %v", err)
	}
	c.Text(render.Point{X: 20, Y: 30}, "lead", render.TextStyle{})
	if err := c.CheckLabels(); err == nil {
		t.Error("a label between the two should overlap both")
	}
	if len(c.TextBoxes()) != 3 {
		t.Error("TextBoxes should give one box per text call")
	}
	if err := c.CheckTextSize(14); err != nil {
		t.Errorf("default size is 14: %v", err)
	}
	c.Text(render.Point{}, "small", render.TextStyle{Size: 12})
	if err := c.CheckTextSize(14); err == nil {
		t.Error("12-unit text should be reported")
	}
}
