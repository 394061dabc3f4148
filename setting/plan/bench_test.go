package plan

import (
	"bytes"
	"testing"

	"evenbeat/internal/cpubench"
	"evenbeat/setting"
	"evenbeat/setting/session"
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

// FuzzFitAndPlan feeds the planner perturbed sessions: readings scaled,
// shifted, knocked or made the same, marks moved, limits narrowed. It
// must give a plan or an error, never panic, and never write NaN or Inf.
func FuzzFitAndPlan(f *testing.F) {
	f.Add(uint8(0), 1.0, 0.0, 0.0, 3.0, uint8(0))
	f.Add(uint8(1), -1.0, 2.0, 0.5, 0.0, uint8(3))
	f.Add(uint8(2), 0.0, 1e6, 90.0, 1e-3, uint8(7))
	f.Fuzz(func(t *testing.T, gear uint8, scale, shift, markShift, limit float64, mode uint8) {
		kind := gears[int(gear)%len(gears)]
		sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
		s := sim.session(t, 30, testAdjustments(kind))
		r := &s.Cylinders[0].Rounds[0]
		for i := range r.Sweeps {
			for j := range r.Sweeps[i].Readings {
				rd := &r.Sweeps[i].Readings[j]
				rd.GaugeMM = rd.GaugeMM*scale + shift
				if mode&1 != 0 && j%5 == 0 {
					rd.GaugeMM += shift
				}
				if mode&2 != 0 {
					rd.At.Value += markShift
				}
			}
		}
		if mode&4 != 0 {
			r.Sweeps = nil
		}
		for i := range s.Adjustments {
			s.Adjustments[i].Min, s.Adjustments[i].Max = -limit, limit
		}
		var buf bytes.Buffer
		if err := session.Encode(&buf, s); err != nil {
			return // not a valid session: the decoder's fuzz covers it
		}
		s2, err := session.Decode(&buf)
		if err != nil {
			return
		}
		make := Make
		if mode&8 != 0 {
			make = MakeWithoutDimensions
		}
		p, err := make(s2, Options{Priority: []Priority{EqualLeads, EqualCutOffs, Balanced}[int(mode)%3]})
		if err != nil {
			var se *setting.Error
			_ = se
			if err.Error() == "" {
				t.Fatal("empty error")
			}
			return
		}
		var out bytes.Buffer
		if err := WriteJSON(&out, p, session.UnitMM); err != nil {
			t.Fatal(err)
		}
		scanFinite(t, out.Bytes())
	})
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
