package plan

import (
	"math"
	"sort"
)

// choice is the plan chosen for one priority.
type choice struct {
	ideal   []float64 // the ideal changes of the chosen knobs, found on the linkage itself
	rounded []float64
	qAft    []quantities // exact: the linkage solved afresh with the rounded changes
	set     []int        // knobs with a step
}

// option is one set of knobs with its continuous changes, judged on the
// linear model about today.
type option struct {
	set     []int
	a       []float64
	measure float64
	effort  float64
	worse   bool
	// polished: a is the ideal found on the linkage itself, q its events
	// there (see polish).
	polished bool
	q        []quantities
	defect   []curve // the linkage less the surrogate curves at a (see polish)
}

// choose finds the plan that comes closest to the priority's goal in the
// fewest and smallest steps hands can make, leaving no position worse
// than today by more than the readings can tell.
//
//  1. Every set of the usable knobs is solved on the linear model about
//     today (least squares with the ridge of effectDoubt, so that knobs
//     acting alike do not trade large changes), then its worst term
//     brought down by reweighting the terms toward the largest (Lawson's
//     rule): the setter sees the worst position, not the sum of squares.
//  2. The sets are ranked: those that leave nothing worse and come within
//     the goal's slack of the best, fewest knobs first, then the smallest
//     changes; then the others that leave nothing worse, closest first.
//  3. In that order (at most three), a set's changes are polished on the
//     linkage itself (Gauss-Newton, the curves sampled afresh at each
//     step: the ideal changes a plan reports hold on the gear, not only on
//     its linearisation), rounded to whole steps of each adjuster either
//     side, and the roundings judged on the linkage solved afresh. The
//     first set whose best rounding leaves nothing worse and comes within
//     the slack of the best rounding found is taken.
//
// No change is the answer only when no rounding gains more than half a
// division (or the fine tolerance) without leaving a position worse.
func (ev *evaluator) choose(p [numParams]float64, ks []knob, ts []term, qNow []quantities, g goal, usable []bool) (*choice, error) {
	n := len(ks)
	g.ks = ks
	var idx []int
	for k := range ks {
		if usable[k] {
			idx = append(idx, k)
		}
	}
	if len(idx) > 7 {
		idx = idx[:7]
	}
	zero := make([]float64, n)
	none := &choice{rounded: zero, ideal: zero, qAft: qNow}
	zeroM := measure(ts, qNow)
	// Where a port does not open today the linear model cannot see a
	// cut-off come back: only the linkage can judge such plans.
	blind := false
	for _, t := range ts {
		if t.what == "cut" && t.w >= 0.05 && !qNow[t.pos].cutOK {
			blind = true
		}
	}
	rd := ridge(ks, ts, qNow)
	lin := make([]quantities, len(qNow))
	var opts []option
	for mask := 1; mask < 1<<len(idx); mask++ {
		var set []int
		for b, k := range idx {
			if mask>>b&1 != 0 {
				set = append(set, k)
			}
		}
		a := minimaxIdeal(ks, ts, qNow, set, rd, lin, g)
		linearAt(qNow, ks, a, lin)
		o := option{set: set, a: a, measure: measure(ts, lin), worse: g.worse(qNow, lin, ts, a)}
		for _, k := range set {
			o.effort += math.Abs(a[k]) / ks[k].scale
		}
		opts = append(opts, o)
	}
	rank := func() {
		best := zeroM
		for _, o := range opts {
			if !o.worse {
				best = math.Min(best, o.measure)
			}
		}
		tier := func(o option) int {
			switch {
			case o.worse:
				return 2
			case o.measure <= best+g.slack:
				return 0
			}
			return 1
		}
		sort.SliceStable(opts, func(i, j int) bool {
			a, b := opts[i], opts[j]
			if ta, tb := tier(a), tier(b); ta != tb {
				return ta < tb
			}
			if tier(a) == 0 {
				if len(a.set) != len(b.set) {
					return len(a.set) < len(b.set)
				}
				return a.effort < b.effort
			}
			return a.measure < b.measure
		})
	}
	rank()
	if g.prio != EqualLeads {
		// Cut-offs are far from linear in the changes: the leading sets
		// are solved on the linkage itself before they are ranked.
		polished := 0
		for i := range opts {
			if polished >= 2 {
				break
			}
			o := &opts[i]
			if o.worse {
				continue
			}
			polished++
			a, q, d := ev.polish(p, ks, ts, qNow, o.set, o.a, g)
			if !g.worse(qNow, q, ts, a) {
				o.a, o.q, o.defect, o.measure, o.polished = a, q, d, measure(ts, q), true
			}
		}
		rank()
	}
	// Exact judgement, in the ranked order.
	type judged struct {
		c       *choice
		measure float64
	}
	var found []judged
	var firstIdeal []float64 // the polished ideal of the first set tried, kept when no rounding holds
	tried := 0
	for _, o := range opts {
		if o.worse || tried >= 6 || len(found) >= 2 {
			break
		}
		if o.measure >= zeroM-g.fine && !blind {
			continue // gains nothing the setter could see
		}
		if len(found) > 0 && o.measure >= found[0].measure-g.slack {
			continue // could not beat the plan found by more than the slack
		}
		tried++
		c, m, ok, ideal := ev.roundBest(p, ks, ts, qNow, g, o)
		if firstIdeal == nil {
			firstIdeal = ideal
		}
		if !ok || m >= zeroM-g.fine {
			continue
		}
		found = append(found, judged{c, m})
	}
	if len(found) == 0 {
		if firstIdeal != nil {
			// No rounding of a continuous answer holds; the continuous
			// answer is still reported (Plan.Ideal), with why it is not
			// made.
			none.ideal = firstIdeal
		}
		var steppable []int
		for _, k := range idx {
			if !isSheave(ks[k]) {
				steppable = append(steppable, k)
			}
		}
		if c := ev.stepSearch(p, ks, ts, qNow, g, steppable, zeroM); c != nil {
			return c, nil
		}
		return none, nil
	}
	bestR := math.Inf(1)
	for _, f := range found {
		bestR = math.Min(bestR, f.measure)
	}
	for _, f := range found {
		if f.measure <= bestR+g.slack {
			return f.c, nil
		}
	}
	return found[0].c, nil
}

