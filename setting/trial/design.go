package trial

import (
	"fmt"
	"math"
	"math/rand/v2"

	"evenbeat/setting"
)

// Size is a class of engine by track gauge: the crank radii drawn for it.
type Size struct {
	Name         string
	CrankLo, Hi  float64 // crank radius range, mm
	WheelLo, WHi float64 // driving wheel diameter range, mm
}

// Sizes are the engine sizes the bench draws from: 3.5 in, 5 in and
// 7.25 in gauge and full size (crank radii common practice, no source).
var Sizes = []Size{
	{"3.5 in gauge", 11, 16, 70, 110},
	{"5 in gauge", 18, 26, 100, 160},
	{"7.25 in gauge", 28, 40, 150, 240},
	{"full size", 230, 330, 1300, 2000},
}

// design is a drawn engine before it is checked.
type design struct {
	spec  setting.EngineSpec
	scale float64 // crank radius / 22 mm: lengths of the 5 in gauge templates scale by it
	wheel float64 // driving wheel diameter, mm
	size  string
}

// uniform draws from [lo, hi).
func uniform(r *rand.Rand, lo, hi float64) float64 { return lo + (hi-lo)*r.Float64() }

// newDesign draws a random engine of the gear kind, valid and working as
// drawn: both ports open in full gear both ways and full-gear cut-off in
// 60 to 90 % (the bench's own band, wider than the 65-85 % of common
// practice so that odd engines are tried too). It tries again until one
// passes.
func newDesign(r *rand.Rand, kind string, slip bool) (design, error) {
	var last error
	for try := 0; try < 200; try++ {
		d, err := drawDesign(r, kind, slip)
		if err == nil {
			err = checkWorks(d.spec)
		}
		if err == nil {
			return d, nil
		}
		last = err
	}
	return design{}, fmt.Errorf("no working %s engine drawn: %v", kind, last)
}

