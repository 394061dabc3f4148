package render

import "image/color"

// Point is a position in logical units (CSS pixels), origin top-left, y down.
type Point struct{ X, Y float64 }

// Rect is an axis-aligned box in logical units; Min is the top-left corner.
type Rect struct{ Min, Max Point }

// W returns the width of r.
func (r Rect) W() float64 { return r.Max.X - r.Min.X }

// H returns the height of r.
func (r Rect) H() float64 { return r.Max.Y - r.Min.Y }

// SegKind says what a path segment does.
type SegKind uint8

// Segment kinds.
const (
	MoveTo SegKind = iota // start a new sub-path at Pts[0]
	LineTo                // straight line to Pts[0]
	CubeTo                // cubic Bézier with controls Pts[0], Pts[1] to Pts[2]
	Close                 // close the current sub-path
)

// NumPoints returns how many of a segment's Pts a kind uses: 1 for MoveTo
// and LineTo, 3 for CubeTo, 0 for Close.
func (k SegKind) NumPoints() int {
	switch k {
	case CubeTo:
		return 3
	case Close:
		return 0
	}
	return 1
}

// Segment is one step of a Path.
type Segment struct {
	Kind SegKind
	Pts  [3]Point
}

// Path is a sequence of segments in logical units. The zero value is empty.
type Path []Segment

// MoveTo starts a new sub-path at p.
func (p *Path) MoveTo(pt Point) { *p = append(*p, Segment{Kind: MoveTo, Pts: [3]Point{pt}}) }

// LineTo adds a straight line to pt.
func (p *Path) LineTo(pt Point) { *p = append(*p, Segment{Kind: LineTo, Pts: [3]Point{pt}}) }

// CubeTo adds a cubic Bézier curve with control points c1, c2 ending at pt.
func (p *Path) CubeTo(c1, c2, pt Point) {
	*p = append(*p, Segment{Kind: CubeTo, Pts: [3]Point{c1, c2, pt}})
}

// Close closes the current sub-path.
func (p *Path) Close() { *p = append(*p, Segment{Kind: Close}) }

// LineStyle says how to stroke a path. Zero values: black, 1 unit wide, solid.
// Colours here and in FillStyle and TextStyle are alpha-premultiplied, as
// color.RGBA always is. Outline turns a stroke into the outline every
// backend fills.
type LineStyle struct {
	Color  color.RGBA
	Width  float64   // logical units; 0 means 1
	Dashes []float64 // alternating on/off lengths; nil means solid
}

// FillStyle says how to fill a path (non-zero winding). Zero value: black.
type FillStyle struct {
	Color color.RGBA
}

// HAlign places text horizontally about its anchor point.
type HAlign uint8

// Horizontal alignments.
const (
	Left HAlign = iota
	Center
	Right
)

// VAlign places text vertically about its anchor point.
type VAlign uint8

// Vertical alignments.
const (
	Baseline VAlign = iota
	Top
	Middle
	Bottom
)

// TextStyle says how to draw text. Zero values: black, 14 units, left on the
// baseline, regular weight.
type TextStyle struct {
	Color  color.RGBA
	Size   float64 // em size in logical units; 0 means 14
	HAlign HAlign
	VAlign VAlign
	Bold   bool
}

// Canvas is the drawing seam every diagram draws through. It is small and
// stateless: styles travel with each call. Coordinates are logical units
// (CSS pixels), origin top-left, y down; a backend maps them to device
// pixels by its own scale.
type Canvas interface {
	// Size returns the drawable size in logical units.
	Size() (w, h float64)
	// Fill fills p with the non-zero winding rule.
	Fill(p Path, s FillStyle)
	// Stroke draws the outline of p.
	Stroke(p Path, s LineStyle)
	// Text draws one line of text anchored at at with the style's
	// alignment: TextOrigin gives the baseline-left point to draw from and
	// TextBox the box it covers, in the one embedded font. A newline is not
	// a line break; Wrap splits paragraphs into lines.
	Text(at Point, text string, s TextStyle)
}
