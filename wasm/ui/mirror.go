package ui

import (
	"fmt"
	"strings"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Mirror returns what the screen shown says, as plain lines for the
// page's hidden live region, which screen readers announce: the title and
// every paragraph (errors and warnings among them), the value the keypad
// is entering and what was typed, the cautions, the plan (its steps, the
// leads and cut-offs now and after per position, the notes and the next
// reading), the rounds' history, and the buttons that can be pressed.
// The saving state is left out: it changes too often to be read out.
func (a *App) Mirror() string {
	v := a.layout()
	var b strings.Builder
	line := func(s string) {
		if s = strings.TrimSpace(s); s != "" {
			b.WriteString(s)
			b.WriteByte('\n')
		}
	}
	for _, p := range v.paras {
		line(strings.Join(p.lines, " "))
	}
	if v.entry.W() > 0 && len(a.fields) > 0 {
		line(a.entryWords())
	}
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
	}
	var buttons []string
	for _, t := range v.targets {
		if t.act == nil || t.bar {
			continue
		}
		if t.On {
			buttons = append(buttons, t.Label+" (chosen)")
		} else {
			buttons = append(buttons, t.Label)
		}
	}
	if len(buttons) > 0 {
		line("Buttons: " + strings.Join(buttons, "; ") + ".")
	}
	return b.String()
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
			line(fmt.Sprintf("%s: lead front %s, back %s; cut-off front %s %%, back %s %%.", p.Notch,
				session.FormatLength(p.Front.LeadMM, a.unit()), session.FormatLength(p.Back.LeadMM, a.unit()),
				render.CutOffState(p.Front), render.CutOffState(p.Back)))
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
