package ui

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
	"time"

	"evenbeat/render"
	"evenbeat/setting/session"
)

// clockApp returns an app whose clock the test moves on by *now.
func clockApp(t *testing.T, st *memStore, now *time.Time) *App {
	t.Helper()
	a := New(Options{Store: st, Now: func() time.Time { return *now }})
	a.Resize(phoneW, phoneH)
	return a
}

// demoFile is the invented demo session file.
func demoFile(t *testing.T) []byte {
	t.Helper()
	b, err := os.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// hasTarget reports whether the screen shown has a target labelled with
// the prefix.
func hasTarget(a *App, prefix string) bool {
	for _, tg := range a.Targets() {
		if strings.HasPrefix(tg.Label, prefix) {
			return true
		}
	}
	return false
}

// TestNothingStoredByLooking: a demo engine opened and left is never
// stored (no write, not listed); a round begun by Next round is stored
// only with its first value, and until then the plan is the steps still
// to do and a reload knows nothing of it.
func TestNothingStoredByLooking(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	tap(t, a, "mm")
	tap(t, a, "Next")
	for a.Back() {
	}
	if len(st.puts) != 0 || len(a.StoredSessions()) != 0 || hasTarget(a, "Brackenfold (Stephenson), 0 rounds") {
		t.Fatalf("a demo looked at: writes %q, %d engines listed", st.puts, len(a.StoredSessions()))
	}
	if a.Status() != "Not saved yet" {
		t.Errorf("status %q after only looking", a.Status())
	}

	a = planApp(t)
	a.Session().DisplayUnit = session.UnitMM
	st = a.opt.Store.(*memStore)
	st.complete()
	a.Update()
	steps := a.PlanText()
	writes := len(st.puts)
	tap(t, a, "Next round")
	tap(t, a, "Back") // the first field: back to the plan
	if a.Screen() != Plan || a.plan == nil {
		t.Fatalf("back from a round not begun: screen %s, plan notes %q", a.Screen(), a.planNote)
	}
	if a.PlanText() != steps {
		t.Errorf("the plan after Next round is not the steps still to do:\n%s\nwant:\n%s", a.PlanText(), steps)
	}
	tap(t, a, "Next round") // the same round, not another
	if n := len(a.Session().Cylinders[0].Rounds); n != 2 || len(st.puts) != writes || a.Status() != "Saved" {
		t.Fatalf("Next round twice: %d rounds in the app, writes %q, status %q", n, st.puts[writes:], a.Status())
	}
	b := newTestApp(t, st)
	if got := len(b.StoredSessions()[0].Session.Cylinders[0].Rounds); got != 1 {
		t.Fatalf("a reload finds %d rounds; want 1 (the round begun holds nothing)", got)
	}
	typeKeys(t, a, "2.5")
	tap(t, a, "Next")
	st.complete()
	a.Update()
	b = newTestApp(t, st)
	if got := b.StoredSessions()[0].Session.Cylinders[0].Rounds; len(got) != 2 || got[1].PortMarks == nil || len(got[1].AdjustmentsBefore) == 0 {
		t.Fatalf("after the first value a reload finds rounds %+v; want the second with its mark and the changes made before it", got)
	}
}

// TestSavedLineIsTrue: a session that cannot be written says so, without
// a key path; another engine shown does not carry the failure; the
// failure clears once a later write of that engine succeeds; a failed
// store write shows on its own engine only.
func TestSavedLineIsTrue(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	if err := a.Import(demoFile(t)); err != nil {
		t.Fatal(err)
	}
	first := a.cur
	st.complete()
	a.Update()
	a.Session().Measuring.WheelDiameterMM = math.NaN() // beyond what any entry lets through
	a.save()
	if !strings.HasPrefix(a.Status(), "Not saved: ") || strings.Contains(a.Status(), "measuring.") {
		t.Fatalf("an unwritable session: status %q", a.Status())
	}
	text, _ := drawText(a)
	noKeyPath(t, text)
	tap(t, a, "Menu")
	tap(t, a, "Engines")
	tap(t, a, "Brackenfold (Walschaerts) (invented demo)")
	if a.Status() != "Not saved yet" {
		t.Fatalf("another engine shows %q", a.Status())
	}
	tap(t, a, "Menu")
	tap(t, a, "Engines")
	if !hasTarget(a, first.Session.Name+", 2 rounds (not saved)") {
		t.Errorf("the engines list does not say the first engine is not saved")
	}
	a.openSession(first)
	a.Session().Measuring.WheelDiameterMM = 116
	a.save()
	if a.Status() != "Saving..." {
		t.Fatalf("a write asked for: status %q, want saving", a.Status())
	}
	st.complete()
	a.Update()
	if a.Status() != "Saved" {
		t.Fatalf("after a good write: status %q", a.Status())
	}
	a.Session().Measuring.WheelDiameterMM = math.Inf(1)
	a.save()
	a.Session().Measuring.WheelDiameterMM = 116
	a.save() // what the store holds already
	if a.Status() != "Saved" || st.pending != nil {
		t.Fatalf("back to what is stored: status %q, %d writes", a.Status(), len(st.pending))
	}

	// A store failure belongs to its engine.
	st.fail = errors.New("the storage is full")
	a.Session().Name = "Renamed"
	a.save()
	st.complete()
	a.Update()
	if !strings.Contains(a.Status(), "the storage is full") {
		t.Fatalf("a failed write: status %q", a.Status())
	}
	st.fail = nil
	tap(t, a, "Menu")
	tap(t, a, "Engines")
	tap(t, a, "Brackenfold (Walschaerts) (invented demo)")
	if strings.HasPrefix(a.Status(), "Not saved:") {
		t.Fatalf("another engine shows the failure: %q", a.Status())
	}
}

// TestDeleteEngineAndUndo: an engine deleted from the list goes from the
// list and the store (list first); Undo writes both back; the Undo bar
// goes after a few seconds, and a delete then stays.
func TestDeleteEngineAndUndo(t *testing.T) {
	st := newMemStore()
	now := time.Date(2026, 11, 21, 9, 0, 0, 0, time.UTC)
	a := clockApp(t, st, &now)
	if err := a.Import(demoFile(t)); err != nil {
		t.Fatal(err)
	}
	key, name := a.cur.Key, a.Session().Name
	st.complete()
	a.Update()
	tap(t, a, "Menu")
	tap(t, a, "Engines")
	tap(t, a, "Delete "+name)
	if len(a.StoredSessions()) != 0 || hasTarget(a, name) || !hasTarget(a, "Undo") {
		t.Fatalf("after Delete: %d engines, Undo shown %v", len(a.StoredSessions()), hasTarget(a, "Undo"))
	}
	if got := st.puts[len(st.puts)-2:]; got[0] != IndexKey || got[1] != "delete "+key {
		t.Fatalf("a delete wrote %q; want the list of engines, then the session's removal", got)
	}
	if a.Session() != nil || a.Back() {
		t.Fatal("the deleted engine is still open, or Back leads into it")
	}
	text, _ := drawText(a)
	if !strings.Contains(strings.Join(strings.Fields(text), " "), name+" deleted.") {
		t.Errorf("the Undo bar does not say what was deleted:\n%s", text)
	}
	st.complete()
	a.Update()
	if _, ok := st.data[key]; ok {
		t.Fatal("the session file is still stored")
	}
	tap(t, a, "Undo")
	st.complete()
	a.Update()
	if _, ok := st.data[key]; !ok || len(a.StoredSessions()) != 1 || !hasTarget(a, name) || a.Status() != "Saved" {
		t.Fatalf("after Undo: stored %v, %d engines, status %q", ok, len(a.StoredSessions()), a.Status())
	}
	if b := newTestApp(t, st); len(b.StoredSessions()) != 1 {
		t.Fatalf("a reload after Undo finds %d engines", len(b.StoredSessions()))
	}

	tap(t, a, "Delete "+name)
	now = now.Add(undoFor - time.Second)
	a.Update()
	if !hasTarget(a, "Undo") {
		t.Fatal("the Undo bar went before its time")
	}
	now = now.Add(2 * time.Second)
	a.Update()
	if hasTarget(a, "Undo") {
		t.Fatal("the Undo bar stays after its time")
	}
	st.complete()
	if b := newTestApp(t, st); len(b.StoredSessions()) != 0 {
		t.Fatalf("a reload finds %d engines after the delete stood", len(b.StoredSessions()))
	}
}

// TestDeleteRoundAndReading: a round deleted from the list of rounds goes
// (its changes move to the round after it) and comes back with Undo; a
// reading typed again from a round's list can be removed (its record: both
// port marks) and comes back with Undo.
func TestDeleteRoundAndReading(t *testing.T) {
	a := planApp(t) // the demo's first round only
	a.Session().DisplayUnit = session.UnitMM
	st := a.opt.Store.(*memStore)
	typed := func() {
		typeKeys(t, a, "2.5")
		tap(t, a, "Next")
	}
	tap(t, a, "Next round")
	typed()
	s := a.Session()
	changes := len(s.Cylinders[0].Rounds[1].AdjustmentsBefore)
	tap(t, a, "Menu")
	tap(t, a, "History of rounds")
	tap(t, a, "Delete round 1")
	if n := len(s.Cylinders[0].Rounds); n != 1 || s.Cylinders[0].Rounds[0].PortMarks.FrontGaugeMM != 2.5 {
		t.Fatalf("after deleting round 1: %d rounds, the first %+v", n, s.Cylinders[0].Rounds[0].PortMarks)
	}
	if got := len(s.Cylinders[0].Rounds[0].AdjustmentsBefore); got != changes {
		t.Errorf("the round left has %d changes before it; want %d", got, changes)
	}
	writes := len(st.puts)
	tap(t, a, "Undo")
	if n := len(a.Session().Cylinders[0].Rounds); n != 2 || len(st.puts) != writes+1 {
		t.Fatalf("after Undo: %d rounds, %d writes", n, len(st.puts)-writes)
	}

	tap(t, a, "Round 2")
	tap(t, a, "Back port mark:")
	if hasTarget(a, RemoveLabel) {
		t.Fatal("Remove offered for a reading not taken")
	}
	a.Back()
	tap(t, a, "Front port mark:")
	if a.Screen() != Measure {
		t.Fatalf("tapping a reading: screen %s", a.Screen())
	}
	tap(t, a, RemoveLabel)
	r := a.Session().Cylinders[0].Rounds[1]
	if a.Screen() != Readings || r.PortMarks != nil || !hasTarget(a, "Undo") {
		t.Fatalf("after Remove: screen %s, port marks %+v", a.Screen(), r.PortMarks)
	}
	text, _ := drawText(a)
	if !strings.Contains(strings.Join(strings.Fields(text), " "), "Front port mark and Back port mark deleted.") {
		t.Errorf("the Undo bar does not name the record:\n%s", text)
	}
	tap(t, a, "Undo")
	if pm := a.Session().Cylinders[0].Rounds[1].PortMarks; pm == nil || pm.FrontGaugeMM != 2.5 {
		t.Fatalf("after Undo the port marks are %+v", pm)
	}
}

// TestUndoBarOverTheList: the Undo bar lies over the bottom of the list,
// its button takes the tap there, and the list scrolls clear of it.
func TestUndoBarOverTheList(t *testing.T) {
	a := newTestApp(t, newMemStore())
	if err := a.Import(demoFile(t)); err != nil {
		t.Fatal(err)
	}
	tap(t, a, "Menu")
	tap(t, a, "History of rounds")
	tap(t, a, "Delete round 1")
	box, button, _, ok := a.undoLayout()
	if !ok || box.Max.Y > phoneH || button.H() < render.HitMin || !box.ContainsRect(button) {
		t.Fatalf("the Undo bar %v, its button %v", box, button)
	}
	before := a.undoRoom()
	a.Handle(Intent{Kind: Tap, At: render.Point{X: (button.Min.X + button.Max.X) / 2, Y: (button.Min.Y + button.Max.Y) / 2}})
	if len(a.Session().Cylinders[0].Rounds) != 2 || a.undoRoom() != 0 || before == 0 {
		t.Fatalf("the tap on Undo: %d rounds, room %v then %v", len(a.Session().Cylinders[0].Rounds), before, a.undoRoom())
	}
}

// TestImportTwice: the same file imported again opens the engine already
// here; a different file of the same engine asks, and Keep both stores it
// under a name of its own, Replace puts it in place (Undo puts the engine
// back), Cancel changes nothing.
func TestImportTwice(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	demo := demoFile(t)
	if err := a.Import(demo); err != nil {
		t.Fatal(err)
	}
	writes := len(st.puts)
	if err := a.Import(demo); err != nil {
		t.Fatal(err)
	}
	if len(a.StoredSessions()) != 1 || len(st.puts) != writes || a.Screen() != Plan {
		t.Fatalf("the same file twice: %d engines, %d writes, screen %s", len(a.StoredSessions()), len(st.puts)-writes, a.Screen())
	}
	name := a.Session().Name
	later := []byte(strings.Replace(string(demo), `"wheel_diameter_mm": 115,`, `"wheel_diameter_mm": 116,`, 1))
	for _, answer := range []string{"Cancel", "Keep both", "Replace it"} {
		if err := a.Import(later); err != nil {
			t.Fatal(err)
		}
		text, _ := drawText(a)
		if a.Screen() != Engines || !strings.Contains(text, "already here") || !hasTarget(a, answer) {
			t.Fatalf("a changed file of the engine: screen %s\n%s", a.Screen(), text)
		}
		tap(t, a, answer)
	}
	ss := a.StoredSessions()
	if len(ss) != 2 || ss[1].Session.Name != name+" (2)" || ss[0].Session.Measuring.WheelDiameterMM != 116 {
		t.Fatalf("after Cancel, Keep both, Replace: %d engines, %q, wheel %v", len(ss), ss[len(ss)-1].Session.Name, ss[0].Session.Measuring.WheelDiameterMM)
	}
	tap(t, a, "Undo")
	st.complete()
	if s, err := decodeSession(st.data[ss[0].Key]); err != nil || s.Measuring.WheelDiameterMM != 115 || a.StoredSessions()[0].Session.Measuring.WheelDiameterMM != 115 {
		t.Fatalf("Undo of Replace: stored %v (%v)", s, err)
	}
}
