package render

import "math"

// Diagram names one of the diagrams a screen can show.
type Diagram uint8

// The diagrams.
const (
	ValveCurveDiagram Diagram = iota
	BalanceDiagram
	ValvePistonDiagram
	PortOpeningDiagram
	MotionDiagram
	PlanDiagram
)

// perPosition reports whether a diagram shows one reverser position (and
// so needs the position tabs).
func (d Diagram) perPosition() bool {
	return d == ValveCurveDiagram || d == ValvePistonDiagram || d == PortOpeningDiagram || d == MotionDiagram
}

// Screen is what a phone screen shows: a diagram, the reverser position
// chosen on the tabs, and the crank angle of the motion drawing.
type Screen struct {
	Diagram  Diagram
	Position int
	CrankDeg float64
}

// ScreenHits are the touch targets a screen drew, for the app's hit
// testing: one per position tab and one per plan step (each at least
// HitMin tall).
type ScreenHits struct {
	Positions []Rect
	Steps     []Rect
}

const tabGap = 6

// LayoutTabs lays out one tab per label across the top of box, in as many
// rows as the labels need at their natural widths (each tab at least
// HitMin square, all of a row sharing its width out), and returns the
// tabs and the height they take with the gap under them.
func LayoutTabs(box Rect, labels []string) ([]Rect, float64) {
	var out []Rect
	if len(labels) == 0 || !usable(box) {
		return nil, 0
	}
	y := box.Min.Y
	i := 0
	for i < len(labels) {
		// Fill a row with as many tabs as fit.
		j, w := i, 0.0
		for j < len(labels) {
			tw := math.Max(HitMin, TextWidth(labels[j], BodySize, true)+2*cardPad)
			if j > i && w+tabGap+tw > box.W() {
				break
			}
			if j > i {
				w += tabGap
			}
			w += tw
			j++
		}
		spare := (box.W() - w) / float64(j-i)
		x := box.Min.X
		for k := i; k < j; k++ {
			tw := math.Max(HitMin, TextWidth(labels[k], BodySize, true)+2*cardPad) + spare
			right := x + tw
			if k == j-1 {
				right = box.Max.X // exactly, whatever the rounding
			}
			out = append(out, Rect{Point{x, y}, Point{right, y + HitMin}})
			x += tw + tabGap
		}
		y += HitMin + tabGap
		i = j
	}
	return out, y - box.Min.Y + gap - tabGap
}

// Tabs draws the tabs of LayoutTabs with sel highlighted and returns
// their hit rectangles and the height used.
func Tabs(c Canvas, box Rect, labels []string, sel int, th Theme) ([]Rect, float64) {
	rs, h := LayoutTabs(box, labels)
	drawTabs(c, rs, labels, sel, th)
	return rs, h
}

// drawTabs draws tabs at rs, sel highlighted; a label too wide for its
// tab shows its first wrapped line.
func drawTabs(c Canvas, rs []Rect, labels []string, sel int, th Theme) {
	for k, r := range rs {
		ts := TextStyle{Color: th.Ink, Size: BodySize, Bold: true, HAlign: Center, VAlign: Middle}
		if k == sel {
			c.Fill(RoundRect(r, 10), FillStyle{Color: th.Accent})
			ts.Color = th.OnAccent
		} else {
			c.Fill(RoundRect(r, 10), FillStyle{Color: th.Surface})
			c.Stroke(RoundRect(r.Inset(0.75), 9.25), LineStyle{Color: th.Grid, Width: 1.5})
		}
		label := labels[k]
		if TextWidth(label, BodySize, true) > r.W()-8 {
			label = Wrap(label, r.W()-8, BodySize, true)[0]
		}
		c.Text(Point{(r.Min.X + r.Max.X) / 2, (r.Min.Y + r.Max.Y) / 2}, label, ts)
	}
}

// sideTabsW is the width of the tab column of a landscape screen.
const sideTabsW = 132

