package trial

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Given is how an engine whose drawing is given (one a setter set up,
// rather than one the bench drew) is built and measured: the driving
// wheel's diameter on the tread (mm), the dial gauge's division (mm) and
// which way its reading grows (+1 as the valve moves toward the front
// cover, -1 away), and what the setter can adjust.
type Given struct {
	WheelMM     float64
	ResMM       float64
	GaugeSign   float64
	Adjustments []session.Adjustment
}

// FromDrawing builds an engine to a given drawing, as NewEngine builds a
// drawn one: every dimension off by a build error of the sizes NewEngine
// uses (scaled with the crank the same way), the errors the planner's fit
// does not model among them (an eccentric's throw, the laps, a Stephenson
// gear's lifting link, link and reverse arm, a Walschaerts return
// crank's throw, lever pins, union link, crosshead arm and trunnion, the
// die's place in the link at each notch), the valve off on its spindle,
// and the measuring set-up of g with a random gauge zero, a gauge a
// little out of square and marks scribed to a few tenths of a millimetre.
// The drawing must be valid; the engine as built must go round and open
// both ports in every planned position, with each adjuster moved a little
// either way, or an error says why.
func FromDrawing(r *rand.Rand, drawing setting.EngineSpec, g Given) (Engine, error) {
	if err := drawing.Validate(); err != nil {
		return Engine{}, fmt.Errorf("the drawing: %w", err)
	}
	s := drawing.Engine.CrankRadius / 22
	e := Engine{Kind: drawing.Gear.Kind, Size: "as given", Scale: s, Drawing: drawing, WheelMM: g.WheelMM,
		RevErr: map[setting.Reverser]float64{}, Adjustments: g.Adjustments, Positions: positionsOf(drawing)}
	t := drawing
	k := math.Pow(s, 0.7)
	// Each entry: a dimension of the truth and its error's standard
	// deviation (mm for a 5 in gauge engine, scaled by k; degrees when
	// angle is set).
	type build struct {
		p     *float64
		sd    float64
		angle bool
	}
	errs := []build{{&t.Engine.CrankRadius, 0.02, false}, {&t.Engine.RodLength, 0.2, false},
		{&t.Valve.Front.SteamLap, 0.05, false}, {&t.Valve.Back.SteamLap, 0.05, false},
		{&t.Valve.Front.ExhaustLap, 0.05, false}, {&t.Valve.Back.ExhaustLap, 0.05, false}}
	ecc := func(x *setting.Eccentric, adv float64) []build {
		return []build{{&x.Advance, adv, true}, {&x.Rod, 0.3, false}, {&x.Throw, 0.05, false}}
	}
	switch t.Gear.Kind {
	case setting.KindSingleEccentric:
		gs := *t.Gear.SingleEccentric
		t.Gear.SingleEccentric = &gs
		errs = append(append(errs, ecc(&gs.Eccentric, 1.5)...), build{&gs.Guide, 0.3, false})
	case setting.KindStephenson:
		gs := *t.Gear.Stephenson
		t.Gear.Stephenson = &gs
		errs = append(append(append(errs, ecc(&gs.Forward, 1.2)...), ecc(&gs.Backward, 1.2)...),
			build{&gs.LiftingLink, 0.5, false}, build{&gs.Link.Suspension.U, 0.3, false}, build{&gs.Link.Suspension.W, 0.3, false},
			build{&gs.Link.Radius, 0.5, false}, build{&gs.Link.PinSpacing, 0.1, false}, build{&gs.MidArmAngle, 0.5, true},
			build{&gs.ReverseArm, 0.2, false}, build{&gs.Weighshaft.U, 0.3, false}, build{&gs.Weighshaft.W, 0.3, false})
	case setting.KindWalschaerts:
		gs := *t.Gear.Walschaerts
		t.Gear.Walschaerts = &gs
		errs = append(errs, build{&gs.ReturnAngle, 1, true}, build{&gs.EccentricRod, 0.3, false}, build{&gs.RadiusRod, 0.3, false},
			build{&gs.ReturnCrank, 0.2, false}, build{&gs.Lever.ValvePin, 0.08, false}, build{&gs.Lever.UnionPin, 0.2, false},
			build{&gs.UnionLink, 0.3, false}, build{&gs.CrossheadArm.W, 0.2, false}, build{&gs.CrossheadArm.U, 0.2, false},
			build{&gs.Trunnion.U, 0.2, false}, build{&gs.Trunnion.W, 0.2, false}, build{&gs.LinkFoot.W, 0.2, false},
			build{&gs.LinkRadius, 0.5, false}, build{&gs.FullGearDie, 0.2, false})
	default:
		return Engine{}, fmt.Errorf("unknown gear kind %q", t.Gear.Kind)
	}
	for _, b := range errs {
		sd := b.sd * k
		if b.angle {
			sd = b.sd
		}
		*b.p += normal(r, sd)
	}
	e.ValveOffsetMM = normal(r, 0.25) * k
	e.Errors = append(e.Errors, fmt.Sprintf("valve on spindle %+.2f mm; every dimension off by a build error", e.ValveOffsetMM))
	e.Truth = t
	if e.Kind != setting.KindSingleEccentric {
		e.dieErrors(r)
	}
	if err := e.checkBuilt(); err != nil {
		return Engine{}, err
	}
	ks := knobsOf(e.Adjustments)
	for j, a := range e.Adjustments {
		for _, sgn := range []float64{-1, 1} {
			amounts := make([]float64, len(ks))
			amounts[j] = sgn * math.Min(math.Max(-a.Min, a.Max), k)
			moved, err := e.with(ks, amounts)
			if err == nil {
				_, err = moved.diffs()
			}
			if err != nil {
				return Engine{}, fmt.Errorf("as built, the gear does not go round with the %s moved %+g: %w", a.Kind, amounts[j], err)
			}
		}
	}
	e.ResMM, e.GaugeSign = g.ResMM, g.GaugeSign
	e.GaugeZeroMM = uniform(r, 2, 8)
	e.GaugeScale = 1 - math.Abs(normal(r, 0.005))
	e.DatumDeg = uniform(r, -15, 15)
	mm := func(x float64) float64 { return session.TyreToDeg(x, e.WheelMM) }
	e.MarkSDDeg = mm(uniform(r, 0.15, 0.4))
	e.SetSDDeg = mm(uniform(r, 0.1, 0.25))
	e.CrossheadSDMM = 0.01 * math.Sqrt(s)
	return e, nil
}

// DeadCentresRound is the round a setter takes first: the port marks,
// the dead centres bracketed on the tyre (mm round it) and the gauge at
// each dead centre in every planned position; no sweep, cut-off or
// feeler, nothing mistyped.
func DeadCentresRound() Round { return Round{Wild: -1, Tyre: true} }

// LeadDiffs returns the engine's true front-minus-back lead differences (mm)
// in each planned position, in Positions' order, as it stands.
func (e Engine) LeadDiffs() ([]float64, error) {
	d, err := e.diffs()
	return d.Lead, err
}

// Made returns the engine after a plan's rounded steps are made on it, as
// the planner's sign conventions say; a step of an adjustment the engine
// does not list is an error.
func (e Engine) Made(steps []plan.Step) (Engine, error) {
	ks := knobsOf(e.Adjustments)
	amounts := make([]float64, len(ks))
	for _, st := range steps {
		i := slices.Index(ks, knob{st.Kind, st.Eccentric})
		if i < 0 {
			return e, fmt.Errorf("the plan changes %s %s, which the engine's adjustments do not list", st.Eccentric, st.Kind)
		}
		amounts[i] += st.Amount
	}
	return e.with(ks, amounts)
}
