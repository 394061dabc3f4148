package ui

import (
	"fmt"
	"math"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// field is one number the user types: an engine dimension at set-up or a
// reading while measuring. Its Key is the value's place in the session
// file, so an error or a warning about it names the same field.
type field struct {
	Key   string // the session file's field ("cylinders[0].rounds[0].port_marks.front_gauge_mm")
	Step  string // the step it belongs to, as a heading ("Port marks")
	Label string // the value in words ("Front port mark")
	Say   string // one or two sentences: what to do and where
	// Lo and Hi bound a plausible value in mm; outside them the entry is
	// accepted with a sentence asking for a second look.
	Lo, Hi float64
	// Optional fields may be skipped with the rest of their step.
	Optional bool
	// Angle marks a value in degrees (typed and shown as such, whatever the
	// display unit); Lo and Hi are then degrees too.
	Angle bool
	// Plain names the unit of a number that is not a length ("deg", "%",
	// "TPI"): typed and shown as it is, whatever the display unit.
	Plain string
	// Choices, when set, make the field a question answered by a tap on
	// one of them (no keypad); get gives the index of the one chosen.
	Choices []choice
	// form, when set, labels a button that asks the value another way
	// (the throw instead of the travel, each end on its own); toggle
	// switches to it, and with skip the field is then passed over (the
	// engine has no running notch).
	form   string
	toggle func(su *setUp, s *session.Session)
	skip   bool
	// Notch and CrankDeg say where the engine stands for this reading, for
	// the drawing of where: the reverser position ("" for full forward) and
	// about where the crank is (degrees from front dead centre).
	Notch    string
	CrankDeg float64
	get      func(s *session.Session) (float64, bool)
	set      func(s *session.Session, mm float64)
	// path gives the value's field in the file as it stands, with list
	// indices, to match session.Check's warnings; nil when Key is it.
	path func(s *session.Session) string
	// open, when set, reports that the value is one of a pair still half
	// taken (a dead centre's first mark): it is judged once both are in.
	open func(s *session.Session) bool
}

// Path returns the field's place in the session file as it stands.
func (f field) Path(s *session.Session) string {
	if f.path != nil {
		return f.path(s)
	}
	return f.Key
}

// newSession returns a session for a demo engine's design with the
// defaults a setter would start from: one cylinder, a 0.01 mm gauge, the
// adjustments the gear has, and no readings yet.
func newSession(spec setting.EngineSpec, unit session.Unit) *session.Session {
	s := &session.Session{
		Name:        spec.Name,
		Invented:    spec.Invented,
		DisplayUnit: unit,
		Engine:      spec,
		Measuring: session.Measuring{
			WheelDiameterMM:   115,
			GaugeResolutionMM: 0.01,
			GaugeIncreases:    session.GaugeFront,
			MarkError:         session.Mark{Scale: session.TyreMM, Value: 0.3},
		},
		Adjustments: defaultAdjustments(spec.Gear.Kind),
	}
	s.Engine.Cylinders = nil
	s.Cylinders = []session.Cylinder{{Name: "right"}}
	if s.Invented {
		s.Note = "Invented demo engine: the design is made up, not a real locomotive."
	}
	return s
}

// spindle is the usual valve-spindle adjustment: lock nuts on an M4
// thread (common practice, no source).
func spindle() session.Adjustment {
	return session.Adjustment{Kind: session.ValveOnSpindle, Min: -1.5, Max: 1.5,
		Thread: session.Thread{PitchMM: 0.7, FlatsPerTurn: 6}}
}

// defaultAdjustments returns the adjustments a gear of the given kind
// usually allows, with modest limits (common practice, no source).
func defaultAdjustments(kind string) []session.Adjustment {
	rod := func(k session.AdjustmentKind, e session.Eccentric) session.Adjustment {
		return session.Adjustment{Kind: k, Eccentric: e, Min: -1.5, Max: 1.5,
			Thread: session.Thread{TPI: 40, FlatsPerTurn: 2}}
	}
	sheave := func(e session.Eccentric) session.Adjustment {
		return session.Adjustment{Kind: session.EccentricAngle, Eccentric: e, Min: -8, Max: 8, SheaveDiameterMM: 30}
	}
	// Appended, not a slice literal: a literal of n makes the compiler an
	// [n]Adjustment type, and with it an equality function per length that
	// the browser build carries (some 8 KB of code for these three).
	adjs := make([]session.Adjustment, 0, 5)
	adjs = append(adjs, spindle())
	switch kind {
	case setting.KindStephenson:
		return append(adjs,
			sheave(session.ForwardEccentric), sheave(session.BackwardEccentric),
			rod(session.EccentricRodLength, session.ForwardEccentric),
			rod(session.EccentricRodLength, session.BackwardEccentric))
	case setting.KindWalschaerts:
		return append(adjs,
			session.Adjustment{Kind: session.ReturnCrankAngle, Min: -5, Max: 5},
			rod(session.EccentricRodLength, ""),
			rod(session.RadiusRodLength, ""))
	default:
		return append(adjs, sheave(""), rod(session.EccentricRodLength, ""))
	}
}

// adjustmentName names an adjustment in workshop words.
func adjustmentName(a session.Adjustment) string {
	e := ""
	if a.Eccentric != "" {
		e = string(a.Eccentric) + " "
	}
	switch a.Kind {
	case session.ValveOnSpindle:
		return "Valve on its spindle"
	case session.EccentricAngle:
		return "Turn the " + e + "eccentric"
	case session.EccentricRodLength:
		return "Length of the " + e + "eccentric rod"
	case session.ReturnCrankAngle:
		return "Turn the return crank"
	case session.RadiusRodLength:
		return "Length of the radius rod"
	case session.LiftingLinkLength:
		return "Length of the lifting link"
	}
	return string(a.Kind)
}

// position is a reverser position the setter reads in, with the way the
// wheel is turned there (the running direction of that gear).
type position struct {
	Notch string
	Dir   session.Direction
}

// positions returns the reverser positions read for a session's engine:
// full forward, the forward running notches and full back (a single
// eccentric is read in full forward only, and full back when it slips).
func positions(s *session.Session) []position {
	ps := []position{{session.FullForward, session.Forward}}
	if g := s.Engine.Gear.SingleEccentric; s.Engine.Gear.Kind == setting.KindSingleEccentric {
		if g != nil && g.Slip {
			ps = append(ps, position{session.FullBack, session.Backward}) // the slip eccentric reverses
		}
		return ps
	}
	for _, n := range s.Engine.Notches {
		if n.Reverser > 0 {
			ps = append(ps, position{n.Name, session.Forward})
		}
	}
	return append(ps, position{session.FullBack, session.Backward})
}

// morePositions returns the reverser positions a link gear may also be
// read in, each optional: mid gear (turned forward) and the backward
// running notches. A single eccentric has none.
func morePositions(s *session.Session) []position {
	if s.Engine.Gear.Kind == setting.KindSingleEccentric {
		return nil
	}
	ps := []position{{session.MidGear, session.Forward}}
	for _, n := range s.Engine.Notches {
		if n.Reverser < 0 {
			ps = append(ps, position{n.Name, session.Backward})
		}
	}
	return ps
}

// everyPosition is every reverser position read, in the order of the
// reverser's travel from full forward to full back.
func everyPosition(s *session.Session) []position {
	ps := positions(s)
	if len(ps) == 1 {
		return ps
	}
	more := morePositions(s)
	out := append([]position(nil), ps[:len(ps)-1]...)
	return append(append(out, more...), ps[len(ps)-1])
}

// sweepSteps is the number of sweep readings round one turn: every 30
// degrees (common practice, no source).
const sweepSteps = 12

// measureFields lists every reading of round ri of cylinder ci in the
// order the setter takes them. Dead centres belong to the cylinder and are
// asked only in the first round.
//
// tyreCutOffs asks for cut-offs not yet taken as tyre marks rather than as
// crosshead travel; lapsForm asks for the steam edges as laps and the
// gauge at valve centre rather than as port marks, unless the round has
// port marks already.
func measureFields(s *session.Session, ci, ri int, tyreCutOffs, lapsForm bool) []field {
	rp := fmt.Sprintf("cylinders[%d].rounds[%d]", ci, ri)
	round := func(s *session.Session) *session.Round { return &s.Cylinders[ci].Rounds[ri] }
	var fs []field
	// Port marks: optional when an earlier round's still hold.
	_, _, keep := s.Cylinders[ci].KeptMarks(ri)
	pm := func(end session.End, label, other, say string) field {
		return field{CrankDeg: deadCentreCrank(end), Key: rp + ".port_marks." + string(end) + "_gauge_mm", path: func(*session.Session) string { return rp + ".port_marks" }, Step: portMarksStep, Label: label, Say: say, Lo: -50, Hi: 50, Optional: keep,
			get: func(s *session.Session) (float64, bool) {
				p := round(s).PortMarks
				if p == nil {
					return 0, false
				}
				if p.Note == notTaken(label) {
					return 0, false
				}
				if end == session.Front {
					return p.FrontGaugeMM, true
				}
				return p.BackGaugeMM, true
			},
			set: func(s *session.Session, v float64) {
				r := round(s)
				if r.PortMarks == nil {
					r.PortMarks = &session.PortMarks{Note: notTaken(other)}
				} else if r.PortMarks.Note == notTaken(label) {
					r.PortMarks.Note = ""
				}
				if end == session.Front {
					r.PortMarks.FrontGaugeMM = v
				} else {
					r.PortMarks.BackGaugeMM = v
				}
			}}
	}
	if r := s.Cylinders[ci].Rounds[ri]; r.Laps != nil || r.PortMarks == nil && lapsForm {
		fs = append(fs, lapsFields(rp, round, keep)...)
	} else {
		front, back := portMarkWords(s)
		fs = append(fs,
			pm(session.Front, "Front port mark", "Back port mark", front),
			pm(session.Back, "Back port mark", "Front port mark", back))
	}
	// Dead centres from tyre marks, first round only: turning forward,
	// then (after the readings a plan needs) turning backward, which may
	// be skipped: a dead centre's place on the tyre is the same either
	// way, and the forward marks serve.
	brackets := func(dir session.Direction) {
		if ri > 0 {
			return
		}
		circ := s.Measuring.WheelDiameterMM * math.Pi
		for _, end := range []session.End{session.Front, session.Back} {
			for k := 0; k < 2; k++ {
				fs = append(fs, deadCentreField(ci, end, dir, k, circ, s.DisplayUnit))
			}
		}
	}
	brackets(session.Forward)
	// Dead-centre readings: full forward, the forward notches and full
	// back are needed; mid gear and the backward notches may be skipped.
	ends := []session.End{session.Front, session.Back}
	for _, p := range positions(s) {
		for _, end := range ends {
			fs = append(fs, dcReadingField(rp, round, p, end, "Readings at dead centre", false, deadCentreAt(s, ci, end, p.Dir)))
		}
	}
	if len(positions(s)) > 1 || s.Engine.Gear.Kind != setting.KindSingleEccentric {
		brackets(session.Backward)
	}
	for _, p := range morePositions(s) {
		for _, end := range ends {
			fs = append(fs, dcReadingField(rp, round, p, end, "Dead centres, "+p.Notch, true, deadCentreAt(s, ci, end, p.Dir)))
		}
	}
	// Per position, each a step that may be skipped: the sweep, the
	// cut-offs and (a slide valve with the chest open) feeler openings.
	external := s.Engine.Valve.Admission != setting.Internal
	r := &s.Cylinders[ci].Rounds[ri]
	for _, p := range everyPosition(s) {
		for k := 0; k < sweepSteps; k++ {
			fs = append(fs, sweepField(rp, round, p, k, false), sweepField(rp, round, p, k, true))
		}
		for _, end := range ends {
			fs = append(fs, cutOffField(rp, round, p, end, cutOffByTyre(r, p, end, tyreCutOffs)))
		}
		if external {
			for _, end := range ends {
				fs = append(fs, feelerField(rp, round, p, end))
			}
		}
	}
	return fs
}

// cutOffByTyre reports whether round r's cut-off at end in position p is
// (or is to be) given as a tyre mark rather than as crosshead travel: as
// it was typed, else as the user chose for new ones.
func cutOffByTyre(r *session.Round, p position, end session.End, tyre bool) bool {
	for _, c := range r.CutOffs {
		if c.End == end && c.Reverser.Notch == p.Notch && c.Direction == p.Dir {
			return c.At.Scale == session.TyreMM
		}
	}
	return tyre
}

// deadCentreField is mark k (0 first, 1 second) of the dead centre at end
// found turning dir; the marks are typed in the display unit, round the
// tyre from its datum. Turning backward the pair is optional.
func deadCentreField(ci int, end session.End, dir session.Direction, k int, circ float64, unit session.Unit) field {
	which := [2]string{"first", "second"}[k]
	round := "mm round the tyre"
	if unit == session.UnitInch {
		round = "inches round the tyre"
	}
	say := fmt.Sprintf("Turn the wheel %s until the crosshead is a little short of the %s end of its travel; scribe the crosshead on the slide bar and type the tyre mark (%s) at the pointer.", dir, end, round)
	if k == 1 {
		say = fmt.Sprintf("Keep turning %s past dead centre until the crosshead comes back to the scribed line, and type the tyre mark again (%s).", dir, round)
	}
	step := "Dead centres"
	if dir == session.Backward {
		step = "Dead centres turning backward"
		if k == 0 {
			say = "Only if you want them checked turning backward too: the forward marks serve for both ways, so you may skip this. " + say
		}
	}
	find := func(s *session.Session) int {
		for i, d := range s.Cylinders[ci].DeadCentres {
			if d.End == end && d.Direction == dir {
				return i
			}
		}
		return -1
	}
	crank := [2]float64{-25, 25}[k]
	if dir == session.Backward {
		crank = -crank
	}
	if end == session.Back {
		crank += 180
	}
	return field{CrankDeg: crank, Key: fmt.Sprintf("cylinders[%d].dead_centres[%s %s].marks_tyre_mm[%d]", ci, end, dir, k),
		Step: step, Label: fmt.Sprintf("%s dead centre turning %s, %s mark", title(string(end)), dir, which), Say: say,
		Lo: 0, Hi: circ, Optional: dir == session.Backward,
		open: func(s *session.Session) bool {
			i := find(s)
			return i >= 0 && strings.HasSuffix(s.Cylinders[ci].DeadCentres[i].Note, "mark not yet taken")
		},
		path: func(s *session.Session) string {
			return fmt.Sprintf("cylinders[%d].dead_centres[%d]", ci, find(s))
		},
		get: func(s *session.Session) (float64, bool) {
			i := find(s)
			if i < 0 {
				return 0, false
			}
			d := s.Cylinders[ci].DeadCentres[i]
			if d.Note == notTaken(which+" mark") {
				return 0, false
			}
			return [2]float64{d.First, d.Second}[k], true
		},
		set: func(s *session.Session, v float64) {
			i := find(s)
			c := &s.Cylinders[ci]
			if i < 0 {
				c.DeadCentres = append(c.DeadCentres, session.DeadCentre{End: end, Direction: dir, Scale: session.TyreMM,
					Note: notTaken([2]string{"second", "first"}[k] + " mark")})
				i = len(c.DeadCentres) - 1
			} else if c.DeadCentres[i].Note == notTaken(which+" mark") {
				c.DeadCentres[i].Note = ""
			}
			if k == 0 {
				c.DeadCentres[i].First = v
			} else {
				c.DeadCentres[i].Second = v
			}
		}}
}

// dcReadingField is the gauge reading at end's dead centre in position p,
// in the step named step; at says where that dead centre is on the tyre
// ("" while its marks are not both in).
func dcReadingField(rp string, round func(*session.Session) *session.Round, p position, end session.End, step string, optional bool, at string) field {
	mark := "mark"
	if at != "" {
		mark = "mark (the pointer at " + at + " on the tyre)"
	}
	find := func(r *session.Round) int {
		return indexWhere(r.DeadCentreReadings, func(d session.DeadCentreReading) bool {
			return d.End == end && d.Reverser.Notch == p.Notch && d.Direction == p.Dir
		})
	}
	return field{Notch: p.Notch, CrankDeg: deadCentreCrank(end), Key: fmt.Sprintf("%s.dead_centre_readings[%s %s].gauge_mm", rp, p.Notch, end),
		Step: step, Optional: optional, Label: fmt.Sprintf("%s dead centre, %s", title(string(end)), p.Notch),
		Say: fmt.Sprintf("Put the reverser in %s. Turn the wheel %s to the %s dead centre %s, taking up backlash as you go, and type the gauge reading.", p.Notch, p.Dir, end, mark),
		Lo:  -50, Hi: 50,
		path: func(s *session.Session) string {
			return fmt.Sprintf("%s.dead_centre_readings[%d]", rp, find(round(s)))
		},
		get: func(s *session.Session) (float64, bool) {
			r := round(s)
			if i := find(r); i >= 0 {
				return r.DeadCentreReadings[i].GaugeMM, true
			}
			return 0, false
		},
		set: func(s *session.Session, v float64) {
			r := round(s)
			i := find(r)
			if i < 0 {
				r.DeadCentreReadings = append(r.DeadCentreReadings, session.DeadCentreReading{End: end,
					Reverser: session.ReverserPosition{Notch: p.Notch}, Direction: p.Dir})
				i = len(r.DeadCentreReadings) - 1
			}
			r.DeadCentreReadings[i].GaugeMM = v
		}}
}

// sweepField is reading k of the sweep in position p: its tyre mark, or
// (gauge) its gauge reading.
func sweepField(rp string, round func(*session.Session) *session.Round, p position, k int, gauge bool) field {
	sweep := func(s *session.Session, make bool) *session.Sweep {
		r := round(s)
		for i := range r.Sweeps {
			if r.Sweeps[i].Reverser.Notch == p.Notch && r.Sweeps[i].Direction == p.Dir {
				return &r.Sweeps[i]
			}
		}
		if !make {
			return nil
		}
		r.Sweeps = append(r.Sweeps, session.Sweep{Reverser: session.ReverserPosition{Notch: p.Notch}, Direction: p.Dir})
		return &r.Sweeps[len(r.Sweeps)-1]
	}
	f := field{Step: "Sweep, " + p.Notch, Optional: true, Lo: -50, Hi: 50, Notch: p.Notch, CrankDeg: float64(k) * 360 / sweepSteps}
	if gauge {
		f.Key = fmt.Sprintf("%s.sweeps[%s].readings[%d].gauge_mm", rp, p.Notch, k)
		f.Label = fmt.Sprintf("%s sweep, reading %d of %d, gauge", title(p.Notch), k+1, sweepSteps)
		f.Say = "Type the gauge reading at that mark."
	} else {
		f.Key = fmt.Sprintf("%s.sweeps[%s].readings[%d].tyre_mm", rp, p.Notch, k)
		f.Label = fmt.Sprintf("%s sweep, reading %d of %d, tyre mark", title(p.Notch), k+1, sweepSteps)
		f.Say = fmt.Sprintf("Readings round a whole turn are better than dead centres alone. Turn the wheel %s about a twelfth of a turn and type the tyre mark at the pointer.", p.Dir)
		f.Lo, f.Hi = 0, 8000
	}
	f.path = func(s *session.Session) string {
		r := round(s)
		for i := range r.Sweeps {
			if r.Sweeps[i].Reverser.Notch == p.Notch && r.Sweeps[i].Direction == p.Dir {
				return fmt.Sprintf("%s.sweeps[%d].readings[%d]", rp, i, k)
			}
		}
		return f.Key
	}
	f.get = func(s *session.Session) (float64, bool) {
		sw := sweep(s, false)
		if sw == nil || k >= len(sw.Readings) {
			return 0, false
		}
		if sw.Readings[k].Note == notTaken(half(gauge)) {
			return 0, false
		}
		if gauge {
			return sw.Readings[k].GaugeMM, true
		}
		return sw.Readings[k].At.Value, true
	}
	f.set = func(s *session.Session, v float64) {
		sw := sweep(s, true)
		for len(sw.Readings) <= k {
			sw.Readings = append(sw.Readings, session.SweepReading{At: session.Mark{Scale: session.TyreMM}, Note: notTaken(half(!gauge))})
		}
		if sw.Readings[k].Note == notTaken(half(gauge)) {
			sw.Readings[k].Note = ""
		}
		if gauge {
			sw.Readings[k].GaugeMM = v
		} else {
			sw.Readings[k].At.Value = v
		}
	}
	return f
}

// cutOffField is where the valve closes end's steam port in position p:
// the crosshead's distance from end's dead centre along the slide bar, or
// (tyre) the tyre mark at the pointer.
func cutOffField(rp string, round func(*session.Session) *session.Round, p position, end session.End, tyre bool) field {
	find := func(r *session.Round) int {
		return indexWhere(r.CutOffs, func(c session.CutOff) bool {
			return c.End == end && c.Reverser.Notch == p.Notch && c.Direction == p.Dir
		})
	}
	crank := 120.0 // about three quarters of the stroke
	if end == session.Back {
		crank = 300
	}
	f := field{Notch: p.Notch, CrankDeg: crank, Key: fmt.Sprintf("%s.cut_offs[%s %s].crosshead_mm", rp, p.Notch, end),
		Step: "Cut-off points, " + p.Notch, Label: fmt.Sprintf("%s cut-off, %s", title(string(end)), p.Notch), Optional: true,
		Say: fmt.Sprintf("Put the reverser in %s. Turn %s from the %s dead centre until the gauge is back at the %s port mark; type how far the crosshead has moved from its dead-centre line on the slide bar.", p.Notch, p.Dir, end, end),
		Lo:  0, Hi: 2000,
		path: func(s *session.Session) string {
			return fmt.Sprintf("%s.cut_offs[%d]", rp, find(round(s)))
		}}
	if tyre {
		f.Key = fmt.Sprintf("%s.cut_offs[%s %s].tyre_mm", rp, p.Notch, end)
		f.Label += ", tyre mark"
		f.Say = fmt.Sprintf("Put the reverser in %s. Turn %s from the %s dead centre until the gauge is back at the %s port mark; type the tyre mark at the pointer.", p.Notch, p.Dir, end, end)
		f.Hi = 8000
	}
	f.get = func(s *session.Session) (float64, bool) {
		r := round(s)
		i := find(r)
		if i < 0 {
			return 0, false
		}
		if c := r.CutOffs[i]; tyre {
			return c.At.Value, c.At.Scale == session.TyreMM
		} else {
			return c.CrossheadMM, c.At.Scale == ""
		}
	}
	f.set = func(s *session.Session, v float64) {
		r := round(s)
		i := find(r)
		if i < 0 {
			r.CutOffs = append(r.CutOffs, session.CutOff{End: end, Reverser: session.ReverserPosition{Notch: p.Notch}, Direction: p.Dir})
			i = len(r.CutOffs) - 1
		}
		c := &r.CutOffs[i]
		if tyre {
			c.At, c.CrossheadMM = session.Mark{Scale: session.TyreMM, Value: v}, 0
		} else {
			c.At, c.CrossheadMM = session.Mark{}, v
		}
	}
	return f
}

// feelerField is the opening of end's steam port measured with feelers at
// end's dead centre in position p (a slide valve with the chest cover
// off); negative when the port is still covered by that much.
func feelerField(rp string, round func(*session.Session) *session.Round, p position, end session.End) field {
	find := func(r *session.Round) int {
		return indexWhere(r.FeelerOpenings, func(o session.FeelerOpening) bool {
			return o.Port == end && o.DeadCentre == end && o.Reverser.Notch == p.Notch && o.Direction == p.Dir
		})
	}
	return field{Notch: p.Notch, CrankDeg: deadCentreCrank(end), Key: fmt.Sprintf("%s.feeler_openings[%s %s].opening_mm", rp, p.Notch, end),
		Step: "Feeler openings, " + p.Notch, Label: fmt.Sprintf("%s port open at %s dead centre, %s", title(string(end)), end, p.Notch), Optional: true,
		Say: fmt.Sprintf("With the steam-chest cover off: reverser in %s, turn %s to the %s dead centre and measure the %s port's opening with feelers (the lead); type it negative if the valve still covers the port by that much. Skip if the chest is closed.", p.Notch, p.Dir, end, end),
		Lo:  -3, Hi: 10,
		path: func(s *session.Session) string {
			return fmt.Sprintf("%s.feeler_openings[%d]", rp, find(round(s)))
		},
		get: func(s *session.Session) (float64, bool) {
			r := round(s)
			if i := find(r); i >= 0 {
				return r.FeelerOpenings[i].OpeningMM, true
			}
			return 0, false
		},
		set: func(s *session.Session, v float64) {
			r := round(s)
			i := find(r)
			if i < 0 {
				r.FeelerOpenings = append(r.FeelerOpenings, session.FeelerOpening{Port: end, DeadCentre: end,
					Reverser: session.ReverserPosition{Notch: p.Notch}, Direction: p.Dir})
				i = len(r.FeelerOpenings) - 1
			}
			r.FeelerOpenings[i].OpeningMM = v
		}}
}

// lapsFields are the steam edges given the other way: the two steam laps
// and the gauge reading with the valve central (the round's laps). Each
// value not yet typed is named in the laps' note.
func lapsFields(rp string, round func(*session.Session) *session.Round, optional bool) []field {
	names := [3]string{"Front steam lap", "Back steam lap", "Gauge at valve centre"}
	says := [3]string{
		"Laps instead of port marks: the front steam lap as measured on this valve and port face (cover off, or from the valve and liner dimensions).",
		"The back steam lap, measured the same way.",
		"Set the valve central between its two port edges and type the dial gauge reading there.",
	}
	ptr := func(l *session.Laps, k int) *float64 {
		return [3]*float64{&l.FrontMM, &l.BackMM, &l.CentreGaugeMM}[k]
	}
	var fs []field
	for k, name := range names {
		lo, hi := -5.0, 60.0 // a lap (mm): small negative laps happen
		if k == 2 {
			lo, hi = -50, 50 // a gauge reading
		}
		fs = append(fs, field{Key: rp + ".laps." + [3]string{"front_lap_mm", "back_lap_mm", "centre_gauge_mm"}[k], path: func(*session.Session) string { return rp + ".laps" },
			Step: portMarksStep, Label: name, Say: says[k], Lo: lo, Hi: hi, Optional: optional, CrankDeg: 90,
			get: func(s *session.Session) (float64, bool) {
				l := round(s).Laps
				if l == nil || strings.Contains(l.Note, notTaken(name)) {
					return 0, false
				}
				return *ptr(l, k), true
			},
			set: func(s *session.Session, v float64) {
				r := round(s)
				if r.Laps == nil {
					var missing []string
					for _, n := range names {
						if n != name {
							missing = append(missing, notTaken(n))
						}
					}
					r.Laps = &session.Laps{Note: strings.Join(missing, "; ")}
				}
				l := r.Laps
				parts := strings.Split(l.Note, "; ")
				kept := parts[:0]
				for _, p := range parts {
					if p != notTaken(name) && p != "" {
						kept = append(kept, p)
					}
				}
				l.Note = strings.Join(kept, "; ")
				*ptr(l, k) = v
			}})
	}
	return fs
}

// indexWhere returns the index of the first element of list that match
// accepts, or -1.
func indexWhere[T any](list []T, match func(T) bool) int {
	for i, x := range list {
		if match(x) {
			return i
		}
	}
	return -1
}

// deadCentreCrank is about where the crank stands at end's dead centre
// (degrees from front dead centre), for the drawing of where.
func deadCentreCrank(end session.End) float64 {
	if end == session.Back {
		return 180
	}
	return 0
}

// notTaken is the note a pair of values carries while one of them, named
// by what, is still to be typed: kept in the file, so a reload knows the
// zero there was never read.
func notTaken(what string) string { return what + " not yet taken" }

// half names the half of a sweep reading: its gauge reading or its mark.
func half(gauge bool) string {
	if gauge {
		return "gauge reading"
	}
	return "tyre mark"
}

// title returns s with its first letter in capitals.
func title(s string) string {
	if s == "" {
		return s
	}
	return string(s[0]-'a'+'A') + s[1:]
}
