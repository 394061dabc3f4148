package ui

import (
	"fmt"
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
