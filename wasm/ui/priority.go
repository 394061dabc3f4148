package ui

import (
	"math"
	"strconv"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// keypadScreen reports whether the screen shown types a number on the
// keypad.
func (a *App) keypadScreen() bool {
	return a.screen == Measure || a.screen == Sizes || a.screen == Lead
}

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
	if t := a.targetLead(); t != nil {
		lead = "Target lead: " + session.FormatLength(*t, a.unit())
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
	if a.priority() == plan.Balanced {
		a.shareRow(l)
	}
	if p := a.priority(); (p == plan.EqualCutOffs || p == plan.Balanced) && len(a.runningNotches()) > 1 {
		l.button("Cut-offs equal in: "+a.runningNotch()+" (change)", false, a.nextRunningNotch)
	}
	l.button(lead, false, a.enterLead)
}

// leadShares are the shares of a balanced plan given to leads that the
// plan screen offers (the rest goes to cut-offs); a file may hold any
// other share above 0, which is then shown beside them.
func leadShares() [3]float64 { return [3]float64{0.25, 0.5, 0.75} }

// shareRow offers the share of a balanced plan given to leads.
func (a *App) shareRow(l *layouter) {
	l.muted("How much of the balance goes to equal leads; the rest goes to equal cut-offs.")
	cur := a.leadShare()
	var labels []string
	var on []bool
	var acts []func()
	known := false
	for _, x := range leadShares() {
		labels = append(labels, "Leads "+percent(x))
		on = append(on, x == cur)
		acts = append(acts, func() { a.setLeadShare(x) })
		known = known || x == cur
	}
	if !known { // from a file: shown, chosen, kept
		labels = append([]string{"Leads " + percent(cur)}, labels...)
		on = append([]bool{true}, on...)
		acts = append([]func(){func() {}}, acts...)
	}
	l.row(labels, on, acts)
}

// percent words a share (0 to 1) as a whole percentage.
func percent(x float64) string { return strconv.Itoa(int(math.Round(100*x))) + " %" }

// leadShare is the share of a balanced plan given to leads: the session's,
// one half when it names none.
func (a *App) leadShare() float64 {
	if m := a.aims(); m != nil && m.LeadShare > 0 {
		return m.LeadShare
	}
	return 0.5
}

// setLeadShare keeps share x (0 to 1) in the session's aims, saves the
// session and plans again.
func (a *App) setLeadShare(x float64) {
	m := a.aims()
	if m == nil || x == a.leadShare() || !(x > 0 && x <= 1) {
		return
	}
	m.LeadShare = x
	a.save()
	a.makePlan()
}

// runningNotches are the notches a plan may make the cut-offs equal in
// (session.Session.RunningNotches: those the session file allows).
func (a *App) runningNotches() []string {
	if s := a.Session(); s != nil {
		return s.RunningNotches()
	}
	return nil
}

// runningNotch is the notch whose cut-offs the plan makes equal: the
// session's, else the engine's first notch, else full forward (as plan
// chooses).
func (a *App) runningNotch() string {
	if m := a.aims(); m != nil && m.RunningNotch != "" {
		return m.RunningNotch
	}
	if s := a.Session(); s != nil && len(s.Engine.Notches) > 0 {
		return s.Engine.Notches[0].Name
	}
	return session.FullForward
}

// nextRunningNotch makes the cut-offs equal in the next notch of
// runningNotches (round to the first after the last), saves the session
// and plans again.
func (a *App) nextRunningNotch() {
	m, ns := a.aims(), a.runningNotches()
	if m == nil || len(ns) < 2 {
		return
	}
	next := ns[0]
	for i, n := range ns {
		if n == a.runningNotch() {
			next = ns[(i+1)%len(ns)]
		}
	}
	m.RunningNotch = next
	a.save()
	a.makePlan()
}

// aims returns the plan aims of the session open, nil when none is.
func (a *App) aims() *session.PlanAims {
	if s := a.Session(); s != nil {
		return &s.Aims
	}
	return nil
}

// priority is the plan's priority as the session's aims say: equal leads
// unless chosen.
func (a *App) priority() plan.Priority {
	if m := a.aims(); m != nil && m.Priority != "" {
		return plan.Priority(m.Priority)
	}
	return plan.EqualLeads
}

// targetLead is the session's target lead (mm), nil for none.
func (a *App) targetLead() *float64 {
	if m := a.aims(); m != nil {
		return m.TargetLeadMM
	}
	return nil
}

// setPriority keeps priority p in the session's aims, saves the session
// and plans again.
func (a *App) setPriority(p plan.Priority) {
	m := a.aims()
	if m == nil || p == a.priority() {
		return
	}
	m.Priority = session.Priority(p)
	if p != plan.Balanced {
		m.LeadShare = 0 // a share of the balance belongs to a balanced plan only
	}
	a.save()
	a.makePlan()
}

// setTargetLead keeps target lead t (mm, nil for none) in the session's
// aims and saves the session. A lead beyond what the file may hold is a
// typing slip: it is not kept.
func (a *App) setTargetLead(t *float64) {
	m := a.aims()
	same := t == nil && m != nil && m.TargetLeadMM == nil
	if m == nil || same || (t != nil && (*t < session.MinTargetLeadMM || *t > session.MaxTargetLeadMM)) {
		return
	}
	m.TargetLeadMM = t
	a.save()
}

// enterLead opens the keypad for the target lead.
func (a *App) enterLead() {
	a.leadFields, a.leadFi = a.fields, a.fi
	a.fields = []field{{Key: "target_lead_mm", Step: "Target lead", Label: "Target lead",
		Say: "The lead wanted at both ends in full gear. Only turning an eccentric changes the lead, so the plan meets it only where the engine allows that. It is saved with this engine's readings.",
		Lo:  -0.5, Hi: 8, // a lead (mm), 5 in gauge to full size: common practice, no source (from memory)
		get: func(*session.Session) (float64, bool) {
			if t := a.targetLead(); t != nil {
				return *t, true
			}
			return 0, false
		},
		set: func(_ *session.Session, v float64) { a.setTargetLead(&v) }}}
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
	a.setTargetLead(nil)
	a.Back()
	a.makePlan()
}
