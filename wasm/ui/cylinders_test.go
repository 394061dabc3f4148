package ui

import (
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/setting/session"
)

// TestTwoCylinders: set-up asks how many cylinders and names them; the
// measuring screen says which cylinder and switches to the other, whose
// readings land in its own rounds; a cylinder with readings is never
// dropped.
func TestTwoCylinders(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	tap(t, a, "mm")
	tap(t, a, "3")
	tap(t, a, "2")
	s := a.Session()
	if len(s.Cylinders) != 2 || s.Cylinders[0].Name != "right" || s.Cylinders[1].Name != "left" {
		t.Fatalf("cylinders %+v, want right and left", s.Cylinders)
	}
	tap(t, a, "Next")
	for a.Screen() == Sizes {
		tap(t, a, "Next")
	}
	tap(t, a, "Next: start measuring")
	tap(t, a, render.AckLabel)
	if text, _ := drawText(a); !strings.Contains(text, "Right, round 1: Port marks") {
		t.Fatalf("measuring does not name the cylinder:\n%s", text)
	}
	typeKeys(t, a, "2.48")
	tap(t, a, "Next")
	tap(t, a, "Left")
	if a.cyl != 1 || a.Field() != "Front port mark" {
		t.Fatalf("after Left: cylinder %d, field %q", a.cyl, a.Field())
	}
	typeKeys(t, a, "2.5")
	tap(t, a, "Next")
	if pm := s.Cylinders[1].Rounds[0].PortMarks; pm == nil || pm.FrontGaugeMM != 2.5 {
		t.Fatalf("left port marks %+v", pm)
	}
	if pm := s.Cylinders[0].Rounds[0].PortMarks; pm.FrontGaugeMM != 2.48 {
		t.Fatalf("right port marks %+v", pm)
	}
	if !strings.HasPrefix(a.fields[a.fi].Key, "cylinders[1].") {
		t.Fatalf("left's field key %q", a.fields[a.fi].Key)
	}
	tap(t, a, "Right")
	if a.cyl != 0 || a.Field() != "Back port mark" {
		t.Fatalf("back on the right: cylinder %d, field %q", a.cyl, a.Field())
	}
	a.setCylinders(1)
	if len(s.Cylinders) != 2 || !strings.HasPrefix(a.note, "Cylinders: the left cylinder already has readings") {
		t.Fatalf("dropping a cylinder with readings: %d cylinders, note %q", len(s.Cylinders), a.note)
	}
	a.setCylinders(3)
	if len(s.Cylinders) != 3 || s.Cylinders[2].Name != "middle" {
		t.Fatalf("three cylinders: %+v", s.Cylinders)
	}
}

// TestPlanPerCylinder: the demo session's plan screen switches between
// its cylinders, each planned from its own readings.
func TestPlanPerCylinder(t *testing.T) {
	a := planApp(t)
	if len(a.Session().Cylinders) < 2 {
		t.Skip("the demo session has one cylinder")
	}
	right := a.plan
	if right.Cylinder != "right" {
		t.Fatalf("first plan is of %q", right.Cylinder)
	}
	tap(t, a, "Left")
	if a.plan == nil {
		t.Fatalf("no plan for the left cylinder: %q", a.planNote)
	}
	if a.plan.Cylinder != "left" || a.plan == right {
		t.Fatalf("plan of %q after choosing Left", a.plan.Cylinder)
	}
	if a.PlanText() == "" || strings.Contains(a.PlanText(), "cylinder right") {
		t.Fatalf("plan text:\n%s", a.PlanText())
	}
	_ = session.FullForward
}
