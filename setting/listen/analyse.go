package listen

import (
	"fmt"
	"math"
	"sort"
)

// Result is what a recording says of the engine's beat. The beats are
// numbered round the turn from the one whose place differs most from an
// even beat (Beats[0], the odd beat), in the order heard.
type Result struct {
	BeatsPerTurn int
	Seconds      float64 // the recording's length
	Onsets       []Onset // every onset heard, in time order
	Turns        int     // turns of the wheel the folded beats span
	Missed       int     // beats due within those turns that were not heard
	Spurious     int     // onsets on no beat, left out
	RevPerMin    float64 // mean speed over the folded beats
	// SpeedChange is how much faster the engine turned at the end than at
	// the start, as a fraction (0.03: 3 % faster; negative: slower).
	SpeedChange float64
	Beats       []BeatHeard // in order round the turn, from the odd beat
	Evenness    float64     // largest gap / smallest gap; 1 is even
	Odd         OddBeat     // how far Beats[0] is from an even beat
	Notes       []string    // what weakens the figures, one sentence each
}

// BeatHeard is one beat of the turn as heard, averaged over the turns.
type BeatHeard struct {
	// Deg is where the beat falls in degrees of crank after beat 1
	// (Beats[0], so 0 for it), from 0 to 360.
	Deg float64
	// Offset is how many degrees of crank later than an even beat it
	// comes (negative: earlier), the even beats placed to fit all the
	// beats best; OffsetDoubt is its standard error.
	Offset, OffsetDoubt float64
	Heard               int // turns it was heard in
	Gap                 Gap // from this beat to the next (the last to beat 1)
}

// Gap is the crank angle between two successive beats.
type Gap struct {
	Deg     float64 // mean, degrees of crank; the gaps of a turn sum to 360
	Scatter float64 // standard deviation from turn to turn, degrees
	Turns   int     // turns it was measured in
}

// Share is the gap as a percentage of an even beat (360 / beats a turn).
func (g Gap) Share(beatsPerTurn int) float64 {
	return g.Deg / (360 / float64(beatsPerTurn)) * 100
}

// OddBeat says how the odd beat (Beats[0]) comes.
type OddBeat struct {
	Deg   float64 // degrees of crank late (negative: early) against an even beat
	Doubt float64 // standard error of Deg
	// StandsOut is set when the beat is off an even beat by at least one
	// degree and three standard errors, and more off than any other beat
	// by three standard errors: only then is it "the" late or early beat.
	StandsOut bool
}

// Late reports whether the odd beat comes late (false: early).
func (o OddBeat) Late() bool { return o.Deg > 0 }

// MinBeatsPerTurn and MaxBeatsPerTurn bound the beats a turn: one cylinder
// gives two, two give four, three give six.
const (
	MinBeatsPerTurn = 2
	MaxBeatsPerTurn = 12
	minTurns        = 3 // the fewest turns the folding can work from
)

// Analyse finds the beat of an engine in a recording: samples are mono,
// from -1 to 1, at rate samples a second (8000 to 48000), at most ten
// minutes; beatsPerTurn is 4 for two cylinders, 6 for three. It finds the
// onsets, the turn from their rhythm (the speed may drift), folds the
// beats onto turns of the wheel and averages their places. Input it
// cannot use is refused with an *Error whose sentence says what to do.
func Analyse(samples []float32, rate, beatsPerTurn int) (*Result, error) {
	if err := checkInput(samples, rate, beatsPerTurn); err != nil {
		return nil, err
	}
	r := &Result{BeatsPerTurn: beatsPerTurn, Seconds: float64(len(samples)) / float64(rate)}
	p := prepare(samples, rate)
	notes, err := levelNotes(p)
	if err != nil {
		return nil, err
	}
	r.Notes = notes
	d := newDetector(p)
	r.Onsets = d.onsets()
	if err := r.fold(d); err != nil {
		return nil, err
	}
	return r, nil
}

