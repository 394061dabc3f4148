package plan

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Residual is one reading against the fitted model.
type Residual struct {
	Label string       `json:"label"` // the reading in words ("back dead centre, full forward")
	Field string       `json:"field"` // the reading's field in the session file
	Kind  session.Kind `json:"kind"`
	// ResidualMM is the reading minus the fit (mm): for a cut-off, how far
	// the fitted steam edge is from closing at that mark.
	ResidualMM float64 `json:"residual_mm"`
	// Used is false for a reading left out of the fit because it disagrees
	// with the rest (see Fit.Recheck).
	Used bool `json:"used"`
	// ExpectMM, for a reading to recheck, is what the other readings put
	// it at, in the reading's own terms (a normalised gauge reading, mm).
	ExpectMM float64 `json:"expect_mm,omitempty"`
	// Pair, for a reading to recheck, is the field of another reading
	// that could as well be the one at fault: the rest cannot tell which,
	// so both are left out. Empty when the reading stands alone.
	Pair string `json:"pair,omitempty"`
}

// Fit is the as-built state of one cylinder found from its readings.
type Fit struct {
	// Model is the drawing with the fitted deviations.
	Model Model
	// Sigma holds one standard deviation of each fitted deviation; zero for
	// deviations not fitted.
	Sigma Deviations
	// Fitted names the deviations the fit moved, in words.
	Fitted []string
	// Residuals are every reading of the round against the fit, in file
	// order.
	Residuals []Residual
	// Recheck are the readings the others contradict, with what the
	// others put them at (ExpectMM); they were left out of the fit.
	Recheck []Residual
	// RMSMM is the root-mean-square residual of the readings used (mm).
	RMSMM float64
	// Undecided names deviations the readings could not pin down; their
	// values come from the drawing (the prior), not from the readings.
	Undecided []string

	obs      []session.Observation
	used     []bool
	sig      []float64 // each reading's standard deviation, mm
	idx      []param
	cov      sym // covariance of the fitted parameters: idx order, then the unmodelled coefficients
	revs     []setting.Reverser
	sens     [][numParams]curve // the fit's effect curves per reverser position, for the planner
	resMM    float64
	varScale float64
	prior    [numParams]float64
	expect   []expected // the readings left out, with what the others put them at
	// The unmodelled coefficients of reverser position g (revs order) are
	// nc of the covariance's columns from len(idx)+cStart[g], cN[g] of
	// them.
	cStart, cN []int
	nc         int
	shape      []unmodShape
}

// FitOptions tunes the fit. The zero value is the default.
type FitOptions struct {
	// Round is the number of the round to fit, counting the first as 1;
	// 0 (or any number beyond the last) means the latest.
	Round int
	// NoRecheck keeps every reading in the fit, however far it lies.
	NoRecheck bool
}

// priors returns one standard deviation of what each deviation is likely
// to be before any reading: the fit's regularisation, so that it stays
// well posed when readings cannot tell two deviations apart, and the
// measure of what a real engine could have. Lengths scale with the crank
// radius (a 25 mm crank is the 5 in gauge norm). The sizes are a careful
// build's errors before the valves are set (common practice, no source):
// a valve a millimetre or two off on its spindle, rods a millimetre or so
// off, a sheave keyed a few degrees out, a steam lap a tenth of a
// millimetre off the drawing.
func priors(spec setting.EngineSpec, dcSigma float64) [numParams]float64 {
	k := scaleOf(spec)
	if !(dcSigma > 0) {
		dcSigma = 0.25 // degrees, when the marks' error is not known
	}
	return [numParams]float64{
		pGaugeZero: 1e3, pValveOffset: 1.5 * k, pDeadCentre: dcSigma,
		pEccFwd: 3, pEccBack: 3, pRodFwd: 1.5 * k, pRodBack: 1.5 * k,
		pReturnCrank: 3, pRadiusRod: 2 * k, pLapFront: 0.1 * k, pLapBack: 0.1 * k,
	}
}

// scaleOf is the engine's size against a 5 in gauge engine (25 mm crank),
// at least 1: what the priors and tolerances of lengths scale by.
func scaleOf(spec setting.EngineSpec) float64 {
	return math.Max(1, spec.Engine.CrankRadius/25)
}

// unmodelledPrior is one standard deviation of the unmodelled part of a
// valve curve (see Unmodelled), per coefficient, at 5 in gauge scale:
// large enough that the model follows what the readings measured rather
// than bending the deviations it has far from their priors (common
// practice, no source: the lifting link, a lever's pins or an eccentric's
// throw move a 5 in gauge valve by a few tenths of a millimetre at most).
const unmodelledPrior = 0.3

// portMarkErrorMM is the error (one standard deviation, mm at 5 in gauge
// scale, growing with the square root of the size) of setting the valve
// where an edge just cracks: by eye, a light or a thin wire through the
// port, coarser than the gauge that reads it (common practice, from
// memory).
const portMarkErrorMM = 0.015

// suspectFloor is how far (mm, at 5 in gauge scale) the gear's unmodelled
// errors may put a reading from what the fitted deviations alone predict
// before it counts against the reading (see suspect).
const suspectFloor = 0.15

// roundObservations picks the observations of round number round (from
// 1; 0 for the latest) of cylinder cyl.
func roundObservations(s *session.Session, cyl, round int) ([]session.Observation, error) {
	if round <= 0 || round > len(s.Cylinders[cyl].Rounds) {
		round = len(s.Cylinders[cyl].Rounds)
	}
	return s.RoundObservations(cyl, round-1)
}

// FitSession fits cylinder cyl of a session (its latest round unless opt
// says otherwise) with the gear's dimensions: see FitObservations.
func FitSession(s *session.Session, cyl int, opt FitOptions) (*Fit, error) {
	if s == nil || cyl < 0 || cyl >= len(s.Cylinders) {
		return nil, &setting.Error{Field: "cylinders", Message: "There is no such cylinder in the session."}
	}
	if len(s.Cylinders[cyl].Rounds) == 0 {
		return nil, &setting.Error{Field: fmt.Sprintf("cylinders[%d].rounds", cyl), Message: "There are no readings yet: take the port marks and gauge readings at both dead centres in full forward and full back gear."}
	}
	spec, err := s.CylinderEngine(cyl)
	if err != nil {
		return nil, err
	}
	obs, err := roundObservations(s, cyl, opt.Round)
	if err != nil {
		return nil, err
	}
	return FitObservations(spec, obs, opt)
}

