package render

import (
	"math"
	"strconv"
)

// Scale maps data values linearly from [Min, Max] onto [A, B] in logical
// units (B may be less than A, as for a y axis that grows upward).
type Scale struct {
	Min, Max float64 // data range
	A, B     float64 // drawing range
}

// At returns the drawing coordinate of data value v. A scale with an empty
// data range maps everything to the middle of the drawing range.
func (s Scale) At(v float64) float64 {
	if s.Max == s.Min {
		return (s.A + s.B) / 2
	}
	return s.A + (v-s.Min)/(s.Max-s.Min)*(s.B-s.A)
}

// Ticks returns round tick values covering [lo, hi] (either order) with
// a step of 1, 2, 2.5 or 5 times a power of ten, the smallest such step
// that gives at most n intervals across the range, so at most n+1 ticks.
// Only ticks inside the range are returned. An empty range gives that one
// value; a range that is not finite, or n < 1, gives nil.
func Ticks(lo, hi float64, n int) []float64 {
	return ticks(lo, hi, n, []float64{1, 2, 2.5, 5, 10})
}

// AngleTicks is Ticks for angles in degrees: steps of 1, 2, 5, 10, 15, 30,
// 45, 60, 90, 180 or 360 degrees, so the quarter turns land on ticks.
func AngleTicks(lo, hi float64, n int) []float64 {
	if math.Abs(hi-lo)/float64(max(n, 1)) > 10 {
		return ticksFrom(lo, hi, n, []float64{15, 30, 45, 60, 90, 180, 360, 720, 1440})
	}
	return Ticks(lo, hi, n)
}

// ticks picks the step from mantissas scaled by a power of ten.
func ticks(lo, hi float64, n int, mantissas []float64) []float64 {
	if bad(lo, hi, n) {
		return nil
	}
	raw := math.Abs(hi-lo) / float64(n)
	if raw == 0 {
		return []float64{lo}
	}
	pow := math.Pow(10, math.Floor(math.Log10(raw)))
	steps := make([]float64, len(mantissas))
	for i, m := range mantissas {
		steps[i] = m * pow
	}
	return ticksFrom(lo, hi, n, steps)
}

func bad(lo, hi float64, n int) bool {
	return n < 1 || math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0)
}

// ticksFrom uses the smallest of steps (ascending) giving at most n
// intervals across [lo, hi], or the largest step if none does.
func ticksFrom(lo, hi float64, n int, steps []float64) []float64 {
	if bad(lo, hi, n) {
		return nil
	}
	if lo > hi {
		lo, hi = hi, lo
	}
	if lo == hi {
		return []float64{lo}
	}
	step := steps[len(steps)-1]
	for _, s := range steps {
		if (hi-lo)/s <= float64(n)+1e-9 {
			step = s
			break
		}
	}
	eps := step * 1e-9
	var out []float64
	for i := math.Ceil((lo - eps) / step); i*step <= hi+eps; i++ {
		v := i * step
		// Trim the float noise of i*step (0.30000000000000004) to the
		// step's own precision.
		v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'g', 12, 64), 64)
		if v == 0 {
			v = 0 // no negative zero
		}
		out = append(out, v)
	}
	return out
}

// FormatTick formats a tick value with no more decimals than it needs.
func FormatTick(v float64) string {
	return strconv.FormatFloat(v, 'f', -1, 64)
}
