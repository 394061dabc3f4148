package listen

import (
	"math"
	"sort"
)

// Onset is the start of one burst heard in the recording.
type Onset struct {
	Seconds float64 // from the start of the recording
	RiseDB  float64 // how far the sound rose at the onset, dB
	// Beat is the beat of the turn the onset was folded onto (an index
	// into Result.Beats), or -1 when it falls on no beat (a knock, a
	// voice, a doubled onset): it is then left out of every figure.
	Beat int
	Turn int // the turn it belongs to, counted from 0; -1 with Beat -1
}

// The onset detector's settings. A block is one millisecond of sound.
const (
	afterBlocks  = 8      // the window after a candidate onset, ms
	beforeBlocks = 16     // the window before it, ms
	pickBlocks   = 10     // an onset is the largest rise within this many ms either side
	minRiseDB    = 6.0    // the least rise an onset may have
	strongShare  = 0.3    // and at least this share of the strong rise near it:
	strongRank   = 3      // the third largest within two seconds either side
	highPassHz   = 40.0   // rumble and a microphone's DC are taken out below this
	refineBefore = 20e-3  // an onset is placed within this stretch before the block found...
	refineAfter  = 9e-3   // ...and this after it, seconds
	refineMin    = 0.5e-3 // the least length of either side of a change point
	splitBefore  = 8e-3   // the splits tried: from this before the block found...
	splitAfter   = 4e-3   // ...to this after it
)

// analysisRate is the most samples a second the onsets are found at: a
// recording made faster is thinned to about it first (48000 Hz to 16000),
// which keeps the bands the exhaust is heard in and places an onset to
// 0.06 ms, for a third of the work.
const analysisRate = 16000

// prepared is the recording as the analysis works on it, and what one
// look at every sample found.
type prepared struct {
	x    []float64 // d samples averaged into one, less everything under highPassHz
	d    int       // samples of the recording in one of x
	rate int       // the recording's samples a second
	bad  bool      // a sample is not a number (NaN or infinite)
	loud bool      // a sample is not silent
	full int       // samples at full scale
}

// analysisRate is rate / d.
func (p *prepared) analysisRate() float64 { return float64(p.rate) / float64(p.d) }

// seconds is the time of sample i of x: the middle of the samples
// averaged into it.
func (p *prepared) seconds(i int) float64 {
	return (float64(i*p.d) + float64(p.d-1)/2) / float64(p.rate)
}

// prepare looks at every sample once: it averages each d of them into
// one (d the whole factor that brings the rate nearest analysisRate; the
// average leaves some sound above the new half rate folded into it, which
// the bands' energies take as the noise it is), takes out everything
// below highPassHz (a one-pole DC blocker: rumble, a microphone's offset),
// and notes samples that are not numbers, silence and full scale.
func prepare(samples []float32, rate int) *prepared {
	d := max(1, (rate+analysisRate/2)/analysisRate)
	p := &prepared{x: make([]float64, len(samples)/d), d: d, rate: rate}
	scale := 1 / float64(d)
	k := math.Exp(-2 * math.Pi * highPassHz * float64(d) / float64(rate))
	var px, py float64
	x, loud := p.x, false // locals while it runs: p's fields are not reloaded each sample
	for i := range x {
		sum := 0.0
		for _, s := range samples[i*d : (i+1)*d] {
			if !(s > -0.999 && s < 0.999) { // also NaN
				switch {
				case s != s || s > 1e30 || s < -1e30:
					p.bad = true
				default:
					p.full++
				}
			}
			sum += float64(s)
		}
		loud = loud || sum != 0
		v := sum * scale
		py = v - px + k*py
		px = v
		x[i] = py
	}
	p.loud = loud
	return p
}

// bandEdges are the upper edges (Hz) of the bands the onset function
// watches, below the last band that reaches to half the sample rate: an
// exhaust's rise shows most where the continuous roar is weakest, as in
// a spectral flux, for a few filters a sample.
var bandEdges = [...]float64{500, 1500, 4000}

