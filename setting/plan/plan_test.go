package plan

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

var gears = []string{setting.KindSingleEccentric, setting.KindStephenson, setting.KindWalschaerts}

// positionsOf returns how many of the three simulated positions a gear
// has (a fixed single eccentric ignores the reverser: full forward only).
func positionsOf(kind string) int {
	if kind == setting.KindSingleEccentric {
		return 1
	}
	return 3
}

// Round trip, priority on leads: readings of a simulated as-built engine
// with known errors, quantised to 0.01 mm; after the plan's ideal amounts
// the true leads agree within 0.02 mm in full forward, the running notch
// and full back, and after its rounded amounts within that and one step
// of the fine adjusters (common practice, no source: the product's goal,
// issues 4 and 11).
func TestRoundTripLeads(t *testing.T) {
	step := 2 * fineThread.Step() // one step of a fine adjuster, on the lead difference
	for _, kind := range gears {
		t.Run(kind, func(t *testing.T) {
			sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
			p, err := Make(sim.session(t, 15, testAdjustments(kind)), Options{Priority: EqualLeads})
			if err != nil {
				t.Fatal(err)
			}
			before := sim.events(t)
			after := sim.after(t, p.Steps).events(t)
			ideal := sim.afterIdeal(t, p.Steps).events(t)
			for i := 0; i < positionsOf(kind); i++ {
				if d := math.Abs(ideal[i].Front.Lead - ideal[i].Back.Lead); d > 0.02 {
					t.Errorf("position %d: leads %.3f and %.3f differ by %.3f mm after the ideal plan (want <= 0.02)", i, ideal[i].Front.Lead, ideal[i].Back.Lead, d)
				}
				d := math.Abs(after[i].Front.Lead - after[i].Back.Lead)
				if d > 0.02+step {
					t.Errorf("position %d: leads %.3f and %.3f differ by %.3f mm after the rounded plan (want <= %.3f)", i, after[i].Front.Lead, after[i].Back.Lead, d, 0.02+step)
				}
				// The prediction of the rounded plan matches the engine.
				if e := math.Abs(p.After[i].Front.LeadMM - after[i].Front.Lead); e > 0.02 {
					t.Errorf("position %d: predicted front lead %.3f, engine gives %.3f", i, p.After[i].Front.LeadMM, after[i].Front.Lead)
				}
				if db := math.Abs(before[i].Front.Lead - before[i].Back.Lead); d > db+1e-9 {
					t.Errorf("position %d: the plan made the leads worse (%.3f -> %.3f)", i, db, d)
				}
			}
		})
	}
}

// bruteCutOff finds by grid search over the spindle position (and the
// eccentric angle when allowed) the smallest worst cut-off difference,
// over the planned positions, any adjustment could reach on the simulated
// engine without leaving a position worse than before by more than 0.5 %
// (no change at all among them).
func bruteCutOff(t *testing.T, sim simulated, adjs []session.Adjustment, n int) float64 {
	t.Helper()
	before := cutDiffs(t, sim, n)
	best := worstCutOff(t, sim, n)
	angles := []float64{0}
	for _, a := range adjs {
		if a.Kind == session.EccentricAngle {
			angles = nil
			for x := a.Min; x <= a.Max+1e-9; x += 0.25 {
				angles = append(angles, x)
			}
		}
	}
	for _, ang := range angles {
		for off := -3.0; off <= 3.0+1e-9; off += 0.01 {
			s := sim
			s.dev.ValveOffsetMM += off
			s.dev.EccentricDeg[0] += ang
			ok := true
			for i, d := range cutDiffs(t, s, n) {
				if math.Abs(d) > math.Abs(before[i])+0.5 {
					ok = false
				}
			}
			if ok {
				best = math.Min(best, worstCutOff(t, s, n))
			}
		}
	}
	return best
}

