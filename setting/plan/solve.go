package plan

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Priority is what the plan makes equal, front against back. Connecting-rod
// angularity makes equal leads and equal cut-offs impossible at once, so
// the setter chooses.
type Priority string

// The priorities.
const (
	// EqualLeads makes the leads equal in every planned reverser position.
	EqualLeads Priority = "leads"
	// EqualCutOffs makes the cut-offs equal in the running notch.
	EqualCutOffs Priority = "cut-offs"
	// Balanced weighs lead differences (per 0.05 mm) against cut-off
	// differences (per 1 % of stroke) by Options.Weight.
	Balanced Priority = "balanced"
)

// Options are the setter's choices for a plan. The zero value plans equal
// leads in full forward gear, the running notches and full back gear.
type Options struct {
	Priority Priority
	// Weight is the share of the balance given to leads (0 to 1) when
	// Priority is Balanced; 0 means one half.
	Weight float64
	// Positions are the reverser positions the plan equalises; empty means
	// full forward, the engine's running notches and full back gear (a
	// fixed single eccentric has only the one).
	Positions []setting.Notch
	// RunningNotch names the notch whose cut-offs EqualCutOffs equalises;
	// empty means the engine's first running notch, or full forward.
	RunningNotch string
	// TargetLeadMM, when set, is the lead wanted at both ends; only gears
	// whose eccentric angles may be changed can meet it.
	TargetLeadMM *float64
	// Fit tunes the fit.
	Fit FitOptions
	// Cylinder is the index of the cylinder to plan.
	Cylinder int
	// Unit is the display unit of the lengths in the notes and in the
	// steps' words; Make uses the session's when it is empty, FromFit mm.
	Unit session.Unit
	// OtherLater leaves the plan made with the other priority (Plan.Other
	// and the note comparing the two) to a later Plan.AddOther call, so
	// that an app can show the plan first; the plan is then the same as
	// one made without it.
	OtherLater bool
}

// position is a reverser position run one way.
type position struct {
	notch setting.Notch
	dir   setting.Direction
}

func (p position) name() string { return p.notch.Name }

// positions returns the reverser positions a plan works on.
func positions(spec setting.EngineSpec, opt Options) []position {
	ns := opt.Positions
	if len(ns) == 0 {
		ns = []setting.Notch{{Name: session.FullForward, Reverser: 1}}
		ns = append(ns, spec.Notches...)
		ns = append(ns, setting.Notch{Name: session.FullBack, Reverser: -1})
	}
	if spec.Gear.Kind == setting.KindSingleEccentric && spec.Gear.SingleEccentric != nil {
		// A fixed eccentric ignores the reverser; a slip eccentric has its
		// two positions.
		f := []position{{setting.Notch{Name: session.FullForward, Reverser: 1}, setting.Forward}}
		if spec.Gear.SingleEccentric.Slip {
			f = append(f, position{setting.Notch{Name: session.FullBack, Reverser: -1}, setting.Backward})
		}
		return f
	}
	var out []position
	for _, n := range ns {
		for _, d := range setting.RunningDirections(n.Reverser) {
			out = append(out, position{n, d})
		}
	}
	return out
}

// runningIndex returns the index in ps of the running notch.
func runningIndex(spec setting.EngineSpec, ps []position, opt Options) int {
	name := opt.RunningNotch
	if name == "" && len(spec.Notches) > 0 {
		name = spec.Notches[0].Name
	}
	for i, p := range ps {
		if p.notch.Name == name {
			return i
		}
	}
	return 0
}

// knob is one allowed adjustment: the session's description and the
// deviation it changes.
type knob struct {
	adj   session.Adjustment
	p     param
	step  float64 // the smallest change hands can make, in the knob's unit
	scale float64 // a typical change, for regularisation
	// doubt is how far the predicted effect of a change may be off, as a
	// share of it (see effectDoubt).
	doubt float64
}

