package main

import (
	"bytes"
	"context"
	"encoding/base64"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/input"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"evenbeat/render"
	"evenbeat/render/report"
	"evenbeat/wasm/ui"
)

// stubShareJS replaces the page's share sheet with one that keeps the
// shared file on window.evenbeatSharedFile (name, type, base64 bytes), as
// a phone's sheet would receive it.
const stubShareJS = `(() => {
	navigator.canShare = () => true;
	navigator.share = (d) => new Promise((ok, no) => {
		const f = d.files[0], r = new FileReader();
		r.onload = () => {
			window.evenbeatSharedFile = {Name: f.name, Type: f.type, Data: r.result.slice(r.result.indexOf(",") + 1)};
			ok();
		};
		r.onerror = () => no(r.error);
		r.readAsDataURL(f);
	});
	return true;
})()`

// storedNamesJS is a promise of every value in the page's IndexedDB that
// is a string, joined: the stored session files.
const storedNamesJS = `new Promise((ok, no) => {
	const r = indexedDB.open("evenbeat", 1);
	r.onerror = () => no(r.error);
	r.onsuccess = () => {
		const g = r.result.transaction("kv").objectStore("kv").getAll();
		g.onsuccess = () => { r.result.close(); ok(g.result.filter(v => typeof v === "string").join("\n")); };
		g.onerror = () => no(g.error);
	};
})`

