package beat

import (
	"math"
	"strings"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/plan"
)

// The beats a recording is laid against come in the direction of running:
// from each beat to the next in the circle's order is that gap, forward
// and backward alike, and each names its cylinder end.
func TestBeatsInTheDirectionOfRunning(t *testing.T) {
	for _, dir := range []setting.Direction{setting.Forward, setting.Backward} {
		set := textbook(t, 5, dir)
		circ, err := NewCircle([]Side{{Name: "right", Set: set}, {Name: "left", CrankDeg: -90, Set: set}})
		if err != nil {
			t.Fatal(err)
		}
		bs := circ.Beats()
		if len(bs) != 4 {
			t.Fatalf("%s: %d beats", dir, len(bs))
		}
		for i, b := range bs {
			next := bs[(i+1)%len(bs)]
			if got := math.Mod(next.Deg-b.Deg+720, 360); math.Abs(got-circ.Gaps[i]) > 1e-9 {
				t.Errorf("%s: from %s to %s %.3f degrees, the circle's gap %.3f", dir, b, next, got, circ.Gaps[i])
			}
			if b.String() != circ.Exhausts[i].Label() {
				t.Errorf("%s: beat %d is %q, the exhaust %q", dir, i, b, circ.Exhausts[i].Label())
			}
		}
	}
}

// PlanAll plans every cylinder of the demo session, and Whole names a
// cylinder without readings.
func TestPlanAll(t *testing.T) {
	s := demo(t)
	plans, err := PlanAll(s, plan.AimsOptions(s.Aims))
	if err != nil || len(plans) != 2 || plans[0] == nil || plans[1] == nil {
		t.Fatalf("demo: %d plans, %v", len(plans), err)
	}
	s.Cylinders[1].Rounds = nil
	if _, err := Whole(s, plan.Options{}, DefaultSteam); err == nil || !strings.Contains(err.Error(), "The left cylinder has no readings yet") {
		t.Errorf("a cylinder without readings: %v", err)
	}
}
