package plan

import (
	"fmt"
	"math"
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
	// Recheck are the readings far from the rest, worst first; they were
	// left out of the fit.
	Recheck []Residual
	// RMSMM is the root-mean-square residual of the readings used (mm).
	RMSMM float64
	// Undecided names deviations the readings could not pin down; their
	// values come from the drawing (the prior), not from the readings.
	Undecided []string

	obs      []session.Observation
	used     []bool
	idx      []param
	cov      sym // covariance of the fitted parameters, in idx order
	revs     []setting.Reverser
	sens     [][numParams]curve // the fit's effect curves per reverser position, for the planner
	resMM    float64
	varScale float64
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
// well posed when readings cannot tell two deviations apart. Lengths scale
// with the crank radius (a 25 mm crank is the 5 in gauge norm).
func priors(spec setting.EngineSpec, dcSigma float64) [numParams]float64 {
	k := math.Max(1, spec.Engine.CrankRadius/25)
	return [numParams]float64{
		pGaugeZero: 1e3, pValveOffset: 2 * k, pDeadCentre: math.Max(0.25, dcSigma),
		pEccFwd: 3, pEccBack: 3, pRodFwd: 2 * k, pRodBack: 2 * k,
		pReturnCrank: 3, pRadiusRod: 3 * k,
	}
}

// roundObservations picks the observations of round number round (from
// 1; 0 for the latest) of cylinder cyl.
func roundObservations(s *session.Session, cyl, round int) ([]session.Observation, error) {
	all, err := s.Observations(cyl)
	if err != nil {
		return nil, err
	}
	if round <= 0 || round > len(s.Cylinders[cyl].Rounds) {
		round = len(s.Cylinders[cyl].Rounds)
	}
	round-- // to an index
	// Observations come round by round, so the round is one run of them.
	lo := 0
	for lo < len(all) && all[lo].Round != round {
		lo++
	}
	hi := lo
	for hi < len(all) && all[hi].Round == round {
		hi++
	}
	for _, o := range all[hi:] {
		if o.Round == round { // not in one run after all: gather them
			out := make([]session.Observation, 0, len(all))
			for _, o := range all {
				if o.Round == round {
					out = append(out, o)
				}
			}
			return out, nil
		}
	}
	return all[lo:hi:hi], nil
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
// gear deviation, the curve of its effect, combined linearly. The fit
// solves on that linear model, samples the linkage again at the answer,
// and repeats until the answer stands still (see fitOuter), so the few
// hundred linkage solutions are spent per round of that loop, not per
// reading and per Jacobian column.
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
}

// newProblem groups the observations by reverser position.
func newProblem(spec setting.EngineSpec, obs []session.Observation) *problem {
	pb := &problem{spec: spec, obs: obs, use: make([]bool, len(obs)), sig: make([]float64, len(obs)), grp: make([]int, len(obs)), tr: curveTrig, tr24: effectTrig}
	for k := 0; k < 2; k++ {
		end := setting.CylinderEnd(k)
		pb.kEdge[k] = spec.Valve.SteamEdge(end, 1) - spec.Valve.SteamEdge(end, 0)
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
		for _, j := range pb.idx {
			if j == pGaugeZero || j == pValveOffset || j == pDeadCentre {
				continue
			}
			ds, err := effect(pb.spec, p, pb.revs, pb.tr24, j, stepOf(j), base, false)
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

// gear returns the linear model's gear valve displacement of observation
// i at deviations p, and its derivatives: by the true crank angle (mm per
// degree) and by each gear deviation.
func (pb *problem) gear(i int, p [numParams]float64) (x, slope float64) {
	g := pb.grp[i]
	th := pb.obs[i].CrankDeg + p[pDeadCentre]
	x, slope = pb.base[g].at(th)
	for _, j := range pb.idx {
		if d := pb.sens[g][j]; d != nil && p[j] != pb.p0[j] {
			v, dv := d.at(th)
			x += (p[j] - pb.p0[j]) * v
			slope += (p[j] - pb.p0[j]) * dv
		}
	}
	return x, slope
}

// predictS is the linear model's prediction of observation i (see
// Predict for what each kind predicts).
func (pb *problem) predictS(i int, p [numParams]float64) float64 {
	o := pb.obs[i]
	if o.Kind == session.PortMarkKind {
		return p[pGaugeZero] - p[pValveOffset] + edgeX(pb.spec.Valve, cylEnd(o.End))
	}
	x, _ := pb.gear(i, p)
	switch o.Kind {
	case session.CutOffKind, session.FeelerKind:
		return pb.spec.Valve.SteamEdge(cylEnd(o.End), x+p[pValveOffset])
	}
	return x + p[pGaugeZero]
}

// eval returns the residuals (prediction - target) of the used
// observations at p.
func (pb *problem) eval(p [numParams]float64, out []float64) error {
	k := 0
	for i, o := range pb.obs {
		if !pb.use[i] {
			continue
		}
		v := pb.predictS(i, p)
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
func (pb *problem) cost(p [numParams]float64, r []float64) float64 {
	c := 0.0
	k := 0
	for i := range pb.obs {
		if pb.use[i] {
			c += sq(r[k] / pb.sig[i])
			k++
		}
	}
	for _, j := range pb.idx {
		c += sq((p[j] - pb.mean[j]) / pb.prior[j])
	}
	return c
}

func sq(x float64) float64 { return x * x }

// stepOf returns the finite-difference step of a deviation (degrees or
// mm).
func stepOf(j param) float64 { return 1e-3 }

// jacobian returns the linear model's derivatives (columns: idx, rows:
// used observations) at p.
func (pb *problem) jacobian(p [numParams]float64, _ []float64) ([][]float64, error) {
	n := pb.nUsed()
	J := make([][]float64, len(pb.idx))
	for c := range J {
		J[c] = make([]float64, n)
	}
	k := 0
	for i, o := range pb.obs {
		if !pb.use[i] {
			continue
		}
		edge := 1.0 // d(prediction)/d(gear displacement)
		if o.Kind == session.CutOffKind || o.Kind == session.FeelerKind {
			edge = pb.kEdge[cylEnd(o.End)]
		}
		var slope float64
		if o.HasCrank {
			_, slope = pb.gear(i, p)
		}
		for c, j := range pb.idx {
			switch j {
			case pGaugeZero, pValveOffset:
				J[c][k] = linearDerivative(pb.spec, o, j)
			case pDeadCentre:
				if o.HasCrank {
					J[c][k] = edge * slope
				}
			default:
				if o.HasCrank {
					J[c][k] = edge * pb.sens[pb.grp[i]][j].value(o.CrankDeg+p[pDeadCentre])
				}
			}
		}
		k++
	}
	return J, nil
}

// linearDerivative is the derivative of an observation's prediction with
// respect to the gauge zero or the valve offset.
func linearDerivative(spec setting.EngineSpec, o session.Observation, j param) float64 {
	switch o.Kind {
	case session.PortMarkKind:
		if j == pGaugeZero {
			return 1
		}
		return -1
	case session.CutOffKind, session.FeelerKind:
		if j == pGaugeZero {
			return 0
		}
		e := cylEnd(o.End)
		return spec.Valve.SteamEdge(e, 1) - spec.Valve.SteamEdge(e, 0)
	}
	if j == pGaugeZero {
		return 1
	}
	return 0
}

// normal returns the normal equations of a Gauss-Newton step at p:
// (J^T W J + P) and -(J^T W r + P (p - mean)).
func (pb *problem) normal(p [numParams]float64, r []float64) (sym, []float64) {
	J, _ := pb.jacobian(p, r)
	m := len(pb.idx)
	A := newSym(m)
	g := make([]float64, m)
	w := make([]float64, 0, len(r))
	for i := range pb.obs {
		if pb.use[i] {
			w = append(w, 1/sq(pb.sig[i]))
		}
	}
	for a := 0; a < m; a++ {
		for b := 0; b <= a; b++ {
			s := 0.0
			for k, wk := range w {
				s += J[a][k] * J[b][k] * wk
			}
			A.a[a*m+b], A.a[b*m+a] = s, s
		}
		s := 0.0
		for k, wk := range w {
			s += J[a][k] * r[k] * wk
		}
		j := pb.idx[a]
		A.add(a, a, 1/sq(pb.prior[j]))
		g[a] = -(s + (p[j]-pb.mean[j])/sq(pb.prior[j]))
	}
	return A, g
}

// fitOuter minimises the weighted sum of squares with the priors by
// Levenberg-Marquardt: each step solves the damped normal equations
// (J^T W J + P + lambda diag) d = -g on the linear model, the linkage is
// sampled again where the step lands (so the model is exact there), and
// lambda grows tenfold while a step does not lower the sum, shrinking
// tenfold after one that does (from zero: a pure Gauss-Newton step first).
func (pb *problem) fitOuter(p [numParams]float64) ([numParams]float64, error) {
	if pb.p0 != p {
		if err := pb.sampleAt(p, false); err != nil {
			return p, err
		}
	}
	n := pb.nUsed()
	r := make([]float64, n)
	if err := pb.eval(p, r); err != nil {
		return p, err
	}
	c := pb.cost(p, r)
	rq := make([]float64, n)
	lambda := 0.0 // Levenberg-Marquardt damping, relative to the diagonal
	for round := 0; round < 12; round++ {
		A, g := pb.normal(p, r)
		accepted := false
		var q [numParams]float64
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
				return p, &setting.Error{Field: "readings", Message: "The readings cannot fix the gear's state: take a sweep in full forward and in full back gear."}
			}
			// Converged when the whole step is a twentieth of a standard
			// deviation of what the readings can tell, or would lower the
			// sum of squares by less than 1e-3 (in units of the readings'
			// errors squared): nothing the readings can see.
			worst, pred = 0, 0
			for a := range pb.idx {
				worst = math.Max(worst, math.Abs(d[a])*math.Sqrt(A.at(a, a)))
				pred += g[a] * d[a]
			}
			if pred < 1e-3 {
				return p, nil
			}
			small = worst < 0.05
			// The effect curves are sampled again only when a gear
			// dimension moved far (a tenth of its prior) early on: the
			// gauge zero, valve offset and dead-centre mark enter exactly.
			resens := false
			for a, j := range pb.idx {
				if j != pGaugeZero && j != pValveOffset && j != pDeadCentre && math.Abs(d[a]) > 0.1*pb.prior[j] {
					resens = round < 2
				}
			}
			q = p
			for a, j := range pb.idx {
				q[j] += d[a]
			}
			if err := pb.sampleAt(q, resens); err == nil && pb.eval(q, rq) == nil {
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
			if err := pb.sampleAt(p, false); err != nil {
				return p, err
			}
			return p, nil
		}
		gain := c - cq
		p, c = q, cq
		copy(r, rq)
		if small || gain < 1e-3 {
			break
		}
	}
	return p, nil
}

// FitObservations fits the as-built deviations of an engine to one round's
// observations by Levenberg-Marquardt: weighted least squares of
// prediction minus reading, each weighted by its error
// sqrt(gauge^2 + (slope x crank-angle error)^2), with a Gaussian prior on
// every deviation (see priors) so that deviations the readings cannot tell
// apart share the change the way the drawing makes likely. Readings far
// from the rest are named in Recheck and left out.
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
	pb.prior = priors(spec, dcSig)
	pb.idx = append([]param{pGaugeZero, pValveOffset, pDeadCentre}, gearParams(spec.Gear.Kind)...)
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
	for i, o := range obs {
		s := math.Max(o.GaugeSigmaMM, 1e-4)
		if o.HasCrank {
			x, slope := pb.gear(i, pb.mean)
			s = math.Hypot(s, slope*o.CrankSigmaDeg)
			if (o.Kind == session.AtDeadCentre || o.Kind == session.InSweep) && !marks {
				zsum += o.GaugeMM - x
				zn++
			}
		}
		if o.Kind == session.PortMarkKind {
			zsum += o.GaugeMM - edgeX(spec.Valve, cylEnd(o.End))
			zn++
		}
		pb.sig[i] = s
	}
	if zn > 0 {
		pb.mean[pGaugeZero] = zsum / float64(zn)
	}
	f := &Fit{obs: obs}
	p, err := pb.fitOuter(pb.mean)
	if err != nil {
		return nil, err
	}
	// Recheck: readings far from the rest, by a robust scale.
	if !opt.NoRecheck {
		for round := 0; round < 3; round++ {
			worst, ok := pb.outlier(p, res)
			if !ok {
				break
			}
			pb.use[worst] = false
			if pb.nUsed() < 2 {
				pb.use[worst] = true
				break
			}
			q, err := pb.fitOuter(p)
			if err != nil {
				return nil, err
			}
			p = q
		}
	}
	if err := pb.finish(f, p, res); err != nil {
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

// outlier returns the used reading farthest from the fit when it lies more
// than 3 robust standard deviations (at least the gauge resolution) away.
func (pb *problem) outlier(p [numParams]float64, res float64) (int, bool) {
	n := pb.nUsed()
	if n < 6 {
		return 0, false
	}
	r := make([]float64, n)
	if pb.eval(p, r) != nil {
		return 0, false
	}
	u := make([]float64, 0, n)
	k := 0
	for i := range pb.obs {
		if pb.use[i] {
			u = append(u, math.Abs(r[k]/pb.sig[i]))
			k++
		}
	}
	sorted := append([]float64(nil), u...)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i] < sorted[j] })
	scale := math.Max(1, 1.4826*sorted[len(sorted)/2])
	worst, wv := -1, 0.0
	k = 0
	for i := range pb.obs {
		if !pb.use[i] {
			continue
		}
		lim := 3 * math.Max(scale*pb.sig[i], res)
		if a := math.Abs(r[k]); a > lim && a/lim > wv {
			worst, wv = i, a/lim
		}
		k++
	}
	return worst, worst >= 0
}

// finish fills the fit's report: residuals, covariance and what the
// readings could not decide.
func (pb *problem) finish(f *Fit, p [numParams]float64, res float64) error {
	f.Model = Model{pb.spec, devOf(p)}
	f.idx = pb.idx
	f.used = append([]bool(nil), pb.use...)
	f.resMM = res
	var ss float64
	var nu int
	var chi float64
	for i, o := range pb.obs {
		v := pb.predictS(i, p)
		rr := Target(o) - v
		f.Residuals = append(f.Residuals, Residual{Label: o.Label, Field: o.Field, Kind: o.Kind, ResidualMM: rr, Used: pb.use[i]})
		if pb.use[i] {
			ss += rr * rr
			chi += sq(rr / pb.sig[i])
			nu++
		} else {
			f.Recheck = append(f.Recheck, f.Residuals[len(f.Residuals)-1])
		}
	}
	sort.SliceStable(f.Recheck, func(a, b int) bool { return math.Abs(f.Recheck[a].ResidualMM) > math.Abs(f.Recheck[b].ResidualMM) })
	if nu > 0 {
		f.RMSMM = math.Sqrt(ss / float64(nu))
	}
	// Covariance (J^T W J + P)^-1, scaled up when the residuals are larger
	// than the stated errors.
	r := make([]float64, pb.nUsed())
	if err := pb.eval(p, r); err != nil {
		return err
	}
	A, _ := pb.normal(p, r)
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
			if sv[j] > 0.7*pb.prior[j]*math.Sqrt(f.varScale) {
				f.Undecided = append(f.Undecided, j.name())
			}
		}
	}
	f.Sigma = devOf(sv)
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

// RecheckMessages returns one sentence per reading to recheck:
// "recheck: back dead centre, full forward, 0.31 mm off the fit".
func (f *Fit) RecheckMessages(unit session.Unit) []string {
	var out []string
	for _, r := range f.Recheck {
		out = append(out, fmt.Sprintf("recheck: %s, %s off the fit", r.Label, strings.TrimPrefix(session.FormatLength(math.Abs(r.ResidualMM), unit), "+")))
	}
	return out
}

// Observations returns the readings the fit was made from (one round's,
// as FitSession chose them), in file order; Residuals match them by Field.
// The slice is the fit's own: read it, do not change it.
func (f *Fit) Observations() []session.Observation { return f.obs }
