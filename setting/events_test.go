package setting

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

func sinDeg(t float64) float64 { return math.Sin(t * math.Pi / 180) }

// wiggly is a gear-like valve curve with harmonics (invented for the tests).
func wiggly(t float64) (float64, error) {
	return 12*sinDeg(t+28) + 0.9*sinDeg(2*t+40) + 0.3*sinDeg(3*t-10) + 0.2, nil
}

// Internal and external admission mirror each other: the same engine with
// the motion mirrored gives identical events.
func TestInternalExternalMirror(t *testing.T) {
	e := Engine{CrankRadius: 38, RodLength: 200, Offset: 15}
	v := Valve{Admission: Internal,
		Front: End{SteamLap: 4, ExhaustLap: 0.3, PortWidth: 3},
		Back:  End{SteamLap: 3.6, ExhaustLap: -0.2, PortWidth: 3.2}}
	mirrored := func(t float64) (float64, error) {
		x, err := wiggly(t)
		return -x, err
	}
	for _, dir := range []Direction{Forward, Backward} {
		in, err := Events(e, v, wiggly, dir)
		if err != nil {
			t.Fatal(err)
		}
		v.Admission = External
		ex, err := Events(e, v, mirrored, dir)
		v.Admission = Internal
		if err != nil {
			t.Fatal(err)
		}
		ex.ValveMin, ex.ValveMax = -ex.ValveMax, -ex.ValveMin
		if !reflect.DeepEqual(in, ex) {
			t.Errorf("%s: internal\n%+v\nexternal mirrored\n%+v", dir, in, ex)
		}
	}
}

// A symmetric engine (centred cylinder, equal laps, a valve curve with
// x(t + 180) = -x(t)) gives the same events at both ends but for the
// angularity of the connecting rod: equal crank angles from each dead
// centre, and with a finite rod the front stroke cuts off later (common
// practice, no source; the size of the effect is checked against C. A.
// Purinton, "Lap and Lead in Slide Valves", The Live Steamer, 1950, in
// TestPublishedPurintonTravel).
func TestSymmetricEngineDiffersOnlyByAngularity(t *testing.T) {
	motion := textbookMotion(6, 30, External)
	v := slideValve(External, 3, 0, 3)
	for _, k := range []float64{longRod, 6} {
		e := Engine{CrankRadius: 30, RodLength: k * 30}
		for _, dir := range []Direction{Forward, Backward} {
			// running backward the gear's curve is the mirror image
			m := func(t float64) (float64, error) { return motion(float64(dir) * t) }
			s, err := Events(e, v, m, dir)
			if err != nil {
				t.Fatal(err)
			}
			f, b := s.Front, s.Back
			name := fmt.Sprintf("rod %g cranks, %s", k, dir)
			near(t, name+" lead", b.Lead, f.Lead, 1e-12)
			near(t, name+" lead angle", b.LeadAngle, f.LeadAngle, 1e-7)
			for _, p := range [][2]Event{{f.Admission, b.Admission}, {f.CutOff, b.CutOff}, {f.Release, b.Release}, {f.Compression, b.Compression}} {
				near(t, name+" crank angle, back - front", mod360(p[1].CrankDeg-p[0].CrankDeg), 180, 1e-7)
			}
			diff := f.CutOff.StrokePercent - b.CutOff.StrokePercent
			if k == longRod {
				near(t, name+" cut-off difference", diff, 0, 1e-4)
			} else if !(diff > 4) {
				t.Errorf("%s: front cut-off %g %% should be well after the back %g %%", name, f.CutOff.StrokePercent, b.CutOff.StrokePercent)
			}
		}
	}
}

