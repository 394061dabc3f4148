package render

import (
	"fmt"
	"image/color"
	"math"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// PlanLayout is where the plan card puts each step in its box.
type PlanLayout struct {
	Inner  Rect
	Title  []string
	TitleY float64
	Steps  []PlanStepLayout
	Notes  []string // wrapped notes under the steps
	NotesY float64
	NeedH  float64 // the box height the card needs
}

// PlanStepLayout is one step's row: its hit rectangle (the whole row, at
// least HitMin tall), the arrow drawing's square and the text.
type PlanStepLayout struct {
	Row     Rect
	Icon    Rect
	Amount  Point // top-left of the amount line (bold)
	Words   []string
	WordsY  float64
	WordsX  float64
	AmountS string
}

// HitMin is the least height of a touch target in CSS px: a fingertip.
const HitMin = 48

const iconSide = 64

// StepAmount returns a step's rounded amount as the setter reads it,
// unsigned (the arrow shows the way): a length in the display unit only
// (a setter with inch tools is not given mm), or degrees.
func StepAmount(s plan.Step, unit session.Unit) string {
	if s.Unit == "deg" {
		return fmt.Sprintf("%.2f°", math.Abs(s.Amount))
	}
	return session.FormatLength(math.Abs(s.Amount), unit)
}

// PlanTitle is the plan card's title.
func PlanTitle(p *plan.Plan) string {
	if p == nil || len(p.Steps) == 0 {
		return "The plan: nothing to change"
	}
	if len(p.Steps) == 1 {
		return "The plan: one step"
	}
	return fmt.Sprintf("The plan: %d steps, in this order", len(p.Steps))
}

// LayoutPlan lays out the plan card of m in box.
func LayoutPlan(box Rect, m *Model) PlanLayout {
	var l PlanLayout
	l.Inner = box.Inset(cardPad)
	w := l.Inner.W()
	var p *plan.Plan
	if m != nil {
		p = m.Plan
	}
	l.Title = Wrap(PlanTitle(p), w, TitleSize, true)
	l.TitleY = l.Inner.Min.Y
	y := l.TitleY + float64(len(l.Title))*lineStep(TitleSize) + gap
	if p != nil {
		// Wide boxes (a phone on its side, a tablet) take the steps in
		// two columns, row by row.
		cols := 1
		if w >= sideColumnFrom && len(p.Steps) > 1 {
			cols = 2
		}
		colW := (w - float64(cols-1)*2*gap) / float64(cols)
		rowTop, rowH := y, 0.0
		for k, s := range p.Steps {
			col := k % cols
			if col == 0 && k > 0 {
				rowTop += rowH + gap
				rowH = 0
			}
			y = rowTop
			left := l.Inner.Min.X + float64(col)*(colW+2*gap)
			tx := left + iconSide + gap + 4
			var sl PlanStepLayout
			sl.AmountS = StepAmount(s, m.Unit)
			sl.Amount = Point{tx, y + 4}
			sl.WordsX = tx
			sl.WordsY = y + 4 + lineStep(BodySize+2)
			sl.Words = Wrap(s.Words, left+colW-tx, BodySize, false)
			h := math.Max(iconSide+8, sl.WordsY-y+float64(len(sl.Words))*lineStep(BodySize)+6)
			h = math.Max(h, HitMin)
			sl.Row = Rect{Point{left, y}, Point{left + colW, y + h}}
			sl.Icon = Rect{Point{left, y + 4}, Point{left + iconSide, y + 4 + iconSide}}
			l.Steps = append(l.Steps, sl)
			rowH = math.Max(rowH, h)
		}
		y = rowTop + rowH + gap
		var notes string
		if p.NextReading != "" {
			notes = p.NextReading
		}
		if notes != "" {
			l.Notes = Wrap(notes, w, BodySize, false)
		}
	}
	l.NotesY = y
	y += float64(len(l.Notes)) * lineStep(BodySize)
	l.NeedH = y + cardPad - box.Min.Y
	return l
}

// PlanCard draws the plan: each step in working order with a drawing of
// which way to move or turn the part (a straight arrow toward the front or
// the back for the valve, arrows apart or together for a rod lengthened or
// shortened, a curved arrow for a sheave or crank turned with or against
// the running direction), the rounded amount in bold and the step in
// workshop words. It returns each step's row as its hit rectangle (at
// least HitMin tall), for ticking steps off.
func PlanCard(c Canvas, m *Model, box Rect, th Theme) []Rect {
	if !usable(box) {
		return nil
	}
	l := LayoutPlan(box, m)
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	drawLines(c, Point{l.Inner.Min.X, l.TitleY}, l.Title, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
	var hits []Rect
	for k, sl := range l.Steps {
		s := m.Plan.Steps[k]
		c.Fill(RoundRect(sl.Icon, 8), FillStyle{Color: th.Background})
		StepArrow(c, sl.Icon, s, th)
		c.Text(sl.Amount, fmt.Sprintf("%d. %s", k+1, sl.AmountS), TextStyle{Color: th.Ink, Size: BodySize + 2, Bold: true, VAlign: Top})
		drawLines(c, Point{sl.WordsX, sl.WordsY}, sl.Words, TextStyle{Color: th.Ink, Size: BodySize})
		if sl.Row.Min.Y > l.Steps[0].Row.Min.Y && sl.Row.Min.X == l.Steps[0].Row.Min.X {
			var sep Path
			sep.MoveTo(Point{sl.Row.Min.X, sl.Row.Min.Y - gap/2})
			sep.LineTo(Point{l.Inner.Max.X, sl.Row.Min.Y - gap/2})
			c.Stroke(sep, th.GridLine())
		}
		hits = append(hits, sl.Row)
	}
	drawLines(c, Point{l.Inner.Min.X, l.NotesY}, l.Notes, TextStyle{Color: th.Muted, Size: BodySize})
	return hits
}

// StepArrow draws the way a step goes in the square r: see PlanCard.
// Screen right is toward the front cover, as in the motion drawing, so
// forward running turns the wheel clockwise.
func StepArrow(c Canvas, r Rect, s plan.Step, th Theme) {
	ctr := Point{(r.Min.X + r.Max.X) / 2, (r.Min.Y + r.Max.Y) / 2}
	half := r.W() / 2 * 0.72
	line := LineStyle{Color: th.Accent, Width: 4}
	part := LineStyle{Color: th.Ink, Width: 3}
	switch s.Kind {
	case session.ValveOnSpindle:
		// The valve on its spindle, arrow toward the front (right) or back.
		var sp Path
		sp.MoveTo(Point{ctr.X - half, ctr.Y + 10})
		sp.LineTo(Point{ctr.X + half, ctr.Y + 10})
		c.Stroke(sp, part)
		c.Fill(RoundRect(Rect{Point{ctr.X - 10, ctr.Y + 2}, Point{ctr.X + 10, ctr.Y + 18}}, 2), FillStyle{Color: th.Ink})
		dir := math.Copysign(1, s.Amount)
		arrow(c, Point{ctr.X - dir*half, ctr.Y - 10}, Point{ctr.X + dir*half, ctr.Y - 10}, line)
	case session.EccentricAngle, session.ReturnCrankAngle:
		// Clockwise on screen is forward running.
		cw := s.Amount > 0
		if s.Kind == session.EccentricAngle && s.Eccentric == session.BackwardEccentric {
			cw = !cw
		}
		c.Stroke(Circle(ctr, half*0.45), part)
		c.Fill(Circle(ctr, 3), FillStyle{Color: th.Ink})
		turnArrow(c, ctr, half*0.85, cw, line)
	default:
		// A rod: arrows apart to lengthen, together to shorten.
		var rod Path
		rod.MoveTo(Point{ctr.X - half*0.45, ctr.Y + 10})
		rod.LineTo(Point{ctr.X + half*0.45, ctr.Y + 10})
		c.Stroke(rod, part)
		c.Stroke(Circle(Point{ctr.X - half*0.45, ctr.Y + 10}, 4), part)
		c.Stroke(Circle(Point{ctr.X + half*0.45, ctr.Y + 10}, 4), part)
		if s.Amount > 0 {
			arrow(c, Point{ctr.X - 4, ctr.Y - 10}, Point{ctr.X - half, ctr.Y - 10}, line)
			arrow(c, Point{ctr.X + 4, ctr.Y - 10}, Point{ctr.X + half, ctr.Y - 10}, line)
		} else {
			arrow(c, Point{ctr.X - half, ctr.Y - 10}, Point{ctr.X - 5, ctr.Y - 10}, line)
			arrow(c, Point{ctr.X + half, ctr.Y - 10}, Point{ctr.X + 5, ctr.Y - 10}, line)
		}
	}
}

// arrow strokes a straight arrow from a to b with a filled head at b.
func arrow(c Canvas, a, b Point, s LineStyle) {
	dx, dy := b.X-a.X, b.Y-a.Y
	n := math.Hypot(dx, dy)
	if !(n > 0) {
		return
	}
	ux, uy := dx/n, dy/n
	head := 3 * s.Width
	var p Path
	p.MoveTo(a)
	p.LineTo(Point{b.X - ux*head*0.8, b.Y - uy*head*0.8})
	c.Stroke(p, s)
	arrowHead(c, b, ux, uy, head, s.Color)
}

// arrowHead fills a head of length h pointing along (ux, uy) with its tip
// at tip.
func arrowHead(c Canvas, tip Point, ux, uy, h float64, col color.RGBA) {
	var p Path
	p.MoveTo(tip)
	p.LineTo(Point{tip.X - ux*h - uy*h*0.6, tip.Y - uy*h + ux*h*0.6})
	p.LineTo(Point{tip.X - ux*h + uy*h*0.6, tip.Y - uy*h - ux*h*0.6})
	p.Close()
	c.Fill(p, FillStyle{Color: col})
}

// turnArrow strokes three quarters of a circle about ctr with a head at
// its end, turning clockwise on screen when cw.
func turnArrow(c Canvas, ctr Point, r float64, cw bool, s LineStyle) {
	start, sweep := -200.0, 250.0
	if !cw {
		start, sweep = 20, -250
	}
	var p Path
	Arc(&p, ctr, r, start, sweep*0.92)
	c.Stroke(p, s)
	end := (start + sweep) * math.Pi / 180
	tip := Point{ctr.X + r*math.Cos(end), ctr.Y + r*math.Sin(end)}
	// Tangent along the sweep.
	sg := math.Copysign(1, sweep)
	ux, uy := -math.Sin(end)*sg, math.Cos(end)*sg
	arrowHead(c, tip, ux, uy, 3*s.Width, s.Color)
}
