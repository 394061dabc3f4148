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
