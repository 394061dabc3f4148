package plan

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Deviations are the as-built departures of one cylinder's gear from its
// drawing, the quantities the fit finds. Signs follow the adjustment kinds
// of package session, so a plan's change is added to the deviation it
// corrects:
//
//   - GaugeZeroMM: the gauge reading (normalised to grow as the valve moves
//     toward the front cover) with the valve spindle where the drawing puts
//     it for a central valve. It has no effect on the valve, only on readings.
//   - ValveOffsetMM: the valve's place on its spindle, + = toward the front
//     cover. Any error that moves the valve the same way in every gear
//     position (spindle or valve-rod length) shows here.
//   - DeadCentreDeg: the error of the marked front dead centre: the true
//     crank angle is the marked one plus this, in the forward running
//     direction.
//   - EccentricDeg: angle of advance of the forward (index 0) and backward
//     (index 1) eccentric, + = more advance (turned ahead in the running
//     direction it drives). A single-eccentric gear uses index 0.
//   - EccentricRodMM: eccentric rod lengths, forward (0) and backward (1),
//   - = longer. Single eccentric and Walschaerts use index 0.
//   - ReturnCrankDeg: Walschaerts return crank, + = turned in the forward
//     running direction.
//   - RadiusRodMM: Walschaerts radius rod, + = longer.
//   - SteamLapMM: the steam laps as built less the drawing's, front (0)
//     and back (1), + = more lap (the port opens later); the port marks
//     measure them.
type Deviations struct {
	GaugeZeroMM    float64    `json:"gauge_zero_mm"`
	ValveOffsetMM  float64    `json:"valve_offset_mm"`
	DeadCentreDeg  float64    `json:"dead_centre_deg"`
	EccentricDeg   [2]float64 `json:"eccentric_deg"`
	EccentricRodMM [2]float64 `json:"eccentric_rod_mm"`
	ReturnCrankDeg float64    `json:"return_crank_deg"`
	RadiusRodMM    float64    `json:"radius_rod_mm"`
	SteamLapMM     [2]float64 `json:"steam_lap_mm"`
}

// param indexes the deviations as a vector.
type param int

const (
	pGaugeZero param = iota
	pValveOffset
	pDeadCentre
	pEccFwd
	pEccBack
	pRodFwd
	pRodBack
	pReturnCrank
	pRadiusRod
	pLapFront
	pLapBack
	numParams
)

// name returns the deviation in words, for messages.
func (p param) name() string {
	switch p {
	case pGaugeZero:
		return "gauge zero"
	case pValveOffset:
		return "valve position on its spindle"
	case pDeadCentre:
		return "front dead-centre mark"
	case pEccFwd:
		return "forward eccentric angle"
	case pEccBack:
		return "backward eccentric angle"
	case pRodFwd:
		return "forward eccentric rod length"
	case pRodBack:
		return "backward eccentric rod length"
	case pReturnCrank:
		return "return crank angle"
	case pRadiusRod:
		return "radius rod length"
	case pLapFront:
		return "front steam lap"
	case pLapBack:
		return "back steam lap"
	}
	return "deviation"
}

func (d Deviations) vec() [numParams]float64 {
	return [numParams]float64{d.GaugeZeroMM, d.ValveOffsetMM, d.DeadCentreDeg,
		d.EccentricDeg[0], d.EccentricDeg[1], d.EccentricRodMM[0], d.EccentricRodMM[1],
		d.ReturnCrankDeg, d.RadiusRodMM, d.SteamLapMM[0], d.SteamLapMM[1]}
}

func devOf(v [numParams]float64) Deviations {
	return Deviations{v[pGaugeZero], v[pValveOffset], v[pDeadCentre],
		[2]float64{v[pEccFwd], v[pEccBack]}, [2]float64{v[pRodFwd], v[pRodBack]},
		v[pReturnCrank], v[pRadiusRod], [2]float64{v[pLapFront], v[pLapBack]}}
}

// Model is one cylinder as built: the engine as drawn, its deviations,
// and, in each reverser position the readings were taken in, the part of
// the valve's motion that the drawing with those deviations cannot follow.
type Model struct {
	Spec setting.EngineSpec
	Dev  Deviations
	// Unmodelled holds, per reverser position, what the readings show
	// that the gear as drawn cannot: the valve's motion less the model's
	// (see Unmodelled). Empty for a model of the drawing alone.
	Unmodelled []Unmodelled
}

