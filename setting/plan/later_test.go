package plan

import (
	"bytes"
	"reflect"
	"testing"

	"evenbeat/setting/session"
)

// laterPair is one plan made at once and the same plan made with
// Options.OtherLater, then AddOther.
type laterPair struct {
	name       string
	now, later *Plan
}

// laterPairs makes the pairs for every test gear and priority, checking
// on the way that the plan made later holds no other plan until AddOther.
func laterPairs(t *testing.T) []laterPair {
	t.Helper()
	lead := 0.5
	var out []laterPair
	for _, kind := range gears {
		sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
		s := sim.session(t, 30, testAdjustments(kind))
		for _, opt := range []Options{{Priority: EqualLeads}, {Priority: EqualCutOffs}, {Priority: Balanced}, {TargetLeadMM: &lead}} {
			name := kind + ", " + string(opt.Priority)
			opt.Unit = session.UnitMM
			now, err := Make(s, opt)
			if err != nil {
				t.Fatal(err)
			}
			if now.OtherPending() || now.Other == nil {
				t.Fatalf("%s: a plan made at once has pending %v, other %v", name, now.OtherPending(), now.Other)
			}
			opt.OtherLater = true
			later, err := Make(s, opt)
			if err != nil {
				t.Fatal(err)
			}
			if !later.OtherPending() || later.Other != nil || len(later.Notes) != len(now.Notes)-1 {
				t.Fatalf("%s: before AddOther: pending %v, other %v, %d notes (at once %d)", name, later.OtherPending(), later.Other, len(later.Notes), len(now.Notes))
			}
			later.AddOther()
			later.AddOther() // a second call does nothing
			if later.OtherPending() {
				t.Errorf("%s: still pending after AddOther", name)
			}
			out = append(out, laterPair{name, now, later})
		}
	}
	return out
}

// TestOtherLater: a plan made with Options.OtherLater holds no other plan
// until AddOther, and is then word for word the plan made at once, with
// the same other plan and notes in the same order, for every test gear
// and priority. (write_json_test.go compares their JSON too.)
func TestOtherLater(t *testing.T) {
	for _, p := range laterPairs(t) {
		var a, b bytes.Buffer
		if err := WriteText(&a, p.now, session.UnitMM); err != nil {
			t.Fatal(err)
		}
		if err := WriteText(&b, p.later, session.UnitMM); err != nil {
			t.Fatal(err)
		}
		if a.String() != b.String() {
			t.Errorf("%s: the plan made later differs:\n%s\nmade at once:\n%s", p.name, b.String(), a.String())
		}
		if !reflect.DeepEqual(p.now.Notes, p.later.Notes) || !reflect.DeepEqual(p.now.Other, p.later.Other) {
			t.Errorf("%s: notes or other plan differ:\n%q\n%+v\nmade at once:\n%q\n%+v", p.name, p.later.Notes, p.later.Other, p.now.Notes, p.now.Other)
		}
	}
}
