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