// checkInput refuses what the analysis cannot take, in the user's words.
func checkInput(samples []float32, rate, n int) error {
	if n < MinBeatsPerTurn || n > MaxBeatsPerTurn {
		return &Error{Field: "beats a turn", Message: fmt.Sprintf("The beats a turn must be from %d to %d (4 for two cylinders, 6 for three; got %d).", MinBeatsPerTurn, MaxBeatsPerTurn, n)}
	}
	if rate < MinRate || rate > MaxRate {
		return refuse("The recording's sample rate is %d Hz; it must be %d to %d Hz (44100 or 48000 are usual).", rate, MinRate, MaxRate)
	}
	if len(samples) > MaxSeconds*rate {
		return refuse("The recording is %.1f minutes long; at most %d minutes can be analysed: record a shorter piece (half a minute is plenty).", float64(len(samples))/float64(rate)/60, MaxSeconds/60)
	}
	if len(samples) == 0 {
		return refuse("The recording is empty; record the engine running for 10 to 20 seconds.")
	}
	if len(samples) < rate {
		return refuse("The recording is only %.2f s long; record the engine running for 10 to 20 seconds.", float64(len(samples))/float64(rate))
	}
	return nil
}

// levelNotes refuses a recording of silence or of samples that are not
// numbers, and warns of a clipped one: a flattened burst has a smeared
// onset.
func levelNotes(p *prepared) ([]string, error) {
	if p.bad {
		return nil, refuse("The recording holds samples that are not numbers; record it again.")
	}
	if !p.loud {
		return nil, refuse("The recording is silent; check that the microphone may be used and hold the phone at the chimney or exhaust.")
	}
	if share := float64(p.full) / float64(len(p.x)*p.d); share > 0.001 {
		return []string{fmt.Sprintf("The recording is overloaded (%.1f %% of it at full scale), which blurs the beats: hold the phone a little further from the chimney or exhaust.", 100*share)}, nil
	}
	return nil, nil
}

// fold works out the turn from the onsets, folds the onsets onto the
// beats of a turn and fills in the figures.
func (r *Result) fold(d *detector) error {
	n := r.BeatsPerTurn
	times := make([]float64, len(r.Onsets))
	for i, o := range r.Onsets {
		times[i] = o.Seconds
	}
	if len(times) < minTurns*n {
		return refuse("Only %d beats were heard in %.1f s, too few to find %d beats a turn; record at least %d turns (10 to 20 seconds), with the phone at the chimney or exhaust.",
			len(times), r.Seconds, n, 2*minTurns)
	}
	rise := make([]float64, len(r.Onsets))
	for i, o := range r.Onsets {
		rise[i] = o.RiseDB
	}
	rh, ok := findRhythm(times, rise, n)
	if !ok {
		return r.noFold()
	}
	model, ph, places := rh.model, rh.ph, rh.places
	k := r.assign(ph, places)
	spread := r.placeAgain(d, ph, places, k, model)
	r.Onsets, k = r.recoverBeats(d, k, spread, model)
	times = times[:0]
	for _, o := range r.Onsets {
		times = append(times, o.Seconds)
	}
	ph = phases(times, model)
	if err := r.measure(ph, places, k, model); err != nil {
		return err
	}
	r.RevPerMin = 60 * (ph[r.lastFolded()] - ph[r.firstFolded()]) / (times[r.lastFolded()] - times[r.firstFolded()])
	r.SpeedChange = model.turnSeconds(times[r.firstFolded()])/model.turnSeconds(times[r.lastFolded()]) - 1
	r.addNotes()
	return nil
}

// noFold is the refusal when the onsets do not fold into beats a turn.
func (r *Result) noFold() error {
	return refuse("The %d onsets heard do not fall into %d beats a turn. Check the beats a turn (4 for two cylinders, 6 for three), run the engine steadily and record at least %d turns with the phone at the chimney or exhaust.",
		len(r.Onsets), r.BeatsPerTurn, 2*minTurns)
}

