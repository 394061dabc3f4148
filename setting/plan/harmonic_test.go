package plan

import (
	"bytes"
	"math"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Fit (b), without the gear's dimensions: the harmonic curve of a
// simulated single-eccentric engine's full-forward sweep gives its leads,
// and the spindle correction makes them equal on the true engine.
func TestHarmonicFitLeadsAndSpindle(t *testing.T) {
	kind := setting.KindSingleEccentric
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 15, testAdjustments(kind))
	obs, err := roundObservations(s, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	h, err := FitHarmonic(obs)
	if err != nil {
		t.Fatal(err)
	}
	truth := sim.events(t)[0]
	set, err := h.Events(sim.spec.Engine, sim.spec.Valve, 0, setting.Forward, 0)
	if err != nil {
		t.Fatal(err)
	}
	// A single eccentric with a long rod is nearly two harmonics: 0.02 mm.
	if d := math.Abs(set.Front.Lead - truth.Front.Lead); d > 0.02 {
		t.Errorf("front lead %.3f, true %.3f", set.Front.Lead, truth.Front.Lead)
	}
	if d := math.Abs(set.Back.Lead - truth.Back.Lead); d > 0.02 {
		t.Errorf("back lead %.3f, true %.3f", set.Back.Lead, truth.Back.Lead)
	}
	d, err := h.SpindleCorrection(sim.spec.Engine, sim.spec.Valve, 0, setting.Forward)
	if err != nil {
		t.Fatal(err)
	}
	after := sim
	after.dev.ValveOffsetMM += d
	a := after.events(t)[0]
	if math.Abs(a.Front.Lead-a.Back.Lead) > 0.03 {
		t.Errorf("after the spindle correction %.3f mm the leads are %.3f and %.3f", d, a.Front.Lead, a.Back.Lead)
	}
	// Phase: advance to a mean lead of 0.2 mm.
	ph, err := h.PhaseCorrection(sim.spec.Engine, sim.spec.Valve, 0, setting.Forward, 0.2)
	if err != nil {
		t.Fatal(err)
	}
	after.dev.EccentricDeg[0] += ph
	a = after.events(t)[0]
	if m := (a.Front.Lead + a.Back.Lead) / 2; math.Abs(m-0.2) > 0.03 {
		t.Errorf("after advancing %.2f deg the mean lead is %.3f, want 0.2", ph, m)
	}
	// A knocked reading is named.
	s.Cylinders[0].Rounds[0].Sweeps[0].Readings[5].GaugeMM += 0.4
	obs, _ = roundObservations(s, 0, 0)
	h, err = FitHarmonic(obs)
	if err != nil {
		t.Fatal(err)
	}
	if len(h.Recheck) == 0 || h.Recheck[0].Field != "cylinders[0].rounds[0].sweeps[0].readings[5]" {
		t.Errorf("recheck %+v", h.Recheck)
	}
}

// Planning without dimensions: on the simulated Stephenson engine the
// backward rod, set last, equalises the full-back leads within 0.05 mm
// (the rod is taken to move the valve one for one in full gear, the die
// at its pin; on the test engine it does a few per cent less);
// the full-forward leads, set first by the spindle, move a little with the
// backward rod (on the test engine the die stands a few per cent short of
// the forward rod's pin, so the backward rod has a few per cent of its
// effect there): within 0.1 mm, and the plan says to check them. On the
// single eccentric a target lead is met.
func TestMakeWithoutDimensions(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 15, testAdjustments(kind))
	p, err := MakeWithoutDimensions(s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Steps) != 2 || p.Steps[0].Kind != session.ValveOnSpindle || p.Steps[1].Kind != session.EccentricRodLength {
		t.Fatalf("steps %+v", p.Steps)
	}
	after := sim.after(t, p.Steps).events(t)
	for i, tol := range map[int]float64{0: 0.1, 2: 0.05} {
		if d := math.Abs(after[i].Front.Lead - after[i].Back.Lead); d > tol {
			t.Errorf("position %d: leads %.3f and %.3f after the plan", i, after[i].Front.Lead, after[i].Back.Lead)
		}
	}
	before := sim.events(t)
	for _, i := range []int{0, 2} {
		if math.Abs(after[i].Front.Lead-after[i].Back.Lead) > math.Abs(before[i].Front.Lead-before[i].Back.Lead) {
			t.Errorf("position %d: the plan made the leads worse", i)
		}
	}
	var buf bytes.Buffer
	if err := WriteJSON(&buf, p, session.UnitMM); err != nil {
		t.Fatal(err)
	}
	scanFinite(t, buf.Bytes())

	kind = setting.KindSingleEccentric
	sim = simulated{spec: testSpec(t, kind), dev: injected(kind)}
	target := 0.25
	p, err = MakeWithoutDimensions(sim.session(t, 15, testAdjustments(kind)), Options{TargetLeadMM: &target})
	if err != nil {
		t.Fatal(err)
	}
	a := sim.after(t, p.Steps).events(t)[0]
	if m := (a.Front.Lead + a.Back.Lead) / 2; math.Abs(m-target) > 0.05 {
		t.Errorf("mean lead %.3f, target %.3f (steps %+v)", m, target, p.Steps)
	}
	if d := math.Abs(a.Front.Lead - a.Back.Lead); d > 0.03 {
		t.Errorf("leads %.3f and %.3f", a.Front.Lead, a.Back.Lead)
	}
}
