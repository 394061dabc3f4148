package ui

import (
	"fmt"
	"image/color"
	"maps"
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strings"
	"testing"
	"time"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting"
	"evenbeat/setting/beat"
	"evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
	"evenbeat/setting/trial"
)

// flatText is every text the screen draws, its lines run together.
func flatText(a *App) (string, *recorder.Canvas) {
	text, c := drawText(a)
	return strings.Join(strings.Fields(text), " "), c
}

// fakeMic is a Microphone that counts what it is asked.
type fakeMic struct{ starts, stops int }

func (m *fakeMic) Start() { m.starts++ }
func (m *fakeMic) Stop()  { m.stops++ }

// wholeApp imports s into an app with a microphone and a clock the test
// moves, and shows the whole engine from the plan.
func wholeApp(t *testing.T, s *session.Session) (*App, *memStore, *fakeMic, *time.Time) {
	t.Helper()
	st, mic := newMemStore(), &fakeMic{}
	clock := time.Date(2026, 12, 3, 10, 0, 0, 0, time.UTC)
	a := New(Options{Store: st, Now: func() time.Time { return clock }, Microphone: mic})
	a.Resize(phoneW, phoneH)
	b, err := encodeSession(s)
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	if a.Screen() != Plan {
		t.Fatalf("the session opened on %s", a.Screen())
	}
	tap(t, a, WholeLabel)
	if a.Screen() != Whole {
		t.Fatalf("after %s: screen %s", WholeLabel, a.Screen())
	}
	st.complete()
	a.Update()
	return a, st, mic, &clock
}

// limpingDemo is the invented demo session with the left cylinder's back
// exhaust lap made 1 mm (the engine's are line and line): in the running
// notch its readings then foresee the left back exhaust about 11 degrees
// late, the one beat that stands out.
func limpingDemo(t testing.TB) *session.Session {
	t.Helper()
	s := demoSession(t)
	p, err := setting.ReadEnginePatch([]byte(`{"valve": {"back": {"exhaust_lap": 1}}}`))
	if err != nil {
		t.Fatal(err)
	}
	s.Cylinders[1].Differences = p
	return s
}

// positionOf returns the whole engine's beat of s in the named position,
// worked out as the command line does.
func positionOf(t *testing.T, s *session.Session, name string) beat.Position {
	t.Helper()
	ps, err := beat.Whole(s, plan.AimsOptions(s.Aims), beat.DefaultSteam)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range ps {
		if p.Name == name {
			return p
		}
	}
	t.Fatalf("no position %q", name)
	return beat.Position{}
}

// TestWholeEngineScreen: from the plan, the demo's whole engine shows the
// running notch first: its beat card with every gap today and the
// evenness today and after the plans, each end's work today and after,
// and Listen; another position is a tap away, and a cylinder's button
// goes back to its plan.
func TestWholeEngineScreen(t *testing.T) {
	s := demoSession(t)
	a, _, _, _ := wholeApp(t, s)
	pos := positionOf(t, s, "running notch")
	if on, ok := targetAt(a, "Running notch"); !ok || !on.On {
		t.Fatalf("the running notch is not chosen first (%v)", ok)
	}
	text, _ := flatText(a)
	want := []string{"The whole engine", "Running forward, the right crank leads the left by 90 degrees.", "The beat, running notch", render.BeatFigures(pos, nil), "Work of each end"}
	for _, g := range pos.Now.Gaps {
		want = append(want, fmt.Sprintf("%.1f", g))
	}
	for k, w := range pos.WorkNow {
		want = append(want, fmt.Sprintf("%s %s: %.0f %% today, %.0f %% after the plans", title(w.Cylinder), w.End, w.Share, pos.WorkAfter[k].Share))
	}
	want = append(want, "Cylinder against cylinder")
	for _, sd := range pos.Sides {
		want = append(want, fmt.Sprintf("%s: lead %s today, %s after; cut-off %.1f %% today, %.1f %% after", title(sd.Cylinder), session.FormatLength(sd.LeadNow, session.UnitInch), session.FormatLength(sd.LeadAfter, session.UnitInch), sd.CutOffNow, sd.CutOffAfter))
	}
	for _, w := range want {
		if !strings.Contains(text, w) {
			t.Errorf("the whole engine does not show %q:\n%s", w, text)
		}
	}
	if _, ok := targetAt(a, ListenLabel); !ok {
		t.Error("no Listen button")
	}
	tap(t, a, "Full back")
	if text, _ = flatText(a); !strings.Contains(text, "The beat, full back") {
		t.Errorf("after Full back:\n%s", text)
	}
	tap(t, a, "Left")
	if a.Screen() != Plan || a.cyl != 1 || a.plan == nil {
		t.Fatalf("Left on the whole engine: screen %s, cylinder %d, plan %v", a.Screen(), a.cyl, a.plan != nil)
	}
	if tg, ok := targetAt(a, WholeLabel); !ok || tg.On {
		t.Errorf("the plan's row offers the whole engine %v (chosen %v)", ok, tg.On)
	}
	if a.Back(); a.Screen() == Whole {
		t.Error("Back from the plan returned to the whole engine it was left from by its own row")
	}
}

