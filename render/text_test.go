package render

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/freetype/truetype"
	"golang.org/x/image/math/fixed"

	"evenbeat/render/font"
	"evenbeat/render/font/fontfile"
)

func TestTextWidthScalesLinearly(t *testing.T) {
	w14 := TextWidth("Piston position", 14, false)
	w28 := TextWidth("Piston position", 28, false)
	if w14 <= 0 || math.Abs(w28-2*w14) > 1e-9 {
		t.Errorf("width at 28 = %g, want twice the width at 14 = %g", w28, 2*w14)
	}
	if TextWidth("", 14, false) != 0 {
		t.Error("empty text should have zero width")
	}
	if b, r := TextWidth("Cut-off", 14, true), TextWidth("Cut-off", 14, false); b <= r {
		t.Errorf("bold width %g should exceed regular %g", b, r)
	}
	if TextWidth("ab", 0, false) != TextWidth("ab", DefaultTextSize, false) {
		t.Error("size 0 should measure at the default size")
	}
}

// ftFonts parses Go Regular and Go Bold with freetype: the reference the
// glyph tables were made from.
func ftFonts(t testing.TB) [2]*truetype.Font {
	t.Helper()
	fs, err := fontfile.Parse()
	if err != nil {
		t.Fatal(err)
	}
	return fs
}

// ftWidth measures text as render did when it read the TrueType files with
// freetype: unhinted advances and kerning in font units, scaled once. A
// rune outside the tables' set is measured as the font's glyph 0, the
// missing-glyph box the tables draw for it (as freetype did for a rune the
// font lacks).
func ftWidth(f *truetype.Font, text string, size float64) float64 {
	upe := fixed.Int26_6(f.FUnitsPerEm())
	var units fixed.Int26_6
	prev, first := truetype.Index(0), true
	for _, r := range text {
		i := f.Index(r)
		if font.Index(r) == font.Fallback {
			i = 0
		}
		if !first {
			units += f.Kern(upe, prev, i)
		}
		units += f.HMetric(upe, i).AdvanceWidth
		prev, first = i, false
	}
	return float64(units) * size / float64(upe)
}

