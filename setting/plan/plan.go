package plan

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// EndState is one end's events in one reverser position, with one
// standard deviation of each from the readings' errors.
type EndState struct {
	LeadMM           float64 `json:"lead_mm"`
	LeadSigmaMM      float64 `json:"lead_sigma_mm"`
	CutOffPercent    float64 `json:"cut_off_percent"` // % of the stroke from this end
	CutOffSigmaPct   float64 `json:"cut_off_sigma_percent"`
	ReleasePercent   float64 `json:"release_percent"`
	CompressionPct   float64 `json:"compression_percent"`
	MaxOpeningMM     float64 `json:"max_opening_mm"`
	NeverOpens       bool    `json:"never_opens,omitempty"`
	NeverCloses      bool    `json:"never_closes,omitempty"`
	AdmissionBeforeD float64 `json:"admission_before_deg"` // crank degrees before dead centre the port opens
}

// PositionState is the events of both ends in one reverser position,
// running one way.
type PositionState struct {
	Notch     string            `json:"notch"`
	Reverser  float64           `json:"reverser"`
	Direction setting.Direction `json:"-"`
	Running   string            `json:"direction"` // "forward" or "backward"
	Front     EndState          `json:"front"`
	Back      EndState          `json:"back"`
}

// Step is one adjustment of a plan, in the order a setter makes them.
type Step struct {
	// Part names what is changed ("backward eccentric rod").
	Part      string                 `json:"part"`
	Kind      session.AdjustmentKind `json:"kind"`
	Eccentric session.Eccentric      `json:"eccentric,omitempty"`
	// Unit is "mm" or "deg".
	Unit string `json:"unit"`
	// Sign says what a positive amount means.
	Sign string `json:"sign"`
	// IdealAmount is the change the solver found; Amount is it rounded to
	// what hands can do (see the rounding rules in the package doc), both
	// signed by Sign. SigmaAmount is one standard deviation of the ideal
	// change from the readings' errors, with the other steps made as
	// planned.
	IdealAmount float64 `json:"ideal_amount"`
	Amount      float64 `json:"amount"`
	SigmaAmount float64 `json:"sigma_amount"`
	// Turns and Flats are the rounded change on the thread (whole turns
	// and the flats beyond them); zero for angular kinds.
	Turns int `json:"turns,omitempty"`
	Flats int `json:"flats,omitempty"`
	// RimMM is the rounded change measured round the sheave rim (angular
	// eccentric changes with a sheave diameter).
	RimMM float64 `json:"rim_mm,omitempty"`
	// AtLimit is true when the change stops at the profile's limit.
	AtLimit bool `json:"at_limit,omitempty"`
	// Words is the step in workshop words.
	Words string `json:"words"`

	perTurn int // flats per turn of the thread, for the words
}

// IdealChange is one adjuster's change in a plan's continuous solution,
// signed as its kind says (see Step.Sign), in Unit ("mm" or "deg").
type IdealChange struct {
	Kind      session.AdjustmentKind `json:"kind"`
	Eccentric session.Eccentric      `json:"eccentric,omitempty"`
	Unit      string                 `json:"unit"`
	Amount    float64                `json:"amount"`
}

// idealWords says a change too small to make in words: "0.12 mm
// shorter", "0.30 deg advanced".
func idealWords(k knob, amount float64, unit session.Unit) string {
	a := math.Abs(amount)
	switch k.adj.Kind {
	case session.ValveOnSpindle:
		if amount < 0 {
			return "moving " + length(a, unit) + " toward the back"
		}
		return "moving " + length(a, unit) + " toward the front cover"
	case session.EccentricAngle:
		if amount < 0 {
			return fmt.Sprintf("%.2f deg less advance", a)
		}
		return fmt.Sprintf("%.2f deg more advance", a)
	case session.ReturnCrankAngle:
		return fmt.Sprintf("turning %.2f deg", a)
	}
	if amount < 0 {
		return length(a, unit) + " shorter"
	}
	return length(a, unit) + " longer"
}

// Alternative is a plan made with another priority: its steps and what the
// engine would do after them.
type Alternative struct {
	Priority Priority        `json:"priority"`
	Steps    []Step          `json:"steps"`
	After    []PositionState `json:"after"`
}

// Plan is what to change, with today's events and those predicted after
// the rounded changes.
type Plan struct {
	Engine   string   `json:"engine"`
	Cylinder string   `json:"cylinder"`
	Priority Priority `json:"priority"`
	// Steps are the rounded changes in working order; empty when nothing
	// the engine allows would make it better.
	Steps []Step `json:"steps"`
	// Ideal is the continuous solution the steps were rounded from: the
	// change of every adjuster the plan works with, as if it could be set
	// exactly. An adjuster whose change rounds to nothing is here but not
	// among the steps (a note says so).
	Ideal []IdealChange `json:"ideal_changes"`
	// Now are the events as the readings show them; After those predicted
	// after the rounded steps.
	Now   []PositionState `json:"now"`
	After []PositionState `json:"after"`
	// Other is the plan made with the other priority, for the setter to
	// compare (angularity makes them differ).
	Other *Alternative `json:"other,omitempty"`
	// Notes are sentences for the setter: angularity, readings to recheck,
	// what the readings could not decide and which reading to take next.
	Notes []string `json:"notes"`
	// Recheck are readings far from the rest.
	Recheck []Residual `json:"recheck"`
	// NextReading says which reading would help most, or is empty.
	NextReading string `json:"next_reading,omitempty"`
	// FitRMSMM is the root-mean-square residual of the fit.
	FitRMSMM float64 `json:"fit_rms_mm"`
	// Deviations are the fitted as-built deviations.
	Deviations Deviations `json:"deviations"`
	// Cautions are the safety cautions printed with every plan.
	Cautions []string `json:"cautions"`

	fit *Fit
	// give are the steps of the give-and-take plan a note offers (see
	// giveFar), nil when none is.
	give []Step
	// later is the other priority's plan still to make (Options.OtherLater).
	later *otherWork
	// sets are the full event sets behind Now and After, and the steps
	// After was worked out for (see EventSets).
	sets struct {
		now, after []setting.EventSet
		steps      []Step
	}
}

