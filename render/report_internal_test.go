package render

import (
	"math"
	"testing"
)

// The readings table lists every reading up to its bound, then those
// farthest off the fit, in file order.
func TestListedReadings(t *testing.T) {
	few := make([]Reading, reportReadings)
	for i, shown := range listedReadings(few) {
		if !shown {
			t.Fatalf("reading %d of %d is not listed", i, len(few))
		}
	}
	many := make([]Reading, 1000)
	for i := range many {
		many[i].ResidualMM = math.Sin(float64(i)) * float64(i%7) / 100
	}
	shown := listedReadings(many)
	n, least := 0, math.Inf(1)
	for i, s := range shown {
		if s {
			n++
			least = math.Min(least, math.Abs(many[i].ResidualMM))
		}
	}
	if n != reportReadings {
		t.Fatalf("%d readings listed, want %d", n, reportReadings)
	}
	for i, s := range shown {
		if !s && math.Abs(many[i].ResidualMM) > least {
			t.Errorf("reading %d (%.4f off) is left out, but one %.4f off is listed", i, many[i].ResidualMM, least)
		}
	}
}
