//go:build !unix

package cpubench

import "time"

// Now returns 0: CPU time is not measured on this platform, so benchmarks
// report wall time only.
func Now() time.Duration { return 0 }
