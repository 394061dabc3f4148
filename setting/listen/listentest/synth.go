// Package listentest makes recordings of invented engines for the tests of
// the listening analysis: exhaust bursts of noise with a decay at the times
// an engine with known, uneven releases gives at a drifting speed, over a
// continuous steam roar and background hiss, with a missed and a spurious
// beat; and WAV files of any of the forms the reader takes. It imports only
// the standard library and package listen.
package listentest

import (
	"math"
	"math/rand/v2"
	"sort"

	"evenbeat/setting/listen"
)

// Engine is an invented engine's exhaust beat round one turn.
type Engine struct {
	Beats []listen.Beat // the releases, in order round the turn
	// Odd is the index in Beats of the beat furthest from an even beat (by
	// the offsets the analysis reports), OddDeg its offset (+ late); the
	// engines RandomEngine makes have it clear of the next by 2 degrees.
	Odd    int
	OddDeg float64
}

// RandomEngine makes an engine of 2 or 3 cylinders (right leading by 90
// degrees, or right, middle, left 120 degrees apart), whose releases come
// 140 to 165 degrees after each end's dead centre, each end off by up to
// a degree, the cranks off their quarter by up to a degree, and one end's
// release 5 to 12 degrees late or early (a valve off centre, an eccentric
// slipped): the beat that limps.
func RandomEngine(rng *rand.Rand, cylinders int) Engine {
	names := []string{"right", "left"}
	if cylinders == 3 {
		names = []string{"right", "middle", "left"}
	}
	for {
		release := 140 + 25*rng.Float64()
		var beats []listen.Beat
		for c, name := range names {
			crank := float64(c) * 360 / float64(2*len(names))
			if len(names) == 3 {
				crank = float64(c) * 120
			}
			if c > 0 {
				crank += rng.Float64()*2 - 1
			}
			for _, front := range []bool{true, false} {
				deg := crank + release + rng.Float64()*2 - 1
				if !front {
					deg += 180
				}
				beats = append(beats, listen.Beat{Deg: math.Mod(deg, 360), Cylinder: name, Front: front})
			}
		}
		limp := rng.IntN(len(beats))
		off := 5 + 7*rng.Float64()
		if rng.IntN(2) == 0 {
			off = -off
		}
		beats[limp].Deg = math.Mod(beats[limp].Deg+off+360, 360)
		sort.Slice(beats, func(i, j int) bool { return beats[i].Deg < beats[j].Deg })
		e := Engine{Beats: beats}
		offsets := Offsets(beats)
		second := 0.0
		for i, o := range offsets {
			if math.Abs(o) > math.Abs(e.OddDeg) {
				second = math.Abs(e.OddDeg)
				e.Odd, e.OddDeg = i, o
			} else {
				second = max(second, math.Abs(o))
			}
		}
		if math.Abs(e.OddDeg)-second >= 2 {
			return e
		}
	}
}

// Offsets is how far each beat of beats (in order round the turn) comes
// after an even beat, degrees, the even beats placed to fit them all.
func Offsets(beats []listen.Beat) []float64 {
	n := len(beats)
	out := make([]float64, n)
	mean := 0.0
	for i, b := range beats {
		d := b.Deg - beats[0].Deg
		if d < 0 {
			d += 360
		}
		out[i] = d - float64(i)*360/float64(n)
		mean += out[i] / float64(n)
	}
	for i := range out {
		out[i] -= mean
	}
	return out
}

// Take is how a recording is made.
type Take struct {
	Beats       []listen.Beat // the releases round one turn
	RevPerSec   float64       // speed at the start
	SpeedChange float64       // speed at the end against the start, e.g. 0.05: 5 % faster
	Seconds     float64
	Rate        int
	RoarDB      float64 // the steam roar's level against a beat's peak, dB (e.g. -10)
	HissDB      float64 // the background hiss's, dB (e.g. -40)
	// DullRoar makes the roar as low as the beats (noise through a
	// one-pole low-pass at 1200 Hz) instead of brighter: the hardest
	// roar for the onset detector, whose bands then see no quieter place.
	DullRoar bool
	Missed   int // beats left out
	Extra    int // spurious bursts between the beats
}

// Recording is a synthesised recording and what it holds.
type Recording struct {
	Samples []float32
	Rate    int
	Starts  []float64 // the start of each beat sounded, seconds
	BeatOf  []int     // each start's index in the take's Beats
	Missed  []float64 // when the beats left out were due
	Extra   []float64 // the starts of the spurious bursts
}

