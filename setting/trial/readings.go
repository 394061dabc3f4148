package trial

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Round says what a setter measures in a round.
type Round struct {
	// SweepStepDeg is the step of the sweeps in full forward and full back
	// (and the running notch when SweepNotch); 0 for none.
	SweepStepDeg float64
	SweepNotch   bool
	// CutOffs: the crosshead's place at each cut-off, in every position.
	CutOffs bool
	// Feelers: the port openings at the dead centres with feelers (slide
	// valves only).
	Feelers bool
	// Wild is the index of the dead-centre reading mistyped (-1 for none)
	// and WildMM what was added to it.
	Wild   int
	WildMM float64
	// Tyre: marks measured round the tyre in mm (else a degree disc).
	Tyre bool
}

// RoundKinds name what a round measured (see Round.Kind).
var RoundKinds = []string{"dead centres only", "with sweeps", "with cut-offs"}

// Kind names what the round measured: one of RoundKinds.
func (rd Round) Kind() string {
	switch {
	case rd.CutOffs:
		return RoundKinds[2]
	case rd.SweepStepDeg > 0:
		return RoundKinds[1]
	}
	return RoundKinds[0]
}

// NewRound draws what a setter takes: always the port marks and the
// dead-centre readings in every planned position, sometimes sweeps, cut-off
// points and feelers, and now and then one reading mistyped.
func NewRound(r *rand.Rand, e Engine, opt Options) Round {
	rd := Round{Wild: -1, Tyre: r.Float64() < 0.7}
	if r.Float64() < 0.4 {
		rd.SweepStepDeg = []float64{15, 30}[r.IntN(2)]
		rd.SweepNotch = r.Float64() < 0.5
	}
	rd.CutOffs = r.Float64() < 0.3
	rd.Feelers = e.Drawing.Valve.Admission == setting.External && r.Float64() < 0.15
	if r.Float64() < 0.15 && !opt.Exact {
		rd.Wild = r.IntN(2 * len(e.Positions))
		// A digit slipped (a tenth or a whole mm) or a reading
		// taken with the gauge knocked.
		mag := []float64{0.1, 1, uniform(r, 0.2, 3)}[r.IntN(3)] * math.Pow(e.Scale, 0.7)
		if r.Float64() < 0.5 {
			mag = -mag
		}
		rd.WildMM = mag
	}
	return rd
}

// reader takes readings off the true engine.
type reader struct {
	e   Engine
	r   *rand.Rand
	bdc float64 // true back dead centre
}

// gauge returns what the dial gauge shows with the true crank at th: the
// spindle's place through the gauge's zero, sense and scale, read to the
// nearest division with a third of a division's slip.
func (g reader) gauge(th float64, rev setting.Reverser) (float64, error) {
	x, err := g.e.spindle(th, rev)
	if err != nil {
		return 0, err
	}
	return g.show(x), nil
}

// show turns a spindle place into the gauge's reading.
func (g reader) show(x float64) float64 {
	raw := g.e.GaugeZeroMM + g.e.GaugeSign*g.e.GaugeScale*x
	if g.e.SetSDDeg > 0 {
		raw += normal(g.r, g.e.ResMM/3)
	}
	return math.Round(raw/g.e.ResMM) * g.e.ResMM
}

// mark returns the mark value (mm round the tyre, or degrees) for a true
// crank angle, as the setter would chalk it: to the nearest 0.5 mm or
// 0.5 degree, with the marking error; and the true angle the mark stands
// for once chalked (what the wheel is turned to when it is read).
func (g reader) mark(th float64, tyre bool) (value, at float64) {
	deg := th - g.e.DatumDeg + normal(g.r, g.e.MarkSDDeg)
	if g.e.SetSDDeg == 0 {
		if tyre {
			return session.DegToTyre(deg, g.e.WheelMM), deg + g.e.DatumDeg
		}
		return deg, deg + g.e.DatumDeg
	}
	if tyre {
		value = math.Round(session.DegToTyre(deg, g.e.WheelMM)*2) / 2
		return value, session.TyreToDeg(value, g.e.WheelMM) + g.e.DatumDeg
	}
	value = math.Round(deg*2) / 2
	return value, value + g.e.DatumDeg
}

