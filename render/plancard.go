package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Text sizes of the plan card, larger than the diagrams' labels: the
// card is read at arm's length by the engine, outdoors (15 CSS px at
// least, common practice, no source).
const (
	planHead  = 17 // a step's headline and the section heads, bold
	planWords = 16 // a step's words
	planSmall = 15 // the table, the notes
)

// PlanLayout is where the plan card puts each part in its box: the title,
// a row per step (its hit rectangle and its sketch's square) and every
// line of text (the steps' words, the table of leads and cut-offs now and
// after, the notes and the next reading), so that the card is drawn,
// measured and tested from one layout.
type PlanLayout struct {
	Inner Rect
	Steps []PlanStepLayout
	Texts []PlacedText
	Rules []Rect  // thin lines between steps and sections (Min to Max, no height)
	NeedH float64 // the box height the card needs
}

// PlanStepLayout is one step's row: its hit rectangle (the whole row, at
// least HitMin tall) and the sketch's square.
type PlanStepLayout struct {
	Row  Rect
	Icon Rect
}

// PlacedText is one line of text a card laid out: its anchor (the top
// left, or the top right when Right), the words, size and weight, and
// its role in the theme's colours.
type PlacedText struct {
	At    Point
	Text  string
	Size  float64
	Bold  bool
	Right bool
	Role  TextRole
}

// TextRole is what a line of text is, for its colour.
type TextRole uint8

// The roles of a card's text.
const (
	InkText   TextRole = iota // the main text
	MutedText                 // secondary: headings of columns, units
	WarnText                  // a warning: the what-if, a target not met
)

// Box returns the rectangle the text's glyphs may reach: its advance
// width and its line's height.
func (p PlacedText) Box() Rect {
	w := TextWidth(p.Text, p.Size, p.Bold)
	x := p.At.X
	if p.Right {
		x -= w
	}
	return Rect{Point{x, p.At.Y}, Point{x + w, p.At.Y + lineStep(p.Size)}}
}

// HitMin is the least height of a touch target in CSS px: a fingertip.
const HitMin = 48

const iconSide = 64

// narrowSteps is the column width under which a step's words go under its
// sketch rather than beside it.
const narrowSteps = 420

// StepAmount returns a step's rounded amount as the setter reads it,
// unsigned (the words and the sketch give the way): a length in the
// display unit only (a setter with inch tools is not given mm), or
// degrees.
func StepAmount(s plan.Step, unit session.Unit) string {
	if s.Unit == "deg" {
		return fmt.Sprintf("%.2f°", math.Abs(s.Amount))
	}
	return session.FormatLength(math.Abs(s.Amount), unit)
}

