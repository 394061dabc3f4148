package render

import (
	"math"
	"strings"
	"sync"
	"unicode"

	"github.com/golang/freetype/truetype"
	"golang.org/x/image/font"
	"golang.org/x/image/math/fixed"

	gofonts "evenbeat/render/font"
)

// DefaultTextSize is the em size in logical units used when TextStyle.Size
// is zero: 14 CSS px, the smallest text a phone reader should be given.
const DefaultTextSize = 14

// LineHeight is the distance between baselines of wrapped lines, as a
// multiple of the em size.
const LineHeight = 1.35

// fontMetrics are the vertical metrics of one face in ems (fractions of the
// em size), from the font's horizontal header.
type fontMetrics struct {
	ascent, descent float64 // both positive; descent is below the baseline
}

// metrics reads the ascent and descent of both weights once. The value is
// computed on first use and never changes.
var metrics = sync.OnceValue(func() [2]fontMetrics {
	var m [2]fontMetrics
	for i, bold := range []bool{false, true} {
		f := gofonts.Get(bold)
		upe := float64(f.FUnitsPerEm())
		// At upe/64 px per em one 26.6 unit is one font unit, so Metrics
		// reports the header's ascent and descent exactly.
		fm := truetype.NewFace(f, &truetype.Options{Size: upe / 64, DPI: 72, Hinting: font.HintingNone}).Metrics()
		m[i] = fontMetrics{ascent: float64(fm.Ascent) / upe, descent: float64(fm.Descent) / upe}
	}
	return m
})

// NewFace returns a face of the embedded font at sizePx device pixels per em
// (72 DPI, so points equal pixels), with no hinting so advance widths scale
// linearly with size and layout measured in logical units holds at any
// device scale. A backend drawing at scale k passes TextStyle.Size*k. The
// face is not safe for concurrent use; make one per goroutine (backends
// cache one per size). A size that is not positive and finite gives the
// default size.
func NewFace(sizePx float64, bold bool) font.Face {
	if !(sizePx > 0) || math.IsInf(sizePx, 0) {
		sizePx = DefaultTextSize
	}
	return truetype.NewFace(gofonts.Get(bold), &truetype.Options{
		Size:    sizePx,
		DPI:     72,
		Hinting: font.HintingNone,
	})
}

// textSize returns the em size a style asks for: Size, or the default when
// Size is zero, negative or not finite.
func textSize(s TextStyle) float64 {
	if !(s.Size > 0) || math.IsInf(s.Size, 0) {
		return DefaultTextSize
	}
	return s.Size
}

// Ascent returns the height above the baseline of a line of text of the
// given em size in the embedded font, in the same units as size.
func Ascent(size float64, bold bool) float64 {
	return metrics()[boolIndex(bold)].ascent * size
}

// Descent returns the depth below the baseline of a line of text of the
// given em size (positive).
func Descent(size float64, bold bool) float64 {
	return metrics()[boolIndex(bold)].descent * size
}

func boolIndex(b bool) int {
	if b {
		return 1
	}
	return 0
}

// TextWidth returns the advance width of text set in one line at the given
// em size, in the units of size, kerning included. It uses unhinted font
// units, so it agrees with what NewFace draws at any scale to within a
// sixty-fourth of a device pixel per glyph.
func TextWidth(text string, size float64, bold bool) float64 {
	if !(size > 0) || math.IsInf(size, 0) {
		size = DefaultTextSize
	}
	f := gofonts.Get(bold)
	return toSize(measure(f, text).units, f, size)
}

// run is the measure of a string in font units, with its first and last
// glyphs so that runs can be joined with the kerning between them.
type run struct {
	units       fixed.Int26_6
	first, last truetype.Index
	empty       bool
}

// measure returns the advance of text in font units (a 26.6 value whose
// integer count is font units: the scale passed to the font is one em).
func measure(f *truetype.Font, text string) run {
	upe := fixed.Int26_6(f.FUnitsPerEm())
	r := run{empty: true}
	for _, ch := range text {
		i := f.Index(ch)
		if r.empty {
			r.first, r.empty = i, false
		} else {
			r.units += f.Kern(upe, r.last, i)
		}
		r.units += f.HMetric(upe, i).AdvanceWidth
		r.last = i
	}
	return r
}

