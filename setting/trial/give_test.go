package trial

import (
	"math"
	"strings"
	"testing"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Where a plan offers give and take (a position left far apart closed at
// the cost of another ending worse by up to twice what its readings
// tell), the offer holds on the true engine: made instead of the plan's
// own steps, it brings the worst lead difference under the plan's own
// result in at least 80 % of the engines it is offered on, and the
// positions it lets go end worse than today by no more than twice their
// readings' error and the plan's own tolerance (0.02 mm) in at least 90 %.
func TestGiveAndTakeHolds(t *testing.T) {
	n := 600
	if testing.Short() {
		n = 200
	}
	offered, better, held := 0, 0, 0
	for i := 0; i < n; i++ {
		e, _, s := benchRound(t, 1, i, false)
		p, err := plan.Make(s, plan.Options{Priority: plan.EqualLeads, Unit: session.UnitMM, OtherLater: true})
		if err != nil || p.GiveAndTake() == nil {
			continue
		}
		offered++
		before, err := e.LeadDiffs()
		if err != nil {
			t.Fatal(err)
		}
		own, err := e.Made(p.Steps)
		if err != nil {
			t.Fatal(err)
		}
		give, err := e.Made(p.GiveAndTake())
		if err != nil {
			t.Fatal(err)
		}
		dOwn, err1 := own.LeadDiffs()
		dGive, err2 := give.LeadDiffs()
		if err1 != nil || err2 != nil {
			t.Logf("engine %d: %v %v", i, err1, err2)
			continue
		}
		if worst(dGive) < worst(dOwn) {
			better++
		}
		ok := true
		for k := range before {
			sd := math.Hypot(p.Now[k].Front.LeadSigmaMM, p.Now[k].Back.LeadSigmaMM)
			if math.Abs(dGive[k])-math.Abs(before[k]) > 2*sd+e.tolerance(plan.EqualLeads) {
				ok = false
			}
		}
		if ok {
			held++
		}
		t.Logf("engine %d (%s %s): worst lead difference today %.3f, after the plan %.3f, after give and take %.3f mm; the let-go positions held: %v", i, e.Kind, e.Size, worst(before), worst(dOwn), worst(dGive), ok)
	}
	t.Logf("give and take offered on %d of %d engines: closer than the plan on %d, the positions let go held on %d", offered, n, better, held)
	if float64(better) < 0.8*float64(offered) || float64(held) < 0.9*float64(offered) {
		t.Errorf("give and take: offered %d, closer %d, held %d", offered, better, held)
	}
}

// Where the strict plan would make no step but a trade closes a far
// larger difference (see TestGiveAndTakeHolds), the trade is the plan and
// says which position it lets go; on the true engine it brings the worst
// lead difference closer than today on at least 80 % of the engines, and
// lets no position end worse than today by more than twice its readings'
// error and the plan's own tolerance on at least 90 % (issue 11: no
// "nothing to change" while a measurable gain exists). Over the held-out
// seed 7 the bench refused two such gains before this.
func TestTradeRatherThanNothing(t *testing.T) {
	traded, closer, held := 0, 0, 0
	for _, seed := range []uint64{1, 7} {
		for i := 0; i < 600; i++ {
			e, _, s := benchRound(t, seed, i, false)
			p, err := plan.Make(s, plan.Options{Priority: plan.EqualLeads, Unit: session.UnitMM, OtherLater: true})
			if err != nil || !hasNote(p.Notes, "No step keeps every position as close as the plan allows itself") {
				continue
			}
			traded++
			if len(p.Steps) == 0 {
				t.Errorf("seed %d engine %d: a trade is said but no step made", seed, i)
				continue
			}
			before, err := e.LeadDiffs()
			if err != nil {
				t.Fatal(err)
			}
			made, err := e.Made(p.Steps)
			if err != nil {
				t.Fatal(err)
			}
			after, err := made.LeadDiffs()
			if err != nil {
				t.Errorf("seed %d engine %d: %v", seed, i, err)
				continue
			}
			if worst(after) < worst(before) {
				closer++
			}
			ok := true
			for k := range before {
				sd := math.Hypot(p.Now[k].Front.LeadSigmaMM, p.Now[k].Back.LeadSigmaMM)
				if math.Abs(after[k])-math.Abs(before[k]) > 2*sd+e.tolerance(plan.EqualLeads) {
					ok = false
				}
			}
			if ok {
				held++
			}
			t.Logf("seed %d engine %d (%s %s): worst lead difference today %.3f, after the trade %.3f mm; the let-go positions held: %v", seed, i, e.Kind, e.Size, worst(before), worst(after), ok)
		}
	}
	t.Logf("traded on %d of 1200 engines: closer on %d, the positions let go held on %d", traded, closer, held)
	if traded == 0 || float64(closer) < 0.8*float64(traded) || float64(held) < 0.9*float64(traded) {
		t.Errorf("trade: made %d, closer %d, held %d", traded, closer, held)
	}
}

// hasNote reports whether a note begins with prefix.
func hasNote(notes []string, prefix string) bool {
	for _, n := range notes {
		if strings.HasPrefix(n, prefix) {
			return true
		}
	}
	return false
}