// refineEdges are the finer bands an onset is placed in.
var refineEdges = [...]float64{400, 800, 1600, 3200, 6400, 12800}

// biquad is a second-order low-pass (Butterworth) section.
type biquad struct {
	b0, b1, b2, a1, a2 float64
	x1, x2, y1, y2     float64
}

// lowPass is the Butterworth low-pass at cut Hz (bilinear transform).
func lowPass(cut, rate float64) biquad {
	k := math.Tan(math.Pi * cut / rate)
	norm := 1 / (1 + math.Sqrt2*k + k*k)
	return biquad{
		b0: k * k * norm, b1: 2 * k * k * norm, b2: k * k * norm,
		a1: 2 * (k*k - 1) * norm, a2: (1 - math.Sqrt2*k + k*k) * norm,
	}
}

// filter runs src through f into dst (which may be src), the state kept
// in locals while it runs and in f between calls.
func (f *biquad) filter(dst, src []float64) {
	b0, b1, b2, a1, a2 := f.b0, f.b1, f.b2, f.a1, f.a2
	x1, x2, y1, y2 := f.x1, f.x2, f.y1, f.y2
	dst = dst[:len(src)]
	for i, x := range src {
		y := b0*x + b1*x1 + b2*x2 - a1*y1 - a2*y2
		x2, x1 = x1, x
		y2, y1 = y1, y
		dst[i] = y
	}
	f.x1, f.x2, f.y1, f.y2 = x1, x2, y1, y2
}

// filterBack runs v through f backward, from its last sample to its
// first, in place: with filter, a zero-phase filter.
func (f *biquad) filterBack(v []float64) {
	b0, b1, b2, a1, a2 := f.b0, f.b1, f.b2, f.a1, f.a2
	x1, x2, y1, y2 := f.x1, f.x2, f.y1, f.y2
	for i := len(v) - 1; i >= 0; i-- {
		x := v[i]
		y := b0*x + b1*x1 + b2*x2 - a1*y1 - a2*y2
		x2, x1 = x1, x
		y2, y1 = y1, y
		v[i] = y
	}
	f.x1, f.x2, f.y1, f.y2 = x1, x2, y1, y2
}

// bandEnergies splits x into bands at bandEdges (those under 0.4 of the
// sample rate) and sums the squares of each over blocks of size samples:
// out[band][block].
func bandEnergies(x []float64, rate, size int) [][]float64 {
	var filters []biquad
	for _, edge := range bandEdges {
		if edge < 0.4*float64(rate) {
			filters = append(filters, lowPass(edge, float64(rate)))
		}
	}
	nb := len(x) / size
	out := make([][]float64, len(filters)+1)
	for i := range out {
		out[i] = make([]float64, nb)
	}
	// A chunk of blocks at a time through each filter (fewer calls; the
	// filters keep their state from chunk to chunk).
	const chunk = 64
	lows := make([][]float64, len(filters)+2) // zeros, each low-pass, the sound
	for i := range lows {
		lows[i] = make([]float64, chunk*size)
	}
	for b0 := 0; b0 < nb; b0 += chunk {
		m := min(chunk, nb-b0) * size
		in := x[b0*size : b0*size+m]
		copy(lows[len(lows)-1], in)
		for i := range filters {
			filters[i].filter(lows[i+1][:m], in)
		}
		for k := range out {
			below, upTo := lows[k][:m], lows[k+1][:m]
			e := out[k][b0:]
			for b := 0; b*size < m; b++ {
				e[b] = diffEnergy(upTo[b*size:(b+1)*size], below[b*size:(b+1)*size])
			}
		}
	}
	return out
}

// diffEnergy is the sum of the squares of a - b.
func diffEnergy(a, b []float64) float64 {
	b = b[:len(a)]
	sum := 0.0
	for i, v := range a {
		d := v - b[i]
		sum += d * d
	}
	return sum
}

