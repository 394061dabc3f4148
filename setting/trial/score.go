package trial

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Diffs are the front-minus-back differences of one engine state in each
// planned position.
type Diffs struct {
	Lead []float64 // mm
	Cut  []float64 // % of stroke
}

// worst returns the largest magnitude.
func worst(xs []float64) float64 {
	w := 0.0
	for _, x := range xs {
		w = math.Max(w, math.Abs(x))
	}
	return w
}

// cutPercent is the planner's convention: 0 for a port that never
// opens, 100 for one that never closes.
func cutPercent(e setting.EndEvents) float64 {
	switch {
	case e.NeverOpens:
		return 0
	case e.NeverCloses:
		return 100
	}
	return e.CutOff.StrokePercent
}

// diffs returns the engine's true differences.
func (e Engine) diffs() (Diffs, error) {
	var d Diffs
	for _, p := range e.Positions {
		set, err := e.Events(p)
		if err != nil {
			return d, err
		}
		d.Lead = append(d.Lead, set.Front.Lead-set.Back.Lead)
		d.Cut = append(d.Cut, cutPercent(set.Front)-cutPercent(set.Back))
	}
	return d, nil
}

// objective is what a priority makes small, as residuals: lead
// differences (mm), cut-off differences (%), or both weighed (per
// 0.05 mm and per 1 %, half each).
func objective(prio plan.Priority, d Diffs) []float64 {
	switch prio {
	case plan.EqualCutOffs:
		return d.Cut
	case plan.Balanced:
		out := make([]float64, 0, 2*len(d.Lead))
		for i := range d.Lead {
			out = append(out, math.Sqrt(0.5)*d.Lead[i]/0.05, math.Sqrt(0.5)*d.Cut[i])
		}
		return out
	}
	return d.Lead
}

// best finds the changes within the adjusters' limits that bring the
// priority's worst difference lowest without leaving any position worse
// than today by more than tolerance (the plan's own rule, so that the
// best is what a plan may reach), with the truth known: least squares by
// Levenberg-Marquardt on finite differences, each position kept from
// getting worse by a steep penalty, then the worst made smaller by
// reweighting (Lawson's rule), every candidate judged on the true
// engine's events.
func (e Engine) best(prio plan.Priority) (float64, []float64, error) {
	ks := knobsOf(e.Adjustments)
	n := len(ks)
	lo, hi := make([]float64, n), make([]float64, n)
	for i, a := range e.Adjustments {
		lo[i], hi[i] = a.Min, a.Max
		if a.Kind == session.EccentricAngle {
			// A sheave changes the lead itself, not its share between the
			// ends: a setter turns one only for a lead wanted or a sheave
			// that has slipped, as the planner does, not to trade a
			// notch's lead difference for a millimetre of lead.
			lo[i], hi[i] = 0, 0
		}
	}
	d0, err := e.diffs()
	if err != nil {
		return 0, nil, err
	}
	o0 := objective(prio, d0)
	tol := e.tolerance(prio)
	// The residuals: the objective's, then per residual a penalty that
	// is zero while it is no worse than today by more than tolerance.
	feasible := func(r []float64) bool {
		for i := len(o0); i < len(r); i++ {
			if r[i] > 1e-9 {
				return false
			}
		}
		return true
	}
	eval := func(a []float64) ([]float64, error) {
		t, err := e.with(ks, a)
		if err != nil {
			return nil, err
		}
		d, err := t.diffs()
		if err != nil {
			return nil, err
		}
		o := objective(prio, d)
		if prio == plan.Balanced {
			return append(o, 30*math.Max(0, rms(o)-rms(o0)-tol)/tol), nil
		}
		for i := range o0 {
			o = append(o, 30*math.Max(0, math.Abs(o[i])-math.Abs(o0[i])-tol)/tol)
		}
		return o, nil
	}
	a := make([]float64, n)
	r0, err := eval(a)
	if err != nil {
		return 0, nil, err
	}
	bestW, bestA := worst(r0[:len(o0)]), append([]float64(nil), a...)
	w := make([]float64, len(r0))
	for i := range w {
		w[i] = 1
	}
	lambda := 1e-3
	cur := r0
	for it := 0; it < 40; it++ {
		// Jacobian by forward differences.
		J := make([][]float64, n)
		for j := range ks {
			h := 1e-3 * math.Max(1, e.Scale)
			if e.Adjustments[j].Kind.Angular() {
				h = 1e-3
			}
			b := append([]float64(nil), a...)
			b[j] += h
			rj, err := eval(b)
			if err != nil {
				J[j] = make([]float64, len(cur))
				continue
			}
			J[j] = make([]float64, len(cur))
			for i := range cur {
				J[j][i] = (rj[i] - cur[i]) / h
			}
		}
		improved := false
		for try := 0; try < 6; try++ {
			A := make([][]float64, n)
			g := make([]float64, n)
			for j := 0; j < n; j++ {
				A[j] = make([]float64, n)
				for k := 0; k < n; k++ {
					for i := range cur {
						A[j][k] += w[i] * J[j][i] * J[k][i]
					}
				}
				A[j][j] += lambda*A[j][j] + 1e-12
				for i := range cur {
					g[j] -= w[i] * J[j][i] * cur[i]
				}
			}
			d, ok := solveDense(A, g)
			if !ok {
				break
			}
			b := make([]float64, n)
			for j := range b {
				b[j] = math.Max(lo[j], math.Min(hi[j], a[j]+d[j]))
			}
			rb, err := eval(b)
			if err == nil && wsum(w, rb) < wsum(w, cur) {
				a, cur = b, rb
				lambda = math.Max(lambda/10, 1e-9)
				improved = true
				break
			}
			lambda *= 10
		}
		if ww := worst(cur[:len(o0)]); ww < bestW && feasible(cur) {
			bestW, bestA = ww, append([]float64(nil), a...)
		}
		if !improved || it >= 12 {
			// Reweight toward the worst residuals (Lawson).
			s := 0.0
			for i := range w {
				w[i] *= math.Abs(cur[i]) + 1e-9
				s += w[i]
			}
			for i := range w {
				w[i] = w[i]/s*float64(len(w)) + 1e-6
			}
			lambda = 1e-3
		}
	}
	return bestW, bestA, nil
}

