package session

import (
	"fmt"
	"math"
	"strconv"

	"evenbeat/setting"
)

// Kind says what an observation measured.
type Kind string

// Observation kinds.
const (
	// AtDeadCentre: a gauge reading with the crank on a dead centre.
	AtDeadCentre Kind = "dead centre"
	// InSweep: a gauge reading at a mark round the wheel.
	InSweep Kind = "sweep"
	// PortMarkKind: the gauge reading at which End's steam edge cracks. It
	// has no crank angle: it places the steam edge in gauge terms.
	PortMarkKind Kind = "port mark"
	// CutOffKind: the crank angle at which the valve closes End's steam port
	// (back at End's port mark).
	CutOffKind Kind = "cut-off"
	// FeelerKind: End's port opening measured with feelers at a crank angle.
	FeelerKind Kind = "feeler opening"
)

// CrossheadErrorMM is the error (one standard deviation) taken for a
// crosshead position read off the slide bar with a rule: about 0.5 mm
// (common practice, from memory).
const CrossheadErrorMM = 0.5

// FeelerErrorMM is the error (one standard deviation) taken for a port
// opening measured with feelers: the blades of a set step by 0.01 to
// 0.05 mm (from memory).
const FeelerErrorMM = 0.02

// Observation is one reading in the form a fitter uses: where the crank was
// (degrees from front dead centre, in the forward running direction), the
// reverser position, and what was read, with its error estimates.
//
// Gauge values are normalised so that they grow as the valve moves toward
// the front cover, whichever way the gauge was mounted: GaugeMM = valve
// displacement + an unknown gauge zero (one per round, since the gauge may
// be re-set between rounds). A least-squares fitter weights the residual
// model(CrankDeg, Reverser) + zero - GaugeMM by
// 1 / sqrt(GaugeSigmaMM^2 + (slope x CrankSigmaDeg)^2), where slope is the
// model's dv/dtheta in mm per degree there.
type Observation struct {
	Kind     Kind
	Cylinder int    // index into Session.Cylinders
	Round    int    // index into that cylinder's Rounds
	Field    string // the reading's field in the file
	// Label names the reading in words for messages: "back dead centre,
	// full forward".
	Label string

	// HasCrank is false for port marks, which belong to no crank angle.
	HasCrank bool
	// CrankDeg is the crank angle in degrees from front dead centre in the
	// forward running direction, in [0, 360).
	CrankDeg float64
	// CrankSigmaDeg is the estimated error of CrankDeg (one standard
	// deviation, degrees) from the mark error and the dead-centre bracket.
	CrankSigmaDeg float64

	// Reverser is the reverser position (+1 full forward, 0 mid, -1 full
	// back); Notch its name when one was given.
	Reverser setting.Reverser
	Notch    string
	// Direction is the way the wheel was turned.
	Direction Direction
	// End is the dead centre (AtDeadCentre) or the port (PortMarkKind,
	// CutOffKind, FeelerKind); empty for sweeps.
	End End

	// HasGauge is true when GaugeMM holds a reading: false for feeler
	// openings, and for cut-offs in a round without port marks.
	HasGauge bool
	// GaugeMM is the normalised gauge reading (mm, growing as the valve
	// moves forward). For a cut-off it is End's port mark in that round.
	GaugeMM float64
	// RawGaugeMM is the reading as the gauge showed it.
	RawGaugeMM float64
	// GaugeSigmaMM is the gauge reading's error: resolution / sqrt(12),
	// the error of rounding to the nearest division. For a feeler opening
	// it is the opening's error, FeelerErrorMM.
	GaugeSigmaMM float64

	// OpeningMM is the measured port opening (FeelerKind), negative when
	// covered.
	OpeningMM float64
}

// CylinderEngine returns the engine as cylinder i is built: the session's
// Engine as it is now, with the cylinder's Differences applied to its
// values (setting.EnginePatch; the engine is not written out as JSON), so
// a change made to Engine after the file was read is always seen. The
// result may share lists and gear objects with Engine: treat it as
// read-only.
func (s *Session) CylinderEngine(i int) (setting.EngineSpec, error) {
	if i < 0 || i >= len(s.Cylinders) {
		return setting.EngineSpec{}, userError("cylinders", fmt.Sprintf("There is no cylinder %d; the session has %d.", i, len(s.Cylinders)))
	}
	spec, err := s.Cylinders[i].Differences.Apply(s.Engine)
	if err != nil {
		d := &decoder{}
		d.engineError(fmt.Sprintf("cylinders[%d].differences", i), err)
		return setting.EngineSpec{}, d.err
	}
	return spec, nil
}