// worstCutOff returns the largest cut-off difference over the first n
// simulated positions (100 % where a port does not open or never closes).
func worstCutOff(t *testing.T, s simulated, n int) float64 {
	t.Helper()
	w := 0.0
	for _, d := range cutDiffs(t, s, n) {
		w = math.Max(w, math.Abs(d))
	}
	return w
}

// cutDiffs returns the front-minus-back cut-off differences of the first n
// simulated positions (100 % where a port does not open or never closes).
func cutDiffs(t *testing.T, s simulated, n int) []float64 {
	t.Helper()
	var out []float64
	for i := 0; i < n; i++ {
		set := s.eventsAt(t, i)
		if set.Front.NeverOpens || set.Back.NeverOpens || set.Front.NeverCloses || set.Back.NeverCloses {
			out = append(out, 100)
			continue
		}
		out = append(out, set.Front.CutOff.StrokePercent-set.Back.CutOff.StrokePercent)
	}
	return out
}

// eventsAt returns the true events in one of the three simulated
// positions.
func (s simulated) eventsAt(t *testing.T, i int) setting.EventSet {
	t.Helper()
	rs := []setting.Reverser{1, 0.4, -1}
	ds := []setting.Direction{setting.Forward, setting.Forward, setting.Backward}
	d := s.dev
	d.DeadCentreDeg = 0
	m, err := Model{Spec: s.spec, Dev: d}.Motion(rs[i])
	if err != nil {
		t.Fatal(err)
	}
	set, err := setting.Events(s.spec.Engine, s.spec.Valve, m, ds[i])
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// Round trip, priority on cut-offs: the plan's worst cut-off difference
// over the planned positions (the running notch first, but full forward
// and full back not given away for it) is within 0.5 % of stroke of the
// best a brute-force search over the allowed adjustments finds, and no
// position is left worse by more than that (the product's goal, issues 4
// and 11).
func TestRoundTripCutOffs(t *testing.T) {
	for _, kind := range gears {
		t.Run(kind, func(t *testing.T) {
			sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
			adjs := []session.Adjustment{{Kind: session.ValveOnSpindle, Min: -3, Max: 3, Thread: fineThread}}
			n := 3
			if kind == setting.KindSingleEccentric {
				adjs = testAdjustments(kind)
				n = 1
			}
			p, err := Make(sim.session(t, 15, adjs), Options{Priority: EqualCutOffs})
			if err != nil {
				t.Fatal(err)
			}
			best := bruteCutOff(t, sim, adjs, n)
			after := sim.after(t, p.Steps)
			got := worstCutOff(t, after, n)
			if got > best+0.5 {
				t.Errorf("worst cut-off difference %.2f %%; the best reachable is %.2f %%", got, best)
			}
			for i := 0; i < n; i++ {
				b, a := sim.eventsAt(t, i), after.eventsAt(t, i)
				was := math.Abs(b.Front.CutOff.StrokePercent - b.Back.CutOff.StrokePercent)
				now := math.Abs(a.Front.CutOff.StrokePercent - a.Back.CutOff.StrokePercent)
				if now > was+0.5 {
					t.Errorf("position %d: the plan made the cut-offs worse: %.2f %% -> %.2f %%", i, was, now)
				}
			}
		})
	}
}

// With an ordinary hex nut (6 flats) on a 0.5 mm thread the rounding
// leaves up to one flat (0.083 mm of valve, so 0.17 mm between the leads):
// the plan keeps within that, and the prediction says what is left.
func TestRoundTripHexNut(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	adjs := testAdjustments(kind)
	for i := range adjs {
		adjs[i].Thread = session.Thread{PitchMM: 0.5, FlatsPerTurn: 6}
	}
	p, err := Make(sim.session(t, 15, adjs), Options{})
	if err != nil {
		t.Fatal(err)
	}
	after := sim.after(t, p.Steps).events(t)
	for i, set := range after {
		d := math.Abs(set.Front.Lead - set.Back.Lead)
		if d > 2*0.5/6 {
			t.Errorf("position %d: leads differ by %.3f mm, more than the rounding allows", i, d)
		}
		if e := math.Abs(p.After[i].Front.LeadMM - p.After[i].Back.LeadMM - (set.Front.Lead - set.Back.Lead)); e > 0.02 {
			t.Errorf("position %d: predicted lead difference off by %.3f mm", i, e)
		}
	}
	for _, s := range p.Steps {
		if r := math.Abs(s.Amount) / (0.5 / 6); math.Abs(r-math.Round(r)) > 1e-6 {
			t.Errorf("%s: %g mm is not a whole number of flats", s.Part, s.Amount)
		}
	}
}

// C5. E. L. Ahrons, Steam Locomotive Construction and Maintenance, c. 1921,
// p. 104: fore-gear leads 1/16 in front and 3/16 in back; shortening the
// fore-gear eccentric rod 1/16 in gives 1/8 in at both ends. Direct-drive
// Stephenson, slide valve; the leads measured with feelers, the chest open.
func TestPublishedAhronsRod(t *testing.T) {
	const in = 25.4
	spec := testSpec(t, setting.KindStephenson)
	k := 12 * in / 2 / spec.Engine.CrankRadius // a 24 in stroke
	spec.Name = "Test full-size Stephenson"
	spec.Engine.CrankRadius *= k
	spec.Engine.RodLength *= k
	for _, e := range []*setting.End{&spec.Valve.Front, &spec.Valve.Back} {
		e.SteamLap *= k
		e.PortWidth *= k
	}
	g := *spec.Gear.Stephenson
	for _, x := range []*setting.Eccentric{&g.Forward, &g.Backward} {
		x.Throw *= k
		x.Rod *= k
	}
	g.Link.Radius *= k
	g.Link.PinSpacing *= k
	g.Weighshaft = g.Weighshaft.Scale(k)
	g.ReverseArm *= k
	g.LiftingLink *= k
	g.ArmSwing = -37 // full forward brings the die to the forward rod pin, as direct drive assumes
	g.ValveCentreU *= k
	spec.Gear.Stephenson = &g
	if err := spec.Validate(); err != nil {
		t.Fatal(err)
	}
	ff := session.ReverserPosition{Notch: session.FullForward}
	ses := &session.Session{Name: "Ahrons p. 104", DisplayUnit: session.UnitInch, Engine: spec,
		Measuring: session.Measuring{WheelDiameterMM: 1700, GaugeResolutionMM: 0.0254, GaugeIncreases: session.GaugeFront, MarkError: session.Mark{Scale: session.Deg, Value: 0.1}},
		Adjustments: []session.Adjustment{{Kind: session.EccentricRodLength, Eccentric: session.ForwardEccentric, Min: -0.5 * in, Max: 0.5 * in,
			Thread: session.Thread{TPI: 8, FlatsPerTurn: 6}}},
		Cylinders: []session.Cylinder{{Name: "left", Rounds: []session.Round{{Date: "2026-12-01",
			FeelerOpenings: []session.FeelerOpening{
				{Port: session.Front, Reverser: ff, Direction: session.Forward, DeadCentre: session.Front, OpeningMM: in / 16},
				{Port: session.Back, Reverser: ff, Direction: session.Forward, DeadCentre: session.Back, OpeningMM: 3 * in / 16},
			}}}}}}
	ses = roundTrip(t, ses)
	p, err := Make(ses, Options{Positions: []setting.Notch{{Name: session.FullForward, Reverser: 1}}})
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Steps) != 1 {
		t.Fatalf("want one step, got %+v", p.Steps)
	}
	s := p.Steps[0]
	if s.Kind != session.EccentricRodLength || s.Eccentric != session.ForwardEccentric {
		t.Fatalf("want the forward eccentric rod, got %+v", s)
	}
	if d := s.IdealAmount/in + 1.0/16; math.Abs(d) > 0.001 {
		t.Errorf("ideal change %.4f in, want -0.0625 +/- 0.001 (shorten 1/16 in)", s.IdealAmount/in)
	}
	if d := s.Amount/in + 1.0/16; math.Abs(d) > 0.001 {
		t.Errorf("rounded change %.4f in, want -0.0625 +/- 0.001 (shorten 1/16 in)", s.Amount/in)
	}
	// 1/16 in is 0.0625 in: to the thou, half rounds up (session.FormatLength).
	if !strings.HasPrefix(stepWords(s, session.UnitInch), "Shorten the forward eccentric rod 0.063 in") {
		t.Errorf("words: %s", stepWords(s, session.UnitInch))
	}
	a := p.After[0]
	for _, l := range []float64{a.Front.LeadMM, a.Back.LeadMM} {
		if math.Abs(l/in-0.125) > 0.002 {
			t.Errorf("predicted lead %.4f in, want 1/8 (+/- 0.002)", l/in)
		}
	}
}

