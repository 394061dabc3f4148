package plan

import (
	"fmt"
	"math"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// targetMissMM is how far the mean lead after a plan may be from the
// target lead and still count as met: about a thou, under what a setter
// acts on (common practice, no source).
const targetMissMM = 0.02

// targetNotes says, for the full-gear positions whose mean lead after
// the plan misses the target lead, why it cannot be met there and what
// lead the plan gives instead: no sheave the profile lets the plan turn
// for that gear (on Walschaerts gear the combination lever sets the
// lead), the sheave stopped at its limit or allowed less than one of its
// steps, or its whole steps and the balance of the ends. Positions missed
// for the same reason share a note.
func targetNotes(target float64, kind string, ks []knob, ps []position, after []PositionState, steps []Step, unit session.Unit) []string {
	var whys, where, gives []string
	for i, pos := range ps {
		if i >= len(after) || math.Abs(float64(pos.notch.Reverser)) != 1 {
			continue
		}
		a := after[i]
		mean := (a.Front.LeadMM + a.Back.LeadMM) / 2
		if math.Abs(mean-target) <= targetMissMM {
			continue
		}
		why := targetWhy(kind, sheaveFor(kind, ks, pos.notch.Reverser), steps, target > mean, unit)
		give := fmt.Sprintf("%s in %s (%s front, %s back)", length(mean, unit), pos.name(), length(a.Front.LeadMM, unit), length(a.Back.LeadMM, unit))
		if n := len(whys); n > 0 && whys[n-1] == why {
			where[n-1] += " and " + pos.name()
			gives[n-1] += " and " + give
			continue
		}
		whys, where, gives = append(whys, why), append(where, pos.name()), append(gives, give)
	}
	var out []string
	for k, why := range whys {
		out = append(out, fmt.Sprintf("The target lead of %s is not met in %s: %s. The plan gives %s.", length(target, unit), where[k], why, gives[k]))
	}
	return out
}

// sheaveFor returns the knob of the eccentric sheave that sets the lead
// in the full gear of reverser r (a Stephenson gear's backward sheave in
// full back, else the forward or only one), or nil when the profile
// lists none the plan may turn.
func sheaveFor(kind string, ks []knob, r setting.Reverser) *knob {
	want := pEccFwd
	if kind == setting.KindStephenson && r < 0 {
		want = pEccBack
	}
	for i := range ks {
		if ks[i].p == want && !(ks[i].adj.Min == 0 && ks[i].adj.Max == 0) {
			return &ks[i]
		}
	}
	return nil
}

// targetWhy says why a target lead is missed where sheave (nil: none the
// plan may turn) sets the lead; more says the lead wanted is more than
// the plan gives.
func targetWhy(kind string, sheave *knob, steps []Step, more bool, unit session.Unit) string {
	switch {
	case kind == setting.KindWalschaerts:
		return "on Walschaerts gear the combination lever's proportions set the lead, the same in every position; only a new lever changes it"
	case sheave == nil && kind == setting.KindStephenson:
		return "only turning an eccentric sheave changes the lead in its gear, and the engine's profile lets the plan turn none"
	case sheave == nil:
		return "only turning the eccentric sheave changes the lead, and the engine's profile does not let the plan turn it"
	}
	part := partName(sheave.adj, kind)
	turned := 0.0
	for _, s := range steps {
		if s.Kind == sheave.adj.Kind && s.Eccentric == sheave.adj.Eccentric {
			turned = s.Amount
		}
	}
	// Advancing a sheave gives more lead in the gear it drives.
	next := turned - sheave.step
	if more {
		next = turned + sheave.step
	}
	switch {
	case next <= sheave.adj.Max+1e-9 && next >= sheave.adj.Min-1e-9:
		return fmt.Sprintf("the %s turns in whole steps, and a step nearer would leave the ends further apart", part)
	case turned == 0:
		return fmt.Sprintf("the limit the profile gives the %s is less than one of its steps (%s)", part, strings.TrimPrefix(handStepWords(*sheave, unit), "each "))
	}
	return fmt.Sprintf("the %s stops at its last whole step within the limit the profile gives it", part)
}