// angles converts marks of one cylinder to crank angles.
type angles struct {
	s        *Session
	cyl      int
	c        *Cylinder
	info     specInfo
	markSig  float64 // one mark's error in degrees
	geomBack float64 // back dead centre from the geometry, degrees
	spec     setting.EngineSpec
}

func (s *Session) angles(cyl int) (*angles, error) {
	spec, err := s.CylinderEngine(cyl)
	if err != nil {
		return nil, err
	}
	a := &angles{s: s, cyl: cyl, c: &s.Cylinders[cyl], info: infoOf(spec), geomBack: 180, spec: spec}
	a.markSig = math.Abs(s.Measuring.MarkError.Degrees(s.Measuring.WheelDiameterMM))
	if a.info.haveEngine {
		a.geomBack = a.info.engine.BackDeadCentre()
	}
	return a, nil
}

// deadCentre returns the bracketed dead centre of end in degrees of the
// datum scale, preferring one found turning in dir.
func (a *angles) deadCentre(end End, dir Direction) (float64, bool) {
	var found *DeadCentre
	for i := range a.c.DeadCentres {
		dc := &a.c.DeadCentres[i]
		if dc.End == end && (found == nil || dc.Direction == dir) {
			found = dc
		}
	}
	if found == nil {
		return 0, false
	}
	return found.Mark(a.s.Measuring.WheelDiameterMM).Degrees(a.s.Measuring.WheelDiameterMM), true
}

// crank converts a mark taken turning in dir to the crank angle from front
// dead centre, with its error. Without a bracketed front dead centre the
// datum itself is taken as front dead centre.
//
// Marks round the tyre are put in proportion to the dead centres bracketed
// on the tyre turning that way, when both are: the tyre between them is
// the turn from front to back dead centre, so a wheel diameter measured a
// little off (a worn tyre, a rule read at the wrong place) does not carry
// its error round the turn.
func (a *angles) crank(m Mark, dir Direction) (deg, sigma float64) {
	fdc, ok := a.deadCentre(Front, dir)
	sigma = a.markSig
	if ok {
		sigma = a.markSig * math.Sqrt(1.5) // the mark, and the midpoint of two marks
	}
	d := wrap(m.Degrees(a.s.Measuring.WheelDiameterMM)-fdc, 360)
	if k, bdc := a.tyreScale(dir); m.Scale == TyreMM && k != 1 {
		// From the nearer dead centre, the tyre in proportion.
		from, at := 0.0, 0.0
		if math.Abs(wrap(d-bdc+180, 360)-180) < math.Abs(wrap(d+180, 360)-180) {
			from, at = bdc, a.geomBack
		}
		d = wrap(at+(wrap(d-from+180, 360)-180)*k, 360)
	}
	return d, sigma
}

// tyreScale returns how much a distance round the tyre is worth against
// what the wheel diameter says: the engine's back dead centre over the
// turn between the dead centres bracketed on the tyre turning in dir; 1
// without both, or when they are more than 5 % off (then the wheel
// diameter or a bracket is wrong, and Check says so). bdc is the back
// dead centre as the brackets put it, degrees from the front one.
func (a *angles) tyreScale(dir Direction) (k, bdc float64) {
	if !a.info.haveEngine {
		return 1, 0
	}
	var f, b *DeadCentre
	for i := range a.c.DeadCentres {
		dc := &a.c.DeadCentres[i]
		if dc.Scale != TyreMM {
			continue
		}
		switch {
		case dc.End == Front && (f == nil || dc.Direction == dir):
			f = dc
		case dc.End == Back && (b == nil || dc.Direction == dir):
			b = dc
		}
	}
	if f == nil || b == nil {
		return 1, 0
	}
	w := a.s.Measuring.WheelDiameterMM
	span := wrap(b.Mark(w).Degrees(w)-f.Mark(w).Degrees(w), 360)
	k = a.geomBack / span
	if !(math.Abs(k-1) <= 0.05) {
		return 1, 0
	}
	return k, span
}

