package session

import (
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/cpubench"
	"evenbeat/setting/jsonx"
)

// A cylinder's engine used to be made on every call by writing the engine
// as JSON, merging the cylinder's differences into it as an RFC 7396 merge
// patch (mergePatch) and reading the result back. setting.EnginePatch now
// applies the differences to the values; the old route is kept here as
// the reference it must match: the same engine, or the same field and
// sentence for a patch that does not fit. One difference is deliberate: a
// refused object is quoted as the patch writes it, where the old route
// quoted it as merged, without its null members.

// refCylinderEngine is CylinderEngine as it was, through JSON.
func refCylinderEngine(s *Session, i int) (setting.EngineSpec, error) {
	if s.Cylinders[i].Differences.IsEmpty() {
		return s.Engine, nil
	}
	base, err := encodeTree(s.Engine)
	if err != nil {
		return setting.EngineSpec{}, userError("engine", fmt.Sprintf("The engine cannot be read back: %v.", err))
	}
	patch, err := parseCompact(s.Cylinders[i].Differences.JSON())
	if err != nil {
		return setting.EngineSpec{}, err
	}
	d := &decoder{}
	spec, _ := d.engine(mergePatch(base, patch), fmt.Sprintf("cylinders[%d].differences", i))
	if d.err != nil {
		return setting.EngineSpec{}, d.err
	}
	return spec, nil
}

// mergePatch applies an RFC 7396 JSON Merge Patch to target and returns the
// result; target is not changed.
func mergePatch(target, patch *node) *node {
	if patch.kind != nodeObject {
		return patch
	}
	out := &node{kind: nodeObject}
	if target != nil && target.kind == nodeObject {
		out.keys = append(out.keys, target.keys...)
		out.vals = append(out.vals, target.vals...)
	}
	for i, k := range patch.keys {
		v := patch.vals[i]
		idx := -1
		for j, ok := range out.keys {
			if ok == k {
				idx = j
				break
			}
		}
		if v.kind == nodeNull {
			if idx >= 0 {
				out.keys = append(out.keys[:idx:idx], out.keys[idx+1:]...)
				out.vals = append(out.vals[:idx:idx], out.vals[idx+1:]...)
			}
			continue
		}
		if idx >= 0 {
			out.vals[idx] = mergePatch(out.vals[idx], v)
		} else {
			out.keys = append(out.keys, k)
			out.vals = append(out.vals, mergePatch(nil, v))
		}
	}
	return out
}