// assign gives each onset its beat (the nearest place, within a fifth of
// an even beat) and its turn; two onsets on one beat of one turn keep the
// one that rose more. The places are moved to the median of their onsets
// (a stray onset does not pull a median) and the onsets assigned again
// once. It returns each onset's turn, or 0 where it has no beat.
func (r *Result) assign(ph, places []float64) []int {
	n := len(places)
	tol := 0.2 / float64(n)
	turn := make([]int, len(ph))
	for pass := range 2 {
		offsets := make([][]float64, n)
		for i, p := range ph {
			r.Onsets[i].Beat, turn[i] = -1, 0
			best, bestD := -1, tol
			for c, pc := range places {
				if d := math.Abs(circularOffset(p, pc)); d < bestD {
					best, bestD = c, d
				}
			}
			if best >= 0 {
				r.Onsets[i].Beat = best
				turn[i] = int(math.Round(p - places[best]))
				offsets[best] = append(offsets[best], circularOffset(p, places[best]))
			}
		}
		if pass == 0 {
			for c := range places {
				places[c] += median(offsets[c])
			}
		}
	}
	// One onset per beat per turn.
	seen := map[[2]int]int{}
	for i, o := range r.Onsets {
		if o.Beat < 0 {
			continue
		}
		key := [2]int{turn[i], o.Beat}
		if j, ok := seen[key]; ok {
			if r.Onsets[j].RiseDB >= o.RiseDB {
				r.Onsets[i].Beat = -1
				continue
			}
			r.Onsets[j].Beat = -1
		}
		seen[key] = i
	}
	return turn
}

// placeAgain places each onset on a beat again, weighing where the
// sound says it starts by where the rhythm says it is due: at the median
// place of its beat's onsets in their turns, give or take their spread
// (1.4826 median absolute deviations, at least 0.25 ms). An onset the
// sound alone placed a few milliseconds off, on a quiet burst or a loud
// moment of the roar, is so drawn back to where its burst most likely
// starts. An onset more than six spreads (and 3 ms) from its due time
// first is no beat at all: a knock that fell near where a missed beat was
// due, or a burst's flutter; it is left out.
func (r *Result) placeAgain(d *detector, ph, places []float64, turn []int, model *speedModel) (spread []float64) {
	n := len(places)
	off := make([]float64, len(r.Onsets)) // seconds after the beat's place
	byBeat := make([][]float64, n)
	for i, o := range r.Onsets {
		if o.Beat >= 0 {
			off[i] = (ph[i] - float64(turn[i]) - places[o.Beat]) * model.turnSeconds(o.Seconds)
			byBeat[o.Beat] = append(byBeat[o.Beat], off[i])
		}
	}
	mid := make([]float64, n)
	spread = make([]float64, n)
	for c, v := range byBeat {
		mid[c] = median(v)
		for j := range v {
			v[j] = math.Abs(v[j] - mid[c])
		}
		spread[c] = max(0.25e-3, 1.4826*median(v))
	}
	for i, o := range r.Onsets {
		if o.Beat < 0 {
			continue
		}
		if late := math.Abs(off[i] - mid[o.Beat]); late > max(6*spread[o.Beat], 3e-3) {
			r.Onsets[i].Beat = -1
			continue
		}
		r.Onsets[i].Seconds = d.again(i, o.Seconds-off[i]+mid[o.Beat], spread[o.Beat])
	}
	return spread
}

// recoverBeats looks again where a beat was due but none was heard, a
// turn after or before the same beat was: the largest rise within 6 ms of
// the due time is taken as the beat if it rose at least minRiseDB and a
// fifth of that beat's median rise (a burst quietened by the one before
// it), placed as placeAgain places. The planted silence of a missed beat
// has no such rise. It returns the onsets with those found, in time
// order, and their turns.
func (r *Result) recoverBeats(d *detector, turn []int, spread []float64, model *speedModel) ([]Onset, []int) {
	n := r.BeatsPerTurn
	at := map[[2]int]int{}
	rises := make([][]float64, n)
	lo, hi := math.MaxInt, math.MinInt
	for i, o := range r.Onsets {
		if o.Beat >= 0 {
			at[[2]int{turn[i], o.Beat}] = i
			rises[o.Beat] = append(rises[o.Beat], o.RiseDB)
			lo, hi = min(lo, turn[i]*n+o.Beat), max(hi, turn[i]*n+o.Beat)
		}
	}
	least := make([]float64, n)
	for c := range n {
		least[c] = max(minRiseDB, 0.2*median(rises[c]))
	}
	onsets, turns := r.Onsets, turn
	for slot := lo + 1; slot < hi; slot++ {
		k, c := floorDiv(slot, n), slot-floorDiv(slot, n)*n
		if _, ok := at[[2]int{k, c}]; ok {
			continue
		}
		var due float64
		if i, ok := at[[2]int{k - 1, c}]; ok {
			due = r.Onsets[i].Seconds + model.turnSeconds(r.Onsets[i].Seconds)
		} else if i, ok := at[[2]int{k + 1, c}]; ok {
			due = r.Onsets[i].Seconds - model.turnSeconds(r.Onsets[i].Seconds)
		} else {
			continue
		}
		if o, ok := d.recover(due, spread[c], least[c]); ok {
			o.Beat = c
			onsets = append(onsets, o)
			turns = append(turns, k)
		}
	}
	// Back into time order, turns alongside.
	idx := make([]int, len(onsets))
	for i := range idx {
		idx[i] = i
	}
	sort.Slice(idx, func(a, b int) bool {
		ta, tb := onsets[idx[a]].Seconds, onsets[idx[b]].Seconds
		return ta < tb || (ta == tb && idx[a] < idx[b]) // stable: sort.Slice is the app's one sort routine
	})
	outO := make([]Onset, len(onsets))
	outT := make([]int, len(onsets))
	for j, i := range idx {
		outO[j], outT[j] = onsets[i], turns[i]
	}
	return outO, outT
}

