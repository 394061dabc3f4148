package plan

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// goal is what counts as better for one priority: the differences the
// plan must not make worse at any position beyond what the readings can
// tell (tol), and how close two plans must be for the simpler to win
// (slack, in the units of the objective's square root).
type goal struct {
	prio    Priority
	running int
	// tol is, per position, how much worse than today its difference (mm
	// or %) may end at the most, with the plan's own error allowed for
	// (see worseAt); seen what the setter could see on measuring again,
	// below which a difference left is not worth a note; sd the error
	// of today's difference as the readings give it.
	tol, seen, sd []float64
	// ks are the knobs the changes judged by worse are of.
	ks []knob
	// slack is how much closer a plan of more steps must come to be
	// preferred (what the setter can measure); fine how much closer a
	// rounding of as many steps must come (half a gauge division).
	slack, fine float64
	res         float64 // what one reading resolves: the gauge (mm), or the cut-off tolerance (%)
}

// diff returns a position's front-minus-back difference the goal
// equalises: leads (mm), or cut-offs (% of stroke) for EqualCutOffs.
func (g goal) diff(q quantities) float64 {
	if g.prio == EqualCutOffs {
		return q.cut[0] - q.cut[1]
	}
	return q.lead[0] - q.lead[1]
}

// worse reports whether the quantities after a plan are worse than now by
// more than the readings can tell: any position's lead difference for
// EqualLeads, any position's cut-off difference for EqualCutOffs (full
// forward and full back are not given away for the running notch), the
// whole weighted objective for Balanced.
func (g goal) worse(now, after []quantities, ts []term, a []float64) bool {
	switch g.prio {
	case Balanced:
		return math.Sqrt(sumSquares(ts, after)) > math.Sqrt(sumSquares(ts, now))+g.slack
	}
	for i := range now {
		if g.worseAt(now, after, i, a) {
			return true
		}
	}
	return false
}

// worseAt reports whether position i's difference (see diff) may end
// worse than now by more than tol; never for Balanced, which judges the
// whole objective.
//
// Today's difference is known only to its error sd: a change that carries
// a position past equal is judged as if the position stood as near equal
// as that error allows (a difference read as 0.06 +/- 0.03 mm may be
// 0.03, and a change of -0.12 would then leave it 0.09 the other way).
// A position the readings cannot tell from equal may be moved by no more
// than tol either way. Common practice, no source: a fitter does not push
// a setting he cannot see past the mark.
func (g goal) worseAt(now, after []quantities, i int, a []float64) bool {
	if g.prio == Balanced {
		return false
	}
	return passedBy(g.diff(now[i]), g.diff(after[i]), sdKnown*g.sd[i])+g.sideDoubt(now[i], a) > g.tol[i]
}

// sideDoubt returns the error of what changes a (knobs g.ks) do to a
// position's difference from the doubt of each knob's effect (see
// effectDoubt), in quadrature and by sideShare: where large changes
// cancel at a position (a spindle against a radius rod), what is left
// there is known only to a share of each.
func (g goal) sideDoubt(q quantities, a []float64) float64 {
	s := 0.0
	for k, kb := range g.ks {
		if k >= len(a) || a[k] == 0 {
			continue
		}
		gd := q.grad[0][kb.p] - q.grad[1][kb.p]
		if g.prio == EqualCutOffs {
			gd = q.grad[2][kb.p] - q.grad[3][kb.p]
		}
		s += sq(kb.doubt * gd * a[k])
	}
	return sideShare * math.Sqrt(s)
}

// passedBy returns how much worse a difference d (known to sd) may end
// when moved to a: the most |d'+(a-d)|-|d'| becomes for a true d'
// within sd of d.
func passedBy(d, a, sd float64) float64 {
	move := a - d
	near := math.Abs(d) - sd // the least the difference may be, on its own side
	if d*move >= 0 || near <= 0 {
		return math.Abs(move)
	}
	return math.Max(math.Abs(move)-2*near, -math.Abs(move))
}

