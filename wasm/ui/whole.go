package ui

import (
	"math"

	"evenbeat/render"
	"evenbeat/setting/beat"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// WholeLabel is the button that shows the whole engine: the plan screen's
// row of cylinders and the menu carry it.
const WholeLabel = "Whole engine"

// wholeEngine is the whole engine's beat as last worked out: every
// cylinder planned with the session's aims, for one session and change.
type wholeEngine struct {
	s   *session.Session
	gen int
	ps  []beat.Position // running notches first, then full forward and full back
	qs  []beat.Quartering
	why string // why there is no beat: one cylinder, one without readings...
	// measure is the cylinder to take readings of first (-1: none).
	measure int
	pos     string // the position chosen, by name ("" the first)
}

// wholeBeat works out the whole engine for the session shown when it
// changed since it was last worked out.
func (a *App) wholeBeat() *wholeEngine {
	w := &a.whole
	s := a.Session()
	if s == nil || (w.s == s && w.gen == a.gen) {
		return w
	}
	pos := w.pos
	if w.s != s {
		pos = s.Aims.RunningNotch
	}
	*w = wholeEngine{s: s, gen: a.gen, pos: pos, measure: -1}
	if len(s.Cylinders) < 2 {
		w.why = "This engine has one cylinder, so its beat is its front and back exhausts, which its plan already makes even against each other. The whole engine's beat, the work side against side and the quartering need two cylinders or more."
		return w
	}
	stored := a.asStored(s) // a round begun and still empty: the plan is the round's before
	opt := plan.AimsOptions(s.Aims)
	opt.Unit, opt.OtherLater = a.unit(), true
	var err error
	if w.ps, err = beat.Whole(stored, opt, beat.DefaultSteam); err != nil {
		w.why = a.inWords(sentence(err))
		for i, c := range stored.Cylinders {
			if len(c.Rounds) == 0 && w.measure < 0 {
				w.measure = i // offered: measure it
			}
		}
		return w
	}
	w.ps = runningFirst(w.ps)
	if len(w.ps) == 0 {
		w.why = "The cylinders' plans share no reverser position, so their exhausts cannot be put on one circle: take every cylinder's readings in the same positions."
	}
	w.qs, _ = beat.Quarterings(s)
	return w
}

// runningFirst orders the positions as the whole-engine screen offers
// them: the running notches first, then full forward and full back.
func runningFirst(ps []beat.Position) []beat.Position {
	rank := func(p beat.Position) int {
		switch p.Name {
		case session.FullForward:
			return 1
		case session.FullBack:
			return 2
		}
		return 0
	}
	out := make([]beat.Position, 0, len(ps))
	for r := range 3 {
		for _, p := range ps {
			if rank(p) == r {
				out = append(out, p)
			}
		}
	}
	return out
}

// chosen returns the position the screen shows: the one chosen, else the
// first; ok is false when there is none.
func (w *wholeEngine) chosen() (beat.Position, bool) {
	for _, p := range w.ps {
		if p.Name == w.pos {
			return p, true
		}
	}
	if len(w.ps) == 0 {
		return beat.Position{}, false
	}
	return w.ps[0], true
}

// showWhole shows the whole engine.
func (a *App) showWhole() {
	a.navigate(Whole)
}

// wholeToPlan leaves the whole engine for the plan of the cylinder shown:
// back, when the whole engine was opened from the plan.
func (a *App) wholeToPlan() {
	if n := len(a.stack); n > 0 && a.stack[n-1] == Plan {
		a.Back()
	} else {
		a.navigate(Plan)
	}
	a.planRound = 0
	a.makePlan()
}

// wholeView lays out the whole engine: the positions to choose from, the
// beat card, the heard beat and what to do, Listen, each end's work, and
// the quartering with the choice that makes it possible.
func (a *App) wholeView(l *layouter) {
	s := a.Session()
	l.title("The whole engine")
	if s == nil {
		return
	}
	a.cylinderRow(l)
	w := a.wholeBeat()
	pos, ok := w.chosen()
	if !ok {
		l.text(w.why, false)
		if w.measure >= 0 {
			i := w.measure
			l.button("Measure the "+s.Cylinders[i].Name+" cylinder", false, func() { a.cyl = i; a.startMeasuring() })
		}
		a.datumsRow(l)
		return
	}
	l.muted(beat.LeadingCranks(s.Engine.Cylinders))
	if len(w.ps) > 1 {
		labels := make([]string, len(w.ps))
		on := make([]bool, len(w.ps))
		acts := make([]func(), len(w.ps))
		for i, p := range w.ps {
			labels[i], on[i] = title(p.Name), p.Name == pos.Name
			acts[i] = func() { w.pos = p.Name; a.dirty = true }
		}
		l.row(labels, on, acts)
	}
	for _, t := range a.heardWords(pos) { // the news first, then the card
		l.text(t, false)
	}
	heard := a.heardGaps(pos)
	need := render.LayoutBeat(render.Rect{Max: render.Point{X: l.w, Y: 1e6}}, pos, heard).NeedH
	l.v.body = rect(l.x, l.y, l.w, need)
	l.y += need + gap
	if len(pos.Now.Beats()) >= 2 {
		l.button(ListenLabel, false, a.askListen)
	}
	l.text(oddToday(pos), false)
	if len(pos.WorkNow) > 0 && len(pos.WorkAfter) == len(pos.WorkNow) {
		l.para("Work of each end, as a share of the mean of them all (a simple indicator diagram):", render.BodySize+2, true, false, false)
		for k, wk := range pos.WorkNow {
			l.text(title(wk.Cylinder)+" "+wk.End.String()+": "+fixed(wk.Share, 0)+" % today, "+fixed(pos.WorkAfter[k].Share, 0)+" % after the plans", false)
		}
	}
	a.sidesWords(l, pos)
	a.quarteringWords(l, w)
	a.datumsRow(l)
}

// sidesWords compares the cylinders in pos, each one's mean of its two
// ends today and after the plans, and says what would match them when
// they stay apart.
func (a *App) sidesWords(l *layouter, pos beat.Position) {
	if len(pos.Sides) < 2 {
		return
	}
	l.para("Cylinder against cylinder, the mean of both ends:", render.BodySize+2, true, false, false)
	u := a.unit()
	for _, sd := range pos.Sides {
		l.text(title(sd.Cylinder)+": lead "+session.FormatLength(sd.LeadNow, u)+" today, "+session.FormatLength(sd.LeadAfter, u)+" after; cut-off "+fixed(sd.CutOffNow, 1)+" % today, "+fixed(sd.CutOffAfter, 1)+" % after", false)
	}
	for _, t := range beat.SideWords(pos, u) {
		l.text(t, true)
	}
	if lead, ok := a.wholeBeat().matchedLead(); ok {
		l.button(MatchLeadsLabel+": "+session.FormatLength(lead, u), false, func() { a.matchLeads(lead) })
	}
}

// MatchLeadsLabel begins the whole engine's button that plans every
// cylinder to the same lead.
const MatchLeadsLabel = "Same full-gear lead on every cylinder"

// matchedLead is the lead to plan every cylinder to when their mean leads
// in full forward stay apart after the plans by more than the gauge tells
// (the mean of them, mm); ok is false when they already match, or when a
// target lead already holds them to one.
func (w *wholeEngine) matchedLead() (float64, bool) {
	if w.s == nil || w.s.Aims.TargetLeadMM != nil {
		return 0, false
	}
	for _, p := range w.ps {
		if p.Name != session.FullForward || len(p.Sides) < 2 {
			continue
		}
		lo, hi, mean := p.Sides[0].LeadAfter, p.Sides[0].LeadAfter, 0.0
		for _, sd := range p.Sides {
			lo, hi = min(lo, sd.LeadAfter), max(hi, sd.LeadAfter)
			mean += sd.LeadAfter / float64(len(p.Sides))
		}
		return mean, hi-lo > w.s.Measuring.GaugeResolutionMM*2
	}
	return 0, false
}

// matchLeads keeps lead (mm) as the session's target lead, which every
// cylinder's plan aims at, and plans again: the cylinders matched to each
// other as well as front against back, where their sheaves allow it.
func (a *App) matchLeads(lead float64) {
	a.setTargetLead(&lead)
	a.makePlan()
}

// drawWhole draws the beat card of the position shown.
func (a *App) drawWhole(c render.Canvas, v *view) {
	if pos, ok := a.wholeBeat().chosen(); ok && v.body.W() > 0 {
		render.BeatCard(c, v.body, pos, a.heardGaps(pos), a.theme)
	}
}

// oddToday says which exhaust stands out from an even beat today, if one
// does.
func oddToday(pos beat.Position) string {
	i, by, ok := pos.Now.Odd(1)
	if !ok {
		return "Today no one exhaust stands out from an even beat."
	}
	word := "late"
	if by < 0 {
		word, by = "early", -by
	}
	return "Today the " + pos.Now.Exhausts[i].Label() + " exhaust comes " + fixed(by, 1) + "° " + word + " against an even beat."
}

// quarteringWords says what the dead-centre marks show of the angle
// between the cranks, with the caution that no valve adjustment cures a
// crank out of quarter.
func (a *App) quarteringWords(l *layouter, w *wholeEngine) {
	if !w.s.Measuring.DatumsMatched {
		return
	}
	if len(w.qs) == 0 {
		l.text("Quartering: the marks need a bracketed dead centre on every cylinder to show the angle between the cranks.", false)
		return
	}
	for _, q := range w.qs {
		s := "Quartering: the marks put the " + q.Other + " crank " + fixed(q.Measured, 1) + "° from the " + q.First + " crank (drawing " + fixed(q.Design, 0) + "°), " + fixed(q.Error, 1) + "° ± " + fixed(q.Uncertainty(), 1) + "° off"
		switch {
		case math.Abs(q.Error) > 20:
			l.text(s+": far more than cranks are ever out. The datums were most likely not marked at the same angle, or the marks were counted from elsewhere: mark them again before anything is done to the wheels.", true)
			continue
		case q.Told:
			l.text(s+": more than the marks can tell. The cranks are not truly quartered.", true)
			continue
		}
		l.text(s+": within what the marks can tell.", false)
	}
	l.text("No valve adjustment cures cranks out of quarter: that is a fitter's job on the wheels (a crank or wheel pressed on its axle), with the wheels off the engine and the usual precautions.", true)
}

// datumsRow offers the measuring choice that makes the quartering
// possible: both wheels' datums marked at the same angle.
func (a *App) datumsRow(l *layouter) {
	s := a.Session()
	if len(s.Cylinders) < 2 {
		return
	}
	l.muted("For the quartering, mark both driving wheels' datums at the same angle: where a square standing on the frame meets each tyre, at the same height on both sides.")
	l.button("Datums at the same angle", s.Measuring.DatumsMatched, func() { a.setDatumsMatched(!s.Measuring.DatumsMatched) })
	l.text(a.note, true)
}

// setDatumsMatched records whether both wheels' datums were marked at the
// same angle: a change of the measuring set-up, kept in the engine's
// history.
func (a *App) setDatumsMatched(on bool) {
	s := a.Session()
	p := s.Profile()
	p.Measuring.DatumsMatched = on
	a.note = ""
	if _, err := s.Edit(p, a.today()); err != nil {
		a.note = a.inWords(sentence(err))
		return
	}
	a.save()
}

// heardGaps returns the gaps heard in position pos, in the order its beat
// circle lists them: from this run's listening, else the latest the
// session keeps; nil when none fits the circle.
func (a *App) heardGaps(pos beat.Position) []float64 {
	if h := a.lis.heard; h != nil && h.s == a.Session() && h.pos == pos.Name {
		return h.gaps
	}
	if h := latestHeard(a.Session(), pos); h != nil {
		return h.GapsDeg
	}
	return nil
}

// latestHeard returns the latest beat the session keeps as heard in pos,
// if its gaps fit pos's circle.
func latestHeard(s *session.Session, pos beat.Position) *session.Heard {
	for i := len(s.Heard) - 1; i >= 0; i-- {
		if h := &s.Heard[i]; h.Position == pos.Name && len(h.GapsDeg) == len(pos.Now.Gaps) {
			return h
		}
	}
	return nil
}

// evenness is the largest gap over the smallest (1 is even; 0 for fewer
// than two gaps).
func evenness(gaps []float64) float64 {
	lo, hi := math.Inf(1), 0.0
	for _, g := range gaps {
		lo, hi = math.Min(lo, g), math.Max(hi, g)
	}
	if len(gaps) < 2 || !(lo > 0) {
		return 0
	}
	return hi / lo
}