// scanFinite fails on any NaN or Inf in a JSON document, and on the words
// "NaN" or "Inf" anywhere in it.
func scanFinite(t testing.TB, data []byte) {
	t.Helper()
	var v any
	if err := json.Unmarshal(data, &v); err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	for _, bad := range []string{"NaN", "Inf"} {
		if bytes.Contains(data, []byte(bad)) {
			t.Errorf("output holds %q", bad)
		}
	}
}

// Bad readings give a clear sentence, never a panic.
func TestBadReadings(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	base := sim.session(t, 0, testAdjustments(kind))

	few := *base
	few.Cylinders = []session.Cylinder{{Name: "left", Rounds: []session.Round{{Date: "2026-12-01", PortMarks: base.Cylinders[0].Rounds[0].PortMarks,
		DeadCentreReadings: base.Cylinders[0].Rounds[0].DeadCentreReadings[:1]}}}}
	same := *base
	r := base.Cylinders[0].Rounds[0]
	r.DeadCentreReadings = append([]session.DeadCentreReading(nil), r.DeadCentreReadings...)
	for i := range r.DeadCentreReadings {
		r.DeadCentreReadings[i].GaugeMM = 4.2
	}
	same.Cylinders = []session.Cylinder{{Name: "left", Rounds: []session.Round{r}}}
	wild := *sim.session(t, 15, testAdjustments(kind))
	w := wild.Cylinders[0].Rounds[0]
	w.Sweeps = append([]session.Sweep(nil), w.Sweeps...)
	for i := range w.Sweeps {
		rs := append([]session.SweepReading(nil), w.Sweeps[i].Readings...)
		for j := range rs {
			rs[j].GaugeMM = float64((j*7919+i*104729)%1000) / 100
		}
		w.Sweeps[i].Readings = rs
	}
	wild.Cylinders = []session.Cylinder{{Name: "left", Rounds: []session.Round{w}}}
	noMarks := *base
	nm := base.Cylinders[0].Rounds[0]
	nm.PortMarks = nil
	noMarks.Cylinders = []session.Cylinder{{Name: "left", Rounds: []session.Round{nm}}}
	for _, c := range []struct {
		name string
		s    *session.Session
		want string
	}{
		{"too few", &few, "Too few readings"},
		{"identical", &same, "are the same"},
		{"contradictory", &wild, "contradict"},
		{"no port marks", &noMarks, "port marks"},
	} {
		_, err := Make(c.s, Options{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want a message with %q", c.name, err, c.want)
		}
	}
}

// One reading knocked 0.31 mm is named for a recheck and left out.
func TestRecheckNamesTheReading(t *testing.T) {
	kind := setting.KindWalschaerts
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 30, testAdjustments(kind))
	s.Cylinders[0].Rounds[0].DeadCentreReadings[1].GaugeMM += 0.31 // back dead centre, full forward
	p, err := Make(s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Recheck) != 1 || p.Recheck[0].Label != "back dead centre, full forward" {
		t.Fatalf("recheck: %+v", p.Recheck)
	}
	msg := p.fit.RecheckMessages(session.UnitMM)[0]
	if !strings.HasPrefix(msg, "Take again the back dead centre, full forward: the gauge read ") || !strings.HasSuffix(msg, "It is left out of the plan until it is taken again.") {
		t.Errorf("message %q", msg)
	}
	// What the others put it at is the reading as it should have been.
	o := s.Cylinders[0].Rounds[0].DeadCentreReadings[1]
	if got := p.Recheck[0].ExpectMM; math.Abs(got-(o.GaugeMM-0.31)) > 0.03 {
		t.Errorf("the other readings put it at %.3f mm; knocked from %.3f", got, o.GaugeMM-0.31)
	}
}

