package render_test

import (
	"math"
	"strings"
	"sync"
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/render/report"
	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// demoSession is the invented Brackenfold session shared by the tests.
func demoSession(t testing.TB) *session.Session {
	t.Helper()
	s, err := session.ReadFile("../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	return s
}

var (
	sessionModelOnce sync.Once
	sessionModelVal  *render.Model
	sessionModelErr  error
)

// sessionModel is the model of the demo session's first cylinder, planned
// for equal leads; built once (a fit and a plan take milliseconds).
func sessionModel(t testing.TB) *render.Model {
	t.Helper()
	sessionModelOnce.Do(func() {
		sessionModelVal, sessionModelErr = render.NewSessionModel(demoSession(t), plan.Options{})
	})
	if sessionModelErr != nil {
		t.Fatal(sessionModelErr)
	}
	return sessionModelVal
}

// frozenModel is the demo session drawn with report.DemoFit's fixed fit
// and plan: the goldens use it, so they move only when the drawing code
// does, not when the solver improves.
func frozenModel(t testing.TB) *render.Model {
	t.Helper()
	m, err := report.DemoModel(demoSession(t))
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// engineModels are the three invented demo engines as drawn.
func engineModels(t testing.TB) []*render.Model {
	t.Helper()
	var out []*render.Model
	for _, spec := range setting.DemoEngines() {
		m, err := render.NewEngineModel(spec)
		if err != nil {
			t.Fatalf("%s: %v", spec.Name, err)
		}
		out = append(out, m)
	}
	return out
}

// The model's events must be the plan's: the diagrams show what the plan
// says, to the micrometre and the hundredth of a per cent.
func TestModelAgreesWithPlan(t *testing.T) {
	m := sessionModel(t)
	if m.Plan == nil || len(m.Positions) != len(m.Plan.Now) {
		t.Fatalf("positions %d, plan rows %v", len(m.Positions), m.Plan)
	}
	for i, p := range m.Positions {
		for _, c := range []struct {
			name      string
			got, want float64
			tol       float64
		}{
			{"front lead now", p.NowEvents.Front.Lead, m.Plan.Now[i].Front.LeadMM, 1e-3},
			{"back lead now", p.NowEvents.Back.Lead, m.Plan.Now[i].Back.LeadMM, 1e-3},
			{"front cut-off now", p.NowEvents.Front.CutOff.StrokePercent, m.Plan.Now[i].Front.CutOffPercent, 0.01},
			{"back cut-off now", p.NowEvents.Back.CutOff.StrokePercent, m.Plan.Now[i].Back.CutOffPercent, 0.01},
			{"front lead after", p.AfterEvents.Front.Lead, m.Plan.After[i].Front.LeadMM, 1e-3},
			{"back lead after", p.AfterEvents.Back.Lead, m.Plan.After[i].Back.LeadMM, 1e-3},
			{"front cut-off after", p.AfterEvents.Front.CutOff.StrokePercent, m.Plan.After[i].Front.CutOffPercent, 0.01},
			{"back cut-off after", p.AfterEvents.Back.CutOff.StrokePercent, m.Plan.After[i].Back.CutOffPercent, 0.01},
		} {
			if math.Abs(c.got-c.want) > c.tol {
				t.Errorf("%s, %s: model %.4f, plan %.4f", p.Notch.Name, c.name, c.got, c.want)
			}
		}
	}
}

// Readings sit on today's curve up to their residual.
func TestReadingsOnTheCurve(t *testing.T) {
	m := sessionModel(t)
	if len(m.Readings) == 0 {
		t.Fatal("no readings placed")
	}
	for _, r := range m.Readings {
		i := -1
		for k, p := range m.Positions {
			if p.Notch.Reverser == r.Reverser {
				i = k
			}
		}
		if i < 0 {
			continue
		}
		if d := r.ValveMM - m.ValveAt(i, r.CrankDeg, false) - r.ResidualMM; math.Abs(d) > 0.01 {
			t.Errorf("%s: reading %.3f, curve %.3f, residual %.3f: off by %.3f mm", r.Label, r.ValveMM, m.ValveAt(i, r.CrankDeg, false), r.ResidualMM, d)
		}
	}
}

// Port edges: with external admission the front port opens to steam when
// the valve moves back past its lap, with internal when it moves forward
// (setting.Admission's derivation), and the port state follows.
func TestValveEdgesAndPortState(t *testing.T) {
	v := setting.Valve{Admission: setting.External,
		Front: setting.End{SteamLap: 2.4, ExhaustLap: 0.1, PortWidth: 2.4},
		Back:  setting.End{SteamLap: 2.2, ExhaustLap: -0.1, PortWidth: 2.4}}
	e := render.ValveEdges(v)
	if e.FrontSteam != -2.4 || e.BackSteam != 2.2 || e.FrontExhaust != 0.1 || e.BackExhaust != 0.1 || e.Sign != -1 {
		t.Errorf("external edges %+v", e)
	}
	for _, c := range []struct {
		x           float64
		front, back render.PortState
	}{
		{-3, render.OpenToSteam, render.OpenToExhaust},
		{3, render.OpenToExhaust, render.OpenToSteam},
		{0, render.Closed, render.OpenToExhaust}, // back exhaust clearance 0.1
		{-0.05, render.Closed, render.OpenToExhaust},
		{0.5, render.OpenToExhaust, render.Closed},
	} {
		if f, b := render.PortStateAt(v, setting.Front, c.x), render.PortStateAt(v, setting.Back, c.x); f != c.front || b != c.back {
			t.Errorf("x=%g: front %v back %v, want %v %v", c.x, f, b, c.front, c.back)
		}
	}
	v.Admission = setting.Internal
	if e := render.ValveEdges(v); e.FrontSteam != 2.4 || e.BackSteam != -2.2 || e.Sign != 1 {
		t.Errorf("internal edges %+v", e)
	}
}

// The enlarged port drawing opens each port exactly where the valve's
// events say: at x = -lap the external valve's front face is line-on-line
// with the front port's outer edge.
func TestInsetPortsFollowLaps(t *testing.T) {
	v := setting.Valve{Admission: setting.External,
		Front: setting.End{SteamLap: 2.4, PortWidth: 2.4}, Back: setting.End{SteamLap: 2.0, PortWidth: 2.4}}
	ip := render.Ports(v, -2.4, 10)
	if got := ip.Valve[1][1]; math.Abs(got-ip.Front[1]) > 1e-12 {
		t.Errorf("external front face at %g, port edge at %g", got, ip.Front[1])
	}
	ip = render.Ports(v, 2.0, 10)
	if got := ip.Valve[0][0]; math.Abs(got-ip.Back[0]) > 1e-12 {
		t.Errorf("external back face at %g, port edge at %g", got, ip.Back[0])
	}
	v.Admission = setting.Internal
	ip = render.Ports(v, 2.4, 10)
	if got := ip.Valve[0][0]; math.Abs(got-ip.Front[0]) > 1e-12 {
		t.Errorf("internal front head's inner face at %g, port inner edge at %g", got, ip.Front[0])
	}
}

// Layout maths with numbers: tabs are finger-sized and stay in the box;
// a card's NeedH fits its content.
func TestLayoutNumbers(t *testing.T) {
	tabs, h := render.LayoutTabs(portrait, []string{"full forward", "running notch", "full back"})
	if len(tabs) != 3 || h < render.HitMin {
		t.Fatalf("tabs %v height %g", tabs, h)
	}
	for i, r := range tabs {
		if r.H() < render.HitMin || r.W() < render.HitMin || !portrait.ContainsRect(r) {
			t.Errorf("tab %d %v: smaller than a finger or outside the box", i, r)
		}
		for j := i + 1; j < len(tabs); j++ {
			if r.Overlaps(tabs[j]) {
				t.Errorf("tabs %d and %d overlap", i, j)
			}
		}
	}
	// Four long names do not fit one phone-wide row: a second row.
	tabs, h = render.LayoutTabs(portrait, []string{"full forward", "running notch", "mid gear", "full back"})
	if tabs[3].Min.Y != tabs[0].Min.Y+render.HitMin+6 || h < 2*render.HitMin {
		t.Errorf("rows: %v, height %g", tabs, h)
	}
	l := render.LayoutCard(render.Rect{Max: render.Point{X: 358, Y: 2000}}, render.CardSpec{Title: "T", Caption: "c", LegendRows: 2, YTickWidth: 20, MaxPlotH: 200})
	if l.Plot.H() != 200 {
		t.Errorf("plot height %g, want the 200 asked", l.Plot.H())
	}
	want := 14 + 18*1.35 + 8 + 14*1.35 + 14*0.65 + 200 + 5 + 2 + 2*14*1.35 + 8 + 2*22 + 8 + 14*1.35 + 14
	if math.Abs(l.NeedH-want) > 1e-9 {
		t.Errorf("NeedH %g, want %g", l.NeedH, want)
	}
	for _, c := range [][2]float64{{0.0108, 0.02}, {3.48, 5}, {2, 2}, {0.21, 0.25}, {7, 10}, {0, 1}} {
		if got := render.NiceCeil(c[0]); math.Abs(got-c[1]) > 1e-12 {
			t.Errorf("NiceCeil(%g) = %g, want %g", c[0], got, c[1])
		}
	}
	if r := render.ResidualRange([]render.Reading{{ResidualMM: -0.05}}); math.Abs(r-0.06) > 1e-12 {
		t.Errorf("ResidualRange %g, want 0.06", r)
	}
}

// The balance card's ticks and crosses follow the tolerance.
func TestBalanceVerdicts(t *testing.T) {
	m := sessionModel(t)
	c := recorder.New(390, 844)
	render.Balance(c, m, portrait, render.Light())
	th := render.Light()
	var ticks, crosses int
	for _, op := range c.Ops() {
		if op.Kind == recorder.Stroke && op.Line.Width == 3 && len(op.Path) == 3 {
			ticks++ // a tick is one stroke of three points
		}
		if op.Kind == recorder.Stroke && op.Line.Color == th.Warn && len(op.Path) == 4 {
			crosses++
		}
	}
	want := 0
	for _, p := range m.Positions {
		for _, ev := range []setting.EventSet{p.NowEvents, p.AfterEvents} {
			if math.Abs(ev.Front.Lead-ev.Back.Lead) <= m.LeadTolMM {
				want++
			}
			if math.Abs(ev.Front.CutOff.StrokePercent-ev.Back.CutOff.StrokePercent) <= m.CutOffTolPct {
				want++
			}
		}
	}
	if ticks != want || ticks+crosses != 4*len(m.Positions) {
		t.Errorf("%d ticks and %d crosses, want %d ticks of %d verdicts", ticks, crosses, want, 4*len(m.Positions))
	}
}

// Bad input: a missing session, a cylinder out of range, an engine that
// fails validation all give sentences naming the field.
func TestModelErrors(t *testing.T) {
	if _, err := render.NewSessionModel(nil, plan.Options{}); err == nil {
		t.Error("nil session accepted")
	}
	if _, err := render.NewSessionModel(demoSession(t), plan.Options{Cylinder: 7}); err == nil || !strings.Contains(err.Error(), "cylinder") {
		t.Errorf("cylinder 7: %v", err)
	}
	spec := setting.DemoStephenson()
	spec.Engine.RodLength = 10
	if _, err := render.NewEngineModel(spec); err == nil {
		t.Error("invalid engine accepted")
	}
}

// planOptions are the plan choices of the tests: equal leads.
func planOptions() plan.Options { return plan.Options{} }
