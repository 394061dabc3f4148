package session

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"testing"

	"evenbeat/setting"
)

// The example session in testdata/sessions is made by buildExample from the
// invented Brackenfold Stephenson engine (testdata/engines) with invented
// as-built errors, so that its readings are what that engine would give:
// a fitter can be tried on it and must find the errors below. Run with
// EVENBEAT_WRITE_EXAMPLE=1 to write the file again.
const examplePath = "../../testdata/sessions/brackenfold-stephenson.json"

// exampleTruth holds the invented as-built errors of the example.
type exampleTruth struct {
	valveOffset float64 // mm, valve ahead of its central place on the spindle
	backRodLong float64 // mm, backward eccentric rod longer than drawn
	gaugeZero   float64 // mm, gauge reading with the spindle central
	fdcTyre     float64 // mm round the tyre from the chalk datum to front dead centre
}

// Invented for the example (no source): the right cylinder as found, the
// right cylinder after one sixth of a turn of its 0.7 mm spindle nut, and
// the left cylinder as found.
var (
	rightAsFound = exampleTruth{valveOffset: 0.12, backRodLong: 0.25, gaugeZero: 5, fdcTyre: 12.3}
	rightRound2  = exampleTruth{valveOffset: 0.12 - 0.117, backRodLong: 0.25, gaugeZero: 5, fdcTyre: 12.3}
	leftAsFound  = exampleTruth{valveOffset: -0.08, backRodLong: 0, gaugeZero: 4.5, fdcTyre: 301.7}
)

// exampleModel is the engine with one cylinder's as-built errors.
type exampleModel struct {
	t    *testing.T
	spec setting.EngineSpec
	gear setting.Gear
	tr   exampleTruth
	circ float64
}

func newExampleModel(t *testing.T, spec setting.EngineSpec, tr exampleTruth) *exampleModel {
	st := *spec.Gear.Stephenson
	st.Backward.Rod += tr.backRodLong
	spec.Gear.Stephenson = &st
	g, err := spec.Gear.Gear()
	if err != nil {
		t.Fatal(err)
	}
	return &exampleModel{t: t, spec: spec, gear: g, tr: tr, circ: math.Pi * 115}
}

// gauge returns the gauge reading (0.01 mm divisions) at crank angle deg.
func (m *exampleModel) gauge(deg float64, r setting.Reverser) float64 {
	x, err := m.gear.Valve(m.spec.Engine, deg, r)
	if err != nil {
		m.t.Fatal(err)
	}
	return math.Round((m.tr.gaugeZero+x)*100) / 100
}

// valve returns the valve's displacement from central at crank angle deg.
func (m *exampleModel) valve(deg float64, r setting.Reverser) float64 {
	x, err := m.gear.Valve(m.spec.Engine, deg, r)
	if err != nil {
		m.t.Fatal(err)
	}
	return x + m.tr.valveOffset
}

// tyre returns the tyre mark of crank angle deg, to the half mm a setter
// marks to.
func (m *exampleModel) tyre(deg float64) float64 {
	return math.Round(2*wrap(m.tr.fdcTyre+DegToTyre(deg, 115), m.circ)) / 2
}

// crankOf returns the true crank angle of a tyre mark.
func (m *exampleModel) crankOf(tyre float64) float64 {
	return wrap(TyreToDeg(tyre-m.tr.fdcTyre, 115), 360)
}

// bracket returns the two tyre marks either side of a dead centre at crank
// angle dc, turning in dir: the first marked about 25 degrees before, the
// second where the crosshead comes back to the same place (the engine has
// no offset, so the crosshead is symmetric about each dead centre).
func (m *exampleModel) bracket(dc float64, dir Direction) [2]float64 {
	before, after := dc-24.6, dc+24.6
	if dir == Backward {
		before, after = after, before
	}
	return [2]float64{m.tyre(before), m.tyre(after)}
}

// portMarks returns the gauge readings at which each steam edge cracks.
func (m *exampleModel) portMarks() PortMarks {
	lap := m.spec.Valve.Front.SteamLap
	q := func(x float64) float64 { return math.Round(x*100) / 100 }
	// External admission: the front port opens as the valve goes back a
	// lap from central; the spindle then reads the lap less the offset.
	return PortMarks{FrontGaugeMM: q(m.tr.gaugeZero - lap - m.tr.valveOffset), BackGaugeMM: q(m.tr.gaugeZero + lap - m.tr.valveOffset)}
}

