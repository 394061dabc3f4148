package render

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/beat"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// ReportModel is what the printed report shows: the diagram model of the
// cylinder the setter is on (with its plan), the engine's other cylinders
// that have readings (each with its plan), the session it came from for
// the header (may be nil), and the whole engine's beat in each position
// every cylinder's plan covers (WholeEngine fills Others and Beat).
type ReportModel struct {
	Model   *Model
	Others  []*Model
	Session *session.Session
	Beat    []beat.Position
}

// WholeEngine returns the report of the whole engine: m (the cylinder
// opt.Cylinder of s, its model made with opt), every other cylinder of s
// with readings planned with the same choices, and, when every cylinder
// has a plan, the beat. A cylinder whose plan cannot be made is left out
// of Others (and then of the beat), as it would be on its own.
func WholeEngine(s *session.Session, m *Model, opt plan.Options) ReportModel {
	rm := ReportModel{Model: m, Session: s}
	if s == nil || m == nil || len(s.Cylinders) < 2 {
		return rm
	}
	plans := make([]*plan.Plan, len(s.Cylinders))
	plans[opt.Cylinder] = m.Plan
	for i := range s.Cylinders {
		if i == opt.Cylinder || len(s.Cylinders[i].Rounds) == 0 {
			continue
		}
		o := opt
		o.Cylinder = i
		om, err := NewSessionModel(s, o)
		if err != nil {
			continue
		}
		rm.Others = append(rm.Others, om)
		plans[i] = om.Plan
	}
	for _, p := range plans {
		if p == nil {
			return rm
		}
	}
	rm.Beat, _ = beat.FromPlans(s, plans, beat.DefaultSteam)
	return rm
}

// Report sizes, logical units.
const (
	// ReportWidth is the width the report is laid out for: about an A4
	// page's text width at 1.5 mm per unit, and twice a phone's width.
	ReportWidth = 640
	reportPad   = 16
	reportPlotH = 260 // plot height of the report's valve curves
)

// ReportHeight returns the height the report needs at the given width.
func ReportHeight(width float64, m ReportModel) float64 {
	return report(nopCanvas{w: width, h: 1e6}, m, Light(), width)
}

// Report draws the whole report down the canvas, at the canvas's width:
// header, engine, readings with their fit residuals, the event table today
// and after the plan, the balance card, the valve curve of every reverser
// position, the plan card and its notes, and the cautions. Make the canvas
// ReportHeight tall.
func Report(c Canvas, m ReportModel, th Theme) {
	w, ch := c.Size()
	if !(w > 2*reportPad+100) || math.IsInf(w, 0) {
		return
	}
	// The ground covers the canvas to its last (perhaps partly used) row.
	c.Fill(RectPath(Rect{Max: Point{w, math.Max(ch, ReportHeight(w, m))}}), FillStyle{Color: th.Background})
	report(c, m, th, w)
}

// nopCanvas draws nothing: ReportHeight runs the report through it to
// learn its height, so layout and drawing never disagree.
type nopCanvas struct{ w, h float64 }

func (n nopCanvas) Size() (float64, float64)    { return n.w, n.h }
func (nopCanvas) Fill(Path, FillStyle)          {}
func (nopCanvas) Stroke(Path, LineStyle)        {}
func (nopCanvas) Text(Point, string, TextStyle) {}

// page is where the report is drawn: the canvas, the column's edges and
// how far down it has come.
type page struct {
	c       Canvas
	th      Theme
	x0, x1  float64
	y       float64
	ink     TextStyle
	muted   TextStyle
	heading TextStyle
}

// para draws a paragraph in style s and moves down past it.
func (p *page) para(text string, s TextStyle) {
	lines := Wrap(text, p.x1-p.x0, textSize(s), s.Bold)
	drawLines(p.c, Point{p.x0, p.y}, lines, s)
	p.y += float64(len(lines)) * lineStep(textSize(s))
}