// diffTerm reports whether term t is the difference the goal holds from
// getting worse.
func (g goal) diffTerm(t term) bool {
	if g.prio == EqualCutOffs {
		return t.what == "cut"
	}
	return t.what == "lead"
}

// Position weights and tolerances. A difference the readings leave
// uncertain by more than leadUnknownMM (scaled with the crank) or
// cutUnknownPct counts for less in the objective, so that a gear position
// nobody measured does not drive the plan; cutTolPct is the least cut-off
// difference the plan treats as seen (common practice, no source: a
// cut-off is marked on the crosshead to about half a millimetre).
const (
	leadUnknownMM = 0.1
	cutUnknownPct = 2.0
	cutTolPct     = 0.2
	// cutWorsePct is the change of a cut-off difference the plan allows
	// itself where a position gets worse: 0.3 % of stroke, so that with
	// the model's few per cent of error (see effectDoubt) it stays within
	// the 0.5 % a crosshead marked to half a millimetre can show on a 5 in
	// gauge stroke (common practice, no source).
	cutWorsePct = 0.3
	// leadWorseMM is the most a plan lets a position's lead difference
	// get worse (on a 5 in gauge engine, scaled with the crank): two
	// divisions of a 0.01 mm gauge, what a setter reads as a change
	// (common practice, no source).
	leadWorseMM = 0.02
	// sdKnown is how many of its errors a difference today is taken to
	// be nearer equal than read, when a plan would carry it past equal.
	sdKnown = 0.5
	// sideShare is the share of the knobs' doubts (see effectDoubt) by
	// which a side effect the changes leave at a position is taken to be
	// off: on the bench's as-built engines such a side effect was off by
	// one or two per cent of the changes' effects there, not effectDoubt's
	// five, and a larger share refused plans that held.
	sideShare = 0.25
)

// weighing fills the objective's position weights from the uncertainty
// of each difference today, and returns the goal's tolerances.
//
// A position whose difference the readings leave uncertain counts for
// less (a gear position nobody measured does not drive the plan), except
// the running notch when the plan makes cut-offs equal: the setter chose
// it. What "worse" means is what the setter could see on measuring again,
// less a margin for the model's own error: for a lead difference 1.5
// gauge divisions, or 1.2 times the error of the difference as the
// dead-centre readings and port marks give it (the gauge, and the
// dead-centre marks through the valve's speed there); for a cut-off
// difference cutWorsePct.
func (ev *evaluator) weighing(obj *objective, qNow []quantities, fit *Fit) goal {
	n := len(qNow)
	g := goal{prio: obj.prio, running: obj.running, tol: make([]float64, n), seen: make([]float64, n), sd: make([]float64, n)}
	obj.wLead, obj.wCut = make([]float64, n), make([]float64, n)
	k := scaleOf(ev.spec)
	res := gaugeResolution(fit)
	readMin := math.Inf(1)
	for i, q := range qNow {
		var sl, sc float64
		if fit != nil && fit.cov.n > 0 {
			sl, sc = sdOf(fit, &q, [4]float64{1, -1, 0, 0}), sdOf(fit, &q, [4]float64{0, 0, 1, -1})
		}
		obj.wLead[i] = 1 / math.Sqrt(1+sq(sl/(leadUnknownMM*k)))
		obj.wCut[i] = 1 / math.Sqrt(1+sq(sc/cutUnknownPct))
		if obj.prio == EqualCutOffs && i == obj.running {
			obj.wCut[i] = 1
		}
		rs, ok := readDiffSigma(fit, ev.ps[i].notch.Reverser)
		if !ok {
			rs = sl
		} else {
			readMin = math.Min(readMin, rs)
		}
		// What the setter could see on measuring again; a position is
		// kept from getting worse by less than that, with a margin for
		// the model's own error (see leadWorseMM, cutWorsePct).
		g.seen[i] = math.Max(1.5*res, 1.2*math.Min(rs, leadUnknownMM*k))
		g.tol[i], g.sd[i] = math.Min(g.seen[i], leadWorseMM*k), sl
		if sl > leadUnknownMM*k {
			if r := ev.ps[i].notch.Reverser; readAt(fit, r) {
				// A position whose dead-centre reading was left out to be
				// taken again is known through the model; but where the
				// model had to be bent far from the drawing to follow the
				// readings there (further than a build's errors leave,
				// see oneEndMM), what it says of the end not read is not
				// known to stand on either side of equal: the plan moves
				// that difference by no more than the tolerance either
				// way until it is read again.
				if fit.bentAt(r) > oneEndMM*k {
					g.sd[i] = math.Inf(1)
				}
			} else {
				// A position nobody read is held only as far as the model
				// knows it, within what a setter could see there; the
				// plan says which readings to take.
				g.tol[i], g.sd[i] = g.seen[i], 0
			}
		}
		if g.prio == EqualCutOffs {
			g.tol[i], g.seen[i], g.sd[i] = cutWorsePct, cutWorsePct, sc
		}
	}
	// A plan of more steps is preferred only when it comes closer by
	// more than a gauge division (or half the error of a measured lead
	// difference, when larger), or the cut-off tolerance. Roundings with
	// as many steps are told apart to half a division.
	known := res
	if !math.IsInf(readMin, 1) {
		known = math.Max(known, math.Min(readMin, leadUnknownMM*k)/2)
	}
	g.res = res
	switch g.prio {
	case EqualCutOffs:
		g.res = cutTolPct
		g.slack, g.fine = cutTolPct/0.1, cutTolPct/2/0.1
	case Balanced:
		g.slack, g.fine = known/0.05, res/2/0.05
	default:
		g.slack, g.fine = known/0.01, res/2/0.01
	}
	return g
}

