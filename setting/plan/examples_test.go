package plan

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"
)

// The examples in testdata/plans are written from the example session by
// this test when EVENBEAT_WRITE_PLANS=1; otherwise it only checks that they
// can be made. They are examples, not goldens.
func TestExamplePlanFiles(t *testing.T) {
	s := exampleSession(t)
	p, err := Make(s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	var txt, js, ev bytes.Buffer
	if err := WriteText(&txt, p, s.DisplayUnit); err != nil {
		t.Fatal(err)
	}
	if err := WriteJSON(&js, p, s.DisplayUnit); err != nil {
		t.Fatal(err)
	}
	scanFinite(t, js.Bytes())
	if err := WriteEventsJSON(&ev, s.Engine); err != nil {
		t.Fatal(err)
	}
	if os.Getenv("EVENBEAT_WRITE_PLANS") != "1" {
		return
	}
	dir := filepath.FromSlash("../../testdata/plans")
	for name, b := range map[string][]byte{
		"brackenfold-stephenson.plan.txt":    txt.Bytes(),
		"brackenfold-stephenson.plan.json":   js.Bytes(),
		"brackenfold-stephenson.events.json": ev.Bytes(),
	} {
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}
