package render

import (
	"image/color"
	"math"
	"testing"
)

// luminance is the relative luminance of an sRGB colour, as defined in
// Web Content Accessibility Guidelines (WCAG) 2.1, W3C Recommendation 2018,
// "relative luminance" in the glossary (sRGB linearisation with the 0.03928
// threshold and weights 0.2126, 0.7152, 0.0722).
func luminance(c color.RGBA) float64 {
	lin := func(v uint8) float64 {
		s := float64(v) / 255
		if s <= 0.03928 {
			return s / 12.92
		}
		return math.Pow((s+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(c.R) + 0.7152*lin(c.G) + 0.0722*lin(c.B)
}

// contrast is the WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05).
func contrast(a, b color.RGBA) float64 {
	la, lb := luminance(a), luminance(b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

func TestContrastFormula(t *testing.T) {
	// WCAG 2.1: black on white is 21:1, a colour on itself 1:1.
	if got := contrast(color.RGBA{0, 0, 0, 255}, color.RGBA{255, 255, 255, 255}); math.Abs(got-21) > 1e-9 {
		t.Errorf("black on white %g, want 21", got)
	}
}

// Text must meet WCAG 2.1 success criterion 1.4.6 (enhanced, 7:1) for body
// text and 1.4.3 (minimum, 4.5:1) for secondary text; curves and markers
// must meet 1.4.11 non-text contrast (3:1) on the surface they are drawn on.
func TestThemeContrast(t *testing.T) {
	for name, th := range map[string]Theme{"light": Light(), "dark": Dark()} {
		checks := []struct {
			what   string
			fg, bg color.RGBA
			min    float64
		}{
			{"ink on surface", th.Ink, th.Surface, 7},
			{"ink on background", th.Ink, th.Background, 7},
			{"muted on surface", th.Muted, th.Surface, 4.5},
			{"warn on surface", th.Warn, th.Surface, 4.5},
			{"front on surface", th.Front, th.Surface, 3},
			{"back on surface", th.Back, th.Surface, 3},
			{"accent curve on surface", th.Accent, th.Surface, 3},
			{"button text on accent", th.OnAccent, th.Accent, 4.5},
			{"grid visible on surface", th.Grid, th.Surface, 1.2},
		}
		for _, c := range checks {
			if got := contrast(c.fg, c.bg); got < c.min {
				t.Errorf("%s: %s contrast %.2f, want at least %g", name, c.what, got, c.min)
			}
		}
	}
}

// Front and back differ by pattern as well as colour, so the ends can be
// told apart without colour vision.
func TestFrontAndBackDifferByPattern(t *testing.T) {
	for _, th := range []Theme{Light(), Dark()} {
		f, b := th.FrontLine(), th.BackLine()
		if len(f.Dashes) != 0 || len(b.Dashes) == 0 {
			t.Errorf("front should be solid and back dashed: %v / %v", f.Dashes, b.Dashes)
		}
		if f.Color == b.Color {
			t.Error("front and back share a colour")
		}
		if th.CompareLine().Dashes == nil || th.CurveLine().Dashes != nil {
			t.Error("the comparison curve should be dashed and the main curve solid")
		}
	}
	if Light() == Dark() {
		t.Error("light and dark themes are the same")
	}
}