// TestNameAndShare runs the app in Chromium as a 3x phone with touch, on
// the demo session's plan: Share report hands the share sheet a PDF
// byte-identical to the one the command line makes of the same plans;
// Rename engine shows a labelled text box over the canvas
// (no zoom on focus, targets of at least 48 CSS px), which the back
// gesture and Escape close, which refuses an empty name with a sentence,
// and whose OK renames the engine: shown by the app, saved in IndexedDB.
func TestNameAndShare(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	demo, err := os.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	wantName, wantReport := nativeShare(t, demo)
	var want bytes.Buffer
	if err := report.PDF(&want, wantReport, report.Title(wantReport)); err != nil {
		t.Fatal(err)
	}

	ctx := openDemoPlan(t, demo)
	if ms := eval[float64](t, ctx, "window.evenbeatPlanMs"); !(ms > 0) {
		t.Errorf("window.evenbeatPlanMs = %v after a plan; want the plan's time in ms", ms)
	}

	words := waitValue[string](t, ctx, 30*time.Second, "window.evenbeatPlanText")

	// Share: the report, a PDF of A4 pages, reaches the share sheet: the
	// very file the command line's report makes of the same plans.
	eval[bool](t, ctx, stubShareJS)
	slowTapLabel(t, ctx, "Menu")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "menu"`)
	if how := shareReport(t, ctx); how != "shared" {
		t.Fatalf("sharing the report: %s", how)
	}
	type sharedFile struct{ Name, Type, Data string }
	f := eval[sharedFile](t, ctx, "window.evenbeatSharedFile")
	if f.Name != wantName || f.Type != "application/pdf" {
		t.Errorf("shared %q of type %q; want %q, application/pdf", f.Name, f.Type, wantName)
	}
	b, err := base64.StdEncoding.DecodeString(f.Data)
	if err != nil {
		t.Fatal(err)
	}
	if dir := os.Getenv("EVENBEAT_SHOTS"); dir != "" {
		os.WriteFile(dir+"/shared-report.pdf", b, 0o644)
	}
	t.Logf("shared report: %d bytes, %d pages; laid out and written in %.0f ms", len(b), bytes.Count(b, []byte("/Type /Page ")),
		eval[float64](t, ctx, "window.evenbeatShareDrawMs"))
	if !bytes.Equal(b, want.Bytes()) {
		t.Errorf("the shared report (%d bytes) differs from the one made natively of the same plans (%d bytes)", len(b), want.Len())
	}

	// Copy: the plan's words reach the clipboard, written inside the tap's
	// pointerup (browsers write the clipboard only in a user's gesture).
	eval[bool](t, ctx, `(window.evenbeatClip = null, Object.defineProperty(navigator, "clipboard", {configurable: true, get: () => ({
		writeText: (text) => { window.evenbeatClip = {Text: text, In: (window.event && window.event.type) || "no event"}; return Promise.resolve(); },
	})}), true)`)
	slowTapLabel(t, ctx, "Copy the plan's words")
	type clip struct{ Text, In string }
	c := waitValue[clip](t, ctx, 30*time.Second, "window.evenbeatClip")
	if c.In != "pointerup" || c.Text != words {
		t.Errorf("the clipboard got %d characters inside %q; want the plan's %d characters inside the tap's pointerup", len(c.Text), c.In, len(words))
	}

	// The name box: shown over the canvas, focused, labelled, big enough.
	// It is open and focused already when the tap's pointerup has gone
	// through the page (a listener on window runs last): the focus is made
	// inside the user's gesture, which iOS needs to raise the keyboard.
	eval[bool](t, ctx, `(window.evenbeatFocusInTap = null, window.addEventListener("pointerup", () => {
		if (window.evenbeatFocusInTap === null) window.evenbeatFocusInTap = (document.activeElement || {}).id || "";
	}), true)`)
	slowTapLabel(t, ctx, "Rename engine")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === true`)
	if got := eval[string](t, ctx, `String(window.evenbeatFocusInTap)`); got != "evenbeat-name" {
		t.Errorf("at the end of the tap's pointerup the focus is on %q; want the name box's input (focused inside the gesture)", got)
	}
	if got, want := eval[string](t, ctx, `document.getElementById("evenbeat-name").value`), eval[string](t, ctx, "window.evenbeatName"); got != want {
		t.Errorf("the name box opened with %q; want the engine's name %q", got, want)
	}
	checkNameBox(t, ctx)
	// The back gesture closes it and stays in the app.
	eval[bool](t, ctx, "(history.back(), true)")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === false && !document.getElementById("evenbeat-name-box")`)
	time.Sleep(500 * time.Millisecond)
	if s := eval[string](t, ctx, "window.evenbeatState"); s != "menu" {
		t.Errorf("the back gesture with the name box open moved the app to %q; want it to close the box only", s)
	}
	// Escape closes it too. The input keeps the focus after the tap (the
	// box opens inside the tap, before the touch's mouse events land on it).
	slowTapLabel(t, ctx, "Rename engine")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === true`)
	time.Sleep(300 * time.Millisecond)
	if id := eval[string](t, ctx, `(document.activeElement || {}).id || ""`); id != "evenbeat-name" {
		t.Errorf("after the tap that opened the name box the focus is on %q; want its input", id)
	}
	key(t, ctx, "Escape", "Escape", 27, "")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === false`)
	// Cancel closes it, and the tap does not reach the app under the box.
	slowTapLabel(t, ctx, "Rename engine")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === true`)
	tapElement(t, ctx, "evenbeat-name-cancel")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === false`)
	time.Sleep(500 * time.Millisecond)
	if s := eval[string](t, ctx, "window.evenbeatState"); s != "menu" {
		t.Errorf("tapping Cancel on the name box moved the app to %q; the tap went through the box", s)
	}

	// An empty name is refused with a sentence; the box stays.
	slowTapLabel(t, ctx, "Rename engine")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === true`)
	old := eval[string](t, ctx, "window.evenbeatName")
	eval[bool](t, ctx, `(document.getElementById("evenbeat-name").value = "   ", true)`)
	key(t, ctx, "Enter", "Enter", 13, "\r")
	msg := waitValue[string](t, ctx, 30*time.Second, `document.getElementById("evenbeat-name-msg").textContent`)
	if !strings.Contains(msg, "empty") || !eval[bool](t, ctx, "window.evenbeatNaming") {
		t.Errorf("an empty name: the box says %q and open=%v; want a sentence about the empty name, box open", msg, eval[bool](t, ctx, "window.evenbeatNaming"))
	}
	if got := eval[string](t, ctx, "window.evenbeatName"); got != old {
		t.Errorf("an empty name changed the engine's name to %q", got)
	}
	// Typed and confirmed with the keyboard's Enter: renamed, shown, saved.
	const name = "Ravensdale No. 3 (invented)"
	eval[bool](t, ctx, `(document.getElementById("evenbeat-name").select(), true)`)
	within(t, ctx, 10*time.Second, "typing the name", chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, input.InsertText, input.InsertTextParams{Text: name})
		return err
	}))
	key(t, ctx, "Enter", "Enter", 13, "\r")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatNaming === false && window.evenbeatName === `+strconv.Quote(name)+` && window.evenbeatStatus === "Saved"`)
	if stored := eval[string](t, ctx, storedNamesJS); !strings.Contains(stored, name) {
		t.Errorf("the new name %q is not in IndexedDB", name)
	}
	slowTapLabel(t, ctx, "Engines")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "engines"`)
	if ts := eval[string](t, ctx, "window.evenbeatTargets"); !strings.Contains(ts, name) {
		t.Errorf("the engines list does not show the new name %q: %s", name, ts)
	}
}

