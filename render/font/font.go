package font

// Weight is one face of the family. The zero value is Regular.
type Weight uint8

// The two weights.
const (
	Regular Weight = iota
	Bold
)

// WeightOf returns Bold when bold is true, else Regular.
func WeightOf(bold bool) Weight {
	if bold {
		return Bold
	}
	return Regular
}

// Glyph is a glyph's number in the character set: Fallback, or 1 + the
// rune's place in Runes.
type Glyph uint16

// Fallback is the glyph drawn and measured for a rune outside the set.
const Fallback Glyph = 0

// UnitsPerEm returns the font units in one em (the same for both weights).
func UnitsPerEm() int { return unitsPerEm }

// Runes returns the character set in ascending order.
func Runes() []rune {
	rs := make([]rune, len(runes)/2)
	for i := range rs {
		rs[i] = rune(u16(runes, 2*i))
	}
	return rs
}

// Index returns the glyph of r: Fallback when r is outside the set.
func Index(r rune) Glyph {
	lo, hi := 0, len(runes)/2
	for lo < hi {
		m := int(uint(lo+hi) >> 1)
		switch v := rune(u16(runes, 2*m)); {
		case v == r:
			return Glyph(m + 1)
		case v < r:
			lo = m + 1
		default:
			hi = m
		}
	}
	return Fallback
}

// tables are one weight's generated data.
type tables struct {
	ascent, descent int
	advances        string // two bytes (unsigned) per glyph
	offsets         string // four bytes per glyph and one more: where each outline starts and ends
	outlines        string // see Outline
	kerns           string // six bytes per pair: left glyph, right glyph, value (signed), sorted
}

func (w Weight) tables() tables {
	if w == Bold {
		return tables{boldAscent, boldDescent, boldAdvances, boldOffsets, boldOutlines, boldKerns}
	}
	return tables{regularAscent, regularDescent, regularAdvances, regularOffsets, regularOutlines, regularKerns}
}

// Ascent returns the face's ascent above the baseline in font units
// (positive), from its horizontal header.
func (w Weight) Ascent() int { return w.tables().ascent }

// Descent returns the face's depth below the baseline in font units
// (positive), from its horizontal header.
func (w Weight) Descent() int { return w.tables().descent }

// valid returns g, or Fallback when g is not a glyph of the set.
func valid(g Glyph) Glyph {
	if int(g) > len(runes)/2 {
		return Fallback
	}
	return g
}

// Advance returns g's advance width in font units.
func (w Weight) Advance(g Glyph) int { return int(u16(w.tables().advances, 2*int(valid(g)))) }

// Kern returns the kerning between a and b set next to each other, in font
// units (negative brings them closer); zero for most pairs.
func (w Weight) Kern(a, b Glyph) int {
	a, b = valid(a), valid(b)
	ks := w.tables().kerns
	key := uint32(a)<<16 | uint32(b)
	lo, hi := 0, len(ks)/6
	for lo < hi {
		m := int(uint(lo+hi) >> 1)
		switch v := uint32(u16(ks, 6*m))<<16 | uint32(u16(ks, 6*m+2)); {
		case v == key:
			return int(int16(u16(ks, 6*m+4)))
		case v < key:
			lo = m + 1
		default:
			hi = m
		}
	}
	return 0
}

// Point is one TrueType outline point in font units, y up. A contour of
// quadratic Bézier pieces runs through its on-curve points; an off-curve
// point is a control point, and between two off-curve points in a row lies
// an implied on-curve point halfway between them.
type Point struct {
	X, Y int
	On   bool // on the curve
}

// Outline returns g's contours, each a closed loop of points. Each call
// returns new slices.
//
// Encoding in the tables: two bytes for the number of contours, two for
// each contour's end (the index of its last point, as TrueType stores it),
// then two signed two-byte values per point: x times two plus one for an
// on-curve point, and y. All values big-endian.
func (w Weight) Outline(g Glyph) [][]Point {
	t := w.tables()
	g = valid(g)
	s := t.outlines[u32(t.offsets, 4*int(g)):u32(t.offsets, 4*int(g)+4)]
	n := int(u16(s, 0))
	pts := s[2+2*n:]
	contours := make([][]Point, n)
	start := 0
	for i := range contours {
		end := int(u16(s, 2+2*i)) + 1
		c := make([]Point, end-start)
		for j := range c {
			xv, y := int16(u16(pts, 4*(start+j))), int16(u16(pts, 4*(start+j)+2))
			c[j] = Point{X: int(xv >> 1), Y: int(y), On: xv&1 == 1}
		}
		contours[i], start = c, end
	}
	return contours
}

// Pen receives an outline as pieces: MoveTo starts a contour, LineTo and
// QuadTo (control point, then end point) continue it, Close ends it.
// Coordinates are font units, y up; an implied on-curve point can fall on
// a half unit.
type Pen interface {
	MoveTo(x, y float64)
	LineTo(x, y float64)
	QuadTo(cx, cy, x, y float64)
	Close()
}

// Draw sends g's outline to p, contour by contour, each closed.
func (w Weight) Draw(g Glyph, p Pen) {
	for _, c := range w.Outline(g) {
		drawContour(c, p)
	}
}

// drawContour walks one closed TrueType contour, turning runs of off-curve
// points into quadratic pieces through their implied midpoints.
func drawContour(c []Point, p Pen) {
	if len(c) == 0 {
		return
	}
	type pt struct{ x, y float64 }
	at := func(i int) pt { q := c[i%len(c)]; return pt{float64(q.X), float64(q.Y)} }
	mid := func(a, b pt) pt { return pt{(a.x + b.x) / 2, (a.y + b.y) / 2} }
	// Start on an on-curve point: the first, else the last, else the
	// midpoint of the last and first.
	first, start := at(0), 1
	switch {
	case c[0].On:
	case c[len(c)-1].On:
		first, start = at(len(c)-1), 0
	default:
		first = mid(at(len(c)-1), at(0))
		start = 0
	}
	p.MoveTo(first.x, first.y)
	end := len(c)
	if !c[0].On && c[len(c)-1].On {
		end = len(c) - 1
	}
	var ctrl pt
	pending := false
	for i := start; i < end; i++ {
		q := at(i)
		if c[i].On {
			if pending {
				p.QuadTo(ctrl.x, ctrl.y, q.x, q.y)
				pending = false
			} else {
				p.LineTo(q.x, q.y)
			}
			continue
		}
		if pending {
			m := mid(ctrl, q)
			p.QuadTo(ctrl.x, ctrl.y, m.x, m.y)
		}
		ctrl, pending = q, true
	}
	if pending {
		p.QuadTo(ctrl.x, ctrl.y, first.x, first.y)
	} else {
		p.LineTo(first.x, first.y)
	}
	p.Close()
}

func u16(s string, i int) uint16 { return uint16(s[i])<<8 | uint16(s[i+1]) }

func u32(s string, i int) uint32 { return uint32(u16(s, i))<<16 | uint32(u16(s, i+2)) }
