package render

import (
	"math"
	"strings"
	"testing"

	"golang.org/x/image/font"
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

// The backends draw with NewFace at size*scale; its advances must agree
// with TextWidth*scale, or centred labels would drift with the device scale.
func TestTextWidthMatchesFace(t *testing.T) {
	const text = "crank angle, degrees 0 90 180 270 360 %"
	for _, scale := range []float64{1, 2, 3} {
		for _, bold := range []bool{false, true} {
			f := NewFace(14*scale, bold)
			got := float64(font.MeasureString(f, text)) / 64
			want := TextWidth(text, 14, bold) * scale
			// Each advance is rounded to 1/64 px by the face.
			if math.Abs(got-want) > float64(len(text))/64 {
				t.Errorf("scale %g bold %v: face measures %g px, TextWidth*scale %g", scale, bold, got, want)
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