// section starts a section under a heading.
func (p *page) section(title string) {
	p.y += gap
	p.para(title, p.heading)
	p.y += 2
}

// card draws a card of height h across the column.
func (p *page) card(h float64, draw func(box Rect)) {
	box := Rect{Point{p.x0, p.y}, Point{p.x1, p.y + h}}
	draw(box)
	p.y = box.Max.Y + gap
}

// report draws the report and returns the height used.
func report(c Canvas, rm ReportModel, th Theme, w float64) float64 {
	m := rm.Model
	pg := &page{c: c, th: th, x0: reportPad, x1: w - reportPad, y: reportPad,
		ink: TextStyle{Color: th.Ink, Size: BodySize}, muted: TextStyle{Color: th.Muted, Size: BodySize},
		heading: TextStyle{Color: th.Ink, Size: TitleSize, Bold: true}}
	x0, x1 := pg.x0, pg.x1
	ink, muted := pg.ink, pg.muted
	para := pg.para
	// Header.
	para("Valve setting report", TextStyle{Color: th.Ink, Size: TitleSize + 6, Bold: true})
	if m == nil {
		para("There is nothing to report: no engine was given.", muted)
		return pg.y + reportPad
	}
	head := m.Title
	if s := rm.Session; s != nil {
		if s.Name != "" && !strings.HasPrefix(head, s.Name) {
			head += ". " + s.Name
		}
		for _, cy := range s.Cylinders {
			if len(cy.Rounds) > 0 && strings.HasPrefix(m.Title, m.Spec.Name+", "+cy.Name) {
				head += fmt.Sprintf(". Round %d, %s", len(cy.Rounds), cy.Rounds[len(cy.Rounds)-1].Date)
			}
		}
		if s.Invented {
			head += ". Invented demonstration data."
		}
	} else if m.Spec.Invented {
		head += ". Invented demonstration engine."
	}
	para(head, muted)
	pg.y += gap

	pg.section("Engine")
	para(engineFigures(m), ink)
	cylinderReport(pg, m, "")
	for _, o := range rm.Others {
		cylinderReport(pg, o, cylinderName(o))
	}
	if len(rm.Beat) > 0 {
		wholeEngineReport(pg, rm)
	}

	pg.section("Before you turn the wheels")
	for _, s := range setting.Cautions() {
		lines := Wrap(s, x1-x0-bulletIndent, BodySize, false)
		c.Fill(RectPath(Rect{Point{x0 + 3, pg.y + 6}, Point{x0 + 10, pg.y + 13}}), FillStyle{Color: th.Warn})
		drawLines(c, Point{x0 + bulletIndent, pg.y}, lines, ink)
		pg.y += float64(len(lines))*lineStep(BodySize) + paraGap
	}
	pg.y += gap
	para("Drawn by Evenbeat from the readings above. Check every change against the engine before you make it; full-size engines are set under the railway's own procedures.", muted)
	return pg.y + reportPad
}

// cylinderName is the cylinder a model's title names ("left cylinder"),
// from "engine, left cylinder".
func cylinderName(m *Model) string {
	if i := strings.LastIndex(m.Title, ", "); i >= 0 {
		return Capital(m.Title[i+2:])
	}
	return m.Title
}