// Running backward with the mirror-image curve gives, on a centred engine,
// the same percentages as running forward.
func TestBackwardMirrorsForward(t *testing.T) {
	e := Engine{CrankRadius: 38, RodLength: 200}
	v := slideValve(Internal, 3.5, 0.2, 3)
	fw, err := Events(e, v, wiggly, Forward)
	if err != nil {
		t.Fatal(err)
	}
	bw, err := Events(e, v, func(t float64) (float64, error) { return wiggly(-t) }, Backward)
	if err != nil {
		t.Fatal(err)
	}
	for _, end := range []CylinderEnd{Front, Back} {
		f, b := fw.End(end), bw.End(end)
		for _, p := range [][3]any{{"admission", f.Admission, b.Admission}, {"cut-off", f.CutOff, b.CutOff}, {"release", f.Release, b.Release}, {"compression", f.Compression, b.Compression}} {
			near(t, fmt.Sprintf("%s %s %%", end, p[0]), p[2].(Event).StrokePercent, p[1].(Event).StrokePercent, 1e-7)
			near(t, fmt.Sprintf("%s %s mirrored angle", end, p[0]), wrap180(p[1].(Event).CrankDeg+p[2].(Event).CrankDeg), 0, 1e-7)
		}
		near(t, end.String()+" lead angle", b.LeadAngle, f.LeadAngle, 1e-7)
		near(t, end.String()+" lead", b.Lead, f.Lead, 1e-12)
	}
}

// A long-rod single eccentric gives lead = r sin(delta) - lap (the textbook
// relation of published-checks C1), at every advance.
func TestSingleEccentricLead(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: longRod * 30}
	for _, delta := range []float64{-10, 0, 12, 30, 45} {
		r, lap := 7.0, 2.0
		s, err := Events(e, slideValve(External, lap, 0, 3), textbookMotion(r, delta, External), Forward)
		if err != nil {
			t.Fatal(err)
		}
		near(t, fmt.Sprintf("lead at advance %g", delta), s.Front.Lead, r*sinDeg(delta)-lap, 1e-12)
		near(t, fmt.Sprintf("travel at advance %g", delta), s.ValveTravel(), 2*r, 1e-9)
		// admission where r sin(t + delta) = lap
		near(t, fmt.Sprintf("lead angle at advance %g", delta), s.Front.LeadAngle, delta-math.Asin(lap/r)*180/math.Pi, 1e-7)
	}
}

// Tangency: a curve that just reaches the lap touches and leaves (never
// opens); one that passes it by a hair opens briefly, and both crossings are
// found though the peak lies between grid points.
func TestTangencyAndNarrowOpening(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: longRod * 30}
	const r, peak = 10.0, 91.3 // the peak is between the 3-degree grid points
	motion := func(t float64) (float64, error) { return r * sinDeg(t-peak+90), nil }
	touch, err := Events(e, slideValve(Internal, r, 0, 3), motion, Forward)
	if err != nil {
		t.Fatal(err)
	}
	if !touch.Front.NeverOpens || touch.Front.MaxOpening != 0 || touch.Front.SteamOpenings != 0 {
		t.Errorf("lap = amplitude: want never opens, got %+v", touch.Front)
	}
	for _, eps := range []float64{1e-3, 1e-6} {
		s, err := Events(e, slideValve(Internal, r-eps, 0, 3), motion, Forward)
		if err != nil {
			t.Fatal(err)
		}
		half := math.Acos(1-eps/r) * 180 / math.Pi
		f := s.Front
		if f.NeverOpens || f.SteamOpenings != 1 {
			t.Fatalf("lap short of the amplitude by %g: want one opening, got %+v", eps, f)
		}
		near(t, fmt.Sprintf("admission, eps %g", eps), f.Admission.CrankDeg, peak-half, 1e-6)
		near(t, fmt.Sprintf("cut-off, eps %g", eps), f.CutOff.CrankDeg, peak+half, 1e-6)
		near(t, fmt.Sprintf("max opening, eps %g", eps), f.MaxOpening, eps, 1e-9)
	}
}

// Events against a brute-force scan at 0.001 degree of a curve with a
// strong high harmonic, with the laps put close to its local peaks so that
// several short openings appear.
func TestEventsAgainstBruteForce(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: 150, Offset: 10}
	motion := func(t float64) (float64, error) {
		return 8*sinDeg(t+20) + 1.5*sinDeg(9*t) + 0.7*sinDeg(23*t+5), nil
	}
	for _, lap := range []float64{5.5, 7, 8.6, 9.1, 9.5} {
		v := slideValve(Internal, lap, lap-1, 30)
		a, err := analyse(e.prepare(), v, motion)
		if err != nil {
			t.Fatal(err)
		}
		for _, end := range []CylinderEnd{Front, Back} {
			want := bruteCrossings(func(t float64) float64 {
				x, _ := motion(t)
				return v.SteamEdge(end, x)
			})
			got := a.steam[end].crossings
			if len(got) != len(want) {
				t.Errorf("lap %g %s: %d crossings, brute force %d: %v / %v", lap, end, len(got), len(want), got, want)
				continue
			}
			for i := range got {
				near(t, fmt.Sprintf("lap %g %s crossing %d", lap, end, i), got[i].theta, want[i], 1e-6)
			}
		}
	}
}

