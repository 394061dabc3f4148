package ui

import (
	"fmt"

	"evenbeat/render"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// historyCache is the history of the cylinder shown, worked out once per
// change of the session, cylinder or unit: a plan per round.
type historyCache struct {
	key historyKey
	h   render.History
}

// historyKey is what a history was worked out for.
type historyKey struct {
	s        *session.Session
	cyl, gen int
	unit     session.Unit
}

// history returns the rounds of the cylinder shown: for each, the changes
// made before it and its leads and cut-offs per position as a plan made
// from that round's readings gives them (the plan shown's own for the
// round it plans), or why there are none.
func (a *App) history() render.History {
	s := a.Session()
	k := historyKey{s, a.cyl, a.gen, a.unit()}
	if k == a.hist.key && k.s != nil {
		return a.hist.h
	}
	h := render.History{Unit: a.unit(), LeadTolMM: render.DefaultLeadTolMM}
	if s != nil {
		rounds := s.Cylinders[a.cyl].Rounds
		for ri, r := range rounds {
			hr := render.HistoryRound{}
			for _, ch := range r.AdjustmentsBefore {
				w := changeWords(session.Adjustment{Kind: ch.Kind, Eccentric: ch.Eccentric}, ch.Amount, a.unit())
				if ch.Note != "" {
					w += " (" + ch.Note + ")"
				}
				hr.Before = append(hr.Before, w)
			}
			if ri == len(rounds)-1 && a.isDraft(s, a.cyl) {
				hr.Note = "Nothing taken yet: its readings are the next to take."
			} else {
				hr.Now, hr.Note = a.roundEvents(ri)
			}
			h.Rounds = append(h.Rounds, hr)
		}
	}
	a.hist = historyCache{k, h}
	return h
}

// roundEvents returns round ri's events per position, from a plan made
// from its readings with the session's aims, or why there are none.
func (a *App) roundEvents(ri int) ([]plan.PositionState, string) {
	if a.plannedRound() == ri {
		return a.plan.Now, "" // the very figures the plan, curve and balance show
	}
	s := a.Session()
	fo := plan.FitOptions{Round: ri + 1}
	fit, err := plan.FitSession(s, a.cyl, fo)
	if err != nil {
		return nil, a.inWords(sentence(err))
	}
	opt := plan.AimsOptions(s.Aims)
	opt.Unit, opt.Cylinder, opt.Fit, opt.OtherLater = a.unit(), a.cyl, fo, true
	p, err := plan.FromFit(fit, s.Adjustments, opt)
	if err != nil {
		return nil, a.inWords(sentence(err))
	}
	return p.Now, ""
}

// historyView lays out the rounds: the chart of the lead differences
// round by round and, per round, its row (tap: its readings; Delete) over
// the changes made before it and its leads and cut-offs.
func (a *App) historyView(l *layouter) {
	s := a.Session()
	l.title("Rounds")
	if s == nil {
		return
	}
	a.cylinderRow(l)
	h := a.history()
	hl := render.LayoutHistory(rect(l.x, l.y, l.w, 0), h, rowH)
	l.v.body = rect(l.x, l.y, l.w, hl.NeedH)
	for ri, r := range s.Cylinders[a.cyl].Rounds {
		ri := ri
		l.y = hl.Rows[ri].Min.Y
		a.rowWithDelete(l, a.roundLabel(ri, fmt.Sprintf("Round %d, %s", ri+1, r.Date)), fmt.Sprintf("round %d", ri+1), func() { a.showRound(ri) }, func() { a.deleteRound(ri) })
	}
	l.y = l.v.body.Max.Y + gap
}