// readDiffSigma returns the error of a lead difference read straight
// from the readings in reverser position r: the dead-centre readings at
// both ends there and the port marks, each with its own error (the
// gauge's, and the dead-centre mark's through the valve's speed); false
// when the round has no dead-centre reading at both ends there.
func readDiffSigma(fit *Fit, r setting.Reverser) (float64, bool) {
	if fit == nil {
		return 0, false
	}
	var v float64
	var ends [2]bool
	for i, o := range fit.obs {
		if i >= len(fit.sig) || !fit.used[i] {
			continue
		}
		switch {
		case o.Kind == session.PortMarkKind:
			v += sq(fit.sig[i])
		case o.Kind == session.AtDeadCentre && o.Reverser == r:
			e := 0
			if o.End == session.Back {
				e = 1
			}
			if !ends[e] {
				ends[e] = true
				v += sq(fit.sig[i])
			}
		}
	}
	if !ends[0] || !ends[1] {
		return 0, false
	}
	return math.Sqrt(v), true
}

// readAt reports whether the round has a dead-centre reading in reverser
// position r, used in the fit or left out to be taken again.
func readAt(fit *Fit, r setting.Reverser) bool {
	if fit == nil {
		return false
	}
	for _, o := range fit.obs {
		if o.Kind == session.AtDeadCentre && o.Reverser == r {
			return true
		}
	}
	return false
}

// gaugeResolution returns the dial gauge's resolution (mm) from the
// readings taken with it; the fit's coarsest resolution (feelers) when
// none were, and 0.01 mm without a fit.
func gaugeResolution(fit *Fit) float64 {
	if fit == nil {
		return 0.01
	}
	res := 0.0
	for _, o := range fit.obs {
		switch o.Kind {
		case session.PortMarkKind, session.AtDeadCentre, session.InSweep:
			res = math.Max(res, o.GaugeSigmaMM*math.Sqrt(12))
		}
	}
	if res == 0 {
		res = fit.resMM
	}
	if !(res > 0) {
		res = 0.01
	}
	return res
}