// A curve with kinks (a clipped, rectified wave) has a spectrum that never
// settles, so it is searched directly; the crossings still agree with a
// brute-force scan.
func TestKinkedCurveSearchedDirectly(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: 150}
	motion := func(t float64) (float64, error) {
		x := 8*sinDeg(t+20) + 2*math.Abs(sinDeg(1.5*t))
		return math.Max(-6.5, math.Min(7.2, x)), nil
	}
	samples := make([]float64, spectralMax)
	for i := range samples {
		samples[i], _ = motion(float64(i) * 360 / spectralMax)
	}
	if _, ok := fitSpectrum(samples); ok {
		t.Fatal("the kinked curve's spectrum counts as resolved; the test no longer reaches the direct search")
	}
	for _, lap := range []float64{3, 5.5, 7.1} {
		v := slideValve(Internal, lap, 6.4, 30)
		a, err := analyse(e.prepare(), v, motion)
		if err != nil {
			t.Fatal(err)
		}
		for _, end := range []CylinderEnd{Front, Back} {
			for _, edge := range []struct {
				name string
				got  []crossing
				g    func(CylinderEnd, float64) float64
			}{{"steam", a.steam[end].crossings, v.SteamEdge}, {"exhaust", a.exhaust[end].crossings, v.ExhaustEdge}} {
				want := bruteCrossings(func(t float64) float64 {
					x, _ := motion(t)
					return edge.g(end, x)
				})
				if len(edge.got) != len(want) {
					t.Errorf("lap %g %s %s: %d crossings, brute force %d", lap, end, edge.name, len(edge.got), len(want))
					continue
				}
				for i := range want {
					near(t, fmt.Sprintf("lap %g %s %s crossing %d", lap, end, edge.name, i), edge.got[i].theta, want[i], 1e-6)
				}
			}
		}
	}
}

// bruteCrossings scans g at 0.001 degree and bisects each sign change.
func bruteCrossings(g func(float64) float64) []float64 {
	var out []float64
	const step = 0.001
	prev := g(0) > 0
	for i := 1; i <= 360000; i++ {
		t := float64(i) * step
		if now := g(t) > 0; now != prev {
			lo, hi := t-step, t
			for range 60 {
				m := (lo + hi) / 2
				if (g(m) > 0) == prev {
					lo = m
				} else {
					hi = m
				}
			}
			out = append(out, (lo+hi)/2)
			prev = now
		}
	}
	return out
}

// A port lapped beyond the travel never opens; negative lap beyond the
// travel never closes; the same for the exhaust edge.
func TestNeverOpensNeverCloses(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: 180}
	v := Valve{Admission: External,
		Front: End{SteamLap: 8, ExhaustLap: -8, PortWidth: 3},
		Back:  End{SteamLap: -8, ExhaustLap: 8, PortWidth: 3}}
	s, err := Events(e, v, textbookMotion(6, 25, External), Forward)
	if err != nil {
		t.Fatal(err)
	}
	f, b := s.Front, s.Back
	if !f.NeverOpens || f.NeverCloses || f.MaxOpening != 0 || f.Lead >= 0 {
		t.Errorf("front steam: want never opens, got %+v", f)
	}
	if !f.ExhaustNeverCloses || f.ExhaustNeverOpens || f.MaxExhaustOpening != 3 {
		t.Errorf("front exhaust: want never closes, got %+v", f)
	}
	if !b.NeverCloses || b.NeverOpens || b.MaxOpening != 3 || b.LeadAngle != 0 {
		t.Errorf("back steam: want never closes, got %+v", b)
	}
	if !b.ExhaustNeverOpens || b.MaxExhaustOpening != 0 {
		t.Errorf("back exhaust: want never opens, got %+v", b)
	}
	if out := (EventTable{Rows: []TableRow{{Notch{"odd", 1}, s}}}).String(); !strings.Contains(out, "never opens") || !strings.Contains(out, "never closes") {
		t.Errorf("table does not say never opens / never closes:\n%s", out)
	}
}

