package ui

import (
	"strings"
	"testing"

	"evenbeat/setting/session"
)

// TestEditPastReading: a reading of an earlier round is chosen from the
// history, typed again on the keypad and saved with the whole session;
// Next returns to that round's list, and that round's plan is made again
// from the edited reading.
func TestEditPastReading(t *testing.T) {
	a := planApp(t)
	a.Session().DisplayUnit = session.UnitMM
	st := a.opt.Store.(*memStore)
	tap(t, a, "Next round")
	tap(t, a, "Menu")
	tap(t, a, "History of rounds")
	tap(t, a, "Round 1")
	if a.Screen() != Readings || a.round != 0 {
		t.Fatalf("round 1 chosen: screen %s, round %d", a.Screen(), a.round+1)
	}
	tap(t, a, "Plan from round 1")
	before := a.model.Positions[0].NowEvents
	a.Back()
	writes := len(st.puts)
	tap(t, a, "Front dead centre, full forward")
	if a.Screen() != Measure || a.Field() != "Front dead centre, full forward" {
		t.Fatalf("tapping the reading: screen %s, field %q", a.Screen(), a.Field())
	}
	old := a.Session().Cylinders[0].Rounds[0].DeadCentreReadings[0].GaugeMM
	typeKeys(t, a, "2.3")
	tap(t, a, "Next")
	if a.Screen() != Readings || a.round != 0 {
		t.Fatalf("after Next: screen %s, round %d, want round 1's readings", a.Screen(), a.round+1)
	}
	if got := a.Session().Cylinders[0].Rounds[0].DeadCentreReadings[0].GaugeMM; got != 2.3 || old == 2.3 {
		t.Fatalf("edited reading %v (was %v), want 2.3", got, old)
	}
	if len(st.puts) != writes+1 || st.puts[len(st.puts)-1] != a.cur.Key {
		t.Fatalf("%d writes for one edit", len(st.puts)-writes)
	}
	if text, _ := drawText(a); !strings.Contains(text, "Front dead centre, full forward: 2.3 mm") {
		t.Fatalf("round 1's list lacks the edited reading:\n%s", text)
	}
	if len(a.Session().Cylinders[0].Rounds[1].DeadCentreReadings) != 0 {
		t.Fatal("the edit landed in round 2")
	}
	tap(t, a, "Plan from round 1")
	if a.model == nil {
		t.Fatalf("no plan after the edit: %q", a.planNote)
	}
	if after := a.model.Positions[0].NowEvents; after == before {
		t.Fatal("round 1's plan was not made again from the edited reading")
	}
}