// rms is the root mean square of xs.
func rms(xs []float64) float64 {
	s := 0.0
	for _, x := range xs {
		s += x * x
	}
	return math.Sqrt(s / math.Max(1, float64(len(xs))))
}

func wsum(w, r []float64) float64 {
	s := 0.0
	for i := range r {
		s += w[i] * r[i] * r[i]
	}
	return s
}

// solveDense solves A x = b by Gaussian elimination with partial pivoting.
func solveDense(A [][]float64, b []float64) ([]float64, bool) {
	n := len(b)
	M := make([][]float64, n)
	for i := range M {
		M[i] = append(append([]float64(nil), A[i]...), b[i])
	}
	for c := 0; c < n; c++ {
		p := c
		for r := c + 1; r < n; r++ {
			if math.Abs(M[r][c]) > math.Abs(M[p][c]) {
				p = r
			}
		}
		if math.Abs(M[p][c]) < 1e-300 {
			return nil, false
		}
		M[c], M[p] = M[p], M[c]
		for r := c + 1; r < n; r++ {
			f := M[r][c] / M[c][c]
			for k := c; k <= n; k++ {
				M[r][k] -= f * M[c][k]
			}
		}
	}
	x := make([]float64, n)
	for r := n - 1; r >= 0; r-- {
		s := M[r][n]
		for k := r + 1; k < n; k++ {
			s -= M[r][k] * x[k]
		}
		x[r] = s / M[r][r]
	}
	return x, true
}

// Result is one plan tried on one engine.
type Result struct {
	Prio plan.Priority
	// Err is the planner's refusal, when it gave no plan.
	Err string
	// Before, Ideal and Rounded are the priority's worst difference on
	// the true engine today, after the plan's ideal amounts and after its
	// rounded ones; Best what the truth-known optimum reaches.
	Before, Ideal, Rounded, Best float64
	// Predicted is what the plan says its rounded amounts leave.
	Predicted float64
	// Rechecked are the fields of the readings the plan asks to take
	// again.
	Rechecked []string
	// RoundTol is what rounding may add: one step of the finest adjuster
	// acting on the worst position (leads), 0 otherwise.
	RoundTol float64
	// Pass: the ideal plan meets the goal (leads: 0.02 mm, or the best
	// reachable + 0.01 where that is higher; cut-offs: best + 0.5 %;
	// balanced: best + 0.5 in the objective's units). RoundPass the same
	// for the rounded plan, with RoundTol.
	Pass, RoundPass bool
	// Abs: leads within 0.02 mm after the ideal plan, whatever is
	// reachable.
	Abs bool
	// Worse: some position ends farther from equal than before by more
	// than the readings can tell (0.02 mm, 0.5 %). Refused: no step while
	// the best reachable gains more than that.
	Worse, Refused bool
	// Beyond: a position's lead difference ends farther from equal than
	// before by more than twice the error of that difference as read
	// straight off the gauge (see Engine.readError), or tol where that is
	// larger: the "worse than the readings can tell". For
	// cut-offs and balanced, as Worse.
	Beyond bool
	// Broken: the plan's changes leave the true gear unable to go round.
	Broken bool
	// Steps is the number of steps; SigmaOK counts steps whose stated +/-
	// covers the ideal change's true error (checked over repeated trials
	// by the caller).
	Steps int
	// Ideal and rounded amounts per adjustment (session order), and the
	// truth's best.
	IdealAmounts, RoundedAmounts, BestAmounts []float64
	Notes                                     []string
	// BeforeDiffs and RoundedDiffs are the priority's differences per
	// position on the true engine today and after the rounded plan.
	BeforeDiffs, RoundedDiffs []float64
}