// LayoutSideTabs lays out one tab per label down the left of col, each
// HitMin tall.
func LayoutSideTabs(col Rect, n int) []Rect {
	var out []Rect
	for k := 0; k < n; k++ {
		y := col.Min.Y + float64(k)*(HitMin+tabGap)
		out = append(out, Rect{Point{col.Min.X, y}, Point{col.Max.X, y + HitMin}})
	}
	return out
}

func sideTabs(c Canvas, col Rect, labels []string, sel int, th Theme) []Rect {
	rs := LayoutSideTabs(col, len(labels))
	drawTabs(c, rs, labels, sel, th)
	return rs
}

// DrawScreen draws a whole phone screen into box: the position tabs when
// the diagram shows one position, then the diagram filling the rest. It
// returns the touch targets.
func DrawScreen(c Canvas, m *Model, s Screen, box Rect, th Theme) ScreenHits {
	var hits ScreenHits
	if !usable(box) || m == nil {
		return hits
	}
	rest := box
	if s.Diagram.perPosition() && len(m.Positions) > 1 {
		if box.W() > box.H() {
			// On its side the phone is short: the tabs stand in a
			// column at the left, one per row.
			col := Rect{box.Min, Point{box.Min.X + sideTabsW, box.Max.Y}}
			hits.Positions = sideTabs(c, col, m.PositionNames(), s.Position, th)
			rest.Min.X += sideTabsW + gap
		} else {
			var h float64
			hits.Positions, h = Tabs(c, box, m.PositionNames(), s.Position, th)
			rest.Min.Y += h
		}
	}
	i := s.Position
	if i < 0 || i >= len(m.Positions) {
		i = 0
	}
	switch s.Diagram {
	case ValveCurveDiagram:
		ValveCurve(c, m, i, rest, th)
	case BalanceDiagram:
		Balance(c, m, rest, th)
	case ValvePistonDiagram:
		ValvePiston(c, m, i, rest, th)
	case PortOpeningDiagram:
		PortOpening(c, m, i, rest, th)
	case MotionDiagram:
		Motion(c, m, i, s.CrankDeg, rest, th)
	case PlanDiagram:
		hits.Steps = PlanCard(c, m, rest, th)
	}
	return hits
}

// ScreenNeedH returns the height DrawScreen needs for s in box: the
// position tabs and the diagram at its least (a card of its own height,
// a plot or drawing at its least size). A box at least this tall holds
// everything drawn; the app makes a shorter screen scroll. A box made
// taller may turn from wide to tall, which moves the tabs from the side
// to the top: the height is the one for the box it makes.
func ScreenNeedH(m *Model, s Screen, box Rect) float64 {
	if !usable(box) || m == nil {
		return 0
	}
	side := box.W() > box.H()
	need := screenNeed(m, s, box, side)
	if grown := box.H() < need && side && box.W() <= need; grown {
		need = screenNeed(m, s, box, false)
	}
	return need
}

// screenNeed is ScreenNeedH with the position tabs at the side or on top.
func screenNeed(m *Model, s Screen, box Rect, side bool) float64 {
	rest := box
	if s.Diagram.perPosition() && len(m.Positions) > 1 {
		if side {
			rest.Min.X += sideTabsW + gap
		} else {
			_, h := LayoutTabs(box, m.PositionNames())
			rest.Min.Y += h
		}
	}
	i := s.Position
	if i < 0 || i >= len(m.Positions) {
		i = 0
	}
	need := 0.0
	switch s.Diagram {
	case ValveCurveDiagram:
		need = LayoutValveCurve(rest, m, i).NeedH
	case BalanceDiagram:
		need = LayoutBalance(rest, m).NeedH
	case MotionDiagram:
		need = LayoutMotion(rest, m, i).NeedH
	case PlanDiagram:
		need = LayoutPlan(rest, m).NeedH
	}
	return rest.Min.Y - box.Min.Y + need
}

// LayoutScreen returns the touch targets DrawScreen would draw for s in
// box, without drawing: the app learns where a tap lands from the same
// layout the picture uses.
func LayoutScreen(m *Model, s Screen, box Rect) ScreenHits {
	return DrawScreen(nopCanvas{w: box.Max.X, h: box.Max.Y}, m, s, box, Light())
}