// With two separate steam openings in a turn, the events are those of the
// opening that holds the dead centre.
func TestTwoOpeningsChooseTheDeadCentre(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: 180}
	// peaks at 0 and 180 for the front edge (internal: x - lap)
	motion := func(t float64) (float64, error) { return 5 * math.Cos(2*t*math.Pi/180), nil }
	s, err := Events(e, slideValve(Internal, 4, 10, 3), motion, Forward)
	if err != nil {
		t.Fatal(err)
	}
	f := s.Front
	if f.SteamOpenings != 2 {
		t.Fatalf("want 2 openings, got %+v", f)
	}
	half := math.Acos(0.8) * 180 / math.Pi / 2
	near(t, "admission", f.Admission.CrankDeg, 360-half, 1e-7)
	near(t, "cut-off", f.CutOff.CrankDeg, half, 1e-7)
}

func TestEventsErrors(t *testing.T) {
	e := Engine{CrankRadius: 30, RodLength: 180}
	v := slideValve(External, 3, 0, 3)
	stuck := &Error{"eccentric rod", "The eccentric rod cannot reach at crank angle 200 deg."}
	cases := []struct {
		name   string
		e      Engine
		v      Valve
		m      Motion
		dir    Direction
		field  string
		target error
	}{
		{"motion error passes through", e, v, func(t float64) (float64, error) {
			if t > 200 {
				return 0, stuck
			}
			return 0, nil
		}, Forward, "eccentric rod", stuck},
		{"NaN", e, v, func(t float64) (float64, error) { return math.NaN(), nil }, Forward, "motion", nil},
		{"Inf mid-turn", e, v, func(t float64) (float64, error) {
			if t > 100 {
				return math.Inf(1), nil
			}
			return 1, nil
		}, Forward, "motion", nil},
		{"nil motion", e, v, nil, Forward, "motion", nil},
		{"bad engine", Engine{CrankRadius: 57, RodLength: 40}, v, wiggly, Forward, "engine.rod_length", nil},
		{"bad valve", e, slideValve(External, 3, 0, 0), wiggly, Forward, "valve.front.port_width", nil},
		{"bad direction", e, v, wiggly, 2, "direction", nil},
	}
	for _, c := range cases {
		_, err := Events(c.e, c.v, c.m, c.dir)
		var got *Error
		if !errors.As(err, &got) || got.Field != c.field {
			t.Errorf("%s: got %v, want field %s", c.name, err, c.field)
		}
		if c.target != nil && !errors.Is(err, c.target) {
			t.Errorf("%s: the gear's error was not passed through: %v", c.name, err)
		}
	}
}