// The glyph tables measure as freetype reading the fonts did, to 1e-9:
// widths of every rune of the set, every pair, labels, random strings and
// runes outside the set (the font's missing glyph both ways), the vertical
// metrics and the origins alignment derives from them.
func TestTextMeasuresAsFreetype(t *testing.T) {
	fs := ftFonts(t)
	set := font.Runes()
	texts := []string{"", "crank angle, degrees 0 90 180 270 360 %", "Lead 1.5 mm ± 0.1", "Cut-off 75 % — back gear", "AVAWAy Te To", "中文", "ß\uFFFD\x00"}
	for _, a := range set {
		texts = append(texts, string(a))
		for _, b := range set {
			texts = append(texts, string([]rune{a, b}))
		}
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for range 200 {
		rs := make([]rune, 1+rng.IntN(40))
		for i := range rs {
			rs[i] = set[rng.IntN(len(set))]
		}
		texts = append(texts, string(rs))
	}
	for bi, bold := range []bool{false, true} {
		f := fs[bi]
		upe := fontfile.Units(f)
		ia, id := fontfile.VMetrics(f)
		for _, size := range []float64{14, 17.5, 42} {
			asc, desc := float64(ia)*size/float64(upe), float64(id)*size/float64(upe)
			if math.Abs(Ascent(size, bold)-asc) > 1e-9 || math.Abs(Descent(size, bold)-desc) > 1e-9 {
				t.Errorf("bold %v size %g: ascent %g descent %g, freetype %g %g", bold, size, Ascent(size, bold), Descent(size, bold), asc, desc)
			}
			for _, text := range texts {
				want := ftWidth(f, text, size)
				if got := TextWidth(text, size, bold); math.Abs(got-want) > 1e-9 {
					t.Errorf("bold %v size %g: TextWidth(%q) = %.12g, freetype %.12g", bold, size, text, got, want)
				}
			}
			st := TextStyle{Size: size, Bold: bold, HAlign: Right, VAlign: Middle}
			const text = "Valve travel 62.5 mm"
			o := TextOrigin(Point{200, 100}, text, st)
			if want := (Point{200 - ftWidth(f, text, size), 100 + (asc-desc)/2}); !near(o, want) {
				t.Errorf("bold %v size %g: origin %v, freetype %v", bold, size, o, want)
			}
		}
	}
}

func TestTextBoxAlignment(t *testing.T) {
	at := Point{100, 50}
	const s = "Lead"
	w := TextWidth(s, 20, false)
	asc, desc := Ascent(20, false), Descent(20, false)
	cases := []struct {
		name string
		st   TextStyle
		want Rect
	}{
		{"left baseline", TextStyle{Size: 20}, Rect{Point{100, 50 - asc}, Point{100 + w, 50 + desc}}},
		{"centre top", TextStyle{Size: 20, HAlign: Center, VAlign: Top}, Rect{Point{100 - w/2, 50}, Point{100 + w/2, 50 + asc + desc}}},
		{"right bottom", TextStyle{Size: 20, HAlign: Right, VAlign: Bottom}, Rect{Point{100 - w, 50 - asc - desc}, Point{100, 50}}},
		{"left middle", TextStyle{Size: 20, VAlign: Middle}, Rect{Point{100, 50 - (asc+desc)/2}, Point{100 + w, 50 + (asc+desc)/2}}},
	}
	for _, tc := range cases {
		got := TextBox(at, s, tc.st)
		if !near(got.Min, tc.want.Min) || !near(got.Max, tc.want.Max) {
			t.Errorf("%s: box %v, want %v", tc.name, got, tc.want)
		}
		o := TextOrigin(at, s, tc.st)
		if !near(o, Point{got.Min.X, got.Min.Y + asc}) {
			t.Errorf("%s: origin %v is not the box's baseline-left", tc.name, o)
		}
	}
	// Go Regular's header: ascent 1935 and descent 432 font units of 2048
	// per em (read from the font; this checks the metrics are wired).
	if math.Abs(asc/20-1935.0/2048) > 1e-9 || math.Abs(desc/20-432.0/2048) > 1e-9 {
		t.Errorf("ascent %g, descent %g per em, want 1935/2048 and 432/2048", asc/20, desc/20)
	}
}

func near(a, b Point) bool { return math.Abs(a.X-b.X) < 1e-9 && math.Abs(a.Y-b.Y) < 1e-9 }

func TestWrap(t *testing.T) {
	const para = "Open the cylinder drain cocks, shut the regulator and chock the wheels, so the engine cannot move on its own."
	for _, width := range []float64{80, 150, 200, 358, 1000} {
		lines := Wrap(para, width, 14, false)
		for _, ln := range lines {
			if w := TextWidth(ln, 14, false); w > width {
				t.Errorf("width %g: line %q is %g wide", width, ln, w)
			}
			if ln != strings.TrimSpace(ln) {
				t.Errorf("width %g: line %q has outer spaces", width, ln)
			}
		}
		if got := strings.Join(lines, " "); got != para {
			t.Errorf("width %g: lines rejoin to %q", width, got)
		}
		if width == 1000 && len(lines) != 1 {
			t.Errorf("width 1000 should hold the sentence on one line, got %d", len(lines))
		}
	}
	// Greedy: a line is only broken when the next word does not fit.
	w := TextWidth("drain cocks", 14, false)
	if got := Wrap("drain cocks open", w, 14, false); len(got) != 2 || got[0] != "drain cocks" {
		t.Errorf("exact fit: got %q", got)
	}
	// Paragraphs and empty lines survive.
	if got := Wrap("one\n\ntwo", 200, 14, false); len(got) != 3 || got[1] != "" {
		t.Errorf("paragraphs: got %q", got)
	}
	// A word too long for the width is split between letters.
	got := Wrap("Walschaerts", TextWidth("Wals", 14, false), 14, false)
	if strings.Join(got, "") != "Walschaerts" || len(got) < 3 {
		t.Errorf("long word: got %q", got)
	}
	for _, ln := range got {
		if TextWidth(ln, 14, false) > TextWidth("Wals", 14, false) {
			t.Errorf("long word: line %q too wide", ln)
		}
	}
	// Regression: a width narrower than one letter (a tiny box) once sliced
	// past the end of a word; each letter now takes its own line.
	if got := Wrap("ab c", -1, 14, false); strings.Join(got, "|") != "a|b|c" {
		t.Errorf("negative width: got %q", got)
	}
	if got := Wrap("ab c", math.NaN(), 14, false); len(got) == 0 {
		t.Errorf("NaN width: got %q", got)
	}
	if got := Wrap("", 100, 14, false); len(got) != 1 || got[0] != "" {
		t.Errorf("empty text: got %q", got)
	}
}
