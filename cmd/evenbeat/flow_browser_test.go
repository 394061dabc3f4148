package main

import (
	"context"
	"encoding/json"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"
)

// flowTarget is one touch target the flow app publishes (CSS px).
type flowTarget struct {
	Label      string
	X, Y, W, H float64
}

// tapLabel taps the published target whose label starts with label.
func tapLabel(t *testing.T, ctx context.Context, label string) {
	t.Helper()
	var ts []flowTarget
	if err := json.Unmarshal([]byte(eval[string](t, ctx, "window.evenbeatTargets")), &ts); err != nil {
		t.Fatal(err)
	}
	for _, tg := range ts {
		if strings.HasPrefix(tg.Label, label) {
			tap(t, ctx, tg.X+tg.W/2, tg.Y+tg.H/2, 150*time.Millisecond)
			return
		}
	}
	t.Fatalf("no target %q on %s: %+v", label, eval[string](t, ctx, "window.evenbeatState"), ts)
}

// tapAndWait taps label and waits until the page state is want.
func tapAndWait(t *testing.T, ctx context.Context, label, want string) {
	t.Helper()
	tapLabel(t, ctx, label)
	waitFor(t, ctx, 30*time.Second, "window.evenbeatState === "+strconv.Quote(want))
}

// TestFlowPhone runs the measuring flow (package ui, "?flow") in Chromium
// as a 3x phone with touch: set-up of the invented demo engine by taps,
// the cautions, one reading typed on the keypad until the app says saved;
// then the browser is killed outright and started again on the same
// profile, and the reading must be there; the back gesture moves back a
// step inside the app; a session file handed to the page opens on its
// plan, whose words are in the page's live region.
func TestFlowPhone(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	profile := t.TempDir()
	ctx, _ := newBrowser(t, profile, noTierUp())
	url := m.URL + "?flow"

	within(t, ctx, 90*time.Second, "opening "+url, chromedpNavigate(url))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	tapAndWait(t, ctx, "Brackenfold (Stephenson) (invented demo)", "units")
	tapAndWait(t, ctx, "Next", "sizes")
	for eval[string](t, ctx, "window.evenbeatState") == "sizes" {
		tapLabel(t, ctx, "Next")
		time.Sleep(300 * time.Millisecond)
	}
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "adjust"`)
	tapAndWait(t, ctx, "Next: start measuring", "cautions")
	tapAndWait(t, ctx, "I understand", "measure")
	for _, k := range []string{"2", ".", "4", "8"} {
		tapLabel(t, ctx, k)
	}
	tapLabel(t, ctx, "Next")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatStatus === "Saved" && window.evenbeatField === "Back port mark"`)
	screenshot(t, ctx, "flow-measure")

	// Saved means on disk: kill the browser at once and start it again.
	killBrowser(t, ctx)
	ctx, _ = newBrowser(t, profile, noTierUp())
	within(t, ctx, 90*time.Second, "opening "+url+" after the kill", chromedpNavigate(url))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	tapAndWait(t, ctx, "Brackenfold (Stephenson), 1 round", "measure")
	tapAndWait(t, ctx, "All readings", "readings")
	if ts := eval[string](t, ctx, "window.evenbeatTargets"); !strings.Contains(ts, "Front port mark: 2.48 mm") {
		t.Fatalf("after the kill the reading is missing: %s", ts)
	}
	// The back gesture: one step back, still in the app.
	eval[bool](t, ctx, "(history.back(), true)")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "measure"`)

	// The demo session file imported (as a chosen file would be) opens on
	// its plan, whose words are in the page's live region. (Typing a
	// whole round by taps is tested natively in package ui: here each tap
	// costs seconds.)
	b, err := os.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	eval[bool](t, ctx, "(window.evenbeatImport("+strconv.Quote(string(b))+"), true)")
	waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan" && window.evenbeatPlanText.includes("Plan for Brackenfold")`)
	if words := eval[string](t, ctx, `document.getElementById("evenbeat-words").textContent`); !strings.Contains(words, "Plan for Brackenfold") {
		t.Errorf("the live region does not hold the plan: %q", words)
	}
	screenshot(t, ctx, "flow-plan")
}
