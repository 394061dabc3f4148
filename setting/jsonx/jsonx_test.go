package jsonx

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting/jsonx/jsonxtest"
)

// The reference throughout is the standard library's encoding/json, a
// general-purpose JSON implementation: jsonx must accept what it accepts,
// refuse what it refuses with the same message and offset, read the same
// strings and numbers, and write the same bytes.

// rfc8259 are the examples of RFC 8259, "The JavaScript Object Notation
// (JSON) Data Interchange Format", T. Bray (ed.), IETF, 2017, section 13.
var rfc8259 = []string{
	`{
        "Image": {
            "Width":  800,
            "Height": 600,
            "Title":  "View from 15th Floor",
            "Thumbnail": {
                "Url":    "http://www.example.com/image/481989943",
                "Height": 125,
                "Width":  100
            },
            "Animated" : false,
            "IDs": [116, 943, 234, 38793]
          }
      }`,
	`[
        {
           "precision": "zip",
           "Latitude":  37.7668,
           "Longitude": -122.3959,
           "Address":   "",
           "City":      "SAN FRANCISCO",
           "State":     "CA",
           "Zip":       "94107",
           "Country":   "US"
        },
        {
           "precision": "zip",
           "Latitude":  37.371991,
           "Longitude": -122.026020,
           "Address":   "",
           "City":      "SUNNYVALE",
           "State":     "CA",
           "Zip":       "94085",
           "Country":   "US"
        }
      ]`,
	`"Hello world!"`,
	`42`,
	`true`,
}

// edgeCases are edge cases in the style of the JSONTestSuite corpus
// (N. Seriot, "Parsing JSON is a Minefield", 2016), written from memory:
// documents that must be accepted, refused, or read with care.
var edgeCases = []string{
	// accepted
	`[]`, `{}`, `[[]]`, `[{}]`, `null`, `false`, ` 0 `, `-0`, `-0.0e+0`, `1E400`, `1e-400`,
	`123456789012345678901234567890`, `0.000001`, `[1e21]`, `"\u0000"`, `"\ud83d\ude00"`,
	`"\ud800"`, `"\udc00"`, `"\ud800\u0041"`, `"\ud800\ud800"`, `"\ud800\udbff"`, `"\u00e9\/\b\f\n\r\t\"\\"`,
	"\"\xff\xfe\"", "\"\xc3\"", "\"\xed\xa0\x80\"", "\"\xf4\x90\x80\x80\"", `"é🙂"`, "\"\u2028\u2029\"",
	`{"a":1,"a":2}`, `{"":""}`, `[1,[2,[3,[4]]]]`, "\t\r\n [ 1 , 2 ]\r\n", `{"a":{"b":{"c":[true,false,null]}}}`,
	`"<&>"`, `[-1.5e-7, 2.5E+3, 0e0, 10]`,
	// refused
	``, ` `, `[`, `]`, `{`, `}`, `[1,]`, `[,1]`, `[1 2]`, `{"a"}`, `{"a":}`, `{"a" 1}`, `{"a":1,}`,
	`{"a":1 "b":2}`, `{1:2}`, `{a:1}`, `{'a':1}`, `['a']`, `[01]`, `[-]`, `[-a]`, `[1.]`, `[.5]`, `[1.e3]`,
	`[1e]`, `[1e+]`, `[+1]`, `[0x10]`, `[NaN]`, `[Infinity]`, `[-Infinity]`, `tru`, `truex`, `nul`, `fals`,
	`[True]`, `"abc`, `"\`, `"\u12`, `"\u12G4"`, `"\x"`, "\"a\tb\"", "\"a\nb\"", "\"\x00\"", `[1]]`, `[1]x`,
	`{}{}`, `1 2`, "\xef\xbb\xbf{}", "\u00a0[]", "[\x0c]", `[1,,2]`, `{"a":1}}`, `{"a":[}`, `[{]`,
	`{"a":1,"b"}`, `1.`, `-`, `1e`, `1e-`, `"\u`, `"\uD800\u`, `[1` + "\n", `{"a":1`, `{"a"`, `{"a":`, `{,}`,
	`/* comment */ 1`, `[1] // c`, `'single'`, "[\"a\x7fb\"]",
}

// refDecode reads data with encoding/json, numbers as json.Number.
func refDecode(data []byte) (any, error) {
	var v any
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	if err := dec.Decode(&v); err != nil {
		return nil, err
	}
	return v, nil
}

