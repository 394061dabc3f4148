package render

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// CurveStep is the crank-angle step, in degrees, at which a Model samples
// its valve curves: 2 degrees is under 2 px across a phone-wide plot, and
// sampling once when the model is built keeps every frame cheap.
const CurveStep = 2

// curveN is the number of samples of a curve, 0 to 360 inclusive.
const curveN = 360/CurveStep + 1

// Default tolerances of the balance diagram: how far apart front and back
// may be and still count as even. Common practice, from memory: a setter
// is content with leads within a couple of thou and cut-offs within a
// couple of per cent of stroke.
const (
	DefaultLeadTolMM    = 0.05
	DefaultCutOffTolPct = 2.0
)

// Position is one reverser position of a Model: its valve curve sampled
// every CurveStep degrees of crank (true crank angle, 0 to 360 inclusive)
// today and, when there is a plan, after it, with the events of both.
type Position struct {
	Notch       setting.Notch
	Direction   setting.Direction
	Now         []float64 // valve displacement, mm from central, + toward the front cover
	NowEvents   setting.EventSet
	After       []float64 // nil without a plan
	AfterEvents setting.EventSet
	HasAfter    bool
}

// Reading is one dial-gauge reading taken at a crank angle, placed on the
// fitted valve curve: the crank angle corrected by the fitted dead-centre
// error and the gauge reading less the fitted gauge zero, so it sits on the
// curve up to its residual.
type Reading struct {
	Reverser   setting.Reverser
	CrankDeg   float64 // true crank angle, degrees
	ValveMM    float64 // valve displacement the reading implies, mm
	ResidualMM float64 // reading minus the fit, mm
	Used       bool    // false when the fit left it out as far from the rest
	Label      string
}

// Model is everything the diagrams show of one cylinder, worked out once
// when it is built (NewEngineModel, NewSessionModel) so that drawing is
// only mapping numbers onto the box. Build a new Model when the data
// change; do not edit one a diagram is drawing.
type Model struct {
	Title     string // engine and cylinder, for card titles
	Spec      setting.EngineSpec
	Crank     setting.Crank
	Valve     setting.Valve
	Positions []Position
	Readings  []Reading
	// Plan is the plan the After curves come from; nil for an engine alone.
	Plan *plan.Plan
	// Unit is the display unit of lengths.
	Unit session.Unit
	// LeadTolMM and CutOffTolPct are the balance diagram's tolerance bands.
	LeadTolMM, CutOffTolPct float64
	// FitRMSMM is the fit's root-mean-square residual (0 without readings).
	FitRMSMM float64
	// Scale, when set, is the model whose balance scales this one keeps:
	// a what-if keeps the plan's, so that today does not seem to move
	// while an amount is dragged (see BalanceRanges).
	Scale *Model
	// WhatIf, when set, says in words what a what-if changes on top of the
	// plan ("valve 0.16 mm toward the front cover"): the cards then say
	// that "after" includes it.
	WhatIf string

	geo   MotionGeometry
	geoOK bool       // geo is worked out on the first Geometry call
	built plan.Model // as built (the drawing plus the fitted deviations)
	gear  setting.PosedGear
}

// NewEngineModel builds the model of an engine as drawn: its full forward
// gear, running notches and full back gear, each run the way its gear
// drives, with no readings and no plan. Errors are *setting.Error values
// naming the field.
func NewEngineModel(spec setting.EngineSpec) (*Model, error) {
	if err := spec.Validate(); err != nil {
		return nil, err
	}
	m := &Model{Title: spec.Name, Spec: spec, Unit: session.UnitMM, built: plan.Model{Spec: spec}}
	var notches []setting.Notch
	notches = append(notches, setting.Notch{Name: session.FullForward, Reverser: 1})
	notches = append(notches, spec.Notches...)
	notches = append(notches, setting.Notch{Name: session.FullBack, Reverser: -1})
	var pos []Position
	for _, n := range notches {
		pos = append(pos, Position{Notch: n, Direction: setting.RunningDirections(n.Reverser)[0]})
	}
	if err := m.fill(pos, nil, nil, nil); err != nil {
		return nil, err
	}
	return m, nil
}

// NewSessionModel fits cylinder opt.Cylinder of a session, plans it with
// opt, and builds the model with today's curves, the readings with their
// residuals and the curves after the rounded plan. Errors are the fit's
// and the plan's *setting.Error sentences.
func NewSessionModel(s *session.Session, opt plan.Options) (*Model, error) {
	if s == nil {
		return nil, &setting.Error{Field: "session", Message: "There is no session to draw."}
	}
	cyl := opt.Cylinder
	if cyl < 0 || cyl >= len(s.Cylinders) {
		return nil, &setting.Error{Field: "cylinder", Message: fmt.Sprintf("The session has no cylinder number %d.", cyl+1)}
	}
	fit, err := plan.FitSession(s, cyl, opt.Fit)
	if err != nil {
		return nil, err
	}
	if opt.Unit == "" {
		opt.Unit = s.DisplayUnit
	}
	p, err := plan.FromFit(fit, s.Adjustments, opt)
	if err != nil {
		return nil, err
	}
	return NewModel(s, cyl, fit, p)
}