// With readings in full forward only, full back gear is left to the
// drawing: the plan says to take a sweep there.
func TestNextReadingNamesThePosition(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 0, testAdjustments(kind))
	r := &s.Cylinders[0].Rounds[0]
	r.DeadCentreReadings = r.DeadCentreReadings[:2] // full forward only
	p, err := Make(s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(p.NextReading, "sweep") || !strings.Contains(p.NextReading, "full back") && !strings.Contains(p.NextReading, "running") {
		t.Errorf("next reading %q", p.NextReading)
	}
	// With sweeps everywhere nothing more is asked for.
	full, err := Make(sim.session(t, 15, testAdjustments(kind)), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if full.NextReading != "" {
		t.Errorf("full session still asks: %q", full.NextReading)
	}
}

// Balanced lies between the two priorities in the running notch, and a
// target lead is met where an eccentric may be turned.
func TestBalancedAndTarget(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 15, testAdjustments(kind))
	diffs := func(prio Priority) (lead, cut float64) {
		p, err := Make(s, Options{Priority: prio, Weight: 0.5})
		if err != nil {
			t.Fatal(err)
		}
		a := p.After[1]
		return math.Abs(a.Front.LeadMM - a.Back.LeadMM), math.Abs(a.Front.CutOffPercent - a.Back.CutOffPercent)
	}
	lL, cL := diffs(EqualLeads)
	lC, cC := diffs(EqualCutOffs)
	lB, cB := diffs(Balanced)
	if !(lB <= lC+1e-6 && cB <= cL+1e-6) {
		t.Errorf("balanced lead diff %.3f (leads %.3f, cut-offs %.3f), cut diff %.2f (leads %.2f, cut-offs %.2f)", lB, lL, lC, cB, cL, cC)
	}
	ks := setting.KindSingleEccentric
	sim = simulated{spec: testSpec(t, ks), dev: injected(ks)}
	target := 0.3
	p, err := Make(sim.session(t, 15, testAdjustments(ks)), Options{TargetLeadMM: &target})
	if err != nil {
		t.Fatal(err)
	}
	set := sim.after(t, p.Steps).events(t)[0]
	if m := (set.Front.Lead + set.Back.Lead) / 2; math.Abs(m-target) > 0.03 {
		t.Errorf("mean lead %.3f after the plan, target %.3f", m, target)
	}
}