// isSheave reports whether a knob turns an eccentric sheave: the one
// adjustment that changes the lead itself rather than sharing it between
// the ends.
func isSheave(k knob) bool { return k.p == pEccFwd || k.p == pEccBack }

// policy says which knobs the plan may use and where it holds the mean
// lead, with the reasons in words.
type policy struct {
	usable []bool
	mean   []bool // positions whose mean lead is held (at the drawing's or the target)
	notes  []string
	// slipped are the sheaves (knob indexes) found slipped, with the
	// note saying so; whether the plan turns each back is said once the
	// steps are known.
	slipped []slip
}

// slip is a sheave found slipped: its knob and the note saying so.
type slip struct {
	k    int
	note string
}

// sheavePolicy decides whether eccentric sheaves may be turned: only for a
// target lead, when the mean lead of the gear an eccentric drives is far
// from the drawing's (a slipped sheave), or when the profile allows
// nothing else. Spindle and rod changes share the lead between the ends;
// a sheave changes it at both, so it is no tool for equalising.
func (ev *evaluator) sheavePolicy(ks []knob, qNow []quantities, obj objective, canLead bool, fit *Fit, unit session.Unit) policy {
	n := len(ev.ps)
	pol := policy{usable: make([]bool, len(ks)), mean: make([]bool, n)}
	other := false
	for i, k := range ks {
		pol.usable[i] = !(k.adj.Min == 0 && k.adj.Max == 0)
		if pol.usable[i] && !isSheave(k) {
			other = true
		}
	}
	target := obj.target != nil && canLead
	kc := math.Max(1, ev.spec.Engine.CrankRadius/25)
	for i, k := range ks {
		if !isSheave(k) || !pol.usable[i] {
			continue
		}
		// The full-gear position this eccentric drives.
		want := setting.Reverser(1)
		if k.p == pEccBack && ev.spec.Gear.Kind == setting.KindStephenson {
			want = -1
		}
		pos := -1
		for j, ps := range ev.ps {
			if ps.notch.Reverser == want {
				pos = j
			}
		}
		switch {
		case target:
			for j := range ev.ps {
				if obj.full == nil || obj.full[j] {
					pol.mean[j] = true
				}
			}
		case !other:
			for j := range ev.ps {
				pol.mean[j] = true
			}
		case pos >= 0 && pos < len(obj.design):
			q := qNow[pos]
			m := (q.lead[0] + q.lead[1]) / 2
			sm := 0.0
			if fit != nil && fit.cov.n > 0 {
				sm = sdOf(fit, &q, [4]float64{0.5, 0.5, 0, 0})
			}
			d := obj.design[pos]
			far := math.Abs(m-d) > math.Max(0.5*math.Abs(d), 0.1*kc)+2*sm
			if far && !ev.slipBorneOut(pos, m-d, qNow, obj, fit) {
				// One reading alone could say so: a mistyped one looks
				// the same. The sheave is not turned on its word.
				pol.usable[i] = false
				pol.notes = append(pol.notes, fmt.Sprintf("The mean lead in %s is %s, far from the drawing's %s, but only one of its dead-centre readings says so: take them again, or a sweep there, before the %s is turned.",
					ev.ps[pos].name(), length(m, unit), length(d, unit), partName(k.adj, ev.spec.Gear.Kind)))
				continue
			}
			if far {
				pol.mean[pos] = true
				pol.slipped = append(pol.slipped, slip{i, fmt.Sprintf("The mean lead in %s is %s, far from the drawing's %s: the %s has probably slipped on the axle. A spindle or rod change only shares the lead between the ends.",
					ev.ps[pos].name(), length(m, unit), length(d, unit), partName(k.adj, ev.spec.Gear.Kind))})
			} else {
				pol.usable[i] = false
			}
		default:
			pol.usable[i] = false
		}
	}
	// A knob that acts mainly where the readings pin nothing down (a
	// backward rod when full back was not measured) is left alone: its
	// change there could not be judged, and the setter measures that gear
	// before setting it. (Lead differences only: a cut-off is seldom
	// measured, and the model is what tells it in every position.)
	var unknownPos []bool
	for i, k := range ks {
		if !pol.usable[i] || isSheave(k) || obj.prio == EqualCutOffs {
			continue
		}
		if unknownPos == nil {
			unknownPos = ev.unknownPositions(qNow, obj.prio, fit)
		}
		all, known := 0.0, 0.0
		worst := -1
		for j, q := range qNow {
			gd := math.Abs(q.grad[0][k.p] - q.grad[1][k.p])
			if obj.prio == EqualCutOffs {
				gd = math.Abs(q.grad[2][k.p] - q.grad[3][k.p])
			}
			if gd > all {
				all, worst = gd, -1
				if unknownPos[j] {
					worst = j
				}
			}
			if !unknownPos[j] {
				known = math.Max(known, gd)
			}
		}
		if all > 0 && known < 0.5*all {
			pol.usable[i] = false
			if worst >= 0 {
				pol.notes = append(pol.notes, fmt.Sprintf("The readings do not pin down %s, so the plan leaves the %s alone: take the readings there, then plan again.", ev.ps[worst].name(), partName(k.adj, ev.spec.Gear.Kind)))
			}
		}
	}
	return pol
}