// atDeadCentre returns the crank angle of a reading taken on a dead
// centre, with its error: the reading is on the dead centre the brackets
// found, so on the engine's own back dead centre where the geometry is
// known (the tyre marks between only say where the wheel stood), and at
// the bracketed one otherwise.
func (a *angles) atDeadCentre(end End, dir Direction) (deg, sigma float64) {
	if end == Front {
		return 0, a.markSig * math.Sqrt(1.5)
	}
	if a.info.haveEngine {
		return a.geomBack, a.markSig * math.Sqrt(1.5)
	}
	return a.bracketedBack(dir), a.markSig * math.Sqrt(1.5)
}

// bracketedBack returns the back dead centre as the brackets place it
// from the front one, turning in dir.
func (a *angles) bracketedBack(dir Direction) float64 {
	bdc, okB := a.deadCentre(Back, dir)
	fdc, okF := a.deadCentre(Front, dir)
	if okB && okF {
		return wrap(bdc-fdc, 360)
	}
	if okB { // datum taken as front dead centre
		return wrap(bdc, 360)
	}
	return a.geomBack
}

// crosshead converts a crosshead travel from end's dead-centre position to
// the crank angle at which it is reached, running in dir.
func (a *angles) crosshead(end End, dir Direction, travel float64) (deg, sigma float64, err error) {
	if !a.info.haveEngine {
		return 0, 0, userError("engine", "The engine's crank geometry is needed to turn a crosshead position into a crank angle.")
	}
	e := a.info.engine
	back := e.BackDeadCentre()
	stroke := e.Stroke()
	if !(travel > 0 && travel < stroke) {
		return 0, 0, userError("crosshead_mm", fmt.Sprintf("The crosshead travel %s mm must lie between zero and the stroke (%s mm).", fmtNum(travel), fmtNum(stroke)))
	}
	// The front-end stroke runs from front dead centre to back dead centre
	// in the running direction; the back-end stroke the other half turn.
	var lo, hi float64
	var target float64
	front := e.CrossheadU(0)
	rear := e.CrossheadU(back)
	switch {
	case end == Front && dir == Forward:
		lo, hi, target = 0, back, front-travel
	case end == Front && dir == Backward:
		lo, hi, target = 360, back, front-travel
	case end == Back && dir == Forward:
		lo, hi, target = back, 360, rear+travel
	default:
		lo, hi, target = back, 0, rear+travel
	}
	// Bisection: f changes sign once between lo and hi (the crosshead moves
	// one way through a stroke).
	f := func(t float64) float64 { return e.CrossheadU(t) - target }
	flo := f(lo)
	for range 60 {
		mid := (lo + hi) / 2
		fm := f(mid)
		if (fm < 0) == (flo < 0) {
			lo, flo = mid, fm
		} else {
			hi = mid
		}
	}
	deg = wrap((lo+hi)/2, 360)
	// Error: the crosshead reading's error through the slope, plus the
	// bracket of front dead centre the crank angle is counted from.
	const h = 0.01
	slope := math.Abs(e.CrossheadU(deg+h)-e.CrossheadU(deg-h)) / (2 * h) // mm per degree
	sigma = math.Min(30, CrossheadErrorMM/math.Max(slope, 1e-9))
	return deg, sigma, nil
}

// CrankAngle returns the crank angle of a mark on cylinder cyl, in degrees
// from front dead centre in the forward running direction, [0, 360), with
// its error (one standard deviation, degrees), using the dead centre found
// turning in dir where there is one. Without a bracketed front dead centre
// the datum is taken as front dead centre.
func (s *Session) CrankAngle(cyl int, m Mark, dir Direction) (deg, sigmaDeg float64, err error) {
	a, err := s.angles(cyl)
	if err != nil {
		return 0, 0, err
	}
	deg, sigmaDeg = a.crank(m, dir)
	return deg, sigmaDeg, nil
}

// BackDeadCentre returns the crank angle of cylinder cyl's back dead centre
// in degrees from front dead centre: from the bracketed dead centres found
// turning in dir (or the other way) when both are there, else from the
// engine's geometry.
func (s *Session) BackDeadCentre(cyl int, dir Direction) (float64, error) {
	a, err := s.angles(cyl)
	if err != nil {
		return 0, err
	}
	return a.bracketedBack(dir), nil
}