// TestWholeEngineSaysWhatIsMissing: one cylinder, or a cylinder without
// readings, gives no beat; the screen says what is missing and offers to
// measure the cylinder that lacks readings.
func TestWholeEngineSaysWhatIsMissing(t *testing.T) {
	one := demoSession(t)
	one.Cylinders = one.Cylinders[:1]
	a := newTestApp(t, newMemStore())
	b, err := encodeSession(one)
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	tap(t, a, "Menu")
	tap(t, a, WholeLabel)
	if text, _ := flatText(a); a.Screen() != Whole || !strings.Contains(text, "This engine has one cylinder") {
		t.Errorf("one cylinder, on %s:\n%s", a.Screen(), text)
	}
	if _, ok := targetAt(a, ListenLabel); ok {
		t.Error("Listen offered for one cylinder")
	}

	two := demoSession(t)
	two.Cylinders[1].Rounds = nil
	a, _, _, _ = wholeApp(t, two)
	text, _ := flatText(a)
	if !strings.Contains(text, "The left cylinder has no readings yet") {
		t.Errorf("a cylinder without readings:\n%s", text)
	}
	tap(t, a, "Measure the left cylinder")
	if a.cyl != 1 || (a.Screen() != Measure && a.Screen() != Cautions) {
		t.Errorf("Measure the left cylinder: screen %s, cylinder %d", a.Screen(), a.cyl)
	}
}

// TestDatumsMatchedChoice: the choice that both wheels' datums are at the
// same angle is stored in the session file (with its record in the
// engine's history), and the quartering the marks show appears with its
// caution; taken back, it goes.
func TestDatumsMatchedChoice(t *testing.T) {
	a, st, _, _ := wholeApp(t, demoSession(t))
	text, _ := flatText(a)
	if strings.Contains(text, "Quartering:") || !strings.Contains(text, "a square standing on the frame meets each tyre") {
		t.Errorf("before the choice:\n%s", text)
	}
	tap(t, a, "Datums at the same angle")
	st.complete()
	a.Update()
	stored, raw := storedSession(t, st, a.cur.Key)
	if !stored.Measuring.DatumsMatched || !strings.Contains(string(raw), `"datums_matched": true`) {
		t.Fatalf("the choice is not stored:\n%s", raw)
	}
	if n := len(stored.EngineChanges); n == 0 || stored.EngineChanges[n-1].Key != "measuring.datums_matched" {
		t.Errorf("the engine's history lacks the change: %+v", stored.EngineChanges)
	}
	if tg, _ := targetAt(a, "Datums at the same angle"); !tg.On {
		t.Error("the choice is not shown as made")
	}
	qs, err := beat.Quarterings(stored)
	if err != nil || len(qs) != 1 {
		t.Fatalf("quarterings of the demo: %v, %v", qs, err)
	}
	text, _ = flatText(a)
	for _, w := range []string{fmt.Sprintf("Quartering: the marks put the left crank %.1f° from the right crank", qs[0].Measured), "No valve adjustment cures cranks out of quarter", "fitter's job on the wheels"} {
		if !strings.Contains(text, w) {
			t.Errorf("with the datums matched the screen lacks %q:\n%s", w, text)
		}
	}
	tap(t, a, "Datums at the same angle")
	st.complete()
	a.Update()
	if stored, _ = storedSession(t, st, a.cur.Key); stored.Measuring.DatumsMatched {
		t.Error("the choice taken back is still stored")
	}
	if text, _ = flatText(a); strings.Contains(text, "Quartering:") {
		t.Errorf("the quartering is shown without matched datums:\n%s", text)
	}
}

