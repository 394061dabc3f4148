package setting

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting/cpubench"
)

// specJSON is a small invented single-eccentric engine (invented for this
// test, no source).
const specJSON = `{
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
}`

func TestDecodeEngineSpecRoundTrip(t *testing.T) {
	spec, err := DecodeEngineSpec(strings.NewReader(specJSON))
	if err != nil {
		t.Fatal(err)
	}
	if spec.Gear.Kind != KindSingleEccentric || spec.Gear.SingleEccentric == nil || spec.Gear.SingleEccentric.Eccentric.Throw != 6.5 {
		t.Fatalf("gear decoded wrong: %+v", spec.Gear)
	}
	if spec.Valve.Admission != External || spec.Valve.Back.PortWidth != 3 {
		t.Fatalf("valve decoded wrong: %+v", spec.Valve)
	}
	var buf bytes.Buffer
	if err := spec.Encode(&buf); err != nil {
		t.Fatal(err)
	}
	again, err := DecodeEngineSpec(&buf)
	if err != nil {
		t.Fatalf("re-reading the written spec: %v\n%s", err, buf.String())
	}
	if !reflect.DeepEqual(spec, again) {
		t.Errorf("round trip changed the spec:\n%+v\n%+v", spec, again)
	}
}

// TestDecodeEngineSpecErrors checks that every bad value is refused with an
// error naming its key path.
func TestDecodeEngineSpecErrors(t *testing.T) {
	cases := []struct {
		name, from, to, field string
	}{
		{"short rod", `"rod_length": 180`, `"rod_length": 20`, "engine.rod_length"},
		{"rod text", `"rod_length": 180`, `"rod_length": "180"`, "engine.rod_length"},
		{"missing offset", `, "offset": 0`, ``, "engine.offset"},
		{"unknown key", `"inclination": 0,`, `"inclination": 0, "stroke": 60,`, "engine.stroke"},
		{"admission word", `"admission": "external",
    "front"`, `"admission": "outside",
    "front"`, "valve.admission"},
		{"negative port", `"back": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3}`, `"back": {"steam_lap": 3, "exhaust_lap": 0, "port_width": -3}`, "valve.back.port_width"},
		{"holes and width", `"back": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3}`, `"back": {"steam_lap": 3, "exhaust_lap": 0, "port_width": 3, "holes": 6, "hole_diameter": 4}`, "valve.back.port_width"},
		{"gear kind", `"kind": "single-eccentric"`, `"kind": "joy"`, "gear.kind"},
		{"gear member missing", `"kind": "single-eccentric"`, `"kind": "walschaerts"`, "gear.walschaerts"},
		{"gear throw", `"throw": 6.5`, `"throw": -1`, "gear.single_eccentric."},
		{"gear throw type", `"throw": 6.5`, `"throw": true`, "gear.single_eccentric.eccentric.throw"},
		{"admission disagrees", `"slip": false, "admission": "external"`, `"slip": false, "admission": "internal"`, "gear.single_eccentric"},
		{"notch range", `"reverser": 0.5`, `"reverser": 1.5`, "notches[0].reverser"},
		{"cylinder name", `{"name": "right", "crank_angle": -90}`, `{"name": "left", "crank_angle": -90}`, "cylinders[1].name"},
		{"not an object", specJSON, `[1, 2]`, ""},
		{"name", `"name": "Test engine"`, `"name": " "`, "name"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if !strings.Contains(specJSON, c.from) {
				t.Fatalf("test case does not apply: %q not in the spec", c.from)
			}
			in := strings.Replace(specJSON, c.from, c.to, 1)
			_, err := DecodeEngineSpec(strings.NewReader(in))
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("got %v, want an *Error", err)
			}
			t.Log(e)
			if !strings.HasPrefix(e.Field, c.field) || (c.field == "" && e.Field != "") {
				t.Errorf("field %q, want %q (message %q)", e.Field, c.field, e.Message)
			}
			if !strings.HasSuffix(e.Message, ".") || e.Message[0] < 'A' || e.Message[0] > 'Z' {
				t.Errorf("message %q is not a full sentence", e.Message)
			}
		})
	}
}

