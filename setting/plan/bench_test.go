package plan

import (
	"testing"

	"evenbeat/setting/cpubench"
)

// Speed goal (issue 4): fit + plan for a full session (sweeps every 15
// degrees in three reverser positions, both directions) in at most 2 ms
// natively. Shown by these benchmarks, never by a timed test.
func BenchmarkFitAndPlan(b *testing.B) {
	for _, kind := range gears {
		b.Run(kind, func(b *testing.B) {
			sim := simulated{spec: testSpec(b, kind), dev: injected(kind)}
			s := sim.session(b, 15, testAdjustments(kind))
			b.ReportAllocs()
			// On a shared machine wall time says little; the process's own
			// CPU time per operation is reported beside it.
			defer cpubench.Report(b, cpubench.Now())
			for b.Loop() {
				if _, err := Make(s, Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkLinkage is one linkage solution of each test gear: the unit the
// planner's cost is made of (a fit + plan costs some two thousand of
// them), for reading BenchmarkFitAndPlan on a busy machine.
func BenchmarkLinkage(b *testing.B) {
	for _, kind := range gears {
		b.Run(kind, func(b *testing.B) {
			spec := testSpec(b, kind)
			g, _ := spec.Gear.Gear()
			th := 0.0
			for b.Loop() {
				g.Valve(spec.Engine, th, 0.7)
				th += 7.3
				if th > 360 {
					th -= 360
				}
			}
		})
	}
}
