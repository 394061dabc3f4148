package session

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting"
)

// example reads the example session (two rounds of the right cylinder).
func example(t *testing.T) *Session {
	t.Helper()
	_, s := readFile(t, examplePath)
	return s
}

// roundTrip writes s and reads it back, failing unless it comes back the
// same.
func roundTrip(t *testing.T, s *Session) string {
	t.Helper()
	var b bytes.Buffer
	if err := Encode(&b, s); err != nil {
		t.Fatal(err)
	}
	again := mustDecode(t, b.String())
	if !reflect.DeepEqual(s, again) {
		t.Fatalf("the session with its history did not read back the same:\n%s", b.String())
	}
	return b.String()
}

// A connecting rod measured again after two rounds: every reading is kept,
// the history records the one value changed, and the file holds it.
func TestEditRodLengthKeepsReadings(t *testing.T) {
	s := example(t)
	readings := fmt.Sprint(s.Cylinders)
	p := s.Profile()
	p.Engine.Engine.RodLength = 134
	changes, err := s.Edit(p, "2026-12-01")
	if err != nil {
		t.Fatal(err)
	}
	want := []EngineChange{{Date: "2026-12-01", Key: "engine.engine.rod_length", Before: "132", After: "134"}}
	if !reflect.DeepEqual(changes, want) || !reflect.DeepEqual(s.EngineChanges, want) {
		t.Fatalf("changes %+v, history %+v; want %+v", changes, s.EngineChanges, want)
	}
	if s.Engine.Engine.RodLength != 134 {
		t.Errorf("the rod length is %g after the edit", s.Engine.Engine.RodLength)
	}
	if fmt.Sprint(s.Cylinders) != readings {
		t.Error("the edit changed the readings")
	}
	if len(s.Cylinders[0].Rounds) != 2 {
		t.Errorf("%d rounds after the edit, want 2", len(s.Cylinders[0].Rounds))
	}
	text := roundTrip(t, s)
	if !strings.Contains(text, `"engine_changes": [`) || !strings.Contains(text, `"key": "engine.engine.rod_length"`) {
		t.Errorf("the history is not in the file:\n%s", text)
	}
	if again, err := s.Edit(s.Profile(), "2026-12-02"); err != nil || again != nil || len(s.EngineChanges) != 1 {
		t.Errorf("an edit changing nothing: %v, %v; history %d long", again, err, len(s.EngineChanges))
	}
}

// The display unit changed: one record, the word before and after.
func TestEditUnitRecordsOne(t *testing.T) {
	s := example(t)
	p := s.Profile()
	p.DisplayUnit = UnitMM
	changes, err := s.Edit(p, "2026-12-01T09:30:00Z")
	if err != nil {
		t.Fatal(err)
	}
	want := []EngineChange{{Date: "2026-12-01T09:30:00Z", Key: "display_unit", Before: `"inch"`, After: `"mm"`}}
	if !reflect.DeepEqual(changes, want) || s.DisplayUnit != UnitMM {
		t.Fatalf("changes %+v (unit %s), want %+v", changes, s.DisplayUnit, want)
	}
	roundTrip(t, s)
}

