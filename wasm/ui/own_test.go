package ui

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
	"evenbeat/setting/trial"
)

// kestrel is what a setter knows of an invented 5 in gauge engine with
// Stephenson gear and slide valves, in mm, by the app's words for each
// question: a value typed, or the label of the answer chosen.
func kestrel() map[string]string {
	return map[string]string{
		"Gauge reading grows": "As the valve moves forward", "The valve": "Slide valve (steam outside)",
		"Stroke": "44", "Connecting rod": "132", "Wheel diameter": "115", "Steam lap": "2.4", "Exhaust lap": "0",
		"Port width": "2.4", "Lead as drawn": "0.25", "The eccentric rods": "Open rods", "Valve travel": "10.4",
		"Eccentric rods": "130", "Link radius": "130", "Link pin spacing": "36", "Reverse arm": "30", "Lifting link": "45",
		"Running notch": "40", "Valve spindle: thread pitch": "0.7", "Valve spindle: steps a turn": "6 (hex nut)",
		"Valve spindle: limit": "1.5", "Rod lengths": "Yes, on the spindle's thread", "The eccentric sheaves": "Fixed",
	}
}

// setUpOwn sets up a new engine with the answers given (the gear's button
// and the unit first), through its sheet and the cautions, to its first
// reading; each answer must be taken.
func setUpOwn(t testing.TB, a *App, gear string, inch bool, answers map[string]string) {
	t.Helper()
	setUpOwnTo(t, a, gear, inch, answers, Measure)
}

// setUpOwnTo sets up a new engine as setUpOwn does, as far as the screen
// until (the engine's sheet, or the first reading).
func setUpOwnTo(t testing.TB, a *App, gear string, inch bool, answers map[string]string, until Screen) {
	t.Helper()
	tap(t, a, "New engine")
	tap(t, a, gear)
	if inch {
		tap(t, a, "inch")
	}
	tap(t, a, "Next")
	for a.Screen() == Sizes {
		f := a.fields[a.fi]
		ans, ok := answers[f.Label]
		if !ok {
			t.Fatalf("no answer for %q", f.Label)
		}
		if len(f.Choices) > 0 {
			tap(t, a, ans)
		} else {
			typeKeys(t, a, ans)
			if !wholeFraction(ans) {
				tap(t, a, "Next")
			}
		}
		if a.Screen() == Sizes && a.fields[a.fi].Label == f.Label {
			t.Fatalf("%s: %q not taken: %s", f.Label, ans, a.Note())
		}
	}
	if a.Screen() != EngineSheet {
		t.Fatalf("after the questions: screen %s", a.Screen())
	}
	if until == EngineSheet {
		return
	}
	tap(t, a, "Next: start measuring")
	if a.Screen() == Cautions {
		tap(t, a, render.AckLabel)
	}
	if a.Screen() != Measure {
		t.Fatalf("after the set-up: screen %s", a.Screen())
	}
}

// benchEngine builds the engine the app worked out on the bench, with
// build errors, measured as set up.
func benchEngine(t testing.TB, s *session.Session, seed uint64) (trial.Engine, *rand.Rand) {
	t.Helper()
	r := rand.New(rand.NewPCG(seed, 1))
	sign := 1.0
	if s.Measuring.GaugeIncreases == session.GaugeBack {
		sign = -1
	}
	e, err := trial.FromDrawing(r, s.Engine, trial.Given{WheelMM: s.Measuring.WheelDiameterMM, ResMM: s.Measuring.GaugeResolutionMM, GaugeSign: sign, Adjustments: s.Adjustments})
	if err != nil {
		t.Fatal(err)
	}
	return e, r
}