// checkReadings refuses readings no fit can use, with a sentence that says
// what to take.
func checkReadings(obs []session.Observation) error {
	var crank, ports, gauges int
	var lo, hi = math.Inf(1), math.Inf(-1)
	for _, o := range obs {
		vals := []float64{o.GaugeMM, o.CrankDeg, o.CrankSigmaDeg, o.GaugeSigmaMM, o.OpeningMM, float64(o.Reverser)}
		for _, v := range vals {
			if !finite(v) {
				return &setting.Error{Field: o.Field, Message: fmt.Sprintf("The reading %q holds a value that is not a number.", o.Label)}
			}
		}
		if math.Abs(float64(o.Reverser)) > 1 {
			return &setting.Error{Field: o.Field, Message: fmt.Sprintf("The reading %q has a reverser position outside -1 to +1.", o.Label)}
		}
		switch o.Kind {
		case session.PortMarkKind:
			ports++
		case session.FeelerKind:
			ports++
			crank++
		case session.AtDeadCentre, session.InSweep:
			crank++
			gauges++
			lo, hi = math.Min(lo, o.GaugeMM), math.Max(hi, o.GaugeMM)
		case session.CutOffKind:
			crank++
		}
	}
	switch {
	case ports == 0:
		return &setting.Error{Field: "port_marks", Message: "There are no port marks (or laps, or feeler openings): without them the ports cannot be placed against the gauge. Take the gauge reading at which each steam edge just cracks."}
	case crank < 2:
		return &setting.Error{Field: "dead_centre_readings", Message: fmt.Sprintf("Too few readings: %d taken with the crank at a known angle, at least 2 needed. Take the gauge readings at both dead centres in full forward and full back gear, or better a sweep every 30 degrees.", crank)}
	case gauges >= 3 && hi-lo < 1e-9:
		return &setting.Error{Field: "dead_centre_readings", Message: fmt.Sprintf("All %d gauge readings are the same (%.3f mm): the gauge is not following the valve. Check that the plunger touches the spindle and that the gear is connected.", gauges, lo)}
	}
	return nil
}

// problem is a fit's internal state: the observations, weights and the
// parameters fitted.
//
// Predictions come from sampled valve curves (see curve), one per reverser
// position the readings were taken in: the curve at deviations p0 and, per
// gear deviation, the curve of its effect, combined linearly, plus the
// position's unmodelled part (see Unmodelled), whose coefficients are
// fitted with the deviations. The fit solves on that linear model, samples
// the linkage again at the answer, and repeats until the answer stands
// still (see fitOuter), so the few hundred linkage solutions are spent per
// round of that loop, not per reading and per Jacobian column.
type problem struct {
	spec  setting.EngineSpec
	obs   []session.Observation
	use   []bool
	sig   []float64 // one standard deviation of each residual, mm
	idx   []param
	prior [numParams]float64
	mean  [numParams]float64 // prior means

	tr    *trig
	tr24  *trig              // for effect curves
	revs  []setting.Reverser // the reverser positions of the readings
	grp   []int              // per observation: index into revs, -1 for port marks
	p0    [numParams]float64 // where base was sampled
	base  []curve            // per position: gear valve curve at p0 (no valve offset)
	sens  [][numParams]curve // per position, per gear deviation: effect curve
	kEdge [2]float64

	// The unmodelled parts: position g's coefficients are c[cStart[g] :
	// cStart[g]+cN[g]], shaped by shape[g].
	cStart, cN []int
	cPrior     []float64
	// harms holds each observation's harmonics at its last true crank
	// angle (see harmAt).
	harms []harm
	shape []unmodShape
	// cc caches the unmodelled parts as curves for the coefficients ccFor
	// (see corrCurves).
	cc    []curve
	ccFor []float64
}

// unmodShape is how the unmodelled part of one reverser position is
// shaped. With readings at the two dead centres alone it is an offset
// and a small phase shift of the position's own valve curve (phi: the
// drawing's curve's slope, scaled to 1 at front dead centre): the offset
// moves the leads apart, the phase moves them together, and the cut-offs
// follow the way the position's own curve takes them. With more readings
// (a sweep) it is the short Fourier series a0 + a1 cos t + b1 sin t (+ a2
// cos 2t + b2 sin 2t with five or more).
type unmodShape struct {
	n   int   // coefficients
	phi curve // the phase shape; nil for the Fourier form
}

// at returns the shape's basis functions at th degrees (n of them).
func (u unmodShape) at(th float64) [5]float64 {
	var b [5]float64
	if u.phi != nil {
		b[0] = 1
		if u.n > 1 {
			b[1] = u.phi.value(th)
		}
		return b
	}
	full := basis(th)
	copy(b[:u.n], full[:u.n])
	return b
}

// curveOf returns the unmodelled part with coefficients c as a curve.
func (u unmodShape) curveOf(c []float64) curve {
	if u.phi != nil {
		out := make(curve, len(u.phi))
		if len(c) > 1 {
			for k, v := range u.phi {
				out[k] = c[1] * v
			}
		}
		if len(c) > 0 {
			out[0] += c[0]
		}
		return out
	}
	out := append(curve(nil), c...)
	if len(out)%2 == 0 {
		out = append(out, 0) // cos pairs with sin: a0, a1 and a zero b1
	}
	return out
}

// phaseShape returns the phase shape of a valve curve: its slope by crank
// angle, scaled to 1 at front dead centre; nil where the valve stands
// still there.
func phaseShape(c curve) curve {
	d := make(curve, len(c))
	for k := 1; 2*k < len(c); k++ {
		a, b := c[2*k-1], c[2*k]
		d[2*k-1], d[2*k] = float64(k)*b, -float64(k)*a
	}
	s0 := d.value(0)
	if math.Abs(s0) < 1e-6 {
		return nil
	}
	for k := range d {
		d[k] /= s0
	}
	return d
}

// state is a point of the fit: the deviations and the unmodelled parts'
// coefficients.
type state struct {
	p [numParams]float64
	c []float64
}

func (s state) clone() state { return state{s.p, append([]float64(nil), s.c...)} }

// newProblem groups the observations by reverser position.
func newProblem(spec setting.EngineSpec, obs []session.Observation) *problem {
	pb := &problem{spec: spec, obs: obs, use: make([]bool, len(obs)), sig: make([]float64, len(obs)), grp: make([]int, len(obs)), tr: curveTrig, tr24: effectTrig, harms: make([]harm, len(obs))}
	for k := 0; k < 2; k++ {
		pb.kEdge[k] = edgeSlope(spec.Valve, setting.CylinderEnd(k))
	}
	for i, o := range obs {
		pb.use[i] = true
		pb.grp[i] = -1
		if !o.HasCrank {
			continue
		}
		for g, r := range pb.revs {
			if r == o.Reverser {
				pb.grp[i] = g
			}
		}
		if pb.grp[i] < 0 {
			pb.revs = append(pb.revs, o.Reverser)
			pb.grp[i] = len(pb.revs) - 1
		}
	}
	return pb
}

// setUnmodelled gives each reverser position as many coefficients of its
// unmodelled part as its readings can carry: the offset a0 and a1 (the
// difference and the sum of the two dead centres' misfits) with readings
// at two crank angles, b1 too with three or four, the second harmonic with
// five or more (a sweep). k scales the prior.
func (pb *problem) setUnmodelled(k float64) {
	pb.cStart, pb.cN, pb.cPrior = make([]int, len(pb.revs)), make([]int, len(pb.revs)), nil
	pb.cc, pb.ccFor = nil, nil
	pb.shape = make([]unmodShape, len(pb.revs))
	n := 0
	for g := range pb.revs {
		var angles []float64
		for i, o := range pb.obs {
			if pb.grp[i] != g || !pb.use[i] {
				continue
			}
			seen := false
			for _, a := range angles {
				if math.Abs(wrap360(o.CrankDeg-a+180)-180) < 2 {
					seen = true
				}
			}
			if !seen {
				angles = append(angles, o.CrankDeg)
			}
		}
		// One reading alone cannot tell a shift of the valve from a
		// change of its travel: it gets none.
		m := 0
		switch na := len(angles); {
		case na >= 5:
			m = 5
		case na >= 3:
			m = 3
		case na == 2:
			m = 2
		}
		pb.cStart[g], pb.cN[g] = n, m
		pb.shape[g] = unmodShape{n: m}
		if m == 2 && g < len(pb.base) {
			pb.shape[g].phi = phaseShape(pb.base[g])
		}
		for j := 0; j < m; j++ {
			pr := unmodelledPrior * k
			if j >= 2 {
				// The phase (b1) is the dead-centre mark's, which a sweep
				// pins down, and the second harmonic is small in a smooth
				// gear: both held closer.
				pr /= 3
			}
			pb.cPrior = append(pb.cPrior, pr)
		}
		n += m
	}
}