// knobsOf maps a session's adjustments to deviations; adjustments the
// model does not cover are returned as notes.
func knobsOf(spec setting.EngineSpec, adjs []session.Adjustment) ([]knob, []string) {
	var ks []knob
	var notes []string
	k := math.Max(1, spec.Engine.CrankRadius/25)
	kind := spec.Gear.Kind
	for _, a := range adjs {
		kb := knob{adj: a, p: -1}
		back := a.Eccentric == session.BackwardEccentric
		switch a.Kind {
		case session.ValveOnSpindle:
			kb.p = pValveOffset
		case session.EccentricAngle:
			if kind == setting.KindStephenson || kind == setting.KindSingleEccentric {
				kb.p = pEccFwd
				if back && kind == setting.KindStephenson {
					kb.p = pEccBack
				}
			}
		case session.EccentricRodLength:
			if kind != setting.KindStephenson || !back {
				kb.p = pRodFwd
			} else {
				kb.p = pRodBack
			}
		case session.ReturnCrankAngle:
			if kind == setting.KindWalschaerts {
				kb.p = pReturnCrank
			}
		case session.RadiusRodLength:
			if kind == setting.KindWalschaerts {
				kb.p = pRadiusRod
			}
		}
		if kb.p < 0 {
			notes = append(notes, fmt.Sprintf("The %s cannot be planned yet: the model does not cover it, so it is left as it is.", partName(a, kind)))
			continue
		}
		kb.step = handStep(a)
		kb.scale = 1 * k
		kb.doubt = knobDoubt(spec, a.Kind)
		if a.Kind.Angular() {
			kb.scale = 1
		}
		ks = append(ks, kb)
	}
	return ks, notes
}

// Rounding: what hands can do. A length made on a thread moves in steps
// of one flat (pitch / flats per turn; 6 flats when not given). A length
// with no thread given moves in 0.05 mm steps (a shim or a careful file).
// An eccentric sheave moves in steps of 0.5 mm round its rim (what can be
// marked and seen against a scribed line); without a sheave diameter, and
// for a return crank, in steps of 0.25 degree.
const (
	rimStepMM      = 0.5
	bareStepMM     = 0.05
	bareAngleStep  = 0.25
	defaultFlats   = 6
	rimAngleMinDeg = 0.01
)

// handStep returns the smallest change of an adjustment hands can make.
func handStep(a session.Adjustment) float64 {
	if a.Kind.Angular() {
		if a.Kind == session.EccentricAngle && a.SheaveDiameterMM > 0 {
			return math.Max(rimAngleMinDeg, rimStepMM/(a.SheaveDiameterMM/2)*180/math.Pi)
		}
		return bareAngleStep
	}
	p := a.Thread.Pitch()
	if !(p > 0) || !finite(p) {
		return bareStepMM
	}
	f := a.Thread.FlatsPerTurn
	if f <= 0 {
		f = defaultFlats
	}
	return p / float64(f)
}

// evaluator works out events and their gradients on a model.
//
// The optimiser and the rounding work on sampled curves (see curve): the
// fitted gear's valve curve in each position and, per knob, the curve of
// its effect, combined linearly; only the final prediction of the rounded
// plan samples the linkage afresh.
type evaluator struct {
	// spec is the engine as drawn with the steam laps as built; model the
	// fitted model, whose unmodelled parts the curves carry.
	spec     setting.EngineSpec
	model    Model
	fitRevs  []setting.Reverser // the fit's reverser positions, for q.group
	fitShape []unmodShape       // and the shapes of their unmodelled parts
	crank    setting.Crank
	ps       []position
	tr       *trig
	tr24     *trig     // for effect curves
	base     []curve   // per position, at the fitted deviations
	sens     [][]curve // per position, per knob: d(curve)/d(knob); nil for the spindle
	kEdge    [2]float64
}

// newEvaluator prepares an evaluator for an engine and positions.
func newEvaluator(spec setting.EngineSpec, crank setting.Crank, ps []position) *evaluator {
	ev := &evaluator{spec: spec, crank: crank, ps: ps, tr: curveTrig, tr24: effectTrig}
	for k := 0; k < 2; k++ {
		end := setting.CylinderEnd(k)
		ev.kEdge[k] = spec.Valve.SteamEdge(end, 1) - spec.Valve.SteamEdge(end, 0)
	}
	return ev
}