// Unmodelled is the part of the valve's motion in one reverser position
// that the gear as drawn, with the fitted deviations, does not follow: the
// errors of parts the model has no deviation for (an eccentric's throw, a
// lifting link, a lever's pins, the die's place in the link at a notch)
// and those the readings cannot tell apart. It is the short trigonometric
// series a0 + a1 cos t + b1 sin t + a2 cos 2t + b2 sin 2t in crank angle t
// (mm, + toward the front cover), fitted to the readings with a prior
// that keeps it small where they say nothing, so that the model follows
// what was measured (a lead read at a dead centre, a cut-off at the
// crosshead) and supplies only what was not. Coef holds it as a
// trigonometric series in crank angle: Coef[0] + sum over k of
// Coef[2k-1] cos kt + Coef[2k] sin kt (mm).
type Unmodelled struct {
	Reverser setting.Reverser `json:"reverser"`
	Coef     []float64        `json:"coef_mm"`
}

// at returns the correction and its slope (mm per degree) at th degrees.
func (u Unmodelled) at(th float64) (x, dx float64) {
	return curve(u.Coef).at(th)
}

// correction returns the unmodelled part of reverser position r, or nil.
// (Unmodelled.Coef holds the same layout as a curve, so it adds to one
// term by term.)
func (m Model) correction(r setting.Reverser) *Unmodelled {
	for i := range m.Unmodelled {
		if m.Unmodelled[i].Reverser == r {
			return &m.Unmodelled[i]
		}
	}
	return nil
}

// Valve returns the valve as built: the drawing's with the fitted steam
// laps.
func (m Model) Valve() setting.Valve {
	return asBuiltValve(m.Spec.Valve, m.Dev.vec())
}

// asBuiltValve returns v with the steam lap deviations of p applied.
func asBuiltValve(v setting.Valve, p [numParams]float64) setting.Valve {
	v.Front.SteamLap += p[pLapFront]
	v.Back.SteamLap += p[pLapBack]
	return v
}

// gearParams returns the deviations of the gear's own dimensions a gear of
// this kind has.
func gearParams(kind string) []param {
	switch kind {
	case setting.KindStephenson:
		return []param{pEccFwd, pEccBack, pRodFwd, pRodBack}
	case setting.KindWalschaerts:
		return []param{pReturnCrank, pRodFwd, pRadiusRod}
	default:
		return []param{pEccFwd, pRodFwd}
	}
}

// Gear returns the gear with the deviations of its dimensions applied (the
// valve offset, gauge zero and dead-centre error are applied by Motion and
// Predict).
func (m Model) Gear() (setting.Gear, error) {
	d := m.Dev
	g := m.Spec.Gear
	switch g.Kind {
	case setting.KindSingleEccentric:
		if g.SingleEccentric == nil {
			break
		}
		s := *g.SingleEccentric
		s.Eccentric.Advance += d.EccentricDeg[0]
		s.Eccentric.Rod += d.EccentricRodMM[0]
		return s, nil
	case setting.KindStephenson:
		if g.Stephenson == nil {
			break
		}
		s := *g.Stephenson
		s.Forward.Advance += d.EccentricDeg[0]
		s.Backward.Advance += d.EccentricDeg[1]
		s.Forward.Rod += d.EccentricRodMM[0]
		s.Backward.Rod += d.EccentricRodMM[1]
		return s, nil
	case setting.KindWalschaerts:
		if g.Walschaerts == nil {
			break
		}
		s := *g.Walschaerts
		s.ReturnAngle += d.ReturnCrankDeg
		s.EccentricRod += d.EccentricRodMM[0]
		s.RadiusRod += d.RadiusRodMM
		return s, nil
	}
	return nil, &setting.Error{Field: "engine.gear", Message: fmt.Sprintf("The gear kind %q cannot be planned yet; the planner knows single-eccentric, Stephenson and Walschaerts gears.", g.Kind)}
}

// Motion returns the valve displacement (mm, + toward the front cover) of
// the as-built gear with the reverser at r, as a function of the true crank
// angle (degrees from front dead centre, forward running).
func (m Model) Motion(r setting.Reverser) (setting.Motion, error) {
	g, err := m.Gear()
	if err != nil {
		return nil, err
	}
	e, off := m.Spec.Engine, m.Dev.ValveOffsetMM
	u := m.correction(r)
	return func(th float64) (float64, error) {
		x, err := g.Valve(e, th, r)
		if u != nil {
			d, _ := u.at(th)
			x += d
		}
		return x + off, err
	}, nil
}

