package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/dom"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"evenbeat/render"
	"evenbeat/setting/session"
	"evenbeat/wasm/ui"
)

// entry is one value the setter types: the keypad's field as the app
// names it, and the text typed.
type entry struct {
	Field, Text string
}

// decodeDemo decodes the demo session file.
func decodeDemo(t testing.TB) *session.Session {
	t.Helper()
	s, err := session.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// demoRound returns what a setter types to enter the demo session's latest
// round of its first cylinder (testdata/sessions/brackenfold-stephenson.json):
// the cylinder's dead centres from the tyre marks, then the round's port
// marks and gauge readings at dead centre, in mm. That round is the
// smallest set of readings the file's own plan comes from: port marks and
// both dead centres in full forward and full back, no sweep and no
// cut-offs. The field names are the app's words for them.
func demoRound(t testing.TB) []entry {
	t.Helper()
	s := decodeDemo(t)
	c := s.Cylinders[0]
	r := c.Rounds[len(c.Rounds)-1]
	num := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	title := func(s string) string { return strings.ToUpper(s[:1]) + s[1:] }
	var es []entry
	if r.PortMarks == nil {
		t.Fatal("the demo session's latest round has no port marks")
	}
	es = append(es, entry{"Front port mark", num(r.PortMarks.FrontGaugeMM)}, entry{"Back port mark", num(r.PortMarks.BackGaugeMM)})
	for _, d := range c.DeadCentres {
		for k, v := range []float64{d.First, d.Second} {
			es = append(es, entry{fmt.Sprintf("%s dead centre turning %s, %s mark", title(string(d.End)), d.Direction, [2]string{"first", "second"}[k]), num(v)})
		}
	}
	for _, d := range r.DeadCentreReadings {
		es = append(es, entry{fmt.Sprintf("%s dead centre, %s", title(string(d.End)), d.Reverser.Notch), num(d.GaugeMM)})
	}
	return es
}

// cliPlan is what `evenbeat plan -unit mm` prints for the demo session file.
func cliPlan(t testing.TB) string {
	t.Helper()
	var out bytes.Buffer
	if err := runPlan([]string{"-unit", "mm", demoSessionFile}, &out, io.Discard); err != nil {
		t.Fatal(err)
	}
	// The cylinder's own plan: the whole engine printed after it needs
	// the session's other cylinder too.
	text, _, _ := strings.Cut(out.String(), "\nThe whole engine")
	return text
}

// planSteps returns the numbered steps of a plan's words up to the first
// blank line after them: the plan chosen, not the other choice; for a
// plan of no steps, its verdict line ("No change: ...").
func planSteps(text string) []string {
	for _, line := range strings.Split(text, "\n") {
		if strings.HasPrefix(line, "No change") || strings.HasPrefix(line, "Nothing to change") {
			return []string{line} // a plan of no steps: its verdict
		}
	}
	var steps []string
	for _, line := range strings.Split(text, "\n") {
		if len(line) > 1 && line[0] >= '1' && line[0] <= '9' && strings.Contains(line[:3], ". ") {
			steps = append(steps, line)
		} else if len(steps) > 0 {
			break
		}
	}
	return steps
}

// phoneApp is what the typing script needs of the app, natively or in the
// browser: the screen and the keypad's field shown, the touch targets, a
// tap that returns once the app has taken it in, and a finger drag.
type phoneApp interface {
	State() string
	Field() string
	Targets() []flowTarget
	Tap(tg flowTarget)
	Scroll(dy float64) // a finger drags the content up by dy CSS px
	Fatalf(format string, args ...any)
}

// findTarget returns the first target whose label starts with prefix, or whose
// label is exactly it when exact.
func findTarget(ts []flowTarget, prefix string, exact bool) (flowTarget, bool) {
	for _, tg := range ts {
		if tg.Label == prefix || !exact && strings.HasPrefix(tg.Label, prefix) {
			return tg, true
		}
	}
	return flowTarget{}, false
}

// pressLabel taps the target labelled label (a prefix unless exact), scrolling
// the screen until it is wholly on the phone's screen (the scripts move
// what they tap to the middle, clear of the top bar).
func pressLabel(a phoneApp, label string, exact bool) {
	for range 20 {
		ts := a.Targets()
		tg, ok := findTarget(ts, label, exact)
		if !ok {
			a.Fatalf("on %s: no target %q among %+v", a.State(), label, ts)
		}
		switch {
		case tg.Y+tg.H > phoneH-8:
			a.Scroll(min(tg.Y+tg.H-phoneH/2, phoneH/2))
		case tg.Y < 0:
			a.Scroll(-min(phoneH/2-tg.Y, phoneH/2))
		default:
			a.Tap(tg)
			return
		}
	}
	a.Fatalf("on %s: cannot scroll %q onto the screen", a.State(), label)
}

// enterDemoRound walks the app from the engines list to the plan by taps:
// the invented demo engine's set-up with its own dimensions, mm and a
// 0.01 mm gauge, the first-run cautions when they come, then es typed on
// the keypad (typeEntries).
func enterDemoRound(a phoneApp, es []entry) {
	pressLabel(a, "Brackenfold (Stephenson) (invented demo)", true)
	wantScreen(a, "units")
	pressLabel(a, "mm", true)
	pressLabel(a, "0.01 mm", true)
	pressLabel(a, "Next", true)
	wantScreen(a, "sizes")
	for a.State() == "sizes" {
		pressLabel(a, "Next", true) // keep the demo engine's dimensions
	}
	wantScreen(a, "adjust")
	pressLabel(a, "Next: start measuring", true)
	if a.State() == "cautions" {
		pressLabel(a, render.AckLabel, true)
	}
	wantScreen(a, "measure")
	typeEntries(a, es)
}

// typeEntries types es on the keypad and opens the round's plan. A
// reading the keypad does not ask next is chosen from the round's list of
// readings (through the menu when the keypad is not shown), as a setter
// skips what they did not take; the plan is opened from that list.
func typeEntries(a phoneApp, es []entry) {
	toReadings := func() {
		switch a.State() {
		case "readings":
		case "measure":
			pressLabel(a, "All readings", true)
		default:
			pressLabel(a, "Menu", true)
			wantScreen(a, "menu")
			pressLabel(a, "All readings", true)
		}
		wantScreen(a, "readings")
	}
	for _, e := range es {
		if a.State() != "measure" || a.Field() != e.Field {
			toReadings()
			pressLabel(a, e.Field+":", false)
			wantScreen(a, "measure")
			if a.Field() != e.Field {
				a.Fatalf("chose %q from the readings; the keypad asks %q", e.Field, a.Field())
			}
		}
		for _, r := range e.Text {
			k := string(r)
			if r == '-' {
				k = "+/-"
			}
			pressLabel(a, k, true)
		}
		pressLabel(a, "Next", true)
	}
	toReadings()
	pressLabel(a, "Plan from round", false)
	wantScreen(a, "plan")
}

// demoLessOne returns the demo session file in mm without the last
// dead-centre reading of its first cylinder's latest round, and that
// reading as the entry that completes it.
func demoLessOne(t testing.TB) ([]byte, entry) {
	t.Helper()
	s := decodeDemo(t)
	s.DisplayUnit = session.UnitMM
	r := &s.Cylinders[0].Rounds[len(s.Cylinders[0].Rounds)-1]
	es := demoRound(t)
	last := es[len(es)-1]
	r.DeadCentreReadings = r.DeadCentreReadings[:len(r.DeadCentreReadings)-1]
	var b bytes.Buffer
	if err := session.Encode(&b, s); err != nil {
		t.Fatal(err)
	}
	return b.Bytes(), last
}

// wantScreen fails unless the app shows screen s.
func wantScreen(a phoneApp, s string) {
	if got := a.State(); got != s {
		a.Fatalf("the app shows %q; want %q (field %q)", got, s, a.Field())
	}
}

// nativeApp runs package ui's app in the test, as the glue would.
type nativeApp struct {
	*testing.T
	a    *ui.App
	taps int
}

func (n *nativeApp) State() string { return n.a.Screen().String() }
func (n *nativeApp) Field() string { return n.a.Field() }
func (n *nativeApp) Targets() []flowTarget {
	var ts []flowTarget
	for _, t := range n.a.Targets() {
		ts = append(ts, flowTarget{t.Label, t.Rect.Min.X, t.Rect.Min.Y, t.Rect.W(), t.Rect.H(), t.On})
	}
	return ts
}
func (n *nativeApp) Tap(tg flowTarget) {
	n.taps++
	n.a.Handle(ui.Intent{Kind: ui.Tap, At: render.Point{X: tg.X + tg.W/2, Y: tg.Y + tg.H/2}})
	n.a.Update()
}
func (n *nativeApp) Scroll(dy float64) {
	n.a.Handle(ui.Intent{Kind: ui.Drag, At: render.Point{X: phoneW / 2, Y: phoneH / 2}, Delta: render.Point{Y: -dy}})
	n.a.Update()
}

// memStore keeps the native app's writes and completes each at once.
type memStore map[string][]byte

func (m memStore) Get(key string) ([]byte, bool, error) { b, ok := m[key]; return b, ok, nil }
func (m memStore) Put(key string, value []byte, done func(error)) {
	m[key] = append([]byte(nil), value...)
	done(nil)
}
func (m memStore) Delete(key string, done func(error)) {
	delete(m, key)
	done(nil)
}

// TestDemoRoundByTapsNative types the demo session's latest round into the
// app natively, through the same scripts as the browser test (the whole
// round from set-up, and the last reading into the file that lacks it),
// and checks the app's plan is word for word what `evenbeat plan -unit mm`
// prints for the session file: the same readings give the same plan on
// the phone as on the command line.
func TestDemoRoundByTapsNative(t *testing.T) {
	want := cliPlan(t)
	if len(planSteps(want)) == 0 {
		t.Fatalf("the command line's plan has no steps:\n%s", want)
	}
	newApp := func() *nativeApp {
		n := &nativeApp{T: t, a: ui.New(ui.Options{Store: memStore{}})}
		n.a.Resize(phoneW, phoneH)
		n.a.Update()
		return n
	}
	n := newApp()
	es := demoRound(t)
	enterDemoRound(n, es)
	if got := n.a.PlanText(); got != want {
		t.Errorf("whole round: the app's plan differs from the command line's\napp:\n%s\ncommand line:\n%s", got, want)
	}
	t.Logf("whole round: %d readings, %d taps", len(es), n.taps)

	n = newApp()
	file, last := demoLessOne(t)
	if err := n.a.Import(file); err != nil {
		t.Fatal(err)
	}
	n.a.Update()
	typeEntries(n, []entry{last})
	if got := n.a.PlanText(); got != want {
		t.Errorf("last reading: the app's plan differs from the command line's\napp:\n%s\ncommand line:\n%s", got, want)
	}
	t.Logf("last reading: %d taps", n.taps)
}

// browserApp is the app in Chromium, tapped as a finger would.
type browserApp struct {
	*testing.T
	ctx  context.Context
	hold time.Duration
	taps int
	wait time.Duration // waiting for the app's answers to taps
}

// pageState is what the app publishes after each tick that changed it.
type pageState struct {
	State, Field, Status, Targets string
	Draws                         int
}

const pageStateJS = `({State: window.evenbeatState || "", Field: window.evenbeatField || "", Status: window.evenbeatStatus || "",
	Targets: window.evenbeatTargets || "[]", Draws: window.evenbeatDraws || 0})`

func (b *browserApp) page() pageState { return eval[pageState](b.T, b.ctx, pageStateJS) }

func (b *browserApp) State() string { return b.page().State }
func (b *browserApp) Field() string { return b.page().Field }
func (b *browserApp) Targets() []flowTarget {
	var ts []flowTarget
	if err := json.Unmarshal([]byte(b.page().Targets), &ts); err != nil {
		b.Fatal(err)
	}
	return ts
}

// Tap holds a finger on tg's middle for b.hold and lifts it, then waits
// until the app has drawn a frame after the lift: what a setter sees
// before the next tap.
func (b *browserApp) Tap(tg flowTarget) {
	b.T.Helper()
	before := b.page().Draws
	start := time.Now()
	if testing.Verbose() {
		b.Logf("tapping %q on %s", tg.Label, b.State())
	}
	tap(b.T, b.ctx, tg.X+tg.W/2, tg.Y+tg.H/2, b.hold)
	touched := time.Since(start)
	b.drawnAfter(before)
	b.wait += time.Since(start)
	b.taps++
	if testing.Verbose() {
		b.Logf("tap %d %q: touch %v, drawn after %v", b.taps, tg.Label, touched.Round(time.Millisecond), time.Since(start).Round(time.Millisecond))
	}
}

// Scroll drags a finger up the middle of the screen by dy and waits for
// the frame drawn after it.
func (b *browserApp) Scroll(dy float64) {
	b.T.Helper()
	before := b.page().Draws
	y0 := phoneH/2 + dy/2
	drag(b.T, b.ctx, phoneW/2, y0, phoneW/2, y0-dy, 8)
	b.drawnAfter(before)
}

// twoFramesJS resolves after two animation frames. Ebiten's game loop
// runs in the page's animation frames, its callback asked for in the frame
// before, so by then the app's Update has taken in every pointer event the
// page had queued, and its Draw has run.
const twoFramesJS = `new Promise(ok => requestAnimationFrame(() => requestAnimationFrame(() => ok(true))))`

// drawnAfter waits until the app has taken in the touch events sent so far
// and drawn a frame since it had drawn before frames.
func (b *browserApp) drawnAfter(before int) {
	b.T.Helper()
	eval[bool](b.T, b.ctx, twoFramesJS)
	waitQuiet(b.T, b.ctx, 3*time.Minute, "window.evenbeatDraws > "+strconv.Itoa(before))
}

// openPhone serves the app and opens it in a fresh Chromium as a 3x touch
// phone, on its engines list; it skips under -short.
func openPhone(t *testing.T) context.Context {
	t.Helper()
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	ctx, _ := newBrowser(t, t.TempDir(), noTierUp())
	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	return ctx
}

// fullRoundEnv, set to 0, makes TestPhoneFullRound type only the last
// reading of the round instead of the whole round from set-up.
const fullRoundEnv = "EVENBEAT_FULL_ROUND"

// TestPhoneFullRound types the demo round by taps in Chromium as a 3x touch
// phone until the plan, and checks the plan's steps are the words
// `evenbeat plan -unit mm` prints for the demo session file, and that the
// page's live region holds the same plan. Each tap is a finger held for a
// moment; the next tap comes once the app has drawn the frame after it.
//
// It walks the whole way: the demo engine's set-up, the cautions, the
// cylinder's dead centres from the tyre marks and the round's port marks
// and dead-centre readings (the same script TestDemoRoundByTapsNative runs
// natively): 95 taps, 0.7 s a tap on the shared 2-core test machine with
// software WebGL (2026-12-02, after the screen's fills stopped being
// anti-aliased at 3x; before, a tap waited 43 s on average). With
// EVENBEAT_FULL_ROUND=0 it imports the demo session file less the last
// reading of its latest round and types only that reading (Menu, All
// readings, the reading, four keys, Next, the round's plan: 9 taps).
func TestPhoneFullRound(t *testing.T) {
	ctx := openPhone(t)

	b := &browserApp{T: t, ctx: ctx, hold: 60 * time.Millisecond}
	var es []entry
	if os.Getenv(fullRoundEnv) != "0" {
		es = demoRound(t)
		readyForTouch(t, ctx)
		start := time.Now()
		enterDemoRound(b, es)
		t.Logf("the whole round from set-up: %d readings by %d taps in %v", len(es), b.taps, time.Since(start).Round(time.Millisecond))
	} else {
		file, last := demoLessOne(t)
		es = []entry{last}
		eval[bool](t, ctx, "(window.evenbeatImport("+strconv.Quote(string(file))+"), true)")
		waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan" || window.evenbeatState === "measure"`)
		readyForTouch(t, ctx)
		start := time.Now()
		typeEntries(b, es)
		t.Logf("the last reading, %q: %d taps in %v (%s=0)", last.Field, b.taps, time.Since(start).Round(time.Millisecond), fullRoundEnv)
	}
	t.Logf("%v a tap on average, waiting for the frame after it included", (b.wait / time.Duration(max(1, b.taps))).Round(time.Millisecond))
	waitFor(t, ctx, 60*time.Second, `window.evenbeatStatus === "Saved"`)

	want := planSteps(cliPlan(t))
	text := waitValue[string](t, ctx, 30*time.Second, "window.evenbeatPlanText")
	got := planSteps(text)
	if len(want) == 0 || strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("the plan's steps in the browser:\n%s\nwant (evenbeat plan -unit mm %s):\n%s\nwhole plan:\n%s",
			strings.Join(got, "\n"), demoSessionFile, strings.Join(want, "\n"), text)
	}
	// The live region mirrors the screen: the plan's steps among it.
	words := eval[string](t, ctx, `document.getElementById("evenbeat-words").textContent`)
	for _, st := range want {
		if !strings.Contains(words, st) {
			t.Errorf("the live region lacks the step %q:\n%s", st, words)
		}
	}
}