// unreadCut is one standard deviation of end k's cut-off in position q
// from the unmodelled coefficients of the first harmonic its readings
// cannot carry (see setUnmodelled: with the dead centres alone, the phase
// b1, which moves a cut-off and not a lead; all three without readings),
// each at unreadShare of its prior. The fit's covariance holds only the
// coefficients it fitted; without this a cut-off read from the dead
// centres alone is stated 2 to 3 times too sure (issue 11's bench: 33 to
// 42 % of true cut-offs within one stated standard deviation on
// single-eccentric and Stephenson gears).
func (f *Fit) unreadCut(q *quantities, k int) float64 {
	n := 0
	if g := q.group; g >= 0 && g < len(f.cN) {
		n = f.cN[g]
	}
	b := basis(q.cutTheta[k])
	pr := unreadShare * unmodelledPrior * scaleOf(f.Model.Spec)
	v := 0.0
	for j := n; j < 3; j++ {
		if j == 2 {
			pr /= 3 // the phase's prior, as setUnmodelled holds it
		}
		v += sq(pr * b[j])
	}
	return math.Sqrt(v) * math.Abs(q.cutPerX[k])
}

// unreadShare scales the priors of the unmodelled coefficients a
// position's readings cannot carry, for unreadCut.
const unreadShare = 0.5

// nc returns the number of unmodelled coefficients.
func (pb *problem) nc() int { return len(pb.cPrior) }

// basis returns the unmodelled part's basis functions at th degrees.
func basis(th float64) [5]float64 {
	s1, c1 := math.Sincos(th * math.Pi / 180)
	return [5]float64{1, c1, s1, c1*c1 - s1*s1, 2 * s1 * c1}
}

// sampleAt samples the gear curves at p, and the effect curves of the
// fitted gear deviations when withSens.
func (pb *problem) sampleAt(p [numParams]float64, withSens bool) error {
	base, err := gearCurves(pb.spec, p, pb.revs, pb.tr, false)
	if err != nil {
		return err
	}
	if withSens || pb.sens == nil {
		// Filled aside and kept only when every effect could be sampled.
		sens := make([][numParams]curve, len(pb.revs))
		at24 := valuesAt(base, pb.tr24)
		for _, j := range pb.idx {
			if !isGearParam(j) {
				continue
			}
			ds, err := effect(pb.spec, p, pb.revs, pb.tr24, j, stepOf(j), at24, false)
			if err != nil {
				return err
			}
			for k := range pb.revs {
				sens[k][j] = ds[k]
			}
		}
		pb.sens = sens
	}
	pb.base, pb.p0 = base, p
	return nil
}

// isGearParam reports whether a deviation changes the gear's linkage
// (the others enter the predictions directly).
func isGearParam(j param) bool {
	switch j {
	case pGaugeZero, pValveOffset, pDeadCentre, pLapFront, pLapBack:
		return false
	}
	return true
}

// gear returns the linear model's gear valve displacement of observation
// i at state s (the unmodelled part included), and its slope by the true
// crank angle (mm per degree).
func (pb *problem) gear(i int, s state) (x, slope float64) {
	g := pb.grp[i]
	h := pb.harmAt(i, s)
	x, slope = pb.base[g].atH(h)
	for _, j := range pb.idx {
		if d := pb.sens[g][j]; d != nil && s.p[j] != pb.p0[j] {
			v, dv := d.atH(h)
			x += (s.p[j] - pb.p0[j]) * v
			slope += (s.p[j] - pb.p0[j]) * dv
		}
	}
	if cc := pb.corrCurves(s); cc != nil && cc[g] != nil {
		v, dv := cc[g].at(h.th)
		x += v
		slope += dv
	}
	return x, slope
}

// harmAt returns observation i's harmonics at its true crank angle in
// state s, worked out again only when the dead-centre error has moved.
func (pb *problem) harmAt(i int, s state) *harm {
	th := pb.obs[i].CrankDeg + s.p[pDeadCentre]
	h := &pb.harms[i]
	if h.n == 0 || h.th != th {
		h.set(th, len(h.c)-1)
	}
	return h
}

// corrCurves returns each position's unmodelled part at s as a curve (nil
// without any), made once per set of coefficients.
func (pb *problem) corrCurves(s state) []curve {
	if len(s.c) == 0 {
		return nil
	}
	same := len(pb.ccFor) == len(s.c)
	for a := 0; same && a < len(s.c); a++ {
		same = pb.ccFor[a] == s.c[a]
	}
	if !same || pb.cc == nil {
		pb.ccFor = append(pb.ccFor[:0], s.c...)
		pb.cc = make([]curve, len(pb.revs))
		for g := range pb.revs {
			if n := pb.cN[g]; n > 0 && pb.cStart[g]+n <= len(s.c) {
				pb.cc[g] = pb.shape[g].curveOf(s.c[pb.cStart[g] : pb.cStart[g]+n])
			}
		}
	}
	return pb.cc
}

// slopeAt is the valve curve's slope (mm per degree) at observation i:
// the sampled curve's and the unmodelled part's (the deviations' small
// changes since sampling are left out: the slope only weighs the
// dead-centre mark's column of the Jacobian).
func (pb *problem) slopeAt(i int, s state) float64 {
	g := pb.grp[i]
	h := pb.harmAt(i, s)
	th := h.th
	_, slope := pb.base[g].atH(h)
	if cc := pb.corrCurves(s); cc != nil && cc[g] != nil {
		_, dv := cc[g].at(th)
		slope += dv
	}
	return slope
}

// predictS is the linear model's prediction of observation i (see
// Predict for what each kind predicts).
func (pb *problem) predictS(i int, s state) float64 {
	o := pb.obs[i]
	v := asBuiltValve(pb.spec.Valve, s.p)
	if o.Kind == session.PortMarkKind {
		return s.p[pGaugeZero] - s.p[pValveOffset] + edgeX(v, cylEnd(o.End))
	}
	x, _ := pb.gear(i, s)
	switch o.Kind {
	case session.CutOffKind, session.FeelerKind:
		return v.SteamEdge(cylEnd(o.End), x+s.p[pValveOffset])
	}
	return x + s.p[pGaugeZero]
}

// eval returns the residuals (prediction - target) of the used
// observations at s.
func (pb *problem) eval(s state, out []float64) error {
	k := 0
	for i, o := range pb.obs {
		if !pb.use[i] {
			continue
		}
		v := pb.predictS(i, s)
		if !finite(v) {
			return &setting.Error{Field: o.Field, Message: "The model gives no value for this reading."}
		}
		out[k] = v - Target(o)
		k++
	}
	return nil
}

func (pb *problem) nUsed() int {
	n := 0
	for _, u := range pb.use {
		if u {
			n++
		}
	}
	return n
}