// Synthesise makes the recording: each release a burst of low, rough
// noise rising over 0.3 to 1 ms and dying away with a time constant of a
// fifth to a third of an even beat (at most 80 ms), its level varying
// 3 dB either way from beat to beat; a continuous roar of brighter noise
// at RoarDB against a beat's peak, its level wandering 1.5 dB; hiss at
// HissDB; the whole scaled to peak at 0.9. The engine's speed changes
// steadily from RevPerSec by SpeedChange over the take, and the first
// release falls at a random place in the turn.
func Synthesise(rng *rand.Rand, t Take) Recording {
	n := int(t.Seconds * float64(t.Rate))
	out := Recording{Rate: t.Rate}
	x := make([]float64, n)
	rate := float64(t.Rate)
	// The wheel's angle in turns: speed f(t) = f0 (1 + c t / T).
	f0, c := t.RevPerSec, t.SpeedChange/t.Seconds
	turnsAt := func(s float64) float64 { return f0 * (s + c*s*s/2) }
	timeOf := func(turns float64) float64 { // inverse of turnsAt
		if c == 0 {
			return turns / f0
		}
		return (-1 + math.Sqrt(1+2*c*turns/f0)) / c
	}
	start := rng.Float64()
	total := turnsAt(t.Seconds)
	type burst struct {
		at   float64
		beat int
	}
	var bursts []burst
	for k := 0; float64(k) < total+2; k++ {
		for i, b := range t.Beats {
			turns := float64(k) + b.Deg/360 - start
			if turns < 0 || turns >= total {
				continue
			}
			bursts = append(bursts, burst{timeOf(turns), i})
		}
	}
	sort.Slice(bursts, func(i, j int) bool { return bursts[i].at < bursts[j].at })
	evenBeat := 1 / (f0 * float64(len(t.Beats)))
	// Missed beats: away from the ends, so the count of beats stays fair.
	for range t.Missed {
		if len(bursts) < 8 {
			break
		}
		i := 2 + rng.IntN(len(bursts)-4)
		out.Missed = append(out.Missed, bursts[i].at)
		bursts = append(bursts[:i], bursts[i+1:]...)
	}
	for _, b := range bursts {
		tau := min(0.08, evenBeat*(0.2+0.13*rng.Float64()))
		level := math.Pow(10, (rng.Float64()*6-3)/20)
		addBurst(rng, x, rate, b.at, tau, level)
		out.Starts = append(out.Starts, b.at)
		out.BeatOf = append(out.BeatOf, b.beat)
	}
	for range t.Extra {
		at := spuriousTime(rng, out.Starts, t.Seconds, evenBeat)
		addBurst(rng, x, rate, at, 0.005+0.01*rng.Float64(), math.Pow(10, -rng.Float64()*6/20))
		out.Extra = append(out.Extra, at)
	}
	addRoar(rng, x, rate, math.Pow(10, t.RoarDB/20), t.DullRoar)
	hiss := math.Pow(10, t.HissDB/20)
	for i := range x {
		x[i] += hiss * rng.NormFloat64()
	}
	peak := 0.0
	for _, v := range x {
		peak = max(peak, math.Abs(v))
	}
	out.Samples = make([]float32, n)
	for i, v := range x {
		out.Samples[i] = float32(0.9 * v / peak)
	}
	return out
}

// spuriousTime is a time at least a fifth of an even beat from any beat's
// start (a knock or a clank between beats).
func spuriousTime(rng *rand.Rand, starts []float64, seconds, evenBeat float64) float64 {
	for {
		at := 0.05 + rng.Float64()*(seconds-0.1)
		clear := true
		for _, s := range starts {
			clear = clear && math.Abs(s-at) >= evenBeat/5
		}
		if clear {
			return at
		}
	}
}

// addBurst adds one exhaust burst starting at at (seconds): rough noise
// (white noise through a one-pole low-pass at 600 to 2500 Hz, scaled to
// unit power) rising linearly over 0.3 to 1 ms, then dying away with time
// constant tau, at peak level (root mean square) level.
func addBurst(rng *rand.Rand, x []float64, rate, at, tau, level float64) {
	cut := 600 + 1900*rng.Float64()
	a := math.Exp(-2 * math.Pi * min(cut, rate/3) / rate)
	gain := math.Sqrt((1 + a) / (1 - a)) // unit power out of unit-power white noise
	rise := (0.3 + 0.7*rng.Float64()) * 1e-3
	i0 := int(math.Ceil(at * rate))
	lp := 0.0
	for i := i0; i < len(x); i++ {
		s := float64(i)/rate - at
		env := s / rise
		if s >= rise {
			env = math.Exp(-(s - rise) / tau)
			if env < 1e-3 {
				break
			}
		}
		lp = a*lp + (1-a)*rng.NormFloat64()
		x[i] += level * env * gain * lp
	}
}

// addRoar adds the steam's continuous roar: white noise through a
// one-pole high-pass at 300 Hz (brighter than the beats), or with dull
// through a one-pole low-pass at 1200 Hz (as low as they), at root mean
// square level, its level wandering 1.5 dB at under a hertz.
func addRoar(rng *rand.Rand, x []float64, rate, level float64, dull bool) {
	hp := math.Exp(-2 * math.Pi * 300 / rate)
	lp := math.Exp(-2 * math.Pi * 1200 / rate)
	gain := math.Sqrt(2 / (1 + hp)) // unit power out of unit-power white noise
	if dull {
		gain = math.Sqrt((1 - lp) / (1 + lp))
	}
	wander, phase := 0.2+0.6*rng.Float64(), 2*math.Pi*rng.Float64()
	var px, py, g float64
	for i := range x {
		if i%64 == 0 { // the level wanders slowly: work it out every 64 samples
			db := 1.5 * math.Sin(2*math.Pi*wander*float64(i)/rate+phase)
			g = level * math.Pow(10, db/20) / gain
		}
		w := rng.NormFloat64()
		if dull {
			py = lp*py + (1-lp)*w
		} else {
			py = hp*py + w - px
			px = w
		}
		x[i] += g * py
	}
}
