package session

import (
	"bytes"
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting"
)

// testJSON is a small session of an invented single-eccentric engine: every
// number is invented for these tests (no source).
const testJSON = `{
  "format": "evenbeat-session",
  "version": 1,
  "name": "Test session",
  "invented": true,
  "display_unit": "mm",
  "engine": {
    "name": "Test engine",
    "invented": true,
    "engine": {"crank_radius": 30, "rod_length": 180, "inclination": 0, "offset": 0},
    "valve": {"admission": "external",
      "front": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3},
      "back": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3}},
    "gear": {"kind": "single-eccentric", "single_eccentric": {
      "eccentric": {"throw": 6.5, "advance": 30, "rod": 250},
      "slip": false, "admission": "external", "guide": 0, "valve_centre_u": 250}},
    "notches": [{"name": "running", "reverser": 0.5}],
    "cylinders": [{"name": "left", "crank_angle": 0}, {"name": "right", "crank_angle": -90}]
  },
  "measuring": {
    "wheel_diameter_mm": 115,
    "gauge_resolution_mm": 0.01,
    "gauge_increases_toward": "front",
    "mark_error_tyre_mm": 0.5
  },
  "adjustments": [
    {"kind": "valve_on_spindle", "min_mm": -3, "max_mm": 3, "thread": {"pitch_mm": 0.5, "flats_per_turn": 6}},
    {"kind": "eccentric_angle", "min_deg": -10, "max_deg": 10, "sheave_diameter_mm": 32},
    {"kind": "eccentric_rod_length", "min_mm": -2, "max_mm": 2, "thread": {"tpi": 40, "flats_per_turn": 2}, "note": "fork end"}
  ],
  "cylinders": [
    {
      "name": "left",
      "dead_centres": [
        {"end": "front", "direction": "forward", "marks_tyre_mm": [350.1, 10.3]},
        {"end": "back", "direction": "forward", "marks_tyre_mm": [160.2, 200.4]}
      ],
      "rounds": [
        {
          "date": "2026-11-28",
          "port_marks": {"front_gauge_mm": 2.0, "back_gauge_mm": 8.0},
          "dead_centre_readings": [
            {"end": "front", "reverser": "full forward", "direction": "forward", "gauge_mm": 1.8},
            {"end": "back", "reverser": "full forward", "direction": "forward", "gauge_mm": 8.25, "note": "checked twice"}
          ],
          "sweeps": [
            {"reverser": "running", "direction": "forward", "readings": [
              {"tyre_mm": 0.2, "gauge_mm": 2.1},
              {"tyre_mm": 30.3, "gauge_mm": 3.9},
              {"tyre_mm": 60.4, "gauge_mm": 5.6},
              {"tyre_mm": 90.5, "gauge_mm": 6.9},
              {"tyre_mm": 120.6, "gauge_mm": 7.5},
              {"deg": 150, "gauge_mm": 7.2}
            ]}
          ],
          "cut_offs": [
            {"end": "front", "reverser": "full forward", "direction": "forward", "crosshead_mm": 44.5},
            {"end": "back", "reverser": "full forward", "direction": "forward", "tyre_mm": 310.0}
          ]
        },
        {
          "date": "2026-11-29",
          "adjustments_before": [{"kind": "valve_on_spindle", "change_mm": -0.025, "note": "a twelfth of a turn"}],
          "laps": {"front_lap_mm": 3, "back_lap_mm": 3, "centre_gauge_mm": 4.975},
          "dead_centre_readings": [
            {"end": "front", "reverser": 1, "direction": "forward", "gauge_mm": 1.78},
            {"end": "back", "reverser": 1, "direction": "forward", "gauge_mm": 8.19}
          ],
          "feeler_openings": [
            {"port": "front", "reverser": "full forward", "direction": "forward", "dead_centre": "front", "opening_mm": 0.2}
          ]
        }
      ]
    },
    {
      "name": "right",
      "differences": {"valve": {"front": {"steam_lap": 3.1}}},
      "note": "not yet read"
    }
  ]
}
`

func mustDecode(t testing.TB, s string) *Session {
	t.Helper()
	sess, err := Decode(strings.NewReader(s))
	if err != nil {
		t.Fatalf("Decode: %v", err)
	}
	return sess
}

