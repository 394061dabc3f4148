package render

import (
	"math"
	"strings"
	"unicode"

	"evenbeat/render/font"
)

// DefaultTextSize is the em size in logical units used when TextStyle.Size
// is zero: 14 CSS px, the smallest text a phone reader should be given.
const DefaultTextSize = 14

// LineHeight is the distance between baselines of wrapped lines, as a
// multiple of the em size.
const LineHeight = 1.35

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
	return float64(font.WeightOf(bold).Ascent()) * size / float64(font.UnitsPerEm())
}

// Descent returns the depth below the baseline of a line of text of the
// given em size (positive).
func Descent(size float64, bold bool) float64 {
	return float64(font.WeightOf(bold).Descent()) * size / float64(font.UnitsPerEm())
}

// TextWidth returns the advance width of text set in one line at the given
// em size, in the units of size, kerning included. It sums the font's
// advances in font units and scales once, so it is exact and linear in
// size; a rune outside the font's character set measures as the fallback
// glyph it is drawn as.
func TextWidth(text string, size float64, bold bool) float64 {
	if !(size > 0) || math.IsInf(size, 0) {
		size = DefaultTextSize
	}
	return toSize(measure(font.WeightOf(bold), text).units, size)
}

// run is the measure of a string in font units, with its first and last
// glyphs so that runs can be joined with the kerning between them.
type run struct {
	units       int
	first, last font.Glyph
	empty       bool
}

// measure returns the advance of text in font units.
func measure(w font.Weight, text string) run {
	r := run{empty: true}
	for _, ch := range text {
		g := font.Index(ch)
		if r.empty {
			r.first, r.empty = g, false
		} else {
			r.units += w.Kern(r.last, g)
		}
		r.units += w.Advance(g)
		r.last = g
	}
	return r
}

// joinRuns returns the measure of a followed by b.
func joinRuns(w font.Weight, a, b run) run {
	switch {
	case a.empty:
		return b
	case b.empty:
		return a
	}
	return run{units: a.units + w.Kern(a.last, b.first) + b.units, first: a.first, last: b.last}
}

// toSize converts font units to the units of an em size.
func toSize(units int, size float64) float64 {
	return float64(units) * size / float64(font.UnitsPerEm())
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
	f := font.WeightOf(bold)
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
			if toSize(try.units, size) <= width {
				line, lineRun = append(line, w), try
				continue
			}
			if len(line) > 0 {
				lines = append(lines, strings.Join(line, " "))
			}
			for toSize(wr.units, size) > width {
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