// cylinderReport draws one cylinder's part of the report under the
// heading title ("" for the cylinder the report is about, whose sections
// stand on their own): its readings, events, balance, valve curves and
// plan.
func cylinderReport(pg *page, m *Model, title string) {
	c, th := pg.c, pg.th
	x0, x1 := pg.x0, pg.x1
	ink, muted := pg.ink, pg.muted
	sub := func(s string) string {
		if title == "" {
			return s
		}
		return title + ": " + strings.ToLower(s[:1]) + s[1:]
	}
	if title != "" {
		pg.y += gap
		pg.para(title, TextStyle{Color: th.Ink, Size: TitleSize + 3, Bold: true})
	}
	if len(m.Readings) > 0 {
		pg.section(sub("Readings of the latest round"))
		rows := [][]string{{"reading", "crank", "valve", "off the fit"}}
		shown := listedReadings(m.Readings)
		for i, r := range m.Readings {
			if !shown[i] {
				continue
			}
			off := m.length(r.ResidualMM)
			if !r.Used {
				off += " (left out)"
			}
			rows = append(rows, []string{r.Label, fmt.Sprintf("%.1f°", r.CrankDeg), m.length(r.ValveMM), off})
		}
		pg.y = table(c, Point{x0, pg.y}, x1-x0, []float64{0.5, 0.14, 0.16, 0.2}, rows, th)
		if n := len(m.Readings); n > len(rows)-1 {
			pg.para(fmt.Sprintf("Of the %d readings, the %d farthest off the fit are listed.", n, len(rows)-1), muted)
		}
		pg.para(fmt.Sprintf("Valve positions are the readings less the fitted gauge zero. The fit follows them to %s root-mean-square.", m.length(m.FitRMSMM)), muted)
		if m.Plan != nil {
			for _, r := range m.Plan.Recheck {
				pg.para("Recheck: "+r.Label+", "+m.length(r.ResidualMM)+" off the fit.", TextStyle{Color: th.Warn, Size: BodySize})
			}
		}
	}

	pg.section(sub("Events"))
	pg.y = table(c, Point{x0, pg.y}, x1-x0, nil, eventRows(m), th)
	pg.para("Leads in "+unitName(m)+" (negative: still closed at dead centre); cut-offs in % of the stroke from that end.", muted)

	pg.y += gap
	bl := LayoutBalance(Rect{Max: Point{x1 - x0, 1e6}}, m)
	pg.card(bl.NeedH, func(b Rect) { Balance(c, m, b, th) })
	var undrawn []string
	for i, p := range m.Positions {
		// Full forward, the first notches and full back: a report stays
		// a few pages long whatever the engine.
		if n := len(m.Positions); n > reportCurves && i >= reportCurves-1 && i < n-1 {
			undrawn = append(undrawn, p.Notch.Name)
			continue
		}
		h := LayoutValveCurve(Rect{Max: Point{x1 - x0, 1e6}}, m, i).NeedH + reportPlotH - minPlotH
		pg.card(h, func(b Rect) { ValveCurve(c, m, i, b, th) })
	}
	if len(undrawn) > 0 {
		pg.para("Valve curves not drawn (the events table gives their events): "+strings.Join(undrawn, ", ")+".", muted)
		pg.y += gap
	}
	if m.Plan != nil {
		// The steps alone: the events table and the notes follow.
		pl := layoutPlan(Rect{Max: Point{x1 - x0, 1e6}}, m, false)
		pg.card(pl.NeedH, func(b Rect) { drawPlan(c, m, b, th, false) })
		for _, n := range m.Plan.Notes {
			pg.para(n, ink)
			pg.y += 4
		}
	}
}

