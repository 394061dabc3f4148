package plan

import (
	"fmt"
	"math"
	"sort"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Harmonic is the valve curve of one reverser position fitted without the
// gear's dimensions: the normalised gauge reading as
// Coef[0] + Coef[1] cos t + Coef[2] sin t + Coef[3] cos 2t + Coef[4] sin 2t,
// t the crank angle from the marked front dead centre (forward running).
// The second harmonic carries the rods' angularity.
type Harmonic struct {
	Notch    string           `json:"notch"`
	Reverser setting.Reverser `json:"reverser"`
	Coef     [5]float64       `json:"coef"`
	RMSMM    float64          `json:"rms_mm"`
	Readings int              `json:"readings"`
}

// Gauge returns the fitted gauge reading at crank angle t (degrees).
func (h Harmonic) Gauge(t float64) float64 {
	r := t * math.Pi / 180
	s1, c1 := math.Sincos(r)
	s2, c2 := math.Sincos(2 * r)
	return h.Coef[0] + h.Coef[1]*c1 + h.Coef[2]*s1 + h.Coef[3]*c2 + h.Coef[4]*s2
}

// HarmonicFit is fit (b): a harmonic curve per reverser position with the
// port marks, which needs no gear dimensions.
type HarmonicFit struct {
	Curves []Harmonic `json:"curves"`
	// PortMarks are the normalised gauge readings of the front and back
	// steam edges.
	PortMarks [2]float64 `json:"port_marks"`
	// Residuals are every sweep and dead-centre reading against its curve;
	// Recheck those far off (left out of the fit).
	Residuals []Residual `json:"residuals"`
	Recheck   []Residual `json:"recheck"`
}

// FitHarmonic fits a harmonic curve (offset, first and second harmonics,
// linear least squares) to the gauge readings of each reverser position
// that has at least six, and takes the port marks. Readings more than 3
// robust standard deviations (at least the gauge resolution) off their
// curve are named in Recheck and left out.
func FitHarmonic(obs []session.Observation) (*HarmonicFit, error) {
	h := &HarmonicFit{}
	var marks [2]int
	groups := map[setting.Reverser][]int{}
	var order []setting.Reverser
	names := map[setting.Reverser]string{}
	res := 0.01
	for i, o := range obs {
		if !finite(o.GaugeMM) || !finite(o.CrankDeg) {
			return nil, &setting.Error{Field: o.Field, Message: fmt.Sprintf("The reading %q is not a number.", o.Label)}
		}
		if o.GaugeSigmaMM > 0 {
			res = o.GaugeSigmaMM * math.Sqrt(12)
		}
		switch o.Kind {
		case session.PortMarkKind:
			k := 0
			if o.End == session.Back {
				k = 1
			}
			h.PortMarks[k] = o.GaugeMM
			marks[k]++
		case session.AtDeadCentre, session.InSweep:
			if _, ok := groups[o.Reverser]; !ok {
				order = append(order, o.Reverser)
				names[o.Reverser] = o.Notch
			}
			groups[o.Reverser] = append(groups[o.Reverser], i)
		}
	}
	if marks[0] == 0 || marks[1] == 0 {
		return nil, &setting.Error{Field: "port_marks", Message: "The harmonic fit needs both port marks: take the gauge reading at which each steam edge just cracks."}
	}
	for _, r := range order {
		idx := groups[r]
		if len(idx) < 6 {
			continue
		}
		use := make([]bool, len(idx))
		for k := range use {
			use[k] = true
		}
		var c [5]float64
		var ok bool
		for round := 0; round < 3; round++ {
			c, ok = harmonicSolve(obs, idx, use)
			if !ok {
				break
			}
			// robust scale of the residuals
			var a []float64
			for k, i := range idx {
				if use[k] {
					a = append(a, math.Abs(obs[i].GaugeMM-Harmonic{Coef: c}.Gauge(obs[i].CrankDeg)))
				}
			}
			sort.Slice(a, func(i, j int) bool { return a[i] < a[j] })
			lim := 3 * math.Max(1.4826*a[len(a)/2], res)
			worst, wv := -1, lim
			for k, i := range idx {
				if d := math.Abs(obs[i].GaugeMM - (Harmonic{Coef: c}).Gauge(obs[i].CrankDeg)); use[k] && d > wv {
					worst, wv = k, d
				}
			}
			if worst < 0 || len(a) <= 7 {
				break
			}
			use[worst] = false
		}
		if !ok {
			return nil, &setting.Error{Field: obs[idx[0]].Field, Message: fmt.Sprintf("The readings in %s do not go round the turn: take them every 15 to 30 degrees through a whole turn.", notchName(names[r], r))}
		}
		cur := Harmonic{Notch: notchName(names[r], r), Reverser: r, Coef: c}
		var ss float64
		for k, i := range idx {
			d := obs[i].GaugeMM - cur.Gauge(obs[i].CrankDeg)
			rr := Residual{Label: obs[i].Label, Field: obs[i].Field, Kind: obs[i].Kind, ResidualMM: d, Used: use[k]}
			h.Residuals = append(h.Residuals, rr)
			if use[k] {
				ss += d * d
				cur.Readings++
			} else {
				h.Recheck = append(h.Recheck, rr)
			}
		}
		cur.RMSMM = math.Sqrt(ss / float64(cur.Readings))
		h.Curves = append(h.Curves, cur)
	}
	if len(h.Curves) == 0 {
		return nil, &setting.Error{Field: "sweeps", Message: "Too few readings for a curve: take a sweep of at least six readings round a turn in the reverser position being set."}
	}
	return h, nil
}

func notchName(name string, r setting.Reverser) string {
	switch {
	case name != "":
		return name
	case r == 1:
		return session.FullForward
	case r == -1:
		return session.FullBack
	case r == 0:
		return session.MidGear
	}
	return fmt.Sprintf("reverser %.2f", float64(r))
}

// harmonicSolve is the linear least-squares fit of the five coefficients.
func harmonicSolve(obs []session.Observation, idx []int, use []bool) ([5]float64, bool) {
	A := newSym(5)
	b := make([]float64, 5)
	for k, i := range idx {
		if !use[k] {
			continue
		}
		r := obs[i].CrankDeg * math.Pi / 180
		s1, c1 := math.Sincos(r)
		s2, c2 := math.Sincos(2 * r)
		row := [5]float64{1, c1, s1, c2, s2}
		for a := 0; a < 5; a++ {
			b[a] += row[a] * obs[i].GaugeMM
			for c := 0; c < 5; c++ {
				A.add(a, c, row[a]*row[c])
			}
		}
	}
	// Reject a badly spread set: the matrix must be well conditioned.
	for a := 0; a < 5; a++ {
		A.add(a, a, 1e-9)
	}
	x, ok := A.solve(b)
	var c [5]float64
	if !ok {
		return c, false
	}
	inv, ok := A.inverse()
	if !ok || inv.at(1, 1)+inv.at(2, 2)+inv.at(3, 3)+inv.at(4, 4) > 10 {
		return c, false
	}
	copy(c[:], x)
	return c, true
}

// Motion returns the fitted valve motion of curve i for events: the valve
// displacement with the ports placed by the port marks (the valve central
// midway between them), and the valve to use with it, whose steam laps are
// those the port marks imply; admission, exhaust laps and port widths are
// taken from v.
func (h *HarmonicFit) Motion(i int, v setting.Valve, shiftMM float64) (setting.Motion, setting.Valve) {
	centre := (h.PortMarks[0] + h.PortMarks[1]) / 2
	half := math.Abs(h.PortMarks[0]-h.PortMarks[1]) / 2
	out := v
	out.Front.SteamLap, out.Back.SteamLap = half, half
	c := h.Curves[i]
	return func(t float64) (float64, error) { return c.Gauge(t) - centre + shiftMM, nil }, out
}

// Events returns the events of curve i running in dir, with the valve
// moved shiftMM toward the front cover.
func (h *HarmonicFit) Events(e setting.Engine, v setting.Valve, i int, dir setting.Direction, shiftMM float64) (setting.EventSet, error) {
	m, vv := h.Motion(i, v, shiftMM)
	return setting.Events(e, vv, m, dir)
}

// SpindleCorrection returns the valve movement on its spindle (mm, + =
// toward the front cover) that makes the leads of curve i equal: leads
// move one way at the front and the other at the back, one for one.
func (h *HarmonicFit) SpindleCorrection(e setting.Engine, v setting.Valve, i int, dir setting.Direction) (float64, error) {
	set, err := h.Events(e, v, i, dir, 0)
	if err != nil {
		return 0, err
	}
	_, vv := h.Motion(i, v, 0)
	kf := vv.SteamEdge(setting.Front, 1) - vv.SteamEdge(setting.Front, 0)
	kb := vv.SteamEdge(setting.Back, 1) - vv.SteamEdge(setting.Back, 0)
	return clean((set.Back.Lead - set.Front.Lead) / (kf - kb)), nil
}

// PhaseCorrection returns how far to advance an eccentric (degrees, + =
// more advance in the running direction dir) to bring the mean lead of
// curve i to targetMM, by Newton's method on the fitted curve turned in
// crank angle.
func (h *HarmonicFit) PhaseCorrection(e setting.Engine, v setting.Valve, i int, dir setting.Direction, targetMM float64) (float64, error) {
	_, vv := h.Motion(i, v, 0)
	c, err := e.Prepare()
	if err != nil {
		return 0, err
	}
	bdc := c.BackDeadCentre()
	mean := func(d float64) float64 {
		m, _ := h.Motion(i, v, 0)
		s := float64(dir) * d
		xf, _ := m(0 + s)
		xb, _ := m(bdc + s)
		return (vv.SteamEdge(setting.Front, xf) + vv.SteamEdge(setting.Back, xb)) / 2
	}
	d := 0.0
	for it := 0; it < 20; it++ {
		f := mean(d) - targetMM
		g := (mean(d+0.01) - mean(d-0.01)) / 0.02
		if g == 0 || !finite(g) {
			return 0, &setting.Error{Field: "target_lead", Message: "The lead does not change with the eccentric's angle on this curve."}
		}
		step := f / g
		d -= step
		if math.Abs(step) < 1e-6 {
			break
		}
	}
	if !finite(d) || math.Abs(d) > 45 {
		return 0, &setting.Error{Field: "target_lead", Message: "The target lead cannot be reached by turning the eccentric."}
	}
	return d, nil
}
