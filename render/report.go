package render

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// ReportModel is what the printed report shows: the diagram model of one
// cylinder (with its plan) and, when there is one, the session it came
// from for the header.
type ReportModel struct {
	Model   *Model
	Session *session.Session // may be nil
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

// report draws the report and returns the height used.
func report(c Canvas, rm ReportModel, th Theme, w float64) float64 {
	m := rm.Model
	x0, x1 := float64(reportPad), w-reportPad
	y := float64(reportPad)
	ink := TextStyle{Color: th.Ink, Size: BodySize}
	muted := TextStyle{Color: th.Muted, Size: BodySize}
	para := func(text string, s TextStyle) {
		lines := Wrap(text, x1-x0, textSize(s), s.Bold)
		drawLines(c, Point{x0, y}, lines, s)
		y += float64(len(lines)) * lineStep(textSize(s))
	}
	// Header.
	para("Valve setting report", TextStyle{Color: th.Ink, Size: TitleSize + 6, Bold: true})
	if m == nil {
		para("There is nothing to report: no engine was given.", muted)
		return y + reportPad
	}
	head := m.Title
	if s := rm.Session; s != nil {
		if s.Name != "" {
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
	y += gap

	section := func(title string) {
		y += gap
		para(title, TextStyle{Color: th.Ink, Size: TitleSize, Bold: true})
		y += 2
	}
	section("Engine")
	para(engineFigures(m), ink)

	if len(m.Readings) > 0 {
		section("Readings of the latest round")
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
		y = table(c, Point{x0, y}, x1-x0, []float64{0.5, 0.14, 0.16, 0.2}, rows, th)
		if n := len(m.Readings); n > len(rows)-1 {
			para(fmt.Sprintf("Of the %d readings, the %d farthest off the fit are listed.", n, len(rows)-1), muted)
		}
		para(fmt.Sprintf("Valve positions are the readings less the fitted gauge zero. The fit follows them to %s root-mean-square.", m.length(m.FitRMSMM)), muted)
		if m.Plan != nil {
			for _, r := range m.Plan.Recheck {
				para("Recheck: "+r.Label+", "+m.length(r.ResidualMM)+" off the fit.", TextStyle{Color: th.Warn, Size: BodySize})
			}
		}
	}

	section("Events")
	y = table(c, Point{x0, y}, x1-x0, nil, eventRows(m), th)
	para("Leads in "+unitName(m)+" (negative: still closed at dead centre); cut-offs in % of the stroke from that end.", muted)

	y += gap
	card := func(h float64, draw func(box Rect)) {
		box := Rect{Point{x0, y}, Point{x1, y + h}}
		draw(box)
		y = box.Max.Y + gap
	}
	bl := LayoutBalance(Rect{Max: Point{x1 - x0, 1e6}}, m)
	card(bl.NeedH, func(b Rect) { Balance(c, m, b, th) })
	var undrawn []string
	for i, p := range m.Positions {
		// Full forward, the first notches and full back: a report stays
		// a few pages long whatever the engine.
		if n := len(m.Positions); n > reportCurves && i >= reportCurves-1 && i < n-1 {
			undrawn = append(undrawn, p.Notch.Name)
			continue
		}
		h := LayoutValveCurve(Rect{Max: Point{x1 - x0, 1e6}}, m, i).NeedH + reportPlotH - minPlotH
		card(h, func(b Rect) { ValveCurve(c, m, i, b, th) })
	}
	if len(undrawn) > 0 {
		para("Valve curves not drawn (the events table gives their events): "+strings.Join(undrawn, ", ")+".", muted)
		y += gap
	}
	if m.Plan != nil {
		pl := LayoutPlan(Rect{Max: Point{x1 - x0, 1e6}}, m)
		card(pl.NeedH, func(b Rect) { PlanCard(c, m, b, th) })
		for _, n := range m.Plan.Notes {
			para(n, ink)
			y += 4
		}
	}

	section("Before you turn the wheels")
	for _, s := range setting.Cautions() {
		lines := Wrap(s, x1-x0-bulletIndent, BodySize, false)
		c.Fill(RectPath(Rect{Point{x0 + 3, y + 6}, Point{x0 + 10, y + 13}}), FillStyle{Color: th.Warn})
		drawLines(c, Point{x0 + bulletIndent, y}, lines, ink)
		y += float64(len(lines))*lineStep(BodySize) + paraGap
	}
	y += gap
	para("Drawn by Evenbeat from the readings above. Check every change against the engine before you make it; full-size engines are set under the railway's own procedures.", muted)
	return y + reportPad
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
		capital(v.Admission.String()), m.length(v.Front.SteamLap), m.length(v.Back.SteamLap),
		m.length(v.Front.ExhaustLap), m.length(v.Back.ExhaustLap), port(v.Front), port(v.Back), kind)
}

func capital(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
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