// exportSession taps Menu and "Export the session file" and returns the
// file the browser downloaded into a new directory.
func exportSession(b *browserApp) (string, []byte) {
	b.T.Helper()
	dir := b.T.TempDir()
	yes := true
	if _, err := chromedp.CallBrowser(b.ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dir, EventsEnabled: &yes,
	}); err != nil {
		b.Fatalf("letting the browser download into %s: %v", dir, err)
	}
	if b.State() != "menu" {
		pressLabel(b, "Menu", true)
		wantScreen(b, "menu")
	}
	pressLabel(b, "Export the session file", true)
	deadline := time.Now().Add(60 * time.Second)
	for time.Now().Before(deadline) {
		names, _ := filepath.Glob(filepath.Join(dir, "*.json"))
		if len(names) == 1 {
			data, err := os.ReadFile(names[0])
			if err == nil && len(data) > 0 && json.Valid(data) {
				return names[0], data
			}
		}
		time.Sleep(100 * time.Millisecond)
	}
	b.Fatalf("no session file downloaded into %s within a minute", dir)
	return "", nil
}

// importByChooser taps Menu and "Import a session file" and gives the
// page's file chooser the file at path, as a setter picking it would.
func importByChooser(b *browserApp, path string) {
	b.T.Helper()
	if _, err := chromedp.Call(b.ctx, page.SetInterceptFileChooserDialog, page.SetInterceptFileChooserDialogParams{Enabled: true}); err != nil {
		b.Fatalf("intercepting the file chooser: %v", err)
	}
	opened := make(chan *page.EventFileChooserOpened, 4)
	lctx, stop := context.WithCancel(b.ctx)
	defer stop()
	if err := chromedp.Listen(lctx, func(ev any) {
		if e, ok := ev.(*page.EventFileChooserOpened); ok {
			select {
			case opened <- e:
			default:
			}
		}
	}); err != nil {
		b.Fatal(err)
	}
	if b.State() != "menu" {
		pressLabel(b, "Menu", true)
		wantScreen(b, "menu")
	}
	// Which event, if any, was being handled when the app opened the
	// chooser: it must be the tap's pointerup (iOS opens a chooser only
	// inside a user's gesture).
	eval[bool](b.T, b.ctx, `(() => {
		window.evenbeatChooserIn = null;
		const click = HTMLInputElement.prototype.click;
		HTMLInputElement.prototype.click = function () {
			if (this.type === "file") window.evenbeatChooserIn = (window.event && window.event.type) || "no event";
			return click.call(this);
		};
		return true;
	})()`)
	pressLabel(b, "Import a session file", true)
	select {
	case e := <-opened:
		if in := eval[string](b.T, b.ctx, "String(window.evenbeatChooserIn)"); in != "pointerup" {
			b.Errorf("the file chooser was opened inside %q; want the tap's pointerup", in)
		}
		if _, err := chromedp.Call(b.ctx, dom.SetFileInputFiles, dom.SetFileInputFilesParams{Files: []string{path}, BackendNodeID: e.BackendNodeID}); err != nil {
			b.Fatalf("choosing %s in the file chooser: %v", path, err)
		}
	case <-time.After(60 * time.Second):
		b.Fatal("the app opened no file chooser within a minute of the tap")
	}
	time.Sleep(time.Second) // the app's own handling of the tap: no second chooser
	if n := len(opened); n > 0 {
		b.Errorf("one tap opened %d more file choosers", n)
	}
}

// TestPhoneExportImport: the demo session file imported into the app,
// exported from the menu (a real download), and that file imported again
// through the page's file chooser gives the same session: the second
// export is byte for byte the first, and both decode to the demo file's
// session.
func TestPhoneExportImport(t *testing.T) {
	b, src := openDemoFile(t)
	ctx := b.ctx

	path, first := exportSession(b)
	t.Logf("exported %s (%d bytes)", filepath.Base(path), len(first))
	importByChooser(b, path)
	waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan" && window.evenbeatStatus === "Saved"`)
	_, second := exportSession(b)
	if !bytes.Equal(first, second) {
		t.Errorf("the session exported after an import differs from the one exported before it:\nbefore:\n%s\nafter:\n%s", first, second)
	}
	decode := func(what string, b []byte) *session.Session {
		s, err := session.Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("%s: %v", what, err)
		}
		return s
	}
	if got, want := decode("the export", first), decode(demoSessionFile, src); !reflect.DeepEqual(got, want) {
		t.Errorf("the exported session differs from the demo file's:\n%s", first)
	}
}
