package session

import (
	"math"
	"strings"
	"testing"

	"evenbeat/setting"
)

// Plain geometry: a wheel of diameter D turns 360 degrees for pi x D of
// tyre, so 1 mm round a 115 mm wheel is 360 / (pi x 115) = 0.99645 degrees.
func TestTyreToDeg(t *testing.T) {
	cases := []struct {
		mm, dia, deg float64
	}{
		{1, 115, 0.99645},
		{math.Pi * 115, 115, 360},
		{math.Pi * 115 / 4, 115, 90},
		{10, 1000, 1.14592},
		{-1, 115, -0.99645},
	}
	for _, c := range cases {
		if got := TyreToDeg(c.mm, c.dia); math.Abs(got-c.deg) > 1e-5 {
			t.Errorf("TyreToDeg(%v, %v) = %.6f, want %.5f", c.mm, c.dia, got, c.deg)
		}
		if back := DegToTyre(TyreToDeg(c.mm, c.dia), c.dia); math.Abs(back-c.mm) > 1e-9 {
			t.Errorf("DegToTyre(TyreToDeg(%v)) = %v", c.mm, back)
		}
	}
}

func TestMidway(t *testing.T) {
	c115 := math.Pi * 115 // 361.283 mm round a 115 mm wheel
	cases := []struct {
		name                 string
		first, second, c     float64
		dir                  Direction
		mid, span, tolerance float64
	}{
		{"plain", 10, 50, 360, Forward, 30, 40, 1e-12},
		{"plain backward", 50, 10, 360, Backward, 30, 40, 1e-12},
		{"across the datum", 350, 10, 360, Forward, 0, 20, 1e-12},
		{"across the datum backward", 10, 350, 360, Backward, 0, 20, 1e-12},
		{"back dead centre", 170, 190, 360, Forward, 180, 20, 1e-12},
		{"marks past a full turn", 710, 730, 360, Forward, 0, 20, 1e-9},
		{"negative marks", -10, 10, 360, Forward, 0, 20, 1e-12},
		{"tyre mm across the datum", 350.1, 10.3, c115, Forward, (350.1 + 10.3 + c115) / 2, 10.3 + c115 - 350.1, 1e-9},
		{"same mark", 42, 42, 360, Forward, 42, 0, 0},
		// Taken the wrong way (second mark behind the first, turning
		// forward): the arc is the long way round, nearly a full turn.
		{"wrong direction", 50, 10, 360, Forward, 210, 320, 1e-12},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			mid := Midway(c.first, c.second, c.c, c.dir)
			if math.Abs(mid-c.mid) > c.tolerance || mid < 0 || mid >= c.c {
				t.Errorf("Midway = %v, want %v", mid, c.mid)
			}
			if span := Span(c.first, c.second, c.c, c.dir); math.Abs(span-c.span) > c.tolerance {
				t.Errorf("Span = %v, want %v", span, c.span)
			}
		})
	}
}

func TestLead(t *testing.T) {
	// Signs from the valve geometry (setting.Admission): external admission
	// opens the front port as the valve moves back.
	cases := []struct {
		adm        setting.Admission
		end        End
		gauge, pm  float64
		lead       float64
		whatItMean string
	}{
		{setting.External, Front, 1.8, 2.0, 0.2, "valve 0.2 behind the front mark: open"},
		{setting.External, Back, 8.25, 8.0, 0.25, "valve 0.25 ahead of the back mark: open"},
		{setting.External, Front, 2.1, 2.0, -0.1, "still lapped"},
		{setting.Internal, Front, 8.2, 8.0, 0.2, "internal: front opens forward"},
		{setting.Internal, Back, 1.7, 2.0, 0.3, "internal: back opens back"},
	}
	for _, c := range cases {
		if got := Lead(c.adm, c.end, c.gauge, c.pm); math.Abs(got-c.lead) > 1e-12 {
			t.Errorf("%s: Lead = %v, want %v", c.whatItMean, got, c.lead)
		}
	}
}

