package ui

import (
	"strings"
	"testing"
)

// TestPlanWithoutSweeps: skipping the optional sweep and cut-offs still
// gives a plan from the dead-centre readings.
func TestPlanWithoutSweeps(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	ref := demoSession(t)
	setUpDemo(t, a, st)
	for a.Screen() == Measure {
		f := a.fields[a.fi]
		if f.Optional {
			tap(t, a, "Skip")
			continue
		}
		v, _ := f.get(ref)
		typeKeys(t, a, formatNumber(v, false))
		tap(t, a, "Next")
	}
	if a.Screen() != Plan || a.plan == nil || len(a.plan.Steps) == 0 {
		t.Fatalf("screen %s, note %q", a.Screen(), a.planNote)
	}
	if !strings.Contains(a.PlanText(), a.plan.Steps[0].Words) {
		t.Fatal("plan text lacks the first step")
	}
	t.Log(a.PlanText())
}
