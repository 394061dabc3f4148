package ui

import (
	"fmt"
	"strconv"

	"evenbeat/setting/session"
)

// cylinderNames are the names given to an engine's cylinders, in the order
// set-up adds them: one cylinder is "right"; a two-cylinder engine has a
// right and a left; a three-cylinder one a middle as well.
func cylinderNames() [3]string { return [3]string{"right", "left", "middle"} }

// setCylinders makes the session's cylinders n (1 to 3). A cylinder that
// already holds readings is never dropped: the sentence says so and the
// count stays.
func (a *App) setCylinders(n int) {
	s := a.Session()
	a.dirty = true
	a.note = ""
	if n < 1 || n > len(cylinderNames()) {
		a.note = fmt.Sprintf("Cylinders: an engine here has 1 to %d cylinders, not %d.", len(cylinderNames()), n)
		return
	}
	for i := n; i < len(s.Cylinders); i++ {
		c := s.Cylinders[i]
		if len(c.Rounds) > 0 || len(c.DeadCentres) > 0 {
			a.note = fmt.Sprintf("Cylinders: the %s cylinder already has readings, so it is kept; export the session first if you mean to drop them.", c.Name)
			return
		}
	}
	if n < len(s.Cylinders) {
		s.Cylinders = s.Cylinders[:n]
	}
	used := map[string]bool{}
	for _, c := range s.Cylinders {
		used[c.Name] = true
	}
	names := cylinderNames()
	for _, name := range engineCylinderNames(s, names[:]) {
		if len(s.Cylinders) < n && !used[name] {
			s.Cylinders = append(s.Cylinders, session.Cylinder{Name: name})
		}
	}
	a.cyl = min(a.cyl, len(s.Cylinders)-1)
	a.save()
}

// cylinderCountRow is set-up's choice of how many cylinders.
func (a *App) cylinderCountRow(l *layouter) {
	s := a.Session()
	l.text("How many cylinders? Each is measured and set on its own.", false)
	labels := make([]string, len(cylinderNames()))
	on := make([]bool, len(labels))
	acts := make([]func(), len(labels))
	for i := range labels {
		n := i + 1
		labels[i] = strconv.Itoa(n)
		on[i] = len(s.Cylinders) == n
		acts[i] = func() { a.setCylinders(n) }
	}
	l.row(labels, on, acts)
	if a.note != "" && a.screen == Units {
		l.text(a.note, true)
	}
}

// cylinderRow is the row of buttons that switches between the cylinders,
// the one shown chosen; nothing for a one-cylinder engine. On the plan and
// the whole engine it ends with the whole engine, chosen on its screen.
func (a *App) cylinderRow(l *layouter) {
	s := a.Session()
	if s == nil || len(s.Cylinders) < 2 {
		return
	}
	labels := make([]string, len(s.Cylinders))
	on := make([]bool, len(labels))
	acts := make([]func(), len(labels))
	for i, c := range s.Cylinders {
		labels[i] = title(c.Name)
		on[i] = i == a.cyl && a.screen != Whole
		acts[i] = func() { a.switchCylinder(i) }
	}
	if a.screen == Plan || a.screen == Whole {
		labels, on, acts = append(labels, WholeLabel), append(on, a.screen == Whole), append(acts, a.showWhole)
	}
	l.row(labels, on, acts)
}

// switchCylinder shows cylinder ci on the screen shown: its latest round
// to measure or list, its plan, or its rounds.
func (a *App) switchCylinder(ci int) {
	if a.screen == Whole { // a cylinder chosen on the whole engine: its plan
		a.cyl = ci
		a.wholeToPlan()
		return
	}
	if ci == a.cyl {
		return
	}
	a.cyl, a.dirty = ci, true
	switch a.screen {
	case Measure, Readings:
		a.latestRound()
	case Plan:
		a.planRound = 0
		a.makePlan()
	}
}

// latestRound opens the current cylinder's latest round (a new one dated
// today when it has none, a draft stored with its first value) at its
// first reading not yet taken.
func (a *App) latestRound() {
	s := a.Session()
	c := &s.Cylinders[a.cyl]
	if len(c.Rounds) == 0 {
		c.Rounds = append(c.Rounds, session.Round{Date: a.today()})
		a.markDraft(s, a.cyl)
	}
	a.round = len(c.Rounds) - 1
	a.fields = a.roundFields(a.round)
	a.setField(0)
	for i, f := range a.fields {
		if _, ok := f.get(s); !ok {
			a.setField(i)
			return
		}
	}
}

// cylinderName is the shown cylinder's name with a capital.
func (a *App) cylinderName() string {
	return title(a.Session().Cylinders[a.cyl].Name)
}

// engineCylinderNames returns the names the engine gives its cylinders,
// which the session must use, or names when it gives none.
func engineCylinderNames(s *session.Session, names []string) []string {
	if len(s.Engine.Cylinders) == 0 {
		return names
	}
	out := make([]string, len(s.Engine.Cylinders))
	for i, c := range s.Engine.Cylinders {
		out[i] = c.Name
	}
	return out
}
