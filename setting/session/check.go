package session

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"evenbeat/setting"
)

// Plausibility ranges. They are common practice, from memory, to be
// replaced by cited values where a published source gives them; they only
// ever give warnings.
const (
	// leadLowMM and leadHighMM bound the usual full-gear lead of a 5 in
	// gauge engine (common practice, from memory). Larger engines scale the
	// band by crank radius over typicalCrankMM.
	leadLowMM  = 0.1
	leadHighMM = 0.4
	// typicalCrankMM is a typical 5 in gauge crank radius (from memory:
	// strokes of 1.5 to 2.5 in).
	typicalCrankMM = 25
	// cutOffLow and cutOffHigh bound the usual full-gear cut-off, percent of
	// stroke (common practice, from memory; published-checks C7 asks for at
	// least 75 % in miniature).
	cutOffLow  = 65
	cutOffHigh = 88
	// coarseGaugeMM: a gauge coarser than this cannot show a lead to the
	// hundredth (common practice).
	coarseGaugeMM = 0.03
	// roughMarkDeg: marks rougher than this make dead-centre readings
	// unreliable (about 0.1 mm of lead per degree on a 5 in gauge engine,
	// valve-setting primer section 4, common practice).
	roughMarkDeg = 2
	// inchLikeCrankMM and inchLikeLapMM: an engine with valve gear has a
	// crank of more than this (a gauge 1 model's is about 6 mm), and laps
	// or ports wider than this (about 0.5 and 1 mm on such a model); less
	// is inches typed in mm (from memory).
	inchLikeCrankMM = 3
	inchLikeLapMM   = 0.25
	// wrongDeadCentresDeg: bracketed dead centres further than this from
	// where the geometry puts them (or from the same dead centre bracketed
	// turning the other way) are wrong marks or a wrong wheel diameter,
	// not backlash or a worn tyre (tyreScale takes up 5 % of the wheel,
	// 9 degrees at back dead centre): Readiness refuses them; Check warns
	// from 5 degrees (common practice, no source).
	wrongDeadCentresDeg = 30
)

// Check returns the values that are possible but unusual: a lead outside
// the usual band, a wheel of odd size, marks far apart. Each names its
// field. Check never refuses anything; Decode has already refused what is
// impossible.
func (s *Session) Check() []Warning {
	var w []Warning
	add := func(field, format string, args ...any) {
		w = append(w, Warning{field, fmt.Sprintf(format, args...)})
	}
	m := s.Measuring
	if m.WheelDiameterMM < 40 || m.WheelDiameterMM > 2500 {
		add("measuring.wheel_diameter_mm", "A wheel of %s mm is unusual for an engine with valve gear; check that the diameter is in mm (%s in would be %s mm).", fmtNum(m.WheelDiameterMM), fmtNum(m.WheelDiameterMM), fmtNum(math.Round(m.WheelDiameterMM*25.4)))
	}
	// Lengths not yet given (zero, in the app's set-up) say nothing.
	e, v := s.Engine.Engine, s.Engine.Valve
	small := math.Max(math.Max(v.Front.SteamLap, v.Back.SteamLap), math.Max(v.Front.Width(), v.Back.Width()))
	if e.CrankRadius > 0 && (e.CrankRadius < inchLikeCrankMM || small > 0 && small <= inchLikeLapMM) {
		add("engine", "The engine's lengths look like inches typed where mm are asked (crank radius %s, steam laps %s and %s, port widths %s and %s): the file holds every length in mm, and 1 in is 25.4 mm. Type them again in mm (or in the app with inches chosen as the unit).",
			fmtNum(e.CrankRadius), fmtNum(v.Front.SteamLap), fmtNum(v.Back.SteamLap), fmtNum(v.Front.Width()), fmtNum(v.Back.Width()))
	}
	if m.GaugeResolutionMM > coarseGaugeMM {
		add("measuring.gauge_resolution_mm", "A gauge reading to %s mm cannot show a lead to a hundredth of a mm; a 0.01 mm (or 0.001 in) gauge is usual.", fmtNum(m.GaugeResolutionMM))
	}
	if md := math.Abs(m.MarkError.Degrees(m.WheelDiameterMM)); md > roughMarkDeg {
		add("measuring.mark_error_"+string(m.MarkError.Scale), "A mark error of %.1f degrees of crank is rough: near dead centre each degree can move the valve about 0.1 mm on a 5 in gauge engine. Finer marks, or sweeps, give a better plan.", md)
	}
	w = append(w, engineWarnings(s.Engine)...)
	for i, a := range s.Adjustments {
		if p := a.Thread.Pitch(); a.Thread != (Thread{}) && (p < 0.2 || p > 6) {
			add(fmt.Sprintf("adjustments[%d].thread", i), "A thread pitch of %s mm is unusual for an adjusting thread; check the pitch (or the threads per inch).", fmtNum(p))
		}
	}
	for ci := range s.Cylinders {
		w = append(w, s.checkCylinder(ci)...)
	}
	return w
}

