package ui

import (
	"fmt"
	"strconv"
	"strings"

	"evenbeat/render"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// moreReadings labels the plan's button to the round's optional steps.
const moreReadings = "More readings"

// moreReadings opens the latest round at its first reading not yet taken
// (a sweep, a cut-off...), or its list when every one is in.
func (a *App) moreReadings() {
	a.latestRound()
	for _, f := range a.fields {
		if _, ok := f.get(a.Session()); !ok {
			a.navigate(Measure)
			return
		}
	}
	a.navigate(Readings)
}

// planFindings are what the plan's fit says of the engine as described:
// where the readings differ from the drawing by more than a build would
// leave or the readings explain (plan.Fit.Findings), worked out once per
// fit.
func (a *App) planFindings() []string {
	if a.fit == nil {
		return nil
	}
	if a.findingsOf != a.fit || a.findingsUnit != a.unit() {
		a.findingsOf, a.findingsUnit = a.fit, a.unit()
		a.findings = a.fit.Findings(a.unit())
	}
	return a.findings
}

// findingRows says on the plan screen, above the plan, when the readings
// do not fit the engine described, with the likely cause: the first
// finding in full, how many more there are in the plan's words. The plan
// is given all the same, made from the readings.
func (a *App) findingRows(l *layouter) {
	fs := a.planFindings()
	if len(fs) == 0 {
		return
	}
	say := "The readings do not fit the engine as described. " + fs[0]
	if len(fs) > 1 {
		say += fmt.Sprintf(" (%d more in the plan's words.)", len(fs)-1)
	}
	l.para(strings.TrimSpace(say), render.BodySize, false, true, false)
}

// findingsCache is what planFindings keeps between frames.
type findingsCache struct {
	findingsOf   *plan.Fit
	findingsUnit session.Unit
	findings     []string
}

// plannedRound is the index of the round of the cylinder shown that the
// plan made last is of (the round its fit's readings are of), or -1
// without one.
func (a *App) plannedRound() int {
	s := a.Session()
	if a.plan == nil || a.fit == nil || s == nil || a.plan.Cylinder != s.Cylinders[a.cyl].Name {
		return -1
	}
	prefix := fmt.Sprintf("cylinders[%d].rounds[", a.cyl)
	for _, o := range a.fit.Observations() {
		if rest, ok := strings.CutPrefix(o.Field, prefix); ok {
			if n, err := strconv.Atoi(rest[:max(0, strings.Index(rest, "]"))]); err == nil {
				return n
			}
		}
	}
	return -1
}

// plannedLeads are the full-forward leads (front, back; mm) of the plan
// made last as the plan has them today (plan.Plan.Now: the readings' own,
// which the plan works from), so that the history says of that round what
// the plan, the curve and the balance say.
func (a *App) plannedLeads() [2]*float64 {
	for _, st := range a.plan.Now {
		if st.Notch == session.FullForward {
			return [2]*float64{&st.Front.LeadMM, &st.Back.LeadMM}
		}
	}
	return [2]*float64{}
}

// leadPair words a front and a back lead: "front 0.25 mm, back 0.20
// mm", each as session.FormatLength shows it.
func (a *App) leadPair(front, back float64) string {
	return "front " + session.FormatLength(front, a.unit()) + ", back " + session.FormatLength(back, a.unit())
}

// endIndex is 0 for the front end, 1 for the back.
func endIndex(e session.End) int {
	if e == session.Back {
		return 1
	}
	return 0
}
