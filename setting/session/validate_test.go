package session

import (
	"errors"
	"strings"
	"testing"
	"unicode"

	"evenbeat/setting"
)

// TestDecodeNamesTheField changes one value of the test session at a time
// and checks that Decode refuses it, naming the field, in a full sentence.
func TestDecodeNamesTheField(t *testing.T) {
	cases := []struct {
		name, from, to, field, says string
	}{
		// the file itself
		{"not an object", testJSON, `[1, 2]`, "", "one JSON object"},
		{"empty", testJSON, ` `, "", "empty"},
		{"cut short", testJSON, testJSON[:200], "", "ends too early"},
		{"syntax", `"name": "Test session",`, `"name": "Test session",,`, "", "line 4"},
		{"trailing text", testJSON, testJSON + "{}", "", "more text after its end"},
		{"duplicate key", `"invented": true,
  "display_unit"`, `"invented": true, "invented": false,
  "display_unit"`, "invented", "written twice"},
		{"unknown top field", `"invented": true,
  "display_unit"`, `"invented": true, "colour": "red",
  "display_unit"`, "colour", "not part of a session"},
		{"misspelt field", `{"tyre_mm": 30.3, "gauge_mm": 3.9}`, `{"tyre_mm": 30.3, "guage_mm": 3.9}`,
			"cylinders[0].rounds[0].sweeps[0].readings[1].guage_mm", `did you mean "gauge_mm"`},
		{"odd key quoted", `"invented": true,
  "display_unit"`, `"invented": true, "a b": 1,
  "display_unit"`, `"a b"`, "not part of"},
		// header fields
		{"name type", `"name": "Test session"`, `"name": 7`, "name", "must be text"},
		{"invented type", `"invented": true,
  "display_unit"`, `"invented": "yes",
  "display_unit"`, "invented", "true or false"},
		{"display unit", `"display_unit": "mm"`, `"display_unit": "cm"`, "display_unit", `"mm" or "inch"`},
		{"no display unit", `"display_unit": "mm",`, ``, "display_unit", "is missing"},
		// engine, through the engine decoder
		{"engine rod", `"rod_length": 180`, `"rod_length": 20`, "engine.engine.rod_length", "shorter than the crank radius"},
		{"engine unknown key", `"inclination": 0,`, `"inclination": 0, "stroke": 60,`, "engine.engine.stroke", "not known"},
		{"engine not object", testJSON, `{"format": "evenbeat-session", "version": 1, "display_unit": "mm", "engine": 5}`, "engine", "engine object"},
		{"differences bad", `{"valve": {"front": {"steam_lap": 3.1}}}`, `{"valve": {"front": {"steam_lap": "a"}}}`,
			"cylinders[1].differences.valve.front.steam_lap", "number"},
		{"differences not object", `{"valve": {"front": {"steam_lap": 3.1}}}`, `[1]`, "cylinders[1].differences", "must be an object"},
		// measuring
		{"wheel NaN text", `"wheel_diameter_mm": 115`, `"wheel_diameter_mm": "NaN"`, "measuring.wheel_diameter_mm",
			`The wheel diameter must be a number (the tyre diameter where the marks are measured, in mm), got the text "NaN".`},
		{"wheel zero", `"wheel_diameter_mm": 115`, `"wheel_diameter_mm": 0`, "measuring.wheel_diameter_mm", "more than zero"},
		{"wheel huge", `"wheel_diameter_mm": 115`, `"wheel_diameter_mm": 1e400`, "measuring.wheel_diameter_mm", "too large"},
		{"wheel missing", `"wheel_diameter_mm": 115,`, ``, "measuring.wheel_diameter_mm", "is missing"},
		{"wheel tiny", `"wheel_diameter_mm": 115`, `"wheel_diameter_mm": 1e-300`, "measuring.wheel_diameter_mm", "not the size of any wheel"},
		{"mark error huge", `"mark_error_tyre_mm": 0.5`, `"mark_error_tyre_mm": 1e300`, "measuring.mark_error_tyre_mm", "more than half the way round"},
		{"resolution", `"gauge_resolution_mm": 0.01`, `"gauge_resolution_mm": 25`, "measuring.gauge_resolution_mm", "not a dial-gauge division"},
		{"gauge direction", `"gauge_increases_toward": "front"`, `"gauge_increases_toward": "up"`, "measuring.gauge_increases_toward", `"front" or "back"`},
		{"mark error both", `"mark_error_tyre_mm": 0.5`, `"mark_error_tyre_mm": 0.5, "mark_error_deg": 0.5`, "measuring.mark_error_deg", "only once"},
		{"mark error none", `,
    "mark_error_tyre_mm": 0.5`, ``, "measuring", "Give the error of one mark"},
		{"mark error deg zero", `"mark_error_tyre_mm": 0.5`, `"mark_error_deg": 0`, "measuring.mark_error_deg", "more than zero"},
		// adjustments
		{"adjustment kind", `{"kind": "valve_on_spindle"`, `{"kind": "valve_spindle"`, "adjustments[0].kind", "must be one of"},
		{"adjustment min positive", `"min_mm": -3`, `"min_mm": 1`, "adjustments[0].min_mm", "between -100000 and 0"},
		{"adjustment wrong unit", `"min_deg": -10, "max_deg": 10`, `"min_mm": -10, "max_mm": 10`, "adjustments[1].min_mm", "set in degrees"},
		{"adjustment no range", `"min_mm": -3, "max_mm": 3`, `"min_mm": 0, "max_mm": 0`, "adjustments[0]", "Both min_mm and max_mm are zero"},
		{"adjustment twice", `{"kind": "eccentric_angle"`, `{"kind": "valve_on_spindle", "min_mm": -1, "max_mm": 1}, {"kind": "eccentric_angle"`, "adjustments[1]", "listed twice"},
		{"thread both", `"pitch_mm": 0.5,`, `"pitch_mm": 0.5, "tpi": 40,`, "adjustments[0].thread.tpi", "only once"},
		{"thread flats", `"flats_per_turn": 6`, `"flats_per_turn": 6.5`, "adjustments[0].thread.flats_per_turn", "whole number"},
		{"thread on angle", `"sheave_diameter_mm": 32`, `"sheave_diameter_mm": 32, "thread": {"pitch_mm": 1, "flats_per_turn": 6}`, "adjustments[1].thread", "not made on a thread"},
		{"no sheave", `, "sheave_diameter_mm": 32`, ``, "adjustments[1].sheave_diameter_mm", "is missing"},
		{"sheave on spindle", `"max_mm": 3, "thread"`, `"max_mm": 3, "sheave_diameter_mm": 30, "thread"`, "adjustments[0].sheave_diameter_mm", "Only an eccentric_angle"},
		{"eccentric on single", `{"kind": "eccentric_angle"`, `{"kind": "eccentric_angle", "eccentric": "forward"`, "adjustments[1].eccentric", "no choice of eccentric"},
		{"radius rod on single", `{"kind": "eccentric_angle", "min_deg": -10, "max_deg": 10, "sheave_diameter_mm": 32}`, `{"kind": "radius_rod_length", "min_mm": -1, "max_mm": 1}`, "adjustments[1].kind", "single-eccentric gear has no radius rod length"},
		// cylinders
		{"no cylinders", testJSON[strings.Index(testJSON, `  "cylinders": [
    {`):], `  "cylinders": []
}`, "cylinders", "at least one cylinder"},
		{"cylinder name missing", `"name": "right",
      "differences"`, `"differences"`, "cylinders[1].name", "is missing"},
		{"cylinder name twice", `"name": "right",
      "differences"`, `"name": "Left",
      "differences"`, "cylinders[1].name", "already used"},
		{"cylinder not in engine", `"name": "right",
      "differences"`, `"name": "middle",
      "differences"`, "cylinders[1].name", `no cylinder called "middle"`},
		{"dead centre one mark", `[350.1, 10.3]`, `[350.1]`, "cylinders[0].dead_centres[0].marks_tyre_mm", "exactly two marks"},
		{"dead centre mark text", `[350.1, 10.3]`, `[350.1, "ten"]`, "cylinders[0].dead_centres[0].marks_tyre_mm[1]", "must be a number"},
		{"dead centre twice", `{"end": "back", "direction": "forward", "marks_tyre_mm"`, `{"end": "front", "direction": "forward", "marks_tyre_mm"`, "cylinders[0].dead_centres[1]", "given twice"},
		{"dead centre both scales", `"marks_tyre_mm": [160.2, 200.4]`, `"marks_tyre_mm": [160.2, 200.4], "marks_deg": [1, 2]`, "cylinders[0].dead_centres[1].marks_deg", "only once"},
		{"mark far", `[160.2, 200.4]`, `[160.2, 2e9]`, "cylinders[0].dead_centres[1].marks_tyre_mm[1]", "too far from the datum"},
		// rounds
		{"date", `"date": "2026-11-28"`, `"date": "28/11/2026"`, "cylinders[0].rounds[0].date", "cannot be read"},
		{"date missing", `"date": "2026-11-28",`, ``, "cylinders[0].rounds[0].date", "is missing"},
		{"marks and laps", `"port_marks": {"front_gauge_mm": 2.0, "back_gauge_mm": 8.0},`, `"port_marks": {"front_gauge_mm": 2.0, "back_gauge_mm": 8.0}, "laps": {"front_lap_mm": 3, "back_lap_mm": 3, "centre_gauge_mm": 5},`, "cylinders[0].rounds[0].laps", "not both"},
		{"port mark missing", `{"front_gauge_mm": 2.0, "back_gauge_mm": 8.0}`, `{"front_gauge_mm": 2.0}`, "cylinders[0].rounds[0].port_marks.back_gauge_mm", "is missing"},
		{"lap huge", `"front_lap_mm": 3,`, `"front_lap_mm": 3000,`, "cylinders[0].rounds[1].laps.front_lap_mm", "between"},
		{"dead-centre end", `{"end": "back", "reverser": "full forward", "direction": "forward", "gauge_mm": 8.25`, `{"end": "rear", "reverser": "full forward", "direction": "forward", "gauge_mm": 8.25`, "cylinders[0].rounds[0].dead_centre_readings[1].end", `"front" or "back"`},
		{"reverser unknown notch", `"reverser": "running"`, `"reverser": "second notch"`, "cylinders[0].rounds[0].sweeps[0].reverser", `"full forward", "mid gear", "full back" or "running"`},
		{"reverser range", `"reverser": 1, "direction": "forward", "gauge_mm": 1.78`, `"reverser": 1.2, "direction": "forward", "gauge_mm": 1.78`, "cylinders[0].rounds[1].dead_centre_readings[0].reverser", "from -1"},
		{"reverser type", `"reverser": 1, "direction": "forward", "gauge_mm": 1.78`, `"reverser": true, "direction": "forward", "gauge_mm": 1.78`, "cylinders[0].rounds[1].dead_centre_readings[0].reverser", "notch name"},
		{"direction", `"reverser": "running", "direction": "forward"`, `"reverser": "running", "direction": "ahead"`, "cylinders[0].rounds[0].sweeps[0].direction", `"forward" or "backward"`},
		{"gauge NaN", `{"tyre_mm": 90.5, "gauge_mm": 6.9}`, `{"tyre_mm": 90.5, "gauge_mm": "NaN"}`, "cylinders[0].rounds[0].sweeps[0].readings[3].gauge_mm",
			`The gauge reading must be a number (the gauge reading in mm), got the text "NaN".`},
		{"gauge null", `{"tyre_mm": 90.5, "gauge_mm": 6.9}`, `{"tyre_mm": 90.5, "gauge_mm": null}`, "cylinders[0].rounds[0].sweeps[0].readings[3].gauge_mm", "got null"},
		{"sweep reading no place", `{"tyre_mm": 90.5, "gauge_mm": 6.9}`, `{"gauge_mm": 6.9}`, "cylinders[0].rounds[0].sweeps[0].readings[3]", `"tyre_mm" or "deg"`},
		{"sweep reading dead centre", `{"tyre_mm": 90.5, "gauge_mm": 6.9}`, `{"dead_centre": "front", "gauge_mm": 6.9}`, "cylinders[0].rounds[0].sweeps[0].readings[3].dead_centre", "not part of a sweep reading"},
		{"sweep empty", `{"reverser": "running", "direction": "forward", "readings": [`, `{"reverser": "running", "direction": "forward", "readings": []}, {"reverser": "running", "direction": "forward", "readings": [`, "cylinders[0].rounds[0].sweeps[0].readings", "list is empty"},
		{"sweeps not list", `"sweeps": [`, `"sweeps": {"a": [`, "", "not valid JSON"},
		{"cut-off beyond stroke", `"crosshead_mm": 44.5`, `"crosshead_mm": 60`, "cylinders[0].rounds[0].cut_offs[0].crosshead_mm", "not less than the stroke (60 mm)"},
		{"cut-off zero", `"crosshead_mm": 44.5`, `"crosshead_mm": 0`, "cylinders[0].rounds[0].cut_offs[0].crosshead_mm", "dead centre itself"},
		{"cut-off two places", `"crosshead_mm": 44.5`, `"crosshead_mm": 44.5, "tyre_mm": 100`, "cylinders[0].rounds[0].cut_offs[0].crosshead_mm", "only once"},
		{"feeler port", `{"port": "front"`, `{"port": "steam"`, "cylinders[0].rounds[1].feeler_openings[0].port", "must be one of"},
		{"feeler crosshead", `"dead_centre": "front", "opening_mm"`, `"crosshead_mm": 10, "opening_mm"`, "cylinders[0].rounds[1].feeler_openings[0].crosshead_mm", "not part of a feeler opening"},
		{"change not listed", `{"kind": "valve_on_spindle", "change_mm"`, `{"kind": "lifting_link_length", "change_mm"`, "cylinders[0].rounds[1].adjustments_before[0].kind", "no lifting_link_length"},
		{"change wrong unit", `"change_mm": -0.025`, `"change_deg": -0.025`, "cylinders[0].rounds[1].adjustments_before[0].change_deg", "given in mm"},
		{"note type", `"note": "checked twice"`, `"note": ["checked", "twice"]`, "cylinders[0].rounds[0].dead_centre_readings[1].note", "must be text"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if !strings.Contains(testJSON, c.from) {
				t.Fatalf("test session has no %q", c.from)
			}
			in := strings.Replace(testJSON, c.from, c.to, 1)
			s, err := Decode(strings.NewReader(in))
			if s != nil || err == nil {
				t.Fatalf("decoded without error")
			}
			var e *setting.Error
			if !errors.As(err, &e) {
				t.Fatalf("error %T %v is not a *setting.Error", err, err)
			}
			if e.Field != c.field {
				t.Errorf("field %q, want %q (%s)", e.Field, c.field, e.Message)
			}
			if !strings.Contains(e.Message, c.says) {
				t.Errorf("message %q does not say %q", e.Message, c.says)
			}
			fullSentence(t, e.Message)
		})
	}
}

