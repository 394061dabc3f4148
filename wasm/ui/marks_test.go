package ui

import (
	"strings"
	"testing"

	"evenbeat/setting/session"
)

// TestKeepPortMarks: after a round whose changes left the valve where it
// sits on its spindle, the next round offers the earlier marks with one
// tap, says why they hold, and goes on to the dead-centre readings; after
// a spindle change it says why the marks must be taken again. The rule is
// the session file's (setting/session/format.md, rounds[]): moving the valve
// on its spindle moves the marks as the gauge sees them (common practice,
// no source).
func TestKeepPortMarks(t *testing.T) {
	a := planApp(t)
	a.Session().DisplayUnit = session.UnitMM
	c := &a.Session().Cylinders[0]
	c.Rounds = append(c.Rounds, session.Round{Date: "2026-11-22", AdjustmentsBefore: []session.Change{
		{Kind: session.EccentricAngle, Eccentric: session.ForwardEccentric, Amount: 1}}})
	a.showRound(1)
	tap(t, a, "Front port mark")
	text, _ := drawText(a)
	if !strings.Contains(text, "The marks of round 1 still hold") {
		t.Fatalf("no word on the kept marks:\n%s", text)
	}
	for _, sz := range [][2]float64{{360, 740}, {390, 844}} {
		a.Resize(sz[0], sz[1])
		checkFits(t, a, sz, "keep the marks")
	}
	tap(t, a, "Keep the marks from round 1")
	if a.Screen() != Readings || c.Rounds[1].PortMarks != nil {
		t.Fatalf("after keeping: screen %s, marks %+v", a.Screen(), c.Rounds[1].PortMarks)
	}
	a.navigate(Measure)
	a.setField(0)
	a.editing = false
	tap(t, a, "Keep the marks from round 1")
	if a.Screen() != Measure || a.fields[a.fi].Step == portMarksStep {
		t.Fatalf("keeping while measuring went to %s, %q", a.Screen(), a.Field())
	}
	if ps := a.Session().Readiness(0); hasMarksProblem(ps) {
		t.Fatalf("the file does not take the kept marks: %+v", ps)
	}

	c.Rounds[1].AdjustmentsBefore = append(c.Rounds[1].AdjustmentsBefore, session.Change{Kind: session.ValveOnSpindle, Amount: -0.117})
	a.showRound(1)
	tap(t, a, "Front port mark")
	text, _ = drawText(a)
	say, keep := a.marksAdvice()
	if !strings.Contains(text, "Take the port marks again") || keep != "" ||
		!strings.HasPrefix(say, "Take the port marks again: the valve was moved on its spindle before round 2") {
		t.Fatalf("after a spindle change: %q, %q\n%s", say, keep, text)
	}
}

// hasMarksProblem reports a readiness problem about port marks that stops
// a plan.
func hasMarksProblem(ps []session.Problem) bool {
	for _, p := range ps {
		if p.Blocking && strings.Contains(strings.ToLower(p.Message), "port mark") {
			return true
		}
	}
	return false
}