// cost is the weighted sum of squares with the priors.
func (pb *problem) cost(s state, r []float64) float64 {
	c := 0.0
	k := 0
	for i := range pb.obs {
		if pb.use[i] {
			c += sq(r[k] / pb.sig[i])
			k++
		}
	}
	for _, j := range pb.idx {
		c += sq((s.p[j] - pb.mean[j]) / pb.prior[j])
	}
	for a, v := range s.c {
		c += sq(v / pb.cPrior[a])
	}
	return c
}

func sq(x float64) float64 { return x * x }

// stepOf returns the finite-difference step of a deviation (degrees or
// mm).
func stepOf(j param) float64 { return 1e-3 }

// row returns the linear model's derivatives of observation i's
// prediction at s: by each fitted deviation (in idx order), then by each
// unmodelled coefficient.
func (pb *problem) row(i int, s state, out []float64) {
	for a := range out {
		out[a] = 0
	}
	o := pb.obs[i]
	edge := 1.0 // d(prediction)/d(gear displacement)
	if o.Kind == session.CutOffKind || o.Kind == session.FeelerKind {
		edge = pb.kEdge[cylEnd(o.End)]
	}
	var slope, th float64
	if o.HasCrank {
		th = o.CrankDeg + s.p[pDeadCentre]
	}
	for c, j := range pb.idx {
		if j == pDeadCentre && o.HasCrank {
			// Only the dead-centre mark needs the curve's slope here.
			slope = pb.slopeAt(i, s)
		}
		switch j {
		case pGaugeZero, pValveOffset, pLapFront, pLapBack:
			out[c] = linearDerivative(pb.spec, o, j)
		case pDeadCentre:
			if o.HasCrank {
				out[c] = edge * slope
			}
		default:
			if o.HasCrank {
				out[c] = edge * pb.sens[pb.grp[i]][j].valueH(pb.harmAt(i, s))
			}
		}
	}
	if g := pb.grp[i]; g >= 0 && pb.cN[g] > 0 && len(s.c) > 0 {
		b := pb.shape[g].at(th)
		for k := 0; k < pb.cN[g]; k++ {
			out[len(pb.idx)+pb.cStart[g]+k] = edge * b[k]
		}
	}
}

// linearDerivative is the derivative of an observation's prediction with
// respect to the gauge zero, the valve offset or a steam lap.
func linearDerivative(spec setting.EngineSpec, o session.Observation, j param) float64 {
	e := cylEnd(o.End)
	lap := (j == pLapFront && e == setting.Front) || (j == pLapBack && e == setting.Back)
	switch o.Kind {
	case session.PortMarkKind:
		switch {
		case j == pGaugeZero:
			return 1
		case j == pValveOffset:
			return -1
		case lap:
			// More lap: the valve must travel further to crack the port
			// (the opening is edgeSlope x x - lap).
			return 1 / edgeSlope(spec.Valve, e)
		}
		return 0
	case session.CutOffKind, session.FeelerKind:
		switch {
		case j == pValveOffset:
			return edgeSlope(spec.Valve, e)
		case lap:
			return -1
		}
		return 0
	}
	if j == pGaugeZero {
		return 1
	}
	return 0
}

// width returns the number of parameters fitted.
func (pb *problem) width(s state) int { return len(pb.idx) + len(s.c) }

// normal returns the normal equations of a Gauss-Newton step at s:
// (J^T W J + P) and -(J^T W r + P (s - mean)).
func (pb *problem) normal(s state, r []float64) (sym, []float64) {
	m := pb.width(s)
	A := newSym(m)
	g := make([]float64, m)
	row := make([]float64, m)
	nz := make([]int, 0, m) // the row's non-zero columns: an observation touches its own position's unmodelled part only
	k := 0
	for i := range pb.obs {
		if !pb.use[i] {
			continue
		}
		pb.row(i, s, row)
		w := 1 / sq(pb.sig[i])
		nz = nz[:0]
		for a, v := range row {
			if v != 0 {
				nz = append(nz, a)
			}
		}
		for x, a := range nz {
			ra := row[a] * w
			for _, b := range nz[:x+1] {
				A.a[a*m+b] += ra * row[b]
			}
			g[a] -= ra * r[k]
		}
		k++
	}
	for a := 0; a < m; a++ {
		for b := 0; b < a; b++ {
			A.a[b*m+a] = A.a[a*m+b]
		}
	}
	for a, j := range pb.idx {
		A.add(a, a, 1/sq(pb.prior[j]))
		g[a] -= (s.p[j] - pb.mean[j]) / sq(pb.prior[j])
	}
	for a, v := range s.c {
		c := len(pb.idx) + a
		A.add(c, c, 1/sq(pb.cPrior[a]))
		g[c] -= v / sq(pb.cPrior[a])
	}
	return A, g
}

// step returns s moved by d (in the normal equations' order).
func (pb *problem) step(s state, d []float64) state {
	q := s.clone()
	for a, j := range pb.idx {
		q.p[j] += d[a]
	}
	for a := range q.c {
		q.c[a] += d[len(pb.idx)+a]
	}
	return q
}

// fitOuter minimises the weighted sum of squares with the priors by
// Levenberg-Marquardt: each step solves the damped normal equations
// (J^T W J + P + lambda diag) d = -g on the linear model, the linkage is
// sampled again where the step lands (so the model is exact there), and
// lambda grows tenfold while a step does not lower the sum, shrinking
// tenfold after one that does (from zero: a pure Gauss-Newton step first).
func (pb *problem) fitOuter(s state) (state, error) {
	s, err := pb.fitLM(s)
	if err == nil && pb.p0 != s.p {
		// The answer is sampled, so that what follows works on the
		// linkage there; where it does not close (a step the linear
		// model took near the end of the linkage's reach), the fit keeps
		// to where it was last sampled.
		if pb.sampleAt(s.p, false) != nil {
			s.p = pb.p0
		}
	}
	return s, err
}

// fitLM is fitOuter's Levenberg-Marquardt iteration.
func (pb *problem) fitLM(s state) (state, error) {
	if pb.p0 != s.p {
		if err := pb.sampleAt(s.p, false); err != nil {
			return s, err
		}
	}
	n := pb.nUsed()
	r := make([]float64, n)
	if err := pb.eval(s, r); err != nil {
		return s, err
	}
	c := pb.cost(s, r)
	rq := make([]float64, n)
	lambda := 0.0 // Levenberg-Marquardt damping, relative to the diagonal
	for round := 0; round < 12; round++ {
		A, g := pb.normal(s, r)
		accepted := false
		var q state
		var cq, pred, worst float64
		var small bool
		for tries := 0; tries < 10; tries++ {
			D := newSym(A.n)
			copy(D.a, A.a)
			for a := 0; a < A.n; a++ {
				D.add(a, a, lambda*A.at(a, a))
			}
			d, ok := D.solve(g)
			if !ok {
				return s, &setting.Error{Field: "readings", Message: "The readings cannot fix the gear's state: take a sweep in full forward and in full back gear."}
			}
			// Converged when the whole step is a twentieth of a standard
			// deviation of what the readings can tell, or would lower the
			// sum of squares by less than 1e-3 (in units of the readings'
			// errors squared): nothing the readings can see.
			worst, pred = 0, 0
			for a := range d {
				worst = math.Max(worst, math.Abs(d[a])*math.Sqrt(A.at(a, a)))
				pred += g[a] * d[a]
			}
			if pred < 1e-3 {
				return s, nil
			}
			small = worst < 0.05
			// The effect curves are sampled again only when a gear
			// dimension moved far (a tenth of its prior) early on: the
			// gauge zero, valve offset, laps and dead-centre mark enter
			// exactly.
			// The linkage is sampled again only when a gear dimension
			// has moved from where it was last sampled by more than a
			// thousandth of its prior: closer than that the linear model
			// (the curve and its effects) is exact to far below a gauge
			// division.
			resens, resample := false, false
			q = pb.step(s, d)
			for a, j := range pb.idx {
				if !isGearParam(j) {
					continue
				}
				if math.Abs(d[a]) > 0.1*pb.prior[j] {
					resens = round < 2
				}
				if math.Abs(q.p[j]-pb.p0[j]) > 1e-3*pb.prior[j] {
					resample = true
				}
			}
			var err error
			if resample || resens {
				err = pb.sampleAt(q.p, resens)
			}
			if err == nil && pb.eval(q, rq) == nil {
				if cq = pb.cost(q, rq); cq <= c*(1+1e-9) || small {
					accepted = true
					lambda /= 10
					if lambda < 1e-6 {
						lambda = 0
					}
					break
				}
			}
			lambda = math.Max(10*lambda, 1e-3)
		}
		if !accepted {
			if pb.p0 != s.p {
				if err := pb.sampleAt(s.p, false); err != nil {
					// Not sampled there, and the linkage does not close:
					// keep to where it was last sampled.
					s.p = pb.p0
				}
			}
			return s, nil
		}
		gain := c - cq
		s, c = q, cq
		copy(r, rq)
		if small || gain < 1e-3 {
			break
		}
	}
	return s, nil
}