// plain turns a Value into what encoding/json's any decoding gives (later
// keys overwrite earlier ones).
func plain(v *Value) any {
	switch v.Kind {
	case Bool:
		return v.Bool
	case Number:
		return json.Number(v.Text)
	case String:
		return v.Text
	case Array:
		out := []any{}
		for _, e := range v.Elems {
			out = append(out, plain(e))
		}
		return out
	case Object:
		out := map[string]any{}
		for i, k := range v.Keys {
			out[k] = plain(v.Vals[i])
		}
		return out
	}
	return nil
}

// compareWithStandard checks one document against encoding/json: validity,
// the syntax error's message and offset, the values read, the spans, and
// the bytes written back.
func compareWithStandard(t *testing.T, data []byte) {
	t.Helper()
	v, err := Parse(data, Options{})
	if got, want := err == nil, json.Valid(data); got != want {
		t.Fatalf("%q: jsonx accepts = %v, encoding/json = %v (%v)", data, got, want, err)
	}
	if err != nil {
		var ref *json.SyntaxError
		if errors.As(json.Unmarshal(data, new(any)), &ref) {
			var se *SyntaxError
			if !errors.As(err, &se) {
				t.Fatalf("%q: error %T %v, want a *SyntaxError", data, err, err)
			}
			if se.Msg != ref.Error() || se.Offset != ref.Offset {
				t.Errorf("%q: error %q at %d, encoding/json %q at %d", data, se.Msg, se.Offset, ref.Error(), ref.Offset)
			}
		}
		return
	}
	ref, err := refDecode(data)
	if err != nil {
		t.Fatalf("%q: encoding/json cannot decode: %v", data, err)
	}
	if got := plain(v); !reflect.DeepEqual(got, ref) {
		t.Errorf("%q: read %#v, encoding/json %#v", data, got, ref)
	}
	if strings.TrimSpace(string(data[v.Start:v.End])) != string(data[v.Start:v.End]) || !json.Valid(data[v.Start:v.End]) {
		t.Errorf("%q: span [%d, %d) is not the value", data, v.Start, v.End)
	}
	for _, indent := range []string{"", "  "} {
		for _, html := range []bool{false, true} {
			w := &Writer{Indent: indent, EscapeHTML: html}
			w.Value(v)
			out, err := w.Bytes()
			if err != nil {
				t.Fatal(err)
			}
			back, err := refDecode(out)
			if err != nil || !reflect.DeepEqual(back, ref) {
				t.Errorf("%q written as %q reads back as %#v (%v)", data, out, back, err)
			}
			var laid bytes.Buffer
			if indent == "" {
				err = json.Compact(&laid, out)
			} else {
				err = json.Indent(&laid, out, "", indent)
			}
			if err != nil || laid.String() != string(out) {
				t.Errorf("%q written with indent %q as %q; encoding/json lays it out as %q", data, indent, out, laid.String())
			}
		}
	}
}

func TestAgreesWithEncodingJSON(t *testing.T) {
	for _, c := range append(append([]string{}, rfc8259...), edgeCases...) {
		compareWithStandard(t, []byte(c))
	}
}

// The corpus holds both kinds, so a parser that accepted or refused
// everything would fail above; this says so outright.
func TestCorpusHasBothKinds(t *testing.T) {
	var ok, bad int
	for _, c := range edgeCases {
		if json.Valid([]byte(c)) {
			ok++
		} else {
			bad++
		}
	}
	if ok < 20 || bad < 40 {
		t.Fatalf("corpus: %d valid, %d invalid", ok, bad)
	}
}

func FuzzParse(f *testing.F) {
	for _, c := range append(append([]string{}, rfc8259...), edgeCases...) {
		f.Add([]byte(c))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		compareWithStandard(t, data)
		var s string
		if json.Unmarshal(data, &s) == nil {
			var sb []byte
			sb = AppendString(sb, s, true)
			want, _ := json.Marshal(s)
			if string(sb) != string(want) {
				t.Errorf("AppendString(%q) = %s, json.Marshal %s", s, sb, want)
			}
		}
	})
}

// Strings are escaped as encoding/json escapes them, with and without
// HTML escaping.
func TestAppendStringAsEncodingJSON(t *testing.T) {
	cases := []string{"", "plain", "quote\" back\\ slash/", "\b\f\n\r\t\x00\x01\x1f\x7f", "<a href=\"x\">&amp;</a>",
		"é 🙂 \u2028 \u2029", "\xff bad \xc3", "\xed\xa0\x80", "\ufffd"}
	for _, s := range cases {
		want, _ := json.Marshal(s)
		if got := AppendString(nil, s, true); string(got) != string(want) {
			t.Errorf("AppendString(%q, html) = %s, want %s", s, got, want)
		}
		var b bytes.Buffer
		enc := json.NewEncoder(&b)
		enc.SetEscapeHTML(false)
		_ = enc.Encode(s)
		if got := AppendString(nil, s, false); string(got) != strings.TrimSuffix(b.String(), "\n") {
			t.Errorf("AppendString(%q) = %s, want %s", s, got, b.String())
		}
	}
}

