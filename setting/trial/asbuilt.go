package trial

import (
	"fmt"
	"math"
	"math/rand/v2"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Position is a reverser position run one way, as the planner plans it.
type Position struct {
	Name     string
	Reverser setting.Reverser // as the setter sets it (the drawing's)
	Dir      setting.Direction
}

// Engine is one as-built engine: the drawing the setter has and the
// truth it was built to.
type Engine struct {
	Kind, Size string
	Scale      float64 // crank radius / 22 mm
	// Drawing is the engine as the setter enters it.
	Drawing setting.EngineSpec
	// Truth is the engine as built: every dimension with its build error.
	Truth setting.EngineSpec
	// ValveOffsetMM is the valve's place on its spindle as built, + toward
	// the front cover (what the spindle adjustment changes).
	ValveOffsetMM float64
	// RevErr is the reverser's error in each position (the die's place
	// in the link), added to the drawing's reverser value.
	RevErr map[setting.Reverser]float64
	// Adjustments are what the setter may change, with limits and threads.
	Adjustments []session.Adjustment
	// Positions are the planned positions (full forward, notches, full
	// back).
	Positions []Position
	// Errors lists the build errors in words, for reports.
	Errors []string

	// The measuring set-up.
	WheelMM     float64
	GaugeZeroMM float64 // reading with the spindle where the drawing puts a central valve
	GaugeScale  float64 // reading per mm of spindle travel (a gauge not square to the spindle reads short)
	GaugeSign   float64 // +1 when the reading grows toward the front cover
	ResMM       float64 // gauge division
	DatumDeg    float64 // true crank angle of the tyre datum
	MarkSDDeg   float64 // one tyre mark's error
	SetSDDeg    float64 // error of setting the wheel to a mark
	// CrossheadSDMM is the error of bringing the crosshead back to its
	// mark on the slide bar when bracketing a dead centre.
	CrossheadSDMM float64
}

// knob names one adjustment kind of a gear (and which eccentric).
type knob struct {
	kind session.AdjustmentKind
	ecc  session.Eccentric
}

// apply makes a change of amount on the truth, as the planner's sign
// conventions say (package session's adjustment kinds).
func (e *Engine) apply(k knob, amount float64) error {
	g := e.Truth.Gear
	switch k.kind {
	case session.ValveOnSpindle:
		e.ValveOffsetMM += amount
		return nil
	case session.EccentricAngle:
		switch g.Kind {
		case setting.KindSingleEccentric:
			g.SingleEccentric.Eccentric.Advance += amount
		case setting.KindStephenson:
			if k.ecc == session.BackwardEccentric {
				g.Stephenson.Backward.Advance += amount
			} else {
				g.Stephenson.Forward.Advance += amount
			}
		default:
			return fmt.Errorf("no eccentric sheave on a %s gear", g.Kind)
		}
	case session.EccentricRodLength:
		switch g.Kind {
		case setting.KindSingleEccentric:
			g.SingleEccentric.Eccentric.Rod += amount
		case setting.KindStephenson:
			if k.ecc == session.BackwardEccentric {
				g.Stephenson.Backward.Rod += amount
			} else {
				g.Stephenson.Forward.Rod += amount
			}
		default:
			g.Walschaerts.EccentricRod += amount
		}
	case session.ReturnCrankAngle:
		g.Walschaerts.ReturnAngle += amount
	case session.RadiusRodLength:
		g.Walschaerts.RadiusRod += amount
	default:
		return fmt.Errorf("the bench cannot make a %s change", k.kind)
	}
	return nil
}

// clone copies the engine deeply enough that changes to the truth's gear
// do not reach the original.
func (e Engine) clone() Engine {
	t := e.Truth
	switch t.Gear.Kind {
	case setting.KindSingleEccentric:
		g := *t.Gear.SingleEccentric
		t.Gear.SingleEccentric = &g
	case setting.KindStephenson:
		g := *t.Gear.Stephenson
		t.Gear.Stephenson = &g
	case setting.KindWalschaerts:
		g := *t.Gear.Walschaerts
		t.Gear.Walschaerts = &g
	}
	e.Truth = t
	return e
}

// With returns the engine after changes: amounts per knob.
func (e Engine) with(ks []knob, amounts []float64) (Engine, error) {
	out := e.clone()
	for i, k := range ks {
		if amounts[i] == 0 {
			continue
		}
		if err := out.apply(k, amounts[i]); err != nil {
			return out, err
		}
	}
	return out, nil
}

// spindle returns the true spindle displacement (mm, + toward the front
// cover, from where the drawing puts it for a central valve) at true crank
// angle th with the reverser set to the drawing's r.
func (e Engine) spindle(th float64, r setting.Reverser) (float64, error) {
	g, err := e.Truth.Gear.Gear()
	if err != nil {
		return 0, err
	}
	rt := r + setting.Reverser(e.RevErr[r])
	rt = max(-1, min(1, rt))
	return g.Valve(e.Truth.Engine, th, rt)
}

// Events returns the true events in position p. The gear's lost motion
// is left out on both sides: the setter turns the wheels the way the
// engine runs in the gear being set, so the valve lags in the readings as
// it does running, and the events are the same either way.
func (e Engine) Events(p Position) (setting.EventSet, error) {
	m := func(th float64) (float64, error) {
		x, err := e.spindle(th, p.Reverser)
		return x + e.ValveOffsetMM, err
	}
	return setting.Events(e.Truth.Engine, e.Truth.Valve, m, p.Dir)
}

// positionsOf lists the planned positions of a drawing.
func positionsOf(spec setting.EngineSpec) []Position {
	ps := []Position{{session.FullForward, 1, setting.Forward}}
	if spec.Gear.Kind == setting.KindSingleEccentric {
		if spec.Gear.SingleEccentric.Slip {
			ps = append(ps, Position{session.FullBack, -1, setting.Backward})
		}
		return ps
	}
	for _, n := range spec.Notches {
		ps = append(ps, Position{n.Name, n.Reverser, setting.Forward})
	}
	return append(ps, Position{session.FullBack, -1, setting.Backward})
}

// Options narrow the bench, to check the bench itself: with OnlyModelled
// the engine is built with only the errors the planner's fit knows, with
// Exact it is measured with a perfect gauge and perfect marks and the
// round holds no slip.
type Options struct {
	OnlyModelled, Exact bool
}

// normal draws from a normal distribution.
func normal(r *rand.Rand, sd float64) float64 { return r.NormFloat64() * sd }

// NewEngine draws an as-built engine of the gear kind: a random working
// design, then the truth with build errors of every kind (sizes in mm for
// a 5 in gauge engine, scaled with the crank; common practice for a
// careful amateur build, no source), and a measuring set-up.
func NewEngine(r *rand.Rand, kind string, opt Options) (Engine, error) {
	slip := kind == setting.KindSingleEccentric && r.Float64() < 0.5
	d, err := newDesign(r, kind, slip)
	if err != nil {
		return Engine{}, err
	}
	s := d.scale
	e := Engine{Kind: kind, Size: d.size, Scale: s, Drawing: d.spec, WheelMM: d.wheel, RevErr: map[setting.Reverser]float64{}}
	t := d.spec
	// Build errors in mm for a 5 in gauge engine, scaled by the size to
	// the power 0.7 (a full-size shop holds larger errors, but not twelve
	// times larger).
	k := math.Pow(s, 0.7)
	L := func(sd float64) float64 { return normal(r, sd*k) }
	note := func(format string, a ...any) { e.Errors = append(e.Errors, fmt.Sprintf(format, a...)) }
	t.Engine.CrankRadius += L(0.02)
	t.Engine.RodLength += L(0.2)
	v := t.Valve
	v.Front.SteamLap += L(0.05)
	v.Back.SteamLap += L(0.05)
	v.Front.ExhaustLap += L(0.05)
	v.Back.ExhaustLap += L(0.05)
	t.Valve = v
	e.ValveOffsetMM = normal(r, 0.25) * k
	note("valve on spindle %+.2f mm, laps %+.2f/%+.2f mm", e.ValveOffsetMM, v.Front.SteamLap-d.spec.Valve.Front.SteamLap, v.Back.SteamLap-d.spec.Valve.Back.SteamLap)
	switch kind {
	case setting.KindSingleEccentric:
		g := *t.Gear.SingleEccentric
		g.Eccentric.Advance += normal(r, 1.5)
		g.Eccentric.Rod += L(0.3)
		g.Eccentric.Throw += L(0.05)
		g.Guide += L(0.3)
		t.Gear.SingleEccentric = &g
		note("advance %+.2f deg, rod %+.2f, throw %+.3f", g.Eccentric.Advance-d.spec.Gear.SingleEccentric.Eccentric.Advance, g.Eccentric.Rod-d.spec.Gear.SingleEccentric.Eccentric.Rod, g.Eccentric.Throw-d.spec.Gear.SingleEccentric.Eccentric.Throw)
	case setting.KindStephenson:
		g := *t.Gear.Stephenson
		d0 := *d.spec.Gear.Stephenson
		for _, x := range []*setting.Eccentric{&g.Forward, &g.Backward} {
			x.Advance += normal(r, 1.2)
			x.Rod += L(0.3)
			x.Throw += L(0.05)
		}
		g.LiftingLink += L(0.5)
		g.Link.Suspension.U += L(0.3)
		g.Link.Suspension.W += L(0.3)
		g.Link.Radius += L(0.5)
		g.Link.PinSpacing += L(0.1)
		g.MidArmAngle += normal(r, 0.5)
		g.ReverseArm += L(0.2)
		g.Weighshaft.U += L(0.3)
		g.Weighshaft.W += L(0.3)
		t.Gear.Stephenson = &g
		note("advances %+.2f/%+.2f deg, rods %+.2f/%+.2f, throws %+.3f/%+.3f, lifting link %+.2f, suspension %+.2f,%+.2f, arm %+.2f deg",
			g.Forward.Advance-d0.Forward.Advance, g.Backward.Advance-d0.Backward.Advance, g.Forward.Rod-d0.Forward.Rod, g.Backward.Rod-d0.Backward.Rod,
			g.Forward.Throw-d0.Forward.Throw, g.Backward.Throw-d0.Backward.Throw, g.LiftingLink-d0.LiftingLink, g.Link.Suspension.U, g.Link.Suspension.W, g.MidArmAngle-d0.MidArmAngle)
	case setting.KindWalschaerts:
		g := *t.Gear.Walschaerts
		d0 := *d.spec.Gear.Walschaerts
		g.ReturnAngle += normal(r, 1)
		g.EccentricRod += L(0.3)
		g.RadiusRod += L(0.3)
		g.ReturnCrank += L(0.2)
		g.Lever.ValvePin += L(0.08)
		g.Lever.UnionPin += L(0.2)
		g.UnionLink += L(0.3)
		g.CrossheadArm.W += L(0.2)
		g.CrossheadArm.U += L(0.2)
		g.Trunnion.U += L(0.2)
		g.Trunnion.W += L(0.2)
		g.LinkFoot.W += L(0.2)
		g.LinkRadius += L(0.5)
		g.FullGearDie += L(0.2)
		t.Gear.Walschaerts = &g
		note("return angle %+.2f deg, eccentric rod %+.2f, radius rod %+.2f, return crank throw %+.2f, lever pins %+.2f/%+.2f, union link %+.2f",
			g.ReturnAngle-d0.ReturnAngle, g.EccentricRod-d0.EccentricRod, g.RadiusRod-d0.RadiusRod, g.ReturnCrank-d0.ReturnCrank,
			g.Lever.ValvePin-d0.Lever.ValvePin, g.Lever.UnionPin-d0.Lever.UnionPin, g.UnionLink-d0.UnionLink)
	}
	if opt.OnlyModelled {
		// Keep only the errors the planner's fit knows: the spindle, the
		// sheaves' angles, the rods the adjusters change.
		m := d.spec
		m.Gear = t.Gear
		switch kind {
		case setting.KindSingleEccentric:
			g := *d.spec.Gear.SingleEccentric
			g.Eccentric.Advance, g.Eccentric.Rod = t.Gear.SingleEccentric.Eccentric.Advance, t.Gear.SingleEccentric.Eccentric.Rod
			m.Gear.SingleEccentric = &g
		case setting.KindStephenson:
			g := *d.spec.Gear.Stephenson
			tg := t.Gear.Stephenson
			g.Forward.Advance, g.Backward.Advance, g.Forward.Rod, g.Backward.Rod = tg.Forward.Advance, tg.Backward.Advance, tg.Forward.Rod, tg.Backward.Rod
			m.Gear.Stephenson = &g
		case setting.KindWalschaerts:
			g := *d.spec.Gear.Walschaerts
			tg := t.Gear.Walschaerts
			g.ReturnAngle, g.EccentricRod, g.RadiusRod = tg.ReturnAngle, tg.EccentricRod, tg.RadiusRod
			m.Gear.Walschaerts = &g
		}
		t = m
	}
	e.Truth = t
	e.Positions = positionsOf(d.spec)
	if kind != setting.KindSingleEccentric && !opt.OnlyModelled {
		e.dieErrors(r)
	}
	if err := e.checkBuilt(); err != nil {
		return Engine{}, err
	}
	e.Adjustments = adjustmentsFor(r, kind, s)
	// A real gear goes round with its adjusters moved a little either
	// way: one built at the very end of a link's reach is no engine.
	ks := knobsOf(e.Adjustments)
	for j, a := range e.Adjustments {
		for _, sgn := range []float64{-1, 1} {
			amounts := make([]float64, len(ks))
			amounts[j] = sgn * math.Min(math.Max(-a.Min, a.Max), k)
			t, err := e.with(ks, amounts)
			if err == nil {
				_, err = t.diffs()
			}
			if err != nil {
				return Engine{}, fmt.Errorf("as built, the gear does not go round with the %s moved %+g: %w", a.Kind, amounts[j], err)
			}
		}
	}
	// Measuring: a metric gauge in 0.01 mm or an imperial one in thou.
	e.ResMM = 0.01
	if r.Float64() < 0.3 {
		e.ResMM = 0.0254
	}
	e.GaugeZeroMM = uniform(r, 2, 8)
	// A gauge set square to the spindle by eye, within about 6 degrees:
	// it reads up to half a per cent short.
	e.GaugeScale = 1 - math.Abs(normal(r, 0.005))
	e.GaugeSign = 1
	if r.Float64() < 0.3 {
		e.GaugeSign = -1
	}
	e.DatumDeg = uniform(r, -15, 15)
	// Marks are scribed on the tyre to a few tenths of a millimetre, so
	// their error in degrees falls as the wheel grows; the wheel is set to
	// a mark against the pointer about as well.
	mm := func(x float64) float64 { return session.TyreToDeg(x, e.WheelMM) }
	e.MarkSDDeg = mm(uniform(r, 0.15, 0.4))
	e.SetSDDeg = mm(uniform(r, 0.1, 0.25))
	e.CrossheadSDMM = 0.01 * math.Sqrt(s)
	if opt.Exact {
		e.ResMM, e.GaugeScale, e.GaugeSign, e.MarkSDDeg, e.SetSDDeg, e.CrossheadSDMM = 1e-6, 1, 1, 1e-6, 0, 0
	}
	return e, nil
}

// adjustmentsFor draws what a setter of this gear can change: the usual
// adjusters with typical limits, on typical threads.
func adjustmentsFor(r *rand.Rand, kind string, s float64) []session.Adjustment {
	thread := func() session.Thread {
		if s > 5 {
			// Full size: coarse threads in TPI.
			tpi := []float64{8, 10, 11, 12}[r.IntN(4)]
			return session.Thread{TPI: tpi, FlatsPerTurn: []int{6, 4, 2}[r.IntN(3)]}
		}
		switch r.IntN(5) {
		case 0:
			return session.Thread{PitchMM: 0.5, FlatsPerTurn: 6}
		case 1:
			return session.Thread{PitchMM: 0.7, FlatsPerTurn: 6}
		case 2:
			return session.Thread{TPI: 40, FlatsPerTurn: 6}
		case 3:
			return session.Thread{TPI: 32, FlatsPerTurn: 4}
		}
		return session.Thread{PitchMM: 0.8, FlatsPerTurn: 2}
	}
	lim := 3 * s
	spindle := session.Adjustment{Kind: session.ValveOnSpindle, Min: -lim, Max: lim, Thread: thread()}
	sheave := func(ecc session.Eccentric) session.Adjustment {
		return session.Adjustment{Kind: session.EccentricAngle, Eccentric: ecc, Min: -10, Max: 10, SheaveDiameterMM: 30 * s}
	}
	rod := func(kind session.AdjustmentKind, ecc session.Eccentric) session.Adjustment {
		return session.Adjustment{Kind: kind, Eccentric: ecc, Min: -lim, Max: lim, Thread: thread()}
	}
	switch kind {
	case setting.KindStephenson:
		return []session.Adjustment{spindle, sheave(session.ForwardEccentric), sheave(session.BackwardEccentric),
			rod(session.EccentricRodLength, session.ForwardEccentric), rod(session.EccentricRodLength, session.BackwardEccentric)}
	case setting.KindWalschaerts:
		return []session.Adjustment{spindle, rod(session.EccentricRodLength, ""), rod(session.RadiusRodLength, ""),
			{Kind: session.ReturnCrankAngle, Min: -6, Max: 6}}
	}
	return []session.Adjustment{spindle, sheave(""), rod(session.EccentricRodLength, "")}
}

// knobs returns the knob of each adjustment, in order.
func knobsOf(adjs []session.Adjustment) []knob {
	out := make([]knob, len(adjs))
	for i, a := range adjs {
		out[i] = knob{a.Kind, a.Eccentric}
	}
	return out
}

// dieErrors draws the die's place in the link in each position: a notch
// cut a little off, a reverser stop not quite at full gear.
func (e *Engine) dieErrors(r *rand.Rand) {
	for _, p := range e.Positions {
		sd := 0.012
		if math.Abs(float64(p.Reverser)) == 1 {
			sd = 0.006
		}
		e.RevErr[p.Reverser] = normal(r, sd)
	}
}

// checkBuilt refuses an as-built engine whose linkage does not close or
// one of whose ports never opens in a position.
func (e Engine) checkBuilt() error {
	if err := e.Truth.Validate(); err != nil {
		return fmt.Errorf("the as-built engine does not close: %w", err)
	}
	for _, p := range e.Positions {
		set, err := e.Events(p)
		if err != nil {
			return fmt.Errorf("as built, %s: %w", p.Name, err)
		}
		if set.Front.NeverOpens || set.Back.NeverOpens {
			return fmt.Errorf("as built, a port never opens in %s", p.Name)
		}
	}
	return nil
}