// checkNameBox checks the open name box: focused text input of at most 60
// characters with a done key, a label screen readers read, text of at
// least 16 CSS px (iOS zooms into smaller), buttons of at least 48 CSS px.
func checkNameBox(t *testing.T, ctx context.Context) {
	t.Helper()
	type box struct {
		Focused, Labelled          bool
		Type, Hint, Label          string
		MaxLength                  int
		Font                       float64
		OKW, OKH, CancelW, CancelH float64
		Dialog, Modal              string
	}
	b := eval[box](t, ctx, `(() => {
		const i = document.getElementById("evenbeat-name");
		const r = id => document.getElementById(id).getBoundingClientRect();
		const form = i.closest("form");
		return {
			Focused: document.activeElement === i,
			Labelled: i.labels.length === 1,
			Type: i.type, Hint: i.getAttribute("enterkeyhint") || "", Label: i.labels.length ? i.labels[0].textContent : "",
			MaxLength: i.maxLength,
			Font: parseFloat(getComputedStyle(i).fontSize),
			OKW: r("evenbeat-name-ok").width, OKH: r("evenbeat-name-ok").height,
			CancelW: r("evenbeat-name-cancel").width, CancelH: r("evenbeat-name-cancel").height,
			Dialog: form.getAttribute("role") || "", Modal: form.getAttribute("aria-modal") || "",
		};
	})()`)
	t.Logf("name box: %+v", b)
	if !b.Focused {
		t.Error("the name box's input is not focused")
	}
	if !b.Labelled || b.Label != "Engine name" {
		t.Errorf("the input's label is %q (labelled %v); want one label, Engine name", b.Label, b.Labelled)
	}
	if b.Type != "text" || b.Hint != "done" || b.MaxLength != 60 {
		t.Errorf("input type %q, enterkeyhint %q, maxlength %d; want text, done, 60", b.Type, b.Hint, b.MaxLength)
	}
	if b.Font < 16 {
		t.Errorf("the input's text is %v CSS px; want at least 16 (iOS zooms into smaller)", b.Font)
	}
	if b.OKW < 48 || b.OKH < 48 || b.CancelW < 48 || b.CancelH < 48 {
		t.Errorf("OK is %.0fx%.0f and Cancel %.0fx%.0f CSS px; want at least 48x48", b.OKW, b.OKH, b.CancelW, b.CancelH)
	}
	if b.Dialog != "dialog" || b.Modal != "true" {
		t.Errorf("the box's role %q, aria-modal %q; want dialog, true", b.Dialog, b.Modal)
	}
}

// nativeShare runs package ui natively on the demo session as the phone
// does (import, Menu, Share report) and returns what it hands OnShare.
func nativeShare(t *testing.T, demo []byte) (string, render.ReportModel) {
	t.Helper()
	var name string
	var rm render.ReportModel
	a := ui.New(ui.Options{OnShare: func(n string, m render.ReportModel) { name, rm = n, m }})
	a.Resize(phoneW, phoneH)
	if err := a.Import(demo); err != nil {
		t.Fatal(err)
	}
	a.Update()
	for _, label := range []string{"Menu", "Share report"} {
		found := false
		for _, tg := range a.Targets() {
			if tg.Label == label {
				a.Handle(ui.Intent{Kind: ui.Tap, At: render.Point{X: (tg.Rect.Min.X + tg.Rect.Max.X) / 2, Y: (tg.Rect.Min.Y + tg.Rect.Max.Y) / 2}})
				found = true
				break
			}
		}
		if !found {
			t.Fatalf("natively, no target %q on %v", label, a.Screen())
		}
		a.Update()
	}
	if rm.Model == nil {
		t.Fatal("natively, Share report handed no report")
	}
	return name, rm
}

