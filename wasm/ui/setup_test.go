package ui

import (
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// TestGearDimensions: set-up asks each demo gear's own dimensions after
// the engine's, every one with a sketch of what to measure, a default
// from the demo design inside its plausible range, and a place in the
// session file that reads back.
func TestGearDimensions(t *testing.T) {
	want := map[string][]string{
		setting.KindStephenson:      {"engine.gear.stephenson.forward.throw", "engine.gear.stephenson.backward.advance", "engine.gear.stephenson.link.radius", "engine.gear.stephenson.lifting_link"},
		setting.KindWalschaerts:     {"engine.gear.walschaerts.return_crank", "engine.gear.walschaerts.radius_rod", "engine.gear.walschaerts.lever.union_pin", "engine.gear.walschaerts.union_link"},
		setting.KindSingleEccentric: {"engine.gear.single_eccentric.eccentric.throw", "engine.gear.single_eccentric.eccentric.rod"},
	}
	for _, spec := range setting.DemoEngines() {
		s := newSession(spec, session.UnitMM)
		fs := dimensionFields(s)
		keys := map[string]bool{}
		for _, f := range fs {
			keys[f.Key] = true
			v, ok := f.get(s)
			if !ok {
				t.Errorf("%s: %s has no default", spec.Name, f.Key)
				continue
			}
			if !(f.Lo < f.Hi) || v < f.Lo || v > f.Hi {
				t.Errorf("%s: %s default %v outside its plausible range %v..%v", spec.Name, f.Key, v, f.Lo, f.Hi)
			}
			if !hasSketch(f.Key, render.Light()) {
				t.Errorf("%s: no sketch for %s", spec.Name, f.Key)
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
			if got, _ := f.get(back); got != v*1.01+0.01 {
				t.Errorf("%s: %s read back %v, want %v", spec.Name, f.Key, got, v*1.01+0.01)
			}
			f.set(s, v)
		}
		for _, k := range want[spec.Gear.Kind] {
			if !keys[k] {
				t.Errorf("%s: set-up does not ask %s", spec.Name, k)
			}
		}
	}
}

// TestSizesSketchAndAssembly: the sizes screen draws the sketch of the
// value asked; a gear value with which the gear cannot be put together
// is held at its field with setting's sentence naming the part, and the
// engine keeps the value it had (nothing is written, and Next with
// nothing typed goes on with the value kept).
func TestSizesSketchAndAssembly(t *testing.T) {
	st := newMemStore()
	a := newTestApp(t, st)
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	tap(t, a, "mm")
	tap(t, a, "Next")
	text, _ := drawText(a)
	if a.Field() != "Crank radius" || !strings.Contains(text, "stroke / 2") {
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
	if g.LiftingLink != want || a.Field() != "Lifting link" || len(st.puts) != writes {
		t.Fatalf("lifting link %v (want %v kept), field %q, %d writes", g.LiftingLink, want, a.Field(), len(st.puts)-writes)
	}
	if !strings.HasPrefix(a.Note(), "Lifting link: ") || !strings.Contains(a.Note(), "lifting") || strings.Contains(a.Note(), "engine.") {
		t.Fatalf("note %q", a.Note())
	}
	t.Logf("note: %s", a.Note())
	for range 3 {
		tap(t, a, KeyDelete.Label())
	}
	tap(t, a, "Next") // nothing typed: the value kept fits
	if a.Screen() != Adjust || len(st.puts) != writes {
		t.Fatalf("after the held value: screen %s, %d writes (%q)", a.Screen(), len(st.puts)-writes, a.Note())
	}
}
