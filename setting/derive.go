package setting

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
)

// A setter knows an engine by what can be measured on it or read off a
// drawing: stroke, valve travel, laps, the lead the drawing asks for, the
// eccentrics' throws, rod and link lengths, roughly where the reverser's
// parts sit. The model needs more: where the valve is central on its
// spindle, each eccentric's angle of advance, a Stephenson reverse arm's
// mid-gear angle and swing, a Walschaerts return crank's angle, eccentric
// rod, radius rod and combination lever. The functions here derive those
// so that the gear AS DESIGNED works (the primer's section 9), each by a
// rule stated with it; the fit then finds how the engine as built
// differs. Each changes the spec in place and says what it set.

// AdvanceFor returns the angle of advance (degrees) that gives lap + lead
// at dead centre from an eccentric of the given throw, with infinite rods:
// sin(advance) = (lap + lead) / throw (the textbook relation; see the
// published checks). It is an error when lap + lead is not less than the
// throw: the valve would never reach the port.
func AdvanceFor(lapPlusLead, throw float64) (float64, error) {
	if !(throw > 0) || !(math.Abs(lapPlusLead) < throw) {
		return 0, &Error{"throw", fmt.Sprintf("Lap and lead together (%.2f mm) must be less than the eccentric's throw (%.2f mm): half the valve travel must reach past the lap.", lapPlusLead, throw)}
	}
	return math.Asin(lapPlusLead/throw) * 180 / math.Pi, nil
}

// valveCentre returns a pointer to the gear's valve central position.
func valveCentre(g GearSpec) *float64 {
	switch g.Kind {
	case KindSingleEccentric:
		if g.SingleEccentric != nil {
			return &g.SingleEccentric.ValveCentreU
		}
	case KindStephenson:
		if g.Stephenson != nil {
			return &g.Stephenson.ValveCentreU
		}
	case KindWalschaerts:
		if g.Walschaerts != nil {
			return &g.Walschaerts.ValveCentreU
		}
	}
	return nil
}

// CentreValve sets the valve's central position (the valve-rod or
// spindle length) so that the valve's mean place at the two dead centres
// in full forward gear is central: with equal laps that gives equal leads
// (the designer's rule). It returns the position set (mm).
func CentreValve(spec *EngineSpec) (float64, error) {
	c, err := spec.Engine.Prepare()
	if err != nil {
		return 0, within("engine", err)
	}
	u := valveCentre(spec.Gear)
	if u == nil {
		return 0, &Error{"gear", "The gear has no valve central position to set."}
	}
	for it := 0; it < 4; it++ {
		g, err := spec.Gear.Gear()
		if err != nil {
			return 0, within("gear", err)
		}
		a, err1 := g.Valve(spec.Engine, 0, 1)
		b, err2 := g.Valve(spec.Engine, c.BackDeadCentre(), 1)
		if err := firstError(err1, err2); err != nil {
			return 0, within("gear", err)
		}
		// Every gear reads the valve as (pin U - ValveCentreU).
		m := (a + b) / 2
		*u += m
		if math.Abs(m) < 1e-9 {
			break
		}
	}
	return *u, nil
}

// meanLead returns the mean of the two leads in full gear running dir
// (full forward, or full back for Backward) with the valve where it is.
func meanLead(spec EngineSpec, dir Direction) (float64, error) {
	c, err := spec.Engine.Prepare()
	if err != nil {
		return 0, err
	}
	g, err := spec.Gear.Gear()
	if err != nil {
		return 0, err
	}
	r := Reverser(1)
	if dir == Backward {
		r = -1
	}
	s := 0.0
	for _, end := range []CylinderEnd{Front, Back} {
		x, err := g.Valve(spec.Engine, c.DeadCentre(end), r)
		if err != nil {
			return 0, err
		}
		s += spec.Valve.SteamEdge(end, x)
	}
	return s / 2, nil
}