// checkCylinder returns the warnings of one cylinder.
func (s *Session) checkCylinder(ci int) []Warning {
	var w []Warning
	add := func(field, format string, args ...any) {
		w = append(w, Warning{field, fmt.Sprintf(format, args...)})
	}
	c := &s.Cylinders[ci]
	cp := fmt.Sprintf("cylinders[%d]", ci)
	a, err := s.angles(ci)
	if err != nil {
		add(cp+".differences", "This cylinder's engine cannot be read: %s", messageOf(err))
		return w
	}
	for i, dc := range c.DeadCentres {
		span := dc.SpanDeg(s.Measuring.WheelDiameterMM)
		f := fmt.Sprintf("%s.dead_centres[%d]", cp, i)
		switch {
		case span == 0:
			// Readiness reports identical marks.
		case span < 2:
			add(f, "The two marks are only %.1f degrees apart: the crosshead was marked very close to the end of its travel, where it hardly moves, so the midpoint is uncertain. Mark it 20 to 40 degrees of crank before dead centre.", span)
		case span > 120:
			add(f, "The two marks are %.0f degrees of crank apart, turning %s; marks either side of a dead centre are usually 20 to 60 degrees apart. Check their order and the turning direction.", span, dc.Direction)
		}
	}
	if a.info.haveEngine {
		for _, dir := range []Direction{Forward, Backward} {
			fdc, okF := a.deadCentre(Front, dir)
			bdc, okB := a.deadCentre(Back, dir)
			if okF && okB {
				got := wrap(bdc-fdc, 360)
				if want := a.geomBack; math.Abs(got-want) > 5 && math.Abs(got-want) <= wrongDeadCentresDeg {
					add(cp+".dead_centres", "Turning %s, the bracketed dead centres are %.1f degrees apart, but the engine's geometry puts them %.1f degrees apart. Check the marks, the wheel diameter and the cylinder offset.", dir, got, want)
				}
			}
		}
	}
	band := 1.0
	if cr := a.info.engine.CrankRadius; cr > 2*typicalCrankMM {
		band = cr / typicalCrankMM
	}
	for ri, r := range c.Rounds {
		// Round by round: a file of many rounds is checked in one pass,
		// never held as observations all at once.
		obs, err := a.observations(ri)
		if err != nil {
			return w
		}
		rp := fmt.Sprintf("%s.rounds[%d]", cp, ri)
		if ri > 0 {
			if d0, e0 := parseDate(c.Rounds[ri-1].Date); e0 == nil {
				if d1, e1 := parseDate(r.Date); e1 == nil && d1.Before(d0) {
					add(rp+".date", "This round is dated %s, before the round before it (%s); rounds are kept oldest first.", r.Date, c.Rounds[ri-1].Date)
				}
			}
		}
		for i, ch := range r.AdjustmentsBefore {
			for _, adj := range s.Adjustments {
				if adj.Kind == ch.Kind && adj.Eccentric == ch.Eccentric && (ch.Amount < adj.Min || ch.Amount > adj.Max) {
					add(fmt.Sprintf("%s.adjustments_before[%d]", rp, i), "This change (%s) is outside the adjustment's limits (%s to %s); check the change or the limits.", fmtNum(ch.Amount), fmtNum(adj.Min), fmtNum(adj.Max))
				}
			}
		}
		if edges, from, ok := a.edgesIn(ri); ok && from == ri {
			if lf, lb := a.info.steamLap[0], a.info.steamLap[1]; lf+lb > 0 {
				apart := math.Abs(edges[1] - edges[0])
				if math.Abs(apart-(lf+lb)) > math.Max(0.5, 0.25*(lf+lb)) {
					add(rp+".port_marks", "The port marks are %s mm apart, but the engine's steam laps add up to %s mm; check the marks or the laps.", fmtNum(round3(apart)), fmtNum(round3(lf+lb)))
				}
			}
		}
		for _, o := range obs {
			if !o.HasCrank {
				continue
			}
			if o.Reverser > 0 && o.Direction == Backward || o.Reverser < 0 && o.Direction == Forward {
				add(o.Field, "The reading at %s was taken turning the wheel against the running direction of that gear, so the backlash in the motion lies the other way; take it again turning %s if it disagrees with the rest.", o.Label, opposite(o.Direction))
			}
			if o.Kind == CutOffKind && a.info.haveEngine && math.Abs(float64(o.Reverser)) == 1 {
				pct := 100 * a.info.engine.PistonFraction(o.CrankDeg)
				if o.End == Back {
					pct = 100 - pct
				}
				if pct < cutOffLow || pct > cutOffHigh {
					add(o.Field, "The %s is at %.0f %% of the stroke; full-gear cut-off is usually 70 to 80 %% (common practice, from memory).", o.Label, pct)
				}
			}
		}
		for _, l := range a.leads(obs) {
			if math.Abs(float64(l.Reverser)) != 1 {
				continue
			}
			lo, hi := leadLowMM*band, leadHighMM*band
			if l.LeadMM < 0 {
				add(l.Field, "The lead at %s is %s mm: the port is still closed at dead centre (negative lead).", l.Label, fmtNum(round3(l.LeadMM)))
			} else if l.LeadMM < lo || l.LeadMM > hi {
				add(l.Field, "The lead at %s is %s mm, outside the usual %s to %s mm (common practice for this size of engine, from memory).", l.Label, fmtNum(round3(l.LeadMM)), fmtNum(round3(lo)), fmtNum(round3(hi)))
			}
		}
		for i, f := range r.FeelerOpenings {
			if a.info.pistonValve {
				add(fmt.Sprintf("%s.feeler_openings[%d]", rp, i), "Feeler openings are measured on a slide valve with the chest open, but this engine has a piston valve; check the reading.")
			}
			if pw := a.info.portWidth[endIndex(f.Port)]; pw > 0 && f.OpeningMM > pw {
				add(fmt.Sprintf("%s.feeler_openings[%d].opening_mm", rp, i), "The opening %s mm is wider than the port (%s mm).", fmtNum(f.OpeningMM), fmtNum(pw))
			}
		}
	}
	return w
}

