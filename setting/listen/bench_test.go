package listen_test

import (
	"math/rand/v2"
	"testing"

	"evenbeat/setting/cpubench"
	"evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
)

// BenchmarkAnalyse20s is the analysis of a 20 s recording at 48 kHz of a
// two-cylinder engine at 2 rev/s (the goal in the browser: under 200 ms).
func BenchmarkAnalyse20s(b *testing.B) {
	rng := rand.New(rand.NewPCG(15, 20))
	e := listentest.RandomEngine(rng, 2)
	rec := listentest.Synthesise(rng, listentest.Take{
		Beats: e.Beats, RevPerSec: 2, SpeedChange: 0.03, Seconds: 20, Rate: 48000,
		RoarDB: -10, HissDB: -35, Missed: 1, Extra: 1,
	})
	b.ResetTimer()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		if _, err := listen.Analyse(rec.Samples, rec.Rate, 4); err != nil {
			b.Fatal(err)
		}
	}
}