// minimaxIdeal solves the knobs in set on the linear model (see
// weightedIdeal), then reweights the terms a few times: toward the largest
// residuals (Lawson's rule for the smallest largest residual), and tenfold
// on any position the changes would leave worse than today (see
// goal.worse), so that the answer keeps to what the setter has. It keeps
// the changes whose worst term is least among those that leave nothing
// worse (or the last, when none). lin is scratch space.
func minimaxIdeal(ks []knob, ts []term, qNow []quantities, set []int, rd []float64, lin []quantities, g goal) []float64 {
	a := weightedIdeal(ks, ts, qNow, set, nil, rd)
	linearAt(qNow, ks, a, lin)
	bestA, bestM := a, math.Inf(1)
	if !g.worse(qNow, lin, ts, a) {
		bestM = measure(ts, lin)
	}
	tw := make([]float64, len(ts))
	for i := range tw {
		tw[i] = 1
	}
	hold := make([]float64, len(ts)) // the tenfold weights of positions kept from getting worse
	for i := range hold {
		hold[i] = 1
	}
	for it := 0; it < 10; it++ {
		s := 0.0
		for ti, t := range ts {
			tw[ti] *= math.Abs(t.value(lin)) + 1e-6
			s += tw[ti]
		}
		if !(s > 0) {
			break
		}
		for ti, t := range ts {
			if g.diffTerm(t) && g.worseAt(qNow, lin, t.pos, a) {
				hold[ti] *= 10
			}
		}
		w := make([]float64, len(tw))
		for ti := range tw {
			tw[ti] = tw[ti]/s*float64(len(tw)) + 1e-9
			w[ti] = tw[ti] * hold[ti]
		}
		a = weightedIdeal(ks, ts, qNow, set, w, rd)
		linearAt(qNow, ks, a, lin)
		if g.worse(qNow, lin, ts, a) {
			continue
		}
		if m := measure(ts, lin); m < bestM-1e-9 {
			bestA, bestM = a, m
		}
	}
	if math.IsInf(bestM, 1) {
		return a
	}
	return bestA
}

