package font

import (
	"os"
	"strings"
	"testing"

	"github.com/golang/freetype/truetype"
	xfont "golang.org/x/image/font"

	"evenbeat/render/font/fontfile"
)

// The tables answer as the TrueType files do, read by freetype: every
// glyph's points, advance and kerning, each face's metrics. (The files are
// the reference; TestTablesAreCurrent checks the tables are today's, this
// checks that reading them back gives the fonts' numbers.)
func TestTablesMatchTheFonts(t *testing.T) {
	fonts := parseFonts(t)
	if UnitsPerEm() != int(fonts[0].FUnitsPerEm()) || UnitsPerEm() != 2048 {
		t.Fatalf("units per em %d, font says %d (Go fonts: 2048)", UnitsPerEm(), fonts[0].FUnitsPerEm())
	}
	rs := Runes()
	if string(rs) != string(sortedCharset()) {
		t.Fatalf("Runes() = %q, want the sorted charset", string(rs))
	}
	for wi, w := range []Weight{Regular, Bold} {
		f := fonts[wi]
		upe := fontfile.Units(f)
		if asc, desc := fontfile.VMetrics(f); w.Ascent() != asc || w.Descent() != desc {
			t.Errorf("weight %d: ascent %d descent %d, font %d %d", w, w.Ascent(), w.Descent(), asc, desc)
		}
		idx := fontIndices(t, f)
		var gb truetype.GlyphBuf
		for g, fi := range idx {
			if got, want := w.Advance(Glyph(g)), int(f.HMetric(upe, fi).AdvanceWidth); got != want {
				t.Errorf("weight %d glyph %d: advance %d, font %d", w, g, got, want)
			}
			if err := gb.Load(f, upe, fi, xfont.HintingNone); err != nil {
				t.Fatal(err)
			}
			n := 0
			for ci, c := range w.Outline(Glyph(g)) {
				n += len(c)
				if n != gb.Ends[ci] {
					t.Errorf("weight %d glyph %d contour %d ends at %d, font %d", w, g, ci, n, gb.Ends[ci])
					break
				}
				for j, p := range c {
					q := gb.Points[n-len(c)+j]
					if p.X != int(q.X) || p.Y != int(q.Y) || p.On != (q.Flags&1 == 1) {
						t.Errorf("weight %d glyph %d point %d: %v, font %v", w, g, n-len(c)+j, p, q)
					}
				}
			}
			if n != len(gb.Points) {
				t.Errorf("weight %d glyph %d: %d points, font %d", w, g, n, len(gb.Points))
			}
			for h, fh := range idx {
				if got, want := w.Kern(Glyph(g), Glyph(h)), int(f.Kern(upe, fi, fh)); got != want {
					t.Errorf("weight %d kern %d,%d = %d, font %d", w, g, h, got, want)
				}
			}
		}
	}
}

// Facts checked by eye rather than read from the fonts, so a fault shared
// by the generator and the reader still shows: 'o' has two contours, 'l'
// one, a space none; bold is wider than regular; the fallback has an
// outline.
func TestGlyphShapes(t *testing.T) {
	cases := []struct {
		r        rune
		contours int
	}{{'o', 2}, {'l', 1}, {' ', 0}, {'B', 3}, {'8', 3}, {'%', 5}, {'°', 2}}
	for _, tc := range cases {
		if got := len(Regular.Outline(Index(tc.r))); got != tc.contours {
			t.Errorf("%q has %d contours, want %d", tc.r, got, tc.contours)
		}
	}
	if Bold.Advance(Index('m')) <= Regular.Advance(Index('m')) {
		t.Error("bold m should be wider than regular m")
	}
	if len(Regular.Outline(Fallback)) == 0 || Regular.Advance(Fallback) == 0 {
		t.Error("the fallback glyph should have an outline and an advance")
	}
	// Go Regular's header: ascent 1935 and descent 432 font units of 2048
	// per em (read from the font with a font tool, value from memory).
	if Regular.Ascent() != 1935 || Regular.Descent() != 432 {
		t.Errorf("regular ascent %d descent %d, want 1935 432", Regular.Ascent(), Regular.Descent())
	}
}

func TestIndexAndFallback(t *testing.T) {
	for i, r := range Runes() {
		if g := Index(r); g != Glyph(i+1) {
			t.Errorf("Index(%q) = %d, want %d", r, g, i+1)
		}
	}
	for _, r := range []rune{-1, 0, '\n', '\t', 0x7f, 'ß', '中', 0x10ffff, 0x110000, '\uFFFD'} {
		if g := Index(r); g != Fallback {
			t.Errorf("Index(%q) = %d, want Fallback", r, g)
		}
	}
	// A glyph number beyond the set reads as the fallback, not out of range.
	big := Glyph(len(Runes()) + 5)
	if Regular.Advance(big) != Regular.Advance(Fallback) || len(Bold.Outline(big)) != len(Bold.Outline(Fallback)) || Regular.Kern(big, big) != 0 {
		t.Error("a glyph number beyond the set should read as the fallback")
	}
	if WeightOf(true) != Bold || WeightOf(false) != Regular {
		t.Error("WeightOf")
	}
}

// pen records the pieces Draw sends.
type pen struct{ log []string }

func (p *pen) MoveTo(x, y float64)         { p.log = append(p.log, "M") }
func (p *pen) LineTo(x, y float64)         { p.log = append(p.log, "L") }
func (p *pen) QuadTo(cx, cy, x, y float64) { p.log = append(p.log, "Q") }
func (p *pen) Close()                      { p.log = append(p.log, "Z") }

func TestDrawContour(t *testing.T) {
	on := func(x, y int) Point { return Point{x, y, true} }
	off := func(x, y int) Point { return Point{x, y, false} }
	cases := []struct {
		name string
		c    []Point
		want string
	}{
		{"square", []Point{on(0, 0), on(10, 0), on(10, 10), on(0, 10)}, "MLLLLZ"},
		{"one curve", []Point{on(0, 0), off(5, 10), on(10, 0)}, "MQLZ"},
		{"starts off", []Point{off(5, 10), on(10, 0), on(0, 0)}, "MQLZ"},
		{"all off", []Point{off(0, 0), off(10, 0), off(10, 10), off(0, 10)}, "MQQQQZ"},
		{"two off in a row", []Point{on(0, 0), off(0, 10), off(10, 10), on(10, 0)}, "MQQLZ"},
	}
	for _, tc := range cases {
		var p pen
		drawContour(tc.c, &p)
		if got := strings.Join(p.log, ""); got != tc.want {
			t.Errorf("%s: %s, want %s", tc.name, got, tc.want)
		}
	}
}

// The licences ship with the font: the Go fonts' licence, and the FreeType
// licence under which the tests read the font files.
func TestLicencesPresent(t *testing.T) {
	for file, want := range map[string]string{
		"LICENSE": "Bigelow & Holmes",
		"FTL.txt": "FreeType Project",
	} {
		b, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(b), want) {
			t.Errorf("%s does not mention %q", file, want)
		}
	}
}
