package setting

import (
	"fmt"
	"math"
)

// Motion is a valve-motion function: the valve displacement in mm from its
// central position, positive forward, at crank angle thetaDeg (degrees from
// front dead centre in the forward running direction). It must be periodic
// in 360 degrees. A gear in a reverser position, a fitted harmonic series or
// a measured curve all give one.
type Motion func(thetaDeg float64) (float64, error)

// Event is one valve event.
type Event struct {
	// CrankDeg is the crank angle in degrees, in [0, 360), from front dead
	// centre in the forward running direction (whichever way the engine runs).
	CrankDeg float64
	// StrokePercent is the piston's distance from this end's dead-centre
	// position as a percentage of the stroke: 0 at this end's dead centre,
	// 100 at the other. A front cut-off at 75 % means the piston has done
	// three quarters of the front stroke; compression at 10 % means it is a
	// tenth of the stroke short of this end (90 % of the return stroke done).
	StrokePercent float64
}

// EndEvents are the valve events of one end of the cylinder in one running
// direction. Events are the edges of the port opening in the order time
// brings them: admission (steam edge opens), cut-off (steam edge closes),
// release (exhaust edge opens), compression (exhaust edge closes).
type EndEvents struct {
	Admission, CutOff, Release, Compression Event

	// Lead is the signed steam opening at this end's dead centre in mm:
	// positive open, negative still lapped by that much. Not capped by the
	// port width.
	Lead float64
	// LeadAngle is how many crank degrees before this end's dead centre, in
	// time, admission happens (negative: after dead centre). Zero when the
	// port never opens or never closes.
	LeadAngle float64
	// MaxOpening is the largest linear steam opening in mm over a turn,
	// capped by the port width; MaxOpeningArea the matching open area in
	// mm^2 (see Valve.PortArea; 0 when the port length is unknown).
	MaxOpening, MaxOpeningArea float64
	// MaxExhaustOpening is the largest linear exhaust opening in mm.
	MaxExhaustOpening float64

	// NeverOpens: the steam edge never opens (Admission and CutOff are zero).
	// NeverCloses: the port is open to steam all the way round.
	NeverOpens, NeverCloses bool
	// ExhaustNeverOpens and ExhaustNeverCloses are the same for the exhaust
	// edge (Release and Compression are then zero).
	ExhaustNeverOpens, ExhaustNeverCloses bool
	// SteamOpenings and ExhaustOpenings count the separate open periods in a
	// turn: 1 for any ordinary gear. With more, the events above belong to
	// the period that contains (or else first follows) the dead centre for
	// steam, and that contains (or else first follows) the other dead
	// centre for exhaust.
	SteamOpenings, ExhaustOpenings int
}

// EventSet is the valve events of both ends for one valve motion and one
// running direction.
type EventSet struct {
	Direction      Direction
	Front, Back    EndEvents
	BackDeadCentre float64 // crank angle of back dead centre, degrees
	// ValveMin and ValveMax are the extremes of the valve displacement over
	// a turn (mm); their difference is the valve travel.
	ValveMin, ValveMax float64
}

// End returns the events of the given end.
func (s EventSet) End(end CylinderEnd) EndEvents {
	if end == Back {
		return s.Back
	}
	return s.Front
}

// ValveTravel returns the valve's total travel over a turn in mm.
func (s EventSet) ValveTravel() float64 { return s.ValveMax - s.ValveMin }