// rises is the onset function: at each block boundary b, the sum over the
// bands of how much louder (dB, rises only) the afterBlocks after b are
// than the beforeBlocks before it. Each band's energy has a floor 25 dB
// under the recording's mean power, so a band with next to nothing in it
// adds nothing. Boundaries too near either end get 0.
func rises(bands [][]float64) []float64 {
	nb := len(bands[0])
	total := 0.0
	for _, e := range bands {
		for _, v := range e {
			total += v
		}
	}
	floor := 0.003*total/float64(max(1, nb)) + 1e-30
	o := make([]float64, nb)
	for _, e := range bands {
		var before, after float64
		for b := range min(beforeBlocks, nb) {
			before += e[b]
		}
		for b := beforeBlocks; b < min(beforeBlocks+afterBlocks, nb); b++ {
			after += e[b]
		}
		for b := beforeBlocks; b+afterBlocks <= nb; b++ {
			// Only a rise counts: a block where the sound does not rise
			// needs no logarithm (most of them).
			if q := (after/afterBlocks + floor) / (before/beforeBlocks + floor); q > 1 {
				o[b] += 10 * math.Log10(q)
			}
			before += e[b] - e[b-beforeBlocks]
			after -= e[b]
			if b+afterBlocks < nb {
				after += e[b+afterBlocks]
			}
		}
	}
	return o
}

// pickOnsets finds the onsets: blocks whose rise is the largest within
// pickBlocks either side, at least minRiseDB, and at least strongShare of
// the strong rise near it (the third largest peak within two seconds
// either side, so that one loud knock does not set it). The threshold so follows the recording: a louder
// roar or a quieter beat moves the strong rises, and the small peaks of
// noise between beats and of a burst's own flutter stay under it. It
// returns block indices.
func pickOnsets(o []float64) []int {
	var picks []int
	for b := beforeBlocks; b < len(o); b++ {
		if o[b] < minRiseDB {
			continue
		}
		peak := true
		for j := max(0, b-pickBlocks); j <= min(len(o)-1, b+pickBlocks); j++ {
			if o[j] > o[b] || (o[j] == o[b] && j < b) {
				peak = false
				break
			}
		}
		if peak {
			picks = append(picks, b)
		}
	}
	const reach = 2000 // blocks
	var keep []int
	var buf []float64
	lo, hi := 0, 0
	for _, b := range picks {
		for lo < len(picks) && picks[lo] < b-reach {
			lo++
		}
		for hi < len(picks) && picks[hi] <= b+reach {
			hi++
		}
		buf = buf[:0]
		for _, p := range picks[lo:hi] {
			buf = append(buf, o[p])
		}
		sortFloats(buf)
		if o[b] >= strongShare*buf[max(0, len(buf)-strongRank)] {
			keep = append(keep, b)
		}
	}
	return keep
}

// refiner places onsets to the sample (place), keeping its buffers from
// one onset to the next.
type refiner struct {
	x       []float64
	rate    int
	filters []biquad  // the low-passes at refineEdges under 0.4 of the rate
	widths  []float64 // each band's share of the whole width
	low     []float64 // scratch: the sound under a band's top edge...
	below   []float64 // ...and under its bottom edge
	heads   [][]float64
}

// newRefiner prepares to place onsets in x at rate.
func newRefiner(x []float64, rate int) *refiner {
	r := &refiner{x: x, rate: rate}
	lower := 0.0
	for _, edge := range refineEdges {
		if edge >= 0.4*float64(rate) {
			break
		}
		r.filters = append(r.filters, lowPass(edge, float64(rate)))
		r.widths = append(r.widths, (edge-lower)/(float64(rate)/2))
		lower = edge
	}
	r.widths = append(r.widths, (float64(rate)/2-lower)/(float64(rate)/2))
	r.heads = make([][]float64, len(r.widths)+1)
	return r
}

