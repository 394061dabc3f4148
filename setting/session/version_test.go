package session

import (
	"bytes"
	"errors"
	"os"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting"
)

// v1ExamplePath is the example as version 1 wrote it, kept to show that
// older files are still read.
const v1ExamplePath = "../../testdata/sessions/v1/brackenfold-stephenson.json"

func readFile(t *testing.T, path string) ([]byte, *Session) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	s, err := Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return b, s
}

// TestVersion1Read: the version 1 example reads as the version 2 example
// without its plan aims, and is written back as version 2: the same bytes
// as the version 2 example without the "plan_aims" object.
func TestVersion1Read(t *testing.T) {
	v1raw, v1 := readFile(t, v1ExamplePath)
	v2raw, v2 := readFile(t, examplePath)
	if !bytes.Contains(v1raw, []byte(`"version": 1,`)) || !bytes.Contains(v2raw, []byte(`"version": 2,`)) {
		t.Fatal("the examples are not of versions 1 and 2")
	}
	if v2.Aims.IsZero() {
		t.Fatal("the version 2 example has no plan aims")
	}
	if !v1.Aims.IsZero() {
		t.Fatalf("a version 1 file gave aims %+v", v1.Aims)
	}
	want := *v2
	want.Aims = PlanAims{}
	if !reflect.DeepEqual(v1, &want) {
		t.Fatal("the version 1 example does not read as the version 2 example without its aims")
	}
	var b bytes.Buffer
	if err := Encode(&b, v1); err != nil {
		t.Fatal(err)
	}
	i := bytes.Index(v2raw, []byte("\n  \"plan_aims\": {")) + 1
	j := bytes.Index(v2raw, []byte("\n  \"cylinders\": [")) + 1
	if i <= 0 || j < i {
		t.Fatal("the version 2 example has no plan_aims before its cylinders")
	}
	noAims := append(append([]byte{}, v2raw[:i]...), v2raw[j:]...)
	if !bytes.Equal(b.Bytes(), noAims) {
		t.Errorf("the version 1 example written again is not the version 2 example without plan_aims:\n%s", b.Bytes())
	}
}

// TestVersion2RoundTrip: a version 2 file with every aim reads and is
// written back byte for byte.
func TestVersion2RoundTrip(t *testing.T) {
	raw, _ := readFile(t, examplePath)
	for _, aims := range []string{
		"", // the example as it is
		`  "plan_aims": {
    "priority": "balanced",
    "target_lead_mm": 0.25,
    "lead_share": 0.7,
    "running_notch": "full forward"
  },
`,
		`  "plan_aims": {
    "target_lead_mm": 0
  },
`,
		`  "plan_aims": {
    "priority": "cut-offs"
  },
`,
	} {
		in := raw
		if aims != "" {
			i := bytes.Index(raw, []byte("\n  \"plan_aims\": {")) + 1
			j := bytes.Index(raw, []byte("\n  \"cylinders\": [")) + 1
			in = append(append(append([]byte{}, raw[:i]...), aims...), raw[j:]...)
		}
		s, err := Decode(bytes.NewReader(in))
		if err != nil {
			t.Fatalf("%s: %v", aims, err)
		}
		var b bytes.Buffer
		if err := Encode(&b, s); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(b.Bytes(), in) {
			t.Errorf("aims\n%s\nwritten back differently:\n%s", aims, b.Bytes())
		}
	}
}

// TestBadAims: each bad aim is refused with a sentence naming its key.
func TestBadAims(t *testing.T) {
	v2 := strings.Replace(testJSON, `"version": 1,`, `"version": 2,`, 1)
	add := func(in, aims string) string {
		return strings.Replace(in, `"display_unit": "mm",`, `"display_unit": "mm", "plan_aims": `+aims+`,`, 1)
	}
	cases := []struct {
		name, in, field, says string
	}{
		{"unknown priority", add(v2, `{"priority": "equal-leads"}`), "plan_aims.priority", `must be one of "leads", "cut-offs" or "balanced"`},
		{"priority as a number", add(v2, `{"priority": 1}`), "plan_aims.priority", "must be text"},
		{"target lead too large", add(v2, `{"target_lead_mm": 40}`), "plan_aims.target_lead_mm", "must be between -5 and 25"},
		{"target lead as text", add(v2, `{"target_lead_mm": "0.2"}`), "plan_aims.target_lead_mm", "must be a number"},
		{"target lead null", add(v2, `{"target_lead_mm": null}`), "plan_aims.target_lead_mm", "must be a number"},
		{"lead share without balance", add(v2, `{"priority": "leads", "lead_share": 0.5}`), "plan_aims.lead_share", `only when the priority is "balanced"`},
		{"lead share zero", add(v2, `{"priority": "balanced", "lead_share": 0}`), "plan_aims.lead_share", "must be more than zero"},
		{"lead share above one", add(v2, `{"priority": "balanced", "lead_share": 1.5}`), "plan_aims.lead_share", "must be between 0 and 1"},
		{"unknown notch", add(v2, `{"running_notch": "notch 9"}`), "plan_aims.running_notch", `The notch "notch 9" is not one the plan works in`},
		{"mid gear", add(v2, `{"running_notch": "mid gear"}`), "plan_aims.running_notch", `"full forward"`},
		{"unknown key", add(v2, `{"priorty": "leads"}`), "plan_aims.priorty", `did you mean "priority"?`},
		{"not an object", add(v2, `["leads"]`), "plan_aims", "must be the plan's aims, written {...}"},
		{"aims in a version 1 file", add(testJSON, `{"priority": "leads"}`), "plan_aims", `change its "version" to 2`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := Decode(strings.NewReader(c.in))
			var e *setting.Error
			if s != nil || !errors.As(err, &e) {
				t.Fatalf("got %v, %v; want an error", s != nil, err)
			}
			if e.Field != c.field || !strings.Contains(e.Message, c.says) {
				t.Errorf("got %s: %s\nwant %s: ...%s...", e.Field, e.Message, c.field, c.says)
			}
			if !strings.HasSuffix(e.Message, ".") && !strings.HasSuffix(e.Message, "?).") {
				t.Errorf("not a sentence: %q", e.Message)
			}
		})
	}
}

// TestAimsEncodeRefused: aims Decode would refuse are not written.
func TestAimsEncodeRefused(t *testing.T) {
	_, s := readFile(t, examplePath)
	for _, a := range []PlanAims{{Priority: "equal"}, {RunningNotch: "no such notch"}, {LeadShare: 0.5}} {
		s.Aims = a
		var b bytes.Buffer
		err := Encode(&b, s)
		var e *setting.Error
		if !errors.As(err, &e) || !strings.HasPrefix(e.Field, "plan_aims") || b.Len() != 0 {
			t.Errorf("aims %+v: error %v, %d bytes written", a, err, b.Len())
		}
	}
}