// An adjuster's thread given again and one added: each value is a record,
// by its key in the file.
func TestEditAdjustments(t *testing.T) {
	s := example(t)
	p := s.Profile()
	p.Adjustments[0].Thread = Thread{TPI: 32, FlatsPerTurn: 6}
	p.Adjustments = append(p.Adjustments, Adjustment{Kind: LiftingLinkLength, Min: -2, Max: 2})
	changes, err := s.Edit(p, "2026-12-01")
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, c := range changes {
		got = append(got, c.Key+" "+c.Before+" -> "+c.After)
	}
	want := []string{
		"adjustments[0].thread.pitch_mm 0.7 -> ",
		"adjustments[0].thread.tpi  -> 32",
		"adjustments[5].kind  -> \"lifting_link_length\"",
		"adjustments[5].min_mm  -> -2",
		"adjustments[5].max_mm  -> 2",
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("changes\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	roundTrip(t, s)
}

// designed returns the example with its engine designed: every part the
// gear derives derived from a lead of 0.25 mm.
func designed(t *testing.T) *Session {
	t.Helper()
	s := example(t)
	s.Engine.Design = &setting.Design{Lead: 0.25, Derived: setting.DerivableKeys(setting.KindStephenson)}
	if err := setting.Derive(&s.Engine, s.Engine.Design.Aims()); err != nil {
		t.Fatal(err)
	}
	return s
}

// With a design, a measured dimension changed derives the derived parts
// again: the setter's change is one record, each derived part that moved
// another, marked derived; the parts are those Derive gives the new
// engine.
func TestEditDerivesAgain(t *testing.T) {
	s := designed(t)
	p := s.Profile()
	p.Engine.Gear.Stephenson.Forward.Throw = 5.5
	changes, err := s.Edit(p, "2026-12-01")
	if err != nil {
		t.Fatal(err)
	}
	mine := 0
	for _, c := range changes {
		if !c.Derived {
			mine++
			if c.Key != "engine.gear.stephenson.forward.throw" {
				t.Errorf("a change not derived: %+v", c)
			}
			continue
		}
		if !strings.HasPrefix(c.Key, "engine.") || !contains(setting.DerivableKeys(setting.KindStephenson), c.Key[len("engine."):]) {
			t.Errorf("a derived change of a part not derived: %+v", c)
		}
	}
	if mine != 1 || len(changes) < 2 {
		t.Fatalf("changes %+v: want the throw and the derived parts it moved", changes)
	}
	want := s.Engine.Clone()
	if err := setting.Derive(&want, want.Design.Aims()); err != nil {
		t.Fatal(err)
	}
	for _, key := range setting.DerivableKeys(setting.KindStephenson) {
		if got, w := *s.Engine.Number(key), *want.Number(key); math.Abs(got-w) > 1e-6 {
			t.Errorf("%s = %v after the edit, Derive gives %v", key, got, w)
		}
	}
	roundTrip(t, s)
}

// A derived value the setter changes is theirs from then on: out of the
// derived list, kept as given while the rest is derived around it.
func TestEditOfDerivedValueOverrides(t *testing.T) {
	s := designed(t)
	const key = "gear.stephenson.forward.advance"
	p := s.Profile()
	*p.Engine.Number(key) = 27.5
	changes, err := s.Edit(p, "2026-12-01")
	if err != nil {
		t.Fatal(err)
	}
	if contains(s.Engine.Design.Derived, key) {
		t.Errorf("%s is still listed as derived: %v", key, s.Engine.Design.Derived)
	}
	if got := *s.Engine.Number(key); got != 27.5 {
		t.Errorf("the advance given is %v after the edit", got)
	}
	found := map[string]EngineChange{}
	for _, c := range changes {
		found[c.Key] = c
	}
	if c, ok := found["engine."+key]; !ok || c.Derived || c.After != "27.5" {
		t.Errorf("the override is recorded as %+v", c)
	}
	if c, ok := found["engine.design.derived"]; !ok || c.Derived || strings.Contains(c.After, key) || !strings.Contains(c.Before, key) {
		t.Errorf("the derived list's change is recorded as %+v", c)
	}
	roundTrip(t, s)
}

// An edit the readings or the engine cannot take is refused naming the
// field, and the session is left as it was.
func TestEditRefused(t *testing.T) {
	cases := []struct {
		name  string
		edit  func(p *Profile)
		date  string
		field string
	}{
		{"rod shorter than the crank", func(p *Profile) { p.Engine.Engine.RodLength = 10 }, "2026-12-01", "engine.engine.rod_length"},
		{"a notch the readings use taken out", func(p *Profile) { p.Engine.Notches = nil }, "2026-12-01", "plan_aims.running_notch"},
		{"an adjustment a change was made with taken out", func(p *Profile) { p.Adjustments = p.Adjustments[1:] }, "2026-12-01", "cylinders[0].rounds[1].adjustments_before[0].kind"},
		{"no unit", func(p *Profile) { p.DisplayUnit = "" }, "2026-12-01", "display_unit"},
		{"a bad date", func(p *Profile) { p.DisplayUnit = UnitMM }, "1 December", "date"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s := example(t)
			was := fmt.Sprintf("%+v", *s)
			p := s.Profile()
			c.edit(&p)
			_, err := s.Edit(p, c.date)
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field {
				t.Fatalf("got %v, want an error on %s", err, c.field)
			}
			fullSentence(t, e.Message)
			if fmt.Sprintf("%+v", *s) != was {
				t.Error("a refused edit changed the session")
			}
		})
	}
}

// The history holds at most MaxEngineChanges records: an edit past it
// lets go of the oldest.
func TestEditKeepsTheHistoryBounded(t *testing.T) {
	s := example(t)
	for i := range MaxEngineChanges {
		s.EngineChanges = append(s.EngineChanges, EngineChange{Date: "2026-11-30", Key: "engine.name", Before: fmt.Sprintf(`"%d"`, i), After: fmt.Sprintf(`"%d"`, i+1)})
	}
	p := s.Profile()
	p.DisplayUnit = UnitMM
	if _, err := s.Edit(p, "2026-12-01"); err != nil {
		t.Fatal(err)
	}
	if n := len(s.EngineChanges); n != MaxEngineChanges || s.EngineChanges[0].Before != `"1"` || s.EngineChanges[n-1].Key != "display_unit" {
		t.Errorf("history of %d, first %+v, last %+v", n, s.EngineChanges[0], s.EngineChanges[n-1])
	}
	roundTrip(t, s)
}

// The reader checks the history's records: a date, a key path of the
// profile, one value (not an object), before or after.
func TestHistoryRefused(t *testing.T) {
	base := strings.TrimSuffix(strings.TrimSpace(testJSON), "}") + `, "engine_changes": [%s]}`
	cases := []struct {
		name, record, field, says string
	}{
		{"no date", `{"key": "display_unit", "before": "mm", "after": "inch"}`, "engine_changes[0].date", "missing"},
		{"bad date", `{"date": "yesterday", "key": "display_unit", "after": "inch"}`, "engine_changes[0].date", "yesterday"},
		{"a reading's key", `{"date": "2026-12-01", "key": "cylinders[0].rounds[0].port_marks.front_gauge_mm", "after": 1}`, "engine_changes[0].key", "not a value of the engine's history"},
		{"an object", `{"date": "2026-12-01", "key": "engine.engine", "after": {"rod_length": 1}}`, "engine_changes[0].after", "one value"},
		{"neither", `{"date": "2026-12-01", "key": "display_unit"}`, "engine_changes[0]", "neither"},
		{"a misspelt key", `{"date": "2026-12-01", "key": "display_unit", "afer": "mm"}`, "engine_changes[0].afer", `did you mean "after"`},
		{"derived not a mark", `{"date": "2026-12-01", "key": "display_unit", "after": "mm", "derived": 1}`, "engine_changes[0].derived", "true or false"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Decode(strings.NewReader(fmt.Sprintf(base, c.record)))
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field || !strings.Contains(e.Message, c.says) {
				t.Fatalf("got %v, want %s saying %q", err, c.field, c.says)
			}
			fullSentence(t, e.Message)
		})
	}
	many := strings.Repeat(`{"date": "2026-12-01", "key": "display_unit", "after": "mm"}, `, MaxEngineChanges) + `{"date": "2026-12-01", "key": "display_unit", "after": "mm"}`
	_, err := Decode(strings.NewReader(fmt.Sprintf(base, many)))
	if err == nil || !strings.Contains(err.Error(), fmt.Sprintf("at most %d", MaxEngineChanges)) {
		t.Errorf("a history of %d records: got %v", MaxEngineChanges+1, err)
	}
	ok := `{"date": "2026-12-01", "key": "engine.design.derived", "before": ["gear.single_eccentric.valve_centre_u"], "after": [], "derived": true}`
	s, err := Decode(strings.NewReader(fmt.Sprintf(base, ok)))
	if err != nil || len(s.EngineChanges) != 1 || s.EngineChanges[0].After != "[]" || !s.EngineChanges[0].Derived {
		t.Errorf("a list of words as a value: %+v, %v", s, err)
	}
}

