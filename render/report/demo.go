package report

import (
	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// DemoFit returns a fixed fit and plan for cylinder 0 of the invented
// Brackenfold demo session (testdata/sessions/brackenfold-stephenson.json):
// the as-built deviations and residuals the fit found when the drawings
// were made, and an invented four-step plan using each kind of arrow. They
// are not the solver's output today: they are frozen so that demo screens
// and the drawing goldens do not move whenever the fit or the solver is
// improved. Invented data.
func DemoFit(s *session.Session) (*plan.Fit, *plan.Plan, error) {
	spec, err := s.CylinderEngine(0)
	if err != nil {
		return nil, nil, err
	}
	fit := &plan.Fit{
		Model: plan.Model{Spec: spec, Dev: plan.Deviations{
			GaugeZeroMM: 5.084805641494573, ValveOffsetMM: 0.08480555315545538, DeadCentreDeg: 0.0005495027006418349,
			EccentricDeg:   [2]float64{0.008792111181406565, -0.028102820056108105},
			EccentricRodMM: [2]float64{-0.08335983649855853, 0.1684346047022516},
		}},
		RMSMM: 7.1e-05,
		Residuals: []plan.Residual{
			{Label: "front dead centre, full forward", Field: "cylinders[0].rounds[1].dead_centre_readings[0]", Kind: session.AtDeadCentre, ResidualMM: -0.00013, Used: true},
			{Label: "back dead centre, full forward", Field: "cylinders[0].rounds[1].dead_centre_readings[1]", Kind: session.AtDeadCentre, ResidualMM: -0.00005, Used: true},
			{Label: "front dead centre, full back", Field: "cylinders[0].rounds[1].dead_centre_readings[2]", Kind: session.AtDeadCentre, ResidualMM: -0.00009, Used: true},
			{Label: "back dead centre, full back", Field: "cylinders[0].rounds[1].dead_centre_readings[3]", Kind: session.AtDeadCentre, ResidualMM: -0.00005, Used: true},
		},
	}
	p := &plan.Plan{
		Engine: spec.Name, Cylinder: s.Cylinders[0].Name, Priority: plan.EqualLeads,
		Steps: []plan.Step{
			{Part: "valve on its spindle", Kind: session.ValveOnSpindle, Unit: "mm", Amount: -0.117, Flats: 1,
				Words: "Move the valve 0.117 mm toward the back (crank) end on its spindle: 1 flat of the nut."},
			{Part: "forward eccentric rod", Kind: session.EccentricRodLength, Eccentric: session.ForwardEccentric, Unit: "mm", Amount: 0.233, Flats: 2,
				Words: "Lengthen the forward eccentric rod 0.23 mm: 2 flats of the thread."},
			{Part: "backward eccentric sheave", Kind: session.EccentricAngle, Eccentric: session.BackwardEccentric, Unit: "deg", Amount: 0.95, RimMM: 0.25,
				Words: "Advance the backward eccentric sheave 0.95 deg: turn it 0.25 mm round the rim, ahead in the backward running direction."},
			{Part: "backward eccentric rod", Kind: session.EccentricRodLength, Eccentric: session.BackwardEccentric, Unit: "mm", Amount: -0.117, Flats: 1,
				Words: "Shorten the backward eccentric rod 0.12 mm: 1 flat of the thread."},
		},
		Now: []plan.PositionState{
			{Notch: session.FullForward, Reverser: 1, Direction: setting.Forward, Running: "forward"},
			{Notch: "running notch", Reverser: 0.4, Direction: setting.Forward, Running: "forward"},
			{Notch: session.FullBack, Reverser: -1, Direction: setting.Backward, Running: "backward"},
		},
		Notes:    []string{"Equal leads and equal cut-offs cannot both be had: the connecting rod's angularity puts them apart."},
		Cautions: setting.Cautions(),
	}
	return fit, p, nil
}

// DemoModel returns the diagram model of the demo session drawn with
// DemoFit's frozen fit and plan.
func DemoModel(s *session.Session) (*render.Model, error) {
	fit, p, err := DemoFit(s)
	if err != nil {
		return nil, err
	}
	return render.NewModel(s, 0, fit, p)
}
