package session

import (
	"bytes"
	"testing"
)

// The examples of RFC 7396, "JSON Merge Patch", P. Hoffman and J. Snell,
// IETF, 2014, Appendix A: each target, patch and result.
func TestMergePatchRFC7396(t *testing.T) {
	cases := [][3]string{
		{`{"a":"b"}`, `{"a":"c"}`, `{"a":"c"}`},
		{`{"a":"b"}`, `{"b":"c"}`, `{"a":"b","b":"c"}`},
		{`{"a":"b"}`, `{"a":null}`, `{}`},
		{`{"a":"b","b":"c"}`, `{"a":null}`, `{"b":"c"}`},
		{`{"a":["b"]}`, `{"a":"c"}`, `{"a":"c"}`},
		{`{"a":"c"}`, `{"a":["b"]}`, `{"a":["b"]}`},
		{`{"a":{"b":"c"}}`, `{"a":{"b":"d","c":null}}`, `{"a":{"b":"d"}}`},
		{`{"a":[{"b":"c"}]}`, `{"a":[1]}`, `{"a":[1]}`},
		{`["a","b"]`, `["c","d"]`, `["c","d"]`},
		{`{"a":"b"}`, `["c"]`, `["c"]`},
		{`{"a":"foo"}`, `null`, `null`},
		{`{"a":"foo"}`, `"bar"`, `"bar"`},
		{`{"e":null}`, `{"a":1}`, `{"e":null,"a":1}`},
		{`[1,2]`, `{"a":"b","c":null}`, `{"a":"b"}`},
		{`{}`, `{"a":{"bb":{"ccc":null}}}`, `{"a":{"bb":{}}}`},
	}
	for _, c := range cases {
		target, err := parseCompact([]byte(c[0]))
		if err != nil {
			t.Fatal(err)
		}
		patch, err := parseCompact([]byte(c[1]))
		if err != nil {
			t.Fatal(err)
		}
		before := compact(target)
		var b bytes.Buffer
		mergePatch(target, patch).writeCompact(&b)
		if b.String() != c[2] {
			t.Errorf("%s + %s = %s, want %s", c[0], c[1], b.String(), c[2])
		}
		if compact(target) != before {
			t.Errorf("the patch changed its target %s", c[0])
		}
	}
}

func compact(n *node) string {
	var b bytes.Buffer
	n.writeCompact(&b)
	return b.String()
}

func TestFieldNamesInMessages(t *testing.T) {
	cases := map[string]string{
		"":                                 "The file",
		"cylinders[1].rounds[0].sweeps[2]": "This sweep",
		"cylinders[1].rounds[0].sweeps[2].readings[5].gauge_mm": "The gauge reading",
		"adjustments[0].thread.pitch_mm":                        "The thread pitch",
		"a.b.unheard_of":                                        "The value",
		"x[3]":                                                  "This entry",
	}
	for field, want := range cases {
		if got := subject(field); got != want {
			t.Errorf("subject(%q) = %q, want %q", field, got, want)
		}
	}
	w := Warning{Field: "measuring.wheel_diameter_mm", Message: "A wheel of 20 mm is unusual."}
	if w.String() != "measuring.wheel_diameter_mm: A wheel of 20 mm is unusual." {
		t.Errorf("Warning.String = %q", w.String())
	}
	p := Problem{Field: "cylinders[0].rounds", Blocking: true, Message: "No readings."}
	if p.String() != "cylinders[0].rounds: No readings." {
		t.Errorf("Problem.String = %q", p.String())
	}
}
