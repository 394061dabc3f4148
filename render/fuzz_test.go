package render

import (
	"math"
	"strings"
	"testing"
	"unicode/utf8"
)

// FuzzWrap: any text and width wraps without panicking, loses no word, and
// gives no line wider than the width unless it is a single letter.
func FuzzWrap(f *testing.F) {
	f.Add("Open the cylinder drain cocks.", 80.0, 14.0, false)
	f.Add("Walschaerts", 3.0, 14.0, true)
	f.Add("a\n\nb  c", -1.0, 0.0, false)
	f.Fuzz(func(t *testing.T, text string, width, size float64, bold bool) {
		if !utf8.ValidString(text) || len(text) > 400 {
			return
		}
		lines := Wrap(text, width, size, bold)
		var got, want []string
		for _, ln := range lines {
			got = append(got, strings.Fields(ln)...)
			if utf8.RuneCountInString(ln) > 1 && TextWidth(ln, size, bold) > width && !math.IsNaN(width) {
				t.Fatalf("line %q wider than %g", ln, width)
			}
		}
		want = strings.Fields(text)
		if strings.Join(got, "") != strings.Join(want, "") {
			t.Fatalf("letters lost or changed: %q from %q", got, want)
		}
	})
}

// FuzzOutline: any segment and style gives an outline of finite points.
func FuzzOutline(f *testing.F) {
	f.Add(0.0, 0.0, 10.0, 0.0, 5.0, 5.0, 2.0, 3.0, 1.0)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Fuzz(func(t *testing.T, x0, y0, x1, y1, x2, y2, width, on, off float64) {
		var p Path
		p.MoveTo(Point{x0, y0})
		p.LineTo(Point{x1, y1})
		p.CubeTo(Point{x2, y2}, Point{x1, y0}, Point{x0, y2})
		p.Close()
		for _, v := range []float64{x0, y0, x1, y1, x2, y2} {
			if math.Abs(v) > 1e6 {
				return // far beyond any screen; keeps the outline small
			}
		}
		if on+off > 0 && (math.Abs(x1-x0)+math.Abs(y1-y0)+math.Abs(x2)+math.Abs(y2))/(on+off) > 1e4 {
			return // too many dashes to be useful in a test
		}
		out := Outline(p, LineStyle{Width: math.Min(width, 1e3), Dashes: []float64{on, off}})
		for _, s := range out {
			for _, pt := range s.Pts[:s.Kind.NumPoints()] {
				if !finite(pt) {
					t.Fatalf("non-finite point %v", pt)
				}
			}
		}
	})
}
