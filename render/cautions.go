package render

import (
	"math"

	"evenbeat/setting"
)

// Cautions card sizes (logical units) and texts.
const (
	// ButtonHeight is the height of a card's main button: above the 48 CSS
	// px a finger needs.
	ButtonHeight = 56
	// AckLabel is the text of the cautions card's button.
	AckLabel = "I understand"
	// CautionsTitle is the heading of the cautions card.
	CautionsTitle  = "Before you turn the wheels"
	cautionSizeMax = 19 // largest body size the card tries
	bulletIndent   = 18 // space for the bullet before each caution
	paraGap        = 6  // extra space between cautions
)

// CautionsLayout is where the cautions card puts each part inside its box.
type CautionsLayout struct {
	Inner  Rect       // the box less the card padding
	Title  []string   // wrapped title lines
	TitleY float64    // top of the first title line
	Size   float64    // body text size chosen to fit (14 to 17)
	Items  [][]string // each caution wrapped to the text width
	ItemsY []float64  // top of each caution's first line
	Ack    Rect       // the acknowledge button
	Fits   bool       // false when even 14-unit text overflows the box
	NeedH  float64    // the box height the content needs at this Size
}

// LayoutCautions lays out the card for the given cautions in box, choosing
// the largest body size from 19 down to 14 at which everything fits above
// the button. When nothing fits, Size is 14, Fits is false and the text
// runs under the button: the caller should give a taller box (see
// CautionsHeight) or let the card scroll.
func LayoutCautions(box Rect, cautions []string) CautionsLayout {
	var l CautionsLayout
	for size := float64(cautionSizeMax); size >= BodySize; size-- {
		l = layoutCautionsAt(box, cautions, size)
		if l.Fits {
			break
		}
	}
	return l
}

func layoutCautionsAt(box Rect, cautions []string, size float64) CautionsLayout {
	l := CautionsLayout{Inner: box.Inset(cardPad), Size: size}
	w := l.Inner.W()
	l.Title = Wrap(CautionsTitle, w-bulletIndent-4, TitleSize+2, true)
	y := l.Inner.Min.Y
	l.TitleY = y
	y += float64(len(l.Title))*lineStep(TitleSize+2) + gap
	for _, s := range cautions {
		lines := Wrap(s, w-bulletIndent, size, false)
		l.Items = append(l.Items, lines)
		l.ItemsY = append(l.ItemsY, y)
		y += float64(len(lines))*lineStep(size) + paraGap
	}
	y += gap
	l.NeedH = y + ButtonHeight + cardPad - box.Min.Y
	ackTop := math.Max(y, l.Inner.Max.Y-ButtonHeight)
	l.Fits = y+ButtonHeight <= l.Inner.Max.Y
	if !l.Fits {
		ackTop = l.Inner.Max.Y - ButtonHeight
	}
	l.Ack = Rect{Point{l.Inner.Min.X, ackTop}, Point{l.Inner.Max.X, ackTop + ButtonHeight}}
	return l
}

// CautionsHeight returns the least box height at which the cautions card
// fits a box of the given width with 14-unit text.
func CautionsHeight(width float64) float64 {
	return layoutCautionsAt(Rect{Max: Point{width, 1e6}}, setting.Cautions(), BodySize).NeedH
}

// Cautions draws the first-run cautions card (setting.Cautions, wrapped to
// the box) with a large acknowledge button at the bottom, and returns the
// button's rectangle for hit testing (ButtonHeight tall, the card's inner
// width). A box that is empty or not finite draws nothing and returns the
// zero Rect, which no tap falls in.
func Cautions(c Canvas, box Rect, th Theme) (ack Rect) {
	if !usable(box) {
		return Rect{}
	}
	l := LayoutCautions(box, setting.Cautions())
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	// The border is stroked inside the box: half its width in from the edge.
	c.Stroke(RoundRect(box.Inset(1), cardRadius-1), LineStyle{Color: th.Warn, Width: 2})

	// Title with a warning triangle.
	ts := TextStyle{Color: th.Ink, Size: TitleSize + 2, Bold: true}
	tri := lineStep(TitleSize+2) * 0.7
	cy := l.TitleY + Ascent(TitleSize+2, true)*0.62
	warningSign(c, Point{l.Inner.Min.X + tri/2, cy}, tri, th)
	drawLines(c, Point{l.Inner.Min.X + bulletIndent + 4, l.TitleY}, l.Title, ts)

	body := TextStyle{Color: th.Ink, Size: l.Size}
	for i, lines := range l.Items {
		y := l.ItemsY[i]
		// Bullet: a small square centred on the first line's x-height.
		by := y + Ascent(l.Size, false) - l.Size*0.3
		r := l.Size * 0.18
		c.Fill(RectPath(Rect{Point{l.Inner.Min.X + 3, by - r}, Point{l.Inner.Min.X + 3 + 2*r, by + r}}), FillStyle{Color: th.Warn})
		drawLines(c, Point{l.Inner.Min.X + bulletIndent, y}, lines, body)
	}

	Button(c, l.Ack, AckLabel, th)
	return l.Ack
}

