package ui

import (
	"bytes"
	"testing"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// samePlanAs fails unless the app's plan is word for word the plan
// package's for the session's aims.
func samePlanAs(t *testing.T, a *App, what string) {
	t.Helper()
	s := a.Session()
	opt := plan.AimsOptions(s.Aims)
	opt.Unit = a.unit()
	want, err := plan.Make(s, opt)
	if err != nil {
		t.Fatal(err)
	}
	var w bytes.Buffer
	if err := plan.WriteText(&w, want, a.unit()); err != nil {
		t.Fatal(err)
	}
	if got := a.PlanText(); got != w.String() {
		t.Errorf("%s: the app's plan\n%s\nwant\n%s", what, got, w.String())
	}
}

// TestLeadShareAndRunningNotch: a balanced plan offers the share given to
// leads, an equal cut-offs or balanced plan the notch whose cut-offs are
// made equal; each choice plans again with it, is saved with the engine
// and reads back from the file, and changing to equal leads drops the
// share (a file may hold it only with a balanced plan).
func TestLeadShareAndRunningNotch(t *testing.T) {
	a := planApp(t)
	st := a.opt.Store.(*memStore)
	if _, ok := targetAt(a, "Leads 50 %"); ok {
		t.Fatal("an equal leads plan offers the share of a balanced one")
	}
	if _, ok := targetAt(a, "Cut-offs equal in"); ok {
		t.Fatal("an equal leads plan offers the notch of equal cut-offs")
	}
	tap(t, a, "Balanced")
	if tg, ok := targetAt(a, "Leads 50 %"); !ok || !tg.On {
		t.Fatalf("a balanced plan without a share: 50 %% offered %v, chosen %v", ok, tg.On)
	}
	tap(t, a, "Leads 75 %")
	if a.plan == nil || a.leadShare() != 0.75 {
		t.Fatalf("after Leads 75 %%: share %v, plan %v %q", a.leadShare(), a.plan != nil, a.planNote)
	}
	samePlanAs(t, a, "leads 75 %")

	ns := a.runningNotches()
	if len(ns) < 2 {
		t.Fatalf("the demo engine's running notches %q: want full forward and its own", ns)
	}
	was := a.runningNotch()
	tap(t, a, "Cut-offs equal in: "+was)
	now := a.runningNotch()
	if now == was || a.plan == nil {
		t.Fatalf("the notch stays %q after a tap (plan %v)", now, a.plan != nil)
	}
	samePlanAs(t, a, "cut-offs equal in "+now)

	st.complete()
	s, _ := storedSession(t, st, a.cur.Key)
	if s.Aims.Priority != session.PriorityBalanced || s.Aims.LeadShare != 0.75 || s.Aims.RunningNotch != now {
		t.Fatalf("stored aims %+v; want balanced, 0.75, %q", s.Aims, now)
	}
	for range ns { // round the notches, back to the first
		tap(t, a, "Cut-offs equal in: ")
	}
	if got := a.runningNotch(); got != now {
		t.Errorf("after %d more taps the notch is %q, want %q again", len(ns), got, now)
	}

	tap(t, a, "Equal leads")
	st.complete()
	s, _ = storedSession(t, st, a.cur.Key)
	if s.Aims.LeadShare != 0 {
		t.Errorf("equal leads kept the share %v", s.Aims.LeadShare)
	}
	samePlanAs(t, a, "equal leads")
}

// TestLeadShareFromFileShown: a share from a file that the plan screen
// does not offer is shown chosen beside the offered ones.
func TestLeadShareFromFileShown(t *testing.T) {
	a := newTestApp(t, newMemStore())
	s := demoSession(t)
	s.Aims = session.PlanAims{Priority: session.PriorityBalanced, LeadShare: 0.6}
	b, err := encodeSession(s)
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	if tg, ok := targetAt(a, "Leads 60 %"); !ok || !tg.On {
		t.Fatalf("the file's share: shown %v, chosen %v", ok, tg.On)
	}
	if tg, _ := targetAt(a, "Leads 50 %"); tg.On {
		t.Error("50 % shown chosen while the file holds 60 %")
	}
}

// targetAt returns the target whose label starts with label.
func targetAt(a *App, label string) (Target, bool) {
	for _, tg := range a.Targets() {
		if len(tg.Label) >= len(label) && tg.Label[:len(label)] == label {
			return tg, true
		}
	}
	return Target{}, false
}
