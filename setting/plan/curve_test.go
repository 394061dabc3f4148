package plan

import (
	"math"
	"testing"

	"evenbeat/setting"
)

// The interpolant of curveSamples samples follows each test gear's exact linkage to
// 1e-4 mm at angles between the samples, in every planned position.
func TestCurveMatchesGear(t *testing.T) {
	tr := newTrig(curveSamples)
	for _, kind := range gears {
		spec := testSpec(t, kind)
		g, _ := spec.Gear.Gear()
		for _, r := range []setting.Reverser{1, 0.4, -0.4, -1} {
			c, err := tr.sample(func(th float64) (float64, error) { return g.Valve(spec.Engine, th, r) })
			if err != nil {
				t.Fatal(err)
			}
			worst := 0.0
			for th := 0.3; th < 360; th += 1.37 {
				x, _ := g.Valve(spec.Engine, th, r)
				worst = math.Max(worst, math.Abs(x-c.value(th)))
			}
			if worst > 1e-4 {
				t.Errorf("%s r=%g: interpolant off by %.2g mm", kind, r, worst)
			}
			// slope against a central difference
			_, d := c.at(77)
			want := (c.value(77.001) - c.value(76.999)) / 0.002
			if math.Abs(d-want) > 1e-6 {
				t.Errorf("slope %g, want %g", d, want)
			}
		}
	}
}
