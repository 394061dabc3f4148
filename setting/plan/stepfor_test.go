package plan

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"evenbeat/setting/session"
)

// adjustmentFor returns the session's adjustment a step changes.
func adjustmentFor(t *testing.T, adjs []session.Adjustment, st Step) session.Adjustment {
	t.Helper()
	for _, a := range adjs {
		if a.Kind == st.Kind && a.Eccentric == st.Eccentric {
			return a
		}
	}
	t.Fatalf("no adjustment for step %q", st.Words)
	return session.Adjustment{}
}

// TestStepForWordsAsPlan: for every step of the example session's plans
// (both cylinders, each round, the other priority's steps too, and with a
// target lead so the sheaves turn), StepFor of the step's adjustment and
// amount is the same step, worded as WriteText words it in mm and in
// inches; only the plan's "+/-" from the readings is not there, since a
// change chosen by hand carries none.
func TestStepForWordsAsPlan(t *testing.T) {
	s := exampleSession(t)
	target := 0.4
	kinds := map[session.AdjustmentKind]bool{}
	n := 0
	for cyl := range s.Cylinders {
		for round := 1; round <= len(s.Cylinders[cyl].Rounds); round++ {
			for _, lead := range []*float64{nil, &target} {
				p, err := Make(s, Options{Cylinder: cyl, Fit: FitOptions{Round: round}, TargetLeadMM: lead})
				if err != nil {
					t.Logf("cylinder %d round %d: %v", cyl, round, err)
					continue
				}
				steps := append([]Step(nil), p.Steps...)
				if p.Other != nil {
					steps = append(steps, p.Other.Steps...)
				}
				for _, unit := range []session.Unit{session.UnitMM, session.UnitInch} {
					var text bytes.Buffer
					if err := WriteText(&text, p, unit); err != nil {
						t.Fatal(err)
					}
					for _, st := range steps {
						got := StepFor(adjustmentFor(t, s.Adjustments, st), st.Amount, unit)
						want := st
						want.SigmaAmount, want.IdealAmount = 0, st.Amount
						want.Words = stepWords(want, unit)
						if got != want {
							t.Errorf("cylinder %d round %d, %s:\n got %+v\nwant %+v", cyl, round, unit, got, want)
						}
						// WriteText's line is StepFor's words with the
						// plan's +/- after the amount.
						if line := withSigma(got.Words, stepWords(st, unit)); !strings.Contains(text.String(), ". "+line+"\n") {
							t.Errorf("WriteText has no step worded %q:\n%s", line, text.String())
						}
						kinds[st.Kind] = true
						n++
					}
				}
			}
		}
	}
	t.Logf("%d steps compared, kinds %v", n, kinds)
	if n == 0 {
		t.Fatal("the example session's plans have no steps to compare")
	}
	for _, k := range []session.AdjustmentKind{session.ValveOnSpindle, session.EccentricAngle} {
		if !kinds[k] {
			t.Errorf("no plan step of kind %s was compared (kinds %v)", k, kinds)
		}
	}
}

// withSigma puts the +/- of the plan's words planned into words (a
// step's words without one) before the colon that begins the how, or
// returns words as they are when planned has no +/-.
func withSigma(words, planned string) string {
	i := strings.Index(planned, " (+/- ")
	if i < 0 {
		return words
	}
	sigma := planned[i : i+strings.Index(planned[i:], ")")+1]
	return strings.Replace(words, ": ", sigma+": ", 1)
}

// TestStepForThread: a change on a thread rounds to whole flats. A fork
// end on a 40 TPI thread, lined up every half turn (2 flats a turn), moves
// 1/40 in a turn, so 1/80 in (0.3175 mm) a flat; the spindle's M4 nut, 0.7
// mm pitch with 6 flats, moves 0.7/6 mm a flat (common practice
// arithmetic, no source: pitch over flats per turn).
func TestStepForThread(t *testing.T) {
	fork := session.Adjustment{Kind: session.EccentricRodLength, Eccentric: session.ForwardEccentric, Min: -1.5, Max: 1.5,
		Thread: session.Thread{TPI: 40, FlatsPerTurn: 2}}
	nut := session.Adjustment{Kind: session.ValveOnSpindle, Min: -1.5, Max: 1.5, Thread: session.Thread{PitchMM: 0.7, FlatsPerTurn: 6}}
	perFlat := 25.4 / 80
	cases := []struct {
		name         string
		adj          session.Adjustment
		amount       float64
		unit         session.Unit
		want         float64
		turns, flats int
		words        string
	}{
		{"one flat of the fork end", fork, 0.3, session.UnitMM, perFlat, 0, 1,
			"Lengthen the forward eccentric rod 0.32 mm: take out the pin of its fork end, slacken the fork's lock nut, screw the fork out half a turn, anticlockwise seen from the fork end (right-hand thread), then pin it and lock the nut again."},
		{"three flats, shorter", fork, -0.9, session.UnitMM, -3 * perFlat, 1, 1,
			"Shorten the forward eccentric rod 0.95 mm: take out the pin of its fork end, slacken the fork's lock nut, screw the fork in 1 and a half turns, clockwise seen from the fork end (right-hand thread), then pin it and lock the nut again."},
		{"two whole turns in inches", fork, 1.3, session.UnitInch, 4 * perFlat, 2, 0,
			"Lengthen the forward eccentric rod 0.050 in: take out the pin of its fork end, slacken the fork's lock nut, screw the fork out 2 turns, anticlockwise seen from the fork end (right-hand thread), then pin it and lock the nut again."},
		{"two flats of the nut", nut, 0.25, session.UnitMM, 2 * 0.7 / 6, 0, 2,
			"Move the valve 0.23 mm toward the front cover on its spindle: back the nut in front of the valve off a turn, turn the nut behind it 2 flats anticlockwise seen from the front of the engine (right-hand thread) to push the valve forward, then run the first nut back up to the valve and lock it."},
		{"a turn and a flat back", nut, -0.8, session.UnitMM, -7 * 0.7 / 6, 1, 1,
			"Move the valve 0.82 mm toward the back (crank) end on its spindle: back the nut behind the valve off a turn, turn the nut in front of it 1 turn and 1 flat clockwise seen from the front of the engine (right-hand thread) to push the valve back, then run the first nut back up to the valve and lock it."},
		{"held at the limit by whole flats", nut, 5, session.UnitMM, 12 * 0.7 / 6, 2, 0,
			"Move the valve 1.40 mm toward the front cover on its spindle, as far as the profile allows: back the nut in front of the valve off a turn, turn the nut behind it 2 turns anticlockwise seen from the front of the engine (right-hand thread) to push the valve forward, then run the first nut back up to the valve and lock it."},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			st := StepFor(c.adj, c.amount, c.unit)
			if math.Abs(st.Amount-c.want) > 1e-12 || st.IdealAmount != c.amount {
				t.Errorf("amount %v (ideal %v), want %v (ideal %v)", st.Amount, st.IdealAmount, c.want, c.amount)
			}
			if st.Turns != c.turns || st.Flats != c.flats {
				t.Errorf("%d turns %d flats, want %d and %d", st.Turns, st.Flats, c.turns, c.flats)
			}
			if st.Words != c.words {
				t.Errorf("words\n got %q\nwant %q", st.Words, c.words)
			}
		})
	}
}

