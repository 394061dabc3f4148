package plan

import (
	"math"
	"testing"

	"evenbeat/setting"
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
