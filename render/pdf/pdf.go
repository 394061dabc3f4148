// Package pdf writes what render draws as a PDF document of A4 pages:
// the report a setter prints or shares. Everything is drawn as filled
// outlines in the page's own vector form (strokes as render.Outline gives
// them, text as the app's own glyph outlines, each glyph defined once and
// placed wherever it is used), so the file is small, sharp at any zoom,
// and made in a fraction of the time a picture of the same report takes
// to rasterise and encode. A tall drawing is cut into pages where no card
// or line of text is split, when there is such a place.
//
// It imports render, render/font's tables through render, and the
// standard library (compress/zlib for the page streams); never ebiten or
// syscall/js.
package pdf

import (
	"bytes"
	"compress/zlib"
	"fmt"
	"image/color"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"evenbeat/render"
)

// A4 in points (1/72 inch), ISO 216: 210 x 297 mm.
const (
	a4W    = 595.276
	a4H    = 841.890
	margin = 28.35 // 10 mm
)

// Canvas records drawing for a PDF: a render.Canvas w by h logical units.
// Write then lays it out on pages.
type Canvas struct {
	w, h float64
	ops  []op
}

// op is one recorded fill (strokes are recorded as their outlines) or
// line of text, with its vertical extent in logical units.
type op struct {
	path   render.Path
	col    color.RGBA
	text   string
	at     render.Point
	style  render.TextStyle
	isText bool
	lo, hi float64
}

// New returns a canvas w by h logical units.
func New(w, h float64) *Canvas { return &Canvas{w: w, h: h} }

// Size returns the canvas size in logical units.
func (c *Canvas) Size() (float64, float64) { return c.w, c.h }

// Fill records p filled with the non-zero rule.
func (c *Canvas) Fill(p render.Path, s render.FillStyle) {
	if s.Color.A == 0 || len(p) == 0 {
		return
	}
	lo, hi := extent(p)
	if lo > hi {
		return
	}
	c.ops = append(c.ops, op{path: p, col: s.Color, lo: lo, hi: hi})
}

// Stroke records the outline of p as render.Outline gives it, filled: the
// same shape every backend draws.
func (c *Canvas) Stroke(p render.Path, s render.LineStyle) {
	c.Fill(render.Outline(p, s), render.FillStyle{Color: s.Color})
}

// Text records one line of text.
func (c *Canvas) Text(at render.Point, text string, s render.TextStyle) {
	if text == "" || s.Color.A == 0 {
		return
	}
	b := render.TextBox(at, text, s)
	c.ops = append(c.ops, op{text: text, at: at, style: s, isText: true, lo: b.Min.Y, hi: b.Max.Y})
}

// extent returns the top and bottom of a path's finite points.
func extent(p render.Path) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, seg := range p {
		for _, pt := range seg.Pts[:seg.Kind.NumPoints()] {
			if finite(pt.Y) {
				lo, hi = math.Min(lo, pt.Y), math.Max(hi, pt.Y)
			}
		}
	}
	return lo, hi
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// Pages returns where the drawing is cut into pages: the top of each page
// in logical units, for pages pageH logical units tall. A cut goes where
// nothing shorter than a page is split (in a gap between cards, lines and
// drawings), as low as such a gap lies in the lower half of the page;
// failing one, at the page's foot.
func (c *Canvas) Pages(pageH float64) []float64 {
	if !(pageH > 0) || !(c.h > 0) {
		return []float64{0}
	}
	// The union of the extents of everything shorter than a page, in
	// order: a cut inside one of them would split something.
	type span struct{ lo, hi float64 }
	var spans []span
	for _, o := range c.ops {
		if o.hi-o.lo < pageH {
			spans = append(spans, span{o.lo, o.hi})
		}
	}
	sort.Slice(spans, func(i, j int) bool { return spans[i].lo < spans[j].lo })
	var busy []span
	for _, s := range spans {
		if n := len(busy); n > 0 && s.lo < busy[n-1].hi {
			busy[n-1].hi = math.Max(busy[n-1].hi, s.hi)
			continue
		}
		busy = append(busy, s)
	}
	// free returns the lowest y in (from, to] strictly inside no busy
	// span (the spans are disjoint: at most one holds to), and whether
	// there is one.
	free := func(from, to float64) (float64, bool) {
		y := to
		i := sort.Search(len(busy), func(i int) bool { return busy[i].hi > y })
		if i < len(busy) && busy[i].lo < y {
			y = busy[i].lo
		}
		return y, y > from
	}
	tops := []float64{0}
	for top := 0.0; top+pageH < c.h; {
		cut, ok := free(top+pageH/2, top+pageH)
		if !ok {
			cut = top + pageH
		}
		tops = append(tops, cut)
		top = cut
	}
	return tops
}