// setAdvances sets the angle of advance of a single-eccentric or
// Stephenson gear's eccentrics so that the mean lead in full gear (full
// forward for the forward eccentric, full back for the backward one) is
// the aimed lead, with the valve centred (CentreValve): from the textbook
// relation, then by the secant method on the linkage itself (finite rods,
// the link's geometry). Parts the aims keep are left as given.
func setAdvances(spec *EngineSpec, aims Aims) error {
	lap := (spec.Valve.Front.SteamLap + spec.Valve.Back.SteamLap) / 2
	type ecc struct {
		x   *Eccentric
		dir Direction
		key string
	}
	var es []ecc
	centre := "gear.single_eccentric.valve_centre_u"
	switch g := spec.Gear; g.Kind {
	case KindSingleEccentric:
		es = append(es, ecc{&g.SingleEccentric.Eccentric, Forward, "gear.single_eccentric.eccentric.advance"})
	case KindStephenson:
		centre = "gear.stephenson.valve_centre_u"
		es = append(es, ecc{&g.Stephenson.Forward, Forward, "gear.stephenson.forward.advance"},
			ecc{&g.Stephenson.Backward, Backward, "gear.stephenson.backward.advance"})
	}
	for _, e := range es {
		if aims.derives(e.key) {
			a, err := AdvanceFor(lap+aims.Lead, e.x.Throw)
			if err != nil {
				return within(strings.TrimSuffix(e.key, ".advance"), err)
			}
			e.x.Advance = a
		}
	}
	// The forward eccentric first (it sets the valve's centre), then
	// the backward one against the same centre; again while the second
	// moves the first (a Stephenson die short of the rod pin feels both).
	var out [2]float64
	for pass := 0; pass < 6; pass++ {
		last := out
		for k, e := range es {
			centres := k == 0 && aims.derives(centre)
			if !aims.derives(e.key) {
				if centres {
					if _, err := CentreValve(spec); err != nil {
						return err
					}
				}
				continue
			}
			f := func(adv float64) (float64, error) {
				e.x.Advance = adv
				if centres {
					if _, err := CentreValve(spec); err != nil {
						return 0, err
					}
				}
				m, err := meanLead(*spec, e.dir)
				return m - aims.Lead, err
			}
			a, err := secant(f, e.x.Advance, 1, 1e-9)
			if err != nil {
				return err
			}
			if !(math.Abs(a) < 89) {
				return &Error{e.key, fmt.Sprintf("No angle of advance gives a lead of %.2f mm with these laps and throws.", aims.Lead)}
			}
			out[k] = a
		}
		if len(es) == 1 || math.Abs(out[0]-last[0])+math.Abs(out[1]-last[1]) < 1e-8 {
			break
		}
	}
	return nil
}

// secant finds x near x0 with |f(x)| <= tol by the secant method, first
// step dx. Where f fails (out of the linkage's reach) the step is halved
// back. It leaves f evaluated at the x returned, since f may set state.
func secant(f func(float64) (float64, error), x0, dx, tol float64) (float64, error) {
	f0, err := f(x0)
	if err != nil {
		return x0, err
	}
	x1 := x0 + dx
	for it := 0; it < 40 && math.Abs(f0) > tol; it++ {
		f1, err := f(x1)
		if err != nil {
			x1 = (x0 + x1) / 2
			continue
		}
		if f1 == f0 {
			break
		}
		x0, x1, f0 = x1, x1-f1*(x1-x0)/(f1-f0), f1
	}
	_, err = f(x0)
	return x0, err
}

// DieShare returns a Stephenson gear's die block's place in the link at
// crank angle th with the reverser at r: its distance from the link's
// middle toward the forward rod's pin, as a share of the middle-to-pin
// distance (+1 at the forward pin, -1 at the backward one).
func (g Stephenson) DieShare(e Engine, th float64, r Reverser) (float64, error) {
	p, err := g.solve(e, th, r, false)
	if err != nil {
		return 0, err
	}
	d := p.fwdPin.Sub(p.centre)
	return p.die.Sub(p.centre).Dot(d) / d.Dot(d), nil
}

// meanShare returns DieShare averaged over a turn (12 crank angles).
func (g Stephenson) meanShare(e Engine, r Reverser) (float64, error) {
	s := 0.0
	for k := 0; k < 12; k++ {
		v, err := g.DieShare(e, float64(k)*30, r)
		if err != nil {
			return 0, err
		}
		s += v
	}
	return s / 12, nil
}