// engineFile reads an engine of testdata/engines.
func engineFile(t testing.TB, name string) setting.EngineSpec {
	t.Helper()
	f, err := os.Open("../../testdata/engines/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	spec, err := setting.DecodeEngineSpec(f)
	if err != nil {
		t.Fatal(err)
	}
	return spec
}

// patchedSession is a session of spec whose second cylinder differs by
// the patch, written compact as Decode keeps it.
func patchedSession(t testing.TB, spec setting.EngineSpec, patch string) *Session {
	t.Helper()
	v, err := jsonx.Parse([]byte(patch), jsonx.Options{})
	if err != nil {
		t.Fatalf("%s: %v", patch, err)
	}
	var w jsonx.Writer
	w.Value(v)
	compact, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	p, err := setting.ReadEnginePatch(compact)
	if err != nil {
		t.Fatalf("%s: %v", patch, err)
	}
	return &Session{Engine: spec, Cylinders: []Cylinder{{Name: "right"}, {Name: "left", Differences: p}}}
}

// sameEngine says how two results of a cylinder's engine differ; "" when
// they do not.
func sameEngine(got setting.EngineSpec, gotErr error, want setting.EngineSpec, wantErr error) string {
	if (gotErr == nil) != (wantErr == nil) {
		return fmt.Sprintf("error %v, want %v", gotErr, wantErr)
	}
	if gotErr != nil {
		var g, w *setting.Error
		if !errors.As(gotErr, &g) || !errors.As(wantErr, &w) || *g != *w {
			return fmt.Sprintf("error\n  %#v\nwant\n  %#v", gotErr, wantErr)
		}
		return ""
	}
	if !reflect.DeepEqual(got, want) {
		return fmt.Sprintf("engine\n  %+v\nwant\n  %+v", got, want)
	}
	return ""
}

// TestCylinderEngineAppliesDifferences: each kind of difference a patch
// can make (a number, a word, a list replaced or removed, an optional
// value or object added or removed, a gear changed for another), and each
// kind of patch that does not fit, gives the engine, or the field and
// sentence, that merging the patch into the engine's JSON gave.
func TestCylinderEngineAppliesDifferences(t *testing.T) {
	steph := engineFile(t, "brackenfold-stephenson.json")
	slip := engineFile(t, "brackenfold-slip-eccentric.json")
	wals := engineFile(t, "brackenfold-walschaerts.json")
	walsJSON, err := wals.AppendJSON(nil)
	if err != nil {
		t.Fatal(err)
	}
	walsTree, err := jsonx.Parse(walsJSON, jsonx.Options{})
	if err != nil {
		t.Fatal(err)
	}
	part := func(v *jsonx.Value) string { return string(walsJSON[v.Start:v.End]) }
	walsGear := part(walsTree.Last("gear").Last("walschaerts"))
	rocker := `{"pivot": {"u": 60, "w": 0}, "drive_arm": 20, "valve_arm": 20, "valve_rod": 60}`

	type engine = setting.EngineSpec
	applied := []struct {
		name  string
		spec  engine
		patch string
		check func(engine) bool // the patched values and their neighbours
	}{
		{"a lap", steph, `{"valve": {"front": {"steam_lap": 2.5}}}`,
			func(e engine) bool {
				return e.Valve.Front.SteamLap == 2.5 && e.Valve.Back.SteamLap == steph.Valve.Back.SteamLap
			}},
		{"both ends", steph, `{"valve": {"front": {"exhaust_lap": -0.2}, "back": {"port_width": 3.5, "exhaust_lap": 0.1}}}`,
			func(e engine) bool {
				return e.Valve.Front.ExhaustLap == -0.2 && e.Valve.Back.PortWidth == 3.5 && e.Valve.Back.ExhaustLap == 0.1
			}},
		{"a gear dimension", steph, `{"gear": {"stephenson": {"backward": {"rod": 130.5}}}}`,
			func(e engine) bool {
				return e.Gear.Stephenson.Backward.Rod == 130.5 && e.Gear.Stephenson.Forward.Rod == steph.Gear.Stephenson.Forward.Rod
			}},
		{"a word and a flag", steph, `{"name": "Brackenfold, left side", "invented": false}`,
			func(e engine) bool { return e.Name == "Brackenfold, left side" && !e.Invented }},
		{"a list replaced", steph, `{"notches": [{"name": "short", "reverser": 0.3}]}`,
			func(e engine) bool { return len(e.Notches) == 1 && e.Notches[0].Name == "short" }},
		{"a list removed", steph, `{"notches": null}`,
			func(e engine) bool { return e.Notches == nil }},
		{"an empty list", steph, `{"notches": []}`,
			func(e engine) bool { return e.Notches != nil && len(e.Notches) == 0 }},
		{"optional values added and removed", steph, `{"valve": {"liner_diameter": 14, "front": {"port_width": 0, "port_length": null, "holes": 4, "hole_diameter": 1}}}`,
			func(e engine) bool {
				return e.Valve.LinerDiameter == 14 && e.Valve.Front.Holes == 4 && e.Valve.Front.PortLength == 0 && e.Valve.Back.PortLength == steph.Valve.Back.PortLength
			}},
		{"a text removed", slip, `{"notes": null}`,
			func(e engine) bool { return e.Notes == "" && e.Name == slip.Name }},
		{"a gear for another", steph, `{"gear": {"kind": "walschaerts", "stephenson": null, "walschaerts": ` + walsGear + `}, "engine": ` + part(walsTree.Last("engine")) + `, "valve": ` + strings.ReplaceAll(part(walsTree.Last("valve")), `"holes"`, `"port_length":null,"holes"`) + `}`,
			func(e engine) bool {
				return e.Gear.Stephenson == nil && reflect.DeepEqual(e.Gear.Walschaerts, wals.Gear.Walschaerts)
			}},
	}
	refused := []struct {
		name, patch string
		spec        engine
		field       string // under cylinders[1].differences
		// message, when given, is the sentence, which the old route worded
		// otherwise.
		message string
	}{
		{name: "an optional object that does not fit", spec: slip, patch: `{"gear": {"single_eccentric": {"rocker": ` + rocker + `}}}`, field: "gear.single_eccentric.eccentric.rod"},
		{name: "a new object's nulls left out", spec: steph, patch: `{"gear": {"kind": "walschaerts", "stephenson": null, "walschaerts": ` + strings.Replace(walsGear, `{`, `{"x": null, `, 1) + `}}`, field: "gear.walschaerts"},
		{name: "two gears", spec: wals, patch: `{"gear": {"stephenson": ` + rocker + `}}`, field: "gear.stephenson.drive_arm"}, // a key not known comes first
		{name: "an unknown key", spec: steph, patch: `{"valve": {"front": {"steam_lap": 2.5, "stem_lap": 2}}}`, field: "valve.front.stem_lap"},
		{name: "an unknown key before a wrong value", spec: steph, patch: `{"valve": {"front": {"stem_lap": 2, "port_width": "wide"}}}`, field: "valve.front.stem_lap"},
		{name: "a wrong kind", spec: steph, patch: `{"engine": {"crank_radius": "38"}}`, field: "engine.crank_radius"},
		{name: "an object for a number", spec: steph, patch: `{"engine": {"crank_radius": {"b": 1}}}`, field: "engine.crank_radius"},
		{name: "an object with nulls for a number", spec: steph, patch: `{"engine": {"crank_radius": {"a": null, "b": 1}}}`, field: "engine.crank_radius",
			message: `The crank radius (engine.crank_radius) must be a number (got {"a":null,"b":1}).`},
		{name: "a number for an object", spec: steph, patch: `{"valve": 3}`, field: "valve"},
		{name: "a required value removed", spec: steph, patch: `{"engine": {"rod_length": null}}`, field: "engine.rod_length"},
		{name: "a required object removed", spec: steph, patch: `{"gear": null}`, field: "gear"},
		{name: "a count with a point", spec: steph, patch: `{"valve": {"front": {"holes": 4.0, "hole_diameter": 1}}}`, field: "valve.front.holes"},
		{name: "a value the engine refuses", spec: steph, patch: `{"valve": {"back": {"port_width": -1}}}`, field: "valve.back.port_width"},
	}
	for _, c := range applied {
		t.Run(c.name, func(t *testing.T) {
			s := patchedSession(t, c.spec, c.patch)
			got, err := s.CylinderEngine(1)
			want, wantErr := refCylinderEngine(s, 1)
			if d := sameEngine(got, err, want, wantErr); d != "" {
				t.Fatalf("%s: %s", c.patch, d)
			}
			if err != nil {
				t.Fatalf("%s: %v", c.patch, err)
			}
			if !c.check(got) {
				t.Errorf("%s: not as patched: %+v", c.patch, got)
			}
			if first, err := s.CylinderEngine(0); err != nil || !reflect.DeepEqual(first, c.spec) {
				t.Errorf("the first cylinder, without differences, is not the engine: %v", err)
			}
		})
	}
	for _, c := range refused {
		t.Run(c.name, func(t *testing.T) {
			s := patchedSession(t, c.spec, c.patch)
			got, err := s.CylinderEngine(1)
			want, wantErr := refCylinderEngine(s, 1)
			var e, w *setting.Error
			if !errors.As(err, &e) || !errors.As(wantErr, &w) {
				t.Fatalf("%s: error %v, the old route's %v; want both refused", c.patch, err, wantErr)
			}
			if e.Field != "cylinders[1].differences."+c.field {
				t.Errorf("%s: error %v, want one at %s", c.patch, err, c.field)
			}
			if c.message != "" {
				if e.Message != c.message || e.Field != w.Field {
					t.Errorf("%s: error %v, want %q (the old route's %v)", c.patch, err, c.message, wantErr)
				}
			} else if d := sameEngine(got, err, want, wantErr); d != "" {
				t.Errorf("%s: %s", c.patch, d)
			}
		})
	}
}

// TestCylinderEngineFollowsEngine: the app changes the session's engine
// in place after the file is read (set-up); the cylinder that differs
// follows the change and keeps its difference, and making its engine
// changes neither the session's engine nor the patch.
func TestCylinderEngineFollowsEngine(t *testing.T) {
	s := patchedSession(t, engineFile(t, "brackenfold-stephenson.json"), `{"valve": {"front": {"steam_lap": 2.5}}, "gear": {"stephenson": {"forward": {"throw": 5.5}}}}`)
	s.Engine.Valve.Back.SteamLap = 2.75
	s.Engine.Gear.Stephenson.Backward.Rod += 0.5
	s.Engine.Gear.Stephenson.Forward.Rod += 0.25
	before, err := s.Engine.AppendJSON(nil)
	if err != nil {
		t.Fatal(err)
	}
	got, err := s.CylinderEngine(1)
	want, wantErr := refCylinderEngine(s, 1)
	if d := sameEngine(got, err, want, wantErr); d != "" {
		t.Fatal(d)
	}
	e := s.Engine
	if got.Valve.Back.SteamLap != 2.75 || got.Gear.Stephenson.Backward.Rod != e.Gear.Stephenson.Backward.Rod || got.Gear.Stephenson.Forward.Rod != e.Gear.Stephenson.Forward.Rod ||
		got.Valve.Front.SteamLap != 2.5 || got.Gear.Stephenson.Forward.Throw != 5.5 {
		t.Errorf("the engine's changes or the difference are lost: %+v %+v", got.Valve, got.Gear.Stephenson)
	}
	after, err := s.Engine.AppendJSON(nil)
	if err != nil || string(after) != string(before) {
		t.Errorf("making the cylinder's engine changed the session's:\n%s\n%s", before, after)
	}
	if again, err := s.CylinderEngine(1); err != nil || !reflect.DeepEqual(again, got) {
		t.Errorf("a second call gave another engine: %v", err)
	}
}

// TestCylinderEngineRandomPatches: random patches on every engine of
// testdata/engines, made of the engine's own keys with values near and
// far from its own, of other kinds, nulls, empty objects and lists, other
// engines' gears and unknown keys, give what the JSON route gave.
func TestCylinderEngineRandomPatches(t *testing.T) {
	names := []string{"brackenfold-stephenson.json", "brackenfold-slip-eccentric.json", "brackenfold-walschaerts.json"}
	var trees []*jsonx.Value
	var specs []setting.EngineSpec
	for _, name := range names {
		spec := engineFile(t, name)
		b, err := spec.AppendJSON(nil)
		if err != nil {
			t.Fatal(err)
		}
		v, err := jsonx.Parse(b, jsonx.Options{})
		if err != nil {
			t.Fatal(err)
		}
		specs, trees = append(specs, spec), append(trees, v)
	}
	n := 600
	if testing.Short() {
		n = 200
	}
	rng := rand.New(rand.NewPCG(16, 7396))
	applied, refused := 0, 0
	for ei, spec := range specs {
		for range n {
			p := randomPatch(rng, trees[ei], trees)
			if !strings.HasPrefix(p, "{") {
				continue
			}
			s := patchedSession(t, spec, p)
			got, err := s.CylinderEngine(1)
			want, wantErr := refCylinderEngine(s, 1)
			if d := sameEngine(got, err, want, wantErr); d != "" {
				t.Fatalf("%s\npatch %s: %s", names[ei], p, d)
			}
			if err == nil {
				applied++
			} else {
				refused++
			}
		}
	}
	// Both outcomes must be well represented, or the comparison is weak.
	if total := applied + refused; applied < total/5 || refused < total/5 {
		t.Errorf("%d patches applied and %d refused; want at least a fifth of each", applied, refused)
	}
}

// randomPatch writes a random merge patch for the value base: an object
// patch of some of its keys (and now and then a key it lacks) when base
// is an object, else a random value.
func randomPatch(rng *rand.Rand, base *jsonx.Value, trees []*jsonx.Value) string {
	if base == nil || base.Kind != jsonx.Object || rng.IntN(8) == 0 {
		return randomValue(rng, base, trees)
	}
	keys := append([]string(nil), base.Keys...)
	rng.Shuffle(len(keys), func(i, j int) { keys[i], keys[j] = keys[j], keys[i] })
	keys = keys[:1+rng.IntN(min(len(keys), 3))]
	if rng.IntN(6) == 0 {
		extra := []string{"notes", "liner_diameter", "holes", "hole_diameter", "port_length", "rocker", "walschaerts", "stephenson", "single_eccentric", "cylinders", "notches", "bogus"}
		keys = append(keys, extra[rng.IntN(len(extra))])
	}
	var b strings.Builder
	b.WriteByte('{')
	seen := map[string]bool{}
	for _, k := range keys {
		if seen[k] {
			continue
		}
		if len(seen) > 0 {
			b.WriteByte(',')
		}
		seen[k] = true
		b.WriteString(strconv.Quote(k) + ":")
		b.WriteString(randomPatch(rng, base.Last(k), trees))
	}
	b.WriteByte('}')
	return b.String()
}

// randomValue is a value to put where base was: mostly one near it.
func randomValue(rng *rand.Rand, base *jsonx.Value, trees []*jsonx.Value) string {
	switch rng.IntN(12) {
	case 0:
		return "null"
	case 1:
		return `{}`
	case 2:
		return `[]`
	case 3:
		return `"external"`
	case 4:
		return "true"
	case 5:
		// Another engine's gear, or part of it.
		g := trees[rng.IntN(len(trees))].Last("gear")
		for _, k := range []string{"stephenson", "walschaerts", "single_eccentric"} {
			if m := g.Last(k); m != nil {
				var w jsonx.Writer
				w.Value(m)
				b, _ := w.Bytes()
				return string(b)
			}
		}
	case 6:
		return strconv.Itoa(rng.IntN(5))
	}
	if base != nil && base.Kind == jsonx.Number {
		f, _ := strconv.ParseFloat(base.Text, 64)
		return strconv.FormatFloat(f*(1+0.01*rng.NormFloat64()), 'g', -1, 64)
	}
	if base != nil {
		var w jsonx.Writer
		w.Value(base)
		b, _ := w.Bytes()
		return string(b)
	}
	return strconv.FormatFloat(rng.Float64()*100, 'g', 4, 64)
}

// BenchmarkCylinderEngine: a cylinder's engine with a difference, made as
// every fit and plan makes it, against the JSON route it replaced.
func BenchmarkCylinderEngine(b *testing.B) {
	s := patchedSession(b, engineFile(b, "brackenfold-stephenson.json"), `{"valve": {"front": {"steam_lap": 2.5}}}`)
	for _, route := range []struct {
		name string
		make func(*Session, int) (setting.EngineSpec, error)
	}{{"values", (*Session).CylinderEngine}, {"json", refCylinderEngine}} {
		b.Run(route.name, func(b *testing.B) {
			defer cpubench.Report(b, cpubench.Now())
			for b.Loop() {
				if _, err := route.make(s, 1); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
