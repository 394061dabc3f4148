package listen_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"sort"
	"strconv"
	"strings"
	"testing"

	"evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
)

// trial is one synthesised recording of a random engine and what the
// analysis made of it.
type trial struct {
	seed      int
	cylinders int
	rate      int
	revPerSec float64
	change    float64
	seconds   float64
	engine    listentest.Engine
	rec       listentest.Recording
	result    *listen.Result
	match     *listen.Match
	err       error
	errorsMS  []float64 // each beat sounded: how far the onset folded onto a beat is from its start, ms (Inf: none within 10 ms)
	onsetsOK  bool      // every beat sounded found on a beat within 2 ms
	named     bool      // the odd beat named right, late or early right, unambiguously
	extraLeft bool      // the spurious burst was left out of the beats
	gapErrors []float64 // each heard gap less the true one, degrees (by the match's way round)
}

// runTrial makes and analyses trial seed: 2 cylinders in three trials of
// four, else 3; a sample rate of 8 to 48 kHz; 0.5 to 4 rev/s (evenly in
// the logarithm); the speed changing up to 5 % either way; 12 to 20 s;
// the roar 10 dB under the beats, hiss 35 dB under; one beat missed and
// one spurious burst. The readings' prediction handed to Match is the true
// beats, each off by a normal 0.5 degree.
func runTrial(seed int) trial { return runTrialWith(seed, false) }

// runTrialWith is runTrial, with a roar as low as the beats when dull.
func runTrialWith(seed int, dull bool) trial {
	rng := rand.New(rand.NewPCG(15, uint64(seed)))
	rates := []int{8000, 11025, 16000, 22050, 32000, 44100, 48000}
	t := trial{seed: seed, cylinders: 2}
	if rng.IntN(4) == 0 {
		t.cylinders = 3
	}
	t.rate = rates[rng.IntN(len(rates))]
	t.revPerSec = 0.5 * math.Pow(8, rng.Float64())
	t.change = 0.1*rng.Float64() - 0.05
	t.seconds = 12 + 8*rng.Float64()
	t.engine = listentest.RandomEngine(rng, t.cylinders)
	t.rec = listentest.Synthesise(rng, listentest.Take{
		Beats: t.engine.Beats, RevPerSec: t.revPerSec, SpeedChange: t.change,
		Seconds: t.seconds, Rate: t.rate, RoarDB: -10, HissDB: -35, Missed: 1, Extra: 1, DullRoar: dull,
	})
	n := 2 * t.cylinders
	t.result, t.err = listen.Analyse(t.rec.Samples, t.rate, n)
	if t.err != nil {
		return t
	}
	t.scoreOnsets()
	predicted := make([]listen.Beat, n)
	for i, b := range t.engine.Beats {
		b.Deg += 0.5 * rng.NormFloat64()
		predicted[i] = b
	}
	t.match, t.err = t.result.Match(predicted)
	if t.err != nil {
		return t
	}
	t.scoreGaps()
	want := t.engine.Beats[t.engine.Odd]
	t.named = !t.match.Ambiguous && len(t.match.Odd) == 1 && t.match.Odd[0].String() == want.String() &&
		t.result.Odd.Late() == (t.engine.OddDeg > 0)
	return t
}

// scoreOnsets finds, for each beat sounded (away from the recording's
// first and last 20 ms, where a burst has no sound before or after it),
// the nearest onset the analysis folded onto a beat, and whether the
// spurious burst was left out.
func (t *trial) scoreOnsets() {
	t.onsetsOK = true
	for _, s := range t.rec.Starts {
		if s < 0.02 || s > t.seconds-0.02 {
			continue
		}
		best := math.Inf(1)
		for _, o := range t.result.Onsets {
			if o.Beat >= 0 {
				best = min(best, math.Abs(o.Seconds-s))
			}
		}
		ms := best * 1000
		if ms > 10 {
			ms = math.Inf(1)
		}
		t.errorsMS = append(t.errorsMS, ms)
		t.onsetsOK = t.onsetsOK && ms <= 2
	}
	t.extraLeft = true
	for _, x := range t.rec.Extra {
		for _, o := range t.result.Onsets {
			if o.Beat >= 0 && math.Abs(o.Seconds-x) < 0.005 {
				t.extraLeft = false
			}
		}
	}
}

// scoreGaps compares each heard gap with the engine's true gap, the
// heard beats laid on the true ones as the match laid them.
func (t *trial) scoreGaps() {
	trueDeg := map[string]float64{}
	for _, b := range t.engine.Beats {
		trueDeg[b.String()] = b.Deg
	}
	n := len(t.match.Beats)
	for j, b := range t.match.Beats {
		next := t.match.Beats[(j+1)%n]
		want := math.Mod(trueDeg[next.String()]-trueDeg[b.String()]+720, 360)
		t.gapErrors = append(t.gapErrors, t.result.Beats[j].Gap.Deg-want)
	}
}