// slipBorneOut reports whether more than one reading bears out a slipped
// sheave whose full-gear position pos has its mean lead off the drawing's
// by off: both ends' leads there off the same way (a slip moves both, a
// mistyped reading one), each by at least a quarter as much; a sweep
// there (its readings show the valve's phase all round); or another
// position the same eccentric drives (the running notches of its gear; a
// slip eccentric's other gear) whose mean lead is off the same way by at
// least a quarter as much (a notch mixes in the other eccentric).
func (ev *evaluator) slipBorneOut(pos int, off float64, qNow []quantities, obj objective, fit *Fit) bool {
	if fit == nil {
		return true
	}
	design := obj.design
	if pos < len(obj.designEnds) {
		e := obj.designEnds[pos]
		f, b := qNow[pos].lead[0]-e[0], qNow[pos].lead[1]-e[1]
		if f*off > 0 && b*off > 0 && math.Min(math.Abs(f), math.Abs(b)) >= 0.25*math.Abs(off) {
			return true
		}
	}
	want := ev.ps[pos].notch.Reverser
	for _, o := range fit.obs {
		if o.Kind == session.InSweep && o.Reverser == want {
			return true
		}
	}
	single := ev.spec.Gear.Kind == setting.KindSingleEccentric
	for j, ps := range ev.ps {
		if j == pos || j >= len(design) || !readAt(fit, ps.notch.Reverser) {
			continue
		}
		if !single && (ps.notch.Reverser > 0) != (want > 0) {
			continue
		}
		mj := (qNow[j].lead[0]+qNow[j].lead[1])/2 - design[j]
		if mj*off > 0 && math.Abs(mj) >= 0.25*math.Abs(off) {
			return true
		}
	}
	return false
}

// unknownPositions marks the positions whose difference (leads, or
// cut-offs for EqualCutOffs) the readings leave uncertain by more than
// leadUnknownMM (scaled with the crank) or cutUnknownPct.
func (ev *evaluator) unknownPositions(qNow []quantities, prio Priority, fit *Fit) []bool {
	out := make([]bool, len(qNow))
	if fit == nil || fit.cov.n == 0 {
		return out
	}
	k := math.Max(1, ev.spec.Engine.CrankRadius/25)
	for i, q := range qNow {
		d := [4]float64{1, -1, 0, 0}
		lim := leadUnknownMM * k
		if prio == EqualCutOffs {
			d = [4]float64{0, 0, 1, -1}
			lim = cutUnknownPct
		}
		out[i] = sdOf(fit, &q, d) > lim
	}
	return out
}

