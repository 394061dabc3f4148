package listen

import (
	"math"
)

// speedModel is the engine's speed through the recording: the time one
// turn takes, as a polynomial in the time from the middle of the
// recording (seconds), held within a factor of two of its mean.
type speedModel struct {
	coef   []float64 // turn time = coef[0] + coef[1] u + coef[2] u^2, u = t - mid
	mid    float64
	lo, hi float64 // the turn time is held within these
}

// turnSeconds is the time one turn takes at t.
func (m *speedModel) turnSeconds(t float64) float64 {
	u := t - m.mid
	v, p := 0.0, 1.0
	for _, c := range m.coef {
		v += c * p
		p *= u
	}
	return min(m.hi, max(m.lo, v))
}

// turnsBetween is the number of turns (the wheel's phase) from a to b:
// the integral of 1 / turn time, by Simpson's rule over steps no longer
// than a twentieth of a turn.
func (m *speedModel) turnsBetween(a, b float64) float64 {
	if b == a {
		return 0
	}
	n := 2 * max(1, int(math.Ceil(math.Abs(b-a)/(0.1*m.lo))))
	h := (b - a) / float64(n)
	sum := 1/m.turnSeconds(a) + 1/m.turnSeconds(b)
	for i := 1; i < n; i++ {
		w := 2.0
		if i%2 == 1 {
			w = 4
		}
		sum += w / m.turnSeconds(a+float64(i)*h)
	}
	return sum * h / 3
}

// roughTurn is the time of a turn from the spacing of the onsets in
// guide (the beats a turn times their mean spacing: a missed and a
// spurious onset cancel in the mean), then the strongest lag of the whole
// onset train within 0.4 of a beat of it (the lag finds the turn however
// uneven the beats within it). It returns 0 when nothing repeats.
func roughTurn(guide, times []float64, n int) float64 {
	if len(guide) < 2 {
		return 0
	}
	guess := float64(n) * (guide[len(guide)-1] - guide[0]) / float64(len(guide)-1)
	lo, hi := guess*(1-0.4/float64(n)), guess*(1+0.4/float64(n))
	sigma := 0.004 * guess
	const steps = 240
	score := make([]float64, steps+1)
	step := (hi - lo) / steps
	for i, a := range times {
		for _, b := range times[i+1:] {
			d := b - a
			if d > hi+3*sigma {
				break
			}
			if d < lo-3*sigma {
				continue
			}
			k0 := max(0, int(math.Floor((d-3*sigma-lo)/step)))
			k1 := min(steps, int(math.Ceil((d+3*sigma-lo)/step)))
			for k := k0; k <= k1; k++ {
				z := (lo + float64(k)*step - d) / sigma
				score[k] += math.Exp(-z * z / 2)
			}
		}
	}
	best := -1
	for k, s := range score {
		if s > 0 && (best < 0 || s > score[best]) {
			best = k
		}
	}
	if best < 0 {
		return 0
	}
	return lo + float64(best)*step
}

// pairs finds, for each onset, the onset one turn later (within a quarter
// of a beat of where turn says), and returns each pair's middle time and
// length.
func pairs(times []float64, n int, turn func(t float64) float64) (mids, lens []float64) {
	j := 0
	for i, a := range times {
		T := turn(a)
		tol := 0.25 * T / float64(n)
		for j < len(times) && times[j] < a+T-tol {
			j++
		}
		best := -1
		for k := max(j, i+1); k < len(times) && times[k] <= a+T+tol; k++ {
			if best < 0 || math.Abs(times[k]-a-T) < math.Abs(times[best]-a-T) {
				best = k
			}
		}
		if best >= 0 {
			mids = append(mids, (a+times[best])/2)
			lens = append(lens, times[best]-a)
		}
	}
	return mids, lens
}

// fitSpeed fits the turn time through the recording to the pairs of
// onsets a turn apart: a quadratic in time (a line over fewer than eight
// turns' span, a constant over fewer than four), by least squares with
// pairs far off the curve (a spurious onset that happened to pair) left
// out and the fit made again, three times.
func fitSpeed(times []float64, n int, rough float64) (*speedModel, int) {
	m := &speedModel{coef: []float64{rough}, lo: rough / 2, hi: rough * 2}
	if len(times) > 0 {
		m.mid = (times[0] + times[len(times)-1]) / 2
	}
	used := 0
	for range 3 {
		mids, lens := pairs(times, n, m.turnSeconds)
		if len(mids) < 2 {
			return m, len(mids)
		}
		span := mids[len(mids)-1] - mids[0]
		degree := 0
		switch {
		case span >= 8*rough:
			degree = 2
		case span >= 4*rough:
			degree = 1
		}
		// Leave out pairs more than 4 robust deviations (and more than
		// half a percent of a turn) off the present curve.
		res := make([]float64, len(mids))
		for i := range mids {
			res[i] = math.Abs(lens[i] - m.turnSeconds(mids[i]))
		}
		limit := max(4*1.4826*median(append([]float64(nil), res...)), 0.005*rough)
		var xs, ys []float64
		for i := range mids {
			if res[i] <= limit {
				xs = append(xs, mids[i]-m.mid)
				ys = append(ys, lens[i])
			}
		}
		if c := polyFit(xs, ys, degree); c != nil {
			m.coef = c
			used = len(xs)
		}
	}
	return m, used
}