// curvesAt samples the valve curve (valve offset and unmodelled part
// included) of every position at deviations p.
func (ev *evaluator) curvesAt(p [numParams]float64) ([]curve, error) {
	cs, err := gearCurves(ev.spec, p, ev.revs(), ev.tr, true)
	if err != nil {
		return nil, err
	}
	for i := range cs {
		cs[i] = ev.model.corrected(cs[i], ev.ps[i].notch.Reverser)
	}
	return cs, nil
}

// revs returns the reverser position of each planned position.
func (ev *evaluator) revs() []setting.Reverser {
	out := make([]setting.Reverser, len(ev.ps))
	for i, p := range ev.ps {
		out[i] = p.notch.Reverser
	}
	return out
}

// setKnobs samples the curves at p and each knob's effect on them, taking
// the effect curves the fit already sampled where it has them (fit may be
// nil).
func (ev *evaluator) setKnobs(p [numParams]float64, ks []knob, fit *Fit) error {
	base, err := ev.curvesAt(p)
	if err != nil {
		return err
	}
	ev.base = base
	var at24 [][]float64 // base at the effects' angles, once needed
	ev.sens = make([][]curve, len(ev.ps))
	for i := range ev.ps {
		ev.sens[i] = make([]curve, len(ks))
	}
	for k, kb := range ks {
		if kb.p == pValveOffset {
			continue
		}
		if fit != nil {
			found := 0
			for i, pos := range ev.ps {
				for g, r := range fit.revs {
					if r == pos.notch.Reverser && fit.sens[g][kb.p] != nil {
						ev.sens[i][k] = fit.sens[g][kb.p]
						found++
						break
					}
				}
			}
			if found == len(ev.ps) {
				continue
			}
		}
		// A secant over a tenth of a typical change keeps the linear
		// model good across the changes a plan makes.
		h := 0.1 * kb.scale
		if at24 == nil {
			at24 = valuesAt(base, ev.tr24)
		}
		ds, err := effect(ev.spec, p, ev.revs(), ev.tr24, kb.p, h, at24, true)
		if err != nil {
			return err
		}
		for i := range ev.ps {
			ev.sens[i][k] = ds[i]
		}
	}
	return nil
}

// quick updates leads and cut-offs for new curves from the events of
// nearby curves prev: each lead is the steam edge at its dead centre, each
// cut-off the root of the steam edge found by Newton's method from the old
// cut-off angle. Where a cut-off is undefined or Newton's method fails it
// falls back to the full event search.
func (ev *evaluator) quick(cs []curve, prev []quantities, ks []knob) ([]quantities, error) {
	out := make([]quantities, len(ev.ps))
	for i := range ev.ps {
		q := prev[i]
		ok := true
		var lo, hi float64
		haveExt := false
		for k := 0; k < 2 && ok; k++ {
			end := setting.CylinderEnd(k)
			x, _ := cs[i].at(q.leadTheta[k])
			q.lead[k] = ev.spec.Valve.SteamEdge(end, x)
			if !q.cutOK && (q.cut[k] == 0 || q.cut[k] == 100) {
				// A port that did not open (or never closed): still so?
				// Looking at the curve every 5 degrees (an opening
				// narrower than that takes no steam).
				if !haveExt {
					lo, hi, haveExt = cs[i].extremes()
				}
				a, b := ev.spec.Valve.SteamEdge(end, lo), ev.spec.Valve.SteamEdge(end, hi)
				switch {
				case math.Max(a, b) <= 0:
					q.cut[k] = 0
				case math.Min(a, b) > 0:
					q.cut[k] = 100
				default:
					ok = false
				}
				continue
			}
			th := q.cutTheta[k]
			conv := false
			for it := 0; it < 30; it++ {
				x, dx := cs[i].at(th)
				f := ev.spec.Valve.SteamEdge(end, x)
				fd := ev.kEdge[k] * dx
				if fd == 0 {
					break
				}
				// Damped: near a long cut-off the edge is flat and a full
				// step could jump to the other crossing.
				step := math.Max(-5, math.Min(5, f/fd))
				th -= step
				if math.Abs(step) < 1e-9 {
					conv = true
					break
				}
			}
			if !conv || math.Abs(th-q.cutTheta[k]) > 30 {
				ok = false
				break
			}
			q.cutTheta[k] = wrap360(th)
			q.cut[k] = 100 * ev.crank.TravelFrom(end, q.cutTheta[k])
		}
		if !ok {
			full, err := ev.eventsOf([]curve{cs[i]}, nil, i)
			if err != nil {
				return nil, err
			}
			q = full[0]
		}
		ev.knobGrad(&q, cs[i], i, ks)
		out[i] = q
	}
	return out, nil
}