// Write writes the drawing as a PDF of A4 portrait pages, the drawing's
// width across the page inside a 10 mm margin, with title in the
// document's information.
func (c *Canvas) Write(out io.Writer, title string) error {
	if !(c.w > 0) || !(c.h > 0) || math.IsInf(c.w, 0) || math.IsInf(c.h, 0) {
		return fmt.Errorf("there is nothing to write: the drawing is %gx%g", c.w, c.h)
	}
	k := (a4W - 2*margin) / c.w // points per logical unit
	pageH := (a4H - 2*margin) / k
	tops := c.Pages(pageH)
	d := &doc{glyphs: map[glyphKey]int{}, alphas: map[uint8]int{}}
	var contents [][]byte
	for i, top := range tops {
		bottom := c.h
		if i+1 < len(tops) {
			bottom = tops[i+1]
		}
		contents = append(contents, d.page(c, k, top, bottom))
	}
	return d.write(out, title, contents)
}

// doc gathers what the pages share: the glyph forms and the opacities.
type doc struct {
	glyphs map[glyphKey]int // glyph -> its index in forms
	forms  [][]byte         // each glyph's outline, 1000 units to the em
	alphas map[uint8]int    // fill opacity -> its graphics state's index
	order  []uint8
}

// glyphKey is one glyph's outline: the rune and the weight.
type glyphKey struct {
	r    rune
	bold bool
}

// glyphEm is the em size the glyph forms are drawn at.
const glyphEm = 1000

// page returns the content stream of the page from top to bottom of the
// drawing (logical units), drawn at k points a unit.
func (d *doc) page(c *Canvas, k, top, bottom float64) []byte {
	var b []byte
	// The drawing's frame: x right and y down from the page's top-left
	// inside the margin, clipped to the page's share of the drawing.
	b = fmt.Appendf(b, "q %s 0 0 %s %s %s cm\n", num(k), num(-k), num(margin), num(a4H-margin+k*top))
	b = fmt.Appendf(b, "0 %s %s %s re W n\n", num(top), num(c.w), num(bottom-top))
	for _, o := range c.ops {
		if o.hi < top || o.lo > bottom {
			continue
		}
		col := o.col
		if o.isText {
			col = o.style.Color
		}
		b = d.colour(b, col)
		if !o.isText {
			b = appendPath(b, o.path)
			b = append(b, "f\n"...)
			continue
		}
		size := o.style.Size
		if !(size > 0) {
			size = 14
		}
		s := size / glyphEm
		for _, g := range render.PlaceGlyphs(o.at, o.text, o.style) {
			if g.Rune == ' ' {
				continue
			}
			b = append(b, "q "...)
			b = append(appendNum(b, s), " 0 0 "...)
			b = append(appendNum(b, s), ' ')
			b = appendPts(b, []render.Point{g.At})
			b = append(b, "cm /G"...)
			b = strconv.AppendInt(b, int64(d.glyph(g.Rune, o.style.Bold)), 10)
			b = append(b, " Do Q\n"...)
		}
	}
	return append(b, "Q\n"...)
}

// colour sets the fill colour and opacity of col (alpha-premultiplied).
func (d *doc) colour(b []byte, col color.RGBA) []byte {
	a := float64(col.A) / 255
	un := func(v uint8) string {
		if col.A == 0 {
			return "0"
		}
		return num(math.Min(1, float64(v)/255/a))
	}
	b = fmt.Appendf(b, "%s %s %s rg ", un(col.R), un(col.G), un(col.B))
	i, ok := d.alphas[col.A]
	if !ok {
		i = len(d.order)
		d.alphas[col.A] = i
		d.order = append(d.order, col.A)
	}
	return fmt.Appendf(b, "/A%d gs\n", i)
}

// glyph returns the index of r's form, making it on first use.
func (d *doc) glyph(r rune, bold bool) int {
	key := glyphKey{r, bold}
	if i, ok := d.glyphs[key]; ok {
		return i
	}
	i := len(d.forms)
	d.glyphs[key] = i
	p := render.GlyphPath(r, glyphEm, bold, render.Point{})
	d.forms = append(d.forms, append(appendPath(nil, p), "f\n"...))
	return i
}

// appendPath appends p's construction operators.
func appendPath(b []byte, p render.Path) []byte {
	open := false
	for _, seg := range p {
		pts := seg.Pts[:seg.Kind.NumPoints()]
		ok := true
		for _, pt := range pts {
			ok = ok && finite(pt.X) && finite(pt.Y)
		}
		if !ok {
			continue
		}
		switch seg.Kind {
		case render.MoveTo:
			b = append(appendPts(b, pts), "m "...)
			open = true
		case render.LineTo:
			if open {
				b = append(appendPts(b, pts), "l "...)
			}
		case render.CubeTo:
			if open {
				b = append(appendPts(b, pts), "c "...)
			}
		case render.Close:
			if open {
				b = append(b, "h "...)
			}
		}
	}
	return b
}

// appendPts appends the points' coordinates, each followed by a space.
func appendPts(b []byte, pts []render.Point) []byte {
	for _, pt := range pts {
		b = append(appendNum(b, pt.X), ' ')
		b = append(appendNum(b, pt.Y), ' ')
	}
	return b
}

