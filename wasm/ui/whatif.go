package ui

import (
	"fmt"
	"math"
	"strings"

	"evenbeat/render"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// whatIf is the plan screen's what-if: an amount for every adjustment the
// engine allows (the plan's at first, nought for those the plan leaves
// alone), one of them chosen to drag, and the model and plan after them
// all once a drag changed one.
type whatIf struct {
	adj     int       // the adjustment dragged, an index of the session's Adjustments
	amounts []float64 // per adjustment: mm, or degrees for angular kinds
	lo, hi  float64   // the chosen adjustment's limits
	plan    *plan.Plan
	model   *render.Model // nil until a drag; then the model after the amounts
}

// resetWhatIf starts the what-if from the plan's amounts, on the plan's
// first step (or the first adjustment when the plan changes nothing).
func (a *App) resetWhatIf() {
	a.what = whatIf{}
	s := a.Session()
	if a.plan == nil || s == nil || len(s.Adjustments) == 0 {
		return
	}
	a.what.amounts = make([]float64, len(s.Adjustments))
	for _, st := range a.plan.Steps {
		if j := adjustmentOf(s.Adjustments, st); j >= 0 {
			a.what.amounts[j] = st.Amount
		}
	}
	first := 0
	if len(a.plan.Steps) > 0 {
		first = max(0, adjustmentOf(s.Adjustments, a.plan.Steps[0]))
	}
	a.chooseAdjustment(first)
}

// adjustmentOf returns the index in adjs of the adjustment a plan step
// changes, or -1.
func adjustmentOf(adjs []session.Adjustment, st plan.Step) int {
	return findAdjustment(adjs, session.Adjustment{Kind: st.Kind, Eccentric: st.Eccentric})
}

// chooseAdjustment makes adjustment j the one the what-if drags.
func (a *App) chooseAdjustment(j int) {
	adjs := a.Session().Adjustments
	if len(a.what.amounts) == 0 || len(adjs) == 0 {
		return
	}
	j = (j%len(adjs) + len(adjs)) % len(adjs)
	a.what.adj = j
	a.what.lo, a.what.hi = adjs[j].Min, adjs[j].Max
	a.dirty = true
}

// setWhatStep chooses the adjustment plan step i changes.
func (a *App) setWhatStep(i int) {
	if a.plan == nil || i < 0 || i >= len(a.plan.Steps) {
		return
	}
	if j := adjustmentOf(a.Session().Adjustments, a.plan.Steps[i]); j >= 0 {
		a.chooseAdjustment(j)
	}
}

// SetWhatIf sets the what-if amount of the part plan step i changes (mm,
// or degrees for angular steps, signed as the step) and rebuilds the
// model after every what-if amount. Amounts are held within the
// adjustment's limits.
func (a *App) SetWhatIf(i int, amount float64) error {
	if a.plan == nil || i < 0 || i >= len(a.plan.Steps) {
		return fmt.Errorf("There is no plan step %d to change.", i+1)
	}
	j := adjustmentOf(a.Session().Adjustments, a.plan.Steps[i])
	if j < 0 {
		return fmt.Errorf("Plan step %d changes a part this engine does not list as adjustable.", i+1)
	}
	return a.SetWhatIfAdjustment(j, amount)
}

// SetWhatIfAdjustment sets the what-if amount of the session's adjustment
// j (any the engine allows, whether the plan changes it or not), held
// within its limits, and rebuilds the model after every what-if amount:
// the events and balance move with it.
func (a *App) SetWhatIfAdjustment(j int, amount float64) error {
	s := a.Session()
	if a.plan == nil || s == nil || j < 0 || j >= len(s.Adjustments) {
		return fmt.Errorf("There is no adjustment %d to change.", j+1)
	}
	if len(a.what.amounts) != len(s.Adjustments) {
		a.resetWhatIf()
	}
	if j != a.what.adj {
		a.chooseAdjustment(j)
	}
	if math.IsNaN(amount) {
		return fmt.Errorf("The what-if amount of %s is not a number.", adjustmentName(s.Adjustments[j]))
	}
	a.what.amounts[j] = max(a.what.lo, min(a.what.hi, amount))
	p := a.whatIfPlan()
	m, err := render.NewModel(s, a.cyl, a.fit, p)
	if err != nil {
		return err
	}
	m.Scale = a.model // the balance keeps the plan's scales while dragging
	m.WhatIf = a.whatIfWords()
	a.what.plan, a.what.model = p, m
	a.dirty = true
	return nil
}

// whatIfPlan is the plan with the what-if amounts: the plan's steps in
// their order with their amounts changed, then any other part given an
// amount, each worded again where its amount differs from the plan's.
func (a *App) whatIfPlan() *plan.Plan {
	s := a.Session()
	p := *a.plan
	p.Steps = nil
	done := make([]bool, len(s.Adjustments))
	for _, st := range a.plan.Steps {
		j := adjustmentOf(s.Adjustments, st)
		if j < 0 {
			p.Steps = append(p.Steps, st)
			continue
		}
		done[j] = true
		if amt := a.what.amounts[j]; amt != st.Amount {
			st = a.whatIfStep(s.Adjustments[j], amt)
		}
		if st.Amount != 0 {
			p.Steps = append(p.Steps, st)
		}
	}
	for j, adj := range s.Adjustments {
		if !done[j] && a.what.amounts[j] != 0 {
			p.Steps = append(p.Steps, a.whatIfStep(adj, a.what.amounts[j]))
		}
	}
	return &p
}

// whatIfStep is a what-if change of adj by amount: the step a plan would
// hold for it (plan.StepFor), so it reads as the plan's steps do (turns
// and flats of the thread, mm round a sheave's rim) for the nearest change
// hands can make. The drag moves in continuous amounts and the model
// follows them: the step's Amount and IdealAmount are the amount dragged,
// which the words give first, in words, when it is not a whole number of
// steps.
func (a *App) whatIfStep(adj session.Adjustment, amount float64) plan.Step {
	st := plan.StepFor(adj, amount, a.unit())
	if math.Abs(st.Amount-amount) > 1e-9 {
		st.Words = capitalise(changeWords(adj, amount, a.unit())) + ". Nearest by hand: " + st.Words
	}
	st.Words = "What if: " + st.Words
	st.Amount, st.IdealAmount = amount, amount
	return st
}

// changeWords says a change of adj by amount in words, the part named
// and the way it goes: "valve 0.16 mm toward the front cover", "forward
// eccentric rod lengthened 0.30 mm", "return crank turned 0.25 deg against
// the forward running direction"; a change of nought leaves the part as
// it is.
func changeWords(adj session.Adjustment, amount float64, unit session.Unit) string {
	part := plan.StepFor(adj, 0, unit).Part
	if adj.Kind == session.ValveOnSpindle && amount != 0 {
		part = "valve"
	}
	return part + " " + changeWay(adj, amount, unit)
}

// changeWay says the way and amount of a change of adj, without the part:
// "0.16 mm toward the front cover", "advanced 1.20 deg", "left as it is".
func changeWay(adj session.Adjustment, amount float64, unit session.Unit) string {
	if amount == 0 {
		return "left as it is"
	}
	by := session.FormatLength(math.Abs(amount), unit)
	if adj.Kind.Angular() {
		by = fmt.Sprintf("%.2f deg", math.Abs(amount))
	}
	more := amount > 0
	switch adj.Kind {
	case session.ValveOnSpindle:
		if more {
			return by + " toward the front cover"
		}
		return by + " toward the back (crank) end"
	case session.EccentricAngle:
		if more {
			return "advanced " + by
		}
		return "retarded " + by
	case session.ReturnCrankAngle:
		if more {
			return "turned " + by + " in the forward running direction"
		}
		return "turned " + by + " against the forward running direction"
	}
	if more {
		return "lengthened " + by
	}
	return "shortened " + by
}

// capitalise gives s a capital first letter.
func capitalise(s string) string {
	if s == "" || s[0] < 'a' || s[0] > 'z' {
		return s
	}
	return string(s[0]-'a'+'A') + s[1:]
}

// whatIfWords says in words what the what-if changes beyond the plan:
// each part whose amount differs from the plan's, with the plan's own,
// for the cards' "after includes the what-if". Empty when the amounts
// are the plan's.
func (a *App) whatIfWords() string {
	s := a.Session()
	var ws []string
	for j, adj := range s.Adjustments {
		planned := 0.0
		for _, st := range a.plan.Steps {
			if adjustmentOf(s.Adjustments, st) == j {
				planned = st.Amount
			}
		}
		if amt := a.what.amounts[j]; amt != planned {
			ws = append(ws, changeWords(adj, amt, a.unit())+" (the plan: "+changeWay(adj, planned, a.unit())+")")
		}
	}
	return strings.Join(ws, "; ")
}

// planAmount is the plan's amount for the chosen adjustment (nought when
// the plan leaves it alone), marked on the what-if track.
func (a *App) planAmount() float64 {
	adjs := a.Session().Adjustments
	for _, st := range a.plan.Steps {
		if adjustmentOf(adjs, st) == a.what.adj {
			return st.Amount
		}
	}
	return 0
}

// shortAdjustmentName names an adjustment in a few letters, for the row
// that chooses which the what-if drags.
func shortAdjustmentName(adj session.Adjustment) string {
	e := ""
	switch adj.Eccentric {
	case session.ForwardEccentric:
		e = "Fwd "
	case session.BackwardEccentric:
		e = "Back "
	}
	switch adj.Kind {
	case session.ValveOnSpindle:
		return "Valve"
	case session.EccentricAngle:
		return e + "sheave"
	case session.EccentricRodLength:
		return e + "rod"
	case session.ReturnCrankAngle:
		return "Return crank"
	case session.RadiusRodLength:
		return "Radius rod"
	case session.LiftingLinkLength:
		return "Lifting link"
	}
	return string(adj.Kind)
}

// whatIfRows lays out the what-if's controls on the balance tab: rows
// choosing the part, the part's amount (a tap there chooses the next
// part) and the track to drag.
func (a *App) whatIfRows(l *layouter) {
	adjs := a.Session().Adjustments
	if len(a.what.amounts) == 0 {
		return
	}
	labels := make([]string, len(adjs))
	on := make([]bool, len(adjs))
	acts := make([]func(), len(adjs))
	for j, adj := range adjs {
		labels[j] = shortAdjustmentName(adj)
		on[j] = j == a.what.adj
		acts[j] = func() { a.chooseAdjustment(j) }
	}
	per := 3 // a row of three keeps "Back sheave" whole on a phone
	if l.w > 600 {
		per = len(labels)
	}
	for i := 0; i < len(labels); i += per {
		k := min(i+per, len(labels))
		l.row(labels[i:k], on[i:k], acts[i:k])
	}
	adj := adjs[a.what.adj]
	what := "What if: " + changeWords(adj, a.what.amounts[a.what.adj], a.unit())
	if a.what.amounts[a.what.adj] == a.planAmount() {
		l.text(what+", as the plan has it.", false)
	} else {
		l.text(what+"; the plan: "+changeWay(adj, a.planAmount(), a.unit())+".", false)
	}
	l.muted("Drag to try another amount. After, on the card below, is the plan with the what-if amounts.")
	// The track is a target of its own, named by the change, so that a
	// screen reader and the tests find it; it has nothing to tap.
	l.v.slider = rect(l.x, l.y, l.w, sliderH)
	l.v.targets = append(l.v.targets, Target{Label: what, Rect: l.v.slider, track: true})
	l.y += sliderH + gap
}