// Limits hold: with the spindle allowed only 0.1 mm either way the plan
// stops there and says so; a profile with nothing to adjust is refused.
func TestLimits(t *testing.T) {
	kind := setting.KindSingleEccentric
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	adjs := []session.Adjustment{{Kind: session.ValveOnSpindle, Min: -0.1, Max: 0.1, Thread: fineThread}}
	p, err := Make(sim.session(t, 30, adjs), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Steps) != 1 || math.Abs(p.Steps[0].Amount) > 0.1+1e-9 || !p.Steps[0].AtLimit {
		t.Fatalf("steps %+v", p.Steps)
	}
	if !strings.Contains(p.Steps[0].Words, "as far as the profile allows") {
		t.Errorf("words %q", p.Steps[0].Words)
	}
	if _, err := Make(sim.session(t, 30, nil), Options{}); err == nil || !strings.Contains(err.Error(), "allows no adjustment") {
		t.Errorf("no adjustments: %v", err)
	}
}

// The readings' errors reach the events: a gauge read to the thou gives
// wider leads than one read to 0.01 mm, and fewer readings wider still.
func TestUncertaintyFollowsTheReadings(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	sigma := func(s *session.Session) float64 {
		p, err := Make(s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		return p.Now[0].Front.LeadSigmaMM
	}
	fine := sigma(sim.session(t, 15, testAdjustments(kind)))
	coarseS := sim.session(t, 15, testAdjustments(kind))
	coarseS.Measuring.GaugeResolutionMM = 0.0254
	coarse := sigma(coarseS)
	few := sigma(sim.session(t, 0, testAdjustments(kind)))
	if !(fine > 0 && coarse > fine && few > fine) {
		t.Errorf("lead sigma: 0.01 mm gauge %.4f, thou gauge %.4f, dead centres only %.4f", fine, coarse, few)
	}
	if fine > 0.02 {
		t.Errorf("with sweeps every 15 degrees the lead should be known to 0.02 mm, got %.4f", fine)
	}
}

// The plan works from the latest round; an earlier one can be chosen.
func TestLatestRound(t *testing.T) {
	kind := setting.KindSingleEccentric
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 30, testAdjustments(kind))
	old := sim
	old.dev.ValveOffsetMM += 0.5 // before the last adjustment
	first := old.session(t, 30, testAdjustments(kind)).Cylinders[0].Rounds[0]
	second := s.Cylinders[0].Rounds[0]
	second.Date = "2026-12-02"
	second.AdjustmentsBefore = []session.Change{{Kind: session.ValveOnSpindle, Amount: -0.5}}
	s.Cylinders[0].Rounds = []session.Round{first, second}
	s = roundTrip(t, s)
	for _, c := range []struct {
		round int
		want  float64
	}{{0, sim.dev.ValveOffsetMM}, {2, sim.dev.ValveOffsetMM}, {1, old.dev.ValveOffsetMM}} {
		f, err := FitSession(s, 0, FitOptions{Round: c.round})
		if err != nil {
			t.Fatal(err)
		}
		// The offset shares with the rod length; their sum is what moves
		// the valve, and is pinned by the readings.
		got := f.Model.Dev.ValveOffsetMM + f.Model.Dev.EccentricRodMM[0]
		want := c.want + sim.dev.EccentricRodMM[0]
		if math.Abs(got-want) > 0.05 {
			t.Errorf("round %d: offset + rod %.3f, want %.3f", c.round, got, want)
		}
	}
}

