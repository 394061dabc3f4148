package render

import (
	"fmt"
	"math"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// TestPlanEventSetsMatchOwn: the event sets a model takes from its plan
// (plan.Plan.EventSets) are those it would find itself from the fit's
// curves and from the plan's steps applied to them (afterModel), for every
// cylinder of the demo session, every priority and some target leads; so
// taking them over changes no diagram. A what-if copy of the plan with
// another amount gets no after sets.
func TestPlanEventSetsMatchOwn(t *testing.T) {
	s, err := session.ReadFile("../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	lead := 0.4
	cases := 0
	for cyl := range s.Cylinders {
		for _, opt := range []plan.Options{{Priority: plan.EqualLeads}, {Priority: plan.EqualCutOffs}, {Priority: plan.Balanced}, {TargetLeadMM: &lead}} {
			opt.Cylinder, opt.Unit = cyl, session.UnitMM
			fit, err := plan.FitSession(s, cyl, opt.Fit)
			if err != nil {
				t.Fatal(err)
			}
			p, err := plan.FromFit(fit, s.Adjustments, opt)
			if err != nil {
				t.Fatal(err)
			}
			now, aft := p.EventSets()
			if len(now) != len(p.Now) || len(aft) != len(p.After) {
				t.Fatalf("cylinder %d, %+v: %d and %d sets for %d positions", cyl, opt, len(now), len(aft), len(p.Now))
			}
			taken, err := NewModel(s, cyl, fit, p)
			if err != nil {
				t.Fatal(err)
			}
			own := &Model{Spec: taken.Spec, built: fit.Model}
			after := afterModel(fit.Model, p.Steps)
			pos := make([]Position, len(taken.Positions))
			for i, q := range taken.Positions {
				pos[i] = Position{Notch: q.Notch, Direction: q.Direction}
			}
			if err := own.fill(pos, &after, nil, nil); err != nil {
				t.Fatal(err)
			}
			for i, q := range taken.Positions {
				where := fmt.Sprintf("cylinder %d, %s, %s, %d steps", cyl, opt.Priority, q.Notch.Name, len(p.Steps))
				sameSets(t, where+", now", q.NowEvents, own.Positions[i].NowEvents)
				sameSets(t, where+", after", q.AfterEvents, own.Positions[i].AfterEvents)
			}
			if len(p.Steps) > 0 {
				cases++
				w := *p
				w.Steps = append([]plan.Step(nil), p.Steps...)
				w.Steps[0].Amount += 0.1
				if n, a := w.EventSets(); len(n) != len(p.Now) || a != nil {
					t.Errorf("a what-if copy with another amount: %d now sets, %d after sets; want %d and none", len(n), len(a), len(p.Now))
				}
			}
		}
	}
	if cases == 0 {
		t.Fatal("no plan had a step: the after sets were never checked against steps")
	}
}

// sameSets fails unless two event sets agree to 1e-6 (mm, degrees, %).
func sameSets(t *testing.T, where string, a, b setting.EventSet) {
	t.Helper()
	if a.Direction != b.Direction {
		t.Errorf("%s: direction %v, own %v", where, a.Direction, b.Direction)
	}
	near := func(what string, x, y float64) {
		if !(math.Abs(x-y) <= 1e-6) {
			t.Errorf("%s: %s %.9g, own %.9g", where, what, x, y)
		}
	}
	near("valve min", a.ValveMin, b.ValveMin)
	near("valve max", a.ValveMax, b.ValveMax)
	for k, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
		x, y := a.End(end), b.End(end)
		if x.NeverOpens != y.NeverOpens || x.NeverCloses != y.NeverCloses {
			t.Errorf("%s: end %d opens/closes %v/%v, own %v/%v", where, k, x.NeverOpens, x.NeverCloses, y.NeverOpens, y.NeverCloses)
		}
		near("lead", x.Lead, y.Lead)
		near("lead angle", x.LeadAngle, y.LeadAngle)
		near("max opening", x.MaxOpening, y.MaxOpening)
		near("max exhaust", x.MaxExhaustOpening, y.MaxExhaustOpening)
		for _, e := range []struct {
			what string
			x, y setting.Event
		}{{"admission", x.Admission, y.Admission}, {"cut-off", x.CutOff, y.CutOff}, {"release", x.Release, y.Release}, {"compression", x.Compression, y.Compression}} {
			near(e.what+" crank", e.x.CrankDeg, e.y.CrankDeg)
			near(e.what+" stroke", e.x.StrokePercent, e.y.StrokePercent)
		}
	}
}

// TestReadingsOfTheFittedRound: a model of an earlier round's plan places
// that round's readings on its curves, not the latest round's.
func TestReadingsOfTheFittedRound(t *testing.T) {
	s, err := session.ReadFile("../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Cylinders[0].Rounds) < 2 {
		t.Fatal("the demo session needs two rounds for this test")
	}
	all, err := s.Observations(0)
	if err != nil {
		t.Fatal(err)
	}
	for round := 1; round <= len(s.Cylinders[0].Rounds); round++ {
		fit, err := plan.FitSession(s, 0, plan.FitOptions{Round: round})
		if err != nil {
			t.Fatal(err)
		}
		p, err := plan.FromFit(fit, s.Adjustments, plan.Options{Fit: plan.FitOptions{Round: round}})
		if err != nil {
			t.Fatal(err)
		}
		m, err := NewModel(s, 0, fit, p)
		if err != nil {
			t.Fatal(err)
		}
		var want []string
		for _, o := range all {
			if o.Round == round-1 && o.HasCrank && o.HasGauge && (o.Kind == session.AtDeadCentre || o.Kind == session.InSweep) {
				want = append(want, fmt.Sprintf("%s %.4f", o.Label, gaugeToValve(o.GaugeMM, fit.Model.Dev)))
			}
		}
		var got []string
		for _, r := range m.Readings {
			got = append(got, fmt.Sprintf("%s %.4f", r.Label, r.ValveMM))
		}
		if len(want) == 0 || fmt.Sprint(got) != fmt.Sprint(want) {
			t.Errorf("round %d: readings %q, want %q", round, got, want)
		}
	}
}