// endIndex is 0 for the front, 1 for the back.
func endIndex(e End) int {
	if e == Back {
		return 1
	}
	return 0
}

func round3(x float64) float64 { return math.Round(x*1000) / 1000 }

func parseDate(s string) (time.Time, error) {
	if t, err := time.Parse("2006-01-02", s); err == nil {
		return t, nil
	}
	return time.Parse(time.RFC3339, s)
}

// LeadReading is a lead found straight from the readings, without a fit:
// a dead-centre gauge reading against the port mark of its end, or a
// feeler opening taken on a dead centre.
type LeadReading struct {
	Round     int
	End       End // the dead centre and its port
	Reverser  setting.Reverser
	Notch     string
	Direction Direction
	// LeadMM is the lead: how far the port is open to steam at dead
	// centre, negative when still closed.
	LeadMM float64
	// SigmaMM is its error from the gauge (or feeler) alone: a dead-centre
	// reading's angle error adds to it, the more so the faster the valve
	// moves there.
	SigmaMM float64
	Field   string // the reading's field
	Label   string // "back dead centre, full forward"
}

// Leads returns the leads read straight from cylinder cyl's dead-centre
// readings and feeler openings, in file order, round by round. Readings in
// a round with no steam edges (see Readiness) give none.
func (s *Session) Leads(cyl int) ([]LeadReading, error) {
	a, err := s.angles(cyl)
	if err != nil {
		return nil, err
	}
	obs, err := a.observations(-1)
	if err != nil {
		return nil, err
	}
	return a.leads(obs), nil
}