// extremes returns the least and greatest value of the curve looked at
// every 5 degrees.
func (c curve) extremes() (lo, hi float64, ok bool) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for th := 0.0; th < 360; th += 5 {
		x := c.value(th)
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	return lo, hi, true
}

// eventsOf finds the events of every position on the given curves; with
// ks it also fills the knobs' gradients from their effect curves.
func (ev *evaluator) eventsOf(cs []curve, ks []knob, only ...int) ([]quantities, error) {
	out := make([]quantities, len(cs))
	for ci := range cs {
		i := ci
		if len(only) > 0 {
			i = only[0]
		}
		pos := ev.ps[i]
		set, err := setting.Events(ev.spec.Engine, ev.spec.Valve, cs[ci].motion(), pos.dir)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", pos.name(), err)
		}
		q := quantities{ev: set}
		q.lead = [2]float64{set.Front.Lead, set.Back.Lead}
		q.cut = [2]float64{cutPercent(set.Front), cutPercent(set.Back)}
		q.cutOK = !set.Front.NeverOpens && !set.Front.NeverCloses && !set.Back.NeverOpens && !set.Back.NeverCloses
		q.leadTheta = [2]float64{0, ev.crank.BackDeadCentre()}
		q.cutTheta = [2]float64{set.Front.CutOff.CrankDeg, set.Back.CutOff.CrankDeg}
		ev.knobGrad(&q, cs[ci], i, ks)
		out[ci] = q
	}
	return out, nil
}

// knobGrad fills the knobs' gradients of position i's quantities from
// their effect curves.
func (ev *evaluator) knobGrad(q *quantities, c curve, i int, ks []knob) {
	if ks == nil {
		return
	}
	ev.gradFrom(q, c, ev.sens[i], ks)
}

// gradFrom fills the knobs' gradients of a position's quantities on curve
// c from the knobs' effect curves there (nil for the valve on its
// spindle, which moves the valve alike all round; a knob with no effect
// curve and another kind is left alone).
func (ev *evaluator) gradFrom(q *quantities, c curve, sens []curve, ks []knob) {
	var slope, dpct [2]float64
	const ht = 1e-3
	for k := 0; k < 2; k++ {
		_, slope[k] = c.at(q.cutTheta[k])
		end := setting.CylinderEnd(k)
		dpct[k] = 100 * (ev.crank.TravelFrom(end, q.cutTheta[k]+ht) - ev.crank.TravelFrom(end, q.cutTheta[k]-ht)) / (2 * ht)
	}
	for kk, kb := range ks {
		var dx [4]float64
		if kb.p == pValveOffset {
			dx = [4]float64{1, 1, 1, 1}
		} else {
			d := sens[kk]
			if d == nil {
				continue
			}
			dx = [4]float64{d.value(q.leadTheta[0]), d.value(q.leadTheta[1]), d.value(q.cutTheta[0]), d.value(q.cutTheta[1])}
		}
		q.grad[0][kb.p] = ev.kEdge[0] * dx[0]
		q.grad[1][kb.p] = ev.kEdge[1] * dx[1]
		for k := 0; k < 2; k++ {
			if q.cutOK && slope[k] != 0 {
				q.grad[2+k][kb.p] = -dx[2+k] / slope[k] * dpct[k]
			}
		}
	}
}