// floorDiv is a / b rounded down (b > 0).
func floorDiv(a, b int) int {
	q := a / b
	if a%b != 0 && a < 0 {
		q--
	}
	return q
}

// measure averages each beat's place over the turns, renumbers the beats
// from the odd one and fills in beats, gaps, evenness and counts.
func (r *Result) measure(ph, places []float64, turn []int, model *speedModel) error {
	n := len(places)
	sum := make([]float64, n)
	sq := make([]float64, n)
	count := make([]int, n)
	at := map[[2]int]float64{} // (turn, beat) -> phase
	var keys [][2]int          // at's keys in time order, for sums that do not depend on a map's order
	for i, o := range r.Onsets {
		if o.Beat < 0 {
			continue
		}
		v := 360 * (ph[i] - float64(turn[i]))
		sum[o.Beat] += v
		sq[o.Beat] += v * v
		count[o.Beat]++
		at[[2]int{turn[i], o.Beat}] = ph[i]
		keys = append(keys, [2]int{turn[i], o.Beat})
	}
	lowest := len(r.Onsets)
	for _, c := range count {
		lowest = min(lowest, c)
	}
	first, last := r.firstFolded(), r.lastFolded()
	span := turn[last] - turn[first] + 1
	if lowest < 2 || float64(lowest) < 0.4*float64(span) {
		return r.noFold()
	}
	place := make([]float64, n)
	doubt := make([]float64, n)
	for c := range n {
		m := sum[c] / float64(count[c])
		place[c] = m
		if count[c] > 1 {
			sd := math.Sqrt(max(0, (sq[c]-float64(count[c])*m*m)/float64(count[c]-1)))
			doubt[c] = sd / math.Sqrt(float64(count[c]))
		}
	}
	offset := evenOffsets(place)
	odd := 0
	for c := range n {
		if math.Abs(offset[c]) > math.Abs(offset[odd]) {
			odd = c
		}
	}
	r.renumber(odd, turn)
	r.Beats = make([]BeatHeard, n)
	for j := range n {
		c := (j + odd) % n
		deg := place[c] - place[odd]
		if c < odd {
			deg += 360
		}
		r.Beats[j] = BeatHeard{Deg: deg, Offset: offset[c], OffsetDoubt: doubt[c], Heard: count[c]}
	}
	r.gaps(at, keys, odd)
	r.oddBeat(doubt[odd], n)
	r.Spurious = 0
	for _, o := range r.Onsets {
		if o.Beat < 0 {
			r.Spurious++
		}
	}
	folded := len(r.Onsets) - r.Spurious
	f, l := r.Onsets[r.firstFolded()], r.Onsets[r.lastFolded()]
	r.Turns = l.Turn + 1
	r.Missed = (l.Turn*n + l.Beat) - (f.Turn*n + f.Beat) + 1 - folded
	return nil
}

// evenOffsets is how far each place (degrees) is from an even beat, the
// even beats placed to fit: place - c * 360/n, less its mean.
func evenOffsets(place []float64) []float64 {
	n := len(place)
	out := make([]float64, n)
	mean := 0.0
	for c, p := range place {
		out[c] = p - float64(c)*360/float64(n)
		mean += out[c] / float64(n)
	}
	for c := range out {
		out[c] -= mean
	}
	return out
}