// appendNum appends v with at most three decimals, as PDF numbers are
// written.
func appendNum(b []byte, v float64) []byte {
	if !finite(v) {
		return append(b, '0')
	}
	v = math.Round(v*1000) / 1000
	if v == 0 {
		return append(b, '0')
	}
	return strconv.AppendFloat(b, v, 'f', -1, 64)
}

// num writes v as appendNum does.
func num(v float64) string { return string(appendNum(nil, v)) }

// write writes the document: catalogue, page tree, the shared resources
// (glyph forms, opacities), each page and its compressed content, the
// information dictionary and the cross-reference table.
func (d *doc) write(out io.Writer, title string, contents [][]byte) error {
	var buf bytes.Buffer
	var offsets []int
	var z bytes.Buffer
	// Fastest compression: the streams are plain numbers and operators,
	// which it shrinks about as well, several times faster.
	zw, _ := zlib.NewWriterLevel(&z, zlib.BestSpeed)
	obj := func(body string, stream []byte) int {
		offsets = append(offsets, buf.Len())
		n := len(offsets)
		fmt.Fprintf(&buf, "%d 0 obj\n", n)
		if stream == nil {
			fmt.Fprintf(&buf, "%s\nendobj\n", body)
			return n
		}
		z.Reset()
		zw.Reset(&z)
		zw.Write(stream)
		zw.Close()
		fmt.Fprintf(&buf, "<< %s /Filter /FlateDecode /Length %d >>\nstream\n", body, z.Len())
		buf.Write(z.Bytes())
		buf.WriteString("\nendstream\nendobj\n")
		return n
	}
	// The header, then a comment of bytes above 127 that marks the file
	// as binary to programs that copy it (ISO 32000-1, 7.5.2).
	buf.WriteString("%PDF-1.4\n")
	buf.Write([]byte{'%', 0xe2, 0xe3, 0xcf, 0xd3, '\n'})
	// Objects 1 and 2 are the catalogue and the page tree; pages refer to
	// the tree, so its number is fixed before the pages are written.
	obj("<< /Type /Catalog /Pages 2 0 R >>", nil)
	offsets = append(offsets, 0) // the page tree, written at the end
	var forms []string
	for i, f := range d.forms {
		n := obj("/Type /XObject /Subtype /Form /BBox [-2000 -2000 3000 2000]", f)
		forms = append(forms, fmt.Sprintf("/G%d %d 0 R", i, n))
	}
	var states []string
	for i, a := range d.order {
		n := obj(fmt.Sprintf("<< /Type /ExtGState /ca %s >>", num(float64(a)/255)), nil)
		states = append(states, fmt.Sprintf("/A%d %d 0 R", i, n))
	}
	res := obj(fmt.Sprintf("<< /XObject << %s >> /ExtGState << %s >> >>", strings.Join(forms, " "), strings.Join(states, " ")), nil)
	var kids []string
	for _, c := range contents {
		cn := obj("", c)
		pn := obj(fmt.Sprintf("<< /Type /Page /Parent 2 0 R /MediaBox [0 0 %s %s] /Resources %d 0 R /Contents %d 0 R >>", num(a4W), num(a4H), res, cn), nil)
		kids = append(kids, fmt.Sprintf("%d 0 R", pn))
	}
	// The page tree, appended now that its kids are known; its offset is
	// where it lands.
	offsets[1] = buf.Len()
	fmt.Fprintf(&buf, "2 0 obj\n<< /Type /Pages /Kids [%s] /Count %d >>\nendobj\n", strings.Join(kids, " "), len(kids))
	info := obj(fmt.Sprintf("<< /Title %s /Producer (Evenbeat) >>", pdfString(title)), nil)
	xref := buf.Len()
	fmt.Fprintf(&buf, "xref\n0 %d\n0000000000 65535 f \n", len(offsets)+1)
	for _, off := range offsets {
		fmt.Fprintf(&buf, "%010d 00000 n \n", off)
	}
	fmt.Fprintf(&buf, "trailer\n<< /Size %d /Root 1 0 R /Info %d 0 R >>\nstartxref\n%d\n%%%%EOF\n", len(offsets)+1, info, xref)
	_, err := out.Write(buf.Bytes())
	return err
}

// pdfString writes s as a PDF text string: plain ASCII in parentheses
// (brackets and backslashes escaped), anything else as UTF-16 in hex with
// its byte-order mark.
func pdfString(s string) string {
	ascii := true
	for _, r := range s {
		if r < 0x20 || r > 0x7e {
			ascii = false
		}
	}
	if ascii {
		r := strings.NewReplacer(`\`, `\\`, `(`, `\(`, `)`, `\)`)
		return "(" + r.Replace(s) + ")"
	}
	var b strings.Builder
	b.WriteString("<FEFF")
	for _, r := range s {
		if r > 0xffff {
			r -= 0x10000
			fmt.Fprintf(&b, "%04X%04X", 0xd800+(r>>10), 0xdc00+(r&0x3ff))
			continue
		}
		fmt.Fprintf(&b, "%04X", r)
	}
	return b.String() + ">"
}
