package render_test

import (
	"os"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/render/report"
	"evenbeat/setting/beat"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// demoBeat returns the demo session's whole-engine positions.
func demoBeat(t *testing.T) []beat.Position {
	t.Helper()
	f, err := os.Open("../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := session.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	var plans []*plan.Plan
	for i := range s.Cylinders {
		p, err := plan.Make(s, plan.Options{Cylinder: i, Priority: plan.EqualLeads})
		if err != nil {
			t.Fatal(err)
		}
		plans = append(plans, p)
	}
	ps, err := beat.FromPlans(s, plans, beat.DefaultSteam)
	if err != nil {
		t.Fatal(err)
	}
	return ps
}

// The beat card names every exhaust and every gap, today and after, and
// the heard beats when given; it stays inside its box on a phone.
func TestBeatCard(t *testing.T) {
	ps := demoBeat(t)
	pos := ps[1]
	heard := []float64{93, 88, 90, 89}
	for _, box := range []render.Rect{portrait, landscape} {
		rec := recorder.New(box.Max.X+16, box.Max.Y+16)
		render.BeatCard(rec, box, pos, heard, render.Light())
		log := rec.String()
		for _, e := range pos.Now.Exhausts {
			if !strings.Contains(log, e.Label()) && !(strings.Contains(log, `"`+e.Cylinder+`"`) && strings.Contains(log, `"`+e.End.String()+`"`)) {
				t.Errorf("the card does not name %q", e.Label())
			}
		}
		for _, want := range []string{"The beat, running notch", "Heard:", "heard", "after the plan (gaps in bold)"} {
			if !strings.Contains(log, want) {
				t.Errorf("the card lacks %q", want)
			}
		}
	}
	if dir := os.Getenv("EVENBEAT_PNG_DIR"); dir != "" {
		c := raster.New(390*2, 700*2, 2)
		c.Clear(render.Light().Background)
		render.BeatCard(c, render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 684}}, pos, heard, render.Light())
		f, err := os.Create(dir + "/beat.png")
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		if err := report.EncodePNG(f, c); err != nil {
			t.Fatal(err)
		}
	}
}
