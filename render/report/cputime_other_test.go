//go:build !unix

package report_test

import "time"

// cpuTime is not measured off unix: benchmarks report wall time only.
func cpuTime() time.Duration { return 0 }