// FuzzDecodeEngineSpec: any input gives a spec or an *Error, never a panic;
// the error is one sentence (a capital first, a full stop or question mark
// last) showing no NaN or Inf it was not given; a spec that decodes holds
// no NaN or Inf, writes and reads back unchanged, and its warnings are
// sentences. Seeds: the demo engines and the hostile inputs of issue 13
// (a byte-order mark, UTF-16, bytes that are not UTF-8, a key twice, a
// misspelt key, a crank of 1e308). Run:
// go test -fuzz=FuzzDecodeEngineSpec -fuzzminimizetime=5s ./setting
func FuzzDecodeEngineSpec(f *testing.F) {
	f.Add(specJSON)
	f.Add(`{}`)
	f.Add(`{"name": "x", "invented": true, "engine": null, "notches": [null]}`)
	f.Add(strings.Replace(specJSON, `"kind": "single-eccentric"`, `"kind": "walschaerts", "walschaerts": {}`, 1))
	f.Add("\xef\xbb\xbf" + specJSON)
	f.Add("\xff\xfe{\x00}\x00")
	f.Add(strings.Replace(specJSON, `"Test engine"`, "\"Test \xe9ngine\"", 1))
	f.Add(strings.Replace(specJSON, `"rod_length": 180`, `"rod_length": 180, "rod_length": 190`, 1))
	f.Add(strings.Replace(specJSON, `"rod_length"`, `"rod_lenght"`, 1))
	f.Add(strings.Replace(specJSON, `"crank_radius": 30`, `"crank_radius": 1e308`, 1))
	f.Add(strings.Replace(specJSON, `"crank_radius": 30`, `"crank_radius": 999999`, 1))
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "engines", "*.json"))
	for _, name := range files {
		data, _ := os.ReadFile(name)
		f.Add(string(data))
	}
	f.Fuzz(func(t *testing.T, in string) {
		spec, err := DecodeEngineSpec(strings.NewReader(in))
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || e.Message == "" {
				t.Fatalf("error %v is not an *Error with a message", err)
			}
			m := e.Message
			if first := m[0]; first < 'A' || first > 'Z' || !strings.HasSuffix(m, ".") && !strings.HasSuffix(m, "?") {
				t.Fatalf("%q is not a sentence", m)
			}
			for _, bad := range []string{"NaN", "Inf"} {
				if strings.Contains(m, bad) && !strings.Contains(in, bad) {
					t.Fatalf("%q shows %s", m, bad)
				}
			}
			return
		}
		if !finiteSpec(spec) {
			t.Fatalf("accepted a NaN or Inf: %+v", spec)
		}
		var buf bytes.Buffer
		if err := spec.Encode(&buf); err != nil {
			t.Fatalf("a decoded spec does not encode: %v", err)
		}
		again, err := DecodeEngineSpec(&buf)
		if err != nil || !reflect.DeepEqual(spec, again) {
			t.Fatalf("round trip: %v\n%+v\n%+v", err, spec, again)
		}
		for _, w := range spec.Warnings() {
			if strings.Contains(w, "NaN") || strings.Contains(w, "Inf") || !strings.HasSuffix(w, ".") {
				t.Fatalf("warning %q", w)
			}
		}
	})
}

// finiteSpec reports whether every number of the spec is finite.
func finiteSpec(spec EngineSpec) bool {
	var walk func(v reflect.Value) bool
	walk = func(v reflect.Value) bool {
		switch v.Kind() {
		case reflect.Float64:
			return !math.IsNaN(v.Float()) && !math.IsInf(v.Float(), 0)
		case reflect.Pointer:
			return v.IsNil() || walk(v.Elem())
		case reflect.Struct:
			for i := range v.NumField() {
				if !walk(v.Field(i)) {
					return false
				}
			}
		case reflect.Slice:
			for i := range v.Len() {
				if !walk(v.Index(i)) {
					return false
				}
			}
		}
		return true
	}
	return walk(reflect.ValueOf(spec))
}

// Reading an engine file (the Stephenson demo engine), validation included.
func BenchmarkDecodeEngineSpec(b *testing.B) {
	defer cpubench.Report(b, cpubench.Now())
	data, err := os.ReadFile(filepath.Join("..", "testdata", "engines", "brackenfold-stephenson.json"))
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := DecodeEngineSpec(bytes.NewReader(data)); err != nil {
			b.Fatal(err)
		}
	}
}

// Notches and cylinders beyond the bounds are refused naming the list.
func TestEngineListBounds(t *testing.T) {
	spec, err := DecodeEngineSpec(strings.NewReader(specJSON))
	if err != nil {
		t.Fatal(err)
	}
	many := spec
	for i := 0; i <= MaxNotches; i++ {
		many.Notches = append(many.Notches, Notch{Name: "n" + strings.Repeat("i", i+1), Reverser: 0.5})
	}
	var e *Error
	if err := many.Validate(); !errors.As(err, &e) || e.Field != "notches" || !strings.Contains(e.Message, "at most 40") {
		t.Errorf("%d notches: %v", len(many.Notches), err)
	}
	many = spec
	for i := 0; i <= MaxCylinders; i++ {
		many.Cylinders = append(many.Cylinders, Cylinder{Name: "c" + strings.Repeat("i", i+1)})
	}
	if err := many.Validate(); !errors.As(err, &e) || e.Field != "cylinders" || !strings.Contains(e.Message, "at most 12") {
		t.Errorf("%d cylinders: %v", len(many.Cylinders), err)
	}
}

