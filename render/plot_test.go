package render

import "testing"

func TestAxesMapping(t *testing.T) {
	a := NewAxes(Rect{Point{50, 20}, Point{350, 320}}, 0, 360, 0, 100, nil, nil)
	for _, c := range []struct {
		x, y float64
		want Point
	}{
		{0, 0, Point{50, 320}},     // origin at the bottom left
		{360, 100, Point{350, 20}}, // top right
		{180, 50, Point{200, 170}}, // centre
	} {
		if got := a.At(c.x, c.y); !near(got, c.want) {
			t.Errorf("At(%g, %g) = %v, want %v", c.x, c.y, got, c.want)
		}
	}
	p := a.Curve(0, 360, 2, func(x float64) float64 { return x / 3.6 })
	if len(p) != 181 || p[0].Kind != MoveTo || !near(p[180].Pts[0], Point{350, 20}) {
		t.Errorf("Curve 0..360 by 2: %d points, last %v; want 181 ending top right", len(p), p[len(p)-1].Pts[0])
	}
	if len(a.Curve(0, 360, 0, func(float64) float64 { return 0 })) != 0 {
		t.Error("a zero step should give an empty curve")
	}
	v := a.VLine(90)
	if !near(v[0].Pts[0], Point{125, 20}) || !near(v[1].Pts[0], Point{125, 320}) {
		t.Errorf("VLine(90) = %v", v)
	}
}

// A button's label keeps its size when it fits, takes two lines at 15 px
// or more when one is too short (each line within the button), and only
// a label too long for two lines shrinks to 14 on one.
func TestButtonLabelFits(t *testing.T) {
	th := Light()
	var got []TextStyle
	c := textSpy{texts: &got}
	Button(c, Rect{Point{0, 0}, Point{300, 56}}, "I understand", th)
	if len(got) != 1 || got[0].Size != ButtonSize {
		t.Errorf("a short label keeps size %d on one line, got %+v", ButtonSize, got)
	}
	got = got[:0]
	Button(c, Rect{Point{0, 0}, Point{120, 56}}, "Acknowledge all cautions", th)
	if len(got) != 2 || got[0].Size < 15 || got[0].Size != got[1].Size {
		t.Errorf("a label too long for one line takes two at 15 or more, got %+v", got)
	}
	lines, size := ButtonLines("Acknowledge all cautions", 104, 52)
	for _, l := range lines {
		if TextWidth(l, size, true) > 104 {
			t.Errorf("line %q is wider than the button", l)
		}
	}
	got = got[:0]
	Button(c, Rect{Point{0, 0}, Point{120, 56}}, "Acknowledge every one of the cautions written above", th)
	if len(got) != 1 || got[0].Size != BodySize {
		t.Errorf("a label too long for two lines shrinks to %d on one, got %+v", BodySize, got)
	}
}

// textSpy is a Canvas that keeps only the text styles drawn.
type textSpy struct{ texts *[]TextStyle }

func (textSpy) Size() (w, h float64)                   { return 0, 0 }
func (textSpy) Fill(Path, FillStyle)                   {}
func (textSpy) Stroke(Path, LineStyle)                 {}
func (s textSpy) Text(_ Point, _ string, st TextStyle) { *s.texts = append(*s.texts, st) }
