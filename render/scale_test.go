package render

import (
	"math"
	"slices"
	"testing"
)

func TestTicks(t *testing.T) {
	nan := math.NaN()
	cases := []struct {
		name   string
		lo, hi float64
		n      int
		want   []float64
	}{
		{"percent in quarters", 0, 100, 4, []float64{0, 25, 50, 75, 100}},
		{"percent in fifths", 0, 100, 5, []float64{0, 20, 40, 60, 80, 100}},
		{"tenths without float noise", 0, 1, 5, []float64{0, 0.2, 0.4, 0.6, 0.8, 1}},
		{"range not on a tick", 0.3, 2.7, 5, []float64{0.5, 1, 1.5, 2, 2.5}},
		{"about zero", -7, 7, 4, []float64{-5, 0, 5}},
		{"reversed range", 100, 0, 4, []float64{0, 25, 50, 75, 100}},
		{"millimetres: step 1 would give 7.3 intervals", -3.2, 4.1, 6, []float64{-2, 0, 2, 4}},
		{"millimetres, more ticks", -3.2, 4.1, 8, []float64{-3, -2, -1, 0, 1, 2, 3, 4}},
		{"thou", 0, 0.035, 4, []float64{0, 0.01, 0.02, 0.03}},
		{"single value", 3, 3, 5, []float64{3}},
		{"NaN", nan, 1, 5, nil},
		{"infinite", 0, math.Inf(1), 5, nil},
		{"no intervals", 0, 1, 0, nil},
	}
	for _, tc := range cases {
		if got := Ticks(tc.lo, tc.hi, tc.n); !slices.Equal(got, tc.want) {
			t.Errorf("%s: Ticks(%g, %g, %d) = %v, want %v", tc.name, tc.lo, tc.hi, tc.n, got, tc.want)
		}
	}
}

func TestAngleTicks(t *testing.T) {
	cases := []struct {
		lo, hi float64
		n      int
		want   []float64
	}{
		{0, 360, 4, []float64{0, 90, 180, 270, 360}},
		{0, 360, 8, []float64{0, 45, 90, 135, 180, 225, 270, 315, 360}},
		{0, 360, 6, []float64{0, 60, 120, 180, 240, 300, 360}},
		{0, 360, 2, []float64{0, 180, 360}},
		{-20, 20, 4, []float64{-20, -10, 0, 10, 20}},
		{170, 190, 4, []float64{170, 175, 180, 185, 190}},
	}
	for _, tc := range cases {
		if got := AngleTicks(tc.lo, tc.hi, tc.n); !slices.Equal(got, tc.want) {
			t.Errorf("AngleTicks(%g, %g, %d) = %v, want %v", tc.lo, tc.hi, tc.n, got, tc.want)
		}
	}
}

func TestScale(t *testing.T) {
	y := Scale{Min: 0, Max: 100, A: 300, B: 100} // y grows upward
	for _, c := range []struct{ v, want float64 }{{0, 300}, {100, 100}, {25, 250}, {-50, 400}} {
		if got := y.At(c.v); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("At(%g) = %g, want %g", c.v, got, c.want)
		}
	}
	if got := (Scale{Min: 5, Max: 5, A: 0, B: 10}).At(7); got != 5 {
		t.Errorf("an empty data range should map to the middle, got %g", got)
	}
	if FormatTick(0.2) != "0.2" || FormatTick(180) != "180" || FormatTick(-2.5) != "-2.5" {
		t.Errorf("FormatTick: %s %s %s", FormatTick(0.2), FormatTick(180), FormatTick(-2.5))
	}
}

func TestLayoutPhone(t *testing.T) {
	portrait := Rect{Point{16, 16}, Point{374, 828}}
	l := LayoutPiston(portrait, "Piston position against crank angle", "Crank radius 38 mm, connecting rod 190 mm, stroke 76 mm. Back dead centre at 180.0°.", "At 90° the piston has gone 55.1 % of its stroke.")
	if l.Plot.H() < 250 || l.Plot.W() < 250 {
		t.Errorf("portrait plot %v too small (want 250 px each way at least)", l.Plot)
	}
	if !l.Inner.ContainsRect(l.Plot) {
		t.Errorf("plot %v outside the inner box %v", l.Plot, l.Inner)
	}
	if !(l.TitleY < l.SubY && l.SubY < l.YLabelY && l.YLabelY < l.Plot.Min.Y && l.Plot.Max.Y < l.XTicksY &&
		l.XTicksY < l.XLabelY && l.XLabelY < l.Legend.Y && l.Legend.Y < l.CaptionY) {
		t.Errorf("parts out of order: %+v", l)
	}
	if end := l.CaptionY + float64(len(l.Caption))*BodySize*LineHeight; end > l.Inner.Max.Y+0.01 {
		t.Errorf("caption ends at %g, below the inner box %g", end, l.Inner.Max.Y)
	}
	wide := LayoutPiston(Rect{Point{16, 16}, Point{828, 374}}, "Piston position against crank angle", "Crank radius 38 mm.", "At 90° the piston has gone 55.1 % of its stroke, not 50 %: the rod's angle puts it ahead of the pure cosine in the first half turn and behind it in the second.")
	if wide.Legend.X <= wide.Plot.Max.X || wide.Legend.Y > wide.Plot.Min.Y {
		t.Errorf("landscape legend at %v should sit right of the plot %v", wide.Legend, wide.Plot)
	}
	if wide.Plot.H() < 150 {
		t.Errorf("landscape plot %v too low (want 150 px at least)", wide.Plot)
	}
	if end := wide.CaptionY + float64(len(wide.Caption))*BodySize*LineHeight; end > wide.Inner.Max.Y {
		t.Errorf("landscape caption ends at %g, below the inner box %g", end, wide.Inner.Max.Y)
	}
	c := LayoutCautions(portrait, []string{"One caution.", "Another caution."})
	if !c.Fits || c.Size != 19 || c.Ack.H() != ButtonHeight || c.Ack.Max.Y != portrait.Max.Y-14 {
		t.Errorf("cautions layout: fits %v size %g button %v", c.Fits, c.Size, c.Ack)
	}
}
