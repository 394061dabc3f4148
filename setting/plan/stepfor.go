package plan

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// StepFor returns the step a plan would hold for changing adj by amount
// (mm, or degrees for angular kinds, signed as the kind says): the amount
// rounded as a plan rounds it (whole flats of the thread, 0.5 mm round a
// sheave's rim, 0.25 degree, or 0.05 mm; see the package doc) and held
// within adj's limits by whole steps, with its turns and flats or its mm
// round the rim, worded in unit as WriteText words a plan's step. AtLimit
// is set, as in a plan, when the change reaches a limit, and also when a
// limit held it back to the last whole step inside.
//
// IdealAmount is amount; Amount is the rounded change, nought when amount
// is under half a step (the words then say the part stays as it is).
// SigmaAmount is nought: a change chosen by hand carries no error from the
// readings. The part is named by adj.Eccentric, which a session sets only
// on a Stephenson gear's eccentrics. A non-finite amount is taken as
// nought.
func StepFor(adj session.Adjustment, amount float64, unit session.Unit) Step {
	if !finite(amount) {
		amount = 0
	}
	gear := setting.KindSingleEccentric
	if adj.Eccentric != "" {
		gear = setting.KindStephenson
	}
	k := knob{adj: adj, p: -1, step: handStep(adj)}
	rounded, at := handRound(k, amount)
	st := newStep(k, gear, amount, rounded)
	st.AtLimit = st.AtLimit || at && rounded != 0
	if rounded == 0 {
		st.Words = fmt.Sprintf("Leave the %s as it is: the change is under half its smallest step, %s.", st.Part, handStepWords(k, unit))
		return st
	}
	st.Words = stepWords(st, unit)
	return st
}

// handRound rounds a change of a knob to the nearest whole number of its
// hand steps, held within the adjustment's limits by whole steps; at says
// a limit held it.
func handRound(k knob, x float64) (r float64, at bool) {
	r = math.Round(x/k.step) * k.step
	if r < k.adj.Min {
		r, at = math.Ceil(k.adj.Min/k.step-1e-9)*k.step, true
	}
	if r > k.adj.Max {
		r, at = math.Floor(k.adj.Max/k.step+1e-9)*k.step, true
	}
	return clean(r), at
}

// newStep is the step that changes knob k by rounded (the solver's ideal
// change before rounding) on a gear of kind gear: its part, sign and unit,
// its turns and flats on a thread or its mm round a sheave's rim, and
// whether it stops at the adjustment's limits. Words and SigmaAmount are
// left to the caller.
func newStep(k knob, gear string, ideal, rounded float64) Step {
	st := Step{Part: partName(k.adj, gear), Kind: k.adj.Kind, Eccentric: k.adj.Eccentric,
		Unit: "mm", Sign: signWords(k.adj.Kind, gear), IdealAmount: clean(ideal), Amount: clean(rounded)}
	if k.adj.Kind.Angular() {
		st.Unit = "deg"
		if k.adj.Kind == session.EccentricAngle && k.adj.SheaveDiameterMM > 0 {
			st.RimMM = clean(rounded * math.Pi / 180 * k.adj.SheaveDiameterMM / 2)
		}
	} else if k.adj.Thread.Pitch() > 0 {
		flats := int(math.Round(math.Abs(rounded) / k.step))
		f := k.adj.Thread.FlatsPerTurn
		if f <= 0 {
			f = defaultFlats
		}
		st.Turns, st.Flats, st.perTurn = flats/f, flats%f, f
	}
	st.AtLimit = rounded != 0 && (rounded <= k.adj.Min+1e-9 || rounded >= k.adj.Max-1e-9)
	return st
}
