package setting

import (
	"bytes"
	"errors"
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
// a spec that decodes writes and reads back unchanged.
func FuzzDecodeEngineSpec(f *testing.F) {
	f.Add(specJSON)
	f.Add(`{}`)
	f.Add(`{"name": "x", "invented": true, "engine": null, "notches": [null]}`)
	f.Add(strings.Replace(specJSON, `"kind": "single-eccentric"`, `"kind": "walschaerts", "walschaerts": {}`, 1))
	f.Fuzz(func(t *testing.T, in string) {
		spec, err := DecodeEngineSpec(strings.NewReader(in))
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || e.Message == "" {
				t.Fatalf("error %v is not an *Error with a message", err)
			}
			return
		}
		var buf bytes.Buffer
		if err := spec.Encode(&buf); err != nil {
			t.Fatalf("a decoded spec does not encode: %v", err)
		}
		again, err := DecodeEngineSpec(&buf)
		if err != nil || !reflect.DeepEqual(spec, again) {
			t.Fatalf("round trip: %v\n%+v\n%+v", err, spec, again)
		}
	})
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