// typeRound types the readings the keypad asks from the bench's round
// (its round 0, read as round ri of the app), in mm, until the plan.
func typeRound(t testing.TB, a *App, sim *session.Session, ri int) {
	t.Helper()
	for len(sim.Cylinders[0].Rounds) <= ri {
		sim.Cylinders[0].Rounds = append([]session.Round{{}}, sim.Cylinders[0].Rounds...)
	}
	for a.Screen() == Measure {
		f := a.fields[a.fi]
		v, ok := f.get(sim)
		if !ok {
			t.Fatalf("the bench's round has no %s", f.Key)
		}
		if v < 0 && strings.Contains(f.Key, "marks_tyre_mm") {
			v += math.Pi * sim.Measuring.WheelDiameterMM
		}
		typeKeys(t, a, formatNumber(v, a.unit() == session.UnitInch))
		tap(t, a, "Next")
	}
	if a.Screen() != Plan || a.plan == nil {
		t.Fatalf("after the round: screen %s, %q", a.Screen(), a.planNote)
	}
}

// TestEditEngineKeepsReadings: after two rounds of an own engine, the
// connecting rod is changed and the unit with it from the engine's sheet
// and the units screen: every reading is kept, the change is in the
// engine's history, the derived parts are worked out again and the plan
// is made again for the engine as it now is.
func TestEditEngineKeepsReadings(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	setUpOwn(t, a, "Stephenson", false, kestrel())
	e, r := benchEngine(t, a.Session(), 5)
	for ri := range 2 {
		sim, err := e.Session(r, trial.DeadCentresRound())
		if err != nil {
			t.Fatal(err)
		}
		typeRound(t, a, sim, ri)
		if ri == 0 {
			tap(t, a, "Next round")
		}
	}
	before, err := encodeSession(a.Session())
	if err != nil {
		t.Fatal(err)
	}
	oldPlan, oldRod := a.PlanText(), a.Session().Engine.Gear.Stephenson.Backward.Rod
	rounds := a.Session().Cylinders[0].Rounds
	tap(t, a, "Menu")
	tap(t, a, "Edit the engine")
	if a.Screen() != EngineSheet {
		t.Fatalf("Edit the engine: screen %s", a.Screen())
	}
	tap(t, a, "Connecting rod: 132 mm")
	typeKeys(t, a, "135")
	tap(t, a, "Next")
	if a.Screen() != EngineSheet || a.Session().Engine.Engine.RodLength != 135 {
		t.Fatalf("after the new rod: screen %s, rod %v (%q)", a.Screen(), a.Session().Engine.Engine.RodLength, a.Note())
	}
	tap(t, a, "Done")
	tap(t, a, "Menu")
	tap(t, a, "Units and dial gauge")
	tap(t, a, "inch")
	tap(t, a, "Done")
	s := a.Session()
	if s.DisplayUnit != session.UnitInch {
		t.Fatal("the unit did not change")
	}
	for ri, r := range rounds {
		got, want := s.Cylinders[0].Rounds[ri], r
		if len(got.DeadCentreReadings) != len(want.DeadCentreReadings) || (got.PortMarks == nil) != (want.PortMarks == nil) {
			t.Errorf("round %d changed: %+v", ri+1, got)
		}
	}
	if len(s.Cylinders[0].Rounds) != 2 || len(s.Cylinders[0].DeadCentres) != len(decodeOrFatal(t, before).Cylinders[0].DeadCentres) {
		t.Errorf("readings lost: %d rounds", len(s.Cylinders[0].Rounds))
	}
	keys := map[string]bool{}
	for _, c := range s.EngineChanges {
		keys[c.Key] = true
	}
	if !keys["engine.engine.rod_length"] || !keys["display_unit"] {
		t.Errorf("the engine's history lacks the changes: %+v", s.EngineChanges)
	}
	if s.Engine.Gear.Stephenson.Backward.Rod == oldRod {
		t.Error("the backward rod, derived, was not worked out again for the new connecting rod")
	}
	tap(t, a, "Menu")
	tap(t, a, "Plan")
	if a.plan == nil {
		t.Fatalf("no plan after the edit: %q", a.planNote)
	}
	if got := a.PlanText(); got == oldPlan || !strings.Contains(got, " in") {
		t.Errorf("the plan was not made again for the engine as edited, in inches:\n%s", got)
	}
	st.complete()
	a.Update()
	if a.Status() != "Saved" {
		t.Errorf("status %q", a.Status())
	}
	if p, err := plan.Make(decodeOrFatal(t, st.data[a.cur.Key]), plan.Options{}); err != nil || len(p.Now) == 0 {
		t.Errorf("the stored session plans: %v", err)
	}
}

