package ui

import (
	"bytes"
	"os"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// storedSession decodes what the store holds under key.
func storedSession(t *testing.T, st *memStore, key string) (*session.Session, []byte) {
	t.Helper()
	b, ok := st.data[key]
	if !ok {
		t.Fatalf("nothing stored under %s", key)
	}
	s, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatalf("%s as stored: %v", key, err)
	}
	return s, b
}

// openEngine taps the engines list's entry for the session named name.
func openEngine(t *testing.T, a *App, name string) {
	t.Helper()
	for a.Back() {
	}
	if a.Screen() != Engines {
		t.Fatalf("Back all the way: screen %s, want engines", a.Screen())
	}
	tap(t, a, name+",")
}

// TestAimsKeptWithEachEngine: the priority and target lead chosen on the
// plan screen are saved in that engine's session: opening another engine
// shows its own aims, and the first engine's come back when it is opened
// again, after a reload too.
func TestAimsKeptWithEachEngine(t *testing.T) {
	a := planApp(t)
	st := a.opt.Store.(*memStore)
	first := a.cur.Key
	name := a.Session().Name
	a.Session().DisplayUnit = session.UnitMM
	tap(t, a, "Equal cut-offs")
	tap(t, a, "Target lead: none")
	typeKeys(t, a, "0.5")
	tap(t, a, "Next")
	if a.plan == nil || a.plan.Priority != plan.EqualCutOffs {
		t.Fatalf("plan after the aims: %+v %q", a.plan, a.planNote)
	}
	st.complete()
	s, _ := storedSession(t, st, first)
	if s.Aims.Priority != session.PriorityCutOffs || s.Aims.TargetLeadMM == nil || *s.Aims.TargetLeadMM != 0.5 {
		t.Fatalf("stored aims %+v", s.Aims)
	}

	// Another engine, with no aims of its own.
	other := demoSession(t)
	other.Name, other.Aims = "Second engine", session.PlanAims{}
	other.Cylinders[0].Rounds = other.Cylinders[0].Rounds[:1]
	b, err := encodeSession(other)
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	if a.priority() != plan.EqualLeads || a.targetLead() != nil || a.plan == nil || a.plan.Priority != plan.EqualLeads {
		t.Fatalf("the second engine took the first's aims: %v %v", a.priority(), a.targetLead())
	}
	if text, _ := drawText(a); !strings.Contains(text, "Target lead: none") {
		t.Errorf("the second engine shows a target lead:\n%s", text)
	}

	openEngine(t, a, name)
	if a.cur.Key != first || a.priority() != plan.EqualCutOffs || a.plan == nil || a.plan.Priority != plan.EqualCutOffs {
		t.Fatalf("the first engine opened again without its aims: %s %v %+v", a.cur.Key, a.priority(), a.plan)
	}
	if text, _ := drawText(a); !strings.Contains(text, "Target lead: 0.5") {
		t.Errorf("the first engine's target lead is not shown:\n%s", text)
	}

	st.complete()
	b2 := newTestApp(t, st)
	openEngine(t, b2, name)
	if b2.priority() != plan.EqualCutOffs || b2.targetLead() == nil || *b2.targetLead() != 0.5 || b2.plan == nil || b2.plan.Priority != plan.EqualCutOffs {
		t.Fatalf("after a reload: %v %v %+v", b2.priority(), b2.targetLead(), b2.plan)
	}
}

// TestStoredVersion1Opens: a session stored by the app when the file was
// version 1 opens as it is, nothing is written by opening it, and the
// first change writes it back as version 2: the same session plus the
// change.
func TestStoredVersion1Opens(t *testing.T) {
	v1, err := os.ReadFile("../../testdata/sessions/v1/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(v1, []byte(`"version": 1,`)) {
		t.Fatal("the version 1 example is not version 1")
	}
	st := newMemStore()
	st.data[IndexKey] = encodeIndex([]string{"session/1"})
	st.data["session/1"] = v1
	a := newTestApp(t, st)
	want, err := session.Decode(bytes.NewReader(v1))
	if err != nil {
		t.Fatal(err)
	}
	if text, _ := drawText(a); strings.Contains(text, "version") || strings.Contains(text, "cannot be opened") {
		t.Errorf("the engines list speaks of the version:\n%s", text)
	}
	openEngine(t, a, want.Name)
	if a.Screen() != Plan || a.plan == nil {
		t.Fatalf("the version 1 session opened on %s (%q)", a.Screen(), a.planNote)
	}
	st.complete()
	if len(st.puts) != 0 || !bytes.Equal(st.data["session/1"], v1) {
		t.Fatalf("opening wrote %q", st.puts)
	}
	if !bytes.Equal(a.cur.Raw, v1) {
		t.Error("the stored original is not kept as it was")
	}
	tap(t, a, "Balanced")
	st.complete()
	got, raw := storedSession(t, st, "session/1")
	if !bytes.Contains(raw, []byte(`"version": 2,`)) {
		t.Fatalf("after a change the stored session is not version 2:\n%.200s", raw)
	}
	want.Aims.Priority = session.PriorityBalanced
	if !reflect.DeepEqual(got, want) {
		t.Error("the stored session is not the version 1 session plus the change")
	}
	if a.plan == nil || a.plan.Priority != plan.Balanced {
		t.Errorf("plan after Balanced: %+v %q", a.plan, a.planNote)
	}
}

// TestAimsTheFileCannotHold: a target lead beyond the file's bounds is not
// kept (the session stays writable), and leaving the balanced priority
// drops its share of the balance, which belongs to it alone.
func TestAimsTheFileCannotHold(t *testing.T) {
	a := planApp(t)
	st := a.opt.Store.(*memStore)
	lead := session.MaxTargetLeadMM + 1.0
	a.setTargetLead(&lead)
	if a.targetLead() != nil {
		t.Fatalf("a %v mm target lead was kept", lead)
	}
	a.Session().Aims.Priority, a.Session().Aims.LeadShare = session.PriorityBalanced, 0.7
	tap(t, a, "Equal cut-offs")
	st.complete()
	s, _ := storedSession(t, st, a.cur.Key)
	if s.Aims.Priority != session.PriorityCutOffs || s.Aims.LeadShare != 0 || a.saveErr != "" {
		t.Fatalf("stored aims %+v, save error %q", s.Aims, a.saveErr)
	}
}