// The keys a history record may have: the profile's key paths.
func TestHistoryKeys(t *testing.T) {
	for key, want := range map[string]bool{
		"display_unit": true, "engine.engine.rod_length": true, "engine.notches[0].reverser": true,
		"adjustments[12].thread.tpi": true, "measuring.wheel_diameter_mm": true, "engine.design.derived": true,
		"": false, "engine": false, "name": false, "cylinders[0].name": false, "adjustments.min_mm": false,
		"adjustments[].min_mm": false, "adjustments[x].min_mm": false, "engine..name": false, "engine.Name": false,
		"engine.notches[0": false, "measuring.wheel diameter": false, "plan_aims.priority": false,
	} {
		if got := historyKey(key); got != want {
			t.Errorf("historyKey(%q) = %v, want %v", key, got, want)
		}
	}
}

// Another gear: the old gear's derived parts leave the design's list, the
// new gear's listed are derived, and the readings stay.
func TestEditChangesTheGear(t *testing.T) {
	s := designed(t)
	p := s.Profile()
	w := setting.DemoWalschaerts()
	p.Engine.Gear, p.Engine.Valve = w.Gear, w.Valve
	p.Engine.Design.Derived = append(p.Engine.Design.Derived, "gear.walschaerts.valve_centre_u")
	p.Adjustments = p.Adjustments[:1] // the valve on its spindle: the only one Walschaerts gear shares
	s.Cylinders[0].Rounds[1].AdjustmentsBefore = nil
	changes, err := s.Edit(p, "2026-12-01")
	if err != nil {
		t.Fatal(err)
	}
	if got := s.Engine.Design.Derived; !reflect.DeepEqual(got, []string{"gear.walschaerts.valve_centre_u"}) {
		t.Errorf("derived after the change of gear: %v", got)
	}
	if len(changes) == 0 || len(s.Cylinders[0].Rounds) != 2 {
		t.Errorf("%d changes, %d rounds", len(changes), len(s.Cylinders[0].Rounds))
	}
	roundTrip(t, s)
}
