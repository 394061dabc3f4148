package recorder

import (
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	"evenbeat/render"
)

// Kind says which Canvas method an Op records.
type Kind uint8

// Kinds of Op.
const (
	Fill Kind = iota
	Stroke
	Text
)

// Op is one recorded call.
type Op struct {
	Kind  Kind
	Path  render.Path      // Fill and Stroke
	Fill  render.FillStyle // Fill
	Line  render.LineStyle // Stroke
	At    render.Point     // Text
	Str   string           // Text
	Style render.TextStyle // Text
}

// Canvas records the calls made on it. Use New.
type Canvas struct {
	w, h float64
	ops  []Op
}

// New returns an empty recorder of logical size w by h.
func New(w, h float64) *Canvas { return &Canvas{w: w, h: h} }

// Size returns the size given to New.
func (c *Canvas) Size() (w, h float64) { return c.w, c.h }

// Fill records a fill.
func (c *Canvas) Fill(p render.Path, s render.FillStyle) {
	c.ops = append(c.ops, Op{Kind: Fill, Path: clonePath(p), Fill: s})
}

// Stroke records a stroke.
func (c *Canvas) Stroke(p render.Path, s render.LineStyle) {
	s.Dashes = append([]float64(nil), s.Dashes...)
	c.ops = append(c.ops, Op{Kind: Stroke, Path: clonePath(p), Line: s})
}

// Text records a line of text.
func (c *Canvas) Text(at render.Point, text string, s render.TextStyle) {
	c.ops = append(c.ops, Op{Kind: Text, At: at, Str: text, Style: s})
}

func clonePath(p render.Path) render.Path { return append(render.Path(nil), p...) }

// Ops returns the recorded calls in order. The slice is the recorder's own;
// do not modify it.
func (c *Canvas) Ops() []Op { return c.ops }

// Reset forgets every recorded call, keeping the size.
func (c *Canvas) Reset() { c.ops = c.ops[:0] }

// String returns the log: a size line, then one line per call.
//
//	size 390.00 844.00
//	fill #1c222bff M 10.00 20.00 L 30.00 20.00 C ... Z
//	stroke #1c222bff w 2.50 dash [9.00 5.00] M ...
//	text #1c222bff 14.00 bold center middle 195.00 40.00 "Title"
func (c *Canvas) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "size %s %s\n", num(c.w), num(c.h))
	for _, op := range c.ops {
		switch op.Kind {
		case Fill:
			fmt.Fprintf(&b, "fill %s", hex(op.Fill.Color))
			writePath(&b, op.Path)
		case Stroke:
			fmt.Fprintf(&b, "stroke %s w %s", hex(op.Line.Color), num(op.Line.Width))
			if len(op.Line.Dashes) > 0 {
				b.WriteString(" dash [")
				for i, d := range op.Line.Dashes {
					if i > 0 {
						b.WriteByte(' ')
					}
					b.WriteString(num(d))
				}
				b.WriteByte(']')
			}
			writePath(&b, op.Path)
		case Text:
			s := op.Style
			weight := "regular"
			if s.Bold {
				weight = "bold"
			}
			fmt.Fprintf(&b, "text %s %s %s %s %s %s %s %s", hex(s.Color), num(s.Size), weight,
				hname(s.HAlign), vname(s.VAlign), num(op.At.X), num(op.At.Y), strconv.Quote(op.Str))
		}
		b.WriteByte('\n')
	}
	return b.String()
}

func writePath(b *strings.Builder, p render.Path) {
	for _, s := range p {
		switch s.Kind {
		case render.MoveTo:
			fmt.Fprintf(b, " M %s %s", num(s.Pts[0].X), num(s.Pts[0].Y))
		case render.LineTo:
			fmt.Fprintf(b, " L %s %s", num(s.Pts[0].X), num(s.Pts[0].Y))
		case render.CubeTo:
			fmt.Fprintf(b, " C %s %s %s %s %s %s", num(s.Pts[0].X), num(s.Pts[0].Y),
				num(s.Pts[1].X), num(s.Pts[1].Y), num(s.Pts[2].X), num(s.Pts[2].Y))
		case render.Close:
			b.WriteString(" Z")
		}
	}
}

// num formats v rounded to 0.01, with no negative zero, so the log is the
// same on every machine.
func num(v float64) string {
	r := math.Round(v*100) / 100
	if r == 0 {
		r = 0
	}
	return strconv.FormatFloat(r, 'f', 2, 64)
}

func hex(c color.RGBA) string { return fmt.Sprintf("#%02x%02x%02x%02x", c.R, c.G, c.B, c.A) }

func hname(h render.HAlign) string {
	switch h {
	case render.Center:
		return "center"
	case render.Right:
		return "right"
	}
	return "left"
}

func vname(v render.VAlign) string {
	switch v {
	case render.Top:
		return "top"
	case render.Middle:
		return "middle"
	case render.Bottom:
		return "bottom"
	}
	return "baseline"
}