// joinRuns returns the measure of a followed by b.
func joinRuns(f *truetype.Font, a, b run) run {
	switch {
	case a.empty:
		return b
	case b.empty:
		return a
	}
	upe := fixed.Int26_6(f.FUnitsPerEm())
	return run{units: a.units + f.Kern(upe, a.last, b.first) + b.units, first: a.first, last: b.last}
}

// toSize converts font units to the units of an em size.
func toSize(units fixed.Int26_6, f *truetype.Font, size float64) float64 {
	return float64(units) * size / float64(f.FUnitsPerEm())
}

// TextOrigin returns the baseline-left point from which a backend draws
// text so that it sits at at with the style's alignment.
func TextOrigin(at Point, text string, s TextStyle) Point {
	size := textSize(s)
	o := at
	switch s.HAlign {
	case Center:
		o.X -= TextWidth(text, size, s.Bold) / 2
	case Right:
		o.X -= TextWidth(text, size, s.Bold)
	}
	asc, desc := Ascent(size, s.Bold), Descent(size, s.Bold)
	switch s.VAlign {
	case Top:
		o.Y += asc
	case Middle:
		o.Y += (asc - desc) / 2
	case Bottom:
		o.Y -= desc
	}
	return o
}

// TextBox returns the box a line of text occupies when drawn at at with
// style s: its advance width by the font's full ascent plus descent (the
// same height for every string, so boxes of one row line up).
func TextBox(at Point, text string, s TextStyle) Rect {
	size := textSize(s)
	o := TextOrigin(at, text, s)
	return Rect{
		Min: Point{o.X, o.Y - Ascent(size, s.Bold)},
		Max: Point{o.X + TextWidth(text, size, s.Bold), o.Y + Descent(size, s.Bold)},
	}
}

// Wrap breaks text into lines no wider than width at the given em size,
// breaking at spaces. A newline starts a new paragraph; an empty paragraph
// gives an empty line. A word wider than width on its own is broken between
// letters, so no line is ever wider than width (unless width is narrower
// than one letter, when each letter takes its own line). Widths are those
// of TextWidth, kerning included.
func Wrap(text string, width, size float64, bold bool) []string {
	if !(size > 0) || math.IsInf(size, 0) {
		size = DefaultTextSize
	}
	f := gofonts.Get(bold)
	space := measure(f, " ")
	var lines []string
	for _, para := range strings.Split(text, "\n") {
		words := strings.FieldsFunc(para, unicode.IsSpace)
		if len(words) == 0 {
			lines = append(lines, "")
			continue
		}
		var line []string
		var lineRun run
		for _, w := range words {
			wr := measure(f, w)
			try := wr
			if len(line) > 0 {
				try = joinRuns(f, joinRuns(f, lineRun, space), wr)
			}
			if toSize(try.units, f, size) <= width {
				line, lineRun = append(line, w), try
				continue
			}
			if len(line) > 0 {
				lines = append(lines, strings.Join(line, " "))
			}
			for toSize(wr.units, f, size) > width {
				head, tail := splitToWidth(w, width, size, bold)
				if tail == "" {
					break // one letter wider than width: it keeps its own line
				}
				lines = append(lines, head)
				w, wr = tail, measure(f, tail)
			}
			line, lineRun = []string{w}, wr
		}
		lines = append(lines, strings.Join(line, " "))
	}
	return lines
}

// splitToWidth splits a word into the longest head that fits width (at
// least one letter) and the rest.
func splitToWidth(word string, width, size float64, bold bool) (head, tail string) {
	runes := []rune(word)
	n := 1
	for n < len(runes) && TextWidth(string(runes[:n+1]), size, bold) <= width {
		n++
	}
	return string(runes[:n]), string(runes[n:])
}