// otherWork is what AddOther needs to make the plan with the other
// priority: the evaluator and the main plan, and where the note comparing
// them goes among the notes.
type otherWork struct {
	ev      *evaluator
	p       [numParams]float64
	ks      []knob
	qNow    []quantities
	obj     objective
	canLead bool
	fit     *Fit
	unit    session.Unit
	main    *planned
	prio    Priority
	running int
	noteAt  int
}

// GiveAndTake returns the steps of the give-and-take plan the notes
// offer (a position left far apart closed at the cost of another ending
// worse by up to twice what its readings tell), or nil.
func (p *Plan) GiveAndTake() []Step { return p.give }

// OtherPending reports whether the plan with the other priority is still
// to be made (see Options.OtherLater and AddOther).
func (p *Plan) OtherPending() bool { return p.later != nil }

// AddOther makes the plan with the other priority that Options.OtherLater
// left out: it sets Other and puts the note comparing the two priorities
// where FromFit would have put it, so the plan is then the same as one
// made at once. Without the other plan pending it does nothing. When the
// other priority cannot be planned the plan stays without it, as FromFit
// leaves it.
func (p *Plan) AddOther() {
	w := p.later
	if w == nil {
		return
	}
	p.later = nil
	alt, err := w.ev.plan(w.p, w.ks, w.qNow, w.obj, w.canLead, w.fit, w.unit)
	if err != nil {
		return
	}
	p.Other = &Alternative{Priority: w.obj.prio, Steps: alt.steps, After: alt.after}
	for i := range p.Other.Steps {
		p.Other.Steps[i].Words = stepWords(p.Other.Steps[i], w.unit)
	}
	note := angularityNote(w.main, alt, w.prio, w.running, w.unit)
	at := min(w.noteAt, len(p.Notes))
	p.Notes = append(p.Notes[:at:at], append([]string{note}, p.Notes[at:]...)...)
}

// EventSets returns the full event sets (setting.Events) behind Now and
// After, in their order, so a diagram need not find them again. now is
// nil for a plan not made by FromFit (one decoded from JSON); after is nil
// as well once Steps no longer hold what the plan made (a what-if copy
// with other amounts), since After no longer follows from them.
func (p *Plan) EventSets() (now, after []setting.EventSet) {
	now = p.sets.now
	if len(p.Steps) != len(p.sets.steps) {
		return now, nil
	}
	for i, st := range p.Steps {
		was := p.sets.steps[i]
		if st.Kind != was.Kind || st.Eccentric != was.Eccentric || st.Amount != was.Amount {
			return now, nil
		}
	}
	return now, p.sets.after
}

// Make fits cylinder opt.Cylinder of a session and plans its adjustments.
// Errors are *setting.Error sentences: too few readings, identical
// readings, readings that contradict one another, a profile with nothing
// to adjust.
func Make(s *session.Session, opt Options) (*Plan, error) {
	if s == nil {
		return nil, &setting.Error{Field: "session", Message: "There is no session."}
	}
	if opt.Cylinder < 0 || opt.Cylinder >= len(s.Cylinders) {
		return nil, &setting.Error{Field: "cylinders", Message: fmt.Sprintf("There is no cylinder %d; the session has %d.", opt.Cylinder, len(s.Cylinders))}
	}
	if opt.Unit == "" {
		opt.Unit = s.DisplayUnit
	}
	fit, err := FitSession(s, opt.Cylinder, opt.Fit)
	if err != nil {
		return nil, err
	}
	p, err := FromFit(fit, s.Adjustments, opt)
	if err != nil {
		return nil, err
	}
	p.Cylinder = s.Cylinders[opt.Cylinder].Name
	return p, nil
}

