package session

import (
	"bytes"
	"errors"
	"reflect"
	"strings"
	"testing"

	"evenbeat/setting"
)

// heardJSON is testJSON with two beats heard (invented figures).
var heardJSON = strings.Replace(testJSON, `      "note": "not yet read"
    }
  ]
}`, `      "note": "not yet read"
    }
  ],
  "heard": [
    {"date": "2026-12-03", "position": "running", "gaps_deg": [88.5, 91.25, 89.75, 90.5], "rev_per_min": 72.4},
    {"date": "2026-12-03T15:04:05Z", "position": "full back", "gaps_deg": [180.2, 179.8], "rev_per_min": 40}
  ]
}`, 1)

// The heard beats read, write back byte for byte and decode the same.
func TestHeardRoundTrip(t *testing.T) {
	if heardJSON == testJSON {
		t.Fatal("the test session's end was not found")
	}
	s := mustDecode(t, heardJSON)
	want := []Heard{
		{Date: "2026-12-03", Position: "running", GapsDeg: []float64{88.5, 91.25, 89.75, 90.5}, RevPerMin: 72.4},
		{Date: "2026-12-03T15:04:05Z", Position: "full back", GapsDeg: []float64{180.2, 179.8}, RevPerMin: 40},
	}
	if !reflect.DeepEqual(s.Heard, want) {
		t.Fatalf("heard %+v, want %+v", s.Heard, want)
	}
	var b bytes.Buffer
	if err := Encode(&b, s); err != nil {
		t.Fatal(err)
	}
	again := mustDecode(t, b.String())
	if !reflect.DeepEqual(s, again) {
		t.Fatalf("decode(encode(s)) != s\n%s", b.String())
	}
	if !strings.Contains(b.String(), `"heard": [`) || !strings.Contains(b.String(), `"rev_per_min": 72.4`) {
		t.Errorf("the file written lacks the heard beats:\n%s", b.String())
	}
	// None heard: no key written.
	s.Heard = nil
	b.Reset()
	if err := Encode(&b, s); err != nil || strings.Contains(b.String(), "heard") {
		t.Errorf("a session with nothing heard writes %q (%v)", "heard", err)
	}
}

// A heard beat that cannot be is refused naming its field, in a full
// sentence; so is a list longer than MaxHeard, which reads at the bound.
func TestHeardRefused(t *testing.T) {
	one := `{"date": "2026-12-03", "position": "running", "gaps_deg": [88.5, 91.25, 89.75, 90.5], "rev_per_min": 72.4}`
	cases := []struct{ name, from, to, field, says string }{
		{"date", `"date": "2026-12-03", "position": "running"`, `"date": "3 Dec", "position": "running"`, "heard[0].date", "cannot be read"},
		{"position", `"position": "running"`, `"position": "notch 2"`, "heard[0].position", `The notch "notch 2" is not one of this engine's`},
		{"no position", `"position": "running", `, ``, "heard[0].position", "is missing"},
		{"one gap", `[88.5, 91.25, 89.75, 90.5]`, `[360]`, "heard[0].gaps_deg", "holds 1; give from 2 to 24"},
		{"gap zero", `[88.5, 91.25, 89.75, 90.5]`, `[0, 180, 89.75, 90.25]`, "heard[0].gaps_deg[0]", "more than 0 and less than 360"},
		{"gap text", `[88.5, 91.25, 89.75, 90.5]`, `[88.5, "91", 89.75, 90.5]`, "heard[0].gaps_deg[1]", "must be a number"},
		{"not a turn", `[88.5, 91.25, 89.75, 90.5]`, `[88.5, 91.25, 89.75, 91.5]`, "heard[0].gaps_deg", "add up to 361 degrees"},
		{"speed zero", `"rev_per_min": 72.4}`, `"rev_per_min": 0}`, "heard[0].rev_per_min", "more than zero"},
		{"speed huge", `"rev_per_min": 72.4}`, `"rev_per_min": 72400}`, "heard[0].rev_per_min", "beyond an engine run on blocks"},
		{"sound kept", `"rev_per_min": 72.4}`, `"rev_per_min": 72.4, "samples": [0.1, 0.2]}`, "heard[0].samples", "not part of a heard beat"},
		{"too many", one, strings.TrimSuffix(strings.Repeat(one+", ", MaxHeard+1), ", "), "heard", "holds 202; a session file holds at most 200"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if !strings.Contains(heardJSON, c.from) {
				t.Fatalf("test session has no %q", c.from)
			}
			_, err := Decode(strings.NewReader(strings.Replace(heardJSON, c.from, c.to, 1)))
			var e *setting.Error
			if !errors.As(err, &e) || e.Field != c.field || !strings.Contains(e.Message, c.says) {
				t.Fatalf("got %v, want an error on %s saying %q", err, c.field, c.says)
			}
			fullSentence(t, e.Message)
		})
	}
	at := strings.Replace(heardJSON, one, strings.TrimSuffix(strings.Repeat(one+", ", MaxHeard-1), ", "), 1)
	if s, err := Decode(strings.NewReader(at)); err != nil || len(s.Heard) != MaxHeard {
		t.Errorf("%d heard beats: %v", MaxHeard, err)
	}
}