// Events finds the valve events of both ends for any valve motion, running
// in direction dir.
//
// Method. Every port edge is a straight function of the valve displacement
// (see Admission), so all four edges are searched on one sampling of the
// curve. The motion is sampled at 32 equally spaced crank angles, doubled
// while the top quarter of the samples' trigonometric interpolant carries
// more than a millionth of its harmonics (up to 256 samples): a smooth gear
// curve's harmonics fall off fast, so 32 samples usually suffice, and the
// interpolant then follows the curve far closer than any dial gauge reads
// (roots and extremes are taken on the curve itself). The edge search
// runs on the interpolant; each crossing is then polished on the motion
// itself by Newton's method with the interpolant's slope, safeguarded: a
// step that leaves the crossing's grid step falls back to Brent's method
// on the motion. A curve whose harmonics do not settle (a kink, a jump,
// noise) is searched on the motion directly instead, on the grid of the
// samples already taken, doubled (up to 3840 steps) until its second
// differences are small.
//
// The edge search, step by grid step: a sign change is refined (bracketed
// Newton steps on the interpolant, Brent's method on the motion). A step
// with no sign change whose ends lie closer to the edge than the curve
// could bulge inside it is searched for its extreme; on the interpolant
// the bulge bound is exact (its curvature is at most the sum of k^2 times
// its harmonics), on the motion it is four times what the second
// differences imply. A dip past the edge by more than 1e-9 mm gives two
// crossings (the curve touches and leaves); a smaller one is a touch that
// opens nothing.
//
// The motion's errors are returned as they are (a gear's *Error naming the
// link and the crank angle); a NaN or infinite displacement is an *Error on
// "motion"; engine and valve errors have fields under "engine" and "valve".
func Events(e Engine, v Valve, motion Motion, dir Direction) (EventSet, error) {
	if err := dir.validate(); err != nil {
		return EventSet{}, err
	}
	c, err := e.Prepare()
	if err != nil {
		return EventSet{}, within("engine", err)
	}
	a, err := analyse(c, v, motion)
	if err != nil {
		return EventSet{}, err
	}
	return a.events(dir)
}

const (
	gridStart   = 120  // first grid, steps per turn
	gridMax     = 3840 // finest grid
	rootTol     = 1e-9 // degrees
	touchTol    = 1e-9 // mm: a dip past an edge by less than this opens nothing
	bulgeSafety = 4.0  // bound on the curve's bulge, in multiples of the second-difference estimate
	resolvedAt  = 0.01 // largest second difference, as a fraction of the range, of a resolved grid
	sameAngle   = 1e-7 // degrees: crossings this close pair off as a touch
	minTolDeg   = 1e-6 // tolerance of the minimiser, degrees: the extreme's value is then exact to ~1e-16 of the travel
)

// crossing is where an edge function changes sign.
type crossing struct {
	theta  float64 // degrees in [0, 360]
	rising bool    // closed -> open with increasing theta
	lo, hi float64 // the grid step it was found in
	double bool    // one of a close pair found at a dip past the edge
}

// edgeCrossings is the result for one port edge: its crossings in
// increasing theta, and whether it is open at theta 0 when there are none.
type edgeCrossings struct {
	crossings []crossing
	allOpen   bool
}

// analysis is what the motion gives independent of running direction.
type analysis struct {
	crank      Crank
	valve      Valve
	steam      [2]edgeCrossings // by CylinderEnd
	exhaust    [2]edgeCrossings
	lead       [2]float64
	vmin, vmax float64
}

// sampler holds the motion's samples and lazily refined step extremes.
type sampler struct {
	motion Motion
	// rootTol and minTol are the tolerances in degrees of roots and
	// extremes: tight on the motion, looser on an interpolant whose
	// crossings are polished afterwards.
	rootTol, minTol float64
	// sp, when not nil, is the curve itself: its slope and curvature are
	// known, so roots and extremes are found by Newton's method and the
	// bulge bound is exact.
	sp     *spectrum
	n      int
	h      float64   // step, degrees
	x      []float64 // x[i] at theta i*h, i < n
	bulge  []float64 // bound on the curve's departure from the chord in step i
	lo, hi []extreme // refined min and max of the curve in step i (NaN: not yet)
}

// extreme is a refined extreme of the curve within one step.
type extreme struct{ theta, x float64 }

// eval calls the motion and rejects non-finite values.
func (s *sampler) eval(theta float64) (float64, error) {
	x, err := s.motion(theta)
	if err != nil {
		return 0, err
	}
	if !finiteNum(x) {
		return 0, &Error{"motion", fmt.Sprintf("The valve motion gave a displacement of %g mm at crank angle %.3f degrees; it must be a finite number.", x, theta)}
	}
	return x, nil
}

// at returns sample i, wrapping round the turn.
func (s *sampler) at(i int) float64 {
	return s.x[((i%s.n)+s.n)%s.n]
}

