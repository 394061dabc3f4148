package ui

import (
	"bytes"
	"strings"
	"testing"

	"evenbeat/setting/session"
)

// TestReadingsPerPosition: a link gear's round asks the sweep, the
// cut-offs and the feeler openings in every reverser position the engine
// has, each a step that Skip passes over alone; the dead-centre readings in
// mid gear may be skipped too.
func TestReadingsPerPosition(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	setUpDemo(t, a, st)
	steps := map[string]bool{}
	for _, f := range a.fields {
		steps[f.Step] = true
	}
	notches := []string{session.FullForward, session.MidGear, session.FullBack}
	for _, n := range a.Session().Engine.Notches {
		notches = append(notches, n.Name)
	}
	for _, n := range notches {
		for _, st := range []string{"Sweep, ", "Cut-off points, ", "Feeler openings, "} {
			if !steps[st+n] {
				t.Errorf("no step %q", st+n)
			}
		}
	}
	if !steps["Dead centres, "+session.MidGear] {
		t.Error("no dead-centre readings in mid gear")
	}
	// Skip passes over one step only.
	goTo(t, a, "Sweep, "+session.MidGear)
	tap(t, a, "Skip")
	if got := a.fields[a.fi].Step; got != "Cut-off points, "+session.MidGear {
		t.Fatalf("Skip of the mid-gear sweep went to %q", got)
	}
}

// goTo moves the keypad to the first field of step.
func goTo(t *testing.T, a *App, step string) {
	t.Helper()
	for i, f := range a.fields {
		if f.Step == step {
			a.setField(i)
			return
		}
	}
	t.Fatalf("no step %q", step)
}

// TestOtherForms: a cut-off typed as a tyre mark, the steam edges typed as
// laps and a feeler opening land in the session file in those forms,
// which reads back.
func TestOtherForms(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	setUpDemo(t, a, st)
	a.Resize(360, 740)
	checkFits(t, a, [2]float64{360, 740}, "port marks with their form")
	a.Resize(phoneW, phoneH)
	tap(t, a, "Laps instead")
	if a.Field() != "Front steam lap" {
		t.Fatalf("laps form starts at %q", a.Field())
	}
	for _, v := range []string{"1.6", "1.5", "4.9"} {
		typeKeys(t, a, v)
		tap(t, a, "Next")
	}
	r := &a.Session().Cylinders[0].Rounds[0]
	if r.PortMarks != nil || r.Laps == nil || *r.Laps != (session.Laps{FrontMM: 1.6, BackMM: 1.5, CentreGaugeMM: 4.9}) {
		t.Fatalf("laps %+v, port marks %+v", r.Laps, r.PortMarks)
	}
	goTo(t, a, "Cut-off points, "+session.FullForward)
	for _, sz := range [][2]float64{{360, 740}, {844, 390}, {390, 844}} {
		a.Resize(sz[0], sz[1])
		checkFits(t, a, sz, "cut-off with its form")
	}
	tap(t, a, "As a tyre mark")
	if !strings.HasSuffix(a.fields[a.fi].Key, "tyre_mm") || !strings.Contains(a.Field(), "tyre mark") {
		t.Fatalf("cut-off form: %q %q", a.fields[a.fi].Key, a.Field())
	}
	typeKeys(t, a, "95.5")
	tap(t, a, "Next")
	if c := r.CutOffs[0]; c.At != (session.Mark{Scale: session.TyreMM, Value: 95.5}) || c.CrossheadMM != 0 {
		t.Fatalf("cut-off %+v", c)
	}
	goTo(t, a, "Feeler openings, "+session.FullForward)
	typeKeys(t, a, "0.2")
	tap(t, a, "Next")
	if len(r.FeelerOpenings) != 1 || r.FeelerOpenings[0].OpeningMM != 0.2 || r.FeelerOpenings[0].DeadCentre != session.Front {
		t.Fatalf("feeler openings %+v", r.FeelerOpenings)
	}
	b, err := encodeSession(a.Session())
	if err != nil {
		t.Fatal(err)
	}
	back, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatalf("the file does not read back: %v", err)
	}
	rb := back.Cylinders[0].Rounds[0]
	if rb.Laps == nil || rb.CutOffs[0].At.Scale != session.TyreMM || len(rb.FeelerOpenings) != 1 {
		t.Fatalf("read back: %+v", rb)
	}
	leads, err := back.Leads(0)
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, l := range leads {
		found = found || strings.Contains(l.Field, "feeler_openings") && l.LeadMM == 0.2
	}
	if !found {
		t.Errorf("the feeler opening is not read as a lead: %+v", leads)
	}
}