// NewModel builds the model of cylinder cyl of a session from a fit and a
// plan already made (plan.FitSession, plan.FromFit): today's curves from
// the fit, the readings of the fitted round with their residuals, and the
// curves after the plan's rounded steps, for every position the plan
// covers. Errors are *setting.Error sentences.
func NewModel(s *session.Session, cyl int, fit *plan.Fit, p *plan.Plan) (*Model, error) {
	if s == nil || fit == nil || p == nil {
		return nil, &setting.Error{Field: "session", Message: "There is no session, fit or plan to draw."}
	}
	if cyl < 0 || cyl >= len(s.Cylinders) {
		return nil, &setting.Error{Field: "cylinder", Message: fmt.Sprintf("The session has no cylinder number %d.", cyl+1)}
	}
	spec := fit.Model.Spec
	m := &Model{
		Title: spec.Name + ", " + s.Cylinders[cyl].Name + " cylinder", Spec: spec, Plan: p,
		Unit: s.DisplayUnit, FitRMSMM: fit.RMSMM, built: fit.Model,
	}
	if m.Unit == "" {
		m.Unit = session.UnitMM
	}
	var pos []Position
	for _, st := range p.Now {
		pos = append(pos, Position{Notch: setting.Notch{Name: st.Notch, Reverser: setting.Reverser(st.Reverser)}, Direction: st.Direction})
	}
	after := afterModel(fit.Model, p.Steps)
	now, aft := p.EventSets()
	if err := m.fill(pos, &after, now, aft); err != nil {
		return nil, err
	}
	m.Readings = readings(s, cyl, fit)
	return m, nil
}

// afterModel applies a plan's rounded steps to the as-built deviations:
// each step's amount adds to the deviation it corrects (the signs of
// plan.Deviations follow the adjustment kinds). A lifting-link change has
// no deviation of its own and moves nothing here.
func afterModel(m plan.Model, steps []plan.Step) plan.Model {
	d := m.Dev
	for _, s := range steps {
		i := 0
		if s.Eccentric == session.BackwardEccentric {
			i = 1
		}
		switch s.Kind {
		case session.ValveOnSpindle:
			d.ValveOffsetMM += s.Amount
		case session.EccentricAngle:
			d.EccentricDeg[i] += s.Amount
		case session.EccentricRodLength:
			d.EccentricRodMM[i] += s.Amount
		case session.ReturnCrankAngle:
			d.ReturnCrankDeg += s.Amount
		case session.RadiusRodLength:
			d.RadiusRodMM += s.Amount
		}
	}
	m.Dev = d
	return m
}

// fill samples the curves and events of every position, today from the
// as-built model and after from after (when not nil). Event sets already
// found (the plan's, see plan.Plan.EventSets), one per position, are taken
// as they are rather than found again.
func (m *Model) fill(pos []Position, after *plan.Model, nowSets, afterSets []setting.EventSet) error {
	crank, err := m.Spec.Engine.Prepare()
	if err != nil {
		return err
	}
	// The valve as built: the port marks measure its steam laps.
	m.Crank, m.Valve = crank, m.built.Valve()
	if m.LeadTolMM == 0 {
		m.LeadTolMM, m.CutOffTolPct = DefaultLeadTolMM, DefaultCutOffTolPct
	}
	if g, err := m.built.Gear(); err == nil {
		m.gear, _ = g.(setting.PosedGear)
	}
	known := func(sets []setting.EventSet, i int) *setting.EventSet {
		if len(sets) != len(pos) {
			return nil
		}
		return &sets[i]
	}
	for i := range pos {
		p := &pos[i]
		if p.Now, p.NowEvents, err = sample(m.built, m.Spec.Engine, m.Valve, p.Notch.Reverser, p.Direction, known(nowSets, i)); err != nil {
			return err
		}
		if after != nil {
			if p.After, p.AfterEvents, err = sample(*after, m.Spec.Engine, m.Valve, p.Notch.Reverser, p.Direction, known(afterSets, i)); err != nil {
				return err
			}
			p.HasAfter = true
		}
	}
	m.Positions = pos
	return nil
}