// drawDesign draws one engine: a template of 5 in gauge proportions (the
// project's invented test engines), its proportions varied and scaled to a
// random size, then the valve centred and the advance or combination lever
// worked out from lap and lead as a designer would.
func drawDesign(r *rand.Rand, kind string, slip bool) (design, error) {
	sz := Sizes[r.IntN(len(Sizes))]
	R := uniform(r, sz.CrankLo, sz.Hi)
	s := R / 22
	f := func() float64 { return uniform(r, 0.92, 1.08) }
	e := setting.Engine{CrankRadius: R, RodLength: R * uniform(r, 5, 8)}
	if r.Float64() < 0.2 {
		e.Offset = uniform(r, -0.25, 0.25) * R
	}
	if r.Float64() < 0.2 {
		e.Inclination = uniform(r, -10, 10)
	}
	lap := uniform(r, 0.09, 0.13) * R
	port := lap * uniform(r, 0.8, 1.2)
	lead := uniform(r, 0.004, 0.014) * R
	exh := uniform(r, -0.01, 0.01) * R
	adm := setting.External
	if r.Float64() < 0.4 {
		adm = setting.Internal
	}
	end := setting.End{SteamLap: lap, ExhaustLap: exh, PortWidth: port, PortLength: 7 * port}
	v := setting.Valve{Admission: adm, Front: end, Back: end}
	throw := (lap + port) * uniform(r, 1.0, 1.15)
	adv := advanceFor(lap+lead, throw)
	spec := setting.EngineSpec{Name: "Trial " + kind, Invented: true, Engine: e, Valve: v}
	switch kind {
	case setting.KindSingleEccentric:
		rod := 120 * s * f()
		g := setting.SingleEccentric{Eccentric: setting.Eccentric{Throw: throw, Advance: adv, Rod: rod}, Slip: slip, Admission: adm, ValveCentreU: rod}
		spec.Gear = setting.GearSpec{Kind: kind, SingleEccentric: &g}
	case setting.KindStephenson:
		rod := 130 * s * f()
		g := setting.Stephenson{
			Forward:    setting.Eccentric{Throw: throw, Advance: adv, Rod: rod},
			Backward:   setting.Eccentric{Throw: throw, Advance: adv, Rod: rod},
			Crossed:    r.Float64() < 0.25,
			Admission:  adm,
			Link:       setting.ExpansionLink{Radius: rod * f(), PinSpacing: 36 * s * f()},
			Weighshaft: setting.Point{U: 100 * s * f(), W: 45 * s * f()}, ReverseArm: 30 * s * f(),
			ArmSwing: -35 * f(), LiftingLink: 45 * s * f(), ValveCentreU: rod,
		}
		if g.Crossed {
			g.ArmSwing = -g.ArmSwing
		}
		spec.Gear = setting.GearSpec{Kind: kind, Stephenson: &g}
		spec.Notches = notchesFor(r)
	case setting.KindWalschaerts:
		// The two layouts of the project's invented test engines: outside
		// admission with the die below the trunnion in full forward gear,
		// inside admission above it.
		w := setting.Walschaerts{ReturnCrank: 24.2 * s * f(), ReturnAngle: 155.6, Trunnion: setting.Point{U: 62 * s * f(), W: 38 * s * f()},
			LinkFoot: setting.Point{U: 0, W: -30 * s * f()}, LinkRadius: 110 * s * f(), FullGearDie: -9 * s * f(),
			UnionLink: 40 * s * f(), CrossheadArm: setting.Point{U: 0, W: -22 * s * f()}, Guide: 45 * s, ValveCentreU: 172 * s}
		if adm == setting.Internal {
			w = setting.Walschaerts{ReturnCrank: 24.2 * s * f(), ReturnAngle: 149.72, Trunnion: setting.Point{U: 61.94 * s * f(), W: 41.59 * s * f()},
				LinkFoot: setting.Point{U: 0, W: -36 * s * f()}, LinkRadius: 110 * s * f(), FullGearDie: 14.05 * s * f(),
				UnionLink: 40 * s * f(), CrossheadArm: setting.Point{U: 0, W: -22 * s * f()}, Guide: 35 * s, ValveCentreU: 171.86 * s}
		}
		lever, err := setting.DesignLever(lap, lead, R, 60*s*f(), adm == setting.Internal)
		if err != nil {
			return design{}, err
		}
		w.Lever = lever
		w.RadiusRod = w.LinkRadius
		w, err = w.CentreLink(e)
		if err != nil {
			return design{}, err
		}
		spec.Gear = setting.GearSpec{Kind: kind, Walschaerts: &w}
		spec.Notches = notchesFor(r)
	default:
		return design{}, fmt.Errorf("unknown gear kind %q", kind)
	}
	if err := centreValve(&spec); err != nil {
		return design{}, err
	}
	if err := tuneTravel(&spec, lap+lead, uniform(r, 68, 82)); err != nil {
		return design{}, err
	}
	if err := spec.Validate(); err != nil {
		return design{}, err
	}
	return design{spec: spec, scale: s, wheel: uniform(r, sz.WheelLo, sz.WHi), size: sz.Name}, nil
}

// tuneTravel sets the full-gear valve travel (an eccentric's throw, with
// its advance from lap + lead; a Walschaerts die's full-gear place) so that
// full forward gear cuts off at about target % of the stroke, as a
// designer chooses the travel for the cut-off wanted; the valve is
// centred again after each change. A few secant steps on the travel's
// scale suffice: the bench needs working engines, not exact ones.
func tuneTravel(spec *setting.EngineSpec, lapLead, target float64) error {
	set := func(k float64) error {
		switch g := spec.Gear; g.Kind {
		case setting.KindSingleEccentric:
			x := &g.SingleEccentric.Eccentric
			x.Throw *= k
			x.Advance = advanceFor(lapLead, x.Throw)
		case setting.KindStephenson:
			for _, x := range []*setting.Eccentric{&g.Stephenson.Forward, &g.Stephenson.Backward} {
				x.Throw *= k
				x.Advance = advanceFor(lapLead, x.Throw)
			}
		default:
			g.Walschaerts.FullGearDie *= k
		}
		return centreValve(spec)
	}
	cut := func() (float64, error) {
		g, err := spec.Gear.Gear()
		if err != nil {
			return 0, err
		}
		set, err := setting.Events(spec.Engine, spec.Valve, func(th float64) (float64, error) { return g.Valve(spec.Engine, th, 1) }, setting.Forward)
		if err != nil {
			return 0, err
		}
		if set.Front.NeverOpens || set.Back.NeverOpens || set.Front.NeverCloses || set.Back.NeverCloses {
			return 0, fmt.Errorf("a port never opens")
		}
		return (set.Front.CutOff.StrokePercent + set.Back.CutOff.StrokePercent) / 2, nil
	}
	c0, err := cut()
	if err != nil {
		return err
	}
	k := 1.0
	for it := 0; it < 4 && math.Abs(c0-target) > 1; it++ {
		// Cut-off grows with travel; a tenth more travel moves it by
		// several per cent, so step by the error's share, held small.
		step := 1 + math.Max(-0.15, math.Min(0.15, (target-c0)/60))
		if err := set(step); err != nil {
			return err
		}
		k *= step
		if c0, err = cut(); err != nil {
			return err
		}
	}
	return nil
}