// key presses and releases one key in the focused element.
func key(t *testing.T, ctx context.Context, k, code string, vk int64, text string) {
	t.Helper()
	within(t, ctx, 10*time.Second, "pressing "+k, chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		for _, typ := range []input.DispatchKeyEventType{input.DispatchKeyEventTypeKeyDown, input.DispatchKeyEventTypeKeyUp} {
			p := input.DispatchKeyEventParams{Type: typ, Key: k, Code: code, WindowsVirtualKeyCode: vk, NativeVirtualKeyCode: vk}
			if typ == input.DispatchKeyEventTypeKeyDown {
				p.Text = text
			}
			if _, err := cdp.Call(ctx, tg, input.DispatchKeyEvent, p); err != nil {
				return err
			}
		}
		return nil
	}))
}

// slowTapLabel taps the target whose label starts with label, allowing
// the page a minute to take the touch (a busy machine draws the 3x phone
// slowly).
func slowTapLabel(t *testing.T, ctx context.Context, label string) {
	t.Helper()
	for _, tg := range targets(t, ctx) {
		if strings.HasPrefix(tg.Label, label) {
			touch(t, ctx, tg.X+tg.W/2, tg.Y+tg.H/2)
			return
		}
	}
	t.Fatalf("no target %q on %s", label, eval[string](t, ctx, "window.evenbeatState"))
}

// touch presses one finger at (x, y) CSS px for 150 ms, allowing a minute.
func touch(t testing.TB, ctx context.Context, x, y float64) {
	t.Helper()
	start := time.Now()
	ev := func(typ input.DispatchTouchEventType, pts []*input.TouchPoint) chromedp.Action[chromedp.Void] {
		return chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, input.DispatchTouchEvent, input.DispatchTouchEventParams{Type: typ, TouchPoints: pts})
			return err
		})
	}
	within(t, ctx, time.Minute, "touching", ev(input.DispatchTouchEventTypeTouchStart, []*input.TouchPoint{{X: x, Y: y}}),
		chromedp.Sleep(150*time.Millisecond), ev(input.DispatchTouchEventTypeTouchEnd, []*input.TouchPoint{}))
	t.Logf("touch at %.0f,%.0f took %v", x, y, time.Since(start).Round(time.Millisecond))
}

// tapElement taps the middle of the element with the given id.
func tapElement(t testing.TB, ctx context.Context, id string) {
	t.Helper()
	r := eval[[]float64](t, ctx, `(r => [r.x + r.width / 2, r.y + r.height / 2])(document.getElementById(`+strconv.Quote(id)+`).getBoundingClientRect())`)
	touch(t, ctx, r[0], r[1])
}

