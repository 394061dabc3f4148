//go:build unix

package cpubench

import "testing"

// TestNowGrows checks that busy work shows up as CPU time, so a benchmark's
// cpu-ns/op cannot silently read zero on unix.
func TestNowGrows(t *testing.T) {
	start := Now()
	if start <= 0 {
		t.Fatalf("Now() = %v at start, want the process's CPU time so far (> 0)", start)
	}
	x := 0.0
	for i := 0; Now()-start < 5e6 && i < 1e9; i++ {
		x += float64(i)
	}
	if Now()-start <= 0 {
		t.Fatalf("CPU time did not grow after busy work (x=%g)", x)
	}
}