// advanceFor is the angle of advance that gives lap + lead at dead centre
// with infinite rods: sin(advance) = (lap + lead) / throw.
func advanceFor(lapLead, throw float64) float64 {
	return math.Asin(math.Min(0.95, lapLead/throw)) * 180 / math.Pi
}

// notchesFor draws the running notches of a link gear: one, sometimes two.
func notchesFor(r *rand.Rand) []setting.Notch {
	n := []setting.Notch{{Name: "running", Reverser: setting.Reverser(uniform(r, 0.3, 0.55))}}
	if r.Float64() < 0.25 {
		n = append(n, setting.Notch{Name: "second", Reverser: setting.Reverser(uniform(r, 0.6, 0.8))})
	}
	return n
}

// valveCentre returns a pointer to the gear's valve central position.
func valveCentre(spec *setting.EngineSpec) *float64 {
	switch g := spec.Gear; g.Kind {
	case setting.KindSingleEccentric:
		return &g.SingleEccentric.ValveCentreU
	case setting.KindStephenson:
		return &g.Stephenson.ValveCentreU
	default:
		return &g.Walschaerts.ValveCentreU
	}
}

// centreValve sets the valve's central position so that its mean at the
// two dead centres in full forward gear is central (the designer's rule:
// equal leads with equal laps).
func centreValve(spec *setting.EngineSpec) error {
	c, err := spec.Engine.Prepare()
	if err != nil {
		return err
	}
	for it := 0; it < 3; it++ {
		g, err := spec.Gear.Gear()
		if err != nil {
			return err
		}
		a, err1 := g.Valve(spec.Engine, 0, 1)
		b, err2 := g.Valve(spec.Engine, c.BackDeadCentre(), 1)
		if err1 != nil || err2 != nil {
			return fmt.Errorf("valve at a dead centre: %v %v", err1, err2)
		}
		// Every gear reads the valve as (pin U - ValveCentreU).
		*valveCentre(spec) += (a + b) / 2
	}
	return nil
}

// checkWorks refuses a drawn engine that would not run: a port that does
// not open in full gear either way, or full-gear cut-off outside 60-90 %.
func checkWorks(spec setting.EngineSpec) error {
	g, err := spec.Gear.Gear()
	if err != nil {
		return err
	}
	for _, p := range []struct {
		r setting.Reverser
		d setting.Direction
	}{{1, setting.Forward}, {-1, setting.Backward}} {
		if spec.Gear.Kind == setting.KindSingleEccentric && !spec.Gear.SingleEccentric.Slip && p.r < 0 {
			continue
		}
		set, err := setting.Events(spec.Engine, spec.Valve, func(th float64) (float64, error) { return g.Valve(spec.Engine, th, p.r) }, p.d)
		if err != nil {
			return err
		}
		for _, e := range []setting.EndEvents{set.Front, set.Back} {
			if e.NeverOpens || e.NeverCloses {
				return fmt.Errorf("a port never opens or never closes in full gear %s", p.d)
			}
			if c := e.CutOff.StrokePercent; c < 60 || c > 90 {
				return fmt.Errorf("full-gear cut-off %.1f %% %s", c, p.d)
			}
			if e.Lead < -0.3*lapOf(spec) || e.Lead > 0.6*lapOf(spec) {
				return fmt.Errorf("full-gear lead %.2f mm %s", e.Lead, p.d)
			}
		}
	}
	for _, n := range spec.Notches {
		set, err := setting.Events(spec.Engine, spec.Valve, func(th float64) (float64, error) { return g.Valve(spec.Engine, th, n.Reverser) }, setting.Forward)
		if err != nil {
			return err
		}
		for _, e := range []setting.EndEvents{set.Front, set.Back} {
			if e.NeverOpens || e.NeverCloses || e.CutOff.StrokePercent < 8 {
				return fmt.Errorf("notch %s does not work", n.Name)
			}
		}
	}
	return nil
}

func lapOf(spec setting.EngineSpec) float64 { return spec.Valve.Front.SteamLap }