// FitObservations fits the as-built state of an engine to one round's
// observations by Levenberg-Marquardt: weighted least squares of
// prediction minus reading, each weighted by its error
// sqrt(gauge^2 + (slope x crank-angle error)^2), with a Gaussian prior on
// every deviation (see priors) so that deviations the readings cannot tell
// apart share the change the way the drawing makes likely, and on each
// position's unmodelled part (see Unmodelled), so that the model follows
// what was measured. The dead-centre mark's error is fitted only with a
// sweep, whose marks show the curve's phase; with readings at the dead
// centres alone nothing can tell it from the gear's errors. A reading the
// others contradict (see suspect) is named in Recheck and left out.
func FitObservations(spec setting.EngineSpec, obs []session.Observation, opt FitOptions) (*Fit, error) {
	if err := spec.Validate(); err != nil {
		return nil, err
	}
	if err := checkReadings(obs); err != nil {
		return nil, err
	}
	pb := newProblem(spec, obs)
	res := 0.0
	dcSig := 0.0
	for _, o := range obs {
		res = math.Max(res, o.GaugeSigmaMM*math.Sqrt(12))
		if o.Kind == session.AtDeadCentre && o.End == session.Front {
			dcSig = math.Max(dcSig, o.CrankSigmaDeg)
		}
	}
	if res == 0 {
		res = 0.01
	}
	k := scaleOf(spec)
	// A reading is suspected against what the gear's unmodelled errors
	// could do, and those grow slower than the engine: a full-size shop
	// holds larger errors than a model engineer's, but not twelve times
	// larger (common practice, no source).
	ks := math.Pow(k, 0.7)
	pb.prior = priors(spec, dcSig)
	pb.idx = []param{pGaugeZero, pValveOffset}
	if hasSweep(obs) {
		pb.idx = append(pb.idx, pDeadCentre)
	}
	pb.idx = append(pb.idx, gearParams(spec.Gear.Kind)...)
	if hasPortMarks(obs) {
		pb.idx = append(pb.idx, pLapFront, pLapBack)
	}
	if !hasGaugeReadings(obs) {
		pb.idx = pb.idx[1:] // the gauge zero means nothing without readings
	}
	if err := pb.sampleAt(pb.mean, true); err != nil {
		return nil, &setting.Error{Field: "engine.gear", Message: "The gear as drawn cannot reach every crank angle of the readings: " + err.Error()}
	}
	// Weights from the drawing's valve slope at each reading, and a first
	// gauge zero.
	var zsum float64
	var zn int
	marks := hasPortMarks(obs)
	pb.setUnmodelled(k)
	s0 := state{p: pb.mean, c: make([]float64, pb.nc())}
	for i, o := range obs {
		sg := math.Max(o.GaugeSigmaMM, 1e-4)
		if o.HasCrank {
			x, slope := pb.gear(i, s0)
			sg = math.Hypot(sg, slope*o.CrankSigmaDeg)
			if (o.Kind == session.AtDeadCentre || o.Kind == session.InSweep) && !marks {
				zsum += o.GaugeMM - x
				zn++
			}
		}
		if o.Kind == session.PortMarkKind {
			zsum += o.GaugeMM - edgeX(spec.Valve, cylEnd(o.End))
			zn++
			// Seeing an edge just crack is coarser than the gauge.
			sg = math.Hypot(sg, portMarkErrorMM*math.Sqrt(k))
		}
		pb.sig[i] = sg
	}
	if zn > 0 {
		pb.mean[pGaugeZero] = zsum / float64(zn)
		s0.p = pb.mean
	}
	f := &Fit{obs: obs}
	// First the gear's own deviations alone, where the readings check one
	// another through the linkage: a reading they contradict is named and
	// left out (up to two). Then the unmodelled parts, so that the model
	// follows what was measured.
	// (With a sweep the unmodelled parts are pinned by the sweep's own
	// readings, and a slip stands out against them: the first pass is
	// not needed.)
	// A position swept keeps its unmodelled part in this first pass (its
	// own readings pin it); the dead-centre readings of the others are
	// checked against the deviations alone.
	nc := pb.cN
	pb.cN = make([]int, len(pb.revs))
	swept := false
	for g, n := range nc {
		if n >= 5 {
			pb.cN[g], swept = n, true
		}
	}
	sA := state{p: s0.p}
	if swept {
		sA.c = make([]float64, pb.nc())
	}
	sA, err := pb.fitOuter(sA)
	if err != nil {
		return nil, err
	}
	if !opt.NoRecheck {
		if cands := pb.suspects(sA, ks, suspectFloor); len(cands) > 0 {
			if named, q, ok := pb.confirm(sA, cands, ks, suspectFloor); ok {
				f.expect = append(f.expect, named...)
				sA = q
			}
		}
	}
	pb.cN = nc
	if len(f.expect) > 0 {
		pb.setUnmodelled(k)
	}
	s, err := pb.fitOuter(state{p: sA.p, c: make([]float64, pb.nc())})
	if err != nil {
		return nil, err
	}
	// With the unmodelled parts a sweep's readings check one another
	// closely: a knocked reading among them stands out there.
	if !opt.NoRecheck && len(f.expect) == 0 {
		if cands := pb.suspects(s, ks, 0); len(cands) > 0 && cands[0].t > 5 && (len(cands) == 1 || cands[0].t > 2*cands[1].t) {
			pb.use[cands[0].i] = false
			f.expect = append(f.expect, cands[0])
			pb.setUnmodelled(k)
			if s, err = pb.fitOuter(state{p: s.p, c: make([]float64, pb.nc())}); err != nil {
				return nil, err
			}
		}
	}
	if !opt.NoRecheck && len(f.expect) == 0 {
		if e, q, ok := pb.oneEnd(s, k, ks); ok {
			f.expect = append(f.expect, e)
			s = q
		}
	}
	if err := pb.finish(f, s, res); err != nil {
		return nil, err
	}
	if err := f.contradiction(pb); err != nil {
		return nil, err
	}
	return f, nil
}