// StepHeadline is a step's bold line: its number, the part to work on
// and the amount ("2. Backward eccentric rod: 0.013 in").
func StepHeadline(k int, s plan.Step, unit session.Unit) string {
	return fmt.Sprintf("%d. %s: %s", k+1, Capital(s.Part), StepAmount(s, unit))
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

// LayoutPlan lays out the plan card of m in box: the steps, then the
// table of leads and cut-offs now and after, the notes and the next
// reading to take.
func LayoutPlan(box Rect, m *Model) PlanLayout { return layoutPlan(box, m, true) }

// layoutPlan lays out the plan card; all adds the table, the notes and
// the next reading under the steps (the report gives them elsewhere).
func layoutPlan(box Rect, m *Model, all bool) PlanLayout {
	l := planLayouter{PlanLayout: PlanLayout{Inner: box.Inset(cardPad)}}
	l.y = l.Inner.Min.Y
	var p *plan.Plan
	if m != nil {
		p = m.Plan
	}
	l.para(PlanTitle(p), l.Inner.Min.X, l.Inner.W(), TitleSize, true, InkText)
	l.y += gap
	if p != nil {
		l.steps(m)
		if all {
			l.table(m)
			l.notes(p)
		}
	}
	l.NeedH = l.y + cardPad - box.Min.Y
	return l.PlanLayout
}

// planLayouter stacks the plan card's parts down the card.
type planLayouter struct {
	PlanLayout
	y float64
}

// put places one line of text.
func (l *planLayouter) put(x, y float64, text string, size float64, bold, right bool, role TextRole) {
	l.Texts = append(l.Texts, PlacedText{At: Point{x, y}, Text: text, Size: size, Bold: bold, Right: right, Role: role})
}

// para wraps text into width at x from the current y and moves y below it.
func (l *planLayouter) para(text string, x, w, size float64, bold bool, role TextRole) {
	for _, line := range Wrap(text, w, size, bold) {
		l.put(x, l.y, line, size, bold, false, role)
		l.y += lineStep(size)
	}
}

// steps lays out a row per step: the sketch, the headline and the words.
// Wide boxes (a phone on its side, a tablet) take the steps in two
// columns, row by row.
func (l *planLayouter) steps(m *Model) {
	w := l.Inner.W()
	n := len(m.Plan.Steps)
	cols := 1
	if w >= sideColumnFrom && n > 1 {
		cols = 2
	}
	colW := (w - float64(cols-1)*2*gap) / float64(cols)
	rowTop, rowH := l.y, 0.0
	for k, s := range m.Plan.Steps {
		col := k % cols
		if col == 0 && k > 0 {
			rowTop += rowH + gap
			l.Rules = append(l.Rules, Rect{Point{l.Inner.Min.X, rowTop - gap/2}, Point{l.Inner.Max.X, rowTop - gap/2}})
			rowH = 0
		}
		left := l.Inner.Min.X + float64(col)*(colW+2*gap)
		tx := left + iconSide + gap + 4
		l.y = rowTop + 4
		l.para(StepHeadline(k, s, m.Unit), tx, left+colW-tx, planHead, true, InkText)
		l.y += 2
		if colW < narrowSteps {
			// A phone held upright: the words take the whole width under
			// the sketch, where they need fewer lines.
			l.y = math.Max(l.y, rowTop+4+iconSide+4)
			tx = left
		}
		l.para(s.Words, tx, left+colW-tx, planWords, false, InkText)
		h := math.Max(math.Max(iconSide+8, l.y-rowTop+6), HitMin)
		l.Steps = append(l.Steps, PlanStepLayout{
			Row:  Rect{Point{left, rowTop}, Point{left + colW, rowTop + h}},
			Icon: Rect{Point{left, rowTop + 4}, Point{left + iconSide, rowTop + 4 + iconSide}},
		})
		rowH = math.Max(rowH, h)
	}
	l.y = rowTop + rowH + gap
}

// head starts a section: a rule across the card and a bold heading.
func (l *planLayouter) head(text string) {
	l.y += gap
	l.Rules = append(l.Rules, Rect{Point{l.Inner.Min.X, l.y}, Point{l.Inner.Max.X, l.y}})
	l.y += gap
	l.para(text, l.Inner.Min.X, l.Inner.W(), planHead, true, InkText)
	l.y += 2
}

// table lays out the leads and cut-offs now and after per position, front
// and back, each number right-aligned in its column, with a +/- where the
// readings leave doubt (see PlanValue). A card too narrow for the
// quantity and the end side by side puts the quantity on a line of its
// own; a wide one puts the positions side by side.
func (l *planLayouter) table(m *Model) {
	ps := PlanTable(m)
	if len(ps) == 0 {
		return
	}
	x0, w := l.Inner.Min.X, l.Inner.W()
	l.head("Leads and cut-offs, now → after")
	l.para(fmt.Sprintf("Leads in %s (negative: still closed at dead centre), cut-offs in %% of the stroke; ± where the readings leave doubt.", unitWords(m)),
		x0, w, planSmall, false, MutedText)
	if m.WhatIf != "" {
		l.para("After includes the what-if: "+m.WhatIf+".", x0, w, planSmall, false, WarnText)
	}
	tw := math.Min(w, tableWidth(ps)+3*gap)
	per := max(1, min(len(ps), int((w+3*gap)/(tw+3*gap))))
	top, bottom := l.y, l.y
	for i, p := range ps {
		col := i % per
		if col == 0 && i > 0 {
			top = bottom
			l.Rules = append(l.Rules, Rect{Point{x0, top + gap/4}, Point{x0 + w, top + gap/4}})
		}
		l.y = top
		l.position(p, x0+float64(col)*(tw+3*gap), tw)
		bottom = math.Max(bottom, l.y)
	}
	l.y = bottom + gap
}

// position lays out one position's part of the table in the width w from
// x0: its name with the heads of the columns, then lead and cut-off, each
// front and back.
func (l *planLayouter) position(p PlanPosition, x0, w float64) {
	c := layoutColumns([]PlanPosition{p}, x0, w)
	step := lineStep(planSmall)
	l.y += gap / 2
	l.put(x0, l.y, p.Name, planSmall, true, false, InkText)
	if x0+TextWidth(p.Name, planSmall, true)+c.sp > c.nowR-TextWidth("now", planSmall, false) {
		l.y += step
	}
	l.put(c.nowR, l.y, "now", planSmall, false, true, MutedText)
	l.put(c.afterR, l.y, "after", planSmall, false, true, MutedText)
	l.y += step
	for q := 0; q < 2; q++ {
		l.put(x0, l.y, qtyName(q), planSmall, false, false, MutedText)
		if !c.apart {
			l.y += step
		}
		for k, end := range p.Ends {
			v := end.Lead
			if q == 1 {
				v = end.CutOff
			}
			l.put(c.endX, l.y, endName(k), planSmall, false, false, InkText)
			l.put(c.nowR, l.y, v.Now, planSmall, false, true, InkText)
			if v.Doubt {
				l.put(c.sigmaX, l.y, "±"+v.Sigma, planSmall, false, false, MutedText)
			}
			l.put(c.arrowX, l.y, "→", planSmall, false, false, MutedText)
			l.put(c.afterR, l.y, v.After, planSmall, false, true, InkText)
			l.y += step
		}
	}
}

// planColumns are the x places of the plan table's columns: the end's
// name (left), now (right edge), the +/- (left), the arrow (left) and
// after (right edge); apart says the quantity and the end share a line.
type planColumns struct {
	endX, nowR, sigmaX, arrowX, afterR, sp float64
	apart                                  bool
}

// columnWidths are the widest texts of the plan table's columns.
type columnWidths struct {
	qty, end, now, sigma, arrow, after, sp float64
}

// measureColumns measures the plan table's columns over ps.
func measureColumns(ps []PlanPosition) columnWidths {
	width := func(s string) float64 { return TextWidth(s, planSmall, false) }
	cw := columnWidths{qty: math.Max(width(qtyName(0)), width(qtyName(1))), now: width("now"), after: width("after"),
		arrow: width("→"), sp: width("  ")}
	for _, p := range ps {
		for k, e := range p.Ends {
			cw.end = math.Max(cw.end, width(endName(k)))
			for _, v := range []PlanValue{e.Lead, e.CutOff} {
				cw.now = math.Max(cw.now, width(v.Now))
				cw.after = math.Max(cw.after, width(v.After))
				if v.Doubt {
					cw.sigma = math.Max(cw.sigma, width("±"+v.Sigma)+width(" "))
				}
			}
		}
	}
	return cw
}

// tableWidth is the width the plan table's columns need side by side.
func tableWidth(ps []PlanPosition) float64 {
	c := measureColumns(ps)
	return c.qty + c.sp + c.end + c.sp + c.now + c.sigma + c.sp + c.arrow + c.sp + c.after
}

// layoutColumns places the plan table's columns in the width w from x0,
// from the right: after, the arrow, the +/-, now; the labels at the left.
func layoutColumns(ps []PlanPosition, x0, w float64) planColumns {
	cw := measureColumns(ps)
	c := planColumns{sp: cw.sp, afterR: x0 + w}
	c.arrowX = c.afterR - cw.after - cw.sp - cw.arrow
	c.sigmaX = c.arrowX - cw.sp - cw.sigma + TextWidth(" ", planSmall, false)
	c.nowR = c.arrowX - cw.sp - cw.sigma
	c.endX = x0 + cw.qty + cw.sp
	c.apart = c.endX+cw.end+cw.sp <= c.nowR-cw.now
	if !c.apart {
		c.endX = x0 + cw.sp
	}
	return c
}

// qtyName names the table's quantities: 0 lead, 1 cut-off.
func qtyName(q int) string {
	if q == 0 {
		return "lead"
	}
	return "cut-off"
}

// endName names a cylinder end by its index: 0 front, 1 back.
func endName(k int) string {
	if k == 0 {
		return "front"
	}
	return "back"
}

// notes lays out the plan's notes as bullets, then the next reading to
// take under its own heading.
func (l *planLayouter) notes(p *plan.Plan) {
	var ns []string
	for _, n := range p.Notes {
		if n != p.NextReading {
			ns = append(ns, n)
		}
	}
	x0 := l.Inner.Min.X
	indent := TextWidth("•  ", planSmall, false)
	if len(ns) > 0 {
		l.head("Notes")
		for _, n := range ns {
			l.put(x0, l.y, "•", planSmall, false, false, InkText)
			l.para(n, x0+indent, l.Inner.W()-indent, planSmall, false, InkText)
			l.y += 4
		}
	}
	if p.NextReading != "" {
		l.head("Next reading")
		l.para(p.NextReading, x0, l.Inner.W(), planSmall, false, InkText)
	}
}

// PlanPosition is one reverser position's row of the plan card's table.
type PlanPosition struct {
	Name string
	Ends [2]PlanEnd // front, back
}

// PlanEnd is one end's lead and cut-off in the plan card's table.
type PlanEnd struct {
	Lead, CutOff PlanValue
}

// PlanValue is one event now and after, as the plan's words write it:
// a lead as a bare number in the display unit, a cut-off in % of the
// stroke ("never opens", "never closes" where it has none), and its one
// standard deviation from the readings. Doubt says the +/- is worth
// showing: a lead known to worse than 0.02 mm, a cut-off to worse than
// 0.5 % (under a thou and half a per cent are what a setter can act on;
// common practice, no source).
type PlanValue struct {
	Now, After, Sigma string
	Doubt             bool
}

// Doubt thresholds of the plan card's +/-: see PlanValue.
const (
	leadDoubtMM = 0.02
	cutDoubtPct = 0.5
)

// cutOffDigits are the decimals of a cut-off in % of the stroke, as the
// plan's words give it.
const cutOffDigits = 1

// PlanTable returns the plan card's table for m: per position, each end's
// lead and cut-off today and after (the what-if's after, when m is a
// what-if), with the errors the plan gives today's. Empty without a plan.
func PlanTable(m *Model) []PlanPosition {
	if m == nil || m.Plan == nil {
		return nil
	}
	var out []PlanPosition
	for i, p := range m.Positions {
		if !p.HasAfter {
			continue
		}
		row := PlanPosition{Name: p.Notch.Name}
		for k, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
			var sd plan.EndState
			if i < len(m.Plan.Now) {
				sd = m.Plan.Now[i].Front
				if k == 1 {
					sd = m.Plan.Now[i].Back
				}
			}
			n, a := p.NowEvents.End(end), p.AfterEvents.End(end)
			row.Ends[k] = PlanEnd{
				Lead: PlanValue{Now: m.bareLength(n.Lead), After: m.bareLength(a.Lead), Sigma: m.bareLength(sd.LeadSigmaMM), Doubt: sd.LeadSigmaMM >= leadDoubtMM},
				CutOff: PlanValue{Now: cutOffText(n), After: cutOffText(a), Sigma: fmt.Sprintf("%.*f", cutOffDigits, sd.CutOffSigmaPct),
					Doubt: sd.CutOffSigmaPct >= cutDoubtPct},
			}
		}
		out = append(out, row)
	}
	return out
}

