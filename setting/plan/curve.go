package plan

import (
	"fmt"
	"math"

	"evenbeat/setting"
)

// curveSamples is how many points round a turn a valve curve is sampled
// at before it is held as its trigonometric interpolant. A gear's valve
// curve is smooth and periodic, so its harmonics fall off fast: with 32
// samples (every 11.25 degrees) the interpolant matches the exact linkage
// to about 1e-9 mm on the test engines, with 24 to 1e-7 and with 16 to
// 1e-5 (TestCurveMatchesGear holds it to 1e-4), while events, fits and
// plans then cost a few hundred linkage solutions instead of tens of
// thousands.
const curveSamples = 32

// curve is a valve curve held as a trigonometric series in crank angle:
// c[0] + sum over k of c[2k-1] cos(k t) + c[2k] sin(k t).
type curve []float64

// trig holds cos(k t_j) and sin(k t_j) for the sample angles.
type trig struct {
	n        int
	cos, sin [][]float64 // [k][j]
	angles   []float64   // [j], degrees
}

// curveTrig and effectTrig are the tables of curveSamples and
// effectSamples, made once: a trig is only read after newTrig.
var (
	curveTrig  = newTrig(curveSamples)
	effectTrig = newTrig(effectSamples)
)

func newTrig(n int) *trig {
	t := &trig{n: n, angles: make([]float64, n)}
	for j := range t.angles {
		t.angles[j] = t.angle(j)
	}
	K := n / 2
	t.cos = make([][]float64, K+1)
	t.sin = make([][]float64, K+1)
	for k := 0; k <= K; k++ {
		t.cos[k] = make([]float64, n)
		t.sin[k] = make([]float64, n)
		for j := 0; j < n; j++ {
			t.sin[k][j], t.cos[k][j] = math.Sincos(2 * math.Pi * float64(k*j) / float64(n))
		}
	}
	return t
}

// angle returns the j-th sample angle in degrees.
func (t *trig) angle(j int) float64 { return 360 * float64(j) / float64(t.n) }

// fit returns the interpolant of samples x taken at the sample angles.
func (t *trig) fit(x []float64) curve {
	n := t.n
	K := n / 2
	c := make(curve, 2*K+1)
	for j := 0; j < n; j++ {
		c[0] += x[j]
	}
	c[0] /= float64(n)
	for k := 1; k <= K; k++ {
		var a, b float64
		for j := 0; j < n; j++ {
			a += x[j] * t.cos[k][j]
			b += x[j] * t.sin[k][j]
		}
		w := 2 / float64(n)
		if 2*k == n {
			w = 1 / float64(n)
			b = 0
		}
		c[2*k-1], c[2*k] = a*w, b*w
	}
	return c
}

// sample evaluates f at the sample angles.
func (t *trig) sample(f func(th float64) (float64, error)) (curve, error) {
	x := make([]float64, t.n)
	for j := range x {
		v, err := f(t.angle(j))
		if err != nil {
			return nil, err
		}
		x[j] = v
	}
	return t.fit(x), nil
}

// at returns the curve's value and slope (mm per degree) at th degrees.
// It runs harm's recurrence in registers rather than through a harm:
// that way is some 10 % slower over a plan (BenchmarkFitAndPlan).
func (c curve) at(th float64) (x, dx float64) {
	if len(c) == 0 {
		return 0, 0
	}
	s1, c1 := math.Sincos(th * math.Pi / 180)
	ck, sk := 1.0, 0.0
	x = c[0]
	for k := 1; 2*k < len(c); k++ {
		ck, sk = ck*c1-sk*s1, sk*c1+ck*s1
		a, b := c[2*k-1], c[2*k]
		x += a*ck + b*sk
		dx += float64(k) * (b*ck - a*sk)
	}
	return x, dx * math.Pi / 180
}

// harm holds cos(k th) and sin(k th) at one angle th for k up to n (at
// most a sampled curve's harmonics), by at's rotation recurrence, so that
// the curves evaluated at one reading's angle share it (see
// problem.harmAt); atH and valueH give at's and value's results exactly.
type harm struct {
	th   float64
	n    int
	c, s [curveSamples/2 + 1]float64
}

// set fills h for th degrees up to harmonic n.
func (h *harm) set(th float64, n int) {
	s1, c1 := math.Sincos(th * math.Pi / 180)
	ck, sk := 1.0, 0.0
	h.c[0], h.s[0] = 1, 0
	for k := 1; k <= n; k++ {
		ck, sk = ck*c1-sk*s1, sk*c1+ck*s1
		h.c[k], h.s[k] = ck, sk
	}
	h.th, h.n = th, n
}

