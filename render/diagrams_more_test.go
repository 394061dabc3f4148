package render_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
)

// Every diagram: a recorder golden in portrait light and landscape dark,
// everything inside its box, no labels overlapping, no text under 14.
func TestDiagramGoldens(t *testing.T) {
	m := frozenModel(t)
	ms := engineModels(t)
	walsch := ms[2]
	type draw func(c render.Canvas, box render.Rect, th render.Theme)
	cases := []struct {
		name string
		draw draw
	}{
		{"valve_curve", func(c render.Canvas, b render.Rect, th render.Theme) { render.ValveCurve(c, m, 0, b, th) }},
		{"valve_curve_notch", func(c render.Canvas, b render.Rect, th render.Theme) { render.ValveCurve(c, m, 1, b, th) }},
		// The balance and plan cards scroll in the app: they get the
		// height they need.
		{"balance", func(c render.Canvas, b render.Rect, th render.Theme) { render.Balance(c, m, b, th) }},
		{"valve_piston", func(c render.Canvas, b render.Rect, th render.Theme) { render.ValvePiston(c, m, 1, b, th) }},
		{"port_opening_holes", func(c render.Canvas, b render.Rect, th render.Theme) { render.PortOpening(c, walsch, 0, b, th) }},
		{"port_opening_slots", func(c render.Canvas, b render.Rect, th render.Theme) { render.PortOpening(c, m, 0, b, th) }},
		{"motion_stephenson", func(c render.Canvas, b render.Rect, th render.Theme) { render.Motion(c, m, 0, 60, b, th) }},
		{"motion_walschaerts", func(c render.Canvas, b render.Rect, th render.Theme) { render.Motion(c, walsch, 1, 200, b, th) }},
		{"motion_slip_eccentric", func(c render.Canvas, b render.Rect, th render.Theme) { render.Motion(c, ms[0], 0, 300, b, th) }},
		{"plan", func(c render.Canvas, b render.Rect, th render.Theme) { render.PlanCard(c, m, b, th) }},
		{"screen_valve_curve", func(c render.Canvas, b render.Rect, th render.Theme) {
			render.DrawScreen(c, m, render.Screen{Diagram: render.ValveCurveDiagram, Position: 2}, b, th)
		}},
	}
	for _, tc := range cases {
		for _, v := range []struct {
			suffix string
			box    render.Rect
			th     render.Theme
		}{{"portrait_light", portrait, render.Light()}, {"landscape_dark", landscape, render.Dark()}} {
			t.Run(tc.name+"_"+v.suffix, func(t *testing.T) {
				c := recorder.New(844, 844)
				switch tc.name {
				case "balance":
					v.box.Max.Y = math.Max(v.box.Max.Y, v.box.Min.Y+render.LayoutBalance(v.box, m).NeedH)
				case "plan":
					v.box.Max.Y = math.Max(v.box.Max.Y, v.box.Min.Y+render.LayoutPlan(v.box, m).NeedH)
					c = recorder.New(844, v.box.Max.Y+16)
				}
				tc.draw(c, v.box, v.th)
				if len(c.Ops()) < 10 {
					t.Fatalf("drew only %d calls", len(c.Ops()))
				}
				checkLayout(t, c, v.box)
				if s := c.String(); strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
					t.Error("NaN or Inf drawn")
				}
				golden(t, tc.name+"_"+v.suffix, c.String())
			})
		}
	}
}

// The motion drawing stays in its box at every crank angle and position,
// for every gear, on a phone both ways up: the frame is fixed once per
// model, so an animation never jumps or spills.
func TestMotionStaysInBoxAllRound(t *testing.T) {
	for _, m := range append(engineModels(t), sessionModel(t)) {
		for _, box := range []render.Rect{portrait, landscape} {
			for i := range m.Positions {
				for a := 0.0; a < 360; a += 15 {
					c := recorder.New(844, 844)
					render.Motion(c, m, i, a, box, render.Light())
					if err := c.CheckInside(box); err != nil {
						t.Fatalf("%s, %s, %g°: %v", m.Title, m.Positions[i].Notch.Name, a, err)
					}
					if err := c.CheckLabels(); err != nil {
						t.Fatalf("%s, %g°: %v", m.Title, a, err)
					}
				}
			}
		}
	}
}

