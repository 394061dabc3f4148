package plan

import (
	"bytes"
	"testing"

	"evenbeat/setting/session"
)

// TestOtherLater: a plan made with Options.OtherLater holds no other plan
// until AddOther, and is then word for word and field for field the plan
// made at once, for every test gear and priority.
func TestOtherLater(t *testing.T) {
	lead := 0.5
	for _, kind := range gears {
		sim := simulated{spec: testSpec(t, kind), dev: injected(kind)}
		s := sim.session(t, 30, testAdjustments(kind))
		for _, opt := range []Options{{Priority: EqualLeads}, {Priority: EqualCutOffs}, {Priority: Balanced}, {TargetLeadMM: &lead}} {
			opt.Unit = session.UnitMM
			now, err := Make(s, opt)
			if err != nil {
				t.Fatal(err)
			}
			if now.OtherPending() || now.Other == nil {
				t.Fatalf("%s, %s: a plan made at once has pending %v, other %v", kind, opt.Priority, now.OtherPending(), now.Other)
			}
			opt.OtherLater = true
			later, err := Make(s, opt)
			if err != nil {
				t.Fatal(err)
			}
			if !later.OtherPending() || later.Other != nil || len(later.Notes) != len(now.Notes)-1 {
				t.Fatalf("%s, %s: before AddOther: pending %v, other %v, %d notes (at once %d)", kind, opt.Priority, later.OtherPending(), later.Other, len(later.Notes), len(now.Notes))
			}
			later.AddOther()
			later.AddOther() // a second call does nothing
			if later.OtherPending() {
				t.Errorf("%s, %s: still pending after AddOther", kind, opt.Priority)
			}
			for _, write := range []func(*bytes.Buffer, *Plan) error{
				func(b *bytes.Buffer, p *Plan) error { return WriteText(b, p, session.UnitMM) },
				func(b *bytes.Buffer, p *Plan) error { return WriteJSON(b, p, session.UnitMM) },
			} {
				var a, b bytes.Buffer
				if err := write(&a, now); err != nil {
					t.Fatal(err)
				}
				if err := write(&b, later); err != nil {
					t.Fatal(err)
				}
				if a.String() != b.String() {
					t.Errorf("%s, %s: the plan made later differs:\n%s\nmade at once:\n%s", kind, opt.Priority, b.String(), a.String())
				}
			}
		}
	}
}
