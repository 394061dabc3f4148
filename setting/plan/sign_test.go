package plan

import (
	"fmt"
	"math"
	"os"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// leadsOf returns the true leads of a model in a position.
func leadsOf(t *testing.T, m Model, r setting.Reverser, d setting.Direction) (float64, float64) {
	t.Helper()
	mo, err := m.Motion(r)
	if err != nil {
		t.Fatal(err)
	}
	set, err := setting.Events(m.Spec.Engine, m.Spec.Valve, mo, d)
	if err != nil {
		t.Fatal(err)
	}
	return set.Front.Lead, set.Back.Lead
}

// meanValve returns the valve's mean displacement over a turn.
func meanValve(t *testing.T, m Model, r setting.Reverser) float64 {
	t.Helper()
	mo, err := m.Motion(r)
	if err != nil {
		t.Fatal(err)
	}
	s := 0.0
	for th := 0.0; th < 360; th += 5 {
		x, err := mo(th)
		if err != nil {
			t.Fatal(err)
		}
		s += x
	}
	return s / 72
}

// Each sign convention the plan states, checked on the simulated engines
// rather than trusted to reasoning.
func TestSignConventions(t *testing.T) {
	single := Model{Spec: testSpec(t, setting.KindSingleEccentric)}
	steph := Model{Spec: testSpec(t, setting.KindStephenson)}
	wals := Model{Spec: testSpec(t, setting.KindWalschaerts)}

	// + valve offset = valve toward the front cover: displacement grows;
	// with a slide valve (external admission) the front lead falls and the
	// back lead grows.
	m := steph
	m.Dev.ValveOffsetMM = 0.1
	if d := meanValve(t, m, 1) - meanValve(t, steph, 1); math.Abs(d-0.1) > 1e-9 {
		t.Errorf("valve offset +0.1 moved the valve %g", d)
	}
	f0, b0 := leadsOf(t, steph, 1, setting.Forward)
	f1, b1 := leadsOf(t, m, 1, setting.Forward)
	if !(f1 < f0 && b1 > b0) {
		t.Errorf("valve forward: front lead %g -> %g, back %g -> %g", f0, f1, b0, b1)
	}
	// + eccentric angle = more advance: more lead at both ends, in the gear
	// that eccentric drives.
	for _, c := range []struct {
		name string
		m    Model
		i    int
		r    setting.Reverser
		d    setting.Direction
	}{{"single", single, 0, 1, setting.Forward}, {"stephenson forward", steph, 0, 1, setting.Forward}, {"stephenson backward", steph, 1, -1, setting.Backward}} {
		f0, b0 := leadsOf(t, c.m, c.r, c.d)
		a := c.m
		a.Dev.EccentricDeg[c.i] = 1
		f1, b1 := leadsOf(t, a, c.r, c.d)
		if !(f1 > f0 && b1 > b0) {
			t.Errorf("%s: advancing 1 deg gave leads %g,%g -> %g,%g", c.name, f0, b0, f1, b1)
		}
	}
	// + rod length = lengthened: with the rods running forward from the
	// axle to the link, the valve moves forward in the gear the rod
	// dominates, about one for one in full gear, half in mid gear.
	for i, r := range []setting.Reverser{1, -1} {
		a := steph
		a.Dev.EccentricRodMM[i] = 0.5
		if d := meanValve(t, a, r) - meanValve(t, steph, r); d < 0.4 || d > 0.6 {
			t.Errorf("rod %d +0.5 mm moved the valve %g mm in its full gear", i, d)
		}
	}
	// Walschaerts: a longer radius rod moves the valve forward (the rod runs
	// forward from the die to the lever); a return crank turned forward
	// changes the phase of the link swing: at front dead centre the valve
	// moves differently in full forward and full back.
	a := wals
	a.Dev.RadiusRodMM = 0.5
	if d := meanValve(t, a, 1) - meanValve(t, wals, 1); d <= 0 {
		t.Errorf("radius rod +0.5 moved the valve %g", d)
	}
	// Dead-centre mark: the reading at marked angle t is the valve at true
	// angle t + DeadCentreDeg.
	a = steph
	a.Dev.DeadCentreDeg = 2
	o := session.Observation{Kind: session.InSweep, HasCrank: true, CrankDeg: 40, Reverser: 1, HasGauge: true}
	got, err := a.Predict(o)
	if err != nil {
		t.Fatal(err)
	}
	mo, _ := steph.Motion(1)
	want, _ := mo(42)
	if math.Abs(got-want) > 1e-12 {
		t.Errorf("dead-centre error: predicted %g, valve at 42 deg %g", got, want)
	}
}

// ExampleMake plans the invented Brackenfold engine's session and prints
// the first step in workshop words.
func ExampleMake() {
	f, err := os.Open("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		return
	}
	defer f.Close()
	s, err := session.Decode(f)
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := Make(s, Options{Priority: EqualLeads})
	if err != nil {
		fmt.Println(err)
		return
	}
	if len(p.Steps) > 0 {
		fmt.Println(p.Steps[0].Words)
	}
	_ = WriteText(os.Stdout, p, s.DisplayUnit)
}