// The curves stay inside their plots for every position of every model.
func TestCurvesStayInBox(t *testing.T) {
	for _, m := range append(engineModels(t), sessionModel(t)) {
		for i := range m.Positions {
			for _, d := range []render.Diagram{render.ValveCurveDiagram, render.ValvePistonDiagram, render.PortOpeningDiagram} {
				for _, box := range []render.Rect{portrait, landscape, {Max: render.Point{X: 320, Y: 560}}} {
					c := recorder.New(844, 844)
					hits := render.DrawScreen(c, m, render.Screen{Diagram: d, Position: i}, box, render.Dark())
					name := fmt.Sprintf("%s, %s, diagram %d, box %v", m.Title, m.Positions[i].Notch.Name, d, box)
					if err := c.CheckTextSize(14); err != nil {
						t.Errorf("%s: %v", name, err)
					}
					if err := c.CheckLabels(); err != nil {
						t.Errorf("%s: %v", name, err)
					}
					// A box shorter than the card needs (a 320x560 phone
					// with tabs) scrolls: the app lets the card run on.
					if box != (render.Rect{Max: render.Point{X: 320, Y: 560}}) {
						if err := c.CheckInside(box); err != nil {
							t.Errorf("%s: %v", name, err)
						}
					}
					for _, h := range hits.Positions {
						if h.H() < render.HitMin || h.W() < render.HitMin {
							t.Errorf("%s: tab %v under a finger's size", name, h)
						}
					}
				}
			}
		}
	}
}

// The plan card gives a finger-sized hit box per step, in order, not
// overlapping, and an arrow per step; a model without a plan says so.
func TestPlanCardHits(t *testing.T) {
	m := frozenModel(t)
	c := recorder.New(390, 844)
	hits := render.PlanCard(c, m, portrait, render.Light())
	if len(hits) != len(m.Plan.Steps) || len(hits) == 0 {
		t.Fatalf("%d hits for %d steps", len(hits), len(m.Plan.Steps))
	}
	for i, h := range hits {
		if h.H() < render.HitMin || !portrait.ContainsRect(h) {
			t.Errorf("step %d hit %v", i, h)
		}
		if i > 0 && h.Min.Y < hits[i-1].Max.Y {
			t.Errorf("step %d overlaps step %d", i, i-1)
		}
	}
	c = recorder.New(390, 844)
	if hits := render.PlanCard(c, engineModels(t)[0], portrait, render.Light()); len(hits) != 0 {
		t.Errorf("an engine with no plan gave %d steps", len(hits))
	}
	if !strings.Contains(c.String(), "nothing to change") {
		t.Error("no plan: the card should say there is nothing to change")
	}
}