// polyFit is the least-squares polynomial of the degree through (x, y),
// by the normal equations (three unknowns at most, x centred), or nil
// when there are too few points or they cannot fix it.
func polyFit(x, y []float64, degree int) []float64 {
	k := degree + 1
	if len(x) < 2*k {
		return nil
	}
	var a [3][4]float64
	for i := range x {
		p := [3]float64{1, x[i], x[i] * x[i]}
		for r := range k {
			for c := range k {
				a[r][c] += p[r] * p[c]
			}
			a[r][k] += p[r] * y[i]
		}
	}
	// Gaussian elimination with partial pivoting.
	for c := range k {
		piv := c
		for r := c + 1; r < k; r++ {
			if math.Abs(a[r][c]) > math.Abs(a[piv][c]) {
				piv = r
			}
		}
		if math.Abs(a[piv][c]) < 1e-300 {
			return nil
		}
		a[c], a[piv] = a[piv], a[c]
		for r := range k {
			if r != c {
				f := a[r][c] / a[c][c]
				for j := c; j <= k; j++ {
					a[r][j] -= f * a[c][j]
				}
			}
		}
	}
	out := make([]float64, k)
	for c := range k {
		out[c] = a[c][k] / a[c][c]
		if math.IsNaN(out[c]) || math.IsInf(out[c], 0) {
			return nil
		}
	}
	return out
}

// phases is each onset's place in turns of the wheel since the first
// onset, by the speed model.
func phases(times []float64, m *speedModel) []float64 {
	ph := make([]float64, len(times))
	for i := 1; i < len(times); i++ {
		ph[i] = ph[i-1] + m.turnsBetween(times[i-1], times[i])
	}
	return ph
}

// beatPlaces finds where in the turn the n beats fall: the n highest peaks
// of the onsets' places within the turn (a circular histogram of 720 bins
// smoothed over 3 degrees), each at least half an even beat from the
// others, as fractions of a turn in increasing order.
func beatPlaces(ph []float64, n int) []float64 {
	const bins = 720
	hist := make([]float64, bins)
	for _, p := range ph {
		f := p - math.Floor(p)
		hist[int(f*bins)%bins]++
	}
	const sigmaBins = 6 // 3 degrees
	// The smoothing's weights, the same for every bin: worked out once.
	var kernel [6*sigmaBins + 1]float64
	for d := range kernel {
		z := float64(d-3*sigmaBins) / sigmaBins
		kernel[d] = math.Exp(-z * z / 2)
	}
	smooth := make([]float64, bins)
	for i := range bins {
		for d, k := range kernel {
			smooth[i] += hist[(i+d-3*sigmaBins+bins)%bins] * k
		}
	}
	apart := bins / (2 * n)
	var places []float64
	taken := make([]bool, bins)
	for range n {
		best := -1
		for i, v := range smooth {
			if !taken[i] && v > 0 && (best < 0 || v > smooth[best]) {
				best = i
			}
		}
		if best < 0 {
			break
		}
		for d := -apart + 1; d < apart; d++ {
			taken[(best+d+bins)%bins] = true
		}
		places = append(places, (float64(best)+0.5)/bins)
	}
	sortFloats(places)
	return places
}

// rhythm is the speed of the wheel through the recording and the places
// of the beats in a turn.
type rhythm struct {
	model  *speedModel
	ph     []float64 // each onset's place, turns
	places []float64 // the beats' places in a turn, fractions
	near   int       // onsets within a fifth of a beat of a place
}

// findRhythm finds the rhythm of the onsets at times that rose rise dB,
// n beats a turn. The rough turn comes from the mean spacing of all the
// onsets, and of those that rose more than a fifth, a third, a half and
// two thirds of the rest: spurious onsets (a loud roar at a slow speed
// lets many through) shorten the mean spacing of them all, missed beats
// lengthen that of the loudest. Each rough turn is taken through to the
// beats' places; the rhythm kept is the one with the most onsets near a
// place. ok is false when none folds.
func findRhythm(times, rise []float64, n int) (best rhythm, ok bool) {
	sorted := append([]float64(nil), rise...)
	sortFloats(sorted)
	for _, q := range []float64{0, 0.2, 0.35, 0.5, 0.65} {
		least := sorted[int(q*float64(len(sorted)-1))]
		var guide []float64
		for i, t := range times {
			if rise[i] >= least {
				guide = append(guide, t)
			}
		}
		rough := roughTurn(guide, times, n)
		if rough <= 0 {
			continue
		}
		model, used := fitSpeed(times, n, rough)
		if used < n {
			continue
		}
		ph := phases(times, model)
		places := beatPlaces(ph, n)
		if len(places) < n {
			continue
		}
		r := rhythm{model: model, ph: ph, places: places}
		for _, p := range ph {
			for _, pc := range places {
				if math.Abs(circularOffset(p, pc)) < 0.2/float64(n) {
					r.near++
					break
				}
			}
		}
		if !ok || r.near > best.near {
			best, ok = r, true
		}
	}
	return best, ok
}

// circularOffset is a - b in turns, wrapped into -0.5..0.5.
func circularOffset(a, b float64) float64 {
	d := a - b
	return d - math.Round(d)
}