// leads returns the leads of the observations obs (as Leads).
func (a *angles) leads(obs []Observation) []LeadReading {
	var out []LeadReading
	for _, o := range obs {
		lr := LeadReading{Round: o.Round, End: o.End, Reverser: o.Reverser, Notch: o.Notch, Direction: o.Direction, Field: o.Field, Label: o.Label}
		switch o.Kind {
		case AtDeadCentre:
			edges, _, ok := a.edgesIn(o.Round)
			if !ok {
				continue
			}
			lr.LeadMM = a.lead(o, edges)
			lr.SigmaMM = o.GaugeSigmaMM * math.Sqrt2 // the reading and the port mark
		case FeelerKind:
			// Only an opening taken on its own port's dead centre is a lead.
			if f := feelerOf(a.c, o); f.DeadCentre == "" || f.DeadCentre != f.Port {
				continue
			}
			lr.LeadMM, lr.SigmaMM = o.OpeningMM, o.GaugeSigmaMM
		default:
			continue
		}
		out = append(out, lr)
	}
	return out
}

// feelerOf returns the feeler opening a FeelerKind observation came from:
// the round's feeler openings appear in order among its observations.
func feelerOf(c *Cylinder, o Observation) FeelerOpening {
	for i, f := range c.Rounds[o.Round].FeelerOpenings {
		if strings.HasSuffix(o.Field, fmt.Sprintf(".feeler_openings[%d]", i)) {
			return f
		}
	}
	return FeelerOpening{}
}

// lead returns the lead of a dead-centre observation given the round's
// steam edges.
func (a *angles) lead(o Observation, edges [2]float64) float64 {
	return Lead(a.info.admission, o.End, o.GaugeMM, edges[endIndex(o.End)])
}

// Lead returns the lead at one end: how far that end's port is open to
// steam (mm; negative when still closed) with the crank on that end's dead
// centre, from the gauge reading there and that end's port mark, both
// normalised to grow as the valve moves toward the front cover. With
// external admission the front port opens as the valve moves back, so the
// front lead is (port mark - reading) and the back lead (reading - port
// mark); internal admission is the other way round (see setting.Admission).
func Lead(admission setting.Admission, end End, gaugeAtDeadCentreMM, portMarkMM float64) float64 {
	d := gaugeAtDeadCentreMM - portMarkMM
	if admission == setting.External {
		d = -d
	}
	if end == Back {
		d = -d
	}
	return d
}