// edgeX returns the valve displacement at which end's steam edge is
// line-on-line with its port edge (see asBuiltValve for the laps as
// built).
func edgeX(v setting.Valve, end setting.CylinderEnd) float64 {
	e0 := v.SteamEdge(end, 0)
	k := v.SteamEdge(end, 1) - e0
	return -e0 / k
}

// cylEnd converts a session end.
func cylEnd(e session.End) setting.CylinderEnd {
	if e == session.Back {
		return setting.Back
	}
	return setting.Front
}

// Predict returns what the model says observation o should have read, in
// the observation's own terms (see Target): a gauge reading in mm
// (normalised, growing toward the front cover) for port marks, dead-centre
// and sweep readings; the steam edge's passage in mm (zero when the reading
// is right) for a cut-off; the port opening in mm for a feeler reading.
func (m Model) Predict(o session.Observation) (float64, error) {
	g, err := m.Gear()
	if err != nil {
		return 0, err
	}
	p := m.Dev.vec()
	x, err := predict(m.Spec, g, p, o)
	if u := m.correction(o.Reverser); u != nil && o.HasCrank && err == nil {
		d, _ := u.at(o.CrankDeg + p[pDeadCentre])
		if o.Kind == session.CutOffKind || o.Kind == session.FeelerKind {
			d *= edgeSlope(m.Spec.Valve, cylEnd(o.End))
		}
		x += d
	}
	return x, err
}

// edgeSlope is d(steam edge opening)/d(valve displacement) of an end: +1
// or -1 by the admission and the end.
func edgeSlope(v setting.Valve, end setting.CylinderEnd) float64 {
	return v.SteamEdge(end, 1) - v.SteamEdge(end, 0)
}

// Target returns the value Predict is compared with for observation o.
func Target(o session.Observation) float64 {
	switch o.Kind {
	case session.CutOffKind:
		return 0
	case session.FeelerKind:
		return o.OpeningMM
	}
	return o.GaugeMM
}

// predict is Predict with the gear already built.
func predict(spec setting.EngineSpec, g setting.Gear, p [numParams]float64, o session.Observation) (float64, error) {
	v := asBuiltValve(spec.Valve, p)
	if o.Kind == session.PortMarkKind {
		return p[pGaugeZero] - p[pValveOffset] + edgeX(v, cylEnd(o.End)), nil
	}
	x, err := g.Valve(spec.Engine, o.CrankDeg+p[pDeadCentre], o.Reverser)
	if err != nil {
		return 0, err
	}
	switch o.Kind {
	case session.CutOffKind, session.FeelerKind:
		return v.SteamEdge(cylEnd(o.End), x+p[pValveOffset]), nil
	}
	return x + p[pGaugeZero], nil
}

// wrap360 reduces an angle to [0, 360).
func wrap360(t float64) float64 {
	t = math.Mod(t, 360)
	if t < 0 {
		t += 360
	}
	return t
}

// Curve is a valve curve held as the trigonometric interpolant of
// curveSamples exact linkage solutions round a turn: it follows the
// linkage to about 1e-9 mm (TestCurveMatchesGear) and costs a few
// multiplications per angle instead of a linkage solution, so a diagram
// can sample it finely and find its events cheaply.
type Curve struct{ c curve }

// Curve returns the model's valve curve (valve offset included) in
// reverser position r, as Motion's values held as a Curve.
func (m Model) Curve(r setting.Reverser) (Curve, error) {
	cs, err := gearCurves(m.Spec, m.Dev.vec(), []setting.Reverser{r}, curveTrig, true)
	if err != nil {
		return Curve{}, err
	}
	return Curve{m.corrected(cs[0], r)}, nil
}

// corrected returns curve c of reverser position r with the unmodelled
// part added (a copy; c itself when there is none).
func (m Model) corrected(c curve, r setting.Reverser) curve {
	u := m.correction(r)
	if u == nil {
		return c
	}
	out := append(curve(nil), c...)
	for len(out) < len(u.Coef) {
		out = append(out, 0)
	}
	for k, v := range u.Coef {
		out[k] += v
	}
	return out
}

// Value returns the valve displacement at crank angle th degrees.
func (c Curve) Value(th float64) float64 { return c.c.value(th) }

// Motion returns the curve as a setting.Motion (it never fails).
func (c Curve) Motion() setting.Motion { return c.c.motion() }