// TestNoStorage runs the app in a browser whose indexedDB refuses this
// page (the getter throws SecurityError, as some private windows do): the
// app still starts, says why nothing is kept, and the first entry that
// would be saved says it is not. Then, on a page whose storage is full
// (every write transaction aborts with QuotaExceededError, as the browser
// reports a full quota), the first save says so in words, names the
// exception and offers the export.
func TestNoStorage(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	ctx, _ := newBrowser(t, t.TempDir(), noTierUp())
	refuse := onNewPage(t, ctx, `Object.defineProperty(window, "indexedDB", {configurable: true, get() {
		throw new DOMException("The user denied permission to access the database.", "SecurityError");
	}});`)
	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if e := eval[string](t, ctx, "window.evenbeatStoreError || ''"); !strings.Contains(e, "does not let this page keep data") || !strings.Contains(e, "SecurityError") {
		t.Errorf("window.evenbeatStoreError = %q; want the refusal in words, naming SecurityError", e)
	}
	slowTapLabel(t, ctx, "Brackenfold (Stephenson) (invented demo)")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "units"`)
	if st := eval[string](t, ctx, "window.evenbeatStatus"); !strings.HasPrefix(st, "Not saved") || !strings.Contains(st, "no storage") {
		t.Errorf("the saving state with no storage is %q; want it to say nothing is saved", st)
	}

	// Storage full.
	within(t, ctx, 10*time.Second, "giving storage back", chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		_, err := cdp.Call(ctx, tg, page.RemoveScriptToEvaluateOnNewDocument, page.RemoveScriptToEvaluateOnNewDocumentParams{Identifier: refuse})
		return err
	}))
	onNewPage(t, ctx, `(() => {
		const put = IDBObjectStore.prototype.put;
		const errorOf = Object.getOwnPropertyDescriptor(IDBTransaction.prototype, "error").get;
		Object.defineProperty(IDBTransaction.prototype, "error", {configurable: true, get() {
			return this.evenbeatFull || errorOf.call(this);
		}});
		IDBObjectStore.prototype.put = function (...args) {
			const req = put.apply(this, args);
			this.transaction.evenbeatFull = new DOMException("The quota has been exceeded.", "QuotaExceededError");
			this.transaction.abort();
			return req;
		};
	})();`)
	within(t, ctx, 90*time.Second, "opening "+m.URL+" again", chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if e := eval[string](t, ctx, "window.evenbeatStoreError || ''"); e != "" {
		t.Fatalf("the database did not open: %s", e)
	}
	slowTapLabel(t, ctx, "Brackenfold (Stephenson) (invented demo)")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "units"`)
	slowTapLabel(t, ctx, "inch") // a change: the demo engine is stored with its first
	st := waitValue[string](t, ctx, 30*time.Second, `window.evenbeatStatus.startsWith("Not saved:") && window.evenbeatStatus`)
	t.Logf("storage full: %s", st)
	for _, want := range []string{"storage for this app is full", "QuotaExceededError", "export"} {
		if !strings.Contains(st, want) {
			t.Errorf("the saving state with storage full is %q; want it to say %q", st, want)
		}
	}
}

// onNewPage has the browser run script in every page it opens from now
// on, before the page's own scripts, and returns the script's identifier.
func onNewPage(t *testing.T, ctx context.Context, script string) page.ScriptIdentifier {
	t.Helper()
	var id page.ScriptIdentifier
	within(t, ctx, 10*time.Second, "adding a script to new pages", chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		res, err := cdp.Call(ctx, tg, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: script})
		id = res.Identifier
		return err
	}))
	return id
}

