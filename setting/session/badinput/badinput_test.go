package badinput

import (
	"os"
	"testing"
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