// Numbers are written as encoding/json writes a float64.
func TestAppendFloatAsEncodingJSON(t *testing.T) {
	cases := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 1.0 / 3, 2.5e-7, 1e-6, 9.99e-7, 1e20, 1e21, 123456789e15,
		-1e-9, math.MaxFloat64, math.SmallestNonzeroFloat64, 228.6, 3.2, -122.3959, 1e100, 5e-324}
	for _, f := range cases {
		want, _ := json.Marshal(f)
		got, err := AppendFloat(nil, f)
		if err != nil || string(got) != string(want) {
			t.Errorf("AppendFloat(%g) = %s (%v), want %s", f, got, err, want)
		}
	}
	for _, f := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		_, ref := json.Marshal(f)
		if _, err := AppendFloat(nil, f); err == nil || ref == nil || err.Error() != ref.Error() {
			t.Errorf("AppendFloat(%g): error %v, encoding/json %v", f, err, ref)
		}
	}
}

// The indented layout is json.MarshalIndent's, empty lists and objects
// included.
func TestWriterLayoutAsMarshalIndent(t *testing.T) {
	w := &Writer{Indent: "  ", EscapeHTML: true}
	w.BeginObject()
	w.Key("name")
	w.String("A & B")
	w.Key("list")
	w.BeginArray()
	w.Int(1)
	w.Float(2.5)
	w.BeginObject()
	w.EndObject()
	w.BeginArray()
	w.EndArray()
	w.EndArray()
	w.Key("ok")
	w.Bool(true)
	w.Key("none")
	w.Null()
	w.EndObject()
	got, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	want, _ := json.MarshalIndent(struct {
		Name string `json:"name"`
		List []any  `json:"list"`
		OK   bool   `json:"ok"`
		None any    `json:"none"`
	}{"A & B", []any{1, 2.5, struct{}{}, []int{}}, true, nil}, "", "  ")
	if string(got) != string(want) {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
	w = &Writer{}
	w.BeginArray()
	w.Float(math.NaN())
	w.EndArray()
	if _, err := w.Bytes(); err == nil {
		t.Error("NaN was written")
	}
}

// The options a file format adds: a key written twice and nesting too deep
// are refused, with where they were met.
func TestDuplicatesAndDepth(t *testing.T) {
	_, err := Parse([]byte(`{"a": [0, {"b": 1, "b": 2}]}`), Options{NoDuplicates: true})
	var dup *DuplicateKeyError
	if !errors.As(err, &dup) {
		t.Fatalf("duplicate: got %v", err)
	}
	want := []Step{{Key: "a"}, {Index: 1, InArray: true}, {Key: "b"}}
	if !reflect.DeepEqual(dup.Path, want) || dup.Offset != 22 {
		t.Errorf("duplicate at %+v offset %d, want %+v offset 22", dup.Path, dup.Offset, want)
	}
	if _, err := Parse([]byte(`{"a": 1, "a": 2}`), Options{}); err != nil {
		t.Errorf("without NoDuplicates a repeated key is JSON: %v", err)
	}
	deep := strings.Repeat("[", 3) + "1" + strings.Repeat("]", 3)
	if _, err := Parse([]byte(deep), Options{MaxDepth: 3}); err != nil {
		t.Errorf("3 deep with MaxDepth 3: %v", err)
	}
	deep = strings.Repeat("[", 4) + "1" + strings.Repeat("]", 4)
	var de *DepthError
	if _, err := Parse([]byte(deep), Options{MaxDepth: 3}); !errors.As(err, &de) || de.Offset != 4 {
		t.Errorf("4 deep with MaxDepth 3: %v", err)
	}
	v, err := Parse([]byte(`{"a": 1} tail`), Options{Prefix: true})
	if err != nil || v.End != 8 {
		t.Errorf("prefix: %v, end %d", err, v.End)
	}
}

// TestAgreesWithEncodingJSONOnRandomEdits compares with encoding/json on
// byte-level edits of the RFC 8259 examples (a fixed seed, so a failure
// repeats).
func TestAgreesWithEncodingJSONOnRandomEdits(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for _, c := range rfc8259[:2] {
		for range 3000 {
			compareWithStandard(t, jsonxtest.Edit(rng, []byte(c), 3))
		}
	}
}