// FromFit plans the adjustments for a fitted cylinder.
func FromFit(fit *Fit, adjs []session.Adjustment, opt Options) (*Plan, error) {
	drawn := fit.Model.Spec
	spec := drawn
	spec.Valve = fit.Model.Valve()
	switch opt.Priority {
	case "":
		opt.Priority = EqualLeads
	case EqualLeads, EqualCutOffs, Balanced:
	default:
		return nil, &setting.Error{Field: "priority", Message: fmt.Sprintf("The priority %q is not known; choose leads, cut-offs or balanced.", opt.Priority)}
	}
	if opt.TargetLeadMM != nil && !finite(*opt.TargetLeadMM) {
		return nil, &setting.Error{Field: "target_lead", Message: "The target lead must be a length in mm."}
	}
	crank, err := spec.Engine.Prepare()
	if err != nil {
		return nil, err
	}
	ks, notes := knobsOf(spec, adjs)
	if len(ks) == 0 {
		return nil, &setting.Error{Field: "adjustments", Message: "The engine's profile allows no adjustment the planner can use: list at least the valve on its spindle."}
	}
	ps := positions(spec, opt)
	ev := newEvaluator(spec, crank, ps)
	ev.model, ev.fitRevs, ev.fitShape = fit.Model, fit.revs, fit.shape
	p := fit.Model.Dev.vec()
	canLead := false
	for _, k := range ks {
		if k.p == pEccFwd || k.p == pEccBack {
			canLead = true
		}
	}
	running := runningIndex(spec, ps, opt)
	design, full, ends, err := designLeads(ev, drawn, ps)
	if err != nil {
		return nil, err
	}
	plan := &Plan{Engine: spec.Name, Priority: opt.Priority, fit: fit, FitRMSMM: fit.RMSMM, Deviations: fit.Model.Dev, Recheck: fit.Recheck, Cautions: setting.Cautions()}
	if plan.Recheck == nil {
		plan.Recheck = []Residual{}
	}
	plan.Notes = append(plan.Notes, fit.RecheckMessages(opt.Unit)...)
	plan.Notes = append(plan.Notes, fit.Findings(opt.Unit)...)
	targetAt := len(plan.Notes) // where a target lead not met is said
	plan.Notes = append(plan.Notes, notes...)

	if err := ev.setKnobs(p, ks, fit); err != nil {
		return nil, &setting.Error{Field: "engine.gear", Message: "The fitted gear cannot close all round: " + err.Error()}
	}
	qNow, err := ev.eventsOf(ev.base, nil)
	if err != nil {
		return nil, &setting.Error{Field: "engine.gear", Message: "The events cannot be found for the fitted gear: " + err.Error()}
	}
	for i := range qNow {
		if err := ev.gradients(p, ev.ps[i].notch.Reverser, &qNow[i]); err != nil {
			return nil, err
		}
	}
	main, err := ev.plan(p, ks, qNow, objective{prio: opt.Priority, weight: opt.Weight, running: running, target: opt.TargetLeadMM, design: design, designEnds: ends, full: full}, canLead, fit, opt.Unit)
	if err != nil {
		return nil, err
	}
	plan.Steps, plan.Now, plan.After, plan.Ideal = main.steps, main.now, main.after, main.ideal
	plan.sets.steps = append([]Step(nil), main.steps...)
	for i := range main.qNow {
		plan.sets.now = append(plan.sets.now, main.qNow[i].ev)
		plan.sets.after = append(plan.sets.after, main.qAft[i].ev)
	}
	plan.Notes = append(plan.Notes, main.notes...)
	plan.give = main.give
	if opt.TargetLeadMM != nil {
		missed := targetNotes(*opt.TargetLeadMM, spec.Gear.Kind, ks, ps, main.after, main.steps, opt.Unit)
		plan.Notes = append(plan.Notes[:targetAt:targetAt], append(missed, plan.Notes[targetAt:]...)...)
	}
	other := EqualCutOffs
	if opt.Priority == EqualCutOffs {
		other = EqualLeads
	}
	plan.later = &otherWork{ev: ev, p: p, ks: ks, qNow: qNow, obj: objective{prio: other, running: running, target: opt.TargetLeadMM, design: design, designEnds: ends, full: full},
		canLead: canLead, fit: fit, unit: opt.Unit, main: main, prio: opt.Priority, running: running, noteAt: len(plan.Notes)}
	if !opt.OtherLater {
		plan.AddOther()
	}
	if len(plan.Steps) == 0 {
		plan.Notes = append(plan.Notes, "Nothing to change: no change the engine allows, in steps hands can make, would make it better by this priority by more than the readings can tell without leaving another position worse.")
	} else {
		plan.Notes = append(plan.Notes, "After the steps, take the port marks and the dead-centre readings again as a new round, to check the result before anything else is changed.")
	}
	if next := nextReading(fit, ev, main, ks); next != "" {
		plan.NextReading = next
		plan.Notes = append(plan.Notes, next)
	}
	for _, u := range fit.Undecided {
		if u == pDeadCentre.name() {
			continue
		}
		plan.Notes = append(plan.Notes, fmt.Sprintf("The readings cannot tell the %s apart from other errors that act alike; the plan does not depend on it, but the fitted value is only a guess.", u))
	}
	for i := range plan.Steps {
		plan.Steps[i].Words = stepWords(plan.Steps[i], opt.Unit)
	}
	if plan.Notes == nil {
		plan.Notes = []string{}
	}
	return plan, nil
}

// designLeads returns the drawing's mean lead in each position, which
// positions are full gear, and each end's lead.
func designLeads(ev *evaluator, drawn setting.EngineSpec, ps []position) ([]float64, []bool, [][2]float64, error) {
	g, err := Model{Spec: drawn}.Gear()
	if err != nil {
		return nil, nil, nil, err
	}
	ends := make([][2]float64, len(ps))
	design := make([]float64, len(ps))
	full := make([]bool, len(ps))
	anyFull := false
	for i := range ps {
		var lead [2]float64
		for k, th := range []float64{0, ev.crank.BackDeadCentre()} {
			x, err := g.Valve(ev.spec.Engine, th, ps[i].notch.Reverser)
			if err != nil {
				return nil, nil, nil, &setting.Error{Field: "engine.gear", Message: "The gear as drawn cannot close at a dead centre: " + err.Error()}
			}
			lead[k] = drawn.Valve.SteamEdge(setting.CylinderEnd(k), x)
		}
		ends[i] = lead
		design[i] = (lead[0] + lead[1]) / 2
		full[i] = math.Abs(float64(ps[i].notch.Reverser)) == 1
		anyFull = anyFull || full[i]
	}
	if !anyFull {
		full = nil
	}
	return design, full, ends, nil
}

// planned is one solved plan.
type planned struct {
	steps      []Step
	ideal      []IdealChange
	now, after []PositionState
	qNow, qAft []quantities
	prio       Priority
	notes      []string // what the plan chose and what rounding leaves
	give       []Step   // the give-and-take plan's steps, when one is offered
}