// setReverser sets a Stephenson gear's reverse arm so that in mid gear the
// die stands, over a turn, at the link's middle (MidArmAngle) and in full
// forward gear at the aimed share of the way to the forward rod's pin
// (ArmSwing; 1 puts it at the pin, as most drawings do; less keeps a
// clearance short of the slot's end). Full back is then the same swing the
// other way.
func setReverser(spec *EngineSpec, aims Aims) error {
	g := spec.Gear.Stephenson
	share := aims.FullGearShare
	if share == 0 {
		share = 1
	}
	if !(share > 0 && share <= 1.2) {
		return &Error{"design.full_gear_share", fmt.Sprintf("The die's place in full gear must be a share of the way to the rod pin, more than 0 and at most 1.2 (got %g).", share)}
	}
	solve := func(key string, x *float64, r Reverser, want float64) error {
		if !aims.derives(key) {
			return nil
		}
		_, err := secant(func(v float64) (float64, error) {
			*x = v
			s, err := g.meanShare(spec.Engine, r)
			return s - want, err
		}, *x, 2, 1e-7)
		return within(key, err)
	}
	return firstError(solve("gear.stephenson.mid_arm_angle", &g.MidArmAngle, 0, 0),
		solve("gear.stephenson.arm_swing", &g.ArmSwing, 1, share))
}

// designWalschaerts sets a Walschaerts gear's parts that follow from the
// rest: the combination lever's valve pin from lap + lead (its ratio to the
// union pin is (lap + lead) / crank radius, C4), the return crank's angle
// and the eccentric rod's length that put the link at the middle of its
// swing at both dead centres (CentreLink), the radius rod equal to the
// link's radius (so the valve stands still when the reverser moves on a
// dead centre), and the valve centred. The lever keeps its union-pin
// distance; the return crank its throw; parts the aims keep stay as given.
//
// Two return-crank angles, about half a turn apart, centre the link; one
// runs the engine forward in full forward gear, the other backward (its
// full-forward cut-off running forward near nothing). When the angle is
// derived both are tried and the one whose full-forward cut-off running
// forward lies nearest the middle of the usual band is taken, so that a
// setter need not know which side the return crank points.
func designWalschaerts(spec *EngineSpec, aims Aims) error {
	g := spec.Gear.Walschaerts
	const p = "gear.walschaerts."
	if aims.derives(p + "lever.valve_pin") {
		lap := (spec.Valve.Front.SteamLap + spec.Valve.Back.SteamLap) / 2
		lever, err := DesignLever(lap, aims.Lead, spec.Engine.CrankRadius, g.Lever.UnionPin, spec.Valve.Admission == Internal)
		if err != nil {
			return leverError(err)
		}
		g.Lever = lever
	}
	if aims.derives(p + "radius_rod") {
		g.RadiusRod = g.LinkRadius
	}
	if aims.derives(p+"return_angle") || aims.derives(p+"eccentric_rod") {
		w, err := centredLink(spec, aims)
		if err != nil {
			return within("gear.walschaerts", err)
		}
		if aims.derives(p + "return_angle") {
			g.ReturnAngle = w.ReturnAngle
		}
		if aims.derives(p + "eccentric_rod") {
			g.EccentricRod = w.EccentricRod
		}
	}
	if aims.derives(p + "valve_centre_u") {
		if _, err := CentreValve(spec); err != nil {
			return err
		}
	}
	return nil
}

// leverError places an error of DesignLever on the engine's key that
// holds the value at fault: the design's lead (lap and lead against the
// crank), the crank radius, or the lever's union-pin distance.
func leverError(err error) error {
	var e *Error
	if !errors.As(err, &e) {
		return within("gear.walschaerts.lever", err)
	}
	switch e.Field {
	case "steam_lap":
		return &Error{"design.lead", e.Message + " Check the lead the design asks for (mm) and the steam laps."}
	case "crank_radius":
		return &Error{"engine.crank_radius", e.Message}
	}
	return &Error{"gear.walschaerts.lever." + e.Field, e.Message}
}