// Session returns the round's readings as the session a setter would
// make: the drawing, the measuring set-up, the adjustments, the bracketed
// dead centres and one round.
func (e Engine) Session(r *rand.Rand, rd Round) (*session.Session, error) {
	c, err := e.Truth.Engine.Prepare()
	if err != nil {
		return nil, err
	}
	g := reader{e: e, r: r, bdc: c.BackDeadCentre()}
	scale := session.Deg
	if rd.Tyre {
		scale = session.TyreMM
	}
	cyl := session.Cylinder{Name: "right"}
	// Dead centres bracketed turning each way used: marks either side
	// where the crosshead came back to the same place.
	dcAt := map[[2]int]float64{} // (end, dir) -> the true angle of the chosen midpoint
	dirs := []setting.Direction{setting.Forward}
	for _, p := range e.Positions {
		if p.Dir == setting.Backward {
			dirs = append(dirs, setting.Backward)
			break
		}
	}
	for _, dir := range dirs {
		for k, end := range []session.End{session.Front, session.Back} {
			th := 0.0
			if end == session.Back {
				th = g.bdc
			}
			beta := uniform(r, 15, 30)
			// Where the crosshead came back to its mark: its error
			// through the crank's slope there.
			xh := func() float64 {
				return normal(r, e.CrossheadSDMM) / (c.Engine().CrankRadius * math.Sin(beta*math.Pi/180)) * 180 / math.Pi
			}
			a1, t1 := g.mark(th-float64(dir)*beta+xh(), rd.Tyre)
			a2, t2 := g.mark(th+float64(dir)*beta+xh(), rd.Tyre)
			// The setter sets the wheel midway between the marks.
			dcAt[[2]int{k, int(dir)}] = (t1 + t2) / 2
			cyl.DeadCentres = append(cyl.DeadCentres, session.DeadCentre{End: end, Direction: sessionDir(dir), Scale: scale, First: a1, Second: a2})
		}
	}
	round := session.Round{Date: "2026-12-03"}
	// Port marks: the valve moved until each steam edge is line and line.
	var marks [2]float64
	for k, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
		x := edgeX(e.Truth.Valve, end) - e.ValveOffsetMM
		if e.SetSDDeg > 0 {
			x += normal(r, 0.01*math.Sqrt(e.Scale))
		}
		marks[k] = g.show(x)
	}
	round.PortMarks = &session.PortMarks{FrontGaugeMM: marks[0], BackGaugeMM: marks[1]}
	n := 0
	for _, p := range e.Positions {
		for k, end := range []session.End{session.Front, session.Back} {
			th := dcAt[[2]int{k, int(p.Dir)}] + normal(r, e.SetSDDeg)
			v, err := g.gauge(th, p.Reverser)
			if err != nil {
				return nil, err
			}
			if n == rd.Wild {
				v += rd.WildMM
			}
			n++
			round.DeadCentreReadings = append(round.DeadCentreReadings, session.DeadCentreReading{End: end, Reverser: reverserOf(p), Direction: sessionDir(p.Dir), GaugeMM: v})
			if rd.Feelers {
				x, err := e.spindle(th, p.Reverser)
				if err != nil {
					return nil, err
				}
				ce := setting.Front
				if end == session.Back {
					ce = setting.Back
				}
				open := e.Truth.Valve.SteamEdge(ce, x+e.ValveOffsetMM) + normal(r, 0.015)
				round.FeelerOpenings = append(round.FeelerOpenings, session.FeelerOpening{Port: end, Reverser: reverserOf(p), Direction: sessionDir(p.Dir), DeadCentre: end, OpeningMM: math.Round(open/0.02) * 0.02})
			}
		}
		full := math.Abs(float64(p.Reverser)) == 1
		if rd.SweepStepDeg > 0 && (full || rd.SweepNotch && p.Name == e.Positions[min(1, len(e.Positions)-1)].Name) {
			sw := session.Sweep{Reverser: reverserOf(p), Direction: sessionDir(p.Dir)}
			for a := 0.0; a < 360-1e-9; a += rd.SweepStepDeg {
				th := a
				if p.Dir == setting.Backward {
					th = 360 - a
				}
				val, at := g.mark(th, rd.Tyre)
				v, err := g.gauge(at+normal(r, e.SetSDDeg), p.Reverser)
				if err != nil {
					return nil, err
				}
				sw.Readings = append(sw.Readings, session.SweepReading{At: session.Mark{Scale: scale, Value: val}, GaugeMM: v})
			}
			round.Sweeps = append(round.Sweeps, sw)
		}
		if rd.CutOffs {
			set, err := e.Events(p)
			if err != nil {
				return nil, err
			}
			for k, end := range []session.End{session.Front, session.Back} {
				ee := set.Front
				ce := setting.Front
				if k == 1 {
					ee, ce = set.Back, setting.Back
				}
				if ee.NeverOpens || ee.NeverCloses {
					continue
				}
				travel := c.TravelFrom(ce, ee.CutOff.CrankDeg)*c.Stroke() + normal(r, 0.3*math.Sqrt(e.Scale))
				travel = math.Round(travel*2) / 2
				if travel <= 0 || travel >= e.Drawing.Engine.Stroke() {
					continue
				}
				round.CutOffs = append(round.CutOffs, session.CutOff{End: end, Reverser: reverserOf(p), Direction: sessionDir(p.Dir), CrossheadMM: travel})
			}
		}
	}
	cyl.Rounds = []session.Round{round}
	inc := session.GaugeFront
	if e.GaugeSign < 0 {
		inc = session.GaugeBack
	}
	// The setter states the error of a mark as they know it: the
	// scribing, the half-millimetre the rule reads to, and setting the
	// wheel to a mark again, to a tenth (at least 0.1).
	perMark := math.Sqrt(sq(e.MarkSDDeg) + sq(session.TyreToDeg(0.5, e.WheelMM))/12 + sq(e.SetSDDeg))
	markErr := session.Mark{Scale: session.Deg, Value: math.Max(0.1, math.Round(perMark*10)/10)}
	if rd.Tyre {
		markErr = session.Mark{Scale: session.TyreMM, Value: math.Max(0.1, math.Round(session.DegToTyre(perMark, e.WheelMM)*10)/10)}
	}
	spec := e.Drawing
	spec.Name = fmt.Sprintf("Trial %s, %s", e.Kind, e.Size)
	s := &session.Session{Name: spec.Name, Invented: true, DisplayUnit: session.UnitMM, Engine: spec,
		Measuring:   session.Measuring{WheelDiameterMM: math.Round(e.WheelMM), GaugeResolutionMM: e.ResMM, GaugeIncreases: inc, MarkError: markErr},
		Adjustments: e.Adjustments, Cylinders: []session.Cylinder{cyl}}
	// Through the file format, as the app and the command line read it.
	var buf bytes.Buffer
	if err := session.Encode(&buf, s); err != nil {
		return nil, err
	}
	return session.Decode(&buf)
}