// plan solves, rounds and describes one priority.
func (ev *evaluator) plan(p [numParams]float64, ks []knob, qNow []quantities, obj objective, canLead bool, fit *Fit, unit session.Unit) (*planned, error) {
	g := ev.weighing(&obj, qNow, fit)
	pol := ev.sheavePolicy(ks, qNow, obj, canLead, fit, unit)
	obj.mean = pol.mean
	obj.cutLost = make([]bool, len(qNow))
	for i, q := range qNow {
		obj.cutLost[i] = !q.cutOK
	}
	ts := obj.terms(len(ev.ps))
	ch, err := ev.choose(p, ks, ts, qNow, g, pol.usable)
	if err != nil {
		return nil, err
	}
	// Where no step keeps every position within what the plan allows
	// itself, but letting one end worse by up to twice what its readings
	// tell closes a difference far larger, that trade is the plan: the
	// readings cannot tell that position's change from none, and the
	// setter is not told there is nothing to change while there is
	// (issue 11: refuse only when nothing measurable can be gained).
	var traded string
	if !hasSteps(ch) {
		if t, ok, err := ev.trade(p, ks, ts, qNow, ch, g, pol.usable, unit); err == nil && ok {
			ch = t.ch
			traded = fmt.Sprintf("No step keeps every position as close as the plan allows itself, so the steps let the %s in %s go further apart, within twice what the readings tell, to bring %s from %s apart to %s at the most.",
				g.what(), strings.Join(t.worse, " and "), ev.ps[t.wi].name(), g.amount(t.worst, unit), g.amount(t.worstAfter, unit))
		}
	}
	rounded := ch.rounded
	out := &planned{prio: obj.prio, qNow: qNow, qAft: ch.qAft, notes: pol.notes}
	if traded != "" {
		out.notes = append(out.notes, traded)
	}
	for _, sl := range pol.slipped {
		if ch.rounded[sl.k] != 0 {
			out.notes = append(out.notes, sl.note+" The plan turns the sheave back.")
		} else {
			out.notes = append(out.notes, sl.note+" The plan leaves it as it is: turning it would not bring this priority closer in steps hands can make. Check its key or grub screw.")
		}
	}
	out.now = ev.states(qNow, fit)
	// The rounded plan's events come from the linkage solved afresh; their
	// errors are today's (the plan adds none the readings can see).
	qAftG := append([]quantities(nil), ch.qAft...)
	for i := range qAftG {
		qAftG[i].grad = qNow[i].grad
	}
	out.after = ev.states(qAftG, fit)
	// Uncertainty of the steps made: the ideal change's sensitivity to
	// the fitted deviations, -(A^T A + R)^-1 A^T B, through the fit's
	// covariance, over the knobs the plan moves.
	sub := make([]knob, len(ch.set))
	for j, k := range ch.set {
		sub[j] = ks[k]
	}
	ideal := ch.ideal
	sigSub := ev.stepSigmas(sub, ts, qNow, fit)
	sig := make([]float64, len(ks))
	for j, k := range ch.set {
		sig[k] = sigSub[j]
	}
	for _, i := range workOrder(ev.spec.Gear.Kind, ks) {
		if ideal[i] != 0 {
			u := "mm"
			if ks[i].adj.Kind.Angular() {
				u = "deg"
			}
			out.ideal = append(out.ideal, IdealChange{Kind: ks[i].adj.Kind, Eccentric: ks[i].adj.Eccentric, Unit: u, Amount: clean(ideal[i])})
		}
		if rounded[i] == 0 {
			if math.Abs(ideal[i]) >= 0.25*ks[i].step {
				smallest := length(ks[i].step, unit)
				if ks[i].adj.Kind.Angular() {
					smallest = fmt.Sprintf("%.2f deg", ks[i].step)
				}
				why := fmt.Sprintf("less than its smallest step (%s)", smallest)
				if math.Abs(ideal[i]) >= ks[i].step/2 {
					why = fmt.Sprintf("but in whole steps of %s it would leave another position worse", smallest)
				}
				out.notes = append(out.notes, fmt.Sprintf("The %s would want %s, %s: it is left as it is. A finer adjuster there would let this come closer.",
					partName(ks[i].adj, ev.spec.Gear.Kind), idealWords(ks[i], ideal[i], unit), why))
			}
			continue
		}
		st := newStep(ks[i], ev.spec.Gear.Kind, ideal[i], rounded[i])
		st.SigmaAmount = clean(sig[i])
		out.steps = append(out.steps, st)
	}
	if out.ideal == nil {
		out.ideal = []IdealChange{}
	}
	if out.steps == nil {
		out.steps = []Step{}
	}
	out.notes = append(out.notes, ev.leftNotes(ks, pol.usable, qNow, ch, g, unit)...)
	if traded != "" {
		return out, nil
	}
	if note, alt, err := ev.giveAndTake(p, ks, ts, qNow, ch, g, pol.usable, unit); err == nil && note != "" {
		out.notes = append(out.notes, note)
		out.give = alt
	}
	return out, nil
}

// Give and take: where the plan leaves a position's leads far apart
// because closing them would leave another position worse by more than
// the plan allows itself, the plan made again allowing each position to
// end worse by up to twice what its readings can tell (common practice,
// no source: a setter trades a hair he can barely measure for a
// difference he can see). Said only when that brings the worst position
// left under half of it: as a note beside a plan that makes steps, and as
// the plan itself where the strict plan would make none.
const (
	// giveFar is how many of the plan's own tolerances a difference left
	// must be for the trade to be looked at.
	giveFar = 5.0
	// giveTell is how many of a difference's standard deviations the
	// trade may let a position end worse by.
	giveTell = 2.0
)