// centredLink returns the Walschaerts gear with the return crank's angle
// and the eccentric rod that centre the link (CentreLink). With the angle
// kept, that from the angle given; with it derived, of the two that centre
// the link the one that runs the engine forward in full forward gear (see
// designWalschaerts).
func centredLink(spec *EngineSpec, aims Aims) (Walschaerts, error) {
	g := *spec.Gear.Walschaerts
	first, err := g.CentreLink(spec.Engine)
	if err != nil || !aims.derives("gear.walschaerts.return_angle") {
		return first, err
	}
	g.ReturnAngle += 180
	other, err := g.CentreLink(spec.Engine)
	if err != nil || math.Abs(math.Remainder(other.ReturnAngle-first.ReturnAngle, 360)) < 1e-6 {
		return first, nil
	}
	best, bestOff := first, math.Inf(1)
	for _, w := range []Walschaerts{first, other} {
		trial := spec.Clone()
		t := trial.Gear.Walschaerts
		t.ReturnAngle, t.EccentricRod = w.ReturnAngle, w.EccentricRod
		if aims.derives("gear.walschaerts.valve_centre_u") {
			if _, err := CentreValve(&trial); err != nil {
				continue
			}
		}
		if cut, ok := forwardCutOff(trial); ok && math.Abs(cut-designCutOffMiddle) < bestOff {
			best, bestOff = w, math.Abs(cut-designCutOffMiddle)
		}
	}
	return best, nil
}

// forwardCutOff returns the mean cut-off (% of the stroke) of both ends
// in full forward gear running forward; false when a port never opens or
// never closes there.
func forwardCutOff(s EngineSpec) (float64, bool) {
	g, err := s.Gear.Gear()
	if err != nil {
		return 0, false
	}
	set, err := Events(s.Engine, s.Valve, func(th float64) (float64, error) { return g.Valve(s.Engine, th, 1) }, Forward)
	if err != nil {
		return 0, false
	}
	f, b := set.End(Front), set.End(Back)
	if f.NeverOpens || b.NeverOpens || f.NeverCloses || b.NeverCloses {
		return 0, false
	}
	return (f.CutOff.StrokePercent + b.CutOff.StrokePercent) / 2, true
}

// Full-gear cut-off band a design is held to (the primer's section 9,
// common practice: about 65-85 % of the stroke).
const (
	designCutOffLow, designCutOffHigh = 65.0, 85.0
	designCutOffMiddle                = (designCutOffLow + designCutOffHigh) / 2
)

// Works checks that an engine as designed works, not only that its
// linkage closes: both ports open to steam in full gear running each way
// the gear runs, and the full-gear cut-off lies in a sensible band (65 to
// 85 % of the stroke). Each failure is an *Error naming the dimension most
// likely wrong, in words, its Field that end's steam lap
// ("valve.front.steam_lap"), or the field Validate names. A nil result
// means it works. WorkChecks says which failures forbid a plan.
func (s EngineSpec) Works() []error {
	refusals, warnings := s.WorkChecks()
	return append(refusals, warnings...)
}

// WorkChecks is Works told apart by weight. Refusals: the spec does not
// validate, or a port never opens to steam in full gear; the engine as
// described could not run, so a plan fitted to it would mislead (the
// session's Readiness blocks the plan). Warnings: a full-gear cut-off
// outside 65 to 85 % of the stroke, or a port that never closes (cut-off
// at the end of the stroke); possible, but a dimension is likely wrong.
func (s EngineSpec) WorkChecks() (refusals, warnings []error) {
	invalid, refusals, warnings := s.CheckWork()
	if invalid != nil {
		return []error{invalid}, nil
	}
	return refusals, warnings
}

