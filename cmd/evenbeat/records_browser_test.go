package main

import (
	"image"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"evenbeat/render"
)

// TestPhoneHeldFieldAndUndo runs the app in Chromium as a 390x844 phone
// at 3x with touch, on the demo session file (shown in inches): a front
// port mark of 999 in typed on the keypad is held at its field with a
// sentence in inches naming the field (no key path, nothing written, the
// line still "Saved"); the engine deleted from the engines list leaves
// the list and IndexedDB, an Undo bar is drawn over the bottom of the
// screen, and Undo writes it back; deleted again and left, the delete
// stands after a reload.
func TestPhoneHeldFieldAndUndo(t *testing.T) {
	b, _ := openDemoFile(t)
	ctx := b.ctx
	name := decodeDemo(t).Name

	// A value that cannot be is held at its field.
	pressLabel(b, "Menu", true)
	wantScreen(b, "menu")
	pressLabel(b, "All readings", true)
	wantScreen(b, "readings")
	pressLabel(b, "Front port mark:", false)
	wantScreen(b, "measure")
	for _, k := range []string{"9", "9", "9", "Next"} {
		pressLabel(b, k, true)
	}
	note := eval[string](t, ctx, "window.evenbeatNote")
	if b.State() != "measure" || b.Field() != "Front port mark" || !strings.HasPrefix(note, "Front port mark: 999 in cannot be taken") ||
		strings.Contains(note, "mm") || strings.Contains(note, "port_marks") {
		t.Fatalf("999 in typed as the front port mark: screen %s, field %q, note %q", b.State(), b.Field(), note)
	}
	if st := eval[string](t, ctx, "window.evenbeatStatus"); st != "Saved" {
		t.Errorf("the saving line says %q after a held value; want Saved", st)
	}
	if stored := eval[string](t, ctx, storedNamesJS); strings.Contains(stored, "25374.6") || !strings.Contains(stored, name) {
		t.Error("the held value reached IndexedDB, or the session is not there")
	}
	screenshot(t, ctx, "phone-held-field")

	// Delete and Undo on the engines list.
	engines := func() {
		pressLabel(b, "Menu", true)
		wantScreen(b, "menu")
		pressLabel(b, "Engines", true)
		wantScreen(b, "engines")
	}
	engines()
	pressLabel(b, "Delete "+name, true)
	if _, ok := findTarget(b.Targets(), "Undo", true); !ok {
		t.Fatalf("no Undo after the delete: %+v", b.Targets())
	}
	if _, ok := findTarget(b.Targets(), name+",", false); ok {
		t.Fatal("the deleted engine is still listed")
	}
	pressLabel(b, "Undo", true)
	if _, ok := findTarget(b.Targets(), name+",", false); !ok {
		t.Fatalf("Undo did not bring the engine back: %+v", b.Targets())
	}
	waitFor(t, ctx, appAnswer, `window.evenbeatStatus === "Saved"`)
	if !strings.Contains(eval[string](t, ctx, storedNamesJS), name) {
		t.Fatal("after Undo the session is not in IndexedDB")
	}

	// Deleted again and left: the bar is drawn, goes, and the delete
	// stands.
	pressLabel(b, "Delete "+name, true)
	undo, ok := findTarget(b.Targets(), "Undo", true)
	if !ok {
		t.Fatal("no Undo after the second delete")
	}
	th := render.Light()
	if eval[string](t, ctx, "window.evenbeatTheme") == "dark" {
		th = render.Dark()
	}
	shot := screenshot(t, ctx, "phone-undo-bar")
	bar := image.Rect(12*phoneScale, int(undo.Y)*phoneScale, int(undo.X)*phoneScale, int(undo.Y+undo.H)*phoneScale)
	if n, all := count(shot, bar, th.Ink, 8), bar.Dx()*bar.Dy(); n < all/2 {
		t.Errorf("the Undo bar's ground (ink) covers %d of %d pixels beside its button; want most", n, all)
	}
	waitFor(t, ctx, 60*time.Second, `!JSON.parse(window.evenbeatTargets).some(t => t.Label === "Undo")`)
	waitFor(t, ctx, appAnswer, `window.evenbeatStatus === "Saved"`)
	within(t, ctx, 90*time.Second, "reloading", chromedpReload())
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if strings.Contains(eval[string](t, ctx, "window.evenbeatTargets"), name) || strings.Contains(eval[string](t, ctx, storedNamesJS), name) {
		t.Error("after the Undo bar went and a reload, the deleted engine is back")
	}
}

// openDemoFile opens the app in a fresh Chromium phone (openPhone), hands
// it the demo session file as a chosen file would be, waits for its plan
// saved, and returns the app to tap and the file.
func openDemoFile(t *testing.T) (*browserApp, []byte) {
	t.Helper()
	ctx := openPhone(t)
	src, err := os.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	eval[bool](t, ctx, "(window.evenbeatImport("+strconv.Quote(string(src))+"), true)")
	waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan" && window.evenbeatStatus === "Saved"`)
	readyForTouch(t, ctx)
	return &browserApp{T: t, ctx: ctx, hold: 60 * time.Millisecond}, src
}