func TestObservations(t *testing.T) {
	s := mustDecode(t, testJSON)
	obs, err := s.Observations(0)
	if err != nil {
		t.Fatal(err)
	}
	byField := map[string]Observation{}
	for _, o := range obs {
		byField[o.Field] = o
	}
	circ := math.Pi * 115
	perMM := 360 / circ
	fdcMM := (350.1+10.3+circ)/2 - circ // front dead centre, mm from the datum
	bdcMM := (160.2 + 200.4) / 2
	markSig := 0.5 * perMM * math.Sqrt(1.5)
	// Tyre marks are put in proportion to the bracketed dead centres: the
	// tyre between them is the turn to the engine's back dead centre (180
	// degrees here), whatever the wheel diameter says.
	scale := 180 / ((bdcMM - fdcMM) * perMM)

	check := func(field string, kind Kind, crank, gauge float64, label string) {
		t.Helper()
		o, ok := byField[field]
		if !ok {
			t.Fatalf("no observation for %s", field)
		}
		if o.Kind != kind {
			t.Errorf("%s: kind %q, want %q", field, o.Kind, kind)
		}
		if o.HasCrank && math.Abs(o.CrankDeg-crank) > 1e-6 {
			t.Errorf("%s: crank %.6f, want %.6f", field, o.CrankDeg, crank)
		}
		if o.HasGauge && math.Abs(o.GaugeMM-gauge) > 1e-12 {
			t.Errorf("%s: gauge %v, want %v", field, o.GaugeMM, gauge)
		}
		if o.Label != label {
			t.Errorf("%s: label %q, want %q", field, o.Label, label)
		}
	}
	r0 := "cylinders[0].rounds[0]"
	check(r0+".dead_centre_readings[0]", AtDeadCentre, 0, 1.8, "front dead centre, full forward")
	// A reading on a dead centre is on it: the engine's back dead centre.
	check(r0+".dead_centre_readings[1]", AtDeadCentre, 180, 8.25, "back dead centre, full forward")
	check(r0+".sweeps[0].readings[1]", InSweep, (30.3-fdcMM)*perMM*scale, 3.9, "sweep at tyre 30.3 mm, running")
	check(r0+".sweeps[0].readings[5]", InSweep, 150-fdcMM*perMM, 7.2, "sweep at 150 deg, running")
	// (Each mark is counted from the nearer dead centre: this one from
	// front dead centre, backward.)
	check(r0+".cut_offs[1]", CutOffKind, 360+(310-fdcMM-circ)*perMM*scale, 8.0, "back cut-off at tyre 310 mm, full forward")
	check("cylinders[0].rounds[1].dead_centre_readings[1]", AtDeadCentre, 180, 8.19, "back dead centre, full forward")
	check("cylinders[0].rounds[1].feeler_openings[0]", FeelerKind, 0, 0, "front port opening at front dead centre, full forward")

	// Port marks and laps become the steam edges.
	var edges [2][2]float64
	for _, o := range obs {
		if o.Kind == PortMarkKind {
			edges[o.Round][endIndex(o.End)] = o.GaugeMM
			if o.HasCrank {
				t.Errorf("%s: a port mark has no crank angle", o.Label)
			}
		}
	}
	// Laps, external admission: the front edge is a lap behind centre.
	want := [2][2]float64{{2, 8}, {4.975 - 3, 4.975 + 3}}
	for i := range want {
		for j := range want[i] {
			if math.Abs(edges[i][j]-want[i][j]) > 1e-12 {
				t.Errorf("steam edges %v, want %v", edges, want)
			}
		}
	}

	// The crosshead cut-off: the crank angle where the piston has gone
	// 44.5 mm of the 60 mm stroke from front dead centre.
	co := byField[r0+".cut_offs[0]"]
	e := s.Engine.Engine
	if got := e.PistonFraction(co.CrankDeg) * e.Stroke(); math.Abs(got-44.5) > 1e-6 {
		t.Errorf("crosshead cut-off at crank %.3f gives %.6f mm, want 44.5", co.CrankDeg, got)
	}
	if co.Label != "front cut-off at crosshead 44.5 mm, full forward" || !co.HasGauge || co.GaugeMM != 2 {
		t.Errorf("crosshead cut-off: %+v", co)
	}

	// Error estimates.
	sw := byField[r0+".sweeps[0].readings[0]"]
	if math.Abs(sw.CrankSigmaDeg-markSig) > 1e-12 {
		t.Errorf("crank sigma %v, want %v", sw.CrankSigmaDeg, markSig)
	}
	if math.Abs(sw.GaugeSigmaMM-0.01/math.Sqrt(12)) > 1e-15 {
		t.Errorf("gauge sigma %v", sw.GaugeSigmaMM)
	}
	if sw.Reverser != 0.5 || sw.Notch != "running" || sw.Direction != Forward {
		t.Errorf("reverser: %+v", sw)
	}
	for _, o := range obs {
		for _, v := range []float64{o.CrankDeg, o.CrankSigmaDeg, o.GaugeMM, o.GaugeSigmaMM, o.OpeningMM} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("%s: NaN or Inf in %+v", o.Field, o)
			}
		}
		if o.HasCrank && (o.CrankDeg < 0 || o.CrankDeg >= 360) {
			t.Errorf("%s: crank %v outside [0, 360)", o.Field, o.CrankDeg)
		}
	}
}