// CheckWork is WorkChecks with Validate's error apart: when the spec
// does not validate, invalid is the error and there is nothing else.
func (s EngineSpec) CheckWork() (invalid error, refusals, warnings []error) {
	if err := s.Validate(); err != nil {
		return err, nil, nil
	}
	g, _ := s.Gear.Gear()
	dirs := []struct {
		r Reverser
		d Direction
	}{{1, Forward}, {-1, Backward}}
	if s.Gear.Kind == KindSingleEccentric && s.Gear.SingleEccentric != nil && !s.Gear.SingleEccentric.Slip {
		dirs = dirs[:1]
	}
	travel := "the eccentric's throw"
	if s.Gear.Kind == KindWalschaerts {
		travel = "the die's place in full gear (full_gear_die) or the return crank's throw"
	}
	for _, p := range dirs {
		set, err := Events(s.Engine, s.Valve, func(th float64) (float64, error) { return g.Valve(s.Engine, th, p.r) }, p.d)
		if err != nil {
			refusals = append(refusals, err)
			continue
		}
		name := "full forward"
		if p.d == Backward {
			name = "full back"
		}
		for _, end := range []CylinderEnd{Front, Back} {
			e := set.End(end)
			lap := fmt.Sprintf("valve.%s.steam_lap", end)
			switch {
			case e.NeverOpens:
				refusals = append(refusals, &Error{lap, fmt.Sprintf("In %s the %s port never opens to steam: the %s steam lap is more than the valve travels past centre, or the valve is off centre. Check the %s steam lap, %s, and the valve's central position (the valve-rod or spindle length).", name, end, end, end, travel)})
			case e.NeverCloses:
				warnings = append(warnings, &Error{lap, fmt.Sprintf("In %s the %s port never closes to steam: the %s steam lap is too small for the travel. Check the %s steam lap and %s.", name, end, end, end, travel)})
			case e.CutOff.StrokePercent < designCutOffLow:
				warnings = append(warnings, &Error{lap, fmt.Sprintf("In %s the %s cut-off is %.0f %% of the stroke; %.0f to %.0f %% is usual, so that the engine starts: the travel is short for the laps. Check %s and the %s steam lap.", name, end, e.CutOff.StrokePercent, designCutOffLow, designCutOffHigh, travel, end)})
			case e.CutOff.StrokePercent > designCutOffHigh:
				warnings = append(warnings, &Error{lap, fmt.Sprintf("In %s the %s cut-off is %.0f %% of the stroke; %.0f to %.0f %% is usual: the travel is long for the laps. Check %s and the %s steam lap.", name, end, e.CutOff.StrokePercent, designCutOffLow, designCutOffHigh, travel, end)})
			}
		}
	}
	return nil, refusals, warnings
}

// equalBackLeads sets a Stephenson gear's backward eccentric rod so that
// the two leads in full back are equal, as a drawing's rods are set
// (E. L. Ahrons: the eccentric rod's length shares the lead between the
// ends). The valve's centre stays where full forward put it.
func equalBackLeads(spec *EngineSpec) error {
	g := spec.Gear.Stephenson
	_, err := secant(func(l float64) (float64, error) {
		g.Backward.Rod = l
		c, err := spec.Engine.Prepare()
		if err != nil {
			return 0, err
		}
		gear, err := spec.Gear.Gear()
		if err != nil {
			return 0, err
		}
		var lead [2]float64
		for k, end := range []CylinderEnd{Front, Back} {
			x, err := gear.Valve(spec.Engine, c.DeadCentre(end), -1)
			if err != nil {
				return 0, err
			}
			lead[k] = spec.Valve.SteamEdge(end, x)
		}
		return lead[0] - lead[1], nil
	}, g.Backward.Rod, 0.5, 1e-9)
	return within("gear.stephenson.backward.rod", err)
}

// Aims are what a design sets out to give, beside the dimensions a setter
// measures: the lead in full gear (mm) and, for Stephenson gear, the die's
// place in full gear as a share of the way to the rod pin (0 means 1).
// Keep, when not nil, names the derivable parts to leave as given (by
// their engine-file keys, as DerivableKeys lists them): a value the setter
// measured or overrode.
type Aims struct {
	Lead          float64
	FullGearShare float64
	Keep          func(key string) bool
}

