package setting

import (
	"os"
	"path/filepath"
	"testing"

	"evenbeat/setting/cpubench"
)

// Speed goal (issue 3): the full event table for the three gears x 9
// reverser positions x both directions in at most 2 ms natively. Shown by
// BenchmarkEventTableThreeGears, never by a timed test.

// demoSpecs reads the shared demo engines, one per gear kind.
func demoSpecs(b *testing.B) map[string]EngineSpec {
	b.Helper()
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "engines", "*.json"))
	out := map[string]EngineSpec{}
	for _, f := range files {
		r, err := os.Open(f)
		if err != nil {
			b.Fatal(err)
		}
		spec, err := DecodeEngineSpec(r)
		r.Close()
		if err != nil {
			b.Logf("%s does not load, so it is left out: %v", f, err)
			continue
		}
		if _, ok := out[spec.Gear.Kind]; !ok {
			out[spec.Gear.Kind] = spec
		}
	}
	return out
}

// benchTables builds each spec's table for 9 positions, both directions.
func benchTables(b *testing.B, specs []EngineSpec) {
	b.Helper()
	positions := ReverserPositions(9)
	dirs := []Direction{Forward, Backward}
	gears := make([]Gear, len(specs))
	for i, s := range specs {
		g, err := s.Gear.Gear()
		if err != nil {
			b.Fatal(err)
		}
		gears[i] = g
	}
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		for i, s := range specs {
			if _, err := Table(s.Engine, s.Valve, gears[i], positions, dirs); err != nil {
				b.Fatal(err)
			}
		}
	}
}

func BenchmarkEventTableThreeGears(b *testing.B) {
	specs := demoSpecs(b)
	var list []EngineSpec
	for _, k := range []string{KindSingleEccentric, KindStephenson, KindWalschaerts} {
		s, ok := specs[k]
		if !ok {
			b.Skipf("no %s demo engine in testdata/engines yet", k)
		}
		list = append(list, s)
	}
	benchTables(b, list)
}

// BenchmarkEventTableSingleEccentric is one gear's share: 9 positions x
// both directions of the single-eccentric test engine.
func BenchmarkEventTableSingleEccentric(b *testing.B) {
	benchTables(b, []EngineSpec{testSingle(b)})
}

// BenchmarkEventsMotion is the event search alone on a cheap motion
// function: its cost in valve-curve evaluations is what a gear multiplies.
func BenchmarkEventsMotion(b *testing.B) {
	e := Engine{CrankRadius: 38, RodLength: 228, Offset: 10}
	v := slideValve(External, 3.2, 0, 3.2)
	calls := 0
	m := func(t float64) (float64, error) {
		calls++
		return wiggly(t)
	}
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		if _, err := Events(e, v, m, Forward); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(calls)/float64(b.N), "evals/op")
}

// BenchmarkCrossheadU is the per-angle cost of the prepared crank.
func BenchmarkCrossheadU(b *testing.B) {
	c, _ := Engine{CrankRadius: 38, RodLength: 228, Offset: 10}.Prepare()
	th, sum := 0.0, 0.0
	for b.Loop() {
		sum += c.CrossheadU(th)
		th += 0.7
	}
	_ = sum
}