// fullSentence fails unless msg starts with a capital and ends with a full
// stop.
func fullSentence(t *testing.T, msg string) {
	t.Helper()
	r := []rune(msg)
	if len(r) == 0 || !unicode.IsUpper(r[0]) || !strings.HasSuffix(msg, ".") {
		t.Errorf("not a full sentence: %q", msg)
	}
}

// Regression: a file of many nested lists must be refused with a message,
// not exhaust the reader's stack.
func TestDeepNestingRefused(t *testing.T) {
	for _, in := range []string{strings.Repeat("[", 100000), `{"format": "evenbeat-session", "version": 1, "note": ` + strings.Repeat(`{"a":`, 5000) + "1" + strings.Repeat("}", 5000) + "}"} {
		_, err := Decode(strings.NewReader(in))
		var e *setting.Error
		if !errors.As(err, &e) || !strings.Contains(e.Message, "nests lists and objects more than 64 deep") {
			t.Errorf("got %v", err)
		}
	}
}

// TestListBounds: lists beyond the bounds format.md states are refused
// with a sentence naming the list and the bound; at the bound they read.
func TestListBounds(t *testing.T) {
	reading := `{"tyre_mm": 30.3, "gauge_mm": 3.9}`
	readings := func(n int) string {
		return strings.TrimSuffix(strings.Repeat(`{"deg": 10, "gauge_mm": 3.9}, `, n), ", ")
	}
	dcr := `{"end": "front", "reverser": "full forward", "direction": "forward", "gauge_mm": 1.8}`
	cases := []struct {
		name, from, to, field, says string
	}{
		{"sweep readings", reading, readings(MaxSweepReadings + 1), "cylinders[0].rounds[0].sweeps[0].readings", "at most 720"},
		{"round readings", dcr, strings.Repeat(dcr+", ", MaxRoundReadings) + dcr, "cylinders[0].rounds[0].dead_centre_readings", "at most 2000"},
		{"round readings together", reading, readings(MaxSweepReadings-6) + `]}, {"reverser": "running", "direction": "forward", "readings": [` + readings(MaxSweepReadings) + `]}, {"reverser": "running", "direction": "forward", "readings": [` + readings(MaxSweepReadings-4),
			"cylinders[0].rounds[0]", "readings; a round holds at most 2000"},
		{"changes", `{"kind": "valve_on_spindle", "change_mm": -0.025, "note": "a twelfth of a turn"}`,
			strings.Repeat(`{"kind": "valve_on_spindle", "change_mm": 0}, `, MaxChanges) + `{"kind": "valve_on_spindle", "change_mm": 0}`, "cylinders[0].rounds[1].adjustments_before", "at most 50"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if !strings.Contains(testJSON, c.from) {
				t.Fatalf("test session has no %q", c.from)
			}
			_, err := Decode(strings.NewReader(strings.Replace(testJSON, c.from, c.to, 1)))
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field || !strings.Contains(e.Message, c.says) {
				t.Fatalf("got %v, want an error on %s saying %q", err, c.field, c.says)
			}
			fullSentence(t, e.Message)
		})
	}
	// At the bound a sweep reads.
	if _, err := Decode(strings.NewReader(strings.Replace(testJSON, reading, readings(MaxSweepReadings-5), 1))); err != nil {
		t.Errorf("a sweep of %d readings: %v", MaxSweepReadings, err)
	}
	// Rounds and cylinders.
	s := mustDecode(t, testJSON)
	r := s.Cylinders[0].Rounds[1]
	for len(s.Cylinders[0].Rounds) <= MaxRounds {
		s.Cylinders[0].Rounds = append(s.Cylinders[0].Rounds, r)
	}
	// Encode checks what it writes as Decode reads it: a session beyond a
	// bound is never written.
	var b strings.Builder
	err := Encode(&b, s)
	var e *setting.Error
	if !errors.As(err, &e) || e.Field != "cylinders[0].rounds" || !strings.Contains(e.Message, "at most 200") {
		t.Errorf("%d rounds: %v, want the bound", len(s.Cylinders[0].Rounds), err)
	}
}