// Design is what an engine's drawing asks of its gear, kept with the
// engine beside the dimensions: the lead in full gear (mm), for Stephenson
// gear the die's place in full gear (a share of the way to the rod pin; 0
// means 1), and which of the derivable parts (DerivableKeys) were derived
// rather than measured or given, so that a change of a dimension derives
// them again and leaves the rest alone.
type Design struct {
	Lead          float64  `json:"lead"`
	FullGearShare float64  `json:"full_gear_share,omitempty"`
	Derived       []string `json:"derived,omitempty"`
}

// Bounds of a design's lead (mm): further from zero is a typing slip, not
// a lead (the session file's target lead has the same bounds).
const (
	minDesignLead, maxDesignLead = -5.0, 25.0
)

// validate checks a design for a gear of the given kind: a lead within
// its bounds, a full-gear share only for Stephenson gear (more than 0 and
// at most 1.2), and derived parts that the gear has (DerivableKeys), each
// listed once. Fields are under the design ("lead", "derived[2]").
func (d Design) validate(kind string) error {
	if !(d.Lead >= minDesignLead && d.Lead <= maxDesignLead) {
		return &Error{"lead", fmt.Sprintf("The lead the design asks for must be from %g to %g mm (got %g); give the lead in full gear in mm, 0 for line and line.", minDesignLead, maxDesignLead, d.Lead)}
	}
	switch {
	case d.FullGearShare != 0 && kind != KindStephenson:
		return &Error{"full_gear_share", "The die's place in full gear is a Stephenson link's; this gear has no such link, so remove \"full_gear_share\"."}
	case d.FullGearShare != 0 && !(d.FullGearShare > 0 && d.FullGearShare <= 1.2):
		return &Error{"full_gear_share", fmt.Sprintf("The die's place in full gear must be a share of the way to the rod pin, more than 0 and at most 1.2 (got %g); 1 puts the die at the pin.", d.FullGearShare)}
	}
	keys := DerivableKeys(kind)
	for i, k := range d.Derived {
		field := fmt.Sprintf("derived[%d]", i)
		if !slices.Contains(keys, k) {
			return &Error{field, fmt.Sprintf("The part %q is not one Evenbeat derives for this gear; the parts it derives are: %s.", k, strings.Join(keys, ", "))}
		}
		if slices.Contains(d.Derived[:i], k) {
			return &Error{field, fmt.Sprintf("The part %q is listed twice as derived; keep one.", k)}
		}
	}
	return nil
}

// Aims returns the aims that derive the parts d lists as derived and keep
// the rest.
func (d Design) Aims() Aims {
	return Aims{Lead: d.Lead, FullGearShare: d.FullGearShare, Keep: func(key string) bool {
		for _, k := range d.Derived {
			if k == key {
				return false
			}
		}
		return true
	}}
}

// derives reports whether the aims let Derive set the part at key.
func (a Aims) derives(key string) bool { return a.Keep == nil || !a.Keep(key) }

// DerivableKeys returns the engine-file keys of the parts of a gear of the
// given kind that Derive sets, in the order a set-up shows them. None of
// them is easily measured on the engine; the Stephenson backward rod and
// the Walschaerts rods are, but a drawing sets them from the rest (the
// backward rod for equal leads in full back, the eccentric rod for a
// central link at both dead centres, the radius rod to the link's radius).
func DerivableKeys(kind string) []string {
	switch kind {
	case KindSingleEccentric:
		return []string{"gear.single_eccentric.eccentric.advance", "gear.single_eccentric.valve_centre_u"}
	case KindStephenson:
		const p = "gear.stephenson."
		return []string{p + "forward.advance", p + "backward.advance", p + "mid_arm_angle", p + "arm_swing", p + "backward.rod", p + "valve_centre_u"}
	case KindWalschaerts:
		const p = "gear.walschaerts."
		return []string{p + "lever.valve_pin", p + "return_angle", p + "eccentric_rod", p + "radius_rod", p + "valve_centre_u"}
	}
	return nil
}