// trade is a plan made again allowing positions to end worse by up to
// twice what their readings tell (see giveFar): its choice, the position
// the first plan leaves furthest apart (wi, worst), the worst the trade
// leaves, and the positions it lets go, in words.
type trade struct {
	ch         *choice
	wi         int
	worst      float64
	worstAfter float64
	worse      []string
}

// trade looks for the trade (see giveFar) beside choice ch; false when
// there is none worth saying.
func (ev *evaluator) trade(p [numParams]float64, ks []knob, ts []term, qNow []quantities, ch *choice, g goal, usable []bool, unit session.Unit) (trade, bool, error) {
	if g.prio == Balanced {
		return trade{}, false, nil
	}
	worst, wi, far := 0.0, -1, false
	for i, q := range ch.qAft {
		d := math.Abs(g.diff(q))
		if d > worst {
			worst, wi = d, i
		}
		far = far || d > giveFar*g.tol[i]
	}
	if !far || wi < 0 {
		return trade{}, false, nil
	}
	g2 := g
	g2.tol = make([]float64, len(g.tol))
	loosened := false
	for i := range g.tol {
		g2.tol[i] = g.tol[i]
		if !math.IsInf(g.sd[i], 1) {
			// (A position whose reading is to be taken again gives nothing.)
			g2.tol[i] = math.Max(g.tol[i], giveTell*g.sd[i])
		}
		loosened = loosened || g2.tol[i] > g.tol[i]
	}
	if !loosened {
		return trade{}, false, nil
	}
	// Worth a second search only if it is not the adjusters' steps that
	// leave it (no knob's one step there is as large), and if the knobs
	// could close it at all: on the linear model, with nothing held back,
	// the worst position left under half of it.
	for k, kb := range ks {
		gd := math.Abs(qNow[wi].grad[0][kb.p] - qNow[wi].grad[1][kb.p])
		if g.prio == EqualCutOffs {
			gd = math.Abs(qNow[wi].grad[2][kb.p] - qNow[wi].grad[3][kb.p])
		}
		if usable[k] && !isSheave(kb) && gd*kb.step > 1e-6 && worst <= gd*kb.step {
			return trade{}, false, nil
		}
	}
	var all []int
	for k := range ks {
		if usable[k] {
			all = append(all, k)
		}
	}
	lin := make([]quantities, len(qNow))
	linearAt(qNow, ks, subsetIdeal(ks, ts, qNow, all), lin)
	free := 0.0
	for i := range lin {
		free = math.Max(free, math.Abs(g.diff(lin[i])))
	}
	if !(free < worst/2) {
		return trade{}, false, nil
	}
	ch2, err := ev.choose(p, ks, ts, qNow, g2, usable)
	if err != nil || len(ch2.set) == 0 {
		return trade{}, false, err
	}
	t := trade{ch: ch2, wi: wi, worst: worst}
	for i, q := range ch2.qAft {
		d := math.Abs(g.diff(q))
		t.worstAfter = math.Max(t.worstAfter, d)
		if d > math.Abs(g.diff(qNow[i]))+g.tol[i] {
			t.worse = append(t.worse, fmt.Sprintf("%s (to %s)", ev.ps[i].name(), g.amount(d, unit)))
		}
	}
	if !(t.worstAfter < worst/2) || len(t.worse) == 0 {
		return trade{}, false, nil
	}
	return t, true, nil
}

// giveAndTake returns the note of the trade (see giveFar) and its steps,
// or "".
func (ev *evaluator) giveAndTake(p [numParams]float64, ks []knob, ts []term, qNow []quantities, ch *choice, g goal, usable []bool, unit session.Unit) (string, []Step, error) {
	if g.prio != EqualLeads {
		return "", nil, nil
	}
	t, ok, err := ev.trade(p, ks, ts, qNow, ch, g, usable, unit)
	if !ok || err != nil {
		return "", nil, err
	}
	var steps []Step
	var words []string
	for _, i := range workOrder(ev.spec.Gear.Kind, ks) {
		if t.ch.rounded[i] != 0 {
			st := newStep(ks[i], ev.spec.Gear.Kind, t.ch.ideal[i], t.ch.rounded[i])
			st.Words = stepWords(st, unit)
			steps = append(steps, st)
			words = append(words, st.Words)
		}
	}
	return fmt.Sprintf("Give and take: the plan above leaves the leads in %s %s apart. If the leads in %s may go further apart than the plan allows itself (but within twice what the readings tell), no position need be left more than %s apart. These steps instead of the plan's: %s",
		ev.ps[t.wi].name(), length(t.worst, unit), strings.Join(t.worse, " and "), length(t.worstAfter, unit), strings.Join(words, " ")), steps, nil
}

// what names the differences the goal equalises.
func (g goal) what() string {
	if g.prio == EqualCutOffs {
		return "cut-offs"
	}
	return "leads"
}

// amount says a difference the goal equalises: a length, or % of the
// stroke.
func (g goal) amount(d float64, unit session.Unit) string {
	if g.prio == EqualCutOffs {
		return fmt.Sprintf("%.1f %% of the stroke", d)
	}
	return length(d, unit)
}

// hasSteps reports whether a choice changes anything.
func hasSteps(ch *choice) bool {
	for _, a := range ch.rounded {
		if a != 0 {
			return true
		}
	}
	return false
}

func applyKnobs(p [numParams]float64, ks []knob, a []float64) [numParams]float64 {
	for i, k := range ks {
		p[k.p] += a[i]
	}
	return p
}