// atH is the curve's value and slope (mm per degree) at h.th (the
// curve's harmonics no more than h's).
func (c curve) atH(h *harm) (x, dx float64) {
	if len(c) == 0 {
		return 0, 0
	}
	x = c[0]
	for k := 1; 2*k < len(c); k++ {
		a, b := c[2*k-1], c[2*k]
		x += a*h.c[k] + b*h.s[k]
		dx += float64(k) * (b*h.c[k] - a*h.s[k])
	}
	return x, dx * math.Pi / 180
}

// valueH is the curve's value at h.th (as atH).
func (c curve) valueH(h *harm) float64 {
	if len(c) == 0 {
		return 0
	}
	x := c[0]
	for k := 1; 2*k < len(c); k++ {
		x += c[2*k-1]*h.c[k] + c[2*k]*h.s[k]
	}
	return x
}

// value returns the curve's value at th degrees (in registers, as at).
func (c curve) value(th float64) float64 {
	if len(c) == 0 {
		return 0
	}
	s1, c1 := math.Sincos(th * math.Pi / 180)
	ck, sk := 1.0, 0.0
	x := c[0]
	for k := 1; 2*k < len(c); k++ {
		ck, sk = ck*c1-sk*s1, sk*c1+ck*s1
		x += c[2*k-1]*ck + c[2*k]*sk
	}
	return x
}

// effectHarmonics is how many harmonics an effect curve keeps: a
// deviation's effect on the valve curve is smoother than the curve itself,
// and its higher harmonics are below 1e-5 mm per mm or degree on the test
// engines.
const effectHarmonics = 12

// combine returns base + sum of a[i] * d[i] (+ shift).
func combine(base curve, d []curve, a []float64, shift float64) curve {
	out := make(curve, len(base))
	copy(out, base)
	out[0] += shift
	for i, di := range d {
		if di == nil || a[i] == 0 {
			continue
		}
		for k := range di {
			out[k] += a[i] * di[k]
		}
	}
	return out
}

// motion returns the curve as a valve motion.
func (c curve) motion() setting.Motion {
	return func(th float64) (float64, error) { return c.value(th), nil }
}

// gearCurves samples the gear's valve curve (plus the valve offset when
// withOffset) at deviations p in each reverser position, at tr's angles.
func gearCurves(spec setting.EngineSpec, p [numParams]float64, revs []setting.Reverser, tr *trig, withOffset bool) ([]curve, error) {
	xs, err := gearSamples(spec, p, revs, tr, withOffset)
	if err != nil {
		return nil, err
	}
	out := make([]curve, len(revs))
	for k, x := range xs {
		out[k] = tr.fit(x)
	}
	return out, nil
}

// gearSamples is gearCurves' samples, [reverser position][angle].
func gearSamples(spec setting.EngineSpec, p [numParams]float64, revs []setting.Reverser, tr *trig, withOffset bool) ([][]float64, error) {
	g, err := Model{Spec: spec, Dev: devOf(p)}.Gear()
	if err != nil {
		return nil, err
	}
	off := 0.0
	if withOffset {
		off = p[pValveOffset]
	}
	out := make([][]float64, len(revs))
	for k, r := range revs {
		x := make([]float64, tr.n)
		if err := setting.ValveCurve(g, spec.Engine, tr.angles, r, x); err != nil {
			return nil, fmt.Errorf("%s: %w", notchName("", r), err)
		}
		for j := range x {
			x[j] += off
		}
		out[k] = x
	}
	return out, nil
}

// valuesAt returns each curve's values at tr's angles (what effect
// takes as its base).
func valuesAt(cs []curve, tr *trig) [][]float64 {
	out := make([][]float64, len(cs))
	for k, c := range cs {
		out[k] = make([]float64, tr.n)
		for j, th := range tr.angles {
			out[k][j] = c.value(th)
		}
	}
	return out
}

// effectSamples is how many points round a turn an effect curve is
// sampled at: twice its harmonics (see effectHarmonics).
const effectSamples = 2 * effectHarmonics

// effect returns, per reverser position, the curve of the effect of one
// unit of deviation j: the gear sampled at p moved by h (by -h when the
// linkage cannot close at +h) at tr24's angles, less the base curves
// there (base: their values at those angles, see valuesAt), over h.
// withOffset must be as the base curves were sampled.
func effect(spec setting.EngineSpec, p [numParams]float64, revs []setting.Reverser, tr24 *trig, j param, h float64, base [][]float64, withOffset bool) ([]curve, error) {
	q := p
	q[j] += h
	xs, err := gearSamples(spec, q, revs, tr24, withOffset)
	if err != nil {
		q[j] = p[j] - h
		if xs, err = gearSamples(spec, q, revs, tr24, withOffset); err != nil {
			return nil, err
		}
		h = -h
	}
	out := make([]curve, len(xs))
	for i, x := range xs {
		for m := range x {
			x[m] = (x[m] - base[i][m]) / h
		}
		out[i] = tr24.fit(x)
	}
	return out, nil
}