// Derive sets every part of spec's gear that a setter does not measure
// (DerivableKeys), but those aims.Keep holds, so that the gear as designed
// gives the aims: a single eccentric's advance and the valve's centre; a
// Stephenson gear's reverse arm, both advances and the backward rod (in
// turn until they agree, since each moves the others a little); a
// Walschaerts gear's lever, return crank, eccentric rod, radius rod and
// valve centre. The dimensions a setter measures are left as they are.
func Derive(spec *EngineSpec, aims Aims) error {
	if _, gear, err := spec.Gear.member(); err != nil || gear == nil {
		if err == nil {
			err = &Error{"", fmt.Sprintf("The %s gear's dimensions are missing.", spec.Gear.Kind)}
		}
		return within("gear", err)
	}
	switch spec.Gear.Kind {
	case KindSingleEccentric:
		return setAdvances(spec, aims)
	case KindStephenson:
		g := spec.Gear.Stephenson
		last := [3]float64{math.NaN()}
		for it := 0; it < 8; it++ {
			if err := setReverser(spec, aims); err != nil {
				return err
			}
			if err := setAdvances(spec, aims); err != nil {
				return err
			}
			if aims.derives("gear.stephenson.backward.rod") {
				if err := equalBackLeads(spec); err != nil {
					return err
				}
			}
			now := [3]float64{g.Forward.Advance, g.Backward.Advance, g.Backward.Rod}
			if math.Abs(now[0]-last[0])+math.Abs(now[1]-last[1])+math.Abs(now[2]-last[2]) < 1e-7 {
				break
			}
			last = now
		}
		return nil
	case KindWalschaerts:
		return designWalschaerts(spec, aims)
	}
	return &Error{"gear.kind", fmt.Sprintf("The gear kind %q has nothing to derive.", spec.Gear.Kind)}
}

// DefaultKeys returns the engine-file keys that an engine file with a
// design may leave out because they have a usual value that a setter need
// not give, for a gear of the given kind: the demo mark (not invented),
// the cylinder's inclination and offset (level, on the axle's line: 0),
// both exhaust laps (0, line and line), and for a single eccentric or a
// Stephenson gear the gear's admission (the valve's), the valve guide's
// height (0: in line with the axle), a fixed eccentric (not slipping) and
// for Stephenson open rods and a link hung by its middle (suspension 0,
// 0). A Walschaerts gear's parts are all measured or derived.
func DefaultKeys(kind string) []string {
	keys := []string{"invented", "engine.inclination", "engine.offset", "valve.front.exhaust_lap", "valve.back.exhaust_lap"}
	switch kind {
	case KindSingleEccentric:
		const p = "gear.single_eccentric."
		keys = append(keys, p+"slip", p+"admission", p+"guide")
	case KindStephenson:
		const p = "gear.stephenson."
		keys = append(keys, p+"crossed", p+"admission", p+"link.suspension", p+"guide")
	}
	return keys
}

// leftOutWords says, for a key missing from an engine file without a
// design, whether a design would let it be left out: words to end the
// refusal's sentence with, or "".
func leftOutWords(key string) string {
	for _, kind := range []string{KindSingleEccentric, KindStephenson, KindWalschaerts} {
		if slices.Contains(DerivableKeys(kind), key) {
			return `, or give the engine's "design" (the lead it is drawn for) to have it derived`
		}
	}
	for _, kind := range []string{KindSingleEccentric, KindStephenson} {
		if slices.Contains(DefaultKeys(kind), key) {
			return `, or give the engine's "design" (the lead it is drawn for) to take the usual value`
		}
	}
	return ""
}