// Button draws a filled, rounded button over r with its label centred in
// bold ButtonSize text, shrunk (down to 14) if the label would not fit the
// width. The caller keeps r as the hit rectangle; make it at least 48 CSS
// px tall (ButtonHeight is 56).
func Button(c Canvas, r Rect, label string, th Theme) {
	c.Fill(RoundRect(r, 10), FillStyle{Color: th.Accent})
	lines, size := ButtonLines(label, r.W()-16, r.H()-4)
	DrawButtonLines(c, r, lines, size, TextStyle{Color: th.OnAccent, Bold: true})
}

// buttonMin is the least size of a button's label before it takes two
// lines: legible at arm's length (15 CSS px).
const buttonMin = 15

// ButtonLines fits a button's label into a width w and height h: on one
// line at the largest size from ButtonSize down to 15 that fits, else on
// two lines at the largest size that fits both, else on one line at
// BodySize (which may not fit: the caller shortens it).
func ButtonLines(label string, w, h float64) ([]string, float64) {
	for size := float64(ButtonSize); size >= buttonMin; size-- {
		if TextWidth(label, size, true) <= w {
			return []string{label}, size
		}
	}
	for size := float64(ButtonSize); size >= buttonMin; size-- {
		if lines := Wrap(label, w, size, true); len(lines) == 2 && 2*lineStep(size) <= h && joinsTo(lines, label) {
			return lines, size
		}
	}
	return []string{label}, BodySize
}

// joinsTo reports whether lines joined by spaces are label: the lines
// were broken between words.
func joinsTo(lines []string, label string) bool {
	n := 0
	for i, l := range lines {
		if i > 0 {
			n++
		}
		n += len(l)
	}
	return n == len(label)
}

// DrawButtonLines draws a button's label lines centred in r at size in
// style s (colour and weight).
func DrawButtonLines(c Canvas, r Rect, lines []string, size float64, s TextStyle) {
	s.Size, s.HAlign, s.VAlign = size, Center, Middle
	mid := (r.Min.Y + r.Max.Y) / 2
	for i, l := range lines {
		y := mid + (float64(i)-float64(len(lines)-1)/2)*lineStep(size)
		c.Text(Point{(r.Min.X + r.Max.X) / 2, y}, l, s)
	}
}

// warningSign draws a filled triangle of side size with an exclamation
// mark, centred on c.
func warningSign(c Canvas, at Point, size float64, th Theme) {
	h := size * math.Sqrt(3) / 2
	var p Path
	p.MoveTo(Point{at.X, at.Y - h/2})
	p.LineTo(Point{at.X + size/2, at.Y + h/2})
	p.LineTo(Point{at.X - size/2, at.Y + h/2})
	p.Close()
	c.Stroke(p, LineStyle{Color: th.Warn, Width: size * 0.12}) // rounds the corners
	c.Fill(p, FillStyle{Color: th.Warn})
	var bar Path
	bar.MoveTo(Point{at.X, at.Y - h*0.15})
	bar.LineTo(Point{at.X, at.Y + h*0.18})
	c.Stroke(bar, LineStyle{Color: th.Surface, Width: size * 0.11})
	c.Fill(Circle(Point{at.X, at.Y + h*0.34}, size*0.06), FillStyle{Color: th.Surface})
}