// The report's height is what it draws, and it holds every section.
func TestReportHeightAndSections(t *testing.T) {
	rm := render.ReportModel{Model: frozenModel(t), Session: demoSession(t)}
	h := render.ReportHeight(render.ReportWidth, rm)
	if !(h > 2000) || math.IsInf(h, 0) {
		t.Fatalf("report height %g", h)
	}
	c := recorder.New(render.ReportWidth, h)
	render.Report(c, rm, render.Light())
	if err := c.CheckInside(render.Rect{Max: render.Point{X: render.ReportWidth, Y: h}}); err != nil {
		t.Error(err)
	}
	if err := c.CheckLabels(); err != nil {
		t.Error(err)
	}
	if err := c.CheckTextSize(14); err != nil {
		t.Error(err)
	}
	s := c.String()
	for _, want := range []string{"Engine", "Readings of the latest round", "Events", "are we there?", "Valve travel, full forward", "Valve travel, full back", "The plan", "Before you turn the wheels", "Invented"} {
		if !strings.Contains(s, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	golden(t, "report_light", s)
}

// Unusable boxes and models draw nothing or a message, never NaN.
func TestNewDiagramsBadInput(t *testing.T) {
	m := sessionModel(t)
	for _, box := range []render.Rect{{}, {Max: render.Point{X: math.NaN(), Y: 300}}} {
		c := recorder.New(390, 844)
		render.ValveCurve(c, m, 0, box, render.Light())
		render.Balance(c, m, box, render.Light())
		render.Motion(c, m, 0, 10, box, render.Light())
		render.PlanCard(c, m, box, render.Light())
		render.PortOpening(c, m, 0, box, render.Light())
		render.ValvePiston(c, m, 0, box, render.Light())
		if len(c.Ops()) != 0 {
			t.Errorf("box %v drew %d calls", box, len(c.Ops()))
		}
	}
	c := recorder.New(390, 844)
	render.ValveCurve(c, m, 99, portrait, render.Light())
	render.Motion(c, m, 0, math.NaN(), portrait, render.Light())
	render.ValveCurve(c, nil, 0, portrait, render.Light())
	if s := c.String(); strings.Contains(s, "NaN") || !strings.Contains(s, "no valve curve") {
		t.Errorf("bad position should give a message:\n%.400s", s)
	}
}

// Every link of the gear is drawn at its solved place: for each bar of
// the pose, a stroke runs from one of its joints to the other (arcs end on
// them), mapped by the layout's scale.
func TestMotionDrawsEveryLink(t *testing.T) {
	for _, m := range engineModels(t) {
		for _, a := range []float64{0, 100, 250} {
			pose, ok := m.Pose(0, a)
			if !ok || len(pose.Bars) < 3 {
				t.Fatalf("%s: no pose at %g", m.Title, a)
			}
			c := recorder.New(390, 844)
			render.Motion(c, m, 0, a, portrait, render.Light())
			l := render.LayoutMotion(portrait, m, 0)
			g := m.Geometry()
			at := func(u, w float64) render.Point {
				return render.Point{X: l.Origin.X + (u-g.Min.U)*l.Scale, Y: l.Origin.Y + (g.Max.W-w)*l.Scale}
			}
			near := func(p, q render.Point) bool { return math.Hypot(p.X-q.X, p.Y-q.Y) < 0.01 }
			for _, b := range pose.Bars {
				from, to := pose.Joints[b.From].At, pose.Joints[b.To].At
				p0, p1 := at(from.U, from.W), at(to.U, to.W)
				found := false
				for _, op := range c.Ops() {
					if op.Kind != recorder.Stroke || len(op.Path) < 2 {
						continue
					}
					s, e := op.Path[0].Pts[0], op.Path[len(op.Path)-1].Pts[0]
					if (near(s, p0) && near(e, p1)) || (near(s, p1) && near(e, p0)) {
						found = true
						break
					}
				}
				if !found {
					t.Errorf("%s at %g°: the %s (%s to %s) is not drawn", m.Title, a, b.Name, pose.Joints[b.From].Name, pose.Joints[b.To].Name)
				}
			}
		}
	}
}

// LayoutScreen gives the same touch targets as drawing the screen.
func TestLayoutScreenMatchesDrawing(t *testing.T) {
	m := frozenModel(t)
	for _, s := range []render.Screen{{Diagram: render.ValveCurveDiagram, Position: 1}, {Diagram: render.PlanDiagram}} {
		for _, box := range []render.Rect{portrait, landscape} {
			want := render.DrawScreen(recorder.New(844, 844), m, s, box, render.Dark())
			got := render.LayoutScreen(m, s, box)
			if fmt.Sprint(got) != fmt.Sprint(want) {
				t.Errorf("screen %v in %v: layout %v, drawing %v", s, box, got, want)
			}
			if len(got.Positions)+len(got.Steps) == 0 {
				t.Errorf("screen %v: no touch targets", s)
			}
		}
	}
}