// completeDesigned fills in what an engine file with a design left out
// (omitted, by key path): the usual values of DefaultKeys (zero, which
// reading left; the gear's admission is set to the valve's), and the
// derivable parts left out, derived by Derive from a start each states
// and added to the design's derived list. The parts given are kept. The
// crank, the valve, the gear's kind and the design are checked first, so
// that a slip there is named as such rather than as a part that cannot
// be derived.
func completeDesigned(spec *EngineSpec, omitted []string) error {
	kind := spec.Gear.Kind
	if err := firstError(within("engine", spec.Engine.Validate()), within("valve", spec.Valve.Validate())); err != nil {
		return err
	}
	if _, err := spec.Gear.Gear(); err != nil {
		return within("gear", err)
	}
	if err := spec.Design.validate(kind); err != nil {
		return within("design", err)
	}
	switch g := spec.Gear; {
	case g.SingleEccentric != nil && slices.Contains(omitted, "gear.single_eccentric.admission"):
		g.SingleEccentric.Admission = spec.Valve.Admission
	case g.Stephenson != nil && slices.Contains(omitted, "gear.stephenson.admission"):
		g.Stephenson.Admission = spec.Valve.Admission
	}
	var derive []string
	for _, key := range DerivableKeys(kind) {
		if slices.Contains(omitted, key) {
			derive = append(derive, key)
		}
	}
	if len(derive) == 0 {
		return nil
	}
	startDerived(spec, derive)
	aims := spec.Design.Aims()
	aims.Keep = func(key string) bool { return !slices.Contains(derive, key) }
	if err := Derive(spec, aims); err != nil {
		return err
	}
	var listed []string
	for _, key := range DerivableKeys(kind) {
		if slices.Contains(spec.Design.Derived, key) || slices.Contains(derive, key) {
			listed = append(listed, key)
		}
	}
	spec.Design.Derived = listed
	return nil
}

// startDerived sets the derivable parts of spec listed in derive, which
// an engine file left out (zero), to where Derive starts from: the valve
// central a rod's length ahead (the eccentric rod's; a rocker's valve rod
// ahead of its pivot; Stephenson, the forward rod's; Walschaerts, the
// radius rod's ahead of the trunnion), a Stephenson backward rod as long
// as the forward one and its reverse arm standing over the link's
// suspension pin, a Walschaerts radius rod as long as the link's radius.
// Advances, the arm's swing, the lever, the return crank and its rod are
// found from scratch.
func startDerived(spec *EngineSpec, derive []string) {
	has := func(key string) bool { return slices.Contains(derive, key) }
	switch g := spec.Gear; g.Kind {
	case KindSingleEccentric:
		e := g.SingleEccentric
		if has("gear.single_eccentric.valve_centre_u") {
			e.ValveCentreU = e.Eccentric.Rod
			if e.Rocker != nil {
				e.ValveCentreU = e.Rocker.Pivot.U + e.Rocker.ValveRod
			}
		}
	case KindStephenson:
		s := g.Stephenson
		if has("gear.stephenson.backward.rod") {
			s.Backward.Rod = s.Forward.Rod
		}
		if has("gear.stephenson.valve_centre_u") {
			s.ValveCentreU = s.Forward.Rod
		}
		if has("gear.stephenson.mid_arm_angle") {
			s.MidArmAngle = s.hangingArmAngle()
		}
	case KindWalschaerts:
		w := g.Walschaerts
		if has("gear.walschaerts.radius_rod") {
			w.RadiusRod = w.LinkRadius
		}
		if has("gear.walschaerts.valve_centre_u") {
			w.ValveCentreU = w.Trunnion.U + w.RadiusRod
		}
	}
}

// hangingArmAngle returns the reverse arm's angle (degrees) that puts its
// lifting-link pin straight over (or under) the link's suspension pin,
// with the link's middle a forward rod's length ahead of the axle on the
// valve guide's line: about where a drawing's arm stands in mid gear. Of
// the two angles at that reach, the one whose pin is nearer the height
// the lifting link asks.
func (g Stephenson) hangingArmAngle() float64 {
	pin := Point{U: g.Forward.Rod + g.Link.Suspension.U, W: g.Guide + g.Link.Suspension.W}
	hang := sign(pin.W - g.Weighshaft.W) // -1: the link hangs below the weighshaft
	pin.W -= hang * g.LiftingLink
	c := math.Max(-1, math.Min(1, (pin.U-g.Weighshaft.U)/g.ReverseArm))
	a := math.Acos(c)
	if up := g.Weighshaft.W + g.ReverseArm*math.Sin(a); math.Abs(up-pin.W) > math.Abs(g.Weighshaft.W-g.ReverseArm*math.Sin(a)-pin.W) {
		a = -a
	}
	return a * 180 / math.Pi
}