func TestDecodeReadsEveryPart(t *testing.T) {
	s := mustDecode(t, testJSON)
	if s.Name != "Test session" || !s.Invented || s.DisplayUnit != UnitMM {
		t.Errorf("header: got %q %v %q", s.Name, s.Invented, s.DisplayUnit)
	}
	if s.Engine.Gear.Kind != setting.KindSingleEccentric || s.Engine.Engine.CrankRadius != 30 {
		t.Errorf("engine not read: %+v", s.Engine.Engine)
	}
	if s.Measuring.MarkError != (Mark{TyreMM, 0.5}) || s.Measuring.GaugeIncreases != Front {
		t.Errorf("measuring: %+v", s.Measuring)
	}
	if got := s.Adjustments[2].Thread.Pitch(); math.Abs(got-0.635) > 1e-12 {
		t.Errorf("40 TPI pitch = %v mm, want 0.635", got)
	}
	c := s.Cylinders[0]
	if len(c.DeadCentres) != 2 || c.DeadCentres[0].First != 350.1 || c.DeadCentres[0].Scale != TyreMM {
		t.Errorf("dead centres: %+v", c.DeadCentres)
	}
	r := c.Rounds[0]
	if r.PortMarks == nil || r.PortMarks.BackGaugeMM != 8 || r.Laps != nil {
		t.Errorf("port marks: %+v", r.PortMarks)
	}
	if r.DeadCentreReadings[0].Reverser != (ReverserPosition{Notch: FullForward}) {
		t.Errorf("reverser: %+v", r.DeadCentreReadings[0].Reverser)
	}
	if r.Sweeps[0].Readings[5].At != (Mark{Deg, 150}) {
		t.Errorf("sweep mark: %+v", r.Sweeps[0].Readings[5].At)
	}
	if r.CutOffs[0].CrossheadMM != 44.5 || r.CutOffs[0].At.Scale != "" || r.CutOffs[1].At != (Mark{TyreMM, 310}) {
		t.Errorf("cut-offs: %+v", r.CutOffs)
	}
	r1 := c.Rounds[1]
	if r1.AdjustmentsBefore[0].Amount != -0.025 || r1.Laps.CentreGaugeMM != 4.975 {
		t.Errorf("round 2: %+v", r1)
	}
	if r1.DeadCentreReadings[0].Reverser != (ReverserPosition{Value: 1}) {
		t.Errorf("numeric reverser: %+v", r1.DeadCentreReadings[0].Reverser)
	}
	if r1.FeelerOpenings[0].DeadCentre != Front || r1.FeelerOpenings[0].OpeningMM != 0.2 {
		t.Errorf("feeler: %+v", r1.FeelerOpenings[0])
	}
	if string(s.Cylinders[1].Differences.JSON()) != `{"valve":{"front":{"steam_lap":3.1}}}` {
		t.Errorf("differences: %s", s.Cylinders[1].Differences.JSON())
	}
	spec, err := s.CylinderEngine(1)
	if err != nil || spec.Valve.Front.SteamLap != 3.1 || spec.Valve.Back.SteamLap != 3 {
		t.Errorf("right cylinder's engine: %v, %+v", err, spec.Valve)
	}
}

func TestRoundTripIsExact(t *testing.T) {
	s := mustDecode(t, testJSON)
	var b1 bytes.Buffer
	if err := Encode(&b1, s); err != nil {
		t.Fatal(err)
	}
	again := mustDecode(t, b1.String())
	if !reflect.DeepEqual(s, again) {
		t.Fatalf("decode(encode(s)) != s\nfile:\n%s", b1.String())
	}
	var b2 bytes.Buffer
	if err := Encode(&b2, again); err != nil {
		t.Fatal(err)
	}
	if b1.String() != b2.String() {
		t.Errorf("encoding is not stable:\n%s\n---\n%s", b1.String(), b2.String())
	}
}

// TestRoundTripNumbers checks numbers that are hard to print: shortest
// exact forms, tiny and huge magnitudes.
func TestRoundTripNumbers(t *testing.T) {
	s := mustDecode(t, testJSON)
	vals := []float64{0.1 + 0.2, 1.0 / 3, 1e-7, -2.5e-9, 987.654321, 0.0254, -0.0}
	r := &s.Cylinders[0].Rounds[0].Sweeps[0]
	for i, v := range vals {
		r.Readings[i%len(r.Readings)].GaugeMM = v
		var b bytes.Buffer
		if err := Encode(&b, s); err != nil {
			t.Fatal(err)
		}
		again := mustDecode(t, b.String())
		if got := again.Cylinders[0].Rounds[0].Sweeps[0].Readings[i%len(r.Readings)].GaugeMM; got != v {
			t.Errorf("%v came back as %v", v, got)
		}
	}
}