// beyond reports whether the rounded plan left a lead difference worse
// than before by more than twice its read error sd (per position), or
// tol when larger (see Result.Beyond).
func (r Result) beyond(sd []float64, tol float64) bool {
	if r.Prio != plan.EqualLeads || len(sd) != len(r.BeforeDiffs) || len(r.RoundedDiffs) != len(sd) {
		return r.Worse
	}
	for i, b := range r.BeforeDiffs {
		if math.Abs(r.RoundedDiffs[i]) > math.Abs(b)+math.Max(tol, 2*sd[i]) {
			return true
		}
	}
	return false
}

// tolerance is the least difference the readings can tell: 0.02 mm (two
// gauge divisions) for leads on a 5 in gauge engine, in proportion to the
// crank on a larger one, 0.5 % of stroke for cut-offs, 0.5 in the
// balance's units (common practice, no source).
func (e Engine) tolerance(prio plan.Priority) float64 {
	switch prio {
	case plan.EqualCutOffs, plan.Balanced:
		return 0.5
	}
	return 0.02 * e.sizeScale()
}

// sizeScale is the engine's crank against a 5 in gauge engine's 25 mm, at
// least 1: the planner's own scale for lengths.
func (e Engine) sizeScale() float64 {
	return math.Max(1, e.Drawing.Engine.CrankRadius/25)
}

// Try makes a plan for the session with the priority, applies it to the
// engine and scores it.
func (e Engine) Try(s *session.Session, prio plan.Priority) (Result, error) {
	res := Result{Prio: prio}
	before, err := e.diffs()
	if err != nil {
		return res, err
	}
	obj0 := objective(prio, before)
	res.Before = worst(obj0)
	bw, ba, err := e.best(prio)
	if err != nil {
		return res, err
	}
	res.Best, res.BestAmounts = bw, ba
	p, err := plan.Make(s, plan.Options{Priority: prio, Unit: session.UnitMM})
	tol := e.tolerance(prio)
	if err != nil {
		res.Err = err.Error()
		res.Ideal, res.Rounded = res.Before, res.Before
		res.Refused = res.Before > res.Best+tol
		return res, nil
	}
	res.Notes = p.Notes
	for _, r := range p.Recheck {
		res.Rechecked = append(res.Rechecked, r.Field)
	}
	var pd Diffs
	for _, st := range p.After {
		pd.Lead = append(pd.Lead, st.Front.LeadMM-st.Back.LeadMM)
		pd.Cut = append(pd.Cut, st.Front.CutOffPercent-st.Back.CutOffPercent)
	}
	if len(pd.Lead) == len(e.Positions) {
		res.Predicted = worst(objective(prio, pd))
	}
	ks := knobsOf(e.Adjustments)
	ideal := make([]float64, len(ks))
	rounded := make([]float64, len(ks))
	for _, c := range p.Ideal {
		for i, k := range ks {
			if k.kind == c.Kind && k.ecc == c.Eccentric {
				ideal[i] = c.Amount
			}
		}
	}
	for _, st := range p.Steps {
		found := false
		for i, k := range ks {
			if k.kind == st.Kind && k.ecc == st.Eccentric {
				rounded[i] = st.Amount
				found = true
			}
		}
		if !found {
			return res, fmt.Errorf("the plan changes %s %s, which the engine's adjustments do not list", st.Eccentric, st.Kind)
		}
		if st.Amount != 0 {
			res.Steps++
		}
	}
	res.IdealAmounts, res.RoundedAmounts = ideal, rounded
	score := func(a []float64) (float64, []float64, error) {
		t, err := e.with(ks, a)
		if err != nil {
			return 0, nil, err
		}
		d, err := t.diffs()
		if err != nil {
			return 0, nil, err
		}
		o := objective(prio, d)
		return worst(o), o, nil
	}
	wi, _, err := score(ideal)
	if err != nil {
		// The plan's changes leave the true gear unable to go round.
		res.Broken, res.Worse = true, true
		res.Ideal, res.Rounded = math.Inf(1), math.Inf(1)
		res.RoundedAmounts = nil
		return res, nil
	}
	wr, or, err := score(rounded)
	if err != nil {
		res.Broken, res.Worse = true, true
		res.Ideal, res.Rounded = wi, math.Inf(1)
		res.RoundedAmounts = nil
		return res, nil
	}
	res.Ideal, res.Rounded = wi, wr
	res.BeforeDiffs, res.RoundedDiffs = obj0, or
	goal := res.Best + tol
	if prio == plan.EqualLeads {
		// 0.02 mm (in proportion on an engine larger than 5 in gauge),
		// or within a gauge division of the best reachable where no
		// allowed change reaches that (a Stephenson gear's notch is set
		// by its full gears: the spindle and both rods act almost alike
		// there).
		goal = math.Max(tol, res.Best+tol/2)
		res.Abs = wi <= tol
	}
	res.RoundTol = e.stepTol(prio, ks, rounded, or)
	res.Pass = wi <= goal
	res.RoundPass = wr <= goal+res.RoundTol
	if prio == plan.Balanced {
		// A balance trades leads for cut-offs: it is worse only when the
		// whole is.
		res.Worse = rms(or) > rms(obj0)+tol
	} else {
		for i := range or {
			if math.Abs(or[i]) > math.Abs(obj0[i])+tol {
				res.Worse = true
			}
		}
	}
	if res.Steps == 0 && res.Before > res.Best+tol {
		// Refused only if whole steps could have gained it.
		br, err := e.bestRounded(prio, res.BestAmounts)
		if err != nil {
			return res, err
		}
		res.Refused = br < res.Before-tol
	}
	return res, nil
}