// Readiness returns what stops or weakens a plan for cylinder cyl, judged
// on its latest round: too few readings, readings that are all the same,
// readings that contradict one another. An empty result means the readings
// are enough for a plan.
func (s *Session) Readiness(cyl int) []Problem {
	var ps []Problem
	add := func(blocking bool, field, format string, args ...any) {
		ps = append(ps, Problem{Field: field, Blocking: blocking, Message: fmt.Sprintf(format, args...)})
	}
	if cyl < 0 || cyl >= len(s.Cylinders) {
		add(true, "cylinders", "There is no cylinder %d; the session has %d.", cyl, len(s.Cylinders))
		return ps
	}
	c := &s.Cylinders[cyl]
	cp := fmt.Sprintf("cylinders[%d]", cyl)
	if spec, err := s.CylinderEngine(cyl); err == nil {
		ps = append(ps, engineRefusals(spec)...)
	}
	if len(c.Rounds) == 0 {
		add(true, cp+".rounds", "There are no readings for the %s cylinder yet. Take a round: the port marks, then gauge readings at both dead centres in full forward and full back gear (a sweep every 30 degrees is better still).", c.Name)
		return ps
	}
	a, err := s.angles(cyl)
	if err != nil {
		add(true, cp+".differences", "This cylinder's engine cannot be read: %s", messageOf(err))
		return ps
	}
	ri := len(c.Rounds) - 1
	obs, err := a.observations(ri)
	if err != nil {
		f := cp
		var e *setting.Error
		if errors.As(err, &e) {
			f = e.Field
		}
		add(true, f, "%s", messageOf(err))
		return ps
	}
	r := &c.Rounds[ri]
	rp := fmt.Sprintf("%s.rounds[%d]", cp, ri)
	res := s.Measuring.GaugeResolutionMM

	wheel := s.Measuring.WheelDiameterMM
	for i, dc := range c.DeadCentres {
		f := fmt.Sprintf("%s.dead_centres[%d]", cp, i)
		if dc.First == dc.Second {
			add(true, f, "The two bracketing marks of the %s dead centre are the same (%s): mark the tyre once a little before dead centre and once after, where the crosshead comes back to the same place.", dc.End, fmtNum(dc.First))
			continue
		}
		// The same dead centre bracketed turning each way.
		for _, other := range c.DeadCentres[i+1:] {
			if other.End == dc.End && other.First != other.Second {
				d := wrap(other.Mark(wheel).Degrees(wheel)-dc.Mark(wheel).Degrees(wheel)+180, 360) - 180
				if math.Abs(d) > wrongDeadCentresDeg {
					add(true, f, "The %s dead centre bracketed turning forward and turning backward are %.0f degrees of crank apart; backlash moves it a degree or two. Bracket the %s dead centre again both ways.", dc.End, math.Abs(d), dc.End)
				}
			}
		}
	}
	if a.info.haveEngine {
		for _, dir := range []Direction{Forward, Backward} {
			fdc, okF := a.deadCentre(Front, dir)
			bdc, okB := a.deadCentre(Back, dir)
			if got := wrap(bdc-fdc, 360); okF && okB && math.Abs(got-a.geomBack) > wrongDeadCentresDeg {
				add(true, cp+".dead_centres", "Turning %s, the bracketed front and back dead centres are %.0f degrees of crank apart, but the engine's geometry puts them %.0f degrees apart: the marks of one of them, or the wheel diameter, are wrong. Bracket both dead centres again, and measure the wheel's diameter on the tread.", dir, got, a.geomBack)
				break
			}
		}
	}
	usesMarks := false
	for _, x := range r.Sweeps {
		usesMarks = usesMarks || len(x.Readings) > 0
	}
	for _, x := range r.CutOffs {
		usesMarks = usesMarks || x.At.Scale != ""
	}
	for _, x := range r.FeelerOpenings {
		usesMarks = usesMarks || x.At.Scale != ""
	}
	if usesMarks {
		if _, ok := a.deadCentre(Front, Forward); !ok {
			add(false, cp+".dead_centres", "Front dead centre has not been found by bracketing marks, so marks round the wheel are counted as if the datum were front dead centre. Bracket front dead centre (mark the tyre either side of it) for a better plan.")
		}
	}

	edges, from, haveEdges := a.edgesIn(ri)
	if haveEdges && from != ri {
		add(false, rp, "This round has no port marks; those of round %d are used. That holds only if the gauge has not been moved or re-set since.", from+1)
	}
	if !haveEdges && len(r.FeelerOpenings) == 0 {
		add(true, rp+".port_marks", "The port marks are missing: without the gauge readings where each steam edge cracks, leads and cut-offs cannot be found. Find where each steam edge is line-on-line (or give the laps and the gauge reading at valve centre).")
	}
	if haveEdges {
		external := a.info.admission == setting.External
		edgeField := fmt.Sprintf("%s.rounds[%d].port_marks", cp, from)
		took := "the port marks"
		if c.Rounds[from].PortMarks == nil {
			edgeField, took = fmt.Sprintf("%s.rounds[%d].laps", cp, from), "the laps and the gauge reading at valve centre"
		}
		apart, laps := math.Abs(edges[1]-edges[0]), a.info.steamLap[0]+a.info.steamLap[1]
		travel := fullTravel(a.spec)
		switch {
		case travel > 0 && apart >= travel:
			// Each port opens only once the valve has moved its lap from
			// centre, so laps adding up to the whole travel leave a port
			// shut all the turn, however the valve sits on its spindle.
			add(true, edgeField, "The steam edges are %s mm apart (the front and back laps together), but the valve travels %s mm in full gear as the gear is drawn: a port would never open. Take %s again, and check the gear's dimensions (the eccentric throw).", fmtNum(round3(apart)), fmtNum(math.Round(travel*100)/100), took)
		case laps > 0 && math.Abs(apart-laps) > math.Max(1, 0.5*math.Max(apart, laps)):
			add(true, edgeField, "The steam edges are %s mm apart (the front and back laps together), but the engine's steam laps add up to %s mm: one of them is wrong. Take %s again, or correct the steam laps in the engine's set-up.", fmtNum(round3(apart)), fmtNum(round3(laps)), took)
		}
		switch {
		case edges[0] == edges[1]:
			add(true, rp+".port_marks", "The front and back port marks are the same reading; the two steam edges crack at different valve positions (steam lap either side of centre). Re-take the port marks.")
		case external && edges[0] > edges[1], !external && edges[0] < edges[1]:
			want := "lower"
			if !external {
				want = "higher"
			}
			add(true, rp+".port_marks", "The port marks are the wrong way round for %s admission: the front steam edge should crack at the %s reading when the gauge grows as the valve moves %s. Check which mark is which, and measuring.gauge_increases_toward.", a.info.admission, want, directionWords(s.Measuring.GaugeIncreases))
		}
	}

	// Enough readings, and not all the same.
	type key struct {
		rev setting.Reverser
		dir Direction
	}
	dcs := map[key]map[End][]Observation{}
	var sweeps, usable int
	var forwardGear, backGear bool
	for _, o := range obs {
		if o.Round != ri || !o.HasCrank {
			continue
		}
		usable++
		forwardGear = forwardGear || o.Reverser > 0
		backGear = backGear || o.Reverser < 0
		if o.Kind == AtDeadCentre {
			k := key{o.Reverser, o.Direction}
			if dcs[k] == nil {
				dcs[k] = map[End][]Observation{}
			}
			dcs[k][o.End] = append(dcs[k][o.End], o)
		}
	}
	if usable == 0 {
		add(true, rp, "This round has no readings at crank positions. Take gauge readings at both dead centres in full forward and full back gear, or a sweep.")
		return ps
	}
	keys := make([]key, 0, len(dcs))
	for k := range dcs {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i].rev != keys[j].rev {
			return keys[i].rev > keys[j].rev
		}
		return keys[i].dir < keys[j].dir
	})
	for _, k := range keys {
		byEnd := dcs[k]
		f, b := byEnd[Front], byEnd[Back]
		for _, list := range [][]Observation{f, b} {
			if len(list) > 1 {
				lo, hi := spread(list)
				if hi-lo > 3*res+0.02 {
					add(false, list[1].Field, "The %s was read %d times, from %s to %s mm; the fit takes them together, but re-check the reading.", list[0].Label, len(list), fmtNum(lo), fmtNum(hi))
				}
			}
		}
		switch {
		case len(f) > 0 && len(b) == 0:
			add(false, f[0].Field, "Only the front dead centre was read in %s; read the back dead centre in the same position too, so that the ends can be compared.", settingWords(f[0]))
		case len(b) > 0 && len(f) == 0:
			add(false, b[0].Field, "Only the back dead centre was read in %s; read the front dead centre in the same position too, so that the ends can be compared.", settingWords(b[0]))
		case len(f) > 0 && len(b) > 0 && math.Abs(f[0].GaugeMM-b[0].GaugeMM) < res && a.info.steamLap[0]+a.info.steamLap[1] > 0:
			add(true, b[0].Field, "The gauge read the same at both dead centres in %s (%s mm), but the valve must move by about twice its lap plus lead between them. Check that the gauge is on the valve spindle and the gear is connected.", settingWords(f[0]), fmtNum(f[0].RawGaugeMM))
		}
	}
	for i, w := range r.Sweeps {
		wp := fmt.Sprintf("%s.sweeps[%d]", rp, i)
		if len(w.Readings) == 0 {
			continue
		}
		sweeps++
		lo, hi := math.Inf(1), math.Inf(-1)
		var ang []float64
		for _, g := range w.Readings {
			lo, hi = math.Min(lo, g.GaugeMM), math.Max(hi, g.GaugeMM)
			deg, _ := a.crank(g.At, w.Direction)
			ang = append(ang, deg)
		}
		if len(w.Readings) >= 3 && hi-lo <= res/2 {
			add(true, wp, "All %d readings of this sweep are %s mm: the valve did not move, so the gauge is not on the spindle or the gear is disconnected. Re-take the sweep.", len(w.Readings), fmtNum(lo))
			continue
		}
		sort.Slice(ang, func(i, j int) bool { return ang[i] < ang[j] })
		for j := 1; j < len(ang); j++ {
			if ang[j]-ang[j-1] < 1e-6 {
				add(false, wp, "Two readings of this sweep are at the same place (%.1f degrees of crank); the fit takes them together.", ang[j])
				break
			}
		}
		if len(w.Readings) < 5 {
			add(false, wp, "This sweep has only %d readings; at least 5 are needed to fit it on its own (offset and two harmonics), 12 or more (every 30 degrees) is better.", len(w.Readings))
		} else if gap := largestGap(ang); gap > 90 {
			add(false, wp, "This sweep leaves a gap of %.0f degrees of crank with no reading; take readings every 30 degrees or closer all the way round.", gap)
		}
	}
	if len(dcs) == 0 && sweeps == 0 {
		add(true, rp, "This round has no gauge readings at dead centres and no sweep, so the leads cannot be found. Read the gauge at both dead centres in full forward and full back gear, or take a sweep.")
	}
	if a.info.gearKind != setting.KindSingleEccentric {
		if !backGear {
			add(false, rp, "There are no readings in back gear, so only forward gear can be set. Take readings at both dead centres in full back gear too.")
		}
		if !forwardGear {
			add(false, rp, "There are no readings in forward gear, so only back gear can be set. Take readings at both dead centres in full forward gear too.")
		}
	}
	if len(r.CutOffs) > 0 && !haveEdges {
		add(false, rp+".cut_offs", "Cut-off points need the port marks (the gauge reading at which the port closes); without them the cut-offs cannot be used.")
	}
	return ps
}