// clean turns -0 and non-finite values into 0.
func clean(x float64) float64 {
	if !finite(x) || x == 0 {
		return 0
	}
	return x
}

// stepSigmas returns one standard deviation of each knob's ideal change.
func (ev *evaluator) stepSigmas(ks []knob, ts []term, q []quantities, fit *Fit) []float64 {
	n := len(ks)
	out := make([]float64, n)
	if fit == nil || fit.cov.n == 0 {
		return out
	}
	A := newSym(n)
	for _, t := range ts {
		for i := range ks {
			for j := range ks {
				A.add(i, j, t.grad(q, ks[i].p)*t.grad(q, ks[j].p))
			}
		}
	}
	for i, r := range ridge(ks, ts, q) {
		A.add(i, i, r)
	}
	Ainv, ok := A.inverse()
	if !ok {
		return out
	}
	m := len(fit.idx) + fit.nc
	// B[t][c]: the gradient of term t by the fit's parameter c.
	B := make([][]float64, len(ts))
	for ti, t := range ts {
		if t.what == "cut" && !q[t.pos].cutOK {
			continue
		}
		v := fitVec(fit, &q[t.pos], t.coef)
		for c := range v {
			v[c] *= t.w / t.scale
		}
		B[ti] = v
	}
	// S[i][c] = d a_i / d p_c
	S := make([][]float64, n)
	for i := range ks {
		g := make([]float64, m)
		for ti, t := range ts {
			if B[ti] == nil {
				continue
			}
			at := 0.0
			for j := range ks {
				at += Ainv.at(i, j) * t.grad(q, ks[j].p)
			}
			if at == 0 {
				continue
			}
			for c := range g {
				g[c] -= at * B[ti][c]
			}
		}
		S[i] = g
	}
	// Covariance of the ideal changes, S Cov S^T. Where knobs act alike
	// (a spindle and both Stephenson rods) single changes can be uncertain
	// while their sum is not; a setter makes the steps in turn, so each
	// step's error is given with the others made as planned: the
	// conditional standard deviation 1/sqrt((C^-1)_ii).
	C := newSym(n)
	tmp := make([]float64, m)
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			for c := 0; c < m; c++ {
				s := 0.0
				for d := 0; d < m; d++ {
					s += fit.cov.at(c, d) * S[j][d]
				}
				tmp[c] = s
			}
			v := 0.0
			for c := 0; c < m; c++ {
				v += S[i][c] * tmp[c]
			}
			C.a[i*n+j], C.a[j*n+i] = v, v
		}
	}
	for i, k := range ks {
		C.add(i, i, sq(1e-6*k.step))
	}
	Cinv, ok := C.inverse()
	for i := range ks {
		if ok && Cinv.at(i, i) > 0 {
			out[i] = 1 / math.Sqrt(Cinv.at(i, i))
		} else {
			out[i] = math.Sqrt(math.Max(0, C.at(i, i)))
		}
	}
	return out
}

// states turns quantities into reported events with their errors.
func (ev *evaluator) states(qs []quantities, fit *Fit) []PositionState {
	out := make([]PositionState, len(qs))
	for i, q := range qs {
		pos := ev.ps[i]
		st := PositionState{Notch: pos.notch.Name, Reverser: float64(pos.notch.Reverser), Direction: pos.dir, Running: pos.dir.String()}
		for k := 0; k < 2; k++ {
			e := q.ev.Front
			if k == 1 {
				e = q.ev.Back
			}
			es := endState(e)
			if fit != nil && fit.cov.n > 0 {
				var c [4]float64
				c[k] = 1
				es.LeadSigmaMM = clean(sdOf(fit, &q, c))
				if q.cutOK {
					c = [4]float64{}
					c[2+k] = 1
					es.CutOffSigmaPct = clean(math.Hypot(sdOf(fit, &q, c), fit.unreadCut(&q, k)))
				}
			}
			if k == 0 {
				st.Front = es
			} else {
				st.Back = es
			}
		}
		out[i] = st
	}
	return out
}

// endState reports one end's events (without errors).
func endState(e setting.EndEvents) EndState {
	return EndState{LeadMM: clean(e.Lead), CutOffPercent: clean(e.CutOff.StrokePercent), ReleasePercent: clean(e.Release.StrokePercent),
		CompressionPct: clean(e.Compression.StrokePercent), MaxOpeningMM: clean(e.MaxOpening), NeverOpens: e.NeverOpens, NeverCloses: e.NeverCloses,
		AdmissionBeforeD: clean(e.LeadAngle)}
}

// sdOf returns the standard deviation, through the fit's covariance, of
// the combination coef of position q's four quantities (lead front, lead
// back, cut-off front, cut-off back).
func sdOf(fit *Fit, q *quantities, coef [4]float64) float64 {
	return math.Sqrt(math.Max(0, fit.cov.quad(fitVec(fit, q, coef))))
}

// fitVec returns the gradient of the combination coef of position q's
// four quantities by the fit's parameters, in its covariance's order.
func fitVec(fit *Fit, q *quantities, coef [4]float64) []float64 {
	v := make([]float64, len(fit.idx)+fit.nc)
	for c, j := range fit.idx {
		for k, w := range coef {
			v[c] += w * q.grad[k][j]
		}
	}
	if g := q.group; g >= 0 && g < len(fit.cN) {
		for m := 0; m < fit.cN[g]; m++ {
			for k, w := range coef {
				v[len(fit.idx)+fit.cStart[g]+m] += w * q.cg[k][m]
			}
		}
	}
	return v
}