// measure is how far a plan leaves the priority's goals: the worst of
// the weighted differences (and of the mean-lead terms where the lead is
// being set), in the terms' units, with a thousandth of their root sum of
// squares to tell apart plans whose worst is alike. The worst position is
// what the setter sees.
func measure(ts []term, q []quantities) float64 {
	worst := 0.0
	for _, t := range ts {
		if t.w >= 0.05 {
			worst = math.Max(worst, math.Abs(t.value(q)))
		}
	}
	return worst + 1e-3*math.Sqrt(sumSquares(ts, q))
}

// linearAt returns the quantities after changes a, linear in the changes
// from today's (exact for the valve on its spindle, and within a few
// thousandths of a millimetre for the rod and angle changes a plan makes).
func linearAt(qNow []quantities, ks []knob, a []float64, out []quantities) {
	for i := range qNow {
		q := &out[i]
		q.cutOK = qNow[i].cutOK
		q.lead, q.cut = qNow[i].lead, qNow[i].cut
		for k, kb := range ks {
			if a[k] == 0 {
				continue
			}
			for e := 0; e < 2; e++ {
				q.lead[e] += qNow[i].grad[e][kb.p] * a[k]
				q.cut[e] += qNow[i].grad[2+e][kb.p] * a[k]
			}
		}
	}
}

// subsetIdeal solves the objective, linear in the changes about today,
// for the knobs in set (the others held at zero), within the knobs'
// limits: least squares with the small change weight, a knob that would
// pass its limit held there and the rest solved again.
func subsetIdeal(ks []knob, ts []term, qNow []quantities, set []int) []float64 {
	return weightedIdeal(ks, ts, qNow, set, nil, ridge(ks, ts, qNow))
}

// weightedIdeal is subsetIdeal with each term's square weighed by tw
// (nil for all alike) and the ridge rd (see ridge).
func weightedIdeal(ks []knob, ts []term, qNow []quantities, set []int, tw []float64, rd []float64) []float64 {
	a := make([]float64, len(ks))
	fixed := make([]bool, len(ks))
	for pass := 0; pass <= len(set); pass++ {
		var free []int
		for _, k := range set {
			if !fixed[k] {
				free = append(free, k)
			}
		}
		if len(free) == 0 {
			break
		}
		m := len(free)
		A := newSym(m)
		g := make([]float64, m)
		for ti, t := range ts {
			w := 1.0
			if tw != nil {
				w = tw[ti]
			}
			v := t.value(qNow)
			for _, k := range set {
				if fixed[k] {
					v += t.grad(qNow, ks[k].p) * a[k]
				}
			}
			row := make([]float64, m)
			for r, k := range free {
				row[r] = t.grad(qNow, ks[k].p)
			}
			for r := range free {
				g[r] -= w * row[r] * v
				for c := range free {
					A.add(r, c, w*row[r]*row[c])
				}
			}
		}
		for r, k := range free {
			A.add(r, r, rd[k])
		}
		d, ok := A.solve(g)
		if !ok {
			break
		}
		clipped := false
		for r, k := range free {
			lo, hi := ks[k].adj.Min, ks[k].adj.Max
			a[k] = d[r]
			if a[k] < lo || a[k] > hi {
				a[k] = math.Max(lo, math.Min(hi, a[k]))
				fixed[k] = true
				clipped = true
			}
		}
		if !clipped {
			break
		}
	}
	return a
}

// roundedNear returns the whole numbers of steps either side of x, kept
// within [lo, hi].
func roundedNear(x, step, lo, hi float64) [2]float64 {
	f := math.Floor(x/step+1e-9) * step
	out := [2]float64{f, f + step}
	for i, v := range out {
		for v < lo-1e-9 {
			v += step
		}
		for v > hi+1e-9 {
			v -= step
		}
		if math.Abs(v) < 1e-12 {
			v = 0
		}
		out[i] = v
	}
	return out
}