// quantities are the four numbers a plan balances per position.
type quantities struct {
	ev    setting.EventSet
	lead  [2]float64 // front, back, mm
	cut   [2]float64 // front, back, % of stroke
	cutOK bool
	grad  [4][numParams]float64 // d(lead f, lead b, cut f, cut b)/d(param)
	// cg is the same by the coefficients of the position's unmodelled
	// part (see Unmodelled), whose place among the fit's is group (an
	// index into Fit.revs; -1 when the readings did not cover it).
	cg    [4][5]float64
	group int
	// cutPerX is each end's cut-off change (% of stroke) for a valve moved
	// 1 mm at its cut-off (0 where the cut-off is not found).
	cutPerX   [2]float64
	cutTheta  [2]float64
	leadTheta [2]float64
}

// cutPercent is an end's cut-off in % of stroke: 0 when the port never
// opens, 100 when it never closes, so that a plan cannot make cut-offs
// "equal" by shutting a port.
func cutPercent(e setting.EndEvents) float64 {
	switch {
	case e.NeverOpens:
		return 0
	case e.NeverCloses:
		return 100
	}
	return e.CutOff.StrokePercent
}

// gradParams are the deviations that change events (the gauge zero and the
// dead-centre mark only change readings).
func gradParams() []param {
	return []param{pValveOffset, pEccFwd, pEccBack, pRodFwd, pRodBack, pReturnCrank, pRadiusRod}
}

// gradients fills q.grad by the implicit-function rule: a lead moves with
// the valve at dead centre; a cut-off's crank angle moves by
// -(dx/dp)/(dx/dtheta) at the cut-off.
func (ev *evaluator) gradients(p [numParams]float64, r setting.Reverser, q *quantities) error {
	e := ev.spec.Engine
	base, err := Model{Spec: ev.spec, Dev: devOf(p)}.Gear()
	if err != nil {
		return err
	}
	thetas := [4]float64{q.leadTheta[0], q.leadTheta[1], q.cutTheta[0], q.cutTheta[1]}
	var x0 [4]float64
	for k, th := range thetas {
		if x0[k], err = base.Valve(e, th, r); err != nil {
			return err
		}
	}
	var slope [2]float64 // dx/dtheta at the cut-offs, mm per degree
	var dpct [2]float64  // d(percent)/dtheta at the cut-offs
	const ht = 1e-3
	u := ev.model.correction(r)
	for k := 0; k < 2; k++ {
		a, err1 := base.Valve(e, thetas[2+k]+ht, r)
		b, err2 := base.Valve(e, thetas[2+k]-ht, r)
		if err := linkageError(err1, err2); err != nil {
			return err
		}
		slope[k] = (a - b) / (2 * ht)
		if u != nil {
			_, du := u.at(thetas[2+k])
			slope[k] += du
		}
		end := setting.CylinderEnd(k)
		dpct[k] = 100 * (ev.crank.TravelFrom(end, thetas[2+k]+ht) - ev.crank.TravelFrom(end, thetas[2+k]-ht)) / (2 * ht)
	}
	var kEdge [2]float64
	for k := 0; k < 2; k++ {
		end := setting.CylinderEnd(k)
		kEdge[k] = ev.spec.Valve.SteamEdge(end, 1) - ev.spec.Valve.SteamEdge(end, 0)
	}
	for _, j := range gradParams() {
		var dx [4]float64
		if j == pValveOffset {
			dx = [4]float64{1, 1, 1, 1}
		} else {
			// A step either way: the linkage may not close one way near
			// the end of its reach (then the effect is taken as none).
			for _, h := range []float64{stepOf(j), -stepOf(j)} {
				qp := p
				qp[j] += h
				g, err := Model{Spec: ev.spec, Dev: devOf(qp)}.Gear()
				if err != nil {
					return err
				}
				var d [4]float64
				ok := true
				for k, th := range thetas {
					x, err := g.Valve(e, th, r)
					if err != nil {
						ok = false
						break
					}
					d[k] = (x - x0[k]) / h
				}
				if ok {
					dx = d
					break
				}
			}
		}
		q.grad[0][j] = kEdge[0] * dx[0]
		q.grad[1][j] = kEdge[1] * dx[1]
		for k := 0; k < 2; k++ {
			if q.cutOK && slope[k] != 0 {
				q.grad[2+k][j] = -dx[2+k] / slope[k] * dpct[k]
			}
		}
	}
	// The steam laps: more lap, less lead and an earlier cut-off at that
	// end; the unmodelled part of this position's curve acts as a valve
	// displacement that varies round the turn.
	for k, j := range []param{pLapFront, pLapBack} {
		q.grad[k][j] = -1
		if q.cutOK && slope[k] != 0 {
			q.grad[2+k][j] = dpct[k] / (kEdge[k] * slope[k])
		}
	}
	for k := 0; k < 2; k++ {
		q.cutPerX[k] = 0
		if q.cutOK && slope[k] != 0 {
			q.cutPerX[k] = -dpct[k] / slope[k]
		}
	}
	q.group = -1
	for g, rg := range ev.fitRevs {
		if rg == r {
			q.group = g
		}
	}
	if q.group >= 0 && q.group < len(ev.fitShape) {
		sh := ev.fitShape[q.group]
		for k := 0; k < 2; k++ {
			bl, bc := sh.at(thetas[k]), sh.at(thetas[2+k])
			for m := 0; m < 5; m++ {
				q.cg[k][m] = kEdge[k] * bl[m]
				if q.cutOK && slope[k] != 0 {
					q.cg[2+k][m] = -bc[m] / slope[k] * dpct[k]
				}
			}
		}
	}
	return nil
}

