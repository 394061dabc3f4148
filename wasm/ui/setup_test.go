package ui

import (
	"math"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// TestGearDimensions: set-up asks each demo gear's own dimensions after
// the engine's, in the trade's terms (the stroke, the valve travel), each
// with the demo design's value inside its plausible range and a place in
// the session file that reads back; the questions with a few answers are
// asked with buttons, each answer read back as chosen.
func TestGearDimensions(t *testing.T) {
	want := map[string][]string{
		setting.KindStephenson:      {"engine.gear.stephenson.forward.throw", "engine.gear.stephenson.link.radius", "engine.gear.stephenson.lifting_link", "engine.gear.stephenson.crossed"},
		setting.KindWalschaerts:     {"engine.gear.walschaerts.return_crank", "engine.gear.walschaerts.lever.union_pin", "engine.gear.walschaerts.union_link", "engine.gear.walschaerts.trunnion.u"},
		setting.KindSingleEccentric: {"engine.gear.single_eccentric.eccentric.throw", "engine.gear.single_eccentric.eccentric.rod", "engine.gear.single_eccentric.slip"},
	}
	for _, spec := range setting.DemoEngines() {
		s := newSession(spec, session.UnitMM)
		su := newSetUp(false)
		fs := setupFields(s, &su)
		keys := map[string]bool{}
		for _, f := range fs {
			keys[f.Key] = true
			v, ok := f.get(s)
			if !ok {
				t.Errorf("%s: %s has no value", spec.Name, f.Key)
				continue
			}
			if len(f.Choices) > 0 {
				for i, c := range f.Choices {
					other := newSession(spec, session.UnitMM) // an answer may drop values
					c.set(other)
					if got, _ := f.get(other); int(got) != i {
						t.Errorf("%s: %s chose %q, reads back %d", spec.Name, f.Key, c.Label, int(got))
					}
				}
				continue
			}
			if !(f.Lo < f.Hi) || v < f.Lo || v > f.Hi {
				t.Errorf("%s: %s default %v outside its plausible range %v..%v", spec.Name, f.Key, v, f.Lo, f.Hi)
			}
			f.set(s, v*1.01+0.01)
			b, err := encodeSession(s)
			if err != nil {
				t.Errorf("%s: %s changed: %v", spec.Name, f.Key, err)
				f.set(s, v)
				continue
			}
			back, err := decodeSession(b)
			if err != nil {
				t.Fatal(err)
			}
			if got, _ := f.get(back); math.Abs(got-(v*1.01+0.01)) > 1e-9 {
				t.Errorf("%s: %s read back %v, want %v", spec.Name, f.Key, got, v*1.01+0.01)
			}
			f.set(s, v)
		}
		for _, k := range want[spec.Gear.Kind] {
			if !keys[k] {
				t.Errorf("%s: set-up does not ask %s", spec.Name, k)
			}
		}
		if !hasSketch("engine.engine.crank_radius", render.Light()) {
			t.Error("no sketch for the stroke")
		}
	}
}

// TestSizesSketchAndAssembly: the sizes screen draws the sketch of the
// value asked; a gear value with which the gear cannot be put together
// is held at its field with setting's sentence naming the part (in
// words), nothing of the engine changes and nothing is written; a value
// that fits is an edit of the engine, recorded in its history.
func TestSizesSketchAndAssembly(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	tap(t, a, "mm")
	tap(t, a, "Next")
	for a.Field() != "Stroke" {
		tap(t, a, "Next")
	}
	text, _ := drawText(a)
	if a.Field() != "Stroke" || !strings.Contains(text, "stroke / 2") {
		t.Fatalf("sizes screen at %q without its sketch:\n%s", a.Field(), text)
	}
	for a.Field() != "Lifting link" {
		tap(t, a, "Next")
		if a.Screen() != Sizes {
			t.Fatal("no lifting link asked")
		}
	}
	writes := len(st.puts)
	want := setting.DemoStephenson().Gear.Stephenson.LiftingLink
	typeKeys(t, a, "900")
	tap(t, a, "Next")
	g := a.Session().Engine.Gear.Stephenson
	if g.LiftingLink != want || a.Field() != "Lifting link" || len(st.puts) != writes || a.text != "900" {
		t.Fatalf("lifting link %v (want %v kept), field %q, %d writes, entry %q", g.LiftingLink, want, a.Field(), len(st.puts)-writes, a.text)
	}
	if !strings.HasPrefix(a.Note(), "Lifting link: ") || !strings.Contains(a.Note(), "lifting") || strings.Contains(a.Note(), "engine.") || strings.Contains(a.Note(), "gear.") {
		t.Fatalf("note %q", a.Note())
	}
	t.Logf("note: %s", a.Note())
	for range 3 {
		tap(t, a, KeyDelete.Label())
	}
	typeKeys(t, a, "50")
	tap(t, a, "Next")
	// The demo, first changed, is kept as a session of its own: the
	// session and the list of sessions are written.
	if g := a.Session().Engine.Gear.Stephenson; g.LiftingLink != 50 || a.Field() == "Lifting link" || len(st.puts) != writes+2 {
		t.Fatalf("after a fitting value: lifting link %v, field %q, %d writes (%q)", g.LiftingLink, a.Field(), len(st.puts)-writes, a.Note())
	}
	if h := a.Session().EngineChanges; len(h) == 0 || h[len(h)-1].Key != "engine.gear.stephenson.lifting_link" {
		t.Errorf("the change is not in the engine's history: %+v", h)
	}
}