// cutOffText is an end's cut-off in % of the stroke as a bare number, or
// why it has none.
func cutOffText(e setting.EndEvents) string {
	switch {
	case e.NeverOpens:
		return "never opens"
	case e.NeverCloses:
		return "never closes"
	}
	return fmt.Sprintf("%.*f", cutOffDigits, e.CutOff.StrokePercent+0)
}

// bareLength writes a length in the model's display unit without the
// unit.
func (m *Model) bareLength(mm float64) string { return bareLength(mm, m.Unit) }

// PlanCard draws the plan: each step in working order with a sketch of
// the part and which way it goes (see StepSketch), the part and the
// rounded amount in bold and the step in workshop words; then the leads
// and cut-offs now and after, the notes and the next reading to take. It
// returns each step's row as its hit rectangle (at least HitMin tall),
// for choosing the step the what-if changes.
func PlanCard(c Canvas, m *Model, box Rect, th Theme) []Rect {
	return drawPlan(c, m, box, th, true)
}

// drawPlan draws the plan card; all as in layoutPlan.
func drawPlan(c Canvas, m *Model, box Rect, th Theme, all bool) []Rect {
	if !usable(box) {
		return nil
	}
	l := layoutPlan(box, m, all)
	c.Fill(RoundRect(box, cardRadius), FillStyle{Color: th.Surface})
	for _, r := range l.Rules {
		c.Stroke(segment(r.Min, r.Max), th.GridLine())
	}
	var hits []Rect
	for k, sl := range l.Steps {
		c.Fill(RoundRect(sl.Icon, 8), FillStyle{Color: th.Background})
		StepSketch(c, sl.Icon, m.Plan.Steps[k], th)
		hits = append(hits, sl.Row)
	}
	DrawTexts(c, l.Texts, th)
	return hits
}

// DrawTexts draws laid-out lines of text in the theme's colours.
func DrawTexts(c Canvas, ts []PlacedText, th Theme) {
	for _, t := range ts {
		col := th.Ink
		switch t.Role {
		case MutedText:
			col = th.Muted
		case WarnText:
			col = th.Warn
		}
		s := TextStyle{Color: col, Size: t.Size, Bold: t.Bold, VAlign: Top}
		if t.Right {
			s.HAlign = Right
		}
		c.Text(t.At, t.Text, s)
	}
}

// unitWords names the model's display unit in a sentence.
func unitWords(m *Model) string { return unitWordsOf(m.Unit) }
