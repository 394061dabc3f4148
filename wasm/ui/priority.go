package ui

import (
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// keypadScreen reports whether the screen shown types a number on the
// keypad.
func (a *App) keypadScreen() bool {
	return a.screen == Measure || a.screen == Sizes || a.screen == Lead
}

// priorityNote says where the plan's aims are kept.
const priorityNote = "Kept while the app is open: the session file has no place for the priority or the target lead."

// priorityRows lays out the steps tab's controls: while a what-if is
// active, that the steps are its amounts and a way back to the plan; else
// the plan's priority and the target lead.
func (a *App) priorityRows(l *layouter) {
	if a.what.model != nil {
		l.muted("The steps are the what-if's amounts, not the plan's.")
		l.button("Back to plan", false, func() { a.resetWhatIf(); a.dirty = true })
		return
	}
	lead := "Target lead: none"
	if a.targetLead != nil {
		lead = "Target lead: " + session.FormatLength(*a.targetLead, a.unit())
	}
	prios := [3]plan.Priority{plan.EqualLeads, plan.EqualCutOffs, plan.Balanced}
	labels := []string{"Equal leads", "Equal cut-offs", "Balanced"}
	on := make([]bool, len(labels))
	acts := make([]func(), len(labels))
	for i, p := range prios {
		on[i] = a.priority() == p
		acts[i] = func() { a.setPriority(p) }
	}
	l.row(labels, on, acts)
	l.button(lead, false, a.enterLead)
	l.muted(priorityNote)
}

// priority is the plan's priority: equal leads unless chosen.
func (a *App) priority() plan.Priority {
	if a.prio == "" {
		return plan.EqualLeads
	}
	return a.prio
}

// setPriority plans again for priority p.
func (a *App) setPriority(p plan.Priority) {
	if p == a.priority() {
		return
	}
	a.prio = p
	a.makePlan()
}

// enterLead opens the keypad for the target lead.
func (a *App) enterLead() {
	a.leadFields, a.leadFi = a.fields, a.fi
	a.fields = []field{{Key: "target_lead_mm", Step: "Target lead", Label: "Target lead",
		Say: "The lead wanted at both ends in full gear. Only turning an eccentric changes the lead, so the plan meets it only where the engine allows that. " + priorityNote,
		Lo:  -0.5, Hi: 8, // a lead (mm), 5 in gauge to full size: common practice, no source (from memory)
		get: func(*session.Session) (float64, bool) {
			if a.targetLead == nil {
				return 0, false
			}
			return *a.targetLead, true
		},
		set: func(_ *session.Session, v float64) { a.targetLead = &v }}}
	a.setField(0)
	a.navigate(Lead)
}

// leaveLead gives the keypad back its fields.
func (a *App) leaveLead() {
	if a.leadFields == nil {
		return
	}
	a.fields, a.fi, a.leadFields = a.leadFields, a.leadFi, nil
}

// clearTargetLead plans again without a target lead.
func (a *App) clearTargetLead() {
	a.targetLead = nil
	a.Back()
	a.makePlan()
}