// roundBest polishes option o's changes on the linkage itself, rounds them
// to whole steps and judges the roundings on the linkage solved afresh;
// it returns the best rounding that leaves nothing worse, with its
// measure on the linkage, and the polished ideal.
func (ev *evaluator) roundBest(p [numParams]float64, ks []knob, ts []term, qNow []quantities, g goal, o option) (*choice, float64, bool, []float64) {
	ideal, qI, defect := o.a, o.q, o.defect
	if !o.polished {
		ideal, qI, defect = ev.polish(p, ks, ts, qNow, o.set, o.a, g)
	}
	n := len(ks)
	lin := make([]quantities, len(qNow))
	linAbout := func(a []float64) float64 {
		for i := range qI {
			q := &lin[i]
			*q = qI[i]
			for _, k := range o.set {
				d := a[k] - ideal[k]
				for e := 0; e < 2; e++ {
					q.lead[e] += qI[i].grad[e][ks[k].p] * d
					q.cut[e] += qI[i].grad[2+e][ks[k].p] * d
				}
			}
		}
		m := measure(ts, lin)
		if g.worse(qNow, lin, ts, a) {
			m += 1e6
		}
		return m
	}
	type local struct {
		a []float64
		m float64
	}
	near := make([][2]float64, len(o.set))
	for j, k := range o.set {
		near[j] = roundedNear(ideal[k], ks[k].step, ks[k].adj.Min, ks[k].adj.Max)
	}
	var cands []local
	for combo := 0; combo < 1<<len(o.set); combo++ {
		a := make([]float64, n)
		for j, k := range o.set {
			a[k] = near[j][combo>>j&1]
		}
		cands = append(cands, local{a, linAbout(a)})
	}
	sort.Slice(cands, func(i, j int) bool { return cands[i].m < cands[j].m })
	// A step either way on one knob or two together, while that helps on
	// the linear model: coarse steps on one adjuster can be made up by
	// another.
	// Each step away from the ideal costs half a division (a division for
	// two knobs a step off together, four for one two steps off).
	away := func(a []float64) float64 {
		c := 0.0
		for _, k := range o.set {
			c += sq((a[k] - ideal[k]) / ks[k].step)
		}
		return g.fine * c
	}
	cur := cands[0]
	cur.m += away(cur.a)
	for it := 0; it < 20; it++ {
		moved := false
		try := func(a []float64) {
			for _, k := range o.set {
				if a[k] < ks[k].adj.Min-1e-9 || a[k] > ks[k].adj.Max+1e-9 {
					return
				}
				// No further than a step beyond the whole steps either
				// side of the ideal: knobs acting alike would otherwise
				// walk far along their valley, trading changes whose
				// errors do not cancel on the engine.
				if math.Abs(a[k]-ideal[k]) > 2*ks[k].step {
					return
				}
			}
			if m := linAbout(a) + away(a); m < cur.m-1e-9 {
				cur, moved = local{a, m}, true
			}
		}
		for x, k := range o.set {
			for _, dir := range []float64{-1, 1} {
				a := append([]float64(nil), cur.a...)
				a[k] += dir * ks[k].step
				try(a)
				for _, k2 := range o.set[x+1:] {
					for _, dir2 := range []float64{-1, 1} {
						b := append([]float64(nil), a...)
						b[k2] += dir2 * ks[k2].step
						try(b)
					}
				}
			}
		}
		if !moved {
			break
		}
	}
	cands = append([]local{cur}, cands...)
	// The roundings judged on the polished curves (today's moved by the
	// knobs' effects, with what the linkage showed them to miss at the
	// ideal), best first; the best that holds is then checked on the
	// linkage solved afresh.
	type judgedR struct {
		a []float64
		m float64
	}
	var rs []judgedR
	seen := map[[8]int32]bool{}
	for _, c := range cands {
		if len(rs) >= 8 {
			break
		}
		var key [8]int32
		steps := 0
		for j, k := range o.set {
			if j < len(key) {
				key[j] = int32(math.Round(c.a[k] / ks[k].step))
			}
			// Whole steps, as StepFor writes them.
			c.a[k] = math.Round(c.a[k]/ks[k].step) * ks[k].step
			if math.Abs(c.a[k]) < 1e-12 {
				c.a[k] = 0
			} else {
				steps++
			}
		}
		if seen[key] || steps == 0 {
			continue
		}
		seen[key] = true
		q, err := ev.quick(ev.surrogate(ks, c.a, defect), qI, nil)
		if err != nil || g.worse(qNow, q, ts, c.a) {
			continue
		}
		rs = append(rs, judgedR{c.a, measure(ts, q)})
	}
	sort.SliceStable(rs, func(i, j int) bool { return rs[i].m < rs[j].m })
	for x, r := range rs {
		if x >= 2 {
			break
		}
		ch, ok := ev.exactChoice(p, ks, ts, qNow, g, r.a)
		if !ok {
			continue
		}
		ch.ideal = ideal
		return ch, measure(ts, ch.qAft), true, ideal
	}
	return nil, math.Inf(1), false, ideal
}