func hasPortMarks(obs []session.Observation) bool {
	for _, o := range obs {
		if o.Kind == session.PortMarkKind {
			return true
		}
	}
	return false
}

// hasSweep reports whether the readings include a sweep, whose marks tie
// the valve curve's phase to the dead-centre mark.
func hasSweep(obs []session.Observation) bool {
	for _, o := range obs {
		if o.Kind == session.InSweep {
			return true
		}
	}
	return false
}

func hasGaugeReadings(obs []session.Observation) bool {
	for _, o := range obs {
		if o.Kind == session.PortMarkKind || o.Kind == session.AtDeadCentre || o.Kind == session.InSweep {
			return true
		}
	}
	return false
}

func linkageError(errs ...error) error {
	for _, e := range errs {
		if e != nil {
			return e
		}
	}
	return nil
}

// expected is a reading the others contradict: its index, and what the
// others put it at.
type expected struct {
	i      int
	expect float64 // the reading the fit without it predicts, mm (normalised gauge, or the kind's own terms)
	t      float64 // how many standard deviations it lies off
	// with is the index of another reading that could as well be the one
	// at fault (the readings cannot tell which), or -1.
	with int
}

// suspects returns the used readings the others contradict, most first
// (at most three): those whose deleted residual (the reading less what
// the fit without it predicts, r/(1-h) with h its leverage, linearised)
// lies more than three standard deviations of that difference away and
// more than 0.15 mm (scaled with the crank). floor (mm at 5 in gauge
// scale) is how far the gear's unmodelled errors may put a reading from
// the fit before it counts against it. A reading the others cannot check
// (leverage near one: nothing else measures what it does) is never
// named.
func (pb *problem) suspects(s state, k, floor float64) []expected {
	n := pb.nUsed()
	if n < 4 {
		return nil
	}
	r := make([]float64, n)
	if pb.eval(s, r) != nil {
		return nil
	}
	A, _ := pb.normal(s, r)
	inv, ok := A.inverse()
	if !ok {
		return nil
	}
	row := make([]float64, pb.width(s))
	var out []expected
	kk := 0
	for i := range pb.obs {
		if !pb.use[i] {
			continue
		}
		ri := r[kk]
		kk++
		// A reading the fit follows closely cannot be 0.15 mm off
		// unless its leverage is high: those are checked in full.
		if math.Abs(ri) < 0.03*k && pb.grp[i] >= 0 && pb.cN[pb.grp[i]] >= 3 {
			continue
		}
		pb.row(i, s, row)
		v := inv.quad(row)
		h := v / sq(pb.sig[i])
		if h > 0.98 {
			continue
		}
		e := ri / (1 - h)
		sd := math.Sqrt(sq(pb.sig[i]) + v/(1-h) + sq(floor*k))
		if t := math.Abs(e) / sd; t > 3 && math.Abs(e) > 0.15*k {
			out = append(out, expected{i: i, expect: Target(pb.obs[i]) + e, t: t, with: -1})
		}
	}
	sort.Slice(out, func(a, b int) bool { return out[a].t > out[b].t })
	if len(out) > 3 {
		out = out[:3]
	}
	return out
}

// oneEnd looks for a position read at its two dead centres alone whose
// unmodelled part bends far at one end and hardly at the other: the gear's
// unmodelled errors move both ends together (an offset) or apart (a
// phase), and only by chance one end alone, while a mistyped reading moves
// one. Such a reading is a suspect: the fit is made again without it, and
// it is named (see confirm) when what the rest put it at lies four
// standard deviations and 0.15 mm (at 5 in gauge, ks the scale) from it.
// k scales the unmodelled parts' priors.
func (pb *problem) oneEnd(s state, k, ks float64) (expected, state, bool) {
	cc := pb.corrCurves(s)
	if cc == nil {
		return expected{}, s, false
	}
	best, bestU := -1, 0.0
	for g := range pb.revs {
		if pb.cN[g] != 2 || cc[g] == nil {
			continue
		}
		var at []int
		for i, o := range pb.obs {
			if pb.use[i] && pb.grp[i] == g && o.Kind == session.AtDeadCentre {
				at = append(at, i)
			}
		}
		if len(at) != 2 {
			continue
		}
		for a, i := range at {
			j := at[1-a]
			ui, _ := cc[g].at(pb.obs[i].CrankDeg + s.p[pDeadCentre])
			uj, _ := cc[g].at(pb.obs[j].CrankDeg + s.p[pDeadCentre])
			if math.Abs(ui) > math.Max(oneEndMM*ks, 4*pb.sig[i]) && math.Abs(uj) < math.Abs(ui)/3 && math.Abs(ui) > bestU {
				best, bestU = i, math.Abs(ui)
			}
		}
	}
	if best < 0 {
		return expected{}, s, false
	}
	pb.use[best] = false
	pb.setUnmodelled(k)
	q, err := pb.fitOuter(state{p: s.p, c: make([]float64, pb.nc())})
	if err == nil {
		o := pb.obs[best]
		pred := pb.predictS(best, q)
		t := math.Abs(Target(o)-pred) / math.Hypot(pb.sig[best], suspectFloor*ks)
		if t > 4 && math.Abs(Target(o)-pred) > 0.15*ks && pb.worstResidual(q, ks, suspectFloor) < 3 {
			return expected{i: best, expect: pred, t: t, with: -1}, q, true
		}
	}
	pb.use[best] = true
	pb.setUnmodelled(k)
	return expected{}, s, false
}

// oneEndMM is how far (mm at 5 in gauge) a position's unmodelled part must
// bend at one dead centre before the reading there is suspected (see
// oneEnd): the unmodelled part's own prior, what the gear's errors leave
// there at most (common practice, no source).
const oneEndMM = 0.3

