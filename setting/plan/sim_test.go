package plan

import (
	"bytes"
	"math"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// The test engines are invented for these tests (no source): a 5 in gauge
// size engine, crank 22 mm, rod 132 mm (six cranks), slide valves with
// 2.4 mm lap and port, in the three gears.

func testValve() setting.Valve {
	end := setting.End{SteamLap: 2.4, PortWidth: 2.4}
	return setting.Valve{Admission: setting.External, Front: end, Back: end}
}

func testSpec(t testing.TB, kind string) setting.EngineSpec {
	t.Helper()
	e := setting.Engine{CrankRadius: 22, RodLength: 132}
	spec := setting.EngineSpec{Name: "Test " + kind, Invented: true, Engine: e, Valve: testValve(),
		Notches: []setting.Notch{{Name: "running", Reverser: 0.4}}}
	switch kind {
	case setting.KindSingleEccentric:
		g := setting.SingleEccentric{Eccentric: setting.Eccentric{Throw: 5, Advance: 31.3, Rod: 120}, Admission: setting.External, ValveCentreU: 120}
		spec.Gear = setting.GearSpec{Kind: kind, SingleEccentric: &g}
	case setting.KindStephenson:
		g := setting.Stephenson{Forward: setting.Eccentric{Throw: 5.2, Advance: 31.3, Rod: 130}, Backward: setting.Eccentric{Throw: 5.2, Advance: 31.3, Rod: 130},
			Admission: setting.External, Link: setting.ExpansionLink{Radius: 130, PinSpacing: 36}, Weighshaft: setting.Point{U: 100, W: 45},
			ReverseArm: 30, ArmSwing: -35, LiftingLink: 45, ValveCentreU: 130}
		spec.Gear = setting.GearSpec{Kind: kind, Stephenson: &g}
	case setting.KindWalschaerts:
		w := setting.Walschaerts{ReturnCrank: 24.2, ReturnAngle: 155.6, EccentricRod: 62, Trunnion: setting.Point{U: 62, W: 38}, LinkFoot: setting.Point{U: 0, W: -30},
			LinkRadius: 110, FullGearDie: -9, RadiusRod: 110, Lever: setting.CombinationLever{ValvePin: -7.09, UnionPin: 60}, UnionLink: 40,
			CrossheadArm: setting.Point{U: 0, W: -22}, Guide: 45, ValveCentreU: 172}
		w, err := w.CentreLink(e)
		if err != nil {
			t.Fatal(err)
		}
		spec.Gear = setting.GearSpec{Kind: kind, Walschaerts: &w}
	}
	if err := spec.Validate(); err != nil {
		t.Fatal(err)
	}
	return spec
}

// thread is a fine adjuster: 0.5 mm pitch read on a 30-division collar
// (0.0167 mm a division), so rounding alone cannot spoil 0.02 mm.
var fineThread = session.Thread{PitchMM: 0.5, FlatsPerTurn: 30}

// testAdjustments lists what each test engine allows.
func testAdjustments(kind string) []session.Adjustment {
	spindle := session.Adjustment{Kind: session.ValveOnSpindle, Min: -3, Max: 3, Thread: fineThread}
	switch kind {
	case setting.KindStephenson:
		return []session.Adjustment{spindle,
			{Kind: session.EccentricRodLength, Eccentric: session.BackwardEccentric, Min: -3, Max: 3, Thread: fineThread},
			{Kind: session.EccentricRodLength, Eccentric: session.ForwardEccentric, Min: -3, Max: 3, Thread: fineThread}}
	case setting.KindWalschaerts:
		return []session.Adjustment{spindle,
			{Kind: session.EccentricRodLength, Min: -3, Max: 3, Thread: fineThread},
			{Kind: session.RadiusRodLength, Min: -3, Max: 3, Thread: fineThread},
			{Kind: session.ReturnCrankAngle, Min: -5, Max: 5}}
	}
	return []session.Adjustment{spindle, {Kind: session.EccentricAngle, Min: -8, Max: 8, SheaveDiameterMM: 40}}
}

// simulated is an as-built engine: the drawing with known deviations.
type simulated struct {
	spec setting.EngineSpec
	dev  Deviations
	zero float64 // the gauge reading with the valve central
}

// reading is the gauge at true crank angle th, quantised to 0.01 mm.
func (s simulated) reading(t testing.TB, th float64, r setting.Reverser) float64 {
	t.Helper()
	g, err := Model{Spec: s.spec, Dev: s.dev}.Gear()
	if err != nil {
		t.Fatal(err)
	}
	x, err := g.Valve(s.spec.Engine, th+s.dev.DeadCentreDeg, r)
	if err != nil {
		t.Fatal(err)
	}
	return q01(x + s.dev.GaugeZeroMM)
}

func q01(x float64) float64 { return math.Round(x*100) / 100 }

// session builds a session of readings of the simulated engine: port
// marks, dead centres in the three positions and sweeps every stepDeg in
// full forward, the running notch and full back, both directions.
func (s simulated) session(t testing.TB, stepDeg float64, adjs []session.Adjustment) *session.Session {
	t.Helper()
	r := session.Round{Date: "2026-12-01"}
	front := edgeX(s.spec.Valve, setting.Front) + s.dev.GaugeZeroMM - s.dev.ValveOffsetMM
	back := edgeX(s.spec.Valve, setting.Back) + s.dev.GaugeZeroMM - s.dev.ValveOffsetMM
	r.PortMarks = &session.PortMarks{FrontGaugeMM: q01(front), BackGaugeMM: q01(back)}
	bdc := s.spec.Engine.BackDeadCentre()
	notches := []struct {
		name string
		r    setting.Reverser
	}{{session.FullForward, 1}, {"running", 0.4}, {session.FullBack, -1}}
	for _, n := range notches {
		dir := session.Forward
		if n.r < 0 {
			dir = session.Backward
		}
		for _, end := range []session.End{session.Front, session.Back} {
			th := 0.0
			if end == session.Back {
				th = bdc
			}
			r.DeadCentreReadings = append(r.DeadCentreReadings, session.DeadCentreReading{End: end, Reverser: session.ReverserPosition{Notch: n.name}, Direction: dir, GaugeMM: s.reading(t, th, n.r)})
		}
		if stepDeg > 0 {
			for _, d := range []session.Direction{session.Forward, session.Backward} {
				sw := session.Sweep{Reverser: session.ReverserPosition{Notch: n.name}, Direction: d}
				for th := 0.0; th < 360-1e-9; th += stepDeg {
					sw.Readings = append(sw.Readings, session.SweepReading{At: session.Mark{Scale: session.Deg, Value: th}, GaugeMM: s.reading(t, th, n.r)})
				}
				r.Sweeps = append(r.Sweeps, sw)
			}
		}
	}
	ses := &session.Session{Name: "Simulated", Invented: true, DisplayUnit: session.UnitMM, Engine: s.spec,
		Measuring:   session.Measuring{WheelDiameterMM: 115, GaugeResolutionMM: 0.01, GaugeIncreases: session.GaugeFront, MarkError: session.Mark{Scale: session.Deg, Value: 0.1}},
		Adjustments: adjs,
		Cylinders:   []session.Cylinder{{Name: "left", Rounds: []session.Round{r}}}}
	return roundTrip(t, ses)
}

// roundTrip writes and reads a session, so that every test session is one
// the decoder accepts.
func roundTrip(t testing.TB, s *session.Session) *session.Session {
	t.Helper()
	var buf bytes.Buffer
	if err := session.Encode(&buf, s); err != nil {
		t.Fatal(err)
	}
	out, err := session.Decode(&buf)
	if err != nil {
		t.Fatalf("%v\n%s", err, buf.String())
	}
	return out
}

// after returns the simulated engine with a plan's rounded steps made.
func (s simulated) after(t testing.TB, steps []Step) simulated {
	t.Helper()
	ks, _ := knobsOf(s.spec, testAdjustmentsFor(steps))
	v := s.dev.vec()
	for i, st := range steps {
		v[ks[i].p] += st.Amount
	}
	out := s
	out.dev = devOf(v)
	return out
}

// afterIdeal returns the simulated engine with a plan's ideal
// (continuous) changes made.
func (s simulated) afterIdeal(t testing.TB, steps []Step) simulated {
	t.Helper()
	ideal := append([]Step(nil), steps...)
	for i := range ideal {
		ideal[i].Amount = ideal[i].IdealAmount
	}
	return s.after(t, ideal)
}

func testAdjustmentsFor(steps []Step) []session.Adjustment {
	var out []session.Adjustment
	for _, st := range steps {
		out = append(out, session.Adjustment{Kind: st.Kind, Eccentric: st.Eccentric})
	}
	return out
}

// events returns the simulated engine's true events in the three planned
// positions.
func (s simulated) events(t testing.TB) []setting.EventSet {
	t.Helper()
	var out []setting.EventSet
	for _, p := range []struct {
		r setting.Reverser
		d setting.Direction
	}{{1, setting.Forward}, {0.4, setting.Forward}, {-1, setting.Backward}} {
		d := s.dev
		d.DeadCentreDeg = 0
		m, err := Model{Spec: s.spec, Dev: d}.Motion(p.r)
		if err != nil {
			t.Fatal(err)
		}
		set, err := setting.Events(s.spec.Engine, s.spec.Valve, m, p.d)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, set)
	}
	return out
}

// injected are the known as-built errors of each gear's simulated engine.
func injected(kind string) Deviations {
	d := Deviations{GaugeZeroMM: 5, ValveOffsetMM: 0.23}
	switch kind {
	case setting.KindStephenson:
		d.EccentricRodMM = [2]float64{0.6, -0.8}
		d.EccentricDeg = [2]float64{0.8, -0.5}
	case setting.KindWalschaerts:
		d.EccentricRodMM[0] = 0.7
		d.ReturnCrankDeg = -1.2
		d.RadiusRodMM = 0.9
	default:
		d.EccentricDeg[0] = -1.5
		d.EccentricRodMM[0] = 0.4
	}
	return d
}