// workOrder returns the knobs in the order a setter works: the gear's own
// order (see the package doc), then any others.
func workOrder(kind string, ks []knob) []int {
	rank := func(k knob) int {
		var order []param
		switch kind {
		case setting.KindStephenson:
			// Forward gear first: its eccentric, then the spindle; then
			// back gear by its rod (and eccentric).
			order = []param{pEccFwd, pValveOffset, pRodFwd, pEccBack, pRodBack}
		case setting.KindWalschaerts:
			// Link swing first (return crank, eccentric rod), then the
			// radius rod, then share the lead with the spindle.
			order = []param{pReturnCrank, pRodFwd, pRadiusRod, pValveOffset}
		default:
			order = []param{pEccFwd, pValveOffset, pRodFwd}
		}
		for i, p := range order {
			if p == k.p {
				return i
			}
		}
		return len(order)
	}
	idx := make([]int, len(ks))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return rank(ks[idx[a]]) < rank(ks[idx[b]]) })
	return idx
}

// partName names the part an adjustment changes.
func partName(a session.Adjustment, kind string) string {
	ecc := ""
	if kind == setting.KindStephenson && a.Eccentric != "" {
		ecc = string(a.Eccentric) + " "
	}
	switch a.Kind {
	case session.ValveOnSpindle:
		return "valve on its spindle"
	case session.EccentricAngle:
		return ecc + "eccentric sheave"
	case session.EccentricRodLength:
		return ecc + "eccentric rod"
	case session.ReturnCrankAngle:
		return "return crank"
	case session.RadiusRodLength:
		return "radius rod"
	case session.LiftingLinkLength:
		return "lifting link"
	}
	return string(a.Kind)
}

// signWords says what a positive change of a kind means.
func signWords(k session.AdjustmentKind, kind string) string {
	switch k {
	case session.ValveOnSpindle:
		return "+ = valve moved toward the front cover"
	case session.EccentricAngle:
		return "+ = eccentric advanced (turned ahead in the running direction it drives)"
	case session.ReturnCrankAngle:
		return "+ = return crank turned in the forward running direction"
	}
	return "+ = lengthened"
}

// stepWords writes a step the way a setter does it: what to change and
// by how much (with the plan's +/- and any limit), then how: the part to
// slacken, which way to turn it as seen from a stated place, the amount
// in turns and flats of the thread or in mm round the sheave's rim, and
// what to lock again. Threads are taken as right-hand (common practice,
// no source) and the words say so; a sheave's or crank's way is given
// as seen from the engine's right-hand side, front to the right, where
// running forward turns the wheels clockwise (as the app's drawings
// show the engine).
func stepWords(s Step, unit session.Unit) string {
	amt := math.Abs(s.Amount)
	var b strings.Builder
	switch s.Kind {
	case session.ValveOnSpindle:
		way := "toward the front cover"
		if s.Amount < 0 {
			way = "toward the back (crank) end"
		}
		fmt.Fprintf(&b, "Move the valve %s %s on its spindle", length(amt, unit), way)
	case session.EccentricAngle:
		way := "Advance"
		if s.Amount < 0 {
			way = "Retard"
		}
		fmt.Fprintf(&b, "%s the %s %.2f deg", way, s.Part, amt)
	case session.ReturnCrankAngle:
		turn := "in the forward running direction"
		if s.Amount < 0 {
			turn = "against the forward running direction"
		}
		fmt.Fprintf(&b, "Turn the return crank %.2f deg %s", amt, turn)
	default:
		way := "Lengthen"
		if s.Amount < 0 {
			way = "Shorten"
		}
		fmt.Fprintf(&b, "%s the %s %s", way, s.Part, length(amt, unit))
	}
	if s.SigmaAmount > 0 {
		if s.Unit == "deg" {
			fmt.Fprintf(&b, " (+/- %.2f deg)", math.Max(s.SigmaAmount, 0.01))
		} else {
			fmt.Fprintf(&b, " (+/- %s)", fineLength(s.SigmaAmount, unit))
		}
	}
	if s.AtLimit {
		b.WriteString(", as far as the profile allows")
	}
	b.WriteString(": ")
	b.WriteString(howWords(s, unit))
	b.WriteString(".")
	return b.String()
}

// howWords says how hands make a step: what to slacken, which way to
// turn what as seen from where, by how much, and what to lock again (see
// stepWords).
func howWords(s Step, unit session.Unit) string {
	thread := s.Turns != 0 || s.Flats != 0
	amount := strings.TrimSuffix(turnsWords(s.Turns, s.Flats, s.perTurn), " of the thread")
	switch s.Kind {
	case session.ValveOnSpindle:
		slack, push, turn, way := "in front of", "behind", "anticlockwise", "forward"
		if s.Amount < 0 {
			slack, push, turn, way = "behind", "in front of", "clockwise", "back"
		}
		if !thread {
			return fmt.Sprintf("slacken the valve's fixing on the spindle, slide the valve %s %s against a mark, and lock it again", way, length(math.Abs(s.Amount), unit))
		}
		return fmt.Sprintf("back the nut %s the valve off a turn, turn the nut %s it %s %s seen from the front of the engine (right-hand thread) to push the valve %s, then run the first nut back up to the valve and lock it",
			slack, push, amount, turn, way)
	case session.EccentricAngle:
		forward := s.Amount > 0 // turned ahead in forward running
		if s.Eccentric == session.BackwardEccentric {
			forward = !forward
		}
		way, clock := "the way the wheels turn running forward", "clockwise"
		if !forward {
			way, clock = "the way the wheels turn running backward", "anticlockwise"
		}
		by := fmt.Sprintf("%.2f deg", math.Abs(s.Amount))
		if s.RimMM != 0 {
			by = length(math.Abs(s.RimMM), unit) + " round the rim"
		}
		return fmt.Sprintf("scribe a mark across sheave and axle, slacken the sheave's grub screws, turn it %s %s (%s seen from the engine's right-hand side), and tighten the screws again",
			by, way, clock)
	case session.ReturnCrankAngle:
		clock := "clockwise"
		if s.Amount < 0 {
			clock = "anticlockwise"
		}
		return fmt.Sprintf("scribe a mark across crank and crankpin, slacken the return crank's pinch bolt, turn it %s seen from the engine's right-hand side, and tighten the bolt again", clock)
	}
	in, turn, longer := "out", "anticlockwise", "longer"
	if s.Amount < 0 {
		in, turn, longer = "in", "clockwise", "shorter"
	}
	if !thread {
		return fmt.Sprintf("set its length between pin centres %s %s and lock it again", length(math.Abs(s.Amount), unit), longer)
	}
	return fmt.Sprintf("take out the pin of its fork end, slacken the fork's lock nut, screw the fork %s %s, %s seen from the fork end (right-hand thread), then pin it and lock the nut again", in, amount, turn)
}