// changeWeight prices a change of a knob by a typical amount (1 mm or 1
// degree) like a lead difference of 0.0002 mm: far below anything the
// readings or the rounding can see, but enough that where several knobs
// act alike (a Stephenson spindle and both rods together) the plan takes
// the smallest changes, and that choice does not swing with the readings.
const changeWeight = 0.02

// effectDoubt is how far the predicted effect of a change may be off, as
// a share of it: the drawing's dimensions are not the engine's, and a
// model the readings bent to fit moves events a few per cent otherwise
// than the engine (common practice, no source). The solver prices each
// knob's change by it (see ridge), so that it never buys a small gain
// with large changes that cancel one another: their errors would not.
const effectDoubt = 0.05

// Doubts of a knob's effect besides effectDoubt: the valve on its spindle
// moves the valve by exactly the change, so both leads by it (only the
// ports' shapes, known from the port marks, stand between: 1 %); a rod
// acting through a rocker moves it by the ratio of the rocker's arms,
// which a build leaves a few per cent off the drawing (10 %). Common
// practice, no source.
const (
	spindleDoubt = 0.01
	rockerDoubt  = 0.10
)

// knobDoubt returns the doubt of the effect of an adjustment of kind on
// the engine spec describes.
func knobDoubt(spec setting.EngineSpec, kind session.AdjustmentKind) float64 {
	switch {
	case kind == session.ValveOnSpindle:
		return spindleDoubt
	case kind == session.EccentricRodLength && spec.Gear.SingleEccentric != nil && spec.Gear.SingleEccentric.Rocker != nil:
		return rockerDoubt
	}
	return effectDoubt
}

// ridge returns, per knob, what the solver adds to the diagonal of its
// normal equations: the small change weight, and the doubt of the knob's
// effect on every term (its doubt times its gradient, squared).
func ridge(ks []knob, ts []term, q []quantities) []float64 {
	out := make([]float64, len(ks))
	for i, k := range ks {
		s := 0.0
		for _, t := range ts {
			s += sq(t.grad(q, k.p))
		}
		out[i] = sq(changeWeight/k.scale) + sq(k.doubt)*s + 1e-12
	}
	return out
}

