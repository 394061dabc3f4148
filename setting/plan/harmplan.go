package plan

import (
	"fmt"
	"math"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// MakeWithoutDimensions plans from fit (b), the harmonic curves, for a
// gear whose dimensions are unknown or do not follow the readings (the
// dimensional fit refused them as contradictory). It uses no gear
// dimensions, only the port marks, the crank geometry and the valve's
// admission: the valve on its spindle equalises the leads in full forward
// gear (or the first position swept); on a Stephenson gear the backward
// rod then equalises them in full back gear, taken to move the valve as
// the spindle does there (one for one in full gear, the rods running
// forward from the axle to the link); on a single-eccentric gear with
// opt.TargetLeadMM the eccentric is turned to bring the mean lead to it.
// Errors are not carried through (the steps' SigmaAmount is zero) and
// cut-offs are not balanced: a note says so.
func MakeWithoutDimensions(s *session.Session, opt Options) (*Plan, error) {
	if s == nil || opt.Cylinder < 0 || opt.Cylinder >= len(s.Cylinders) {
		return nil, &setting.Error{Field: "cylinders", Message: "There is no such cylinder in the session."}
	}
	if len(s.Cylinders[opt.Cylinder].Rounds) == 0 {
		return nil, &setting.Error{Field: fmt.Sprintf("cylinders[%d].rounds", opt.Cylinder), Message: "There are no readings yet: take the port marks and a sweep every 15 to 30 degrees in full forward gear."}
	}
	if opt.Unit == "" {
		opt.Unit = s.DisplayUnit
	}
	spec, err := s.CylinderEngine(opt.Cylinder)
	if err != nil {
		return nil, err
	}
	obs, err := roundObservations(s, opt.Cylinder, opt.Fit.Round)
	if err != nil {
		return nil, err
	}
	h, err := FitHarmonic(obs)
	if err != nil {
		return nil, err
	}
	e, v := spec.Engine, spec.Valve
	if err := e.Validate(); err != nil {
		return nil, err
	}
	find := func(r setting.Reverser) int {
		for i, c := range h.Curves {
			if c.Reverser == r {
				return i
			}
		}
		return -1
	}
	fwd := find(1)
	if fwd < 0 {
		fwd = 0
	}
	dirOf := func(i int) setting.Direction {
		if h.Curves[i].Reverser < 0 {
			return setting.Backward
		}
		return setting.Forward
	}
	adj := func(kind session.AdjustmentKind, ecc session.Eccentric) (knob, bool) {
		ks, _ := knobsOf(spec, s.Adjustments)
		for _, k := range ks {
			if k.adj.Kind == kind && (ecc == "" || k.adj.Eccentric == ecc) {
				return k, true
			}
		}
		return knob{}, false
	}
	p := &Plan{Engine: spec.Name, Cylinder: s.Cylinders[opt.Cylinder].Name, Priority: EqualLeads, Recheck: h.Recheck, Cautions: setting.Cautions(),
		Notes: []string{"Planned without the gear's dimensions, from a curve fitted to each position's readings: only the spindle" + map[bool]string{true: " and the backward rod", false: ""}[spec.Gear.Kind == setting.KindStephenson] + " can be worked out, the readings' errors are not carried through, and cut-offs are not balanced."}}
	if p.Recheck == nil {
		p.Recheck = []Residual{}
	}
	for _, r := range h.Recheck {
		p.Notes = append(p.Notes, fmt.Sprintf("recheck: %s, %s off the fit", r.Label, length(math.Abs(r.ResidualMM), opt.Unit)))
	}
	shift := make([]float64, len(h.Curves)) // valve movement per curve after the plan
	var steps []Step
	add := func(k knob, ideal float64) float64 {
		amt, at := handRound(k, ideal)
		if amt == 0 {
			return 0
		}
		st := newStep(k, spec.Gear.Kind, ideal, amt)
		st.AtLimit = at
		st.Words = stepWords(st, opt.Unit)
		steps = append(steps, st)
		return amt
	}
	phase := 0.0
	if opt.TargetLeadMM != nil && spec.Gear.Kind == setting.KindSingleEccentric {
		if k, ok := adj(session.EccentricAngle, ""); ok {
			d, err := h.PhaseCorrection(e, v, fwd, dirOf(fwd), *opt.TargetLeadMM)
			if err != nil {
				return nil, err
			}
			phase = add(k, d)
		}
	}
	turned := func(i int, sh float64) (setting.EventSet, error) {
		m, vv := h.Motion(i, v, sh)
		d := float64(dirOf(i)) * phase
		return setting.Events(e, vv, func(t float64) (float64, error) { return m(t + d) }, dirOf(i))
	}
	if k, ok := adj(session.ValveOnSpindle, ""); ok {
		set, err := turned(fwd, 0)
		if err != nil {
			return nil, err
		}
		_, vv := h.Motion(fwd, v, 0)
		kf := vv.SteamEdge(setting.Front, 1) - vv.SteamEdge(setting.Front, 0)
		kb := vv.SteamEdge(setting.Back, 1) - vv.SteamEdge(setting.Back, 0)
		sp := add(k, (set.Back.Lead-set.Front.Lead)/(kf-kb))
		for i := range shift {
			shift[i] = sp
		}
	}
	if spec.Gear.Kind == setting.KindStephenson {
		if back := find(-1); back >= 0 {
			if k, ok := adj(session.EccentricRodLength, session.BackwardEccentric); ok {
				set, err := turned(back, shift[back])
				if err != nil {
					return nil, err
				}
				_, vv := h.Motion(back, v, 0)
				kf := vv.SteamEdge(setting.Front, 1) - vv.SteamEdge(setting.Front, 0)
				kb := vv.SteamEdge(setting.Back, 1) - vv.SteamEdge(setting.Back, 0)
				if d := add(k, (set.Back.Lead-set.Front.Lead)/(kf-kb)); d != 0 {
					shift[back] += d
					p.Notes = append(p.Notes, "The backward rod moves the valve a little in forward gear too (the die seldom stands right at the forward rod's pin): read the full-forward dead centres again after changing it.")
				}
			}
		}
	}
	p.Steps = steps
	if p.Steps == nil {
		p.Steps = []Step{}
	}
	for i, c := range h.Curves {
		now, err := h.Events(e, v, i, dirOf(i), 0)
		if err != nil {
			return nil, err
		}
		after, err := turned(i, shift[i])
		if err != nil {
			return nil, err
		}
		st := PositionState{Notch: c.Notch, Reverser: float64(c.Reverser), Direction: dirOf(i), Running: dirOf(i).String()}
		p.Now = append(p.Now, PositionState{Notch: st.Notch, Reverser: st.Reverser, Direction: st.Direction, Running: st.Running, Front: endState(now.Front), Back: endState(now.Back)})
		st.Front, st.Back = endState(after.Front), endState(after.Back)
		p.After = append(p.After, st)
	}
	var ss float64
	var n int
	for _, r := range h.Residuals {
		if r.Used {
			ss += r.ResidualMM * r.ResidualMM
			n++
		}
	}
	if n > 0 {
		p.FitRMSMM = math.Sqrt(ss / float64(n))
	}
	return p, nil
}
