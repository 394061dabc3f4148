package badinput

import (
	"bytes"
	"os"
	"testing"

	"evenbeat/setting/session"
)

// The catalogue builds from the demo files, holds at least the 40 kinds
// issue 13 asks for, and every refusal says what to look for.
func TestCatalogueBuilds(t *testing.T) {
	sess, err := os.ReadFile("../../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	eng, err := os.ReadFile("../../../testdata/engines/brackenfold-walschaerts.json")
	if err != nil {
		t.Fatal(err)
	}
	cases, err := Catalogue(sess, eng)
	if err != nil {
		t.Fatal(err)
	}
	if len(cases) < 40 {
		t.Errorf("%d cases, want at least 40", len(cases))
	}
	names := map[string]bool{}
	for _, c := range cases {
		if names[c.Name] {
			t.Errorf("two cases are called %q", c.Name)
		}
		names[c.Name] = true
		if c.Refused && (len(c.Words) == 0 || len(c.Fix) == 0) {
			t.Errorf("%s: a refusal without the words to look for", c.Name)
		}
		if c.Blocked && !c.Refused {
			t.Errorf("%s: blocked but not refused", c.Name)
		}
	}
	if _, err := Catalogue(nil, nil); err == nil {
		t.Error("a catalogue built from empty files, without an error")
	}
}

// Largest grows the demo session within the format's bounds: the file
// reads, and a plan can be asked of it.
func TestLargestReads(t *testing.T) {
	demo, err := os.ReadFile("../../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	size := 2 << 20
	if !testing.Short() {
		size = 16 << 20
	}
	b, err := Largest(demo, size)
	if err != nil {
		t.Fatal(err)
	}
	if len(b) > size || len(b) < size*3/4 {
		t.Errorf("%d bytes, want about %d", len(b), size)
	}
	s, err := session.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	r := s.Cylinders[0].Rounds[len(s.Cylinders[0].Rounds)-1]
	if n := r.Readings(); n != session.MaxRoundReadings {
		t.Errorf("a round of %d readings, want %d", n, session.MaxRoundReadings)
	}
	for _, p := range s.Readiness(0) {
		if p.Blocking {
			t.Errorf("the plan is blocked: %s", p)
		}
	}
}
