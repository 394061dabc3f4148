package session

import (
	"errors"
	"os"
	"strings"
	"testing"

	"evenbeat/setting"
)

// sessionFor wraps an engine file from testdata/engines in a small session
// with the given adjustments list.
func sessionFor(t *testing.T, engineFile, adjustments string) string {
	t.Helper()
	eng, err := os.ReadFile("../../testdata/engines/" + engineFile)
	if err != nil {
		t.Fatal(err)
	}
	return `{"format": "evenbeat-session", "version": 1, "display_unit": "mm",
  "engine": ` + string(eng) + `,
  "measuring": {"wheel_diameter_mm": 115, "gauge_resolution_mm": 0.01, "gauge_increases_toward": "front", "mark_error_deg": 0.5},
  "adjustments": [` + adjustments + `],
  "cylinders": [{"name": "right"}]}`
}

// Each gear allows the adjustments it has (valve-setting primer, section 5)
// and refuses the others, naming the field.
func TestAdjustmentsFollowTheGear(t *testing.T) {
	cases := []struct {
		name, engine, adjustments, field, says string
	}{
		{"Walschaerts return crank and radius rod", "brackenfold-walschaerts.json",
			`{"kind": "valve_on_spindle", "min_mm": -1, "max_mm": 1},
			 {"kind": "return_crank_angle", "min_deg": -5, "max_deg": 5},
			 {"kind": "radius_rod_length", "min_mm": -1, "max_mm": 1, "thread": {"pitch_mm": 0.5, "flats_per_turn": 2}},
			 {"kind": "eccentric_rod_length", "min_mm": -1, "max_mm": 1}`, "", ""},
		{"Walschaerts has no eccentric sheave", "brackenfold-walschaerts.json",
			`{"kind": "eccentric_angle", "min_deg": -5, "max_deg": 5, "sheave_diameter_mm": 30}`,
			"adjustments[0].kind", "Walschaerts gear has no eccentric angle"},
		{"Stephenson names its eccentric", "brackenfold-stephenson.json",
			`{"kind": "eccentric_rod_length", "min_mm": -1, "max_mm": 1}`,
			"adjustments[0].eccentric", "is missing"},
		{"Stephenson eccentric by name", "brackenfold-stephenson.json",
			`{"kind": "eccentric_rod_length", "eccentric": "reverse", "min_mm": -1, "max_mm": 1}`,
			"adjustments[0].eccentric", `"forward" or "backward"`},
		{"Stephenson has no return crank", "brackenfold-stephenson.json",
			`{"kind": "return_crank_angle", "min_deg": -5, "max_deg": 5}`,
			"adjustments[0].kind", "Stephenson gear has no return crank angle"},
		{"slip eccentric has no lifting link", "brackenfold-slip-eccentric.json",
			`{"kind": "lifting_link_length", "min_mm": -1, "max_mm": 1}`,
			"adjustments[0].kind", "single-eccentric gear has no lifting link length"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := Decode(strings.NewReader(sessionFor(t, c.engine, c.adjustments)))
			if c.field == "" {
				if err != nil {
					t.Fatal(err)
				}
				if len(s.Adjustments) != 4 || s.Adjustments[1].Kind != ReturnCrankAngle || s.Adjustments[1].Max != 5 {
					t.Errorf("adjustments: %+v", s.Adjustments)
				}
				return
			}
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field || !strings.Contains(e.Message, c.says) {
				t.Fatalf("got %v; want %s saying %q", err, c.field, c.says)
			}
		})
	}
}