// renumber makes beat odd beat 0 and counts turns from the first onset
// folded, a turn starting at the odd beat.
func (r *Result) renumber(odd int, turn []int) {
	n := r.BeatsPerTurn
	firstTurn := math.MaxInt
	for i := range r.Onsets {
		o := &r.Onsets[i]
		if o.Beat < 0 {
			o.Turn = -1
			continue
		}
		o.Turn = turn[i]
		if o.Beat < odd {
			o.Turn--
		}
		o.Beat = (o.Beat - odd + n) % n
		firstTurn = min(firstTurn, o.Turn)
	}
	for i := range r.Onsets {
		if r.Onsets[i].Beat >= 0 {
			r.Onsets[i].Turn -= firstTurn
		}
	}
}

// gaps fills each beat's gap to the next: the mean from the beats' mean
// places (so the gaps sum to 360), the scatter from turn to turn. at holds
// each folded onset's phase by (turn, beat) in the numbering before odd
// was made beat 0, keys its keys in time order.
func (r *Result) gaps(at map[[2]int]float64, keys [][2]int, odd int) {
	n := r.BeatsPerTurn
	sum := make([]float64, n)
	sq := make([]float64, n)
	count := make([]int, n)
	for _, key := range keys {
		k, c, p := key[0], key[1], at[key]
		next := [2]int{k, c + 1}
		if c == n-1 {
			next = [2]int{k + 1, 0}
		}
		q, ok := at[next]
		if !ok {
			continue
		}
		g := 360 * (q - p)
		sum[c] += g
		sq[c] += g * g
		count[c]++
	}
	for j := range n {
		c := (j + odd) % n
		next := r.Beats[(j+1)%n].Deg
		if j == n-1 {
			next = 360
		}
		g := Gap{Deg: next - r.Beats[j].Deg, Turns: count[c]}
		if count[c] > 1 {
			m := sum[c] / float64(count[c])
			g.Scatter = math.Sqrt(max(0, (sq[c]-float64(count[c])*m*m)/float64(count[c]-1)))
		}
		r.Beats[j].Gap = g
	}
	lo, hi := math.Inf(1), 0.0
	for _, b := range r.Beats {
		lo, hi = min(lo, b.Gap.Deg), max(hi, b.Gap.Deg)
	}
	r.Evenness = hi / lo
}

// oddBeat fills Odd from Beats[0] and the other beats' offsets.
func (r *Result) oddBeat(doubt0 float64, n int) {
	// The offset is the place less the mean of all places: its variance
	// takes (1 - 1/n)^2 of its own and 1/n^2 of each other's.
	v := doubt0 * doubt0 * (1 - 1/float64(n)) * (1 - 1/float64(n))
	runner := 0.0
	for _, b := range r.Beats[1:] {
		v += b.OffsetDoubt * b.OffsetDoubt / float64(n*n)
		runner = max(runner, math.Abs(b.Offset))
	}
	o := OddBeat{Deg: r.Beats[0].Offset, Doubt: math.Sqrt(v)}
	off := math.Abs(o.Deg)
	o.StandsOut = off >= 1 && off >= 3*o.Doubt && off-runner >= 3*o.Doubt
	r.Odd = o
}

// firstFolded and lastFolded are the indices of the first and last onsets
// on a beat.
func (r *Result) firstFolded() int {
	for i, o := range r.Onsets {
		if o.Beat >= 0 {
			return i
		}
	}
	return 0
}

func (r *Result) lastFolded() int {
	for i := len(r.Onsets) - 1; i >= 0; i-- {
		if r.Onsets[i].Beat >= 0 {
			return i
		}
	}
	return 0
}

// addNotes says what weakens the figures.
func (r *Result) addNotes() {
	if r.Turns < 8 {
		r.Notes = append(r.Notes, fmt.Sprintf("Only %d turns were heard; 10 or more make the gaps surer: record for longer.", r.Turns))
	}
	if heard := len(r.Onsets) - r.Spurious; r.Spurious > heard/10 {
		r.Notes = append(r.Notes, fmt.Sprintf("%d of the %d onsets heard fell on no beat and were left out: other noises are loud; record closer to the chimney or exhaust, with nobody talking.", r.Spurious, len(r.Onsets)))
	}
	if math.Abs(r.SpeedChange) > 0.1 {
		r.Notes = append(r.Notes, fmt.Sprintf("The speed changed by %.0f %% during the recording; a steadier run makes the gaps surer.", 100*r.SpeedChange))
	}
}
