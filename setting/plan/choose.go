package plan

import (
	"fmt"
	"math"
	"sort"

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
	tol     []float64 // per position: measurement uncertainty of its difference (mm or %)
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
// EqualLeads, the running notch's cut-off difference for EqualCutOffs,
// the whole weighted objective for Balanced.
func (g goal) worse(now, after []quantities, ts []term) bool {
	switch g.prio {
	case EqualCutOffs:
		i := g.running
		return math.Abs(g.diff(after[i])) > math.Abs(g.diff(now[i]))+g.tol[i]
	case Balanced:
		return math.Sqrt(sumSquares(ts, after)) > math.Sqrt(sumSquares(ts, now))+g.slack
	}
	for i := range now {
		if math.Abs(g.diff(after[i])) > math.Abs(g.diff(now[i]))+g.tol[i] {
			return true
		}
	}
	return false
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
)

// weighing fills the objective's position weights from the uncertainty
// of each difference today, and returns the goal's tolerances.
func (ev *evaluator) weighing(obj *objective, qNow []quantities, fit *Fit) goal {
	n := len(qNow)
	g := goal{prio: obj.prio, running: obj.running, tol: make([]float64, n)}
	obj.wLead, obj.wCut = make([]float64, n), make([]float64, n)
	k := math.Max(1, ev.spec.Engine.CrankRadius/25)
	res := gaugeResolution(fit)
	for i, q := range qNow {
		var sl, sc float64
		if fit != nil && fit.cov.n > 0 {
			var dl, dc [numParams]float64
			for j := range dl {
				dl[j] = q.grad[0][j] - q.grad[1][j]
				dc[j] = q.grad[2][j] - q.grad[3][j]
			}
			sl, sc = sdOf(fit, dl), sdOf(fit, dc)
		}
		obj.wLead[i] = 1 / math.Sqrt(1+sq(sl/(leadUnknownMM*k)))
		obj.wCut[i] = 1 / math.Sqrt(1+sq(sc/cutUnknownPct))
		g.tol[i] = math.Max(res, sl)
		if g.prio == EqualCutOffs {
			g.tol[i] = math.Max(cutTolPct, sc)
		}
	}
	// A plan of more steps is preferred only when it comes closer by
	// more than the setter can measure: two gauge divisions (a lead
	// difference is read from four gauge readings) or the cut-off
	// tolerance, or the uncertainty of the differences in the positions
	// the readings pin down, whichever is larger. Roundings with as many
	// steps are told apart to half a division.
	known := 0.0
	for i, tl := range g.tol {
		if g.prio == EqualCutOffs && i != g.running {
			continue
		}
		if tl <= leadUnknownMM*k || g.prio == EqualCutOffs && tl <= cutUnknownPct {
			known = math.Max(known, tl)
		}
	}
	g.res = res
	switch g.prio {
	case EqualCutOffs:
		g.res = cutTolPct
		g.slack, g.fine = math.Max(cutTolPct, known)/0.1, cutTolPct/2/0.1
	case Balanced:
		g.slack, g.fine = math.Max(2*res, known)/0.05, res/2/0.05
	default:
		g.slack, g.fine = math.Max(2*res, known)/0.01, res/2/0.01
	}
	return g
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
			var gm [numParams]float64
			for j := range gm {
				gm[j] = (q.grad[0][j] + q.grad[1][j]) / 2
			}
			sm := 0.0
			if fit != nil && fit.cov.n > 0 {
				sm = sdOf(fit, gm)
			}
			d := obj.design[pos]
			if math.Abs(m-d) > math.Max(0.5*math.Abs(d), 0.1*kc)+2*sm {
				pol.mean[pos] = true
				pol.notes = append(pol.notes, fmt.Sprintf("The mean lead in %s is %s, far from the drawing's %s: the %s has probably slipped on the axle. A spindle or rod change only shares the lead between the ends, so the plan turns the sheave back.",
					ev.ps[pos].name(), length(m, unit), length(d, unit), partName(k.adj, ev.spec.Gear.Kind)))
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
	// before setting it.
	var unknownPos []bool
	for i, k := range ks {
		if !pol.usable[i] || isSheave(k) {
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
		var d [numParams]float64
		for j := range d {
			if prio == EqualCutOffs {
				d[j] = q.grad[2][j] - q.grad[3][j]
			} else {
				d[j] = q.grad[0][j] - q.grad[1][j]
			}
		}
		lim := leadUnknownMM * k
		if prio == EqualCutOffs {
			lim = cutUnknownPct
		}
		out[i] = sdOf(fit, d) > lim
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

// candidate is one rounded plan.
type candidate struct {
	a       []float64
	ideal   []float64 // the ideal changes it was rounded from
	steps   int
	effort  float64
	measure float64
	worse   bool
	tier    int     // rank group (see rankPlans)
	bar     float64 // the measure its rank promised
	from    int     // where a judged candidate's curves are kept
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
		for _, t := range ts {
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
				g[r] -= row[r] * v
				for c := range free {
					A.add(r, c, row[r]*row[c])
				}
			}
		}
		for r, k := range free {
			A.add(r, r, sq(changeWeight/ks[k].scale)+1e-12)
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

// choice is the plan chosen for one priority.
type choice struct {
	ideal   []float64 // the ideal changes the plan was rounded from
	rounded []float64
	qAft    []quantities // exact: the linkage solved afresh with the rounded changes
	set     []int        // knobs with a step
}

// choose finds the plan with the fewest and smallest steps that does as
// well as any, in steps hands can make. Every set of the usable knobs is
// solved (linear in the changes about today), each knob rounded to the
// whole steps either side of its ideal; the whole usable set and the
// favourite's set are solved again on the events themselves (a port that
// opens or closes on the way is not linear), and their roundings judged
// on those events. A plan that leaves any position worse than today by
// more than the readings can tell is refused; among those within the
// goal's slack of the best, the fewest steps win, then the smallest
// changes. The favourite is checked on the linkage solved afresh with the
// rounded changes, and the next taken when that check fails; no change at
// all is the last resort.
func (ev *evaluator) choose(p [numParams]float64, ks []knob, ts []term, qNow []quantities, g goal, usable []bool) (*choice, error) {
	n := len(ks)
	var idx []int
	for k := range ks {
		if usable[k] {
			idx = append(idx, k)
		}
	}
	if len(idx) > 7 {
		idx = idx[:7]
	}
	lin := make([]quantities, len(qNow))
	// A plan's key: its whole steps per usable knob.
	type planKey [7]int32
	keyOf := func(a []float64) planKey {
		var key planKey
		for j, k := range idx {
			key[j] = int32(math.Round(a[k] / ks[k].step))
		}
		return key
	}
	pos := map[planKey]int{}
	var cands []candidate
	add := func(a []float64, q []quantities, ideal []float64) {
		key := keyOf(a)
		c := candidate{a: append([]float64(nil), a...), ideal: ideal}
		for k, v := range a {
			if v != 0 {
				c.steps++
				c.effort += math.Abs(v) / ks[k].scale
			}
		}
		c.measure = measure(ts, q)
		c.worse = g.worse(qNow, q, ts)
		if i, ok := pos[key]; ok {
			cands[i] = c // judged on the events: replaces the linear guess
			return
		}
		pos[key] = len(cands)
		cands = append(cands, c)
	}
	// roundings calls f with every rounding of ideal over the knobs in set.
	roundings := func(ideal []float64, set []int, f func(a []float64)) {
		near := make([][2]float64, len(set))
		for j, k := range set {
			near[j] = roundedNear(ideal[k], ks[k].step, ks[k].adj.Min, ks[k].adj.Max)
		}
		a := make([]float64, n)
		for combo := 0; combo < 1<<len(set); combo++ {
			for j, k := range set {
				a[k] = near[j][combo>>j&1]
			}
			f(a)
		}
	}
	zero := make([]float64, n)
	add(zero, qNow, zero)
	for mask := 1; mask < 1<<len(idx); mask++ {
		var set []int
		for b, k := range idx {
			if mask>>b&1 != 0 {
				set = append(set, k)
			}
		}
		ideal := subsetIdeal(ks, ts, qNow, set)
		roundings(ideal, set, func(a []float64) {
			if _, ok := pos[keyOf(a)]; !ok {
				linearAt(qNow, ks, a, lin)
				add(a, lin, ideal)
			}
		})
	}
	rank := func() {
		rankPlans(cands, g)
		for i, c := range cands {
			pos[keyOf(c.a)] = i
		}
	}
	rank()
	// For cut-offs, solve again on the events: the set of the favourite,
	// or the whole usable set when no change is the favourite (the linear
	// model cannot see a port that does not open today).
	var sets [][]int
	if g.prio != EqualLeads && len(idx) > 0 && len(cands) > 0 {
		var fav []int
		for k, v := range cands[0].a {
			if v != 0 {
				fav = append(fav, k)
			}
		}
		if len(fav) == 0 {
			fav = idx
		}
		sets = append(sets, fav)
	}
	for _, set := range sets {
		in := make([]bool, n)
		for _, k := range set {
			in[k] = true
		}
		ideal, qIdeal, err := ev.optimise(p, ks, ts, qNow, in, subsetIdeal(ks, ts, qNow, set))
		if err != nil {
			continue
		}
		// The roundings either side of the ideal, then a step either way
		// on each knob while that helps (coarse steps on one knob can be
		// made up by another), judged linear about the ideal; the best few
		// are then judged on the events.
		linIdeal := func(a []float64) float64 {
			for i := range qIdeal {
				q := &lin[i]
				q.cutOK = qIdeal[i].cutOK
				q.lead, q.cut = qIdeal[i].lead, qIdeal[i].cut
				for _, k := range set {
					d := a[k] - ideal[k]
					for e := 0; e < 2; e++ {
						q.lead[e] += qIdeal[i].grad[e][ks[k].p] * d
						q.cut[e] += qIdeal[i].grad[2+e][ks[k].p] * d
					}
				}
			}
			return sumSquares(ts, lin)
		}
		type local struct {
			a []float64
			c float64
		}
		var near []local
		roundings(ideal, set, func(a []float64) {
			near = append(near, local{append([]float64(nil), a...), linIdeal(a)})
		})
		sort.Slice(near, func(i, j int) bool { return near[i].c < near[j].c })
		if len(near) > 0 {
			cur := near[0]
			for it := 0; it < 40; it++ {
				moved := false
				try := func(a []float64) {
					for _, k := range set {
						if a[k] < ks[k].adj.Min-1e-9 || a[k] > ks[k].adj.Max+1e-9 {
							return
						}
					}
					if c := linIdeal(a); c < cur.c-1e-12 {
						cur, moved = local{a, c}, true
					}
				}
				// One knob a step either way, or two together (knobs
				// that act alike trade steps along their valley).
				for x, k := range set {
					for _, dir := range []float64{-1, 1} {
						a := append([]float64(nil), cur.a...)
						a[k] += dir * ks[k].step
						try(a)
						for _, k2 := range set[x+1:] {
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
			near = append([]local{cur}, near...)
		}
		for i, l := range near {
			if i >= 5 {
				break
			}
			for k := range l.a {
				if math.Abs(l.a[k]) < 1e-12 {
					l.a[k] = 0
				}
			}
			if q, err := ev.quick(ev.surrogate(ks, l.a), qIdeal, nil); err == nil {
				add(l.a, q, ideal)
			}
		}
	}
	rank()
	// The favourites judged on the linkage solved afresh with their
	// rounded changes: the first that holds up (not worse, and as close
	// as its rank promised) is taken; when none does, the best of those
	// judged, by the same rules.
	var judged []candidate
	curves := map[int][]curve{}
	for _, c := range cands {
		if c.tier != 0 || c.steps == 0 || len(judged) >= 4 {
			break
		}
		// The linkage sampled afresh; the events found from today's by
		// Newton's method (the full search where that fails).
		cs, err := ev.curvesAt(applyKnobs(p, ks, c.a))
		if err != nil {
			continue
		}
		q, err := ev.quick(cs, qNow, nil)
		if err != nil || g.worse(qNow, q, ts) {
			continue
		}
		c.measure = measure(ts, q)
		if c.measure <= c.bar {
			return ev.newChoice(c, cs)
		}
		curves[len(judged)] = cs
		judged = append(judged, c)
	}
	for i := range judged {
		judged[i].from = i
	}
	judged = append(judged, candidate{a: zero, ideal: zero, measure: measure(ts, qNow)})
	rankPlans(judged, g)
	c := judged[0]
	if c.steps == 0 {
		return &choice{rounded: zero, ideal: zero, qAft: qNow}, nil
	}
	return ev.newChoice(c, curves[c.from])
}

// rankPlans orders candidate plans: first, for each number of steps whose
// best comes within the goal's slack of the best of all, fewest steps
// first, the roundings within half a division of that best, smallest
// changes first; then the other plans that leave nothing worse, closest
// first; last those that leave something worse. Each candidate's bar is
// the measure its rank promised (its step count's best, and the fine
// tolerance).
func rankPlans(cs []candidate, g goal) {
	bestOf := map[int]float64{}
	all := math.Inf(1)
	for _, c := range cs {
		if c.worse {
			continue
		}
		if b, ok := bestOf[c.steps]; !ok || c.measure < b {
			bestOf[c.steps] = c.measure
		}
		all = math.Min(all, c.measure)
	}
	for i := range cs {
		c := &cs[i]
		b := bestOf[c.steps]
		switch {
		case c.worse:
			c.tier = 2
		case b <= all+g.slack && c.measure <= b+g.fine:
			c.tier, c.bar = 0, b+g.fine
		default:
			c.tier = 1
		}
	}
	sort.SliceStable(cs, func(i, j int) bool {
		a, b := cs[i], cs[j]
		if a.tier != b.tier {
			return a.tier < b.tier
		}
		if a.tier > 0 {
			return a.measure < b.measure
		}
		if a.steps != b.steps {
			return a.steps < b.steps
		}
		if math.Abs(a.effort-b.effort) > 1e-9 {
			return a.effort < b.effort
		}
		return a.measure < b.measure
	})
}

// newChoice makes the choice of a candidate, its events found in full on
// the linkage sampled afresh with its changes.
func (ev *evaluator) newChoice(c candidate, cs []curve) (*choice, error) {
	q, err := ev.eventsOf(cs, nil)
	if err != nil {
		return nil, &setting.Error{Field: "adjustments", Message: "The events cannot be found for the gear with the changes proposed: " + err.Error()}
	}
	ch := &choice{rounded: c.a, ideal: c.ideal, qAft: q}
	for k, v := range c.a {
		if v != 0 {
			ch.set = append(ch.set, k)
		}
	}
	return ch, nil
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
		if math.Abs(d) <= g.tol[i] {
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