// engineWarnings returns the engine's design faults that are worth a
// word but allow a plan (setting.EngineSpec.WorkChecks: a full-gear
// cut-off outside the usual band, a port that never closes), each on the
// engine's field. An engine that does not yet validate (an app's set-up
// half done) gives none.
func engineWarnings(spec setting.EngineSpec) []Warning {
	var w []Warning
	_, warnings := spec.WorkChecks()
	for _, err := range warnings {
		w = append(w, Warning{engineField(err), messageOf(err)})
	}
	return w
}

// engineRefusals returns, as blocking problems, the ways the engine as
// described could not run (setting.EngineSpec.WorkChecks: a port that
// never opens to steam in full gear): a plan fitted to such an engine
// would mislead, so the dimension is named to be put right first. An
// engine that does not yet validate gives none: Decode refuses it, and an
// app's set-up names the part that does not fit as it is typed.
func engineRefusals(spec setting.EngineSpec) []Problem {
	invalid, refusals, _ := spec.CheckWork()
	if invalid != nil {
		return nil
	}
	var ps []Problem
	for _, err := range refusals {
		ps = append(ps, Problem{Field: engineField(err), Blocking: true, Message: messageOf(err) + " The readings are kept; correct the engine's dimensions and the plan is made again."})
	}
	return ps
}

