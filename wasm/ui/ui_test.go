package ui

import (
	"errors"
	"os"
	"strings"
	"testing"
	"time"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// memStore is a Store in memory whose writes complete only when the test
// says so, so "saved" can be checked to wait for them.
type memStore struct {
	data    map[string][]byte
	pending []func()
	puts    []string // keys in the order written
	fail    error    // when set, writes fail with it
}

func newMemStore() *memStore { return &memStore{data: map[string][]byte{}} }

func (m *memStore) Get(key string) ([]byte, bool, error) {
	b, ok := m.data[key]
	return b, ok, nil
}

func (m *memStore) Put(key string, value []byte, done func(error)) {
	m.puts = append(m.puts, key)
	v := append([]byte(nil), value...)
	fail := m.fail
	m.pending = append(m.pending, func() {
		if fail != nil {
			done(fail)
			return
		}
		m.data[key] = v
		done(nil)
	})
}

func (m *memStore) Delete(key string, done func(error)) {
	m.puts = append(m.puts, "delete "+key)
	fail := m.fail
	m.pending = append(m.pending, func() {
		if fail != nil {
			done(fail)
			return
		}
		delete(m.data, key)
		done(nil)
	})
}

// complete finishes every pending write.
func (m *memStore) complete() {
	p := m.pending
	m.pending = nil
	for _, f := range p {
		f()
	}
}

// phone is the logical size of a common phone screen (CSS px).
const phoneW, phoneH = 390, 844

func newTestApp(t testing.TB, st Store) *App {
	t.Helper()
	a := New(Options{Store: st, Now: func() time.Time { return time.Date(2026, 11, 21, 9, 0, 0, 0, time.UTC) }})
	a.Resize(phoneW, phoneH)
	return a
}

// tap taps the middle of the target whose label starts with label.
func tap(t testing.TB, a *App, label string) {
	t.Helper()
	for _, tg := range a.Targets() {
		if strings.HasPrefix(tg.Label, label) {
			a.Handle(Intent{Kind: Tap, At: render.Point{X: (tg.Rect.Min.X + tg.Rect.Max.X) / 2, Y: (tg.Rect.Min.Y + tg.Rect.Max.Y) / 2}})
			return
		}
	}
	var ls []string
	for _, tg := range a.Targets() {
		ls = append(ls, tg.Label)
	}
	t.Fatalf("on %s: no target %q among %q", a.Screen(), label, ls)
}

// typeKeys taps the keypad keys spelling text ('-' taps the sign key, ' '
// the space).
func typeKeys(t testing.TB, a *App, text string) {
	t.Helper()
	for _, r := range text {
		switch r {
		case '-':
			tap(t, a, KeySign.Label())
		case ' ':
			tap(t, a, KeySpace.Label())
		default:
			tap(t, a, string(r))
		}
	}
}

// drawText draws the screen on a recorder and returns every text drawn.
func drawText(a *App) (string, *recorder.Canvas) {
	c := recorder.New(phoneW, phoneH)
	a.Draw(c)
	return recordedText(c), c
}

// recordedText returns every text drawn on c, a line each.
func recordedText(c *recorder.Canvas) string {
	var b strings.Builder
	for _, op := range c.Ops() {
		if op.Kind == recorder.Text {
			b.WriteString(op.Str)
			b.WriteByte('\n')
		}
	}
	return b.String()
}

// demoSession is the invented demo session the readings are typed from.
func demoSession(t testing.TB) *session.Session {
	t.Helper()
	s, err := session.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// setUpDemo taps from the engines list through set-up and the cautions to
// the first reading of the Stephenson demo engine.
func setUpDemo(t testing.TB, a *App, st *memStore) {
	t.Helper()
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	if a.Screen() != Units {
		t.Fatalf("after choosing the demo engine: screen %s, want units", a.Screen())
	}
	tap(t, a, "mm")
	tap(t, a, "0.01 mm")
	tap(t, a, "Next")
	for a.Screen() == Sizes {
		tap(t, a, "Next") // keep the demo engine's dimensions
	}
	if a.Screen() != Adjust {
		t.Fatalf("after the dimensions: screen %s, want adjust", a.Screen())
	}
	tap(t, a, "Next: start measuring")
	if a.Screen() != Cautions {
		t.Fatalf("first run: screen %s, want the cautions", a.Screen())
	}
	tap(t, a, render.AckLabel)
	if a.Screen() != Measure {
		t.Fatalf("after the cautions: screen %s, want measure", a.Screen())
	}
	st.complete()
	a.Update()
}

// TestFullDemoSessionByTaps types the first round of the invented demo
// session (testdata/sessions/brackenfold-stephenson.json) with the keypad,
// from set-up to plan, and checks the readings landed where the file has
// them and the plan's steps are drawn.
func TestFullDemoSessionByTaps(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	ref := demoSession(t)
	ref.Cylinders[0].Rounds = ref.Cylinders[0].Rounds[:1]
	setUpDemo(t, a, st)
	entries, writes := 0, len(st.puts)
	for more := true; a.Screen() == Measure; {
		f := a.fields[a.fi]
		v, ok := f.get(ref)
		if !ok && f.Optional {
			tap(t, a, "Skip") // a step the demo file does not have
			continue
		}
		if !ok {
			t.Fatalf("the demo session has no %s", f.Key)
		}
		typeKeys(t, a, formatNumber(v, false))
		tap(t, a, "Next")
		entries++
		// The demo engine is stored with its first change: the first
		// entry writes the list of engines too.
		if len(st.puts) != writes+entries+1 || st.puts[len(st.puts)-1] != a.cur.Key && entries > 1 {
			t.Fatalf("%s: %d writes for %d entries (%q)", f.Key, len(st.puts)-writes, entries, st.puts[writes:])
		}
		if a.Note() != "" && a.fields[a.fi].Key == f.Key {
			t.Fatalf("%s: entry refused: %s", f.Key, a.Note())
		}
		if a.Screen() == Plan && more {
			// The plan comes once the readings it needs are in; the
			// round's sweep and cut-offs are typed from More readings.
			more = false
			tap(t, a, moreReadings)
		}
	}
	if a.Screen() != Plan {
		t.Fatalf("after the last reading: screen %s, want plan (%q)", a.Screen(), a.planNote)
	}
	s := a.Session()
	got, want := s.Cylinders[0], ref.Cylinders[0]
	if len(got.DeadCentres) != len(want.DeadCentres) || len(got.Rounds[0].DeadCentreReadings) != len(want.Rounds[0].DeadCentreReadings) ||
		len(got.Rounds[0].Sweeps[0].Readings) != len(want.Rounds[0].Sweeps[0].Readings) || len(got.Rounds[0].CutOffs) != len(want.Rounds[0].CutOffs) {
		t.Fatalf("readings typed do not match the demo file's: got %+v", got)
	}
	if *got.Rounds[0].PortMarks != (session.PortMarks{FrontGaugeMM: want.Rounds[0].PortMarks.FrontGaugeMM, BackGaugeMM: want.Rounds[0].PortMarks.BackGaugeMM}) {
		t.Errorf("port marks %+v, want %+v", got.Rounds[0].PortMarks, want.Rounds[0].PortMarks)
	}
	if a.plan == nil || len(a.plan.Steps) == 0 {
		t.Fatalf("no plan steps: %q", a.planNote)
	}
	text, c := drawText(a)
	for _, step := range a.plan.Steps {
		if amt := render.StepAmount(step, session.UnitMM); !strings.Contains(text, amt) {
			t.Errorf("the plan screen does not show step %q's amount %q:\n%s", step.Part, amt, text)
		}
	}
	if err := c.CheckTextSize(14); err != nil {
		t.Error(err)
	}
	words := a.PlanText()
	for _, step := range a.plan.Steps {
		if !strings.Contains(words, step.Words) {
			t.Errorf("PlanText lacks step %q", step.Words)
		}
	}
	t.Logf("%d entries typed; plan:\n%s", entries, words)
}

// TestStoreSeesEveryEntry: each committed entry is written as the whole
// session file, and "Saved" shows only once the store says the write is
// complete.
func TestStoreSeesEveryEntry(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	setUpDemo(t, a, st)
	before := len(st.puts)
	typeKeys(t, a, "2.48")
	tap(t, a, "Next")
	typeKeys(t, a, "7.28")
	tap(t, a, "Next")
	if len(st.puts) != before+3 || st.puts[before+1] != IndexKey {
		t.Fatalf("two entries made the writes %q, want the session, the list of engines (the demo engine stored with its first change) and the session", st.puts[before:])
	}
	a.Update()
	if text, _ := drawText(a); strings.Contains(text, "Saved") || a.Status() == "Saved" {
		t.Fatalf("shows saved before the store answered: %q", a.Status())
	}
	st.complete()
	a.Update()
	if text, _ := drawText(a); !strings.Contains(text, "Saved") {
		t.Fatalf("does not show saved after the store answered: %q", a.Status())
	}
	key := a.cur.Key
	s, err := decodeSession(st.data[key])
	if err != nil {
		t.Fatal(err)
	}
	if pm := s.Cylinders[0].Rounds[0].PortMarks; pm == nil || pm.FrontGaugeMM != 2.48 {
		t.Fatalf("stored session lacks the entry: %+v", pm)
	}
	// A new app on the same store finds the session and resumes at the
	// next reading.
	b := newTestApp(t, st)
	if len(b.StoredSessions()) != 1 {
		t.Fatalf("reloaded %d sessions, want 1", len(b.StoredSessions()))
	}
	tap(t, b, "Brackenfold (Stephenson), 1 round")
	if want := "Front dead centre turning forward, first mark"; b.Screen() != Measure || b.fields[b.fi].Label != want {
		t.Fatalf("reopened on %s at %q, want measure at %q", b.Screen(), b.fields[b.fi].Label, want)
	}
}

// TestStoreErrorShown: a failed write is shown as a sentence offering an
// export, and the entry stays.
func TestStoreErrorShown(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	setUpDemo(t, a, st)
	st.fail = errors.New("the storage is full")
	typeKeys(t, a, "2.48")
	tap(t, a, "Next")
	st.complete()
	a.Update()
	text, _ := drawText(a)
	if !strings.Contains(text, "the storage is full") || !strings.Contains(a.Status(), "export") {
		t.Fatalf("store failure not shown: status %q", a.Status())
	}
	if a.Session().Cylinders[0].Rounds[0].PortMarks.FrontGaugeMM != 2.48 {
		t.Fatal("the entry was dropped")
	}
	// The next write succeeding holds everything: saved again.
	st.fail = nil
	typeKeys(t, a, "7.28")
	tap(t, a, "Next")
	st.complete()
	a.Update()
	if a.Status() != "Saved" {
		t.Fatalf("status %q after a good write, want Saved", a.Status())
	}
}

// TestKeypadEntryAndEditing: digits, point, sign, delete; an implausible
// value gets a sentence naming the field; a bad entry is refused naming the
// field; a past reading is chosen and typed again.
func TestKeypadEntryAndEditing(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	setUpDemo(t, a, st)
	typeKeys(t, a, "12.345")
	tap(t, a, KeyDelete.Label())
	tap(t, a, KeySign.Label())
	if a.text != "-12.34" || a.Note() != "" {
		t.Fatalf("typed %q (note %q), want -12.34", a.text, a.Note())
	}
	tap(t, a, KeySign.Label())
	tap(t, a, KeyPoint.Label()) // a second point is ignored
	for range 5 {
		tap(t, a, KeyDelete.Label())
	}
	typeKeys(t, a, "129.1")
	if a.text != "129.1" || !strings.Contains(a.Note(), "Front port mark") || !strings.Contains(a.Note(), "unusual") {
		t.Fatalf("implausible %q mm gave note %q", a.text, a.Note())
	}
	for range 5 {
		tap(t, a, KeyDelete.Label())
	}
	typeKeys(t, a, "2.48")
	if a.Note() != "" {
		t.Fatalf("plausible value kept note %q", a.Note())
	}
	tap(t, a, "Next")
	// Next with nothing typed and nothing taken is refused by name.
	tap(t, a, "Next")
	if !strings.Contains(a.Note(), "Back port mark") {
		t.Fatalf("empty Next gave note %q", a.Note())
	}
	typeKeys(t, a, "7.28")
	tap(t, a, "Next")
	// Edit the first reading from the list of readings.
	tap(t, a, "All readings")
	if a.Screen() != Readings {
		t.Fatalf("screen %s, want readings", a.Screen())
	}
	text, _ := drawText(a)
	if !strings.Contains(text, "Front port mark: 2.48 mm") {
		t.Fatalf("readings list lacks the front port mark:\n%s", text)
	}
	tap(t, a, "Front port mark")
	typeKeys(t, a, "2.5")
	tap(t, a, "Next")
	if got := a.Session().Cylinders[0].Rounds[0].PortMarks.FrontGaugeMM; got != 2.5 {
		t.Fatalf("edited front port mark is %v, want 2.5", got)
	}
}

// TestKeypadTargets: every key at least 48 CSS px each way, inside the
// screen, none overlapping, on a small and a large phone.
func TestKeypadTargets(t *testing.T) {
	for _, sz := range [][2]float64{{320, 568}, {360, 640}, {390, 844}, {430, 932}} {
		box := render.Rect{Min: render.Point{X: margin, Y: margin}, Max: render.Point{X: sz[0] - margin, Y: sz[1] - margin}}
		for _, fractions := range []bool{false, true} {
			checkKeypad(t, sz, box, fractions)
		}
	}
}

// checkKeypad checks the keypad laid out in box: every key (16 with the
// space and the fraction bar, else 14) a fingertip wide and tall, on the
// screen, none over another.
func checkKeypad(t *testing.T, sz [2]float64, box render.Rect, fractions bool) {
	t.Helper()
	keys := LayoutKeypad(box, fractions)
	if want := map[bool]int{false: 14, true: 16}[fractions]; len(keys) != want {
		t.Fatalf("%v: %d keys, want %d", sz, len(keys), want)
	}
	for i, k := range keys {
		if k.Rect.W() < render.HitMin || k.Rect.H() < render.HitMin {
			t.Errorf("%v: key %s is %.1f x %.1f, under 48", sz, k.Key.Label(), k.Rect.W(), k.Rect.H())
		}
		if !box.ContainsRect(k.Rect) {
			t.Errorf("%v: key %s outside the screen", sz, k.Key.Label())
		}
		for _, o := range keys[i+1:] {
			if k.Rect.Overlaps(o.Rect) {
				t.Errorf("%v: keys %s and %s overlap", sz, k.Key.Label(), o.Key.Label())
			}
		}
	}
}

// TestBack: Back moves one field, then one screen, and reports false at
// the engines list.
func TestBack(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	if a.Back() {
		t.Fatal("Back on the engines list should let the browser leave")
	}
	setUpDemo(t, a, st)
	typeKeys(t, a, "2.48")
	tap(t, a, "Next")
	if !a.Back() || a.Screen() != Measure || a.fi != 0 {
		t.Fatalf("Back from the second field: screen %s field %d", a.Screen(), a.fi)
	}
	if !a.Back() || a.Screen() != Adjust {
		t.Fatalf("Back from the first field: screen %s, want adjust (the cautions are not a step)", a.Screen())
	}
	for a.Back() {
	}
	if a.Screen() != Engines {
		t.Fatalf("Back all the way: screen %s, want engines", a.Screen())
	}
}

// TestImportBadFileNamesField: a file with a bad value is refused with the
// field's name, and nothing is stored.
func TestImportBadFileNamesField(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	b, err := os.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	bad := strings.Replace(string(b), `"wheel_diameter_mm": 115`, `"wheel_diameter_mm": -115`, 1)
	err = a.Import([]byte(bad))
	if err == nil || !strings.Contains(err.Error(), "wheel diameter") || strings.Contains(err.Error(), "measuring.") {
		t.Fatalf("bad import gave %v, want the field named in words (no key path)", err)
	}
	text, _ := drawText(a)
	if !strings.Contains(text, "must be more than zero") {
		t.Fatalf("the error is not shown:\n%s", text)
	}
	newer := strings.Replace(string(b), `"version": 2`, `"version": 99`, 1)
	if err := a.Import([]byte(newer)); err == nil {
		t.Fatal("a newer version was imported")
	}
	if len(st.puts) != 0 {
		t.Fatalf("a refused import wrote %q", st.puts)
	}
	// A good file is stored and opened, and exports the same session.
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	out, err := a.ExportJSON()
	if err != nil {
		t.Fatal(err)
	}
	s1, _ := decodeSession(b)
	s2, err := decodeSession(out)
	if err != nil {
		t.Fatal(err)
	}
	e1, _ := encodeSession(s1)
	e2, _ := encodeSession(s2)
	if string(e1) != string(e2) {
		t.Fatal("export after import differs from the file")
	}
}

// TestUnreadableStoredSessionKept: a stored session of a newer version is
// listed with the reason and offered for export, never overwritten.
func TestUnreadableStoredSessionKept(t *testing.T) {
	st := newMemStore()
	raw := []byte(`{"format": "evenbeat-session", "version": 7}`)
	st.data[IndexKey] = []byte(`["session/1"]`)
	st.data["session/1"] = raw
	var exported []byte
	a := New(Options{Store: st, OnExport: func(_ string, b []byte) { exported = b }})
	a.Resize(phoneW, phoneH)
	text, _ := drawText(a)
	if !strings.Contains(text, "cannot be opened") {
		t.Fatalf("unreadable session not explained:\n%s", text)
	}
	tap(t, a, "Export the unreadable")
	if string(exported) != string(raw) {
		t.Fatalf("exported %q, want the raw bytes", exported)
	}
	tap(t, a, "Brackenfold (Walschaerts) (invented demo)")
	if a.cur.Key == "session/1" {
		t.Fatal("a new session took the unreadable one's key")
	}
	st.complete()
	if string(st.data["session/1"]) != string(raw) {
		t.Fatal("the unreadable session was overwritten")
	}
}

// TestDefaultSessionsDecode: a new session for each demo engine is a valid
// session file.
func TestDefaultSessionsDecode(t *testing.T) {
	for _, spec := range setting.DemoEngines() {
		b, err := encodeSession(newSession(spec, session.UnitInch))
		if err != nil {
			t.Fatalf("%s: %v", spec.Name, err)
		}
		if _, err := decodeSession(b); err != nil {
			t.Errorf("%s: %v", spec.Name, err)
		}
	}
}

// TestWhatIfMovesBalance: a drag on the what-if track changes the step's
// amount and the events after it.
func TestWhatIfMovesBalance(t *testing.T) {
	a := planApp(t)
	tap(t, a, "Balance")
	v := a.layout()
	if v.slider.W() == 0 {
		t.Fatal("no what-if track on the balance tab")
	}
	before := a.shownModel().Positions[0].AfterEvents
	a.Handle(Intent{Kind: Drag, At: render.Point{X: v.slider.Max.X - 1, Y: (v.slider.Min.Y + v.slider.Max.Y) / 2}})
	if a.what.model == nil || a.what.amounts[a.what.adj] <= a.planAmount() {
		t.Fatalf("drag to the right end left amount %v (plan %v)", a.what.amounts[a.what.adj], a.planAmount())
	}
	after := a.shownModel().Positions[0].AfterEvents
	if before == after {
		t.Fatal("the events after did not move")
	}
}

// planApp returns an app on the plan screen of the demo session's first
// round, imported.
func planApp(t testing.TB) *App {
	t.Helper()
	st := newMemStore()
	a := newTestApp(t, st)
	ref := demoSession(t)
	ref.Cylinders[0].Rounds = ref.Cylinders[0].Rounds[:1]
	b, err := encodeSession(ref)
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	if a.Screen() != Plan || a.plan == nil {
		t.Fatalf("imported complete session opened on %s (%q)", a.Screen(), a.planNote)
	}
	return a
}

// TestNextRoundAndHistory: the next round records the plan's changes as
// made before it and asks the port marks again; the rounds list opens the
// plan of an earlier round.
func TestNextRoundAndHistory(t *testing.T) {
	a := planApp(t)
	steps := len(a.plan.Steps)
	tap(t, a, "Next round")
	s := a.Session()
	if n := len(s.Cylinders[0].Rounds); n != 2 || a.Screen() != Measure || a.round != 1 {
		t.Fatalf("next round: %d rounds, screen %s, round %d", n, a.Screen(), a.round+1)
	}
	if got := len(s.Cylinders[0].Rounds[1].AdjustmentsBefore); got == 0 || got > steps {
		t.Fatalf("next round recorded %d changes for a plan of %d steps", got, steps)
	}
	if f := a.fields[a.fi]; f.Label != "Front port mark" {
		t.Fatalf("next round starts at %q", f.Label)
	}
	for _, f := range a.fields {
		if f.Step == "Dead centres" {
			t.Fatal("dead centres asked again in a later round")
		}
	}
	tap(t, a, "Menu")
	tap(t, a, "History of rounds")
	text, _ := drawText(a)
	if !strings.Contains(text, "Round 1, 2026-11-21") || !strings.Contains(text, "Round 2") || !strings.Contains(text, "Before it: valve") {
		t.Fatalf("rounds list:\n%s", text)
	}
	tap(t, a, "Round 1")
	tap(t, a, "Plan from round 1")
	if a.Screen() != Plan || a.plan == nil {
		t.Fatalf("round 1's plan: screen %s, %q", a.Screen(), a.planNote)
	}
	if !a.Back() || a.Screen() != Readings || !a.Back() || a.Screen() != History {
		t.Fatalf("Back from the plan: %s", a.Screen())
	}
}

// TestCautionsFromMenuAndMotionScrub: the cautions are always reachable
// from the menu and Back returns from them; a drag on the motion drawing
// turns the wheel.
func TestCautionsFromMenuAndMotionScrub(t *testing.T) {
	a := planApp(t)
	tap(t, a, "Motion")
	before, _ := drawText(a)
	a.Handle(Intent{Kind: Drag, At: render.Point{X: 200, Y: 400}, Delta: render.Point{X: 40}})
	if a.crankDeg != 40 {
		t.Fatalf("crank at %v after a 40 px drag, want 40", a.crankDeg)
	}
	if after, _ := drawText(a); after == before {
		t.Fatal("the motion drawing did not change with the drag")
	}
	tap(t, a, "Menu")
	tap(t, a, "Cautions")
	if text, _ := drawText(a); a.Screen() != Cautions || !strings.Contains(text, render.CautionsTitle) {
		t.Fatalf("menu's cautions: screen %s", a.Screen())
	}
	tap(t, a, render.AckLabel)
	if a.Screen() != Menu {
		t.Fatalf("after the cautions from the menu: screen %s, want menu", a.Screen())
	}
}