// edgeX is the valve displacement at which end's steam edge is line and
// line with its port edge.
func edgeX(v setting.Valve, end setting.CylinderEnd) float64 {
	e0 := v.SteamEdge(end, 0)
	return -e0 / (v.SteamEdge(end, 1) - e0)
}

func sessionDir(d setting.Direction) session.Direction {
	if d == setting.Backward {
		return session.Backward
	}
	return session.Forward
}

func reverserOf(p Position) session.ReverserPosition {
	return session.ReverserPosition{Notch: p.Name}
}

func sq(x float64) float64 { return x * x }

// readError returns, per planned position, the standard deviation of the
// lead difference as a setter reads it straight off the gauge (the two
// dead-centre readings less the port marks), over repeated rounds of the
// same engine with fresh reading and marking errors: what a round can
// tell of that difference, whatever the planner makes of it.
func (e Engine) readError(seed uint64, i int, rd Round) ([]float64, error) {
	const repeats = 24
	plain := Round{Wild: -1, Tyre: rd.Tyre}
	sum := make([]float64, len(e.Positions))
	sum2 := make([]float64, len(e.Positions))
	for k := 0; k < repeats; k++ {
		r := rand.New(rand.NewPCG(seed^0x5eed, uint64(i)*repeats+uint64(k)))
		s, err := e.Session(r, plain)
		if err != nil {
			return nil, err
		}
		rn := s.Cylinders[0].Rounds[0]
		m := rn.PortMarks.FrontGaugeMM + rn.PortMarks.BackGaugeMM
		for p := range e.Positions {
			// Front lead less back lead, up to the gauge's sense: the
			// readings at both ends less both marks.
			d := (rn.DeadCentreReadings[2*p].GaugeMM + rn.DeadCentreReadings[2*p+1].GaugeMM - m) / e.GaugeScale
			sum[p] += d
			sum2[p] += d * d
		}
	}
	out := make([]float64, len(e.Positions))
	for p := range out {
		mean := sum[p] / repeats
		out[p] = math.Sqrt(math.Max(0, (sum2[p]-repeats*mean*mean)/(repeats-1)))
	}
	return out, nil
}
