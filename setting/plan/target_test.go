package plan

import (
	"strings"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// TestTargetLeadNotMet: a target lead the plan cannot meet is said, with
// why and the lead the plan gives instead: on Walschaerts gear (the
// combination lever sets the lead; common practice, see valve-setting.md
// section 5), on a Stephenson gear whose profile lets no sheave turn, and
// on a single eccentric whose sheave may turn less than a step, or a few
// steps short of the target (its limit).
// A target the plan meets gets no such note.
func TestTargetLeadNotMet(t *testing.T) {
	sheave := session.Adjustment{Kind: session.EccentricAngle, Min: -0.3, Max: 0.3, SheaveDiameterMM: 40}
	wider := sheave
	wider.Min, wider.Max = -3, 3
	spindle := testAdjustments(setting.KindSingleEccentric)[0]
	for _, c := range []struct {
		name, kind string
		adjs       []session.Adjustment
		target     float64
		why        string // "" for a target met
	}{
		{"Walschaerts", setting.KindWalschaerts, nil, 0.9, "combination lever"},
		{"Stephenson without sheaves", setting.KindStephenson, nil, 0.9, "lets the plan turn none"},
		{"a sheave held under a step", setting.KindSingleEccentric, []session.Adjustment{spindle, sheave}, 0.9, "less than one of its steps (0.50 mm round its rim)"},
		{"a sheave at its limit", setting.KindSingleEccentric, []session.Adjustment{spindle, wider}, 0.9, "stops at its last whole step within the limit"},
		{"a sheave free to turn", setting.KindSingleEccentric, nil, 0.3, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			sim := simulated{spec: testSpec(t, c.kind), dev: injected(c.kind)}
			adjs := c.adjs
			if adjs == nil {
				adjs = testAdjustments(c.kind)
			}
			target := c.target
			p, err := Make(sim.session(t, 15, adjs), Options{TargetLeadMM: &target})
			if err != nil {
				t.Fatal(err)
			}
			var said []string
			for _, n := range p.Notes {
				if strings.HasPrefix(n, "The target lead of 0.90 mm is not met") || strings.HasPrefix(n, "The target lead of 0.30 mm") {
					said = append(said, n)
				}
			}
			if c.why == "" {
				if len(said) > 0 {
					t.Errorf("a target met is said to be missed: %q", said)
				}
				return
			}
			if len(said) == 0 {
				t.Fatalf("no note says the target is missed: %q", p.Notes)
			}
			t.Log(said[0])
			full := fmtMean(p.After[0], session.UnitMM)
			if !strings.Contains(said[0], "is not met in full forward") || !strings.Contains(said[0], c.why) || !strings.Contains(said[0], "The plan gives "+full+" in full forward (") {
				t.Errorf("note %q; want full forward, %q and the plan's %s", said[0], c.why, full)
			}
		})
	}
}

// fmtMean writes a position's mean lead as the notes do.
func fmtMean(st PositionState, unit session.Unit) string {
	return length((st.Front.LeadMM+st.Back.LeadMM)/2, unit)
}