func (t trial) String() string {
	s := fmt.Sprintf("trial %d: %d cylinders, %d Hz, %.2f rev/s %+.1f %%, %.1f s, %s %+.1f deg",
		t.seed, t.cylinders, t.rate, t.revPerSec, 100*t.change, t.seconds, t.engine.Beats[t.engine.Odd], t.engine.OddDeg)
	if t.result == nil {
		return s + ": " + t.err.Error()
	}
	worst, within := 0.0, 0
	for _, e := range t.errorsMS {
		worst = max(worst, e)
		if e <= 2 {
			within++
		}
	}
	r := t.result
	s += fmt.Sprintf("; onsets %d/%d within 2 ms (worst %.2f ms); heard %.1f rev/min, %d turns, %d missed, %d spurious, odd %+.1f +/- %.1f deg (stands out %v)",
		within, len(t.errorsMS), worst, r.RevPerMin, r.Turns, r.Missed, r.Spurious, r.Odd.Deg, r.Odd.Doubt, r.Odd.StandsOut)
	if t.match != nil {
		var ends []string
		for _, b := range t.match.Odd {
			ends = append(ends, b.String())
		}
		s += fmt.Sprintf("; named [%s], ambiguous %v, %.1f deg rms", strings.Join(ends, ", "), t.match.Ambiguous, t.match.RMSDeg)
	} else if t.err != nil {
		s += ": " + t.err.Error()
	}
	return s
}

// trialCount is 200 (60 with -short) unless EVENBEAT_LISTEN_TRIALS says.
func trialCount(t *testing.T) int {
	if s := os.Getenv("EVENBEAT_LISTEN_TRIALS"); s != "" {
		n, err := strconv.Atoi(s)
		if err != nil || n < 1 {
			t.Fatalf("EVENBEAT_LISTEN_TRIALS=%q is not a count of trials", s)
		}
		return n
	}
	if testing.Short() {
		return 60
	}
	return 200
}

// TestListeningTrials is issue 15's check of the listening: synthesised
// recordings of random engines with one uneven release (exhaust bursts of
// noise with a decay, 0.5 to 4 rev/s drifting up to 5 %, hiss, a
// continuous roar 10 dB under the beats, a missed and a spurious beat)
// must give every beat's onset within 2 ms of its burst's start and name
// the late or early beat's cylinder end, in at least 95 % of 200 trials.
// It prints the figures; the floors sit a little under what the analysis
// reaches, and a trial that fails is named with what it held.
func TestListeningTrials(t *testing.T) {
	runTrials(t, trialCount(t), false, 97)
}

// TestListeningTrialsDullRoar is the same with the roar as low as the
// beats, where no band is quieter for the onsets to rise in: at the
// slowest speeds, with few turns and many spurious onsets, a recording
// may be refused. Half as many trials.
func TestListeningTrialsDullRoar(t *testing.T) {
	runTrials(t, trialCount(t)/2, true, 95)
}

// runTrials runs n trials and holds the share of them that must pass to
// floor (%), the others a little over it.
func runTrials(t *testing.T, n int, dull bool, floor float64) {
	var both, onsets, named, extraLeft, refused, ambiguous int
	var all, gaps []float64
	for seed := range n {
		tr := runTrialWith(seed, dull)
		for _, g := range tr.gapErrors {
			gaps = append(gaps, math.Abs(g))
		}
		if tr.result == nil {
			refused++
		}
		if tr.match != nil && tr.match.Ambiguous {
			ambiguous++
		}
		all = append(all, tr.errorsMS...)
		if tr.onsetsOK {
			onsets++
		}
		if tr.named {
			named++
		}
		if tr.extraLeft {
			extraLeft++
		}
		if tr.onsetsOK && tr.named {
			both++
		} else {
			t.Logf("failed %s", tr)
		}
	}
	sort.Slice(all, func(i, j int) bool { return all[i] < all[j] })
	within := sort.SearchFloat64s(all, 2.0000001)
	pct := func(k int) float64 { return 100 * float64(k) / float64(n) }
	t.Logf("%d trials: onsets and late beat right in %d (%.1f %%); every onset within 2 ms in %d (%.1f %%); late beat named right in %d (%.1f %%), ambiguous in %d, refused %d; spurious burst left out in %d (%.1f %%)",
		n, both, pct(both), onsets, pct(onsets), named, pct(named), ambiguous, refused, extraLeft, pct(extraLeft))
	if len(all) > 0 {
		t.Logf("onsets: %d beats sounded, %.3f %% within 2 ms; error median %.2f ms, 99th centile %.2f ms, worst %.2f ms",
			len(all), 100*float64(within)/float64(len(all)), all[len(all)/2], all[len(all)*99/100], all[len(all)-1])
	}
	sort.Slice(gaps, func(i, j int) bool { return gaps[i] < gaps[j] })
	if len(gaps) > 0 {
		t.Logf("gaps: %d measured, error median %.2f deg, 95th centile %.2f deg, worst %.2f deg",
			len(gaps), gaps[len(gaps)/2], gaps[len(gaps)*95/100], gaps[len(gaps)-1])
		if g := gaps[len(gaps)*95/100]; g > 0.5 {
			t.Errorf("95 %% of the heard gaps are within %.2f deg of the true ones; the floor is 0.5 deg", g)
		}
	}
	floors := []struct {
		what  string
		got   int
		floor float64 // %
	}{
		{"onsets within 2 ms and the late beat named right", both, floor},
		{"every onset within 2 ms", onsets, floor},
		{"the late beat named right", named, floor + 1},
		{"the spurious burst left out", extraLeft, floor},
	}
	for _, f := range floors {
		if pct(f.got) < f.floor {
			t.Errorf("%s in %.1f %% of %d trials, under the floor of %.0f %% (the issue asks 95 %%)", f.what, pct(f.got), n, f.floor)
		}
	}
}