// TestStorageSlowToAnswer: while the browser's database does not answer
// the app's open, the loading screen says it waits for it (and that
// nothing is lost) instead of looking frozen, and the app starts normally,
// with storage, once the database answers: it never gives up on it.
func TestStorageSlowToAnswer(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	ctx, _ := newBrowser(t, t.TempDir(), noTierUp())
	// open answers only once the test calls window.evenbeatReleaseOpen().
	onNewPage(t, ctx, `(() => {
		const open = IDBFactory.prototype.open;
		let release;
		const gate = new Promise(r => release = r);
		window.evenbeatReleaseOpen = () => { release(); return true; };
		IDBFactory.prototype.open = function (...args) {
			const held = {};
			gate.then(() => {
				const req = open.apply(this, args);
				req.onupgradeneeded = e => { held.result = req.result; held.onupgradeneeded && held.onupgradeneeded(e); };
				req.onsuccess = e => { held.result = req.result; held.onsuccess && held.onsuccess(e); };
				req.onerror = e => { held.error = req.error; held.onerror && held.onerror(e); };
				req.onblocked = e => { held.onblocked && held.onblocked(e); };
			});
			return held;
		};
	})();`)
	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	text := waitValue[string](t, ctx, 90*time.Second, `(t => t.includes("Waiting for the browser's storage") && t)(document.getElementById("loading").textContent)`)
	t.Logf("loading screen: %s", text)
	if !strings.Contains(text, "Nothing is lost") {
		t.Errorf("the loading screen while storage is slow says %q; want it to say nothing is lost", text)
	}
	if drawn := eval[bool](t, ctx, `window.evenbeatDrawn !== undefined`); drawn {
		t.Fatal("the app started before the database answered")
	}
	eval[bool](t, ctx, `window.evenbeatReleaseOpen()`)
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if e := eval[string](t, ctx, "window.evenbeatStoreError || ''"); e != "" {
		t.Errorf("after the late answer the app runs without storage: %s", e)
	}
	slowTapLabel(t, ctx, "Brackenfold (Stephenson) (invented demo)")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "units"`)
	slowTapLabel(t, ctx, "inch") // a change: the demo engine is stored with its first
	waitFor(t, ctx, 60*time.Second, `window.evenbeatStatus === "Saved"`)
}

// shareReport taps Share report on the menu and, when the page asks for a
// tap of its own to open the share sheet (the first tap too long ago by
// the time the report is drawn), taps its Share; it returns how the share
// went (window.evenbeatShare).
func shareReport(t *testing.T, ctx context.Context) string {
	t.Helper()
	slowTapLabel(t, ctx, "Share report")
	const done = `window.evenbeatShare === "shared" || window.evenbeatShare === "downloaded" || (window.evenbeatShare || "").startsWith("failed")`
	waitFor(t, ctx, 90*time.Second, done+` || window.evenbeatShare === "asking"`)
	if eval[string](t, ctx, "window.evenbeatShare") == "asking" {
		tapElement(t, ctx, "evenbeat-share-ok")
		waitFor(t, ctx, 30*time.Second, done)
	}
	return eval[string](t, ctx, "window.evenbeatShare")
}

// TestShareAsksForATap: when the tap on Share report is too long ago for
// the browser to open its share sheet by the time the report is drawn
// (navigator.userActivation no longer active, or share refused with
// NotAllowedError), the page asks for a tap of its own in a box over the
// canvas: its Share opens the sheet with the report, the back gesture
// closes it as Cancel and leaves the app where it was.
func TestShareAsksForATap(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	demo, err := os.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	ctx := openDemoPlan(t, demo)
	eval[bool](t, ctx, stubShareJS)
	eval[bool](t, ctx, `(Object.defineProperty(navigator, "userActivation", {configurable: true, get: () => ({isActive: false, hasBeenActive: true})}), true)`)
	slowTapLabel(t, ctx, "Menu")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatState === "menu"`)

	// The activation is spent: the page asks; Back closes the box.
	slowTapLabel(t, ctx, "Share report")
	waitFor(t, ctx, 90*time.Second, `window.evenbeatShare === "asking"`)
	screenshot(t, ctx, "share-box")
	if h := eval[float64](t, ctx, `document.getElementById("evenbeat-share-ok").getBoundingClientRect().height`); h < 48 {
		t.Errorf("the Share button of the box is %.0f px high; want at least 48", h)
	}
	eval[bool](t, ctx, "(history.back(), true)")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatShare === "cancelled" && !document.getElementById("evenbeat-share-box")`)
	time.Sleep(500 * time.Millisecond)
	if s := eval[string](t, ctx, "window.evenbeatState"); s != "menu" {
		t.Errorf("the back gesture with the share box open moved the app to %q; want it to close the box only", s)
	}
	// Again, and its Share shares the report.
	if how := shareReport(t, ctx); how != "shared" {
		t.Fatalf("sharing after the page asked: %s", how)
	}

	// A browser without userActivation that refuses the share for want of
	// a tap: the page asks too.
	eval[bool](t, ctx, `(() => {
		delete navigator.userActivation;
		Object.defineProperty(navigator, "userActivation", {configurable: true, get: () => undefined});
		const ok = navigator.share;
		let first = true;
		navigator.share = (d) => {
			if (first) {
				first = false;
				return Promise.reject(new DOMException("Must be handling a user gesture to perform a share request.", "NotAllowedError"));
			}
			return ok(d);
		};
		window.evenbeatSharedFile = null;
		return true;
	})()`)
	slowTapLabel(t, ctx, "Share report")
	waitFor(t, ctx, 90*time.Second, `window.evenbeatShare === "asking"`)
	tapElement(t, ctx, "evenbeat-share-ok")
	waitFor(t, ctx, 30*time.Second, `window.evenbeatShare === "shared"`)
	if f := eval[bool](t, ctx, `!!window.evenbeatSharedFile && window.evenbeatSharedFile.Type === "application/pdf"`); !f {
		t.Error("after the refusal and the tap, no PDF reached the share sheet")
	}
}

// openDemoPlan opens the app in a new browser, imports the session file
// demo and waits for its plan.
func openDemoPlan(t *testing.T, demo []byte) context.Context {
	t.Helper()
	m := startServer(t)
	ctx, _ := newBrowser(t, t.TempDir(), noTierUp())
	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	eval[bool](t, ctx, "(window.evenbeatImport("+strconv.Quote(string(demo))+"), true)")
	waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan"`)
	return ctx
}
