package plan

import (
	"math"
	"testing"

	"evenbeat/setting"
)

// The cut-off in a notch follows the die's place in its link, whatever
// puts it there (common practice, no source): the cut-off per mm of die
// that CutOffPerDieMM finds by moving the reverser agrees, within 5 %,
// with what moving the die another way gives: on the Stephenson gear a
// longer lifting link (the link hangs lower), on the Walschaerts gear a
// die set further out in full gear (the radius rod lifted further), each
// read off the poses. In full gear and on a gear without a link there is
// no such figure.
func TestCutOffFollowsTheDie(t *testing.T) {
	type move struct {
		name string
		spec setting.EngineSpec
		bend func(s *setting.EngineSpec, by float64)
	}
	moves := []move{
		{"Stephenson, lifting link", setting.DemoStephenson(), func(s *setting.EngineSpec, by float64) {
			g := *s.Gear.Stephenson
			g.LiftingLink += by
			s.Gear.Stephenson = &g
		}},
		{"Walschaerts, die in full gear", setting.DemoWalschaerts(), func(s *setting.EngineSpec, by float64) {
			g := *s.Gear.Walschaerts
			g.FullGearDie += by
			s.Gear.Walschaerts = &g
		}},
	}
	for _, mv := range moves {
		for _, r := range []setting.Reverser{0.35, 0.6, -0.45} {
			dir := setting.RunningDirections(r)[0]
			m := Model{Spec: mv.spec}
			got, ok := m.cutPerDie(r, dir)
			if !ok {
				t.Fatalf("%s at %g: no cut-off per mm of die", mv.name, r)
			}
			// The other way: the part moved by +-h, the mean cut-off and
			// the die's mean place read afresh.
			const h = 0.2
			var cut, at [2]float64
			for k, by := range []float64{-h, h} {
				s := mv.spec
				mv.bend(&s, by)
				mb := Model{Spec: s}
				g, err := mb.Gear()
				if err != nil {
					t.Fatal(err)
				}
				set, err := setting.Events(s.Engine, s.Valve, func(th float64) (float64, error) { return g.Valve(s.Engine, th, r) }, dir)
				if err != nil {
					t.Fatal(err)
				}
				cut[k] = (set.Front.CutOff.StrokePercent + set.Back.CutOff.StrokePercent) / 2
				at[k] = meanDieFromMiddle(t, s, r)
			}
			want := (cut[1] - cut[0]) / (at[1] - at[0])
			t.Logf("%s at reverser %g: %.3f %% a mm by the reverser, %.3f %% by the part (die moved %.3f mm)", mv.name, r, got, want, at[1]-at[0])
			if math.Abs(got-want) > 0.05*want || !(want > 0) {
				t.Errorf("%s at reverser %g: %.3f %% of stroke a mm of die, moving the part gives %.3f", mv.name, r, got, want)
			}
		}
		if _, ok := (Model{Spec: mv.spec}).cutPerDie(1, setting.Forward); ok {
			t.Errorf("%s: a cut-off per mm of die in full gear", mv.name)
		}
	}
	if _, ok := (Model{Spec: setting.DemoSlipEccentric()}).cutPerDie(0.5, setting.Forward); ok {
		t.Error("a cut-off per mm of die on a gear without a link")
	}
}

// meanDieFromMiddle is the die's distance from the middle of its link,
// away from it positive, the mean over a turn.
func meanDieFromMiddle(t *testing.T, s setting.EngineSpec, r setting.Reverser) float64 {
	t.Helper()
	g, err := s.Gear.Gear()
	if err != nil {
		t.Fatal(err)
	}
	pg := g.(setting.PosedGear)
	middle, ends := linkJoints(s.Gear.Kind)
	sum := 0.0
	const n = 36
	for j := 0; j < n; j++ {
		p, err := pg.Pose(s.Engine, 10*float64(j), r)
		if err != nil {
			t.Fatal(err)
		}
		die, _ := p.Joint("die block")
		mid, _ := p.Joint(middle)
		a, _ := p.Joint(ends[0])
		b, _ := p.Joint(ends[1])
		sum += die.Sub(mid).Len() * math.Copysign(1, die.Sub(mid).Dot(a.Sub(b)))
	}
	return math.Abs(sum / n)
}