// objective is what the solver drives to zero: weighted terms per
// position.
type objective struct {
	prio    Priority
	weight  float64
	running int
	target  *float64
	// design is the drawing's mean lead per position.
	design []float64
	// designEnds is the drawing's lead at each end (front, back) per
	// position.
	designEnds [][2]float64
	full       []bool // positions in full gear, where a target lead applies
	// wLead and wCut weigh each position's differences by how well the
	// readings know them (see weighing); nil weighs all alike.
	wLead, wCut []float64
	// cutLost marks the positions where a port does not open or never
	// closes today: their cut-offs cannot guide a change.
	cutLost []bool
	// mean marks the positions whose mean lead the plan holds: at the
	// target in full gear when one is set, else at the drawing's. Only
	// an eccentric sheave moves the mean lead, so it is held only where
	// sheaves may be turned (see sheavePolicy).
	mean []bool
}

// otherNotchCut weighs the cut-off difference of a position other than
// the running notch when the plan makes cut-offs equal: the running notch
// first, but full forward and full back are not given away for it.
const otherNotchCut = 0.85

// term is one weighted residual: coefficients on the four quantities of a
// position, plus a constant.
type term struct {
	pos   int
	coef  [4]float64
	c     float64
	scale float64 // divides the residual
	w     float64 // multiplies it
	what  string
}

func (o objective) terms(n int) []term {
	var ts []term
	wl, wc := 1.0, 1e-2
	sl, sc := 0.01, 1.0
	switch o.prio {
	case EqualCutOffs:
		wl, wc = 1e-2, 1
		sl, sc = 0.05, 0.1
	case Balanced:
		w := o.weight
		if !(w > 0 && w < 1) {
			w = 0.5
		}
		wl, wc = math.Sqrt(w), math.Sqrt(1-w)
		sl, sc = 0.05, 1
	}
	for i := 0; i < n; i++ {
		pl, pc := 1.0, 1.0
		if i < len(o.wLead) {
			pl, pc = o.wLead[i], o.wCut[i]
		}
		lw := wl
		cw := wc
		if o.prio == EqualCutOffs && i != o.running {
			cw = otherNotchCut
		}
		if i < len(o.cutLost) && o.cutLost[i] && o.prio != EqualLeads {
			// A port that does not open (or never closes) has no
			// cut-off to move: its leads say which way the valve must
			// go until it has.
			lw = math.Max(lw, cw)
		}
		ts = append(ts, term{pos: i, coef: [4]float64{1, -1, 0, 0}, scale: sl, w: lw * pl, what: "lead"})
		ts = append(ts, term{pos: i, coef: [4]float64{0, 0, 1, -1}, scale: sc, w: cw * pc, what: "cut"})
		if i >= len(o.mean) || !o.mean[i] {
			continue
		}
		switch {
		case o.target != nil && (o.full == nil || o.full[i]):
			ts = append(ts, term{pos: i, coef: [4]float64{0.5, 0.5, 0, 0}, c: -*o.target, scale: sl, w: pl, what: "target"})
		case i < len(o.design):
			ts = append(ts, term{pos: i, coef: [4]float64{0.5, 0.5, 0, 0}, c: -o.design[i], scale: 0.05, w: pl, what: "design"})
		}
	}
	return ts
}

// value returns a term's weighted residual.
func (t term) value(q []quantities) float64 {
	v := [4]float64{q[t.pos].lead[0], q[t.pos].lead[1], q[t.pos].cut[0], q[t.pos].cut[1]}
	s := t.c
	for k := range v {
		s += t.coef[k] * v[k]
	}
	return t.w * s / t.scale
}

// grad returns a term's gradient with respect to parameter j.
func (t term) grad(q []quantities, j param) float64 {
	if t.what == "cut" && !q[t.pos].cutOK {
		return 0
	}
	s := 0.0
	for k := range t.coef {
		s += t.coef[k] * q[t.pos].grad[k][j]
	}
	return t.w * s / t.scale
}

func sumSquares(ts []term, q []quantities) float64 {
	s := 0.0
	for _, t := range ts {
		s += sq(t.value(q))
	}
	return s
}