// confirm fits again without each suspect (see suspects) and names the
// one whose leaving out makes the rest agree (every residual within three
// standard deviations, floor among them) while leaving out any other does
// not; what the fit without it predicts is what the others put it at.
// When two such readings would each explain the rest, both are named as
// one of a pair. It returns the fit without the named readings.
func (pb *problem) confirm(s state, cands []expected, k, floor float64) ([]expected, state, bool) {
	type try struct {
		e      expected
		s      state
		agrees bool
		worst  float64
		sum    float64
	}
	without := func(i int) (try, bool) {
		pb.use[i] = false
		defer func() { pb.use[i] = true }()
		q, err := pb.fitOuter(s)
		if err != nil {
			return try{}, false
		}
		pred := pb.predictS(i, q)
		sd := math.Hypot(pb.sig[i], floor*k)
		worst, sum := pb.misfit(q, k, floor)
		t := math.Abs(Target(pb.obs[i])-pred) / sd
		// The rest agree: every residual within three standard
		// deviations, or the one left out stands at least twice as far
		// off as any left in.
		return try{expected{i: i, expect: pred, t: t, with: -1}, q, worst < math.Max(3, t/2), worst, sum}, true
	}
	var tries []try
	tried := map[int]bool{}
	for _, c := range cands {
		tried[c.i] = true
		if t, ok := without(c.i); ok {
			tries = append(tries, t)
		}
	}
	far := func(t try) bool { return math.Abs(Target(pb.obs[t.e.i])-t.e.expect) > 0.15*k }
	var good []try
	for _, t := range tries {
		if t.agrees && t.e.t > 4 && far(t) {
			good = append(good, t)
		}
	}
	// Another dead-centre reading that the first pass did not suspect,
	// whose leaving out explains the rest clearly better (by 4 in the sum
	// of squares, odds of about seven to one) and that stands off by as
	// much as a slip (twice its error and 0.15 mm at 5 in gauge scale), is
	// named instead: on a gear whose unmodelled errors are large the
	// reading that stands furthest from the fit is not always the one
	// mistyped.
	if len(good) > 0 {
		bestSum := good[0].sum
		for _, t := range good {
			bestSum = math.Min(bestSum, t.sum)
		}
		var rival *try
		for i, o := range pb.obs {
			if !pb.use[i] || tried[i] || o.Kind != session.AtDeadCentre {
				continue
			}
			t, ok := without(i)
			if ok && t.agrees && t.e.t > 2 && far(t) && t.sum < bestSum-4 && (rival == nil || t.sum < rival.sum) {
				rival = &t
			}
		}
		if rival != nil {
			good = []try{*rival}
		}
	}
	// The one whose leaving out makes the rest agree best (the least sum
	// of squares, priors included: the likeliest state of the gear); a
	// second is named beside it only when it explains the rest nearly as
	// well (within 4 of that sum, odds under about seven to one).
	sort.SliceStable(good, func(a, b int) bool { return good[a].sum < good[b].sum })
	if len(good) > 1 && good[1].sum > good[0].sum+4 {
		good = good[:1]
	}
	switch len(good) {
	case 0:
		return nil, s, false
	case 1:
		pb.use[good[0].e.i] = false
		return []expected{good[0].e}, good[0].s, true
	}
	// Two readings either of which explains the rest: name both and
	// leave both out.
	a, b := good[0].e, good[1].e
	a.with, b.with = b.i, a.i
	pb.use[a.i], pb.use[b.i] = false, false
	q, err := pb.fitOuter(good[0].s)
	if err != nil {
		q = good[0].s
	}
	return []expected{a, b}, q, true
}

// worstResidual returns the largest residual of the used readings at s in
// standard deviations (each reading's own, with floor for the gear's
// unmodelled errors).
func (pb *problem) worstResidual(s state, k, floor float64) float64 {
	w, _ := pb.misfit(s, k, floor)
	return w
}

// misfit returns the largest residual of the used readings at s in
// standard deviations (each reading's own, with floor for the gear's
// unmodelled errors), and the sum of their squares with the deviations'
// priors: how unlikely the readings left in make the fit.
func (pb *problem) misfit(s state, k, floor float64) (worst, sum float64) {
	r := make([]float64, pb.nUsed())
	if pb.eval(s, r) != nil {
		return math.Inf(1), math.Inf(1)
	}
	kk := 0
	for i := range pb.obs {
		if pb.use[i] {
			z := math.Abs(r[kk]) / math.Hypot(pb.sig[i], floor*k)
			worst = math.Max(worst, z)
			sum += z * z
			kk++
		}
	}
	for _, j := range pb.idx {
		sum += sq((s.p[j] - pb.mean[j]) / pb.prior[j])
	}
	return worst, sum
}

// finish fills the fit's report: the model with its unmodelled parts,
// residuals, covariance and what the readings could not decide.
func (pb *problem) finish(f *Fit, s state, res float64) error {
	f.Model = Model{Spec: pb.spec, Dev: devOf(s.p)}
	for g, r := range pb.revs {
		if pb.cN[g] == 0 {
			continue
		}
		u := Unmodelled{Reverser: r, Coef: pb.shape[g].curveOf(s.c[pb.cStart[g] : pb.cStart[g]+pb.cN[g]])}
		f.Model.Unmodelled = append(f.Model.Unmodelled, u)
	}
	f.idx = pb.idx
	f.cStart, f.cN, f.nc, f.shape = pb.cStart, pb.cN, pb.nc(), pb.shape
	f.used = append([]bool(nil), pb.use...)
	f.resMM = res
	f.sig = append([]float64(nil), pb.sig...)
	var ss float64
	var nu int
	var chi float64
	for i, o := range pb.obs {
		v := pb.predictS(i, s)
		rr := Target(o) - v
		f.Residuals = append(f.Residuals, Residual{Label: o.Label, Field: o.Field, Kind: o.Kind, ResidualMM: rr, Used: pb.use[i]})
		if pb.use[i] {
			ss += rr * rr
			chi += sq(rr / pb.sig[i])
			nu++
		}
	}
	for _, x := range f.expect {
		rr := f.Residuals[x.i]
		// What the final fit, made without it, predicts.
		rr.ExpectMM = pb.predictS(x.i, s)
		if x.with >= 0 {
			rr.Pair = pb.obs[x.with].Field
		}
		f.Recheck = append(f.Recheck, rr)
	}
	if nu > 0 {
		f.RMSMM = math.Sqrt(ss / float64(nu))
	}
	// Covariance (J^T W J + P)^-1, scaled up when the residuals are larger
	// than the stated errors.
	r := make([]float64, pb.nUsed())
	if err := pb.eval(s, r); err != nil {
		return err
	}
	A, _ := pb.normal(s, r)
	m := len(pb.idx)
	cov, ok := A.inverse()
	if !ok {
		return &setting.Error{Field: "readings", Message: "The readings cannot fix the gear's state: take a sweep in full forward and in full back gear."}
	}
	f.varScale = 1
	if dof := nu - m; dof > 0 && chi/float64(dof) > 1 {
		f.varScale = chi / float64(dof)
	}
	for i := range cov.a {
		cov.a[i] *= f.varScale
	}
	f.cov = cov
	var sv [numParams]float64
	for a, j := range pb.idx {
		sv[j] = math.Sqrt(cov.at(a, a))
		if j != pGaugeZero {
			f.Fitted = append(f.Fitted, j.name())
			// (A lap is always shared with the spindle by the port
			// marks: the plan never depends on which, and saying so
			// every time would bury the notes that matter.)
			if sv[j] > 0.7*pb.prior[j]*math.Sqrt(f.varScale) && j != pLapFront && j != pLapBack {
				f.Undecided = append(f.Undecided, j.name())
			}
		}
	}
	f.Sigma = devOf(sv)
	f.prior = pb.prior
	f.obs = pb.obs
	f.revs, f.sens = pb.revs, pb.sens
	return nil
}

// contradiction refuses a fit that cannot follow the readings: most of
// them lie many times farther from it than the gauge and the marks could
// explain.
func (f *Fit) contradiction(pb *problem) error {
	var u []float64
	for i, r := range f.Residuals {
		if r.Used {
			u = append(u, math.Abs(r.ResidualMM)/pb.sig[i])
		}
	}
	if len(u) < 4 {
		return nil
	}
	sort.Slice(u, func(i, j int) bool { return u[i] < u[j] })
	scale := 1.4826 * u[len(u)/2]
	if scale < 10 || f.RMSMM < 5*f.resMM {
		return nil
	}
	worst := append([]Residual(nil), f.Residuals...)
	sort.SliceStable(worst, func(a, b int) bool { return math.Abs(worst[a].ResidualMM) > math.Abs(worst[b].ResidualMM) })
	var names []string
	for i := 0; i < len(worst) && i < 3; i++ {
		names = append(names, fmt.Sprintf("%s (%.2f mm off)", worst[i].Label, math.Abs(worst[i].ResidualMM)))
	}
	return &setting.Error{Field: "readings", Message: fmt.Sprintf("The readings contradict one another (or the engine's dimensions): no setting of the gear follows them closer than %.2f mm, where the gauge reads to %.2f mm. Farthest off: %s. Check that the gauge was not knocked, that the marks are numbered the way the wheel turns, and the gear's dimensions, then take the round again; or plan without the dimensions, from the readings alone.", f.RMSMM, f.resMM, strings.Join(names, "; "))}
}

