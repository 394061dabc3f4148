package ui

import (
	"math"
	"strings"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// allFields returns every field the app asks, for each demo engine: the
// set-up values (and those of a new engine of each gear, with what its
// design works out), every reading of a first and a later round in both forms
// of the steam edges and the cut-offs, and the target lead.
func allFields(t *testing.T) []field {
	t.Helper()
	var fs []field
	for _, spec := range setting.DemoEngines() {
		s := newSession(spec, session.UnitMM)
		s.Cylinders[0].Rounds = []session.Round{{Date: "2026-11-21"}, {Date: "2026-11-22"}}
		su := newSetUp(false)
		fs = append(fs, setupFields(s, &su)...)
		blank := blankSession(spec.Gear.Kind)
		fs = append(fs, setupFields(blank, &su)...)
		fs = append(fs, derivedFields(blank)...)
		for ri := range 2 {
			for _, other := range []bool{false, true} {
				fs = append(fs, measureFields(s, 0, ri, other, other)...)
			}
		}
	}
	a := planApp(t)
	a.enterLead()
	return append(fs, a.fields...)
}

// TestEveryFieldChecked: every value the app asks has a plausible range
// and a label; a value typed far outside the range gets a sentence naming
// the field as it is typed, and one inside gets none.
func TestEveryFieldChecked(t *testing.T) {
	a := planApp(t)
	a.Session().DisplayUnit = session.UnitMM
	seen := map[string]bool{}
	for _, f := range allFields(t) {
		if seen[f.Key] || len(f.Choices) > 0 {
			continue // a question answered with buttons types nothing
		}
		seen[f.Key] = true
		if f.Label == "" || f.Say == "" || !(f.Lo < f.Hi) || math.IsInf(f.Lo, 0) || math.IsInf(f.Hi, 0) {
			t.Errorf("%s: label %q, say %q, range %v..%v", f.Key, f.Label, f.Say, f.Lo, f.Hi)
			continue
		}
		a.fields, a.fi = []field{f}, 0
		a.text = a.showValue(f, f.Hi+10*(f.Hi-f.Lo)+1)
		a.check()
		if !strings.HasPrefix(a.note, f.Label+": ") || !strings.Contains(a.note, "unusual") || !strings.HasSuffix(a.note, ".") {
			t.Errorf("%s: typing %s gave %q", f.Key, a.text, a.note)
		}
		a.text = a.showValue(f, (f.Lo+f.Hi)/2)
		a.check()
		if a.note != "" {
			t.Errorf("%s: typing %s (mid-range) gave %q", f.Key, a.text, a.note)
		}
	}
	if len(seen) < 60 {
		t.Errorf("only %d fields checked", len(seen))
	}
}