// synthesised is a recording of pos's beats as its readings foresee them
// (listentest: bursts over roar and hiss, a missed and a spurious beat),
// at 1.5 rev/s slowing 2 %.
func synthesised(pos beat.Position, seconds float64, rate int) []float32 {
	rec := listentest.Synthesise(rand.New(rand.NewPCG(15, 3)), listentest.Take{
		Beats: pos.Now.Beats(), RevPerSec: 1.5, SpeedChange: -0.02, Seconds: seconds, Rate: rate,
		RoarDB: -10, HissDB: -35, Missed: 1, Extra: 1,
	})
	return rec.Samples
}

// untilHeard runs the app's ticks (drawing as the glue does) until the
// analysis is done, failing after a while.
func untilHeard(t *testing.T, a *App) {
	t.Helper()
	for end := time.Now().Add(30 * time.Second); time.Now().Before(end); time.Sleep(time.Millisecond) {
		a.Update()
		if a.Dirty() {
			a.Draw(recorder.New(phoneW, phoneH))
		}
		if a.ListenState() == "ready" {
			return
		}
	}
	t.Fatalf("the analysis did not end: %s", a.ListenState())
}

// TestListenOnTheWholeEngine: Listen shows the cautions and Start; Start
// asks for the microphone, the recording's sign counts the seconds and
// stops by itself at 20; the recording of an engine whose left back
// exhaust comes late is worked out, its gaps kept in the session file and
// drawn on the beat card beside the predicted ones, and the late beat
// named as the left back exhaust, with what to do.
func TestListenOnTheWholeEngine(t *testing.T) {
	s := limpingDemo(t)
	a, st, mic, clock := wholeApp(t, s)
	pos := positionOf(t, s, "running notch")
	if i, _, ok := pos.Now.Odd(1); !ok || pos.Now.Exhausts[i].Label() != "left back" {
		t.Fatalf("the limping demo foresees no late left back exhaust: %v", pos.Now.Gaps)
	}
	tap(t, a, ListenLabel)
	text, _ := flatText(a)
	if a.Screen() != Listen || !strings.Contains(text, "Listen to the beat, running notch") {
		t.Fatalf("Listen: screen %s\n%s", a.Screen(), text)
	}
	for _, c := range listen.Cautions() {
		if !strings.Contains(text, c) {
			t.Errorf("the caution %q is not shown:\n%s", c, text)
		}
	}
	if mic.starts != 0 {
		t.Fatal("the microphone was asked for before Start")
	}
	tap(t, a, StartLabel)
	if mic.starts != 1 || a.ListenState() != "asking" {
		t.Fatalf("Start: %d starts, %s", mic.starts, a.ListenState())
	}
	a.MicOpened()
	a.Update()
	if text, _ = flatText(a); a.ListenState() != "recording" || !strings.Contains(text, "Recording 0 s") {
		t.Fatalf("opened: %s\n%s", a.ListenState(), text)
	}
	*clock = clock.Add(7 * time.Second)
	if !a.Update() {
		t.Error("a second gone by does not draw the seconds again")
	}
	if text, _ = flatText(a); !strings.Contains(text, "Recording 7 s") {
		t.Errorf("after 7 s:\n%s", text)
	}
	*clock = clock.Add(13 * time.Second)
	a.Update()
	if mic.stops != 1 || a.ListenState() != "stopping" {
		t.Fatalf("after 20 s: %d stops, %s", mic.stops, a.ListenState())
	}
	a.Recorded(synthesised(pos, 20, 16000), 16000)
	untilHeard(t, a)
	if a.Screen() != Whole {
		t.Fatalf("after the analysis: screen %s, %q", a.Screen(), a.lis.why)
	}
	st.complete()
	a.Update()
	stored, raw := storedSession(t, st, a.cur.Key)
	if len(stored.Heard) != 1 {
		t.Fatalf("%d heard beats stored:\n%s", len(stored.Heard), raw)
	}
	h := stored.Heard[0]
	if h.Position != "running notch" || h.Date != "2026-12-03" || math.Abs(h.RevPerMin-89.1) > 1 || len(h.GapsDeg) != 4 {
		t.Fatalf("stored %+v", h)
	}
	for i, g := range h.GapsDeg {
		if math.Abs(g-pos.Now.Gaps[i]) > 0.5 {
			t.Errorf("gap %d heard %.2f, foreseen %.2f", i, g, pos.Now.Gaps[i])
		}
	}
	words := a.HeardText()
	foreseen := fmt.Sprintf("(today's readings foresee %.1f, %.1f, %.1f and %.1f°)", pos.Now.Gaps[0], pos.Now.Gaps[1], pos.Now.Gaps[2], pos.Now.Gaps[3])
	heardGaps := fmt.Sprintf("The gaps heard from the %s exhaust on: %.1f, %.1f, %.1f and %.1f°", pos.Now.Exhausts[0].Label(), h.GapsDeg[0], h.GapsDeg[1], h.GapsDeg[2], h.GapsDeg[3])
	for _, w := range []string{"Heard over", "rev/min (the squares)", "The late beat is the left back exhaust", "What to do:", heardGaps, foreseen} {
		if !strings.Contains(words, w) {
			t.Errorf("the words lack %q:\n%s", w, words)
		}
	}
	text, c := flatText(a)
	if !strings.Contains(text, "heard") || !strings.Contains(text, render.BeatFigures(pos, h.GapsDeg)) || !strings.Contains(text, "The late beat is the left back exhaust") {
		t.Errorf("the whole engine after listening:\n%s", text)
	}
	if squares := heardSquares(c, a.theme.Ink); squares != 4+1 { // four beats and the legend's
		t.Errorf("%d heard squares drawn, want 5", squares)
	}
	if took, secs := a.ListenTime(); took <= 0 || secs != 20 {
		t.Errorf("ListenTime %v, %v s", took, secs)
	}
	// Opened again later, the session's gaps are drawn.
	a.lis.heard = nil
	if text, _ = flatText(a); !strings.Contains(text, "Heard on 2026-12-03 at 89 rev/min") || !strings.Contains(text, heardGaps) {
		t.Errorf("the kept gaps are not said:\n%s", text)
	}
}