// handStep is the smallest change of an adjustment hands can make: a flat
// of its thread (6 a turn when not given), 0.05 mm without a thread, 0.5 mm
// round a sheave's rim, 0.25 degree otherwise (the planner's rounding,
// stated again here as the bench's own).
func handStep(a session.Adjustment) float64 {
	if a.Kind.Angular() {
		if a.Kind == session.EccentricAngle && a.SheaveDiameterMM > 0 {
			return 0.5 / (a.SheaveDiameterMM / 2) * 180 / math.Pi
		}
		return 0.25
	}
	if p := a.Thread.Pitch(); p > 0 {
		f := a.Thread.FlatsPerTurn
		if f <= 0 {
			f = 6
		}
		return p / float64(f)
	}
	return 0.05
}

// bestRounded returns the worst difference of the best rounding of the
// best continuous changes a (each adjuster to the whole step either side)
// that leaves no position worse than today by more than tolerance.
func (e Engine) bestRounded(prio plan.Priority, a []float64) (float64, error) {
	ks := knobsOf(e.Adjustments)
	d0, err := e.diffs()
	if err != nil {
		return 0, err
	}
	o0 := objective(prio, d0)
	tol := e.tolerance(prio)
	var idx []int
	for i, v := range a {
		if v != 0 {
			idx = append(idx, i)
		}
	}
	best := worst(o0)
	b := make([]float64, len(a))
	for combo := 0; combo < 1<<len(idx); combo++ {
		for j, i := range idx {
			st := handStep(e.Adjustments[i])
			b[i] = math.Floor(a[i]/st) * st
			if combo>>j&1 != 0 {
				b[i] += st
			}
		}
		t, err := e.with(ks, b)
		if err != nil {
			continue
		}
		d, err := t.diffs()
		if err != nil {
			continue
		}
		o := objective(prio, d)
		ok := true
		if prio == plan.Balanced {
			ok = rms(o) <= rms(o0)+tol
		} else {
			for i := range o {
				if math.Abs(o[i]) > math.Abs(o0[i])+tol {
					ok = false
				}
			}
		}
		if ok {
			best = math.Min(best, worst(o))
		}
	}
	return best, nil
}

// stepTol returns the effect on the worst term of the priority's
// objective of one step of the finest length adjuster acting there at
// least half as much as anywhere: what rounding to whole steps may leave.
func (e Engine) stepTol(prio plan.Priority, ks []knob, base, o []float64) float64 {
	wi := 0
	for i := range o {
		if math.Abs(o[i]) > math.Abs(o[wi]) {
			wi = i
		}
	}
	t0, err := e.with(ks, base)
	if err != nil {
		return 0
	}
	d0, err := t0.diffs()
	if err != nil {
		return 0
	}
	best := 0.0
	for j, a := range e.Adjustments {
		if a.Kind.Angular() {
			continue
		}
		b := append([]float64(nil), base...)
		b[j] += handStep(a)
		t, err := e.with(ks, b)
		if err != nil {
			continue
		}
		d, err := t.diffs()
		if err != nil {
			continue
		}
		most, here := 0.0, 0.0
		o1, o0 := objective(prio, d), objective(prio, d0)
		for i := range o1 {
			ef := math.Abs(o1[i] - o0[i])
			most = math.Max(most, ef)
			if i == wi {
				here = ef
			}
		}
		if here >= most/2 && here > 1e-4 && (best == 0 || here < best) {
			best = here
		}
	}
	return best
}