func TestEncodeRefusesBadValues(t *testing.T) {
	cases := []struct {
		name  string
		edit  func(s *Session)
		field string
	}{
		{"NaN gauge", func(s *Session) { s.Cylinders[0].Rounds[0].Sweeps[0].Readings[2].GaugeMM = math.NaN() }, "cylinders[0].rounds[0].sweeps[0].readings[2].gauge_mm"},
		{"Inf wheel", func(s *Session) { s.Measuring.WheelDiameterMM = math.Inf(1) }, "measuring.wheel_diameter_mm"},
		{"unknown unit", func(s *Session) { s.DisplayUnit = "furlong" }, "display_unit"},
		{"unknown end", func(s *Session) { s.Cylinders[0].Rounds[0].DeadCentreReadings[0].End = "middle" }, "cylinders[0].rounds[0].dead_centre_readings[0].end"},
		{"negative wheel", func(s *Session) { s.Measuring.WheelDiameterMM = -3 }, "measuring.wheel_diameter_mm"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s := mustDecode(t, testJSON)
			c.edit(s)
			var b bytes.Buffer
			err := Encode(&b, s)
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field {
				t.Fatalf("got %v, want an error on %s", err, c.field)
			}
			if b.Len() != 0 {
				t.Errorf("wrote %d bytes despite the error", b.Len())
			}
		})
	}
}

func TestVersionAndFormatRefused(t *testing.T) {
	cases := []struct {
		name, from, to, field, msg string
	}{
		{"newer version", `"version": 1,`, `"version": 3,`, "version",
			"This file was written by a newer Evenbeat (session version 3); this version reads versions 1 to 2. Update the app."},
		{"newer version, rest unreadable", `"display_unit": "mm",`, `"display_unit": "mm", "future_field": {"x": [1, 2]},`, "", ""},
		{"version zero", `"version": 1,`, `"version": 0,`, "version", "Version 0 is not a session version; versions start at 1."},
		{"version text", `"version": 1,`, `"version": "1",`, "version", "The version must be a whole number, got the text \"1\"."},
		{"version fraction", `"version": 1,`, `"version": 1.5,`, "version", "The version must be a whole number, got the number 1.5."},
		{"no version", `"version": 1,`, ``, "version", ""},
		{"engine file", `"format": "evenbeat-session"`, `"format": "evenbeat-engine"`, "format",
			"This is an Evenbeat engine file, not a session; open it where engine files are read."},
		{"other format", `"format": "evenbeat-session"`, `"format": "gpx"`, "format", ""},
		{"no format", `"format": "evenbeat-session",`, ``, "format", ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := strings.Replace(testJSON, c.from, c.to, 1)
			if c.name == "newer version, rest unreadable" {
				in = strings.Replace(in, `"version": 1,`, `"version": 3,`, 1)
				c.field = "version"
				c.msg = "This file was written by a newer Evenbeat (session version 3); this version reads versions 1 to 2. Update the app."
			}
			s, err := Decode(strings.NewReader(in))
			if s != nil {
				t.Fatal("a session came back with the error: the file was half-read")
			}
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field {
				t.Fatalf("got %v, want an error on %q", err, c.field)
			}
			if c.msg != "" && e.Message != c.msg {
				t.Errorf("message\n got %q\nwant %q", e.Message, c.msg)
			}
		})
	}
}

// The engine's design (the lead its drawing asks for and the parts derived
// from it) travels inside the session's engine object, in version 2: read
// and written back exactly, and refused by the engine reader's rules,
// named under "engine.".
func TestEngineDesignRoundTrip(t *testing.T) {
	s := mustDecode(t, testJSON)
	s.Engine.Design = &setting.Design{Lead: 0.2, Derived: []string{"gear.single_eccentric.valve_centre_u"}}
	var b bytes.Buffer
	if err := Encode(&b, s); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), `"design": {`) || !strings.Contains(b.String(), `"version": 2,`) {
		t.Fatalf("the design is not written in a version 2 file:\n%s", b.String())
	}
	again := mustDecode(t, b.String())
	if !reflect.DeepEqual(s, again) {
		t.Fatalf("the design did not come back: %+v", again.Engine.Design)
	}
	bad := strings.Replace(b.String(), `"lead": 0.2`, `"lead": 0.2, "derivd": []`, 1)
	_, err := Decode(strings.NewReader(bad))
	var e *setting.Error
	if !errors.As(err, &e) || e.Field != "engine.design.derivd" || !strings.Contains(e.Message, `did you mean "derived"`) {
		t.Errorf("a misspelt design key: got %v", err)
	}
}
