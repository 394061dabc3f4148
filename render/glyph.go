package render

import (
	"math"

	"evenbeat/render/font"
)

// PlacedGlyph is one glyph of a line of text and the baseline-left (pen)
// point it is drawn from, in the units of the text's position.
type PlacedGlyph struct {
	Rune rune
	At   Point
}

// PlaceGlyphs returns the glyphs of one line of text drawn at at with
// style s, each with its pen point: TextOrigin, then the advances and
// kerning TextWidth sums. A backend that draws glyph by glyph (from a
// cache) draws each at its point. Layout characters get no special
// treatment: a newline is a glyph like any other (Wrap splits lines).
func PlaceGlyphs(at Point, text string, s TextStyle) []PlacedGlyph {
	size := textSize(s)
	w := font.WeightOf(s.Bold)
	o := TextOrigin(at, text, s)
	var out []PlacedGlyph
	units := 0
	prev := font.Fallback
	for i, r := range []rune(text) {
		g := font.Index(r)
		if i > 0 {
			units += w.Kern(prev, g)
		}
		out = append(out, PlacedGlyph{Rune: r, At: Point{o.X + toSize(units, size), o.Y}})
		units += w.Advance(g)
		prev = g
	}
	return out
}

// TextPath returns the outline of one line of text drawn at at with style
// s, as Canvas.Text draws it, for a backend to fill with the non-zero rule
// in the style's colour.
func TextPath(at Point, text string, s TextStyle) Path {
	var p Path
	for _, g := range PlaceGlyphs(at, text, s) {
		p = appendGlyph(p, g.Rune, textSize(s), s.Bold, g.At)
	}
	return p
}

// GlyphPath returns the outline of r at em size size with its pen point
// (baseline-left) at origin, y down; a rune outside the font's character
// set gives the fallback glyph. The quadratic pieces of the font become
// exact cubics. A size that is not positive and finite gives the default
// size; an origin that is not finite gives an empty path.
func GlyphPath(r rune, size float64, bold bool, origin Point) Path {
	return appendGlyph(nil, r, textSize(TextStyle{Size: size}), bold, origin)
}

// GlyphBounds returns the box the control points of r's outline span at em
// size size, relative to its pen point (so Min.Y is negative above the
// baseline): the outline lies inside it. A blank glyph gives an empty box.
func GlyphBounds(r rune, size float64, bold bool) Rect {
	k := textSize(TextStyle{Size: size}) / float64(font.UnitsPerEm())
	var b Rect
	first := true
	for _, c := range font.WeightOf(bold).Outline(font.Index(r)) {
		for _, p := range c {
			x, y := float64(p.X)*k, -float64(p.Y)*k
			if first {
				b, first = Rect{Point{x, y}, Point{x, y}}, false
				continue
			}
			b.Min.X, b.Max.X = math.Min(b.Min.X, x), math.Max(b.Max.X, x)
			b.Min.Y, b.Max.Y = math.Min(b.Min.Y, y), math.Max(b.Max.Y, y)
		}
	}
	return b
}

// appendGlyph appends r's outline at size with its pen point at origin.
func appendGlyph(p Path, r rune, size float64, bold bool, origin Point) Path {
	if !finite(origin) {
		return p
	}
	gp := glyphPen{p: p, o: origin, k: size / float64(font.UnitsPerEm())}
	font.WeightOf(bold).Draw(font.Index(r), &gp)
	return gp.p
}

// glyphPen turns a font outline (font units, y up) into a Path (y down,
// scaled by k about the pen point o).
type glyphPen struct {
	p   Path
	o   Point
	k   float64
	cur Point
}

func (g *glyphPen) pt(x, y float64) Point { return Point{g.o.X + x*g.k, g.o.Y - y*g.k} }

func (g *glyphPen) MoveTo(x, y float64) {
	g.cur = g.pt(x, y)
	g.p.MoveTo(g.cur)
}

func (g *glyphPen) LineTo(x, y float64) {
	g.cur = g.pt(x, y)
	g.p.LineTo(g.cur)
}

// QuadTo adds the quadratic piece as the cubic with the same curve: its
// controls lie two thirds of the way from each end to the quadratic's.
func (g *glyphPen) QuadTo(cx, cy, x, y float64) {
	c, e := g.pt(cx, cy), g.pt(x, y)
	c1 := Point{g.cur.X + 2.0/3*(c.X-g.cur.X), g.cur.Y + 2.0/3*(c.Y-g.cur.Y)}
	c2 := Point{e.X + 2.0/3*(c.X-e.X), e.Y + 2.0/3*(c.Y-e.Y)}
	g.p.CubeTo(c1, c2, e)
	g.cur = e
}

func (g *glyphPen) Close() { g.p.Close() }
