package render

import (
	"image"
	"image/draw"
	"math"
	"slices"
	"testing"

	"github.com/golang/freetype/truetype"
	xfont "golang.org/x/image/font"
	"golang.org/x/image/math/fixed"
	"golang.org/x/image/vector"
)

// GlyphPath filled with x/image/vector covers the pixels freetype's own
// rasteriser covers for the same glyph read from the TrueType file
// (unhinted, at the same pen point): the outline, its placement and its
// y flip are the font's. Both rasterisers compute exact area coverage of
// a flattened outline but flatten curves differently (each within about a
// tenth of a pixel); measured here, up to 49 of 255 on one pixel of a
// curve's edge and at most 5.5 on average over a glyph's box. A glyph
// misplaced by half a pixel, flipped or scaled wrong differs by far more.
func TestGlyphPathCoversAsFreetype(t *testing.T) {
	fs := ftFonts(t)
	for bi, bold := range []bool{false, true} {
		for _, size := range []float64{14, 42} {
			face := truetype.NewFace(fs[bi], &truetype.Options{Size: size, DPI: 72, Hinting: xfont.HintingNone})
			for _, r := range "AHWgjoQ%&8@°±µ½é—…″≈→" {
				// A pen point on whole pixels, away from the box's edge.
				dot := fixed.P(20, 60)
				dr, mask, mp, _, ok := face.Glyph(dot, r)
				if !ok || dr.Empty() {
					t.Fatalf("freetype has no glyph for %q", r)
				}
				var z vector.Rasterizer
				z.Reset(dr.Dx(), dr.Dy())
				p := GlyphPath(r, size, bold, Point{20 - float64(dr.Min.X), 60 - float64(dr.Min.Y)})
				fillVector(&z, p)
				got := image.NewAlpha(image.Rect(0, 0, dr.Dx(), dr.Dy()))
				z.Draw(got, got.Rect, image.Opaque, image.Point{})
				var sum, worst int
				for y := 0; y < dr.Dy(); y++ {
					for x := 0; x < dr.Dx(); x++ {
						_, _, _, a := mask.At(mp.X+x, mp.Y+y).RGBA()
						d := int(got.AlphaAt(x, y).A) - int(a>>8)
						sum += abs(d)
						worst = max(worst, abs(d))
					}
				}
				if mean := float64(sum) / float64(dr.Dx()*dr.Dy()); worst > 64 || mean > 6 {
					t.Errorf("bold %v size %g %q: coverage differs from freetype's by up to %d (mean %.2f) of 255", bold, size, r, worst, mean)
				}
			}
		}
	}
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}

// fillVector loads p into z.
func fillVector(z *vector.Rasterizer, p Path) {
	for _, s := range p {
		switch s.Kind {
		case MoveTo:
			z.MoveTo(float32(s.Pts[0].X), float32(s.Pts[0].Y))
		case LineTo:
			z.LineTo(float32(s.Pts[0].X), float32(s.Pts[0].Y))
		case CubeTo:
			z.CubeTo(float32(s.Pts[0].X), float32(s.Pts[0].Y), float32(s.Pts[1].X), float32(s.Pts[1].Y), float32(s.Pts[2].X), float32(s.Pts[2].Y))
		case Close:
			z.ClosePath()
		}
	}
	z.DrawOp = draw.Src
}

func TestPlaceGlyphsAndTextPath(t *testing.T) {
	st := TextStyle{Size: 20, HAlign: Center, VAlign: Top, Bold: true}
	const text = "Lap 1.5 mm"
	at := Point{100, 40}
	gs := PlaceGlyphs(at, text, st)
	if len(gs) != len([]rune(text)) {
		t.Fatalf("%d glyphs for %d runes", len(gs), len([]rune(text)))
	}
	o := TextOrigin(at, text, st)
	if !near(gs[0].At, o) {
		t.Errorf("first pen point %v, want the origin %v", gs[0].At, o)
	}
	for i, g := range gs {
		want := o.X + TextWidth(text[:len(string([]rune(text)[:i]))], 20, true)
		if g.Rune != []rune(text)[i] || math.Abs(g.At.X-want) > 1e-9 || g.At.Y != o.Y {
			t.Errorf("glyph %d: %q at %v, want x %g", i, g.Rune, g.At, want)
		}
	}
	var want Path
	for _, g := range gs {
		want = append(want, GlyphPath(g.Rune, 20, true, g.At)...)
	}
	if got := TextPath(at, text, st); !slices.Equal(got, want) {
		t.Error("TextPath is not the glyph paths at the placed points")
	}
	// The box: every point of the text's outline lies within its TextBox
	// widened by the glyphs' overhang (none here beyond a unit).
	box := TextBox(at, text, st)
	for _, s := range TextPath(at, text, st) {
		for _, p := range s.Pts[:s.Kind.NumPoints()] {
			if p.X < box.Min.X-1 || p.X > box.Max.X+1 || p.Y < box.Min.Y-1 || p.Y > box.Max.Y+1 {
				t.Errorf("outline point %v outside the text box %v", p, box)
			}
		}
	}
}

// A rune outside the set draws as the fallback glyph, for any such rune;
// bad sizes and origins give the default size or nothing, never NaN.
func TestGlyphPathFallbackAndBadInput(t *testing.T) {
	a, b := GlyphPath('中', 14, false, Point{}), GlyphPath('\U0001F600', 14, false, Point{})
	if len(a) == 0 || !slices.Equal(a, b) {
		t.Error("runes outside the set should both draw the fallback glyph")
	}
	if !slices.Equal(GlyphPath('A', 0, false, Point{}), GlyphPath('A', DefaultTextSize, false, Point{})) ||
		!slices.Equal(GlyphPath('A', math.NaN(), false, Point{}), GlyphPath('A', DefaultTextSize, false, Point{})) {
		t.Error("a bad size should draw at the default size")
	}
	if p := GlyphPath('A', 14, false, Point{math.NaN(), 0}); len(p) != 0 {
		t.Error("a NaN origin should give an empty path")
	}
	if p := TextPath(Point{math.Inf(1), 0}, "abc", TextStyle{}); len(p) != 0 {
		t.Error("an infinite position should give an empty path")
	}
	for _, s := range GlyphPath('g', 14, true, Point{1, 2}) {
		for _, p := range s.Pts[:s.Kind.NumPoints()] {
			if !finite(p) {
				t.Fatalf("point %v not finite", p)
			}
		}
	}
	if b := GlyphBounds(' ', 14, false); b.W() != 0 || b.H() != 0 {
		t.Errorf("a space has bounds %v", b)
	}
	b2 := GlyphBounds('H', 20, false)
	if !(b2.Min.Y < -10 && b2.Max.Y <= 0.01 && b2.Min.X >= 0 && b2.Max.X < TextWidth("H", 20, false)) {
		t.Errorf("H bounds %v: should stand on the baseline inside its advance", b2)
	}
}

// BenchmarkTextPath is the cost of the outline of a typical label, what
// the PNG backend fills for each Text call.
func BenchmarkTextPath(b *testing.B) {
	st := TextStyle{Size: 14}
	for b.Loop() {
		_ = TextPath(Point{10, 20}, "Lead 1.52 mm at 75 % cut-off", st)
	}
}