// heardSquares counts the filled 8 by 8 squares drawn in ink: the heard
// beats' marks.
func heardSquares(c *recorder.Canvas, ink color.RGBA) int {
	n := 0
	for _, op := range c.Ops() {
		if op.Kind != recorder.Fill || len(op.Path) != 5 || op.Fill.Color != ink {
			continue
		}
		p0, p2 := op.Path[0].Pts[0], op.Path[2].Pts[0]
		if math.Abs(p2.X-p0.X-8) < 1e-9 && math.Abs(p2.Y-p0.Y-8) < 1e-9 {
			n++
		}
	}
	return n
}

// TestListenRefusalsBreakNothing: a microphone refused, a browser without
// one, a screen left while recording and a recording too short each say
// a sentence (or keep nothing) and leave the whole engine as it was.
func TestListenRefusalsBreakNothing(t *testing.T) {
	a, _, mic, _ := wholeApp(t, limpingDemo(t))
	tap(t, a, ListenLabel)
	tap(t, a, StartLabel)
	a.MicFailed("The microphone was refused: allow it for this page in the browser's settings, then tap Start again.")
	a.Update()
	text, _ := flatText(a)
	if a.ListenState() != "ready" || !strings.Contains(text, "The microphone was refused") {
		t.Errorf("refused: %s\n%s", a.ListenState(), text)
	}
	if _, ok := targetAt(a, StartLabel); !ok {
		t.Error("Start is not offered again")
	}
	// Left while recording: the microphone is let go, nothing kept.
	tap(t, a, StartLabel)
	a.MicOpened()
	a.Update()
	a.Back()
	a.Update()
	if mic.stops != 1 || a.ListenState() != "ready" || a.Screen() != Whole {
		t.Errorf("left while recording: %d stops, %s, on %s", mic.stops, a.ListenState(), a.Screen())
	}
	a.Recorded(make([]float32, 16000), 16000)
	a.Update()
	if len(a.Session().Heard) != 0 || a.ListenState() != "ready" {
		t.Error("a recording left behind was kept")
	}
	// Too short.
	tap(t, a, ListenLabel)
	tap(t, a, StartLabel)
	a.MicOpened()
	a.Update()
	tap(t, a, "Stop")
	a.Recorded(make([]float32, 8000), 16000)
	untilHeard(t, a)
	if text, _ = flatText(a); a.Screen() != Listen || !strings.Contains(text, "The recording is only 0.50 s long") {
		t.Errorf("too short: on %s\n%s", a.Screen(), text)
	}
	// No microphone at all.
	b := New(Options{Store: newMemStore()})
	b.Resize(phoneW, phoneH)
	raw, _ := encodeSession(limpingDemo(t))
	if err := b.Import(raw); err != nil {
		t.Fatal(err)
	}
	tap(t, b, WholeLabel)
	tap(t, b, ListenLabel)
	if text, _ = flatText(b); !strings.Contains(text, "This browser gives the app no microphone") {
		t.Errorf("no microphone:\n%s", text)
	}
	if _, ok := targetAt(b, StartLabel); ok {
		t.Error("Start offered without a microphone")
	}
}

