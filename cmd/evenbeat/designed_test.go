package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"evenbeat/setting"
)

// designedEngine is an invented engine given only by what a setter knows:
// its advances, reverse arm, backward rod and valve rod are left out, to
// be derived from the lead its drawing asks for.
const designedEngine = "../../testdata/engines/pellowmire-stephenson.json"

// runBoth runs the command line and returns stdout, stderr and the error.
func runBoth(t *testing.T, args ...string) (string, string, error) {
	t.Helper()
	var out, errOut bytes.Buffer
	err := run(context.Background(), args, &out, &errOut)
	return out.String(), errOut.String(), err
}

// evenbeat events on an engine given as a setter knows it: the table of
// the engine as derived, the design's lead in full gear at both ends
// both ways, and on stderr every part derived with its value and every
// key taken at its usual value.
func TestEventsOfAnEngineGivenAsASetterKnowsIt(t *testing.T) {
	out, errOut, err := runBoth(t, "events", "-json", designedEngine)
	if err != nil {
		t.Fatal(err)
	}
	spec, leftOut, err := readEngine(designedEngine)
	if err != nil {
		t.Fatal(err)
	}
	for _, key := range setting.DerivableKeys(setting.KindStephenson) {
		want := fmt.Sprintf("evenbeat: derived: %s = %s %s\n", key, trimNumber(*spec.Number(key), 3), keyUnit(key))
		if !strings.Contains(errOut, want) {
			t.Errorf("stderr does not show %q:\n%s", want, errOut)
		}
	}
	for _, key := range []string{"engine.inclination", "valve.front.exhaust_lap", "gear.stephenson.crossed", "gear.stephenson.link.suspension"} {
		if !strings.Contains(errOut, "evenbeat: usual: "+key+" = ") {
			t.Errorf("stderr does not say %s was taken as usual:\n%s", key, errOut)
		}
	}
	if len(leftOut) != len(setting.DerivableKeys(setting.KindStephenson))+8 {
		t.Errorf("left out: %v", leftOut)
	}
	var tab struct {
		Rows []struct {
			Notch string
			Front struct {
				LeadMM        float64 `json:"lead_mm"`
				CutOffPercent float64 `json:"cut_off_percent"`
			}
			Back struct {
				LeadMM        float64 `json:"lead_mm"`
				CutOffPercent float64 `json:"cut_off_percent"`
			}
		}
	}
	if err := json.Unmarshal([]byte(out), &tab); err != nil {
		t.Fatal(err)
	}
	full := 0
	for _, r := range tab.Rows {
		if r.Notch != "full forward" && r.Notch != "full back" {
			continue
		}
		full++
		// The design's lead, 0.010 in, as the mean of the two ends (the
		// valve centred, the backward rod for equal leads in full back).
		if m := (r.Front.LeadMM + r.Back.LeadMM) / 2; math.Abs(m-0.254) > 0.005 {
			t.Errorf("%s: mean lead %.3f mm, want the design's 0.254", r.Notch, m)
		}
		for _, c := range []float64{r.Front.CutOffPercent, r.Back.CutOffPercent} {
			if c < 65 || c > 85 {
				t.Errorf("%s: cut-off %.1f %%, outside 65-85 %%", r.Notch, c)
			}
		}
	}
	if full != 2 {
		t.Errorf("%d full-gear rows, want 2", full)
	}
}

// A session of that engine, its engine object as the setter gave it (the
// derivable parts left out), with one round read off the engine as
// derived but with the valve built 0.15 mm forward on its spindle:
// evenbeat plan reads it, shows the derived parts on stderr and moves the
// valve back by about that much.
func TestPlanOfAnEngineGivenAsASetterKnowsIt(t *testing.T) {
	engine, err := os.ReadFile(designedEngine)
	if err != nil {
		t.Fatal(err)
	}
	spec, _, err := readEngine(designedEngine)
	if err != nil {
		t.Fatal(err)
	}
	// The valve sits offMM forward on its spindle; the gauge, on the
	// spindle, reads zero with the spindle central, so the steam edges
	// crack offMM early at the front and late at the back.
	const offMM, zero = 0.15, 5.0
	c, err := spec.Engine.Prepare()
	if err != nil {
		t.Fatal(err)
	}
	g, _ := spec.Gear.Gear()
	var readings []string
	for _, p := range []struct {
		notch, dir string
		r          setting.Reverser
	}{{"full forward", "forward", 1}, {"full back", "backward", -1}} {
		for _, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
			x, err := g.Valve(spec.Engine, c.DeadCentre(end), p.r)
			if err != nil {
				t.Fatal(err)
			}
			readings = append(readings, fmt.Sprintf(`{"end": %q, "reverser": %q, "direction": %q, "gauge_mm": %.3f}`, end, p.notch, p.dir, zero+x))
		}
	}
	lap := spec.Valve.Front.SteamLap
	sess := fmt.Sprintf(`{"format": "evenbeat-session", "version": 2, "display_unit": "inch", "engine": %s,
  "measuring": {"wheel_diameter_mm": 120.65, "gauge_resolution_mm": 0.0254, "gauge_increases_toward": "front", "mark_error_tyre_mm": 0.5},
  "adjustments": [{"kind": "valve_on_spindle", "min_mm": -1.5, "max_mm": 1.5, "thread": {"tpi": 40, "flats_per_turn": 6}}],
  "cylinders": [{"name": "right", "rounds": [{"date": "2026-12-01",
    "port_marks": {"front_gauge_mm": %.3f, "back_gauge_mm": %.3f},
    "dead_centre_readings": [%s]}]}]}`, engine, zero-offMM-lap, zero-offMM+lap, strings.Join(readings, ", "))
	path := filepath.Join(t.TempDir(), "pellowmire.json")
	if err := os.WriteFile(path, []byte(sess), 0o600); err != nil {
		t.Fatal(err)
	}
	out, errOut, err := runBoth(t, "plan", "-json", path)
	if err != nil {
		t.Fatalf("%v\n%s", err, errOut)
	}
	if !strings.Contains(errOut, "evenbeat: derived: gear.stephenson.valve_centre_u = ") {
		t.Errorf("plan does not show the derived parts:\n%s", errOut)
	}
	var p struct {
		Engine       string
		IdealChanges []struct {
			Kind   string
			Amount float64
		} `json:"ideal_changes"`
	}
	if err := json.Unmarshal([]byte(out), &p); err != nil {
		t.Fatal(err)
	}
	if p.Engine != "Pellowmire" {
		t.Errorf("the plan is for %q", p.Engine)
	}
	moved := 0.0
	for _, ch := range p.IdealChanges {
		if ch.Kind == "valve_on_spindle" {
			moved = ch.Amount
		}
	}
	// The gauge reads to the thou (0.0254 mm): the plan finds the error
	// within a few of its divisions.
	if math.Abs(moved+offMM) > 0.03 {
		t.Errorf("the plan moves the valve %+.3f mm on its spindle, want about %+.3f; changes %+v", moved, -offMM, p.IdealChanges)
	}
}