// A gauge mounted so that its reading falls as the valve moves forward:
// the observations carry the negated reading, and the raw one for messages.
func TestObservationsNormaliseGaugeDirection(t *testing.T) {
	s := mustDecode(t, strings.Replace(testJSON, `"gauge_increases_toward": "front"`, `"gauge_increases_toward": "back"`, 1))
	obs, err := s.Observations(0)
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range obs {
		if o.Field == "cylinders[0].rounds[0].dead_centre_readings[0]" {
			if o.GaugeMM != -1.8 || o.RawGaugeMM != 1.8 {
				t.Errorf("got %v (raw %v), want -1.8 (raw 1.8)", o.GaugeMM, o.RawGaugeMM)
			}
		}
		if o.Kind == PortMarkKind && o.Round == 1 && o.End == Front {
			// centre -4.975 normalised; external: front edge a lap behind.
			if math.Abs(o.GaugeMM-(-4.975-3)) > 1e-12 {
				t.Errorf("laps with a reversed gauge: front edge %v, want %v", o.GaugeMM, -4.975-3)
			}
		}
	}
}

// Backward turning: a back-gear cut-off given by the crosshead lies in the
// other half of the turn.
func TestCrossheadBackward(t *testing.T) {
	s := mustDecode(t, testJSON)
	a, err := s.angles(0)
	if err != nil {
		t.Fatal(err)
	}
	e := s.Engine.Engine
	for _, c := range []struct {
		end End
		dir Direction
	}{{Front, Forward}, {Front, Backward}, {Back, Forward}, {Back, Backward}} {
		deg, sigma, err := a.crosshead(c.end, c.dir, 15)
		if err != nil {
			t.Fatal(err)
		}
		frac := e.PistonFraction(deg)
		travel := frac * e.Stroke()
		if c.end == Back {
			travel = (1 - frac) * e.Stroke()
		}
		if math.Abs(travel-15) > 1e-6 {
			t.Errorf("%s %s: crank %.3f gives travel %.6f, want 15", c.end, c.dir, deg, travel)
		}
		inFirstHalf := deg < e.BackDeadCentre()
		if want := (c.end == Front) == (c.dir == Forward); inFirstHalf != want {
			t.Errorf("%s %s: crank %.3f in the wrong half turn", c.end, c.dir, deg)
		}
		if !(sigma > 0 && sigma < 30) {
			t.Errorf("sigma %v", sigma)
		}
	}
}

func TestCylinderEngineOutOfRange(t *testing.T) {
	s := mustDecode(t, testJSON)
	if _, err := s.Observations(5); err == nil {
		t.Error("no error for cylinder 5")
	}
	if _, err := s.Observations(-1); err == nil {
		t.Error("no error for cylinder -1")
	}
}

func TestCrankAngleAndBackDeadCentre(t *testing.T) {
	s := mustDecode(t, testJSON)
	perMM := 360 / (math.Pi * 115)
	fdcMM := (350.1+10.3+math.Pi*115)/2 - math.Pi*115
	bdcMM := (160.2 + 200.4) / 2
	scale := 180 / ((bdcMM - fdcMM) * perMM) // the tyre between the brackets is half a turn
	deg, sigma, err := s.CrankAngle(0, Mark{TyreMM, 100}, Forward)
	if err != nil || math.Abs(deg-(100-fdcMM)*perMM*scale) > 1e-9 || sigma <= 0 {
		t.Errorf("CrankAngle = %v, %v, %v", deg, sigma, err)
	}
	bdc, err := s.BackDeadCentre(0, Forward)
	if want := ((160.2+200.4)/2 - fdcMM) * perMM; err != nil || math.Abs(bdc-want) > 1e-9 {
		t.Errorf("BackDeadCentre = %v, want %v (%v)", bdc, want, err)
	}
	// The right cylinder has no brackets: the geometry's 180 degrees.
	if bdc, err := s.BackDeadCentre(1, Forward); err != nil || math.Abs(bdc-180) > 1e-9 {
		t.Errorf("BackDeadCentre from geometry = %v (%v)", bdc, err)
	}
}