// place places an onset found at block b to the sample: within the
// stretch from refineBefore before to refineAfter after the block, it is
// the split that best parts a quieter stretch before from a louder one
// after: the most likely change of the sound's power, each band (as
// refineEdges split the sound) taken as steady noise either side and
// weighed by its width (the independent samples it holds). The bands are
// filtered forward and backward, so their filters delay nothing. The
// splits are tried every quarter of a millisecond, then to the sample
// about the best. lo is the earliest sample it may take. With a spread
// (samples) above zero, each split's likelihood is weighed by a normal
// spread about due (a sample, not necessarily whole).
func (r *refiner) place(b, block, lo int, due, spread float64) int {
	x, rate := r.x, r.rate
	c := b * block
	start := max(lo, c-int(refineBefore*float64(rate)))
	end := min(len(x), c+int(refineAfter*float64(rate)))
	m := max(2, int(refineMin*float64(rate)))
	n := end - start
	if n < 2*m+1 {
		return c
	}
	r.split(start, end)
	bands := r.heads[:len(r.widths)]
	whole := r.heads[len(r.widths)]
	cost := func(i int) float64 {
		// Only a rise is an onset: a split where the whole sound falls
		// is the end of a burst, not a start.
		if i < m || n-i < m || (whole[n]-whole[i])/float64(n-i) <= whole[i]/float64(i) {
			return math.Inf(1)
		}
		sum := 0.0
		for k, h := range bands {
			tiny := 1e-30 + 1e-9*h[n]/float64(n)
			v1 := h[i]/float64(i) + tiny
			v2 := (h[n]-h[i])/float64(n-i) + tiny
			sum += r.widths[k] * (float64(i)*math.Log(v1) + float64(n-i)*math.Log(v2))
		}
		if spread > 0 {
			// The cost is twice the negative log-likelihood; so is this.
			z := (float64(start+i) - due) / spread
			sum += z * z
		}
		return sum
	}
	stride := max(1, rate/4000)
	best, bestCost := -1, math.Inf(1)
	// The splits tried lie near the block found (the whole stretch
	// still weighs each).
	first := max(m, c-int(splitBefore*float64(rate))-start)
	last := min(n-m, c+int(splitAfter*float64(rate))-start)
	for i := first; i <= last; i += stride {
		if v := cost(i); v < bestCost {
			best, bestCost = i, v
		}
	}
	if best < 0 {
		return c
	}
	for i := best - stride + 1; i < best+stride; i++ {
		if v := cost(i); v < bestCost {
			best, bestCost = i, v
		}
	}
	return start + best
}

// split fills heads[k] with the running energy of band k over x[start:end]
// (heads[k][i]: the energy of its first i samples), and the last of heads
// with that of the whole sound. Each band is the difference of two
// zero-phase low-passes; the stretch is filtered with 3 ms either side
// for the filters to settle (they do in under 2 ms).
func (r *refiner) split(start, end int) {
	pad := int(0.003 * float64(r.rate))
	from, to := max(0, start-pad), min(len(r.x), end+pad)
	w := r.x[from:to]
	r.below = append(r.below[:0], make([]float64, len(w))...)
	for k := range r.filters {
		r.low = append(r.low[:0], w...)
		f := r.filters[k]
		f.filter(r.low, r.low)
		f = r.filters[k]
		f.filterBack(r.low)
		r.heads[k] = prefixEnergy(r.heads[k][:0], r.low[start-from:end-from], r.below[start-from:end-from])
		r.low, r.below = r.below, r.low
	}
	top := len(r.filters)
	r.heads[top] = prefixEnergy(r.heads[top][:0], w[start-from:end-from], r.below[start-from:end-from])
	r.heads[top+1] = prefixEnergy(r.heads[top+1][:0], w[start-from:end-from], nil)
}

