// Package cpubench lets benchmarks report the CPU time each operation costs
// (cpu-ns/op) beside Go's wall-clock ns/op. The machines the benchmarks run
// on are shared, so wall time is inflated by other work; process CPU time
// (user + system, all threads, GC included) is the cost of the work itself.
// Where the platform cannot tell CPU time, nothing extra is reported.
//
// Use it as the first line of a benchmark:
//
//	defer cpubench.Report(b, cpubench.Now())
//
// It imports only the standard library.
package cpubench

import (
	"testing"
	"time"
)

// Report adds the cpu-ns/op metric for the benchmark loop that started when
// Now returned start.
func Report(b *testing.B, start time.Duration) {
	if d := Now() - start; start > 0 && d > 0 {
		b.ReportMetric(float64(d.Nanoseconds())/float64(b.N), "cpu-ns/op")
	}
}