// wholeEngineReport draws the whole engine: the beat in the positions
// where it matters (the running notches, else full forward; and full
// back), the work of every end, and the quartering the marks show.
func wholeEngineReport(pg *page, rm ReportModel) {
	c, th := pg.c, pg.th
	pg.y += gap
	pg.para("The whole engine", TextStyle{Color: th.Ink, Size: TitleSize + 3, Bold: true})
	pg.para("Every cylinder's exhausts round one turn of the wheel, and the work each end does, from each cylinder's events today and after its plan.", pg.muted)
	pg.y += gap
	for _, pos := range beatPositions(rm.Beat) {
		h := LayoutBeat(Rect{Max: Point{pg.x1 - pg.x0, 1e6}}, pos, nil).NeedH
		pg.card(h, func(b Rect) { BeatCard(c, b, pos, nil, th) })
		if len(pos.WorkNow) > 0 && len(pos.WorkAfter) == len(pos.WorkNow) {
			rows := [][]string{{"end", "mean pressure", "share", "after", "share"}}
			for k, w := range pos.WorkNow {
				a := pos.WorkAfter[k]
				rows = append(rows, []string{w.Cylinder + " " + w.End.String(), fmt.Sprintf("%.2f bar", w.Bar), fmt.Sprintf("%.0f %%", w.Share), fmt.Sprintf("%.2f bar", a.Bar), fmt.Sprintf("%.0f %%", a.Share)})
			}
			pg.y = table(c, Point{pg.x0, pg.y}, pg.x1-pg.x0, []float64{0.3, 0.22, 0.13, 0.22, 0.13}, rows, th)
		}
		// Where the cylinders stay apart after the plans, what would
		// match them (the die's place in each link, a target lead).
		unit := session.UnitMM
		if rm.Model != nil {
			unit = rm.Model.Unit
		}
		for _, w := range beat.SideWords(pos, unit) {
			pg.para(w, TextStyle{Color: th.Warn, Size: BodySize})
		}
	}
	st := beat.DefaultSteam
	pg.para(fmt.Sprintf("Work from a simple indicator diagram: admission at %.1f bar less %.0f %%, expansion and compression with pV constant, %.0f %% clearance, exhaust at %.1f bar; each end's share is of the mean of all of them.",
		st.BoilerBar, 100*st.DropShare, 100*st.ClearanceShare, st.BackBar), pg.muted)
	if rm.Session != nil {
		if qs, err := beat.Quarterings(rm.Session); err == nil {
			for _, q := range qs {
				s := fmt.Sprintf("Quartering: the marks put the %s crank %s° from the %s crank (drawing %s°), %s° +/- %s° off.",
					q.Other, deg(q.Measured), q.First, deg(q.Design), deg(q.Error), deg(q.Uncertainty()))
				style := pg.ink
				if q.Told {
					s += " That is more than the marks can tell: the cranks are not truly quartered. No valve adjustment cures it; it is work on the wheels for a fitter, with the wheels off the engine and the usual precautions."
					style = TextStyle{Color: th.Warn, Size: BodySize}
				} else {
					s += " Within what the marks can tell (this needs both wheels' datums at the same angle)."
				}
				pg.para(s, style)
			}
		}
	}
}

// beatPositions picks the beat cards a report draws: the running notches
// (or full forward when there are none) and full back.
func beatPositions(ps []beat.Position) []beat.Position {
	var out []beat.Position
	for _, p := range ps {
		if p.Name != session.FullForward && p.Name != session.FullBack {
			out = append(out, p)
		}
	}
	if len(out) == 0 {
		for _, p := range ps {
			if p.Name == session.FullForward {
				out = append(out, p)
			}
		}
	}
	for _, p := range ps {
		if p.Name == session.FullBack {
			out = append(out, p)
		}
	}
	if len(out) > 3 {
		out = append(out[:2], out[len(out)-1])
	}
	return out
}

// Bounds that keep the report a few pages long whatever the session.
const (
	reportReadings = 40 // rows of the readings table
	reportCurves   = 6  // valve curves drawn
)

// listedReadings chooses the readings the report lists: all of them, or
// when there are more than reportReadings, those farthest off the fit.
func listedReadings(rs []Reading) []bool {
	shown := make([]bool, len(rs))
	order := make([]int, len(rs))
	for i := range rs {
		order[i] = i
	}
	sort.Slice(order, func(a, b int) bool {
		return math.Abs(rs[order[a]].ResidualMM) > math.Abs(rs[order[b]].ResidualMM)
	})
	for _, i := range order[:min(len(rs), reportReadings)] {
		shown[i] = true
	}
	return shown
}

