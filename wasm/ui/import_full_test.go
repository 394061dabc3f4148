package ui

import (
	"os"
	"strings"
	"testing"
)

// TestImportOpensPlan: the whole demo session file, imported, opens on the
// plan of its latest round.
func TestImportOpensPlan(t *testing.T) {
	a := newTestApp(t, newMemStore())
	b, err := os.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	if a.Screen() != Plan || !strings.HasPrefix(a.PlanText(), "Plan for Brackenfold") {
		t.Fatalf("screen %s, plan text %q", a.Screen(), a.PlanText())
	}
}