// prefixEnergy appends to dst the running sum of the squares of a - b (b
// nil: of a): dst[i] is the energy of the first i samples.
func prefixEnergy(dst, a, b []float64) []float64 {
	sum := 0.0
	dst = append(dst, 0)
	if b == nil {
		for _, v := range a {
			sum += v * v
			dst = append(dst, sum)
		}
		return dst
	}
	b = b[:len(a)]
	for i, v := range a {
		d := v - b[i]
		sum += d * d
		dst = append(dst, sum)
	}
	return dst
}

// detector finds the onsets of a prepared recording, and places them
// again once the rhythm says where each is due.
type detector struct {
	p     *prepared
	rate  int // the analysis rate, near enough for the sizes of windows
	block int // samples a block (a millisecond)
	rise  []float64
	ref   *refiner
	picks []int // each onset's block
	los   []int // the earliest sample each onset may take
}

// newDetector works out the onset function of p.
func newDetector(p *prepared) *detector {
	d := &detector{p: p, rate: int(p.analysisRate())}
	d.block = max(1, int(math.Round(p.analysisRate()/1000)))
	d.rise = rises(bandEnergies(p.x, d.rate, d.block))
	d.ref = newRefiner(p.x, d.rate)
	return d
}

// onsets picks the onsets and places each to the sample.
func (d *detector) onsets() []Onset {
	d.picks = pickOnsets(d.rise)
	onsets := make([]Onset, 0, len(d.picks))
	prev := math.MinInt / 2
	for _, b := range d.picks {
		// The stretch before an onset starts no earlier than half way
		// from the onset before it: the sound just after that onset is
		// its burst, not the quiet this one rises from.
		lo := max(0, prev+int(refineMin*float64(d.rate)), (prev+b*d.block)/2)
		s := d.ref.place(b, d.block, lo, 0, 0)
		d.los = append(d.los, lo)
		onsets = append(onsets, Onset{Seconds: d.p.seconds(s), RiseDB: d.rise[b], Beat: -1, Turn: -1})
		prev = s
	}
	return onsets
}

// recover looks for an onset due at due (seconds) give or take spread:
// the largest rise within 6 ms of it, if at least least dB, placed as
// again places.
func (d *detector) recover(due, spread, least float64) (Onset, bool) {
	centre := int(math.Round(due * d.p.analysisRate() / float64(d.block)))
	best := -1
	for b := max(beforeBlocks, centre-6); b <= min(len(d.rise)-1, centre+6); b++ {
		if best < 0 || d.rise[b] > d.rise[best] {
			best = b
		}
	}
	if best < 0 || d.rise[best] < least {
		return Onset{}, false
	}
	s := d.ref.place(best, d.block, 0, d.toSample(due), spread*d.p.analysisRate())
	return Onset{Seconds: d.p.seconds(s), RiseDB: d.rise[best], Turn: -1}, true
}

// toSample is the sample of x (not necessarily whole) at sec seconds.
func (d *detector) toSample(sec float64) float64 {
	return (sec*float64(d.p.rate) - float64(d.p.d-1)/2) / float64(d.p.d)
}

// again places onset i again, where due is when the rhythm says it is due
// (seconds) give or take spread: the split's likelihood is weighed by a
// normal spread about due. It returns the onset's new time.
func (d *detector) again(i int, due, spread float64) float64 {
	s := d.ref.place(d.picks[i], d.block, d.los[i], d.toSample(due), spread*d.p.analysisRate())
	return d.p.seconds(s)
}

// median returns the median of v, reordering v.
func median(v []float64) float64 {
	return centile(v, 0.5)
}

// centile returns the q-th centile (0..1) of v by the nearest rank,
// reordering v; 0 for none. (sort.Slice: the app's build carries one sort
// routine for every element type.)
func centile(v []float64, q float64) float64 {
	if len(v) == 0 {
		return 0
	}
	sort.Slice(v, func(i, j int) bool { return v[i] < v[j] })
	i := int(math.Round(q * float64(len(v)-1)))
	return v[i]
}

// sortFloats sorts v in increasing order.
func sortFloats(v []float64) {
	sort.Slice(v, func(i, j int) bool { return v[i] < v[j] })
}
