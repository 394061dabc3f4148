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
	resMM    float64
	varScale float64
}

// FitOptions tunes the fit. The zero value is the default.
type FitOptions struct {
	// Round is the index of the round to fit; -1 or any value out of range
	// means the latest.
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

// roundObservations picks the observations of one round of cylinder cyl.
func roundObservations(s *session.Session, cyl, round int) ([]session.Observation, error) {
	all, err := s.Observations(cyl)
	if err != nil {
		return nil, err
	}
	if round < 0 || round >= len(s.Cylinders[cyl].Rounds) {
		round = len(s.Cylinders[cyl].Rounds) - 1
	}
	var out []session.Observation
	for _, o := range all {
		if o.Round == round {
			out = append(out, o)
		}
	}
	return out, nil
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
type problem struct {
	spec  setting.EngineSpec
	obs   []session.Observation
	use   []bool
	sig   []float64 // one standard deviation of each residual, mm
	idx   []param
	prior [numParams]float64
	mean  [numParams]float64 // prior means
}

// eval returns the residuals (prediction - target) of the used
// observations at p, or an error when the gear cannot close.
func (pb *problem) eval(p [numParams]float64, out []float64) error {
	g, err := Model{pb.spec, devOf(p)}.Gear()
	if err != nil {
		return err
	}
	k := 0
	for i, o := range pb.obs {
		if !pb.use[i] {
			continue
		}
		v, err := predict(pb.spec, g, p, o)
		if err != nil {
			return err
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

// step returns the finite-difference step of a parameter.
func stepOf(j param) float64 {
	switch j {
	case pDeadCentre, pEccFwd, pEccBack, pReturnCrank:
		return 1e-3
	}
	return 1e-3
}

// jacobian fills J (rows: used observations, cols: idx) at p, whose
// residuals are r0.
func (pb *problem) jacobian(p [numParams]float64, r0 []float64) ([][]float64, error) {
	n := len(r0)
	J := make([][]float64, len(pb.idx))
	tmp := make([]float64, n)
	for c, j := range pb.idx {
		col := make([]float64, n)
		switch j {
		case pGaugeZero, pValveOffset:
			// exact: both enter linearly (see predict)
			k := 0
			for i, o := range pb.obs {
				if !pb.use[i] {
					continue
				}
				col[k] = linearDerivative(pb.spec, o, j)
				k++
			}
		default:
			h := stepOf(j)
			q := p
			q[j] += h
			if err := pb.eval(q, tmp); err != nil {
				q[j] = p[j] - h
				if err := pb.eval(q, tmp); err != nil {
					return nil, err
				}
				h = -h
			}
			for k := range col {
				col[k] = (tmp[k] - r0[k]) / h
			}
		}
		J[c] = col
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
	pb := &problem{spec: spec, obs: obs, use: make([]bool, len(obs)), sig: make([]float64, len(obs))}
	nominal, err := Model{Spec: spec}.Gear()
	if err != nil {
		return nil, err
	}
	res := 0.0
	dcSig := 0.0
	for i, o := range obs {
		pb.use[i] = true
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
	// Weights from the drawing's valve slope at each reading.
	var zsum float64
	var zn int
	for i, o := range obs {
		s := math.Max(o.GaugeSigmaMM, 1e-4)
		if o.HasCrank {
			a, err1 := nominal.Valve(spec.Engine, o.CrankDeg+0.5, o.Reverser)
			b, err2 := nominal.Valve(spec.Engine, o.CrankDeg-0.5, o.Reverser)
			if err1 != nil || err2 != nil {
				return nil, linkageError(err1, err2)
			}
			slope := math.Abs(a - b)
			s = math.Hypot(s, slope*o.CrankSigmaDeg)
			if o.Kind == session.AtDeadCentre || o.Kind == session.InSweep {
				x, _ := nominal.Valve(spec.Engine, o.CrankDeg, o.Reverser)
				if !hasPortMarks(obs) {
					zsum += o.GaugeMM - x
					zn++
				}
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
	p, err := pb.solve(pb.mean)
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
			q, err := pb.solve(p)
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

// solve runs Levenberg-Marquardt from p0.
func (pb *problem) solve(p0 [numParams]float64) ([numParams]float64, error) {
	n := pb.nUsed()
	r := make([]float64, n)
	p := p0
	if err := pb.eval(p, r); err != nil {
		return p, &setting.Error{Field: "engine.gear", Message: "The gear as drawn cannot reach every crank angle of the readings: " + err.Error()}
	}
	c := pb.cost(p, r)
	lambda := 1e-3
	m := len(pb.idx)
	trial := make([]float64, n)
	for it := 0; it < 30; it++ {
		J, err := pb.jacobian(p, r)
		if err != nil {
			return p, err
		}
		// Normal equations, weighted: (J^T W J + P) d = -(J^T W r + P (p - mean)).
		A := newSym(m)
		g := make([]float64, m)
		for a := 0; a < m; a++ {
			for b := 0; b <= a; b++ {
				s := 0.0
				k := 0
				for i := range pb.obs {
					if pb.use[i] {
						s += J[a][k] * J[b][k] / sq(pb.sig[i])
						k++
					}
				}
				A.a[a*m+b], A.a[b*m+a] = s, s
			}
			s := 0.0
			k := 0
			for i := range pb.obs {
				if pb.use[i] {
					s += J[a][k] * r[k] / sq(pb.sig[i])
					k++
				}
			}
			j := pb.idx[a]
			A.add(a, a, 1/sq(pb.prior[j]))
			g[a] = -(s + (p[j]-pb.mean[j])/sq(pb.prior[j]))
		}
		improved := false
		for tries := 0; tries < 12; tries++ {
			D := newSym(m)
			copy(D.a, A.a)
			for a := 0; a < m; a++ {
				D.add(a, a, lambda*A.at(a, a))
			}
			d, ok := D.solve(g)
			if !ok {
				lambda *= 10
				continue
			}
			q := p
			for a, j := range pb.idx {
				q[j] += d[a]
			}
			if err := pb.eval(q, trial); err != nil {
				lambda *= 10
				continue
			}
			cq := pb.cost(q, trial)
			if cq < c {
				// Converged when the step is a thousandth of what the
				// readings can tell, or the cost has stopped falling.
				small := c-cq < 1e-6*c
				for a := range pb.idx {
					if math.Abs(d[a]) > 1e-3/math.Sqrt(A.at(a, a)) {
						small = small || false
					}
				}
				if !small {
					small = true
					for a := range pb.idx {
						if math.Abs(d[a]) > 1e-3/math.Sqrt(A.at(a, a)) {
							small = false
						}
					}
				}
				p, c = q, cq
				copy(r, trial)
				lambda = math.Max(lambda/10, 1e-9)
				improved = true
				if small {
					return p, nil
				}
				break
			}
			lambda *= 10
		}
		if !improved {
			break
		}
	}
	return p, nil
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
	sort.Float64s(sorted)
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
	g, err := f.Model.Gear()
	if err != nil {
		return err
	}
	var ss float64
	var nu int
	var chi float64
	for i, o := range pb.obs {
		v, err := predict(pb.spec, g, p, o)
		if err != nil {
			return err
		}
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
	J, err := pb.jacobian(p, r)
	if err != nil {
		return err
	}
	m := len(pb.idx)
	A := newSym(m)
	for a := 0; a < m; a++ {
		for b := 0; b < m; b++ {
			s := 0.0
			k := 0
			for i := range pb.obs {
				if pb.use[i] {
					s += J[a][k] * J[b][k] / sq(pb.sig[i])
					k++
				}
			}
			A.a[a*m+b] = s
		}
		A.add(a, a, 1/sq(pb.prior[pb.idx[a]]))
	}
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
			f.Fitted = append(f.Fitted, paramNames[j])
			if sv[j] > 0.7*pb.prior[j]*math.Sqrt(f.varScale) {
				f.Undecided = append(f.Undecided, paramNames[j])
			}
		}
	}
	f.Sigma = devOf(sv)
	f.obs = pb.obs
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
	sort.Float64s(u)
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
	return &setting.Error{Field: "readings", Message: fmt.Sprintf("The readings contradict one another (or the engine's dimensions): no setting of the gear follows them closer than %.2f mm, where the gauge reads to %.2f mm. Farthest off: %s. Check that the gauge was not knocked, that the marks are numbered the way the wheel turns, and the gear's dimensions; then take the round again.", f.RMSMM, f.resMM, strings.Join(names, "; "))}
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