// surrogate returns today's curves moved by the knobs' changes a through
// their effect curves, plus defect (per position, nil for none).
func (ev *evaluator) surrogate(ks []knob, a []float64, defect []curve) []curve {
	cs := make([]curve, len(ev.ps))
	shift := 0.0
	for k, kb := range ks {
		if kb.p == pValveOffset {
			shift += a[k]
		}
	}
	for i := range ev.ps {
		cs[i] = combine(ev.base[i], ev.sens[i], a, shift)
		if defect != nil {
			for k := range cs[i] {
				if k < len(defect[i]) {
					cs[i][k] += defect[i][k]
				}
			}
		}
	}
	return cs
}

// polish solves the knobs in set on the linkage itself, from the linear
// model's changes a0: Gauss-Newton on the objective with the ridge, the
// events found afresh at each step on the curves the changes give (today's
// curves moved by the knobs' effect curves, corrected by what the linkage
// solved afresh at the last answer shows them to miss: so the linkage is
// solved twice a polish, not at every step), within the knobs' limits,
// halving a step that does not lower the sum. The terms are reweighted
// toward the largest after each step (Lawson's rule, as minimaxIdeal),
// tenfold where a position would end worse than today, and the changes
// kept are those with the least worst term among the points reached that
// leave nothing worse. It returns the changes and the events there, on the
// linkage, with the knobs' gradients.
func (ev *evaluator) polish(p [numParams]float64, ks []knob, ts []term, qNow []quantities, set []int, a0 []float64, g goal) ([]float64, []quantities, []curve) {
	rd := ridge(ks, ts, qNow)
	tw := make([]float64, len(ts))
	for i := range tw {
		tw[i] = 1
	}
	cost := func(a []float64, q []quantities) float64 {
		c := 0.0
		for ti, t := range ts {
			c += tw[ti] * sq(t.value(q))
		}
		for _, k := range set {
			c += rd[k] * sq(a[k])
		}
		return c
	}
	var defect []curve // per position: the linkage less the surrogate at the last answer
	curves := func(a []float64) []curve { return ev.surrogate(ks, a, defect) }
	last := qNow // the events found last, from which the next are followed
	at := func(a []float64, cs []curve) ([]quantities, bool) {
		q, err := ev.quick(cs, last, nil)
		if err != nil {
			return nil, false
		}
		for i := range q {
			ev.knobGrad(&q[i], cs[i], i, ks)
		}
		last = q
		return q, true
	}
	exact := func(a []float64) ([]curve, bool) {
		cs, err := ev.curvesAt(applyKnobs(p, ks, a))
		return cs, err == nil
	}
	a := append([]float64(nil), a0...)
	bestA, bestM := a, math.Inf(1)
	var bestCS []curve
	// Leads move almost in proportion to the changes: one correction
	// by the linkage is enough there; cut-offs get two.
	outers := 2
	if g.prio == EqualLeads {
		outers = 1
	}
	for outer := 0; outer < outers; outer++ {
		q, ok := at(a, curves(a))
		if !ok {
			break
		}
		for it := 0; it < 8; it++ {
			m := len(set)
			A := newSym(m)
			gr := make([]float64, m)
			for ti, t := range ts {
				v := t.value(q)
				for r, k := range set {
					gk := t.grad(q, ks[k].p)
					gr[r] -= tw[ti] * gk * v
					for s2, k2 := range set {
						A.add(r, s2, tw[ti]*gk*t.grad(q, ks[k2].p))
					}
				}
			}
			for r, k := range set {
				A.add(r, r, rd[k])
				gr[r] -= rd[k] * a[k]
			}
			d, solved := A.solve(gr)
			if !solved {
				break
			}
			c := cost(a, q)
			moved := false
			for scale := 1.0; scale > 0.1; scale /= 2 {
				b := append([]float64(nil), a...)
				for r, k := range set {
					b[k] = math.Max(ks[k].adj.Min, math.Min(ks[k].adj.Max, a[k]+scale*d[r]))
				}
				if qb, ok := at(b, curves(b)); ok && cost(b, qb) < c {
					a, q, moved = b, qb, true
					break
				}
			}
			// Reweight toward the largest terms, and hold positions that
			// would end worse.
			s := 0.0
			for ti, t := range ts {
				tw[ti] *= math.Abs(t.value(q)) + 1e-6
				s += tw[ti]
			}
			if !(s > 0) {
				break
			}
			for ti, t := range ts {
				tw[ti] = tw[ti]/s*float64(len(tw)) + 1e-9
				if g.diffTerm(t) && g.worseAt(qNow, q, t.pos, a) {
					tw[ti] *= 10
				}
			}
			if !moved && it > 0 {
				break
			}
		}
		// The linkage itself where the answer has got to.
		cs, ok := exact(a)
		if !ok {
			break
		}
		qe, ok := at(a, cs)
		if !ok {
			break
		}
		if !g.worse(qNow, qe, ts, a) {
			if mq := measure(ts, qe); mq < bestM {
				bestA, bestM, bestCS = append([]float64(nil), a...), mq, cs
			}
		}
		defect = nil
		base := curves(a)
		defect = make([]curve, len(cs))
		for i := range cs {
			defect[i] = make(curve, len(cs[i]))
			for k := range cs[i] {
				defect[i][k] = cs[i][k]
				if k < len(base[i]) {
					defect[i][k] -= base[i][k]
				}
			}
		}
	}
	if math.IsInf(bestM, 1) {
		bestA, bestCS = a, nil
	}
	cs, ok := bestCS, bestCS != nil
	if !ok {
		cs, ok = exact(bestA)
	}
	if !ok {
		linear := make([]quantities, len(qNow))
		linearAt(qNow, ks, bestA, linear)
		return bestA, linear, nil
	}
	q, ok := at(bestA, cs)
	if !ok {
		linear := make([]quantities, len(qNow))
		linearAt(qNow, ks, bestA, linear)
		return bestA, linear, nil
	}
	// What the surrogate misses at the answer, for judging roundings near
	// it.
	defect = nil
	base := curves(bestA)
	defect = make([]curve, len(cs))
	for i := range cs {
		defect[i] = append(curve(nil), cs[i]...)
		for k := range base[i] {
			if k < len(defect[i]) {
				defect[i][k] -= base[i][k]
			}
		}
	}
	return bestA, q, defect
}