// A reading mistyped by a millimetre in a round of dead-centre readings
// alone (no sweep to check it against) is named, with what the others put
// it at, and left out: the plan is made from the rest and still brings the
// leads together on the true engine (issue 11: one mistyped reading steered
// the plan).
func TestMistypedDeadCentreReadingIsNamed(t *testing.T) {
	kind := setting.KindStephenson
	sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
	s := sim.session(t, 0, testAdjustments(kind))
	r := &s.Cylinders[0].Rounds[0]
	true4 := r.DeadCentreReadings[4].GaugeMM // front dead centre, full back
	r.DeadCentreReadings[4].GaugeMM += 1.2
	p, err := Make(s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	named := false
	for _, rc := range p.Recheck {
		if rc.Field == "cylinders[0].rounds[0].dead_centre_readings[4]" {
			named = true
			if rc.Pair == "" && math.Abs(rc.ExpectMM-true4) > 0.15 {
				t.Errorf("the others put it at %.3f mm; it was %.3f before the slip", rc.ExpectMM, true4)
			}
		}
	}
	if !named {
		t.Fatalf("the mistyped reading is not named: %+v", p.Recheck)
	}
	msgs := strings.Join(p.fit.RecheckMessages(session.UnitMM), " ")
	if !strings.Contains(msgs, "front dead centre, full back") || !strings.Contains(msgs, "left out of the plan") {
		t.Errorf("messages: %q", msgs)
	}
	// That end of full back is then the model's, not a reading's: the
	// plan holds to a tenth (it would have been 1.2 mm off).
	after := sim.after(t, p.Steps).events(t)
	for i := 0; i < 3; i++ {
		if d := math.Abs(after[i].Front.Lead - after[i].Back.Lead); d > 0.1 {
			t.Errorf("position %d: leads %.3f apart after the plan", i, d)
		}
	}
}

// A mistyped reading in a notch read at its dead centres alone, between
// full gears swept, is named too: the sweeps pin the gear, and the notch's
// own unmodelled part would otherwise bend to the reading and the plan
// report the gear off its drawing there (issue 11).
func TestMistypedNotchReadingBetweenSweepsIsNamed(t *testing.T) {
	for _, kind := range []string{setting.KindStephenson, setting.KindWalschaerts} {
		sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
		s := sim.session(t, 15, testAdjustments(kind))
		r := &s.Cylinders[0].Rounds[0]
		var sw []session.Sweep
		for _, x := range r.Sweeps {
			if x.Reverser.Notch != "running" {
				sw = append(sw, x)
			}
		}
		r.Sweeps = sw
		true2 := r.DeadCentreReadings[2].GaugeMM // front dead centre, running
		r.DeadCentreReadings[2].GaugeMM += 1.2
		p, err := Make(s, Options{})
		if err != nil {
			t.Fatal(err)
		}
		// Named alone, or beside the other end of the notch where the
		// rest cannot tell which of the two is off.
		var named []string
		found := false
		for _, rc := range p.Recheck {
			named = append(named, rc.Field)
			if rc.Field != "cylinders[0].rounds[0].dead_centre_readings[2]" {
				continue
			}
			found = true
			if rc.Pair == "" && math.Abs(rc.ExpectMM-true2) > 0.15 {
				t.Errorf("%s: the others put it at %.3f mm; it was %.3f before the slip", kind, rc.ExpectMM, true2)
			}
		}
		if !found || len(named) > 2 {
			t.Errorf("%s: named %q, want the running notch's front dead centre", kind, named)
		}
		t.Logf("%s: named %q", kind, named)
	}
}

// A deviation beyond what a build would leave is never used silently: the
// plan names it (a radius rod 9 mm longer than drawn on a 5 in gauge
// gear), while ordinary build errors give no such finding (issue 11).
func TestFindingsNameWhatIsOff(t *testing.T) {
	kind := setting.KindWalschaerts
	for _, c := range []struct {
		dev  Deviations
		want string
	}{
		{injected(kind), ""},
		{Deviations{GaugeZeroMM: 5, ValveOffsetMM: 0.1, RadiusRodMM: 9}, "radius rod"},
	} {
		sim := simulated{spec: testSpec(t, kind), dev: c.dev}
		p, err := Make(sim.session(t, 15, testAdjustments(kind)), Options{})
		if err != nil {
			t.Fatal(err)
		}
		var found []string
		for _, n := range p.Notes {
			if strings.Contains(n, "far more than a build would leave") {
				found = append(found, n)
			}
		}
		t.Logf("%+v: %q", c.dev, found)
		switch {
		case c.want == "" && len(found) > 0:
			t.Errorf("ordinary errors give a finding: %q", found)
		case c.want != "" && (len(found) == 0 || !strings.Contains(found[0], c.want)):
			t.Errorf("no finding names the %s: %q (deviations %+v)", c.want, found, p.Deviations)
		}
	}
}