// TestStepForRim: an eccentric sheave of 30 mm turns pi x 30 / 360 mm
// round its rim a degree (geometry: arc = angle x radius), and a plan turns
// it by whole 0.5 mm marks on the rim.
func TestStepForRim(t *testing.T) {
	sheave := session.Adjustment{Kind: session.EccentricAngle, Eccentric: session.BackwardEccentric, Min: -8, Max: 8, SheaveDiameterMM: 30}
	perDeg := math.Pi * 30 / 360
	markDeg := 0.5 / perDeg
	st := StepFor(sheave, -2, session.UnitMM)
	if math.Abs(st.Amount+markDeg) > 1e-9 || math.Abs(st.RimMM+0.5) > 1e-9 || math.Abs(st.RimMM-st.Amount*perDeg) > 1e-12 {
		t.Errorf("amount %v deg, rim %v mm; want %v deg, -0.5 mm", st.Amount, st.RimMM, -markDeg)
	}
	if math.Abs(sheave.RimMM(st.Amount)-st.RimMM) > 1e-12 {
		t.Errorf("session's RimMM %v, the step's %v", sheave.RimMM(st.Amount), st.RimMM)
	}
	want := "Retard the backward eccentric sheave 1.91 deg: scribe a mark across sheave and axle, slacken the sheave's grub screws, turn it 0.50 mm round the rim the way the wheels turn running forward (clockwise seen from the engine's right-hand side), and tighten the screws again."
	if st.Words != want || st.Unit != "deg" {
		t.Errorf("words\n got %q (%s)\nwant %q", st.Words, st.Unit, want)
	}
	// Three marks: 1.5 mm round the rim, in inches 0.059 in.
	if st := StepFor(sheave, 3*markDeg+0.2, session.UnitInch); math.Abs(st.RimMM-1.5) > 1e-9 || !strings.Contains(st.Words, "turn it 0.059 in round the rim the way the wheels turn running backward (anticlockwise seen from the engine's right-hand side)") {
		t.Errorf("three marks: rim %v mm, %q", st.RimMM, st.Words)
	}
}

// TestStepForTooSmall: a change under half a step, or not a number, is no
// change, and the words say why; nothing is NaN.
func TestStepForTooSmall(t *testing.T) {
	nut := session.Adjustment{Kind: session.ValveOnSpindle, Min: -1.5, Max: 1.5, Thread: session.Thread{PitchMM: 0.7, FlatsPerTurn: 6}}
	crank := session.Adjustment{Kind: session.ReturnCrankAngle, Min: -2, Max: 2}
	for _, c := range []struct {
		adj    session.Adjustment
		amount float64
		words  string
	}{
		{nut, 0.05, "Leave the valve on its spindle as it is: the change is under half its smallest step, each flat of its thread (0.12 mm)."},
		{nut, math.NaN(), "Leave the valve on its spindle as it is"},
		{nut, math.Inf(-1), "Leave the valve on its spindle as it is"},
		{crank, -0.1, "Leave the return crank as it is: the change is under half its smallest step, each 0.25 deg."},
	} {
		st := StepFor(c.adj, c.amount, session.UnitMM)
		if st.Amount != 0 || st.AtLimit || !strings.HasPrefix(st.Words, c.words) || strings.Contains(st.Words, "NaN") || !finite(st.IdealAmount) {
			t.Errorf("StepFor(%s, %v) = %+v", c.adj.Kind, c.amount, st)
		}
	}
	if st := StepFor(crank, -0.3, session.UnitMM); st.Words != "Turn the return crank 0.25 deg against the forward running direction: scribe a mark across crank and crankpin, slacken the return crank's pinch bolt, turn it anticlockwise seen from the engine's right-hand side, and tighten the bolt again." {
		t.Errorf("return crank: %q", st.Words)
	}
}