// leftNotes says plainly what the rounded plan leaves: for each position
// still apart by more than the readings can tell, how far, and the step of
// the adjuster that acts most there.
func (ev *evaluator) leftNotes(ks []knob, usable []bool, qNow []quantities, ch *choice, g goal, unit session.Unit) []string {
	var out []string
	for i, q := range ch.qAft {
		if g.prio == EqualCutOffs && i != g.running || g.prio == Balanced {
			continue
		}
		d := g.diff(q)
		if math.Abs(d) <= g.seen[i] {
			continue
		}
		what := fmt.Sprintf("the leads will still be %s apart (%s front, %s back)", length(math.Abs(d), unit), length(q.lead[0], unit), length(q.lead[1], unit))
		if len(ch.set) == 0 {
			what = fmt.Sprintf("the leads stay %s apart (%s front, %s back)", length(math.Abs(d), unit), length(q.lead[0], unit), length(q.lead[1], unit))
		}
		if g.prio == EqualCutOffs {
			what = fmt.Sprintf("the cut-offs will still be %.1f %% apart (%.1f %% front, %.1f %% back)", math.Abs(d), q.cut[0], q.cut[1])
		}
		// The adjuster that sets this position: the finest of the plan's
		// own steps that acts there at least half as much as anywhere,
		// else the one that acts most there rather than elsewhere (the
		// backward rod for full back).
		fine, fk, spec := 0.0, -1, 0.0
		inPlan := false
		for k, kb := range ks {
			if !usable[k] || isSheave(kb) {
				continue
			}
			var here, all, most float64
			for j, qj := range qNow {
				gd := qj.grad[0][kb.p] - qj.grad[1][kb.p]
				if g.prio == EqualCutOffs {
					gd = qj.grad[2][kb.p] - qj.grad[3][kb.p]
				}
				all += math.Abs(gd)
				most = math.Max(most, math.Abs(gd))
				if j == i {
					here = math.Abs(gd)
				}
			}
			if here*kb.step < 1e-6 {
				continue
			}
			own := ch.rounded[k] != 0 && here >= most/2
			sp := here / all
			switch {
			case own && (!inPlan || here*kb.step < fine):
				fine, fk, inPlan = here*kb.step, k, true
			case !own && !inPlan && (fk < 0 || sp > spec+1e-6 || math.Abs(sp-spec) <= 1e-6 && here*kb.step < fine):
				fine, fk, spec = here*kb.step, k, sp
			}
		}
		name := ev.ps[i].name()
		switch {
		case fk < 0:
			out = append(out, fmt.Sprintf("In %s %s: nothing the profile allows, other than an eccentric sheave, moves them apart or together.", name, what))
		case math.Abs(d) <= fine/2+g.res/2:
			amt := length(fine, unit)
			if g.prio == EqualCutOffs {
				amt = fmt.Sprintf("%.1f %%", fine)
			}
			out = append(out, fmt.Sprintf("In %s %s: the %s moves them %s with %s, so this is as close as it can be set.", name, what, partName(ks[fk].adj, ev.spec.Gear.Kind), amt, handStepWords(ks[fk], unit)))
		default:
			out = append(out, fmt.Sprintf("In %s %s: setting them closer would upset another position by more, or take more steps than it gains.", name, what))
		}
	}
	return out
}

// handStepWords names a knob's smallest step: "each half turn of its
// thread (0.32 mm)".
func handStepWords(k knob, unit session.Unit) string {
	if k.adj.Kind.Angular() {
		if k.adj.Kind == session.EccentricAngle && k.adj.SheaveDiameterMM > 0 {
			return fmt.Sprintf("each %s round its rim", length(rimStepMM, unit))
		}
		return fmt.Sprintf("each %.2f deg", k.step)
	}
	if !(k.adj.Thread.Pitch() > 0) {
		return "each " + length(k.step, unit)
	}
	f := k.adj.Thread.FlatsPerTurn
	if f <= 0 {
		f = defaultFlats
	}
	one := "flat"
	if f == 2 {
		one = "half turn"
	}
	return fmt.Sprintf("each %s of its thread (%s)", one, length(k.step, unit))
}