// sample fills the grid, refining it until the curve is resolved. A grid
// already in s.x (equally spaced from theta 0) is the start; otherwise
// gridStart points.
func (s *sampler) sample() error {
	if s.x == nil {
		s.x = make([]float64, gridStart)
		for i := range s.x {
			x, err := s.eval(float64(i) * 360 / float64(len(s.x)))
			if err != nil {
				return err
			}
			s.x[i] = x
		}
	}
	s.n = len(s.x)
	for s.sp == nil {
		lo, hi, d2 := math.Inf(1), math.Inf(-1), 0.0
		for i, x := range s.x {
			lo, hi = math.Min(lo, x), math.Max(hi, x)
			d2 = math.Max(d2, secondDiff(s.x, i))
		}
		if d2 <= resolvedAt*(hi-lo) || s.n >= gridMax {
			break
		}
		finer := make([]float64, 2*s.n)
		for i, x := range s.x {
			finer[2*i] = x
			m, err := s.eval((float64(i) + 0.5) * 360 / float64(s.n))
			if err != nil {
				return err
			}
			finer[2*i+1] = m
		}
		s.x, s.n = finer, 2*s.n
	}
	s.h = 360 / float64(s.n)
	s.bulge = make([]float64, s.n)
	s.lo = make([]extreme, s.n)
	s.hi = make([]extreme, s.n)
	scale, spBulge := 0.0, 0.0
	if s.sp != nil {
		spBulge = s.sp.bulge(s.h)
	}
	d2 := make([]float64, s.n)
	for i, x := range s.x {
		scale = math.Max(scale, math.Abs(x))
		d2[i] = secondDiff(s.x, i)
	}
	for i := range s.x {
		// the second differences at the step's ends and their neighbours
		d := math.Max(math.Max(d2[(i+s.n-1)%s.n], d2[i]), math.Max(d2[(i+1)%s.n], d2[(i+2)%s.n]))
		// a curve with |x''| <= M departs from its chord over a step h by at
		// most M h^2 / 8, and M h^2 is what the second difference measures.
		s.bulge[i] = bulgeSafety*d/8 + 1e-12*(1+scale)
		if s.sp != nil {
			s.bulge[i] = spBulge
		}
		s.lo[i], s.hi[i] = extreme{x: math.NaN()}, extreme{x: math.NaN()}
	}
	return nil
}

// secondDiff returns |x[i+1] - 2 x[i] + x[i-1]|, round the turn.
func secondDiff(x []float64, i int) float64 {
	n := len(x)
	prev, next := i-1, i+1
	if prev < 0 {
		prev = n - 1
	}
	if next == n {
		next = 0
	}
	return math.Abs(x[next] - 2*x[i] + x[prev])
}

// stepExtreme returns the smallest (sign +1) or largest (sign -1) value of
// the curve in step i, refined by Brent's minimiser, with its angle.
func (s *sampler) stepExtreme(i int, sign float64) (theta, x float64, err error) {
	cache := s.lo
	if sign < 0 {
		cache = s.hi
	}
	if c := cache[i]; !math.IsNaN(c.x) {
		return c.theta, c.x, nil
	}
	t0 := float64(i) * s.h
	start := t0 + s.h/2
	if sign*s.at(i+1) < sign*s.at(i) {
		start = t0 + s.h
	} else if sign*s.at(i+1) > sign*s.at(i) {
		start = t0
	}
	t, fx, err := s.extremeIn(t0, t0+s.h, start, sign)
	if err != nil {
		return 0, 0, err
	}
	// the ends are samples; keep whichever is most extreme
	for _, k := range [2]int{i, i + 1} {
		if v := sign * s.at(k); v < fx {
			t, fx = float64(k)*s.h, v
		}
	}
	cache[i] = extreme{t, sign * fx}
	return t, sign * fx, nil
}

// analyse samples the motion and finds every edge crossing.
//
// A smooth curve is sampled at spectralStart points, doubled until its
// trigonometric interpolant is resolved (see spectrum); the edge search
// then runs on the interpolant, which is cheap, and each crossing is
// polished on the motion itself by Newton's method with the interpolant's
// slope (safeguarded: a step leaving the crossing's grid step falls back
// to Brent's method on the motion). A curve whose spectrum does not settle
// by spectralMax points (a kink, a jump, noise) is searched directly.
func analyse(c Crank, v Valve, motion Motion) (*analysis, error) {
	return analyseBy(c, v, motion, true)
}