// length shows a length in the display unit: mm to the hundredth, or
// inches to the thou.
// It is session.FormatLength, so the app's tables (render) and the
// plan's words round alike.
func length(mm float64, unit session.Unit) string { return session.FormatLength(mm, unit) }

// fineLength shows a small length one place finer than length.
func fineLength(mm float64, unit session.Unit) string {
	if unit == session.UnitInch {
		return fmt.Sprintf("%.4f in", math.Max(mm/session.MMPerInch, 0.0001))
	}
	return fmt.Sprintf("%.3f mm", math.Max(mm, 0.001))
}

// turnsWords writes a change on a thread: "2 turns and 3 flats of the
// thread", or in half turns for a thread turned only by halves (a fork end
// with two flats a turn).
func turnsWords(turns, flats, perTurn int) string {
	if perTurn == 2 {
		switch {
		case turns == 0:
			return "half a turn of the thread"
		case flats == 0:
			return count(turns, "turn") + " of the thread"
		}
		return fmt.Sprintf("%d and a half turns of the thread", turns)
	}
	var parts []string
	if turns > 0 {
		parts = append(parts, count(turns, "turn"))
	}
	if flats > 0 {
		parts = append(parts, count(flats, "flat"))
	}
	return strings.Join(parts, " and ") + " of the thread"
}

// count writes "1 turn", "3 turns".
func count(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return fmt.Sprintf("%d %ss", n, word)
}

// angularityNote tells the setter what the other quantity becomes.
func angularityNote(main, alt *planned, prio Priority, running int, unit session.Unit) string {
	lead, cut := main, alt
	if prio == EqualCutOffs {
		lead, cut = alt, main
	}
	ra := running
	if ra >= len(lead.after) {
		ra = 0
	}
	la, ca := lead.after[ra], cut.after[ra]
	return fmt.Sprintf("Equal leads and equal cut-offs cannot both be had: the connecting rod's angularity puts them apart. In %s, equal leads leave the cut-offs at %.1f %% front and %.1f %% back; equal cut-offs (%.1f %% and %.1f %%) need leads of %s front and %s back. The plan shown first is the one chosen (equal %s); the other is given beside it.",
		la.Notch, la.Front.CutOffPercent, la.Back.CutOffPercent, ca.Front.CutOffPercent, ca.Back.CutOffPercent, length(ca.Front.LeadMM, unit), length(ca.Back.LeadMM, unit), prio)
}

// nextReading names the reading that would help most when the readings
// leave an event or a step uncertain.
func nextReading(fit *Fit, ev *evaluator, p *planned, ks []knob) string {
	count := func(r setting.Reverser) int {
		have := 0
		for i, o := range fit.obs {
			if fit.used[i] && o.HasCrank && math.Abs(float64(o.Reverser-r)) < 1e-6 {
				have++
			}
		}
		return have
	}
	worst, wi := 0.0, -1
	for i, st := range p.now {
		for _, e := range []EndState{st.Front, st.Back} {
			if r := e.LeadSigmaMM / 0.05; r > worst {
				worst, wi = r, i
			}
			if r := e.CutOffSigmaPct / 1.0; r > worst {
				worst, wi = r, i
			}
		}
	}
	if worst >= 1 && wi >= 0 {
		pos := ev.ps[wi]
		if count(pos.notch.Reverser) < 4 {
			return fmt.Sprintf("Take a sweep in %s (a gauge reading every 15 to 30 degrees round a turn): the readings leave its events uncertain.", pos.notch.Name)
		}
		return fmt.Sprintf("Bracket the dead centres again and take a second sweep in %s: the readings there scatter too much to pin its events down.", pos.notch.Name)
	}
	// A change the readings cannot pin down to two of its steps: the
	// position with the fewest readings is the one to sweep.
	for _, s := range p.steps {
		for _, k := range ks {
			if k.adj.Kind != s.Kind || k.adj.Eccentric != s.Eccentric || s.SigmaAmount <= 2*k.step {
				continue
			}
			fewest, fi := math.MaxInt, 0
			for i, pos := range ev.ps {
				if c := count(pos.notch.Reverser); c < fewest {
					fewest, fi = c, i
				}
			}
			return fmt.Sprintf("Take a sweep in %s (a gauge reading every 15 to 30 degrees round a turn): without it the readings cannot tell how much of the change belongs to the %s (+/- %.2f %s).", ev.ps[fi].notch.Name, s.Part, s.SigmaAmount, s.Unit)
		}
	}
	return ""
}
