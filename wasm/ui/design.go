package ui

import (
	"math"

	"evenbeat/setting"
)

// A new engine is set up from what a setter measures or reads off the
// drawing; everything else the model needs is derived (setting.Derive)
// or placed by a rule stated here, and shown for the setter to override.
// The solver that derives starts from a first guess of each derived part,
// worked out here from the dimensions given; the guesses are never kept
// as values of their own.

// placeReverser places a Stephenson gear's weighshaft where a setter
// cannot easily measure it, when it was not given (left at the axle
// centre): level with the top of a lifting link that hangs upright from
// the reverse arm to the link's middle, the arm level and pointing forward
// in mid gear, so that the weighshaft stands one arm's length behind the
// link (the usual layout of an inside Stephenson gear; common practice,
// no source). The link is hung by its middle and the die's guide is the
// line through the axle centre unless given otherwise.
func placeReverser(g *setting.Stephenson) {
	if g.Weighshaft != (setting.Point{}) {
		return
	}
	linkU := g.Forward.Rod
	if g.ValveCentreU > 0 {
		linkU = g.ValveCentreU
	}
	g.Weighshaft = setting.Point{U: linkU - g.ReverseArm, W: g.Guide + g.Link.Suspension.W + g.LiftingLink}
}

// seedDerived gives each part the design derives a first guess to start
// the solver from, when it has none: the advances from lap + lead
// (setting.AdvanceFor), the valve centred about where the rod puts the
// valve pin, a Stephenson reverse arm swinging a third of a right angle,
// a Walschaerts return crank leading the main crank by about 150 degrees.
// Parts the setter gave are left alone (their keys are not in derived).
func seedDerived(spec *setting.EngineSpec, d setting.Design) {
	derived := map[string]bool{}
	for _, k := range d.Derived {
		derived[k] = true
	}
	lap := (spec.Valve.Front.SteamLap + spec.Valve.Back.SteamLap) / 2
	advance := func(x *setting.Eccentric, key string) {
		if !derived[key] {
			return
		}
		a, err := setting.AdvanceFor(lap+d.Lead, x.Throw)
		if err != nil {
			a = 30
		}
		x.Advance = a
	}
	guess := func(key string, p *float64, v float64) {
		if derived[key] && (*p == 0 || math.IsNaN(*p)) {
			*p = v
		}
	}
	adm := spec.Valve.Admission
	switch g := spec.Gear; g.Kind {
	case setting.KindSingleEccentric:
		e := g.SingleEccentric
		e.Admission = adm
		advance(&e.Eccentric, "gear.single_eccentric.eccentric.advance")
		guess("gear.single_eccentric.valve_centre_u", &e.ValveCentreU, e.Eccentric.Rod)
	case setting.KindStephenson:
		s := g.Stephenson
		s.Admission = adm
		advance(&s.Forward, "gear.stephenson.forward.advance")
		advance(&s.Backward, "gear.stephenson.backward.advance")
		guess("gear.stephenson.backward.rod", &s.Backward.Rod, s.Forward.Rod)
		guess("gear.stephenson.valve_centre_u", &s.ValveCentreU, s.Forward.Rod)
		swing := -30.0
		if s.Crossed {
			swing = 30
		}
		guess("gear.stephenson.arm_swing", &s.ArmSwing, swing)
		placeReverser(s)
	case setting.KindWalschaerts:
		w := g.Walschaerts
		if derived["gear.walschaerts.lever.valve_pin"] {
			// Any pin on the right side of the radius-rod pin: Derive
			// sets it from lap + lead.
			w.Lever.ValvePin = w.Lever.UnionPin / 10
			if adm != setting.Internal {
				w.Lever.ValvePin = -w.Lever.ValvePin
			}
		}
		guess("gear.walschaerts.return_angle", &w.ReturnAngle, 150)
		foot := w.Trunnion.Add(w.LinkFoot)
		guess("gear.walschaerts.eccentric_rod", &w.EccentricRod, math.Hypot(foot.U, foot.W))
		guess("gear.walschaerts.radius_rod", &w.RadiusRod, w.LinkRadius)
		guess("gear.walschaerts.valve_centre_u", &w.ValveCentreU, w.Trunnion.U+w.LinkRadius)
	}
}

// deriveEngine derives the parts of spec's gear that d lists as derived,
// from a first guess (seedDerived), so that the gear as designed gives
// d's lead in full gear (setting.Derive).
func deriveEngine(spec *setting.EngineSpec, d setting.Design) error {
	seedDerived(spec, d)
	return setting.Derive(spec, d.Aims())
}
