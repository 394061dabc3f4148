package ui

import (
	"strings"
	"testing"

	"evenbeat/render/recorder"
	"evenbeat/setting/session"
)

// TestOtherPriorityAfterFirstFrame: the plan is shown before its other
// priority's plan is made; the first Update after the plan is drawn makes
// it, and the plan's words are then those of a plan made at once.
func TestOtherPriorityAfterFirstFrame(t *testing.T) {
	a := newTestApp(t, newMemStore())
	s := demoSession(t)
	src, err := encodeSession(s)
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(src); err != nil {
		t.Fatal(err)
	}
	if !a.PlanPending() || a.plan.Other != nil {
		t.Fatalf("a new plan: pending %v, other %v; want the other priority left for later", a.PlanPending(), a.plan.Other)
	}
	a.Update() // not drawn yet: nothing more
	if !a.PlanPending() {
		t.Fatal("the other priority was made before the plan was drawn")
	}
	a.Draw(recorder.New(phoneW, phoneH))
	if !a.Update() {
		t.Error("Update after making the other priority does not ask for a frame")
	}
	if a.PlanPending() || a.plan.Other == nil || a.OtherTime() <= 0 {
		t.Fatalf("after the first frame: pending %v, other %v, took %v", a.PlanPending(), a.plan.Other, a.OtherTime())
	}
	samePlanAs(t, a, "the words after the first frame")
}

// TestPlanTextFollowsUnit: the plan's words, kept between calls, are
// written again when the display unit changes.
func TestPlanTextFollowsUnit(t *testing.T) {
	a := planApp(t)
	s := a.Session()
	s.DisplayUnit = session.UnitMM
	mm := a.PlanText()
	s.DisplayUnit = session.UnitInch
	inch := a.PlanText()
	if mm == inch || !strings.Contains(mm, " mm") || !strings.Contains(inch, " in") {
		t.Errorf("the words in mm and in inches:\n%s\n---\n%s", mm, inch)
	}
	samePlanAs(t, a, "in inches")
}