// place returns the crank angle, its error and its name in words of a
// reading taken on dead centre dc, or at mark m when dc is empty.
func (a *angles) place(dc End, m Mark, dir Direction) (deg, sigma float64, words string) {
	if dc != "" {
		deg, sigma = a.atDeadCentre(dc, dir)
		return deg, sigma, string(dc) + " dead centre"
	}
	deg, sigma = a.crank(m, dir)
	return deg, sigma, markWords(m)
}

// Observations returns every reading of cylinder cyl, all rounds, as
// observations in file order: port marks (or laps) first in each round,
// then dead-centre readings, sweeps, cut-offs and feeler openings.
//
// A round without port marks or laps takes those of the latest earlier
// round, if the valve has not been moved on its spindle since: they are
// listed again in that round, with the earlier round's Field and a label
// saying so, so that each round can be fitted on its own. A fitter using
// several rounds at once should count a port mark once per Field.
func (s *Session) Observations(cyl int) ([]Observation, error) {
	return s.RoundObservations(cyl, -1)
}

// RoundObservations returns the observations of round ri of cylinder cyl
// (counting from 0), as Observations lists them; ri < 0 gives every round.
// A fit or check of one round needs no more, and a session of many rounds
// is then never held as observations all at once.
func (s *Session) RoundObservations(cyl, ri int) ([]Observation, error) {
	a, err := s.angles(cyl)
	if err != nil {
		return nil, err
	}
	return a.observations(ri)
}

// observations returns the observations of round only, or of every round
// when only < 0.
func (a *angles) observations(only int) ([]Observation, error) {
	s, cyl := a.s, a.cyl
	sign := a.gaugeSign()
	gsig := s.Measuring.GaugeResolutionMM / math.Sqrt(12)
	var out []Observation
	for ri, r := range a.c.Rounds {
		if only >= 0 && ri != only {
			continue
		}
		// Paths and labels by concatenation: this runs for every plan, and
		// fmt costs most of it in the browser's wasm.
		cp := "cylinders[" + strconv.Itoa(cyl) + "]"
		path := cp + ".rounds[" + strconv.Itoa(ri) + "]"
		base := Observation{Cylinder: cyl, Round: ri, GaugeSigmaMM: gsig}
		// atCrank starts an observation taken with the crank at an angle.
		atCrank := func(kind Kind, end End, field string, rp ReverserPosition, dir Direction) Observation {
			o := base
			o.Kind, o.End, o.Field, o.HasCrank = kind, end, field, true
			o.setReverser(rp, dir, a.info)
			return o
		}
		marks, from, haveMarks := a.edgesIn(ri)
		if haveMarks {
			src := a.c.Rounds[from]
			field := cp + ".rounds[" + strconv.Itoa(from) + "].port_marks"
			if src.PortMarks == nil {
				field = cp + ".rounds[" + strconv.Itoa(from) + "].laps"
			}
			for k, end := range []End{Front, Back} {
				o := base
				o.Kind, o.End, o.Field = PortMarkKind, end, field
				o.HasGauge, o.GaugeMM, o.RawGaugeMM = true, marks[k], sign*marks[k]
				o.Label = string(end) + " port mark"
				if from != ri {
					o.Label += " (from round " + strconv.Itoa(from+1) + ")"
				}
				out = append(out, o)
			}
		}
		for i, d := range r.DeadCentreReadings {
			o := atCrank(AtDeadCentre, d.End, path+".dead_centre_readings["+strconv.Itoa(i)+"]", d.Reverser, d.Direction)
			o.CrankDeg, o.CrankSigmaDeg = a.atDeadCentre(d.End, d.Direction)
			o.HasGauge, o.GaugeMM, o.RawGaugeMM = true, sign*d.GaugeMM, d.GaugeMM
			o.Label = string(d.End) + " dead centre, " + o.setting()
			out = append(out, o)
		}
		for i, w := range r.Sweeps {
			for j, g := range w.Readings {
				o := atCrank(InSweep, "", path+".sweeps["+strconv.Itoa(i)+"].readings["+strconv.Itoa(j)+"]", w.Reverser, w.Direction)
				o.CrankDeg, o.CrankSigmaDeg = a.crank(g.At, w.Direction)
				o.HasGauge, o.GaugeMM, o.RawGaugeMM = true, sign*g.GaugeMM, g.GaugeMM
				o.Label = "sweep at " + markWords(g.At) + ", " + o.setting()
				out = append(out, o)
			}
		}
		for i, c := range r.CutOffs {
			o := atCrank(CutOffKind, c.End, path+".cut_offs["+strconv.Itoa(i)+"]", c.Reverser, c.Direction)
			var where string
			if c.At.Scale != "" {
				o.CrankDeg, o.CrankSigmaDeg, where = a.place("", c.At, c.Direction)
			} else {
				var err error
				o.CrankDeg, o.CrankSigmaDeg, err = a.crosshead(c.End, c.Direction, c.CrossheadMM)
				if err != nil {
					return nil, userError(o.Field+".crosshead_mm", messageOf(err))
				}
				where = "crosshead " + fmtNum(c.CrossheadMM) + " mm"
			}
			if haveMarks {
				k := endIndex(c.End)
				o.HasGauge, o.GaugeMM, o.RawGaugeMM = true, marks[k], sign*marks[k]
			}
			o.Label = string(c.End) + " cut-off at " + where + ", " + o.setting()
			out = append(out, o)
		}
		for i, f := range r.FeelerOpenings {
			o := atCrank(FeelerKind, f.Port, path+".feeler_openings["+strconv.Itoa(i)+"]", f.Reverser, f.Direction)
			var where string
			o.CrankDeg, o.CrankSigmaDeg, where = a.place(f.DeadCentre, f.At, f.Direction)
			o.GaugeSigmaMM = FeelerErrorMM
			o.OpeningMM = f.OpeningMM
			o.Label = string(f.Port) + " port opening at " + where + ", " + o.setting()
			out = append(out, o)
		}
	}
	return out, nil
}