// An engine's design (the lead the drawing asks for, the parts derived
// from it) is written and read back unchanged, in the file's key order,
// and left out when there is none.
func TestDesignRoundTrip(t *testing.T) {
	spec := DemoStephenson()
	spec.Design = &Design{Lead: 0.25, FullGearShare: 0.95, Derived: []string{"gear.stephenson.forward.advance", "gear.stephenson.valve_centre_u"}}
	var buf bytes.Buffer
	if err := spec.Encode(&buf); err != nil {
		t.Fatal(err)
	}
	text := buf.String()
	if !strings.Contains(text, `"design": {`) || strings.Index(text, `"design"`) < strings.Index(text, `"gear"`) || strings.Index(text, `"design"`) > strings.Index(text, `"notches"`) {
		t.Errorf("the design is not written between the gear and the notches:\n%s", text)
	}
	again, err := DecodeEngineSpec(strings.NewReader(text))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(spec, again) {
		t.Errorf("round trip changed the design: %+v, want %+v", again.Design, spec.Design)
	}
	spec.Design = nil
	buf.Reset()
	if err := spec.Encode(&buf); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(buf.String(), "design") {
		t.Errorf("an engine without a design writes one:\n%s", buf.String())
	}
}

// A design that cannot be is refused naming its key.
func TestDesignRefused(t *testing.T) {
	cases := []struct {
		name, design, field, says string
	}{
		{"lead far off", `{"lead": 30}`, "design.lead", "from -5 to 25 mm"},
		{"lead missing", `{"derived": []}`, "design.lead", "missing"},
		{"share on a single eccentric", `{"lead": 0.2, "full_gear_share": 1}`, "design.full_gear_share", "Stephenson"},
		{"part of another gear", `{"lead": 0.2, "derived": ["gear.stephenson.arm_swing"]}`, "design.derived[0]", "gear.single_eccentric.eccentric.advance"},
		{"part twice", `{"lead": 0.2, "derived": ["gear.single_eccentric.valve_centre_u", "gear.single_eccentric.valve_centre_u"]}`, "design.derived[1]", "twice"},
		{"not a list", `{"lead": 0.2, "derived": "gear.single_eccentric.valve_centre_u"}`, "design.derived", "list"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := strings.Replace(specJSON, `"notches": [`, `"design": `+c.design+`, "notches": [`, 1)
			_, err := DecodeEngineSpec(strings.NewReader(in))
			var e *Error
			if !errors.As(err, &e) || e.Field != c.field || !strings.Contains(e.Message, c.says) {
				t.Fatalf("got %v, want %s saying %q", err, c.field, c.says)
			}
		})
	}
}

// A clone shares nothing with its engine: every part changed in the clone
// leaves the engine as it was.
func TestCloneSharesNothing(t *testing.T) {
	for _, spec := range DemoEngines() {
		spec.Design = &Design{Lead: 0.2, Derived: DerivableKeys(spec.Gear.Kind)[:1]}
		if spec.Gear.SingleEccentric != nil {
			spec.Gear.SingleEccentric.Rocker = &Rocker{DriveArm: 20, ValveArm: 20, ValveRod: 50}
		}
		was := fmt.Sprintf("%+v %+v %+v %+v %+v", spec, *spec.Design, spec.Gear.SingleEccentric, spec.Gear.Stephenson, spec.Gear.Walschaerts)
		c := spec.Clone()
		if !reflect.DeepEqual(c, spec) {
			t.Fatalf("%s: the clone differs", spec.Name)
		}
		for _, key := range DerivableKeys(spec.Gear.Kind) {
			*c.Number(key) += 1
		}
		c.Design.Derived[0] = "x"
		c.Design.Lead = 1
		c.Notches = append(c.Notches[:0], Notch{"other", 0.1})
		c.Cylinders[0].Name = "other"
		if c.Gear.SingleEccentric != nil {
			c.Gear.SingleEccentric.Rocker.ValveRod = 1
		}
		if now := fmt.Sprintf("%+v %+v %+v %+v %+v", spec, *spec.Design, spec.Gear.SingleEccentric, spec.Gear.Stephenson, spec.Gear.Walschaerts); now != was {
			t.Errorf("%s: changing the clone changed the engine:\n%s\n%s", spec.Name, was, now)
		}
	}
}

// Number finds a number by its engine-file key, and nothing where there is
// no number.
func TestNumberByKey(t *testing.T) {
	s := DemoStephenson()
	if p := s.Number("engine.rod_length"); p == nil || *p != 132 {
		t.Errorf("engine.rod_length: %v", p)
	}
	*s.Number("gear.stephenson.backward.rod") = 131
	if s.Gear.Stephenson.Backward.Rod != 131 {
		t.Error("setting gear.stephenson.backward.rod through Number did not set it")
	}
	if p := s.Number("gear.stephenson.link.suspension.w"); p != &s.Gear.Stephenson.Link.Suspension.W {
		t.Error("gear.stephenson.link.suspension.w is not the suspension's w")
	}
	for _, key := range []string{"", "name", "gear.kind", "gear.walschaerts.radius_rod", "design.lead", "engine.rod_length.x", "engine.stroke", "gear.stephenson.forward"} {
		if p := s.Number(key); p != nil {
			t.Errorf("%q names a number: %v", key, *p)
		}
	}
	for _, spec := range DemoEngines() {
		for _, key := range DerivableKeys(spec.Gear.Kind) {
			if spec.Number(key) == nil {
				t.Errorf("%s: the derivable part %s is no number", spec.Name, key)
			}
		}
	}
}