// cutOff returns the crosshead travel (to half a mm) at which the valve
// closes end's steam port in reverser position r, turning forward.
func (m *exampleModel) cutOff(end End, r setting.Reverser) float64 {
	e := m.spec.Engine
	bdc := e.BackDeadCentre()
	lap := m.spec.Valve.Front.SteamLap
	open := func(deg float64) float64 {
		if end == Front {
			return -m.valve(deg, r) - lap
		}
		return m.valve(deg, r) - lap
	}
	lo, hi := 10.0, bdc-1
	if end == Back {
		lo, hi = bdc+10, 359
	}
	for range 60 { // open > 0 at lo, < 0 at hi
		mid := (lo + hi) / 2
		if open(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	frac := e.PistonFraction(lo)
	if end == Back {
		frac = 1 - frac
	}
	return math.Round(2*frac*e.Stroke()) / 2
}

func buildExample(t *testing.T) *Session {
	f, err := os.Open("../../testdata/engines/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	spec, err := setting.DecodeEngineSpec(f)
	if err != nil {
		t.Fatal(err)
	}
	ff := ReverserPosition{Notch: FullForward}
	fb := ReverserPosition{Notch: FullBack}
	run := ReverserPosition{Notch: "running notch"}
	s := &Session{
		Name:        "Brackenfold: setting the valves after the winter overhaul",
		Invented:    true,
		Note:        "Invented example: the engine, the readings, the dates and the errors in them are made up, not measured.",
		DisplayUnit: UnitInch,
		Engine:      spec,
		Measuring: Measuring{
			WheelDiameterMM:   115,
			GaugeResolutionMM: 0.01,
			GaugeIncreases:    Front,
			MarkError:         Mark{TyreMM, 0.3},
		},
		Adjustments: []Adjustment{
			{Kind: ValveOnSpindle, Min: -1.5, Max: 1.5, Thread: Thread{PitchMM: 0.7, FlatsPerTurn: 6}, Note: "M4 lock nuts either side of the valve buckle"},
			{Kind: EccentricAngle, Eccentric: ForwardEccentric, Min: -8, Max: 8, SheaveDiameterMM: 30},
			{Kind: EccentricAngle, Eccentric: BackwardEccentric, Min: -8, Max: 8, SheaveDiameterMM: 30},
			{Kind: EccentricRodLength, Eccentric: ForwardEccentric, Min: -1.5, Max: 1.5, Thread: Thread{TPI: 40, FlatsPerTurn: 2}, Note: "fork end: half turns only"},
			{Kind: EccentricRodLength, Eccentric: BackwardEccentric, Min: -1.5, Max: 1.5, Thread: Thread{TPI: 40, FlatsPerTurn: 2}, Note: "fork end: half turns only"},
		},
		// The plan's defaults, written out: the plan of the example is the
		// same with or without them.
		Aims: PlanAims{Priority: PriorityLeads, RunningNotch: "running notch"},
	}
	bdc := spec.Engine.BackDeadCentre()

	// Right cylinder: two rounds.
	m1 := newExampleModel(t, spec, rightAsFound)
	right := Cylinder{Name: "right", Note: "Chalk datum on the right driving wheel, by the balance weight."}
	for _, dc := range []struct {
		end End
		dir Direction
		at  float64
	}{{Front, Forward, 0}, {Back, Forward, bdc}, {Front, Backward, 0}, {Back, Backward, bdc}} {
		b := m1.bracket(dc.at, dc.dir)
		right.DeadCentres = append(right.DeadCentres, DeadCentre{End: dc.end, Direction: dc.dir, Scale: TyreMM, First: b[0], Second: b[1]})
	}
	deadCentreReadings := func(m *exampleModel, positions []ReverserPosition) []DeadCentreReading {
		var out []DeadCentreReading
		for _, p := range positions {
			r := spec.Notches[0].Reverser
			switch p.Notch {
			case FullForward:
				r = 1
			case FullBack:
				r = -1
			}
			dir := Forward
			if r < 0 {
				dir = Backward
			}
			for _, end := range []End{Front, Back} {
				at := 0.0
				if end == Back {
					at = bdc
				}
				out = append(out, DeadCentreReading{End: end, Reverser: p, Direction: dir, GaugeMM: m.gauge(at, r)})
			}
		}
		return out
	}
	round1 := Round{
		Date:               "2026-11-21",
		Note:               "As found after re-assembly.",
		PortMarks:          ptr(m1.portMarks()),
		DeadCentreReadings: deadCentreReadings(m1, []ReverserPosition{ff, run, fb}),
		CutOffs: []CutOff{
			{End: Front, Reverser: ff, Direction: Forward, CrossheadMM: m1.cutOff(Front, 1)},
			{End: Back, Reverser: ff, Direction: Forward, CrossheadMM: m1.cutOff(Back, 1)},
		},
	}
	sweep := Sweep{Reverser: ff, Direction: Forward, Note: "every 30 degrees: 30.1 mm round the tyre"}
	for k := range 12 {
		mark := m1.tyre(float64(k) * 30)
		sweep.Readings = append(sweep.Readings, SweepReading{At: Mark{TyreMM, mark}, GaugeMM: m1.gauge(m1.crankOf(mark), 1)})
	}
	round1.Sweeps = []Sweep{sweep}
	m2 := newExampleModel(t, spec, rightRound2)
	round2 := Round{
		Date:               "2026-11-22",
		AdjustmentsBefore:  []Change{{Kind: ValveOnSpindle, Amount: -0.117, Note: "one flat back on the spindle nut (0.7 mm / 6)"}},
		PortMarks:          ptr(m2.portMarks()),
		DeadCentreReadings: deadCentreReadings(m2, []ReverserPosition{ff, fb}),
	}
	right.Rounds = []Round{round1, round2}

	// Left cylinder: one round, chest cover off; laps measured with a rule.
	m3 := newExampleModel(t, spec, leftAsFound)
	left := Cylinder{Name: "left", Note: "Steam chest cover off for this round."}
	for _, dc := range []struct {
		end End
		at  float64
	}{{Front, 0}, {Back, bdc}} {
		b := m3.bracket(dc.at, Forward)
		left.DeadCentres = append(left.DeadCentres, DeadCentre{End: dc.end, Direction: Forward, Scale: TyreMM, First: b[0], Second: b[1]})
	}
	lap := spec.Valve.Front.SteamLap
	lr := Round{
		Date:               "2026-11-22",
		Laps:               &Laps{FrontMM: lap, BackMM: lap, CentreGaugeMM: math.Round((m3.tr.gaugeZero-m3.tr.valveOffset)*100) / 100, Note: "valve centred by eye between the port edges"},
		DeadCentreReadings: deadCentreReadings(m3, []ReverserPosition{ff}),
	}
	for _, end := range []End{Front, Back} {
		at := 0.0
		if end == Back {
			at = bdc
		}
		x := m3.valve(at, 1)
		open := -x - lap
		if end == Back {
			open = x - lap
		}
		// Feelers come in steps of 0.05 mm (from memory).
		lr.FeelerOpenings = append(lr.FeelerOpenings, FeelerOpening{Port: end, Reverser: ff, Direction: Forward, DeadCentre: end, OpeningMM: math.Round(open*20) / 20})
	}
	left.Rounds = []Round{lr}
	s.Cylinders = []Cylinder{right, left}
	return s
}

func ptr[T any](v T) *T { return &v }

// TestExampleSessionFile checks that the example file is exactly what the
// invented engine with its invented errors gives.
func TestExampleSessionFile(t *testing.T) {
	var b bytes.Buffer
	if err := Encode(&b, buildExample(t)); err != nil {
		t.Fatal(err)
	}
	if os.Getenv("EVENBEAT_WRITE_EXAMPLE") == "1" {
		if err := os.WriteFile(filepath.FromSlash(examplePath), b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	got, err := os.ReadFile(filepath.FromSlash(examplePath))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, b.Bytes()) {
		t.Errorf("%s differs from what buildExample makes; run with EVENBEAT_WRITE_EXAMPLE=1 after checking why", examplePath)
	}
}