// gaugeSign is +1 when the gauge grows as the valve moves forward, -1 when
// it falls: multiplying a reading by it normalises it.
func (a *angles) gaugeSign() float64 {
	if a.s.Measuring.GaugeIncreases == Back {
		return -1
	}
	return 1
}

// portMarks returns a round's own steam edges as normalised gauge
// readings, front then back, from port marks or from laps.
func (a *angles) portMarks(r Round) ([2]float64, bool) {
	sign := a.gaugeSign()
	switch {
	case r.PortMarks != nil:
		return [2]float64{sign * r.PortMarks.FrontGaugeMM, sign * r.PortMarks.BackGaugeMM}, true
	case r.Laps != nil:
		c := sign * r.Laps.CentreGaugeMM
		// The front steam edge is reached when sense*x = lap, the back one
		// when -sense*x = lap, sense being +1 for internal admission and -1
		// for external (see setting.Admission).
		sense := 1.0
		if a.info.admission == setting.External {
			sense = -1
		}
		return [2]float64{c + sense*r.Laps.FrontMM, c - sense*r.Laps.BackMM}, true
	}
	return [2]float64{}, false
}

// edgesIn returns the steam edges (normalised gauge readings, front then
// back) that hold in round ri (see Cylinder.MarksFor); from is the round
// they were taken in.
func (a *angles) edgesIn(ri int) (edges [2]float64, from int, ok bool) {
	if from, ok = a.c.MarksFor(ri); !ok {
		return edges, 0, false
	}
	edges, ok = a.portMarks(a.c.Rounds[from])
	return edges, from, ok
}

// setReverser fills the reverser fields of an observation.
func (o *Observation) setReverser(r ReverserPosition, d Direction, info specInfo) {
	o.Direction = d
	if r.Notch != "" {
		o.Notch = r.Notch
		o.Reverser = info.notches[r.Notch]
		return
	}
	o.Reverser = r.Value
}

// setting describes the reverser and, when it is not the gear's own
// running direction, the way the wheel was turned.
func (o *Observation) setting() string {
	w := o.Notch
	switch {
	case w != "":
	case o.Reverser == 1:
		w = FullForward
	case o.Reverser == 0:
		w = MidGear
	case o.Reverser == -1:
		w = FullBack
	default:
		w = "reverser " + fmtNum(float64(o.Reverser))
	}
	natural := Forward
	if o.Reverser < 0 {
		natural = Backward
	}
	if o.Reverser == 0 || o.Direction != natural {
		w += ", turned " + string(o.Direction)
	}
	return w
}

// markWords names a mark: "tyre 40.1 mm" or "45 deg".
func markWords(m Mark) string {
	if m.Scale == TyreMM {
		return "tyre " + fmtNum(math.Round(m.Value*100)/100) + " mm"
	}
	return fmtNum(math.Round(m.Value*100)/100) + " deg"
}