// engineField places an engine error's field under the session's
// "engine".
func engineField(err error) string {
	var e *setting.Error
	if errors.As(err, &e) && e.Field != "" {
		return "engine." + e.Field
	}
	return "engine"
}

// fullTravel returns the valve's travel in full gear, forward or back
// whichever is the larger, from the engine's gear as drawn (sampled every
// 10 degrees of crank: a few hundredths of a mm short at most); 0 when
// the gear cannot say.
func fullTravel(spec setting.EngineSpec) float64 {
	g, err := spec.Gear.Gear()
	if err != nil || spec.Engine.Validate() != nil {
		return 0
	}
	travel := 0.0
	for _, r := range []setting.Reverser{1, -1} {
		lo, hi := math.Inf(1), math.Inf(-1)
		for deg := 0.0; deg < 360; deg += 10 {
			x, err := g.Valve(spec.Engine, deg, r)
			if err != nil {
				return 0
			}
			lo, hi = math.Min(lo, x), math.Max(hi, x)
		}
		travel = math.Max(travel, hi-lo)
	}
	return travel
}

// spread returns the smallest and largest raw gauge readings of a list.
func spread(list []Observation) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, o := range list {
		lo, hi = math.Min(lo, o.RawGaugeMM), math.Max(hi, o.RawGaugeMM)
	}
	return lo, hi
}

// largestGap returns the largest gap between sorted angles round a turn.
func largestGap(sorted []float64) float64 {
	if len(sorted) == 0 {
		return 360
	}
	gap := sorted[0] + 360 - sorted[len(sorted)-1]
	for j := 1; j < len(sorted); j++ {
		gap = math.Max(gap, sorted[j]-sorted[j-1])
	}
	return gap
}

// settingWords names an observation's reverser and direction.
func settingWords(o Observation) string { return o.setting() }

// directionWords says which way the valve moves for a gauge direction.
func directionWords(e End) string {
	if e == Back {
		return "back"
	}
	return "forward"
}

// messageOf returns an error's sentence without its field.
func messageOf(err error) string {
	var e *setting.Error
	if errors.As(err, &e) {
		return e.Message
	}
	return err.Error()
}

// opposite returns the other turning direction.
func opposite(d Direction) Direction {
	if d == Forward {
		return Backward
	}
	return Forward
}
