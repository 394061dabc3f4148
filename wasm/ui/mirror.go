package ui

import (
	"fmt"
	"sort"
	"strings"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Mirror returns what the screen shown says, as plain lines for the
// page's hidden live region, which screen readers announce: the title and
// every paragraph (errors and warnings marked), the value the keypad is
// entering and what was typed, the drawing's words (the cautions; the
// plan's steps, leads and cut-offs now and after per position, notes and
// next reading; the rounds' history; where the engine stands), and the
// buttons and keys, in the order the screen shows them from the top.
// The saving state is left out: it changes too often to be read out.
func (a *App) Mirror() string {
	v := a.layout()
	var items []mirrorItem
	add := func(y float64, kind mirrorKind, s string) {
		if s = strings.TrimSpace(s); s != "" {
			items = append(items, mirrorItem{y, kind, s})
		}
	}
	if v.title == "" {
		add(-1, mirrorLine, a.untitled())
	}
	for _, p := range v.paras {
		t := strings.Join(p.lines, " ")
		if p.warn {
			t = "Warning: " + t
		}
		add(p.at.Y, mirrorLine, t)
	}
	if v.entry.W() > 0 && len(a.fields) > 0 {
		add(v.entry.Min.Y, mirrorLine, a.entryWords())
	}
	a.mirrorBody(func(s string) { add(v.body.Min.Y, mirrorLine, s) })
	keys := map[render.Rect]bool{}
	for _, k := range v.keypad {
		keys[k.Rect] = true
	}
	for _, t := range v.targets {
		switch {
		case t.act == nil || t.bar:
		case keys[t.Rect]:
			add(t.Rect.Min.Y, mirrorKey, t.Label)
		case t.On:
			add(t.Rect.Min.Y, mirrorButton, t.Label+" (chosen)")
		default:
			add(t.Rect.Min.Y, mirrorButton, t.Label)
		}
	}
	sort.SliceStable(items, func(i, j int) bool { return items[i].y < items[j].y })
	return mirrorText(items)
}

// untitled is the title the mirror gives a screen drawn without one.
func (a *App) untitled() string {
	switch s := a.Session(); {
	case s == nil:
		return ""
	case a.screen == Plan && len(s.Cylinders) > 1:
		return fmt.Sprintf("%s, %s cylinder: the plan", s.Name, s.Cylinders[a.cyl].Name)
	case a.screen == Plan:
		return s.Name + ": the plan"
	case a.screen == Where:
		return s.Name + ": where the engine stands"
	}
	return ""
}

// mirrorKind is what a line of the mirror is: words, a button, a key.
type mirrorKind uint8

const (
	mirrorLine mirrorKind = iota
	mirrorButton
	mirrorKey
)

// mirrorItem is one thing the screen shows, at its height y.
type mirrorItem struct {
	y    float64
	kind mirrorKind
	text string
}

// mirrorText writes the items a line each, buttons and keys next to each
// other in one line ("Buttons: mm (chosen); inch.", "Keys: 7 8 9 Del").
func mirrorText(items []mirrorItem) string {
	var b strings.Builder
	for i := 0; i < len(items); {
		it := items[i]
		j := i + 1
		for j < len(items) && it.kind != mirrorLine && items[j].kind == it.kind {
			j++
		}
		var group []string
		for _, g := range items[i:j] {
			group = append(group, g.text)
		}
		switch it.kind {
		case mirrorButton:
			b.WriteString("Buttons: " + strings.Join(group, "; ") + ".")
		case mirrorKey:
			b.WriteString("Keys: " + strings.Join(group, " ") + ".")
		default:
			b.WriteString(it.text)
		}
		b.WriteByte('\n')
		i = j
	}
	return b.String()
}

// mirrorBody says the screen's drawing in words, a line at a time.
func (a *App) mirrorBody(line func(string)) {
	switch a.screen {
	case Cautions:
		line(render.CautionsTitle + ":")
		for _, c := range setting.Cautions() {
			line("- " + c)
		}
	case Plan:
		a.mirrorPlan(line)
	case History:
		a.mirrorHistory(line)
	case Whole:
		a.mirrorBeat(line)
	case Where:
		if a.engine != nil {
			line(fmt.Sprintf("The drawing: crank at %.0f deg, %s.", a.crankDeg, a.engine.PositionNames()[a.wherePosition()]))
		}
	}
}

// entryWords says the keypad's value and what is typed or kept: "Front
// port mark: 4.53 mm typed".
func (a *App) entryWords() string {
	f := a.fields[a.fi]
	if a.typed && a.text != "" {
		return fmt.Sprintf("%s: %s %s typed, not yet taken (Next takes it).", f.Label, a.text, a.fieldUnit(f))
	}
	if v, ok := f.get(a.Session()); ok {
		return fmt.Sprintf("%s: %s %s.", f.Label, a.showValue(f, v), a.fieldUnit(f))
	}
	return f.Label + ": nothing typed yet."
}

// mirrorPlan says the plan shown: its steps (the what-if's while one is
// dragged), a line per position and end with the lead and cut-off now and
// after as the plan card's table gives them, the notes and the next
// reading.
func (a *App) mirrorPlan(line func(string)) {
	m := a.shownModel()
	if m == nil || m.Plan == nil {
		return
	}
	p := m.Plan
	line(render.PlanTitle(p) + ".")
	for k, s := range p.Steps {
		line(fmt.Sprintf("%d. %s", k+1, s.Words))
	}
	unit := a.unitLabel()
	line("Leads and cut-offs, now and after:")
	if m.WhatIf != "" {
		line("After includes the what-if: " + m.WhatIf + ".")
	}
	for _, pos := range render.PlanTable(m) {
		for k, e := range pos.Ends {
			end := "front"
			if k == 1 {
				end = "back"
			}
			line(fmt.Sprintf("%s, %s end: lead %s %s +/- %s now, %s %s after; cut-off %s now, %s after.",
				pos.Name, end, e.Lead.Now, unit, e.Lead.Sigma, e.Lead.After, unit, percentWords(e.CutOff.Now)+" +/- "+e.CutOff.Sigma, percentWords(e.CutOff.After)))
		}
	}
	line("Notes:")
	for _, n := range p.Notes {
		if n != p.NextReading {
			line("- " + n)
		}
	}
	if p.NextReading != "" {
		line("Next reading: " + p.NextReading)
	}
}

// mirrorHistory says each round: its date, the changes made before it and
// its leads and cut-offs per position.
func (a *App) mirrorHistory(line func(string)) {
	s := a.Session()
	if s == nil {
		return
	}
	h := a.history()
	for ri, r := range h.Rounds {
		line(fmt.Sprintf("Round %d, %s.", ri+1, s.Cylinders[a.cyl].Rounds[ri].Date))
		if len(r.Before) > 0 {
			line("Before it: " + strings.Join(r.Before, "; ") + ".")
		}
		line(r.Note)
		for _, p := range r.Now {
			line(fmt.Sprintf("%s: lead front %s, back %s; cut-off front %s, back %s.", p.Notch,
				session.FormatLength(p.Front.LeadMM, a.unit()), session.FormatLength(p.Back.LeadMM, a.unit()),
				percentWords(render.CutOffState(p.Front)), percentWords(render.CutOffState(p.Back))))
		}
	}
}

// percentWords gives a cut-off of the plan card's table its "%", unless it
// is words ("never opens").
func percentWords(v string) string {
	if strings.HasPrefix(v, "never") {
		return v
	}
	return v + " %"
}

// mirrorBeat says the beat card of the whole engine's position shown: its
// evenness and the gaps between the exhausts in degrees of crank, today,
// after the plans and as heard.
func (a *App) mirrorBeat(line func(string)) {
	pos, ok := a.wholeBeat().chosen()
	if !ok {
		return
	}
	heard := a.heardGaps(pos)
	line("The beat, " + pos.Name + ": " + render.BeatFigures(pos, heard))
	gaps := func(when string, g []float64) {
		if len(g) == 0 {
			return
		}
		t := make([]string, len(g))
		for i, x := range g {
			t[i] = fixed(x, 1)
		}
		line("Gaps between the exhausts " + when + ": " + strings.Join(t, ", ") + " deg.")
	}
	gaps("today", pos.Now.Gaps)
	gaps("after the plans", pos.After.Gaps)
	gaps("heard", heard)
}