// FuzzEvents: any finite harmonic motion and laps give events without a
// panic, NaN or Inf, and with angles and percentages in range.
func FuzzEvents(f *testing.F) {
	f.Add(10.0, 25.0, 1.0, 3.0, 0.5, 4.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0)
	f.Add(5.0, 0.0, 5.0, 90.0, 5.0, 5.0, -5.0, 20.0, 1.0, 0.0)
	f.Add(1e6, 3.0, 1e5, 7.0, 33.0, 1e5, 2.0, -30.0, 100.0, 0.0)
	f.Add(8.0, 20.0, 0.0, 0.0, 0.0, 5.0, 1.0, 0.0, 0.0, 3.0)
	f.Fuzz(func(t *testing.T, a1, p1, a2, p2, a7, lap, exLap, offset, bias, kink float64) {
		for _, x := range []float64{a1, p1, a2, p2, a7, lap, exLap, offset, bias, kink} {
			if !finiteNum(x) || math.Abs(x) > 1e9 {
				return
			}
		}
		e := Engine{CrankRadius: 30, RodLength: 180, Offset: math.Mod(offset, 140)}
		v := Valve{Admission: Internal, Front: End{SteamLap: lap, ExhaustLap: exLap, PortWidth: 3}, Back: End{SteamLap: exLap, ExhaustLap: lap, PortWidth: 3}}
		m := func(t float64) (float64, error) {
			// kink: a rectified term whose spectrum never settles, so that the
			// direct search is fuzzed too
			return a1*sinDeg(t+p1) + a2*sinDeg(2*t+p2) + a7*sinDeg(7*t) + bias + kink*math.Abs(sinDeg(t)), nil
		}
		for _, dir := range []Direction{Forward, Backward} {
			s, err := Events(e, v, m, dir)
			if err != nil {
				t.Fatalf("unexpected error %v", err)
			}
			checkFinite(t, reflect.ValueOf(s), "EventSet")
			for _, end := range []CylinderEnd{Front, Back} {
				ee := s.End(end)
				for _, ev := range []Event{ee.Admission, ee.CutOff, ee.Release, ee.Compression} {
					if ev.CrankDeg < 0 || ev.CrankDeg >= 360 || ev.StrokePercent < -1e-9 || ev.StrokePercent > 100+1e-9 {
						t.Fatalf("event out of range: %+v", ev)
					}
				}
			}
		}
	})
}

// checkFinite fails on any NaN or Inf float in v.
func checkFinite(t *testing.T, v reflect.Value, path string) {
	t.Helper()
	switch v.Kind() {
	case reflect.Float64:
		if !finiteNum(v.Float()) {
			t.Fatalf("%s is %g", path, v.Float())
		}
	case reflect.Struct:
		for i := range v.NumField() {
			checkFinite(t, v.Field(i), path+"."+v.Type().Field(i).Name)
		}
	}
}

// The search through the interpolant and the direct search on the curve
// agree on real gear curves: the invented test engine, and the shared demo
// engines when present.
func TestSpectralAgreesWithDirectSearch(t *testing.T) {
	specs := []EngineSpec{testSingle(t)}
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "engines", "*.json"))
	for _, f := range files {
		r, err := os.Open(f)
		if err != nil {
			t.Fatal(err)
		}
		spec, err := DecodeEngineSpec(r)
		r.Close()
		if err != nil {
			t.Logf("%s does not load, so it is left out here: %v", f, err)
			continue
		}
		specs = append(specs, spec)
	}
	for _, spec := range specs {
		g, err := spec.Gear.Gear()
		if err != nil {
			t.Fatal(err)
		}
		c, _ := spec.Engine.Prepare()
		for _, n := range ReverserPositions(9) {
			m := func(th float64) (float64, error) { return g.Valve(spec.Engine, th, n.Reverser) }
			fast, err := analyseBy(c, spec.Valve, m, true)
			if err != nil {
				t.Fatal(err)
			}
			slow, err := analyseBy(c, spec.Valve, m, false)
			if err != nil {
				t.Fatal(err)
			}
			for _, dir := range []Direction{Forward, Backward} {
				a, _ := fast.events(dir)
				b, _ := slow.events(dir)
				name := fmt.Sprintf("%s %s %s", spec.Name, n.Name, dir)
				near(t, name+" valve min", a.ValveMin, b.ValveMin, 1e-9)
				near(t, name+" valve max", a.ValveMax, b.ValveMax, 1e-9)
				for _, end := range []CylinderEnd{Front, Back} {
					x, y := a.End(end), b.End(end)
					if x.NeverOpens != y.NeverOpens || x.SteamOpenings != y.SteamOpenings || x.ExhaustOpenings != y.ExhaustOpenings {
						t.Errorf("%s %s: openings differ: %+v / %+v", name, end, x, y)
						continue
					}
					for i, p := range [][2]Event{{x.Admission, y.Admission}, {x.CutOff, y.CutOff}, {x.Release, y.Release}, {x.Compression, y.Compression}} {
						near(t, fmt.Sprintf("%s %s event %d", name, end, i), wrap180(p[0].CrankDeg-p[1].CrankDeg), 0, 1e-7)
					}
					near(t, name+" lead", x.Lead, y.Lead, 0)
					near(t, name+" max opening", x.MaxOpening, y.MaxOpening, 1e-9)
				}
			}
		}
	}
}
