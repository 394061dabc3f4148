package beat

import (
	"math"
	"os"
	"strings"
	"testing"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// demo reads the invented demo session.
func demo(t *testing.T) *session.Session {
	t.Helper()
	f, err := os.Open("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := session.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// The demo session's two cylinders, each planned, give four beats a turn
// in every position both plan, their gaps adding to a turn, and the work
// of all four ends sharing the mean.
func TestFromPlansDemo(t *testing.T) {
	s := demo(t)
	var plans []*plan.Plan
	for i := range s.Cylinders {
		p, err := plan.Make(s, plan.Options{Cylinder: i, Priority: plan.EqualLeads})
		if err != nil {
			t.Fatal(err)
		}
		plans = append(plans, p)
	}
	ps, err := FromPlans(s, plans, DefaultSteam)
	if err != nil {
		t.Fatal(err)
	}
	if len(ps) == 0 {
		t.Fatal("no position is planned on both cylinders")
	}
	for _, p := range ps {
		for _, c := range []Circle{p.Now, p.After} {
			sum := 0.0
			for _, g := range c.Gaps {
				sum += g
			}
			if len(c.Gaps) != 4 || math.Abs(sum-360) > 1e-9 || !(c.Evenness() >= 1 && c.Evenness() < 1.5) {
				t.Errorf("%s: gaps %v (sum %g), evenness %g", p.Name, c.Gaps, sum, c.Evenness())
			}
		}
		share := 0.0
		for _, w := range p.WorkAfter {
			share += w.Share
		}
		if len(p.WorkAfter) != 4 || math.Abs(share-400) > 1e-9 {
			t.Errorf("%s: work after %+v", p.Name, p.WorkAfter)
		}
		t.Logf("%s %s: gaps now %.1f, after %.1f; evenness %.3f -> %.3f", p.Name, p.Direction, p.Now.Gaps, p.After.Gaps, p.Now.Evenness(), p.After.Evenness())
	}
	// A cylinder the engine does not list cannot be placed.
	s.Cylinders[1].Name = "middle"
	if _, err := FromPlans(s, plans, DefaultSteam); err == nil {
		t.Error("a cylinder the engine does not list was placed on the circle")
	}
}

// Cylinders whose means differ by more than the readings tell are named,
// with what sets each between the sides; alike ones are not.
func TestSidesCompared(t *testing.T) {
	p := Position{Name: "running notch", Sides: []SideMeans{
		{Cylinder: "right", LeadNow: 0.2, LeadAfter: 0.2, CutOffNow: 40, CutOffAfter: 40},
		{Cylinder: "left", LeadNow: 0.3, LeadAfter: 0.3, CutOffNow: 42, CutOffAfter: 42},
	}}
	var b strings.Builder
	if err := WriteText(&b, nil, []Position{p}, nil, session.UnitMM); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"leads stay 0.10 mm apart", "same target lead (the lead wanted in full gear).", "cut off 2.0 % of stroke apart", "reversing linkage"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("the comparison lacks %q:\n%s", want, b.String())
		}
	}
	// In full gear the target lead to give is the mean of the sides'.
	p.Name = session.FullForward
	b.Reset()
	WriteText(&b, nil, []Position{p}, nil, session.UnitMM)
	if want := "same target lead, e.g. 0.25 mm."; !strings.Contains(b.String(), want) {
		t.Errorf("the comparison in full forward lacks %q:\n%s", want, b.String())
	}
	p.Name = "running notch"
	p.Sides[1].LeadAfter, p.Sides[1].CutOffAfter = 0.205, 40.2
	b.Reset()
	WriteText(&b, nil, []Position{p}, nil, session.UnitMM)
	if strings.Contains(b.String(), "apart") {
		t.Errorf("sides within what the readings tell are called apart:\n%s", b.String())
	}
}

// Where each side's cut-off per mm of die is known, the sides cut off
// apart in a notch are told how far each die wants to move, and which
// way, to cut off alike at their mean: (40 - 38) / 4 = 0.5 mm further out
// for one, (42 - 40) / 4 = 0.5 mm nearer the middle for the other, in
// inches too (0.5 mm = 0.020 in; 4 % a mm is 1.0 % each 0.01 in). Where
// it is not known, the words say only what sets the cut-offs apart.
func TestSidesCutOffApartSayHowFarEachDie(t *testing.T) {
	p := Position{Name: "running notch", Sides: []SideMeans{
		{Cylinder: "right", CutOffNow: 38, CutOffAfter: 38, CutOffPerDieMM: 4},
		{Cylinder: "left", CutOffNow: 42, CutOffAfter: 42, CutOffPerDieMM: 4},
	}}
	for _, c := range []struct {
		unit session.Unit
		want []string
	}{
		{session.UnitMM, []string{"apart after the plans (right 38.0 %, left 42.0 %)", "at 40.0 %", "move the right die about 0.50 mm further from the middle of its link", "move the left die about 0.50 mm nearer to the middle of its link", "each mm moves a cut-off about 4.0 %"}},
		{session.UnitInch, []string{"the right die about 0.020 in further from", "the left die about 0.020 in nearer to", "each 0.01 in moves a cut-off about 1.0 %"}},
	} {
		w := strings.Join(SideWords(p, c.unit), " ")
		for _, want := range c.want {
			if !strings.Contains(w, want) {
				t.Errorf("%v: the words lack %q:\n%s", c.unit, want, w)
			}
		}
	}
	p.Sides[1].CutOffPerDieMM = 0
	w := strings.Join(SideWords(p, session.UnitMM), " ")
	if strings.Contains(w, "further from") || !strings.Contains(w, "Check the die's place in each link") {
		t.Errorf("a side without its cut-off per mm of die still moved:\n%s", w)
	}
}