// analyseBy is analyse, with the interpolant only when spectral is true
// (the tests compare the two searches).
func analyseBy(c Crank, v Valve, motion Motion, spectral bool) (*analysis, error) {
	if err := v.Validate(); err != nil {
		return nil, within("valve", err)
	}
	if motion == nil {
		return nil, &Error{"motion", "No valve motion was given."}
	}
	truth := &sampler{motion: motion, rootTol: rootTol, minTol: minTolDeg}
	sp, samples, err := truth.spectrum()
	if err != nil {
		return nil, err
	}
	if !spectral {
		sp = nil
	}
	s := truth
	if sp == nil {
		// the samples already taken start the direct search's grid
		truth.x = append([]float64(nil), samples...)
	} else {
		// the interpolant passes through the samples: they start its grid
		s = &sampler{x: samples, sp: sp, rootTol: 1e-7, minTol: 1e-4,
			motion: func(t float64) (float64, error) { return sp.at(t), nil }}
	}
	if err := s.sample(); err != nil {
		return nil, err
	}
	a := &analysis{crank: c, valve: v}
	tlo, thi, err := s.extremes()
	if err != nil {
		return nil, err
	}
	if a.vmin, a.vmax, err = truth.extremesAt(tlo, thi, samples); err != nil {
		return nil, err
	}
	sense := v.Admission.sense()
	for _, end := range [2]CylinderEnd{Front, Back} {
		p := v.End(end)
		k := 1.0 // +1: the front steam edge opens with sense*x
		if end == Back {
			k = -1
		}
		if a.steam[end], err = s.crossings(k*sense, p.SteamLap); err != nil {
			return nil, err
		}
		if a.exhaust[end], err = s.crossings(-k*sense, p.ExhaustLap); err != nil {
			return nil, err
		}
		if sp != nil {
			if err = truth.polish(sp, k*sense, p.SteamLap, a.steam[end].crossings); err != nil {
				return nil, err
			}
			if err = truth.polish(sp, -k*sense, p.ExhaustLap, a.exhaust[end].crossings); err != nil {
				return nil, err
			}
		}
		x := samples[0]
		if end == Back {
			if x, err = truth.eval(c.bdc); err != nil {
				return nil, err
			}
		}
		a.lead[end] = v.SteamEdge(end, x)
	}
	return a, nil
}

