package beat

import (
	"math"
	"math/rand/v2"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// textbook returns the events of an equal-ended piston valve (inside
// admission: the valve moving forward opens the front port) driven by the
// textbook motion r sin(theta + delta) (infinite eccentric rod), on an
// engine with a connecting rod of rodCranks cranks.
func textbook(t *testing.T, rodCranks float64, dir setting.Direction) setting.EventSet {
	t.Helper()
	const r, lap, lead = 12.0, 4.0, 0.5
	delta := math.Asin((lap+lead)/r) * 180 / math.Pi
	if dir == setting.Backward {
		delta = 180 - delta
	}
	e := setting.Engine{CrankRadius: 25, RodLength: rodCranks * 25}
	end := setting.End{SteamLap: lap, ExhaustLap: 0.5, PortWidth: 5}
	v := setting.Valve{Admission: setting.Internal, Front: end, Back: end}
	set, err := setting.Events(e, v, func(th float64) (float64, error) {
		return r * math.Sin((th+delta)*math.Pi/180), nil
	}, dir)
	if err != nil {
		t.Fatal(err)
	}
	return set
}

// The exhausts of an engine with equal events and true quartering fall
// evenly: a two-cylinder engine with cranks at right angles gives four
// beats 90 degrees apart a turn, a three-cylinder one with cranks at 120
// degrees six beats 60 degrees apart. Elementary kinematics, stated in the
// trade's books, e.g. Angus Sinclair, "Locomotive Engine Running and
// Management" (the four exhausts of a two-cylinder engine; from memory,
// page not checked). Exact with an infinitely long connecting rod; with a
// real rod the front and back releases are not quite half a turn apart.
func TestEvenBeatPublished(t *testing.T) {
	for _, c := range []struct {
		name   string
		cranks []float64
		gap    float64
	}{{"two cylinders at 90", []float64{0, -90}, 90}, {"three cylinders at 120", []float64{0, 120, 240}, 60}} {
		for _, dir := range []setting.Direction{setting.Forward, setting.Backward} {
			set := textbook(t, 1e6, dir)
			var sides []Side
			for i, a := range c.cranks {
				sides = append(sides, Side{Name: []string{"right", "left", "middle"}[i], CrankDeg: a, Set: set})
			}
			circ, err := NewCircle(sides)
			if err != nil {
				t.Fatal(err)
			}
			if len(circ.Gaps) != 2*len(c.cranks) {
				t.Fatalf("%s: %d beats, want %d", c.name, len(circ.Gaps), 2*len(c.cranks))
			}
			for i, g := range circ.Gaps {
				if math.Abs(g-c.gap) > 1e-6 {
					t.Errorf("%s %s: gap %d after %s is %.6f deg, want %g", c.name, dir, i, circ.Exhausts[i].Label(), g, c.gap)
				}
			}
			if ev := circ.Evenness(); math.Abs(ev-1) > 1e-6 {
				t.Errorf("%s %s: evenness %g, want 1", c.name, dir, ev)
			}
		}
	}
	// A real rod (5 cranks) limps a little even with equal events; a
	// crank 3 degrees out of quarter limps more.
	set := textbook(t, 5, setting.Forward)
	circ, _ := NewCircle([]Side{{Name: "right", Set: set}, {Name: "left", CrankDeg: -90, Set: set}})
	rod := circ.Evenness()
	circ, _ = NewCircle([]Side{{Name: "right", Set: set}, {Name: "left", CrankDeg: -93, Set: set}})
	if !(rod > 1 && circ.Evenness() > rod) {
		t.Errorf("evenness with a 5-crank rod %g, with the left crank 3 deg out %g: want 1 < first < second", rod, circ.Evenness())
	}
	// One end releasing 4 degrees late is the beat Late names, by about
	// three quarters of that (the even beat laid on all four moves by a
	// quarter).
	late := set
	late.Back.Release.CrankDeg += 4
	circ, _ = NewCircle([]Side{{Name: "right", Set: set}, {Name: "left", CrankDeg: -90, Set: late}})
	i, by := circ.Late()
	if circ.Exhausts[i].Label() != "left back" || math.Abs(by-3) > 0.5 {
		t.Errorf("late beat %s by %.2f deg, want left back by about 3", circ.Exhausts[i].Label(), by)
	}
}

// The mean effective pressure of the simple diagram with no clearance and
// no compression is p1 (1 + ln R) / R - pb for hyperbolic expansion at the
// ratio R (the inverse of the cut-off), the textbook formula: W. J. M.
// Rankine, "A Manual of the Steam Engine and Other Prime Movers", 1859
// (from memory, page not checked).
func TestMeanPressureHyperbolic(t *testing.T) {
	st := Steam{BoilerBar: 6, DropShare: 0, BackBar: 0, ClearanceShare: 1e-9}
	p1, pb := 6+atmosphereBar, atmosphereBar
	for _, cut := range []float64{0.25, 0.5, 0.75} {
		ev := setting.EndEvents{CutOff: setting.Event{StrokePercent: 100 * cut}, Release: setting.Event{StrokePercent: 100}, Compression: setting.Event{StrokePercent: 0}}
		got, err := st.MeanPressure(ev)
		if err != nil {
			t.Fatal(err)
		}
		R := 1 / cut
		want := p1*(1+math.Log(R))/R - pb
		if math.Abs(got-want) > 1e-6 {
			t.Errorf("cut-off %g: mean pressure %.6f bar, want %.6f", cut, got, want)
		}
	}
	// Compression and an early release take work away; equal events do
	// equal work.
	set := textbook(t, 5, setting.Forward)
	ws, err := DefaultSteam.Works([]Side{{Name: "right", Set: set}})
	if err != nil {
		t.Fatal(err)
	}
	if !(ws[0].Bar > 0 && ws[1].Bar > 0) || math.Abs(ws[0].Share+ws[1].Share-200) > 1e-9 {
		t.Errorf("works %+v", ws)
	}
	if _, err := (Steam{BoilerBar: -1, ClearanceShare: 0.1}).MeanPressure(set.Front); err == nil {
		t.Error("a negative boiler pressure was taken")
	}
}

// quarterTrials simulates n engines of two sides (wheels 120 mm on the
// tread) with the left crank outBy degrees behind its quarter, every mark
// (the datums too) off by noise mm round the tyre (one standard
// deviation), and returns how often the error found lay within its stated
// uncertainty (all trials, and the first 100), and how often it was
// called out of quarter.
func quarterTrials(t *testing.T, n int, outBy, noise float64) (within, within100, told int) {
	t.Helper()
	const wheel = 120.0
	r := rand.New(rand.NewPCG(1, 2))
	circ := math.Pi * wheel
	for trial := 0; trial < n; trial++ {
		s := &session.Session{
			Engine:    setting.DemoStephenson(),
			Measuring: session.Measuring{WheelDiameterMM: wheel, GaugeResolutionMM: 0.01, MarkError: session.Mark{Scale: session.TyreMM, Value: noise}, DatumsMatched: true},
		}
		crank, _ := s.Engine.Engine.Prepare()
		// The right crank's front dead centre somewhere on its tyre; the
		// left, designed 90 degrees behind, is outBy further.
		fdc := map[string]float64{"right": r.Float64() * 360}
		fdc["left"] = fdc["right"] + 90 + outBy
		for _, name := range []string{"right", "left"} {
			datum := r.NormFloat64() * noise // where this wheel's datum really is
			c := session.Cylinder{Name: name}
			for _, end := range []session.End{session.Front, session.Back} {
				at := fdc[name]
				if end == session.Back {
					at += crank.BackDeadCentre()
				}
				mm := session.DegToTyre(at, wheel) - datum
				half := 15 + r.Float64()*15 // the marks 15 to 30 mm either side
				first := math.Mod(mm-half+r.NormFloat64()*noise+2*circ, circ)
				second := math.Mod(mm+half+r.NormFloat64()*noise+2*circ, circ)
				c.DeadCentres = append(c.DeadCentres, session.DeadCentre{End: end, Direction: session.Forward, Scale: session.TyreMM, First: first, Second: second})
			}
			s.Cylinders = append(s.Cylinders, c)
		}
		qs, err := Quarterings(s)
		if err != nil || len(qs) != 1 {
			t.Fatalf("trial %d: %v %v", trial, qs, err)
		}
		q := qs[0]
		if math.Abs(q.Error-(-outBy)) <= q.Uncertainty() {
			within++
			if trial < 100 {
				within100++
			}
		}
		if q.Told {
			told++
		}
	}
	return within, within100, told
}

// Quartering from the dead-centre marks of a 5 in gauge engine with the
// left crank 1.5 degrees out of quarter and 0.5 mm mark noise: the error
// found lies within its stated uncertainty in at least 95 of 100 trials
// (the first 100 of 2000; all 2000 are counted too, and a stated +/- that
// held the truth in more than 99.5 % of them would be needlessly wide).
// A crank 4 degrees out is called out of quarter nearly always; a true
// one almost never.
func TestQuarteringFromMarks(t *testing.T) {
	const n = 2000
	within, within100, told := quarterTrials(t, n, 1.5, 0.5)
	t.Logf("1.5 deg out: the error within its stated +/- in %d of the first 100 trials, %d of %d; called out of quarter in %d", within100, within, n, told)
	if within100 < 95 || within > n*995/1000 {
		t.Errorf("the stated uncertainty covered the true error in %d of 100 trials (want at least 95) and %d of %d (want at most 99.5 %%)", within100, within, n)
	}
	_, _, told4 := quarterTrials(t, n, 4, 0.5)
	_, _, told0 := quarterTrials(t, n, 0, 0.5)
	t.Logf("called out of quarter: 4 deg out %d of %d, true %d of %d", told4, n, told0, n)
	if told4 < n*95/100 || told0 > n/100 {
		t.Errorf("called out of quarter: 4 deg out in %d of %d (want 95 %%), true in %d (want under 1 %%)", told4, n, told0)
	}
}

// Without the datums matched, the marks of two wheels are counted from
// unrelated places: no quartering is claimed from them.
func TestNoQuarteringWithoutMatchedDatums(t *testing.T) {
	s := &session.Session{Engine: setting.DemoStephenson(), Measuring: session.Measuring{WheelDiameterMM: 120, MarkError: session.Mark{Scale: session.TyreMM, Value: 0.5}}}
	for _, name := range []string{"right", "left"} {
		s.Cylinders = append(s.Cylinders, session.Cylinder{Name: name, DeadCentres: []session.DeadCentre{{End: session.Front, Direction: session.Forward, Scale: session.TyreMM, First: 10, Second: 40}}})
	}
	if qs, err := Quarterings(s); err != nil || len(qs) != 0 {
		t.Errorf("got %v, %v; want nothing without matched datums", qs, err)
	}
	s.Measuring.DatumsMatched = true
	if qs, err := Quarterings(s); err != nil || len(qs) != 1 {
		t.Errorf("got %v, %v; want one quartering with matched datums", qs, err)
	}
}

// The crank that leads is named from the engine's crank angles, whichever
// cylinder the list gives first and however the angle is written.
func TestLeadingCranks(t *testing.T) {
	for _, c := range []struct {
		cyls []setting.Cylinder
		want string
	}{
		{[]setting.Cylinder{{Name: "right"}, {Name: "left", CrankAngle: -90}}, "Running forward, the right crank leads the left by 90 degrees."},
		{[]setting.Cylinder{{Name: "right"}, {Name: "left", CrankAngle: 270}}, "Running forward, the right crank leads the left by 90 degrees."},
		{[]setting.Cylinder{{Name: "left", CrankAngle: 90}, {Name: "right"}}, "Running forward, the left crank leads the right by 90 degrees."},
		{[]setting.Cylinder{{Name: "right"}, {Name: "middle", CrankAngle: 120}, {Name: "left", CrankAngle: 240}}, "Running forward, the middle crank leads the right by 120 degrees, the right the left by 120 degrees."},
		{[]setting.Cylinder{{Name: "right"}, {Name: "left", CrankAngle: 180}}, "The right and left cranks are 180 degrees apart: neither leads."},
		{[]setting.Cylinder{{Name: "only"}}, ""},
	} {
		if got := LeadingCranks(c.cyls); got != c.want {
			t.Errorf("%+v: %q, want %q", c.cyls, got, c.want)
		}
	}
}