// decodeOrFatal decodes a session file.
func decodeOrFatal(t testing.TB, b []byte) *session.Session {
	t.Helper()
	s, err := decodeSession(b)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// TestSameLeadOnEveryScreen: for the round planned, the history of
// rounds, the plan's valve curve and its words give the same full-forward
// leads (the readings' own, which the plan works from).
func TestSameLeadOnEveryScreen(t *testing.T) {
	a := newTestApp(t, newMemStore())
	setUpOwn(t, a, "Stephenson", false, kestrel())
	e, r := benchEngine(t, a.Session(), 9)
	sim, err := e.Session(r, trial.DeadCentresRound())
	if err != nil {
		t.Fatal(err)
	}
	typeRound(t, a, sim, 0)
	tap(t, a, "Curve")
	curve, _ := drawText(a)
	i := strings.Index(curve, "Today: lead front ")
	if i < 0 {
		t.Fatalf("the curve gives no lead:\n%s", curve)
	}
	front, back, _ := strings.Cut(strings.TrimPrefix(curve[i:], "Today: lead front "), ", back ")
	back, _, _ = strings.Cut(back, ";")
	tap(t, a, "Rounds")
	history, _ := drawText(a)
	// The round's table: full forward's row, its leads front and back
	// bare under the column's unit.
	bare := func(l string) string { return strings.Fields(l)[0] }
	if !strings.Contains(history, "full forward\n"+bare(front)+"\n"+bare(back)+"\n") {
		t.Errorf("the curve says front %s, back %s; the history:\n%s", front, back, history)
	}
	if words := a.PlanText(); !strings.Contains(words, front) || !strings.Contains(words, back) {
		t.Errorf("the plan's words do not give front %s, back %s:\n%s", front, back, words)
	}
}

// TestSetUpSurvivesAReload: the answers given to a new engine's set-up
// are kept (a draft, until the engine is whole) and a reload carries on
// where it stopped, every answer and form as given.
func TestSetUpSurvivesAReload(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	tap(t, a, "New engine")
	tap(t, a, "Stephenson")
	tap(t, a, "inch")
	if err := a.Rename("Kestrel"); err != nil {
		t.Fatal(err)
	}
	tap(t, a, "Next")
	tap(t, a, "As the valve moves back")
	tap(t, a, "Slide valve")
	typeKeys(t, a, "1 3/4") // the stroke, in as the fraction is whole
	typeKeys(t, a, "5 1/4")
	st.complete()
	b := New(Options{Store: st})
	b.Resize(phoneW, phoneH)
	tap(t, b, "Carry on setting up Kestrel")
	tap(t, b, "Next")
	if b.Field() != "Wheel diameter" {
		t.Fatalf("carried on at %q", b.Field())
	}
	s := b.Session()
	if s.DisplayUnit != session.UnitInch || s.Measuring.GaugeIncreases != session.GaugeBack || math.Abs(s.Engine.Engine.CrankRadius-22.225) > 1e-9 || math.Abs(s.Engine.Engine.RodLength-133.35) > 1e-9 {
		t.Errorf("the draft came back as %+v, %+v", s.Measuring, s.Engine.Engine)
	}
	if len(b.StoredSessions()) != 0 {
		t.Errorf("an engine half set up was stored as a session")
	}
}

// TestWordsAtTheEngine: the port-mark steps follow the admission (with
// steam outside, as on a slide valve, the valve moves back to crack the
// front port and forward for the back; with steam inside, the other way)
// and say how to move it; in an inch session no step of a round speaks of
// mm; once both marks of a dead centre are in, the next step gives the
// dead centre as a tyre mark, and a half-typed pair draws no warning.
func TestWordsAtTheEngine(t *testing.T) {
	for _, c := range []struct {
		valve       string
		front, back string
	}{{"Slide valve (steam outside)", "Move the valve back", "move the valve forward"}, {"Piston valve (steam inside)", "Move the valve forward", "move the valve back"}} {
		answers := kestrel()
		answers["The valve"], answers["Piston valve diameter"] = c.valve, "16"
		a := newTestApp(t, newMemStore())
		setUpOwn(t, a, "Stephenson", false, answers)
		front, back := portMarkWords(a.Session())
		if !strings.HasPrefix(front, c.front) || !strings.Contains(back, c.back) || !strings.Contains(front, "turn the wheels, or push the valve with its rod disconnected") {
			t.Errorf("%s: port marks say %q / %q", c.valve, front, back)
		}
	}
	a := newTestApp(t, newMemStore())
	setUpOwn(t, a, "Stephenson", false, kestrel())
	tap(t, a, "Menu")
	tap(t, a, "Units and dial gauge")
	tap(t, a, "inch")
	tap(t, a, "Done")
	a.syncFields()
	for _, f := range a.fields {
		if strings.Contains(f.Say, "mm") {
			t.Errorf("%s says %q in an inch session", f.Label, f.Say)
		}
	}
	for i := 0; a.Field() != "Front dead centre turning forward, first mark"; i++ {
		if i == 40 {
			t.Fatalf("no tyre mark asked after 40 fields; at %q (%s) with %q, note %q, text %q", a.Field(), a.screen, a.warn, a.note, a.text)
		}
		if a.Field() == "Back port mark" {
			typeKeys(t, a, ".389") // the front mark and the laps (0.189 in) apart
		} else {
			typeKeys(t, a, ".2")
		}
		tap(t, a, "Next")
	}
	typeKeys(t, a, "6")
	tap(t, a, "Next")
	if a.warn != "" {
		t.Errorf("a half-typed pair was judged: %q", a.warn)
	}
	typeKeys(t, a, "7 1/2")
	text, _ := drawText(a)
	if !strings.Contains(text, "Front dead centre found: 6 3/4 in round the tyre") {
		t.Errorf("the dead centre is not given as a tyre mark:\n%s", text)
	}
}

// TestDraftKeepsTheForms: a draft taken back gives every value as it was
// given in the form it was asked in: the throw rather than the travel, a
// pitch in an inch session, the laps of each end apart.
func TestDraftKeepsTheForms(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	tap(t, a, "New engine")
	tap(t, a, "Stephenson")
	tap(t, a, "inch")
	tap(t, a, "Next")
	answers := map[string]string{"Gauge reading grows": "As the valve moves forward", "The valve": "Slide valve (steam outside)", "Stroke": "1 3/4", "Connecting rod": "5 1/4",
		"Wheel diameter": "4 1/2", "Front steam lap": "3/32", "Back steam lap": "1/8", "Exhaust lap": "0", "Port width": "3/32", "Lead as drawn": "1/64",
		"The eccentric rods": "Open rods", "Eccentric throw": "13/64"}
	for a.Field() != "Eccentric rods" {
		f := a.fields[a.fi]
		switch {
		case f.Label == "Steam lap":
			tap(t, a, "Front and back differ")
		case f.Label == "Valve travel":
			tap(t, a, "Eccentric throw instead")
		case len(f.Choices) > 0:
			tap(t, a, answers[f.Label])
		default:
			typeKeys(t, a, answers[f.Label])
			if !wholeFraction(answers[f.Label]) {
				tap(t, a, "Next")
			}
		}
	}
	want := a.Session().Engine
	st.complete()
	b := New(Options{Store: st})
	b.Resize(phoneW, phoneH)
	tap(t, b, "Carry on setting up")
	got := b.Session().Engine
	if got.Valve != want.Valve || *got.Gear.Stephenson != *want.Gear.Stephenson || got.Engine != want.Engine || got.Design.Lead != want.Design.Lead {
		t.Errorf("the draft came back as\n%+v %+v\nwant\n%+v %+v", got.Valve, *got.Gear.Stephenson, want.Valve, *want.Gear.Stephenson)
	}
}