// sample returns the valve curve of model pm (with valve v) in reverser position r at
// every CurveStep degrees and its events running in dir, both from the
// curve's interpolant (plan.Curve: 32 linkage solutions, within about
// 1e-9 mm of the linkage) rather than a linkage solution per angle. The
// events are set's when it is not nil (found already from the same curve).
func sample(pm plan.Model, e setting.Engine, v setting.Valve, r setting.Reverser, dir setting.Direction, set *setting.EventSet) ([]float64, setting.EventSet, error) {
	c, err := pm.Curve(r)
	if err != nil {
		return nil, setting.EventSet{}, err
	}
	out := make([]float64, curveN)
	for i := range out {
		v := c.Value(float64(i * CurveStep))
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, setting.EventSet{}, &setting.Error{Field: "motion", Message: "The valve curve is not a finite number at some crank angle."}
		}
		out[i] = v
	}
	if set != nil {
		return out, *set, nil
	}
	ev, err := setting.Events(e, v, c.Motion(), dir)
	return out, ev, err
}

// readings places the fitted round's dead-centre and sweep readings on
// the fitted curve, with their residuals. A fit made by hand, without its
// readings, gets those of the session's latest round.
func readings(s *session.Session, cyl int, fit *plan.Fit) []Reading {
	obs := fit.Observations()
	if obs == nil {
		var err error
		if obs, err = s.RoundObservations(cyl, len(s.Cylinders[cyl].Rounds)-1); err != nil {
			return nil
		}
	}
	res := map[string]plan.Residual{}
	for _, r := range fit.Residuals {
		res[r.Field] = r
	}
	d := fit.Model.Dev
	var out []Reading
	for _, o := range obs {
		if !o.HasCrank || !o.HasGauge || (o.Kind != session.AtDeadCentre && o.Kind != session.InSweep) {
			continue
		}
		r, ok := res[o.Field]
		a := math.Mod(o.CrankDeg+d.DeadCentreDeg+360, 360)
		out = append(out, Reading{
			Reverser: o.Reverser, CrankDeg: a, ValveMM: gaugeToValve(o.GaugeMM, d),
			ResidualMM: r.ResidualMM, Used: !ok || r.Used, Label: o.Label,
		})
	}
	return out
}

// gaugeToValve turns a normalised gauge reading (on the spindle) into the
// valve's displacement: less the gauge zero, plus the valve's place on its
// spindle.
func gaugeToValve(g float64, d plan.Deviations) float64 { return g - d.GaugeZeroMM + d.ValveOffsetMM }

// ValveAt returns position i's valve displacement at crank angle deg
// (degrees, any value), interpolated between the samples; after chooses
// the curve after the plan when there is one.
func (m *Model) ValveAt(i int, deg float64, after bool) float64 {
	if i < 0 || i >= len(m.Positions) {
		return 0
	}
	c := m.Positions[i].Now
	if after && m.Positions[i].HasAfter {
		c = m.Positions[i].After
	}
	return interp(c, deg)
}

// interp reads a curve sampled every CurveStep degrees at deg.
func interp(c []float64, deg float64) float64 {
	if len(c) != curveN || math.IsNaN(deg) || math.IsInf(deg, 0) {
		return 0
	}
	deg = math.Mod(deg, 360)
	if deg < 0 {
		deg += 360
	}
	f := deg / CurveStep
	k := int(f)
	if k >= curveN-1 {
		return c[curveN-1]
	}
	t := f - float64(k)
	return c[k]*(1-t) + c[k+1]*t
}

// Pose returns the gear's joints and links at crank angle deg in position
// i, as built, with the valve displacement including its place on the
// spindle; false when the gear cannot give a pose there.
func (m *Model) Pose(i int, deg float64) (setting.Pose, bool) {
	if m.gear == nil || i < 0 || i >= len(m.Positions) {
		return setting.Pose{}, false
	}
	p, err := m.gear.Pose(m.Spec.Engine, deg, m.Positions[i].Notch.Reverser)
	if err != nil {
		return setting.Pose{}, false
	}
	p.Valve += m.built.Dev.ValveOffsetMM
	return p, true
}

// Geometry returns the scale drawing's frame (see MotionGeometry).
// It is worked out on the first call (a pose of every position round a
// turn), since only the motion card needs it.
func (m *Model) Geometry() MotionGeometry {
	if !m.geoOK {
		m.geo, m.geoOK = m.geometry(), true
	}
	return m.geo
}

// PositionNames returns the names of the model's reverser positions, for
// tabs.
func (m *Model) PositionNames() []string {
	out := make([]string, len(m.Positions))
	for i, p := range m.Positions {
		out[i] = p.Notch.Name
	}
	return out
}

// length formats a length in the model's display unit.
func (m *Model) length(mm float64) string { return session.FormatLength(mm, m.Unit) }
