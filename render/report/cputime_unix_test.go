//go:build unix

package report_test

import (
	"syscall"
	"time"
)

// cpuTime returns the CPU time (user + system) the process has used, so
// benchmarks can report CPU per report when other work shares the machine.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