// Turning a change into what the hands do. Ahrons' eccentric rod change of
// 1/16 in (published-checks C5; E. L. Ahrons, Steam Locomotive Construction
// and Maintenance, c. 1921, p. 104) on a 40 TPI fork end (a common model
// thread, common practice) is 2.5 turns: 5 half-turn steps.
func TestThreadAndSheave(t *testing.T) {
	fork := Thread{TPI: 40, FlatsPerTurn: 2}
	if got := fork.Turns(-MMPerInch / 16); math.Abs(got+2.5) > 1e-12 {
		t.Errorf("1/16 in at 40 TPI = %v turns, want -2.5", got)
	}
	if got := fork.Flats(-MMPerInch / 16); got != -5 {
		t.Errorf("1/16 in at 40 TPI = %d half turns, want -5", got)
	}
	nut := Thread{PitchMM: 0.7, FlatsPerTurn: 6}
	if got := nut.Step(); math.Abs(got-0.7/6) > 1e-15 {
		t.Errorf("step %v", got)
	}
	if got := nut.Flats(0.3); got != 3 { // 0.3 / 0.1167 = 2.57 -> 3 flats
		t.Errorf("0.3 mm = %d flats, want 3", got)
	}
	// Plain geometry: an arc of 1 degree on a 30 mm sheave is pi x 30 / 360.
	sheave := Adjustment{Kind: EccentricAngle, SheaveDiameterMM: 30}
	if got := sheave.RimMM(1); math.Abs(got-0.261799) > 1e-6 {
		t.Errorf("1 degree on a 30 mm sheave = %v mm round the rim, want 0.2618", got)
	}
}

// A round without port marks takes the last ones taken, unless the valve
// has been moved on its spindle since.
func TestObservationsCarryPortMarksForward(t *testing.T) {
	s := mustDecode(t, testJSON)
	r := &s.Cylinders[0].Rounds[1]
	r.Laps = nil
	count := func() (n int, label, field string) {
		obs, err := s.Observations(0)
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range obs {
			if o.Round == 1 && o.Kind == PortMarkKind {
				n++
				label, field = o.Label, o.Field
			}
		}
		return n, label, field
	}
	// The spindle was moved before round 2: the old marks no longer hold.
	if n, _, _ := count(); n != 0 {
		t.Errorf("%d port marks carried past a spindle change", n)
	}
	r.AdjustmentsBefore = nil
	n, label, field := count()
	if n != 2 || label != "back port mark (from round 1)" || field != "cylinders[0].rounds[0].port_marks" {
		t.Errorf("carried marks: %d, %q, %q", n, label, field)
	}
}

// A wheel diameter entered a little off (here 1.5 % too small) moves no
// sweep angle: the tyre between the bracketed dead centres is the turn to
// back dead centre, so marks round the tyre are put in proportion to it.
func TestWheelDiameterSlipIsTakenOutByTheBrackets(t *testing.T) {
	s := mustDecode(t, testJSON)
	// A front bracket that does not straddle the datum (one that does
	// depends on the circumference through its numbering).
	for i := range s.Cylinders[0].DeadCentres {
		if dc := &s.Cylinders[0].DeadCentres[i]; dc.End == Front {
			dc.First, dc.Second = 2, 12
		}
	}
	want, err := s.Observations(0)
	if err != nil {
		t.Fatal(err)
	}
	s.Measuring.WheelDiameterMM *= 0.985
	got, err := s.Observations(0)
	if err != nil {
		t.Fatal(err)
	}
	for i := range want {
		if want[i].Kind != InSweep || !strings.Contains(want[i].Label, "tyre") {
			continue
		}
		if d := math.Abs(got[i].CrankDeg - want[i].CrankDeg); d > 1e-6 {
			t.Errorf("%s: crank %.4f with the wheel 1.5 %% small, %.4f with it right", want[i].Label, got[i].CrankDeg, want[i].CrankDeg)
		}
	}
}