// stepSearch looks, when no rounding of a continuous answer holds, for a
// few whole steps of the knobs idx (no sheave: one is turned back by the
// continuous answer or not at all) that still gain; their ideal is the
// steps themselves: one adjuster moved up to three steps
// either way, or two moved up to two steps each (two coarse threads
// together make a finer step than either: a flat on one against a flat on
// the other). The sets are judged on the linear model, those that leave
// nothing worse and gain more than half a division ranked (within the
// slack of the best, fewest steps first), and the first three checked on
// the linkage solved afresh. It returns nil when none gains.
func (ev *evaluator) stepSearch(p [numParams]float64, ks []knob, ts []term, qNow []quantities, g goal, idx []int, zeroM float64) *choice {
	type cand struct {
		a     []float64
		m     float64
		steps int
	}
	n := len(ks)
	lin := make([]quantities, len(qNow))
	var cs []cand
	try := func(a []float64, steps int) {
		for _, k := range idx {
			if a[k] < ks[k].adj.Min-1e-9 || a[k] > ks[k].adj.Max+1e-9 {
				return
			}
		}
		linearAt(qNow, ks, a, lin)
		if g.worse(qNow, lin, ts, a) {
			return
		}
		if m := measure(ts, lin); m < zeroM-g.fine {
			cs = append(cs, cand{a, m, steps})
		}
	}
	for x, k := range idx {
		for s := -3; s <= 3; s++ {
			if s == 0 {
				continue
			}
			a := make([]float64, n)
			a[k] = float64(s) * ks[k].step
			try(a, abs(s))
			for _, k2 := range idx[x+1:] {
				if abs(s) > 2 {
					continue
				}
				for s2 := -2; s2 <= 2; s2++ {
					if s2 == 0 {
						continue
					}
					b := append([]float64(nil), a...)
					b[k2] = float64(s2) * ks[k2].step
					try(b, abs(s)+abs(s2))
				}
			}
		}
	}
	if len(cs) == 0 {
		return nil
	}
	best := math.Inf(1)
	for _, c := range cs {
		best = math.Min(best, c.m)
	}
	sort.SliceStable(cs, func(i, j int) bool {
		ti, tj := cs[i].m <= best+g.slack, cs[j].m <= best+g.slack
		if ti != tj {
			return ti
		}
		if ti && cs[i].steps != cs[j].steps {
			return cs[i].steps < cs[j].steps
		}
		return cs[i].m < cs[j].m
	})
	for x, c := range cs {
		if x >= 3 {
			break
		}
		if ch, ok := ev.exactChoice(p, ks, ts, qNow, g, c.a); ok && measure(ts, ch.qAft) < zeroM-g.fine {
			return ch
		}
	}
	return nil
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

// exactChoice solves the linkage afresh with the whole-step changes a and
// returns them as the plan's choice (its ideal a as well, for the caller
// to replace), or false when the linkage does not close or a position
// would end worse.
func (ev *evaluator) exactChoice(p [numParams]float64, ks []knob, ts []term, qNow []quantities, g goal, a []float64) (*choice, bool) {
	cs, err := ev.curvesAt(applyKnobs(p, ks, a))
	if err != nil {
		return nil, false
	}
	full, err := ev.eventsOf(cs, nil)
	if err != nil || g.worse(qNow, full, ts, a) {
		return nil, false
	}
	for i := range full {
		full[i].grad, full[i].cg, full[i].group = qNow[i].grad, qNow[i].cg, qNow[i].group
	}
	ch := &choice{ideal: a, rounded: a, qAft: full}
	for k, v := range a {
		if v != 0 {
			ch.set = append(ch.set, k)
		}
	}
	return ch, true
}
