package ui

import (
	"errors"
	"strings"
	"testing"

	"evenbeat/render"
)

// TestRename: the menu's "Rename engine" hands the current name to the
// glue; Rename trims, refuses an empty or overlong name with a sentence
// naming the field, and saves a good one.
func TestRename(t *testing.T) {
	a := planApp(t)
	tap(t, a, "Menu")
	for _, tg := range a.Targets() {
		if tg.Label == "Rename engine" {
			t.Fatal("Rename engine shown without OnName")
		}
	}
	var asked []string
	a.opt.OnName = func(cur string) { asked = append(asked, cur) }
	tap(t, a, "Rename engine")
	if len(asked) != 1 || asked[0] != a.Session().Name {
		t.Fatalf("OnName called with %q, want [%q]", asked, a.Session().Name)
	}
	for _, bad := range []string{"", "   ", strings.Repeat("x", 61)} {
		err := a.Rename(bad)
		if err == nil || !strings.HasPrefix(err.Error(), "name: ") || !strings.HasSuffix(err.Error(), ".") {
			t.Errorf("Rename(%q) = %v, want a sentence naming the field name", bad, err)
		}
	}
	st := a.opt.Store.(*memStore)
	before := len(st.puts)
	if err := a.Rename("  Garden railway 0-6-0  "); err != nil {
		t.Fatal(err)
	}
	if a.Session().Name != "Garden railway 0-6-0" || len(st.puts) != before+1 {
		t.Fatalf("name %q, %d writes", a.Session().Name, len(st.puts)-before)
	}
	if err := a.Rename(strings.Repeat("é", 60)); err != nil {
		t.Errorf("60 characters refused: %v", err)
	}
}

// TestShareReport: "Share report" is offered only with a plan and hands
// the plan's model and the session to the glue.
func TestShareReport(t *testing.T) {
	var name string
	var got render.ReportModel
	a := planApp(t)
	a.opt.OnShare = func(n string, m render.ReportModel) { name, got = n, m }
	if err := a.Rename("Brackenfold No 3"); err != nil {
		t.Fatal(err)
	}
	tap(t, a, "Menu")
	tap(t, a, "Share report")
	if name != "Brackenfold-No-3-report.pdf" || got.Model != a.model || got.Session != a.Session() {
		t.Fatalf("OnShare(%q, %+v)", name, got)
	}
	b := newTestApp(t, newMemStore())
	b.opt.OnShare = a.opt.OnShare
	tap(t, b, "Brackenfold (Stephenson)")
	tap(t, b, "Menu")
	for _, tg := range b.Targets() {
		if tg.Label == "Share report" {
			t.Fatal("Share report offered with no plan")
		}
	}
}

// TestUpdateBanner: once a new version is ready every screen says so and
// its Restart button calls OnUpdate.
func TestUpdateBanner(t *testing.T) {
	a := planApp(t)
	restarts := 0
	a.opt.OnUpdate = func() { restarts++ }
	a.SetUpdateReady(true)
	for _, scr := range []string{"plan", "Menu", "History of rounds"} {
		if scr != "plan" {
			tap(t, a, scr)
		}
		text, _ := drawText(a)
		if !strings.Contains(text, "A new version is ready.") {
			t.Errorf("%s: no banner:\n%s", a.Screen(), text)
		}
	}
	tap(t, a, "Restart")
	if restarts != 1 {
		t.Fatalf("Restart called OnUpdate %d times", restarts)
	}
	a.SetUpdateReady(false)
	if text, _ := drawText(a); strings.Contains(text, "A new version") {
		t.Fatal("banner still shown")
	}
	if a.PlanTime() <= 0 {
		t.Errorf("PlanTime %v after a plan", a.PlanTime())
	}
}

// TestCopyPlanWords: the menu's copy button hands the glue the plan's
// words, and says how the copy went; without a plan there is no button.
func TestCopyPlanWords(t *testing.T) {
	a := planApp(t)
	var got []string
	a.opt.OnCopy = func(text string) { got = append(got, text) }
	tap(t, a, "Menu")
	tap(t, a, CopyLabel)
	if len(got) != 1 || got[0] != a.PlanText() || got[0] == "" {
		t.Fatalf("copied %q; want the plan's words once", got)
	}
	a.CopyDone(nil)
	if text, _ := drawText(a); !strings.Contains(strings.ReplaceAll(text, "\n", " "), "words are copied") {
		t.Errorf("after the copy the menu says:\n%s", text)
	}
	a.CopyDone(errors.New("the browser refused (NotAllowedError)"))
	if text, _ := drawText(a); !strings.Contains(strings.ReplaceAll(text, "\n", " "), "not copied: the browser refused (NotAllowedError)") {
		t.Errorf("after a refused copy the menu says:\n%s", text)
	}

	// A session with no readings has no plan: no button.
	b := newTestApp(t, newMemStore())
	b.opt.OnCopy = func(string) { t.Error("copied without a plan") }
	bare := demoSession(t)
	for i := range bare.Cylinders {
		bare.Cylinders[i].Rounds = nil
	}
	src, err := encodeSession(bare)
	if err != nil {
		t.Fatal(err)
	}
	if err := b.Import(src); err != nil {
		t.Fatal(err)
	}
	tap(t, b, "Menu")
	if b.Screen() != Menu {
		t.Fatalf("Menu led to %s", b.Screen())
	}
	for _, tg := range b.Targets() {
		if tg.Label == CopyLabel {
			t.Error("the menu offers the copy with no plan")
		}
	}
}