// extremesAt returns the motion's smallest and largest values: the least
// and greatest of its samples and of its values at the angles tlo and thi.
func (s *sampler) extremesAt(tlo, thi float64, samples []float64) (lo, hi float64, err error) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, x := range samples {
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	for _, t := range [2]float64{tlo, thi} {
		x, err := s.eval(t)
		if err != nil {
			return 0, 0, err
		}
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	return lo, hi, nil
}

// polish moves each crossing of the edge function k*x - lap found on the
// interpolant onto the motion itself. A crossing of a close pair (a dip
// past the edge) is left where the interpolant put it: there the slope is
// too small for Newton's method, and the interpolant is resolved.
func (s *sampler) polish(sp *spectrum, k, lap float64, cs []crossing) error {
	g := func(t float64) (float64, error) {
		x, err := s.eval(t)
		return k*x - lap, err
	}
	for i := range cs {
		c := &cs[i]
		if c.double {
			continue
		}
		t := c.theta
		ok := false
		for range 4 {
			gt, err := g(t)
			if err != nil {
				return err
			}
			_, dx, _ := sp.value3(t)
			if gt == 0 {
				ok = true
				break
			}
			if dx == 0 {
				break
			}
			step := gt / (k * dx)
			if t-step < c.lo || t-step > c.hi {
				break
			}
			t -= step
			// Newton's method converges quadratically: from within 1e-6
			// degrees one step leaves an error far below rootTol.
			if math.Abs(step) < 1e-6 {
				ok = true
				break
			}
		}
		if ok {
			c.theta = t
			continue
		}
		glo, err := g(c.lo)
		if err != nil {
			return err
		}
		ghi, err := g(c.hi)
		if err != nil {
			return err
		}
		if (glo > 0) != (ghi > 0) {
			if c.theta, err = brentRoot(g, c.lo, c.hi, glo, ghi, s.rootTol); err != nil {
				return err
			}
		}
	}
	return nil
}

const (
	spectralStart = 32   // first number of samples for the interpolant
	spectralMax   = 256  // most samples before searching the motion directly
	spectralTail  = 1e-6 // resolved: the top quarter of the spectrum holds less than this share of it
)

// spectrum is the trigonometric interpolant of n equally spaced samples:
// x(t) = a[0] + sum over k = 1..n/2 of a[k] cos kt + b[k] sin kt.
type spectrum struct {
	a, b []float64
}

// at returns the interpolant at theta degrees.
func (sp *spectrum) at(theta float64) float64 {
	s, c := math.Sincos(theta * (math.Pi / 180))
	ck, sk := c, s
	x := sp.a[0]
	for k := 1; k < len(sp.a); k++ {
		x += sp.a[k]*ck + sp.b[k]*sk
		ck, sk = ck*c-sk*s, sk*c+ck*s
	}
	return x
}

// value3 returns the interpolant, its slope (per degree) and its
// curvature (per degree squared) at theta degrees.
func (sp *spectrum) value3(theta float64) (x, dx, ddx float64) {
	s, c := math.Sincos(theta * (math.Pi / 180))
	ck, sk := c, s
	x = sp.a[0]
	for k := 1; k < len(sp.a); k++ {
		fk := float64(k)
		x += sp.a[k]*ck + sp.b[k]*sk
		dx += fk * (sp.b[k]*ck - sp.a[k]*sk)
		ddx -= fk * fk * (sp.a[k]*ck + sp.b[k]*sk)
		ck, sk = ck*c-sk*s, sk*c+ck*s
	}
	const r = math.Pi / 180
	return x, dx * r, ddx * r * r
}

// bulge bounds how far the interpolant departs from its chord over a step
// of h degrees: M h^2 / 8 with M = sum of k^2 |c_k|, a bound on its
// curvature; plus a rounding allowance.
func (sp *spectrum) bulge(h float64) float64 {
	var m, size float64
	for k := 1; k < len(sp.a); k++ {
		c := math.Hypot(sp.a[k], sp.b[k])
		m += float64(k*k) * c
		size += c
	}
	const r = math.Pi / 180
	return m*r*r*h*h/8 + 1e-12*(1+math.Abs(sp.a[0])+size)
}

// fitSpectrum returns the interpolant of samples (len n, even) at
// theta = 360 j / n, and whether it is resolved: whether the top quarter of
// its harmonics carries less than spectralTail of the whole, which a smooth
// curve's quickly falling spectrum does and a kinked one's does not.
func fitSpectrum(x []float64) (*spectrum, bool) {
	n := len(x)
	h := n / 2
	cs, sn := make([]float64, n), make([]float64, n)
	for m := range n {
		sn[m], cs[m] = math.Sincos(2 * math.Pi * float64(m) / float64(n))
	}
	sp := &spectrum{a: make([]float64, h+1), b: make([]float64, h+1)}
	for _, v := range x {
		sp.a[0] += v
	}
	sp.a[0] /= float64(n)
	var total, tail float64
	for k := 1; k <= h; k++ {
		var a, b float64
		m := 0
		for _, v := range x {
			a += v * cs[m]
			b += v * sn[m]
			if m += k; m >= n {
				m -= n
			}
		}
		w := 2 / float64(n)
		if k == h {
			w, b = 1/float64(n), 0
		}
		sp.a[k], sp.b[k] = a*w, b*w
		c := math.Hypot(sp.a[k], sp.b[k])
		total += c
		if 4*k > n {
			tail += c
		}
	}
	return sp, tail <= spectralTail*total+1e-12*(1+math.Abs(sp.a[0]))
}

// spectrum samples the motion at spectralStart points, doubling until the
// interpolant is resolved. It returns the interpolant, or nil when the
// curve is not smooth enough, and the samples (the first at theta 0).
func (s *sampler) spectrum() (*spectrum, []float64, error) {
	x := make([]float64, spectralStart)
	for i := range x {
		v, err := s.eval(float64(i) * 360 / float64(len(x)))
		if err != nil {
			return nil, nil, err
		}
		x[i] = v
	}
	for {
		sp, ok := fitSpectrum(x)
		if ok {
			return sp, x, nil
		}
		if len(x) >= spectralMax {
			return nil, x, nil
		}
		finer := make([]float64, 2*len(x))
		for i, v := range x {
			finer[2*i] = v
			m, err := s.eval((float64(i) + 0.5) * 360 / float64(len(x)))
			if err != nil {
				return nil, nil, err
			}
			finer[2*i+1] = m
		}
		x = finer
	}
}

// extremes returns the angles of the curve's smallest and largest values
// over the turn, refined over the two steps either side of the extreme
// samples.
func (s *sampler) extremes() (tlo, thi float64, err error) {
	ilo, ihi := 0, 0
	for i, x := range s.x {
		if x < s.x[ilo] {
			ilo = i
		}
		if x > s.x[ihi] {
			ihi = i
		}
	}
	var out [2]float64
	for j, ex := range [2]struct {
		i    int
		sign float64
	}{{ilo, 1}, {ihi, -1}} {
		t := float64(ex.i) * s.h
		out[j] = t
		tm, fx, err := s.extremeIn(t-s.h, t+s.h, t, ex.sign)
		if err != nil {
			return 0, 0, err
		}
		if fx < ex.sign*s.x[ex.i] {
			out[j] = mod360(tm)
		}
	}
	return out[0], out[1], nil
}

// crossings finds where the edge function g = k*x - lap changes sign (k is
// +1 or -1), in increasing theta over one turn.
func (s *sampler) crossings(k, lap float64) (edgeCrossings, error) {
	g := func(t float64) (float64, error) {
		x, err := s.eval(t)
		return k*x - lap, err
	}
	var out []crossing
	for i := 0; i < s.n; i++ {
		t0, t1 := float64(i)*s.h, float64(i+1)*s.h
		g0, g1 := k*s.at(i)-lap, k*s.at(i+1)-lap
		open0, open1 := g0 > 0, g1 > 0
		if open0 != open1 {
			t, err := s.root(g, k, lap, t0, t1, g0, g1)
			if err != nil {
				return edgeCrossings{}, err
			}
			out = append(out, crossing{theta: t, rising: open1, lo: t0, hi: t1})
			continue
		}
		if math.Min(math.Abs(g0), math.Abs(g1)) > s.bulge[i] {
			continue
		}
		// The curve may reach the edge inside the step and come back: find
		// the extreme of g on the side toward the edge.
		sign := k // minimise g when open (g > 0), maximise when closed
		if !open0 {
			sign = -k
		}
		tm, xm, err := s.stepExtreme(i, sign)
		if err != nil {
			return edgeCrossings{}, err
		}
		gm := k*xm - lap
		if (open0 && gm >= -touchTol) || (!open0 && gm <= touchTol) || tm <= t0 || tm >= t1 {
			continue // a touch, or no turn inside the step
		}
		ta, err := s.root(g, k, lap, t0, tm, g0, gm)
		if err != nil {
			return edgeCrossings{}, err
		}
		tb, err := s.root(g, k, lap, tm, t1, gm, g1)
		if err != nil {
			return edgeCrossings{}, err
		}
		out = append(out, crossing{ta, !open0, t0, tm, true}, crossing{tb, open0, tm, t1, true})
	}
	out = pairOffTouches(out)
	return edgeCrossings{crossings: out, allOpen: len(out) == 0 && s.x[0]*k-lap > 0}, nil
}

// root finds the crossing of the edge function g = k*x - lap in [a, b],
// where g(a) = ga and g(b) = gb lie on opposite sides of the edge: by
// Newton's method on an interpolant (bracketed: a step leaving the bracket
// bisects instead), by Brent's method on a motion.
func (s *sampler) root(g func(float64) (float64, error), k, lap, a, b, ga, gb float64) (float64, error) {
	if s.sp == nil {
		return brentRoot(g, a, b, ga, gb, s.rootTol)
	}
	if ga == 0 {
		return a, nil
	}
	t := a + (b-a)*ga/(ga-gb) // the chord's crossing
	for range 60 {
		x, dx, _ := s.sp.value3(t)
		gt := k*x - lap
		if gt == 0 {
			return t, nil
		}
		if (gt > 0) == (ga > 0) {
			a = t
		} else {
			b = t
		}
		next := t - gt/(k*dx)
		if !(next > a && next < b) {
			next = (a + b) / 2
		}
		if math.Abs(next-t) < s.rootTol || b-a < s.rootTol {
			return next, nil
		}
		t = next
	}
	return t, nil
}

// extremeIn finds the smallest value of sign*x in [a, b] near start and
// returns its angle and sign*x there: by Newton's method on the slope of an
// interpolant where the curve is convex that way, else by Brent's
// minimiser.
func (s *sampler) extremeIn(a, b, start, sign float64) (theta, fx float64, err error) {
	if s.sp != nil {
		t := start
		for range 30 {
			_, dx, ddx := s.sp.value3(t)
			if !(sign*ddx > 0) {
				break // not convex here: leave it to the minimiser
			}
			next := math.Max(a, math.Min(b, t-dx/ddx))
			if math.Abs(next-t) < s.minTol*1e-3 {
				return next, sign * s.sp.at(next), nil
			}
			t = next
		}
	}
	return brentMin(func(t float64) (float64, error) {
		x, err := s.eval(t)
		return sign * x, err
	}, a, b, s.minTol)
}

// pairOffTouches removes neighbouring crossings (round the turn) that are
// closer than sameAngle: an edge met exactly at a sample and left again is a
// touch, not an opening.
func pairOffTouches(cs []crossing) []crossing {
	out := cs[:0]
	for _, c := range cs {
		if n := len(out); n > 0 && c.theta-out[n-1].theta < sameAngle && c.rising != out[n-1].rising {
			out = out[:n-1]
			continue
		}
		out = append(out, c)
	}
	if n := len(out); n >= 2 && out[0].theta+360-out[n-1].theta < sameAngle && out[0].rising != out[n-1].rising {
		out = out[1 : n-1]
	}
	return out
}

// interval is one open period of an edge: it opens at from and closes at to
// (degrees, increasing theta; to may be less than from when it spans 0).
type interval struct{ from, to float64 }

// intervals turns crossings into open periods.
func (ec edgeCrossings) intervals() []interval {
	cs := ec.crossings
	var out []interval
	for i, c := range cs {
		if !c.rising {
			continue
		}
		for j := 1; j <= len(cs); j++ {
			if d := cs[(i+j)%len(cs)]; !d.rising {
				out = append(out, interval{c.theta, d.theta})
				break
			}
		}
	}
	return out
}

// period returns the number of open periods of an edge in a turn, whether
// it never opens or never closes, and otherwise the time-ordered opening
// and closing angles of the period chosen for theta (see choose).
func (ec edgeCrossings) period(theta float64, dir Direction) (count int, never, always bool, opens, closes float64) {
	if ec.allOpen {
		return 1, false, true, 0, 0
	}
	ivs := ec.intervals()
	if len(ivs) == 0 {
		return 0, true, false, 0, 0
	}
	opens, closes = choose(ivs, theta, dir)
	return len(ivs), false, false, opens, closes
}

// mod360 maps an angle into [0, 360).
func mod360(t float64) float64 {
	t = math.Mod(t, 360)
	if t < 0 {
		t += 360
	}
	if t >= 360 {
		t = 0
	}
	return t
}

// wrap180 maps an angle into (-180, 180].
func wrap180(t float64) float64 {
	t = mod360(t)
	if t > 180 {
		t -= 360
	}
	return t
}

// choose picks the open period containing theta or, failing that, the first
// to open after theta in time. It returns the time-ordered opening and
// closing angles.
func choose(ivs []interval, theta float64, dir Direction) (opens, closes float64) {
	best, bestWait := -1, math.Inf(1)
	for i, iv := range ivs {
		start, end := iv.from, iv.to
		if dir == Backward {
			start, end = end, start
		}
		// time from start to theta, and from start to end, both measured in
		// the running direction
		toTheta := mod360(float64(dir) * (theta - start))
		toEnd := mod360(float64(dir) * (end - start))
		if toTheta <= toEnd {
			return start, end
		}
		if wait := mod360(float64(dir) * (start - theta)); wait < bestWait {
			best, bestWait = i, wait
		}
	}
	iv := ivs[best]
	if dir == Backward {
		return iv.to, iv.from
	}
	return iv.from, iv.to
}

// event makes an Event of a crank angle for the given end.
func (a *analysis) event(end CylinderEnd, theta float64) Event {
	t := mod360(theta)
	return Event{CrankDeg: t, StrokePercent: 100 * a.crank.TravelFrom(end, t)}
}

// events assembles the events for one running direction.
func (a *analysis) events(dir Direction) (EventSet, error) {
	if err := dir.validate(); err != nil {
		return EventSet{}, err
	}
	set := EventSet{Direction: dir, BackDeadCentre: a.crank.bdc, ValveMin: a.vmin, ValveMax: a.vmax}
	for _, end := range [2]CylinderEnd{Front, Back} {
		ev := EndEvents{Lead: a.lead[end]}
		dc := a.crank.DeadCentre(end)
		other := a.crank.DeadCentre(1 - end)
		p := a.valve.End(end)

		var opens, closes float64
		ev.SteamOpenings, ev.NeverOpens, ev.NeverCloses, opens, closes = a.steam[end].period(dc, dir)
		if ev.SteamOpenings > 0 && !ev.NeverCloses {
			ev.Admission, ev.CutOff = a.event(end, opens), a.event(end, closes)
			ev.LeadAngle = wrap180(float64(dir) * (dc - opens))
		}
		if !ev.NeverOpens {
			ev.MaxOpening = p.clamp(a.valve.SteamEdge(end, a.extremeToward(end, true)))
			ev.MaxOpeningArea = a.valve.PortArea(end, ev.MaxOpening)
		}
		ev.ExhaustOpenings, ev.ExhaustNeverOpens, ev.ExhaustNeverCloses, opens, closes = a.exhaust[end].period(other, dir)
		if ev.ExhaustOpenings > 0 && !ev.ExhaustNeverCloses {
			ev.Release, ev.Compression = a.event(end, opens), a.event(end, closes)
		}
		if !ev.ExhaustNeverOpens {
			ev.MaxExhaustOpening = p.clamp(a.valve.ExhaustEdge(end, a.extremeToward(end, false)))
		}
		if end == Back {
			set.Back = ev
		} else {
			set.Front = ev
		}
	}
	return set, nil
}

// extremeToward returns the valve displacement extreme that opens the given
// end's steam (steam true) or exhaust edge furthest.
func (a *analysis) extremeToward(end CylinderEnd, steam bool) float64 {
	if a.valve.SteamEdge(end, a.vmax) > a.valve.SteamEdge(end, a.vmin) == steam {
		return a.vmax
	}
	return a.vmin
}

// brentRoot finds a root of f in [a, b] given f(a) = fa and f(b) = fb of
// opposite sign (Brent's method: inverse quadratic interpolation and
// secant steps safeguarded by bisection), to rootTol degrees.
func brentRoot(f func(float64) (float64, error), a, b, fa, fb, rootTol float64) (float64, error) {
	lo, hi := a, b
	if fa == 0 {
		return a, nil
	}
	if fb == 0 {
		return b, nil
	}
	c, fc := a, fa
	d := b - a
	e := d
	for iter := 0; iter < 200; iter++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 4e-16*math.Abs(b) + 0.5*rootTol
		m := 0.5 * (c - b)
		if math.Abs(m) <= tol || fb == 0 {
			break
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			s := fb / fa
			var p, q float64
			if a == c {
				p, q = 2*m*s, 1-s
			} else {
				q0, r := fa/fc, fb/fc
				p = s * (2*m*q0*(q0-r) - (b-a)*(r-1))
				q = (q0 - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			}
			p = math.Abs(p)
			if 2*p < math.Min(3*m*q-math.Abs(tol*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else {
			b += math.Copysign(tol, m)
		}
		var err error
		if fb, err = f(b); err != nil {
			return 0, err
		}
	}
	return math.Max(lo, math.Min(hi, b)), nil
}

// brentMin finds the minimum of f on [a, b] (Brent's minimiser: golden
// section with parabolic steps).
func brentMin(f func(float64) (float64, error), a, b, tol float64) (xmin, fmin float64, err error) {
	const cgold = 0.3819660112501051
	x := a + cgold*(b-a)
	w, v := x, x
	fx, err := f(x)
	if err != nil {
		return 0, 0, err
	}
	fw, fv := fx, fx
	var d, e float64
	for iter := 0; iter < 100; iter++ {
		xm := 0.5 * (a + b)
		tol1 := tol
		tol2 := 2 * tol1
		if math.Abs(x-xm) <= tol2-0.5*(b-a) {
			break
		}
		golden := true
		if math.Abs(e) > tol1 {
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			p := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				p = -p
			}
			q = math.Abs(q)
			if math.Abs(p) < math.Abs(0.5*q*e) && p > q*(a-x) && p < q*(b-x) {
				e, d = d, p/q
				golden = false
				if u := x + d; u-a < tol2 || b-u < tol2 {
					d = math.Copysign(tol1, xm-x)
				}
			}
		}
		if golden {
			if x >= xm {
				e = a - x
			} else {
				e = b - x
			}
			d = cgold * e
		}
		u := x + d
		if math.Abs(d) < tol1 {
			u = x + math.Copysign(tol1, d)
		}
		fu, err := f(u)
		if err != nil {
			return 0, 0, err
		}
		if fu <= fx {
			if u >= x {
				a = x
			} else {
				b = x
			}
			v, w, x = w, x, u
			fv, fw, fx = fw, fx, fu
		} else {
			if u < x {
				a = u
			} else {
				b = u
			}
			if fu <= fw || w == x {
				v, w = w, u
				fv, fw = fw, fu
			} else if fu <= fv || v == x || v == w {
				v, fv = u, fu
			}
		}
	}
	return x, fx, nil
}