// RecheckMessages returns one sentence per reading to take again: "Take
// again the front dead centre, full forward: the gauge read 4.53 mm, where
// the other readings put it near 2.51 mm. It is left out of the plan until
// it is taken again." Two readings either of which could be at fault get
// one sentence naming both.
func (f *Fit) RecheckMessages(unit session.Unit) []string {
	var out []string
	done := map[string]bool{}
	for _, r := range f.Recheck {
		if done[r.Field] {
			continue
		}
		done[r.Field] = true
		i := f.index(r.Field)
		if i < 0 {
			continue
		}
		o := f.obs[i]
		if r.Pair != "" {
			if j := f.index(r.Pair); j >= 0 {
				done[r.Pair] = true
				out = append(out, fmt.Sprintf("Take again the %s and the %s: one of them disagrees with the other readings by about %s, and they cannot tell which. Both are left out of the plan until they are taken again.",
					r.Label, f.obs[j].Label, plainLength(math.Abs(Target(o)-r.ExpectMM), unit)))
				continue
			}
		}
		got, want := Target(o), r.ExpectMM
		if o.HasGauge && (o.Kind == session.AtDeadCentre || o.Kind == session.InSweep || o.Kind == session.PortMarkKind) {
			// In the gauge's own terms, as the setter read it.
			got, want = o.RawGaugeMM, o.RawGaugeMM+(r.ExpectMM-o.GaugeMM)*gaugeSense(o)
			out = append(out, fmt.Sprintf("Take again the %s: the gauge read %s, where the other readings put it near %s. It is left out of the plan until it is taken again.", r.Label, plainLength(got, unit), plainLength(want, unit)))
			continue
		}
		out = append(out, fmt.Sprintf("Take again the %s: it lies %s from where the other readings put it. It is left out of the plan until it is taken again.", r.Label, plainLength(math.Abs(got-want), unit)))
	}
	return out
}

// Findings says where the engine, as the readings show it, differs from
// its drawing by more than a build would leave or the readings can
// explain: a deviation more than three times its prior ("the fit puts the
// radius rod 9.10 mm longer than drawn"), and a reverser position whose
// readings the drawing cannot follow at a dead centre by more than a
// tenth of a millimetre (scaled with the crank) and three times the
// reading's own error. The plan works from the readings either way; these
// say what to check on the drawing or the engine.
func (f *Fit) Findings(unit session.Unit) []string {
	var out []string
	d := f.Model.Dev.vec()
	for _, j := range f.idx {
		if j == pGaugeZero || j == pDeadCentre || !(math.Abs(d[j]) > 3*f.prior[j]) {
			continue
		}
		what := ""
		switch j {
		case pValveOffset:
			what = fmt.Sprintf("the valve %s from where the drawing puts it on its spindle", movedWords(d[j], unit))
		case pEccFwd, pEccBack:
			what = fmt.Sprintf("the %s %.1f deg %s than drawn", j.name(), math.Abs(d[j]), moreLess(d[j], "more advanced", "less advanced"))
		case pReturnCrank:
			what = fmt.Sprintf("the return crank %.1f deg off its drawn angle", math.Abs(d[j]))
		case pLapFront, pLapBack:
			what = fmt.Sprintf("the %s %s %s than drawn", j.name(), plainLength(math.Abs(d[j]), unit), moreLess(d[j], "more", "less"))
		default:
			what = fmt.Sprintf("the %s %s %s than drawn", strings.TrimSuffix(j.name(), " length"), plainLength(math.Abs(d[j]), unit), moreLess(d[j], "longer", "shorter"))
		}
		out = append(out, fmt.Sprintf("The readings put %s: far more than a build would leave. Check that dimension on the drawing and on the engine; the plan works from the readings.", what))
	}
	k := scaleOf(f.Model.Spec)
	var where []string
	for _, r := range f.revs {
		worst := f.bentAt(r)
		// The reading's own error there, as the fit weighed it, and the
		// position's name as the readings give it.
		sig, name := 0.0, ""
		for i, o := range f.obs {
			if o.Reverser == r && o.Notch != "" {
				name = o.Notch
			}
			if o.Kind == session.AtDeadCentre && o.Reverser == r && i < len(f.sig) {
				sig = math.Max(sig, f.sig[i])
			}
		}
		if worst > math.Max(0.15*k, 4*sig) {
			where = append(where, fmt.Sprintf("%s (%s)", notchName(name, r), plainLength(worst, unit)))
		}
	}
	if len(where) > 0 {
		out = append(out, fmt.Sprintf("At the dead centres the readings differ from the gear as drawn by more than their errors explain, in %s: a dimension of the drawing, or of the engine, is off there (a rod, the link or its hanging, the die's place in the notch). The plan works from the readings.", strings.Join(where, ", ")))
	}
	return out
}

// bentAt returns how far (mm) the fit's unmodelled part puts the valve
// from the gear as drawn at the dead centres in reverser position r: how
// much the model was bent to follow the readings there; 0 where it has no
// unmodelled part.
func (f *Fit) bentAt(r setting.Reverser) float64 {
	u := f.Model.correction(r)
	g := slices.Index(f.revs, r)
	if u == nil || g < 0 || g >= len(f.cN) || f.cN[g] == 0 {
		return 0
	}
	crank, err := f.Model.Spec.Engine.Prepare()
	if err != nil {
		return 0
	}
	worst := 0.0
	for _, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
		x, _ := u.at(crank.DeadCentre(end))
		worst = math.Max(worst, math.Abs(x))
	}
	return worst
}

// moreLess picks words by the sign of x.
func moreLess(x float64, plus, minus string) string {
	if x < 0 {
		return minus
	}
	return plus
}

// movedWords says how far and which way the valve stands: "1.20 mm toward
// the front cover".
func movedWords(x float64, unit session.Unit) string {
	return plainLength(math.Abs(x), unit) + " " + moreLess(x, "toward the front cover", "toward the back")
}

// gaugeSense returns +1 when the raw gauge reading grows with the
// normalised one, -1 when the gauge is mounted the other way.
func gaugeSense(o session.Observation) float64 {
	if o.RawGaugeMM != 0 && o.RawGaugeMM == -o.GaugeMM {
		return -1
	}
	return 1
}

// plainLength writes a length without a sign: "2.51 mm", "0.099 in".
func plainLength(mm float64, unit session.Unit) string {
	return strings.TrimPrefix(session.FormatLength(mm, unit), "+")
}

// index returns the index of the observation with the field, or -1.
func (f *Fit) index(field string) int {
	for i, o := range f.obs {
		if o.Field == field {
			return i
		}
	}
	return -1
}

// Observations returns the readings the fit was made from (one round's,
// as FitSession chose them), in file order; Residuals match them by Field.
// The slice is the fit's own: read it, do not change it.
func (f *Fit) Observations() []session.Observation { return f.obs }