// engineFigures describes the engine in one paragraph.
func engineFigures(m *Model) string {
	e, v := m.Spec.Engine, m.Valve
	port := func(p setting.End) string {
		if p.Holes > 0 {
			return fmt.Sprintf("a ring of %d holes of %s", p.Holes, m.length(p.HoleDiameter))
		}
		return "a slot " + m.length(p.PortWidth) + " wide"
	}
	kind := m.Spec.Gear.Kind
	if m.gear != nil {
		kind = m.gear.Kind()
	}
	return fmt.Sprintf("Crank radius %s, connecting rod %s, stroke %s; back dead centre at %s°. %s admission; steam lap front %s, back %s; exhaust lap front %s, back %s; front port %s, back port %s. Gear: %s.",
		m.length(e.CrankRadius), m.length(e.RodLength), m.length(m.Crank.Stroke()), deg(m.Crank.BackDeadCentre()),
		Capital(v.Admission.String()), m.length(v.Front.SteamLap), m.length(v.Back.SteamLap),
		m.length(v.Front.ExhaustLap), m.length(v.Back.ExhaustLap), port(v.Front), port(v.Back), kind)
}

// Capital returns s with its first letter a capital: a small ASCII
// letter raised, anything else left as it is (the app's words start with
// ASCII; strings.ToUpper would bring Unicode's case tables).
func Capital(s string) string {
	if s == "" || s[0] < 'a' || s[0] > 'z' {
		return s
	}
	return string(s[0]-'a'+'A') + s[1:]
}

// eventRows returns the event table: a header and two rows per position.
func eventRows(m *Model) [][]string {
	after := len(m.Positions) > 0 && m.Positions[0].HasAfter
	head := []string{"position", "end", "lead", "cut-off", "release", "compr."}
	if after {
		head = []string{"position", "end", "lead", "after", "cut-off", "after"}
	}
	rows := [][]string{head}
	for _, p := range m.Positions {
		for k, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
			name := ""
			if k == 0 {
				name = p.Notch.Name
			}
			n := p.NowEvents.End(end)
			row := []string{name, end.String(), m.length(n.Lead)}
			if after {
				a := p.AfterEvents.End(end)
				row = append(row, m.length(a.Lead), pct(n.CutOff.StrokePercent)+" %", pct(a.CutOff.StrokePercent)+" %")
			} else {
				row = append(row, pct(n.CutOff.StrokePercent)+" %", pct(n.Release.StrokePercent)+" %", pct(n.Compression.StrokePercent)+" %")
			}
			rows = append(rows, row)
		}
	}
	return rows
}

// table draws rows of cells from at across width, the first row as a bold
// header, each column a share of the width (nil: the first column a
// quarter, the rest equal), text left in the first column and right in
// the others; a cell too wide for its column is wrapped. It returns the y
// under the table.
func table(c Canvas, at Point, width float64, shares []float64, rows [][]string, th Theme) float64 {
	if len(rows) == 0 {
		return at.Y
	}
	n := len(rows[0])
	if len(shares) != n {
		shares = make([]float64, n)
		for i := range shares {
			shares[i] = 0.75 / float64(n-1)
		}
		shares[0] = 0.25
	}
	y := at.Y
	for r, row := range rows {
		s := TextStyle{Color: th.Ink, Size: BodySize, Bold: r == 0, VAlign: Top}
		x := at.X
		lines := 1
		for i, cell := range row {
			cw := shares[i] * width
			if i >= len(shares) {
				break
			}
			ls := Wrap(cell, cw-gap, BodySize, s.Bold)
			lines = max(lines, len(ls))
			cs := s
			ax := x
			if i > 0 {
				cs.HAlign = Right
				ax = x + cw
			}
			drawLines(c, Point{ax, y}, ls, cs)
			x += cw
		}
		y += float64(lines) * lineStep(BodySize)
		if r == 0 {
			var p Path
			p.MoveTo(Point{at.X, y + 1})
			p.LineTo(Point{at.X + width, y + 1})
			c.Stroke(p, th.GridLine())
			y += 3
		}
	}
	return y + gap
}