// withinRate halves a recording made faster than the analysis takes.
func TestWithinRate(t *testing.T) {
	x, r := withinRate([]float32{1, 3, 5, 7, 9, 11, 13, 15}, 192000)
	if r != 48000 || len(x) != 2 || x[0] != 4 || x[1] != 12 {
		t.Errorf("got %v at %d", x, r)
	}
	if x, r = withinRate([]float32{1, 2}, 44100); r != 44100 || len(x) != 2 {
		t.Errorf("44.1 kHz changed: %v at %d", x, r)
	}
}

// pellowmire is a session of an engine that is not the demo: the
// invented Pellowmire Stephenson two-cylinder drawing, each cylinder built
// by the bench with its own errors and read in a first round.
func pellowmire(t *testing.T) *session.Session {
	t.Helper()
	f, err := os.Open("../../testdata/engines/pellowmire-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	spec, err := setting.DecodeEngineSpec(f)
	if err != nil {
		t.Fatal(err)
	}
	r := rand.New(rand.NewPCG(11, 5))
	adj := demoSession(t).Adjustments // a Stephenson gear's, as the demo has them
	var s *session.Session
	for _, c := range spec.Cylinders {
		e, err := trial.FromDrawing(r, spec, trial.Given{WheelMM: 120, ResMM: 0.01, GaugeSign: 1, Adjustments: adj})
		if err != nil {
			t.Fatal(err)
		}
		one, err := e.Session(r, trial.DeadCentresRound())
		if err != nil {
			t.Fatal(err)
		}
		one.Cylinders[0].Name = c.Name
		if s == nil {
			s = one
			continue
		}
		s.Cylinders = append(s.Cylinders, one.Cylinders[0])
	}
	s.Engine.Cylinders = spec.Cylinders
	s.Name = "Pellowmire"
	if len(spec.Notches) > 0 {
		s.Aims.RunningNotch = spec.Notches[0].Name
	}
	return s
}

// threeCylinders is the demo as a three-cylinder engine with cranks 120
// degrees apart, the middle cylinder read as the right.
func threeCylinders(t *testing.T) *session.Session {
	t.Helper()
	s := limpingDemo(t)
	s.Engine.Cylinders = []setting.Cylinder{{Name: "right"}, {Name: "middle", CrankAngle: 120}, {Name: "left", CrankAngle: 240}}
	mid := s.Cylinders[0]
	mid.Name = "middle"
	s.Cylinders = []session.Cylinder{s.Cylinders[0], mid, s.Cylinders[1]}
	return s
}

// TestSameLeadOnEveryCylinder: where the cylinders' mean leads in full
// forward stay apart after their plans (here the left cylinder's laps
// taken 0.06 mm less and its leads read that much more with feelers), the whole engine offers to plan every
// cylinder to one lead, the mean of them; a tap keeps it as the session's
// target lead, which every cylinder's plan then aims at, and the offer
// goes.
func TestSameLeadOnEveryCylinder(t *testing.T) {
	s := demoSession(t)
	s.Aims.TargetLeadMM = nil
	r := &s.Cylinders[1].Rounds[len(s.Cylinders[1].Rounds)-1]
	r.Laps.FrontMM -= 0.06
	r.Laps.BackMM -= 0.06
	for k := range r.FeelerOpenings {
		r.FeelerOpenings[k].OpeningMM += 0.06
	}
	full := positionOf(t, s, session.FullForward)
	if len(full.Sides) != 2 || math.Abs(full.Sides[0].LeadAfter-full.Sides[1].LeadAfter) < 0.04 {
		t.Fatalf("the sides' leads after the plans are not apart: %+v", full.Sides)
	}
	want := (full.Sides[0].LeadAfter + full.Sides[1].LeadAfter) / 2
	a, _, _, _ := wholeApp(t, s)
	tg, ok := targetAt(a, MatchLeadsLabel+": "+session.FormatLength(want, a.unit()))
	if !ok {
		text, _ := flatText(a)
		t.Fatalf("no offer of one lead for every cylinder (%s):\n%s", session.FormatLength(want, a.unit()), text)
	}
	tg.act()
	got := a.Session().Aims.TargetLeadMM
	if got == nil || math.Abs(*got-want) > 1e-9 {
		t.Fatalf("the target lead kept is %v; want %.4f mm", got, want)
	}
	if _, ok := targetAt(a, MatchLeadsLabel+": "+session.FormatLength(want, a.unit())); ok {
		t.Error("the offer stays once every cylinder is planned to one lead")
	}
	// The demo's sheaves turn in whole steps, so the lead is met only to
	// a step; each plan says where it is not met and what it gives.
	after := positionOf(t, a.Session(), session.FullForward)
	apart := func(p beat.Position) float64 { return math.Abs(p.Sides[0].LeadAfter - p.Sides[1].LeadAfter) }
	if apart(after) > apart(full) {
		t.Errorf("planned to one lead, the sides' leads in full forward are %.3f mm apart, further than before (%.3f)", apart(after), apart(full))
	}
	for i := range a.Session().Cylinders {
		a.cyl = i
		a.makePlan()
		if a.plan == nil {
			t.Fatalf("no plan for cylinder %d: %q", i, a.planNote)
		}
		if !slices.ContainsFunc(a.plan.Notes, func(n string) bool {
			return strings.Contains(n, "target lead of "+session.FormatLength(want, a.unit()))
		}) {
			t.Errorf("cylinder %d's plan says nothing of the target lead: %q", i, a.plan.Notes)
		}
	}
}

// TestSidesDieMovesOnTheWholeEngine: an engine whose left side's die
// stands out of place in the running notch (its reversing linkage off),
// read with the cut-offs at the crosshead on both sides, shows on the
// whole engine how far each side's die wants to move to cut off alike,
// in the session's unit: mm, then inches.
func TestSidesDieMovesOnTheWholeEngine(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 5))
	var right trial.Engine
	var err error
	for try := 0; try < 20; try++ {
		if right, err = trial.NewEngine(r, setting.KindStephenson, trial.Options{}); err == nil {
			break
		}
	}
	if err != nil {
		t.Fatal(err)
	}
	left := right
	left.RevErr = maps.Clone(right.RevErr)
	notch := setting.Reverser(right.Drawing.Notches[0].Reverser)
	left.RevErr[notch] += 0.06
	rd := trial.Round{Wild: -1, Tyre: true, CutOffs: true}
	s, err := right.Session(r, rd)
	if err != nil {
		t.Fatal(err)
	}
	sl, err := left.Session(r, rd)
	if err != nil {
		t.Fatal(err)
	}
	s.Engine.Cylinders = []setting.Cylinder{{Name: "right"}, {Name: "left", CrankAngle: -90}}
	c := sl.Cylinders[0]
	c.Name = "left"
	s.Cylinders = append(s.Cylinders, c)
	pos := positionOf(t, s, right.Drawing.Notches[0].Name)
	moves, _, ok := pos.DieMoves()
	if !ok || math.Abs(pos.Sides[0].CutOffAfter-pos.Sides[1].CutOffAfter) < 1 {
		t.Fatalf("the sides are not told apart in the notch: %+v", pos.Sides)
	}
	for _, unit := range []session.Unit{session.UnitMM, session.UnitInch} {
		s.DisplayUnit = unit
		a, _, _, _ := wholeApp(t, s)
		text, _ := flatText(a)
		for k, sd := range pos.Sides {
			way := "further from"
			if moves[k] < 0 {
				way = "nearer to"
			}
			want := "the " + sd.Cylinder + " die about " + session.FormatLength(math.Abs(moves[k]), unit) + " " + way + " the middle of its link"
			if !strings.Contains(text, want) {
				t.Errorf("%v: the whole engine lacks %q:\n%s", unit, want, text)
			}
		}
		// The shared report says it too.
		rm := render.WholeEngine(a.Session(), a.model, plan.AimsOptions(a.Session().Aims))
		c := recorder.New(render.ReportWidth, render.ReportHeight(render.ReportWidth, rm))
		render.Report(c, rm, render.Light())
		report := strings.Join(strings.Fields(recordedText(c)), " ")
		if !strings.Contains(report, "die about "+session.FormatLength(math.Abs(moves[0]), unit)) {
			t.Errorf("%v: the report does not say how far the dies want to move:\n%s", unit, report)
		}
	}
}
