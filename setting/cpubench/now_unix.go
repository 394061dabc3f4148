//go:build unix

package cpubench

import (
	"syscall"
	"time"
)

// Now returns the CPU time the process has used so far, or 0 when the
// system cannot say.
func Now() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
