package recorder

import (
	"fmt"
	"math"

	"evenbeat/render"
)

// Bounds returns the box covering every recorded path point (control
// points included, so it is never smaller than the curves) widened by half
// the stroke width, and every text box.
func (c *Canvas) Bounds() render.Rect {
	b := render.Rect{Min: render.Point{X: math.Inf(1), Y: math.Inf(1)}, Max: render.Point{X: math.Inf(-1), Y: math.Inf(-1)}}
	for _, op := range c.ops {
		b = union(b, opBox(op))
	}
	return b
}

// opBox returns the box one call covers.
func opBox(op Op) render.Rect {
	if op.Kind == Text {
		return render.TextBox(op.At, op.Str, op.Style)
	}
	b := render.Rect{Min: render.Point{X: math.Inf(1), Y: math.Inf(1)}, Max: render.Point{X: math.Inf(-1), Y: math.Inf(-1)}}
	for _, s := range op.Path {
		for _, p := range s.Pts[:s.Kind.NumPoints()] {
			b = union(b, render.Rect{Min: p, Max: p})
		}
	}
	if op.Kind == Stroke {
		hw := op.Line.Width / 2
		if !(hw > 0) {
			hw = 0.5
		}
		b = b.Inset(-hw)
	}
	return b
}

func union(a, b render.Rect) render.Rect {
	return render.Rect{
		Min: render.Point{X: math.Min(a.Min.X, b.Min.X), Y: math.Min(a.Min.Y, b.Min.Y)},
		Max: render.Point{X: math.Max(a.Max.X, b.Max.X), Y: math.Max(a.Max.Y, b.Max.Y)},
	}
}

// CheckInside returns an error naming the first call that reaches outside
// box (strokes counted with half their width, text by its TextBox), or nil.
// A tolerance of 0.01 units allows for rounding.
func (c *Canvas) CheckInside(box render.Rect) error {
	grown := box.Inset(-0.01)
	for i, op := range c.ops {
		if b := opBox(op); !grown.ContainsRect(b) {
			return fmt.Errorf("call %d (%s) covers %v, outside the box %v", i, describe(op), b, box)
		}
	}
	return nil
}

// TextBoxes returns the box of every recorded text call, in order.
func (c *Canvas) TextBoxes() []render.Rect {
	var out []render.Rect
	for _, op := range c.ops {
		if op.Kind == Text {
			out = append(out, render.TextBox(op.At, op.Str, op.Style))
		}
	}
	return out
}

// CheckLabels returns an error naming the first two text calls whose boxes
// overlap, or nil. Empty strings are ignored.
func (c *Canvas) CheckLabels() error {
	var texts []Op
	for _, op := range c.ops {
		if op.Kind == Text && op.Str != "" {
			texts = append(texts, op)
		}
	}
	for i := range texts {
		bi := render.TextBox(texts[i].At, texts[i].Str, texts[i].Style)
		for j := i + 1; j < len(texts); j++ {
			if bj := render.TextBox(texts[j].At, texts[j].Str, texts[j].Style); bi.Overlaps(bj) {
				return fmt.Errorf("labels %q %v and %q %v overlap", texts[i].Str, bi, texts[j].Str, bj)
			}
		}
	}
	return nil
}

// CheckTextSize returns an error naming the first text call smaller than
// min logical units (a zero size counts as render.DefaultTextSize), or nil.
func (c *Canvas) CheckTextSize(min float64) error {
	for _, op := range c.ops {
		if op.Kind != Text {
			continue
		}
		size := op.Style.Size
		if size == 0 {
			size = render.DefaultTextSize
		}
		if size < min {
			return fmt.Errorf("text %q is %g units, smaller than %g", op.Str, size, min)
		}
	}
	return nil
}

func describe(op Op) string {
	switch op.Kind {
	case Fill:
		return "fill"
	case Stroke:
		return "stroke"
	}
	return fmt.Sprintf("text %q", op.Str)
}
