package main

import (
	"context"
	"encoding/json"
	"fmt"
	"image"
	"image/color"
	"math"
	"net/http"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"evenbeat/render"
	"evenbeat/wasm/ui"
)

// capture is a render.Canvas that only notes where things go, so a test
// knows where to look in a screenshot: the same layout code the app runs,
// computed natively.
type capture struct {
	w, h    float64
	strokes map[color.RGBA]render.Rect // bounding box of all strokes per colour
}

func (c *capture) Size() (w, h float64)                        { return c.w, c.h }
func (c *capture) Fill(render.Path, render.FillStyle)          {}
func (c *capture) Text(render.Point, string, render.TextStyle) {}
func (c *capture) Stroke(p render.Path, s render.LineStyle) {
	if c.strokes == nil {
		c.strokes = map[color.RGBA]render.Rect{}
	}
	r, ok := c.strokes[s.Color]
	if !ok {
		r = render.Rect{Min: render.Point{X: math.Inf(1), Y: math.Inf(1)}, Max: render.Point{X: math.Inf(-1), Y: math.Inf(-1)}}
	}
	for _, seg := range p {
		n := map[render.SegKind]int{render.MoveTo: 1, render.LineTo: 1, render.CubeTo: 3}[seg.Kind]
		for _, pt := range seg.Pts[:n] {
			r.Min.X, r.Min.Y = math.Min(r.Min.X, pt.X), math.Min(r.Min.Y, pt.Y)
			r.Max.X, r.Max.Y = math.Max(r.Max.X, pt.X), math.Max(r.Max.Y, pt.Y)
		}
	}
	c.strokes[s.Color] = r
}

// devicePx turns a logical rectangle into the screenshot's pixels.
func devicePx(r render.Rect) image.Rectangle {
	k := float64(phoneScale)
	return image.Rect(int(math.Floor(r.Min.X*k)), int(math.Floor(r.Min.Y*k)), int(math.Ceil(r.Max.X*k)), int(math.Ceil(r.Max.Y*k)))
}

// demoSessionFile is the invented demo engine's session file.
const demoSessionFile = "../../testdata/sessions/brackenfold-stephenson.json"

// appAnswer limits the wait for the app's answer to a tap or a back
// gesture. The app answers in its next tick, but on the shared 2-core test
// machine the page's animation frames (and so the ticks) stop for up to a
// minute or more while the software GPU draws a 3x frame; the limit only
// guards against a hung page.
const appAnswer = 3 * time.Minute

// flowTarget is one touch target the app publishes (CSS px).
type flowTarget struct {
	Label      string
	X, Y, W, H float64
	On         bool
}

// targets returns the touch targets the app publishes.
func targets(t testing.TB, ctx context.Context) []flowTarget {
	t.Helper()
	var ts []flowTarget
	if err := json.Unmarshal([]byte(eval[string](t, ctx, "window.evenbeatTargets")), &ts); err != nil {
		t.Fatal(err)
	}
	return ts
}

// tapLabel taps the published target whose label starts with label: a
// finger held longer than a frame.
func tapLabel(t testing.TB, ctx context.Context, label string) {
	t.Helper()
	ts := targets(t, ctx)
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
	waitFor(t, ctx, appAnswer, "window.evenbeatState === "+strconv.Quote(want))
}

// ackStoredJS is a promise of whether the page's IndexedDB holds the
// cautions acknowledgement. A read transaction sees only committed
// writes.
const ackStoredJS = `new Promise((ok, no) => {
	const r = indexedDB.open("evenbeat", 1);
	r.onerror = () => no(r.error);
	r.onsuccess = () => {
		const g = r.result.transaction("kv").objectStore("kv").get(` + "`" + ui.AckKey + "`" + `);
		g.onsuccess = () => { r.result.close(); ok(g.result !== undefined); };
		g.onerror = () => no(g.error);
	};
})`

// curveLayout draws the demo session's valve curve (the plan's Curve tab)
// natively, as the app lays it out on the phone, and returns where it
// puts its strokes.
func curveLayout(t *testing.T, th render.Theme) *capture {
	t.Helper()
	b, err := os.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	a := ui.New(ui.Options{Theme: th})
	a.Resize(phoneW, phoneH)
	if err := a.Import(b); err != nil {
		t.Fatal(err)
	}
	a.Update()
	for _, tg := range a.Targets() {
		if tg.Label == "Curve" {
			a.Handle(ui.Intent{Kind: ui.Tap, At: render.Point{X: (tg.Rect.Min.X + tg.Rect.Max.X) / 2, Y: (tg.Rect.Min.Y + tg.Rect.Max.Y) / 2}})
		}
	}
	a.Update()
	c := &capture{w: phoneW, h: phoneH}
	a.Draw(c)
	if a.Screen() != ui.Plan {
		t.Fatalf("the demo session opens on %v; want the plan", a.Screen())
	}
	return c
}

// curveProblems lists what is wrong with shot as a picture of the plan's
// valve curve: the theme's front and back colours must run along the
// curves where the native layout puts them, and the card and page colours
// must cover most of the screen.
func curveProblems(t *testing.T, shot image.Image, layout *capture, th render.Theme) []string {
	t.Helper()
	var problems []string
	screen := render.Rect{Max: render.Point{X: phoneW, Y: phoneH}}
	for _, end := range []struct {
		name string
		col  color.RGBA
	}{{"front", th.Front}, {"back", th.Back}} {
		r, ok := layout.strokes[end.col]
		if !ok {
			t.Fatalf("the valve curve strokes nothing in the %s colour; the check needs updating", end.name)
		}
		r = render.Rect{Min: render.Point{X: math.Max(r.Min.X, 0), Y: math.Max(r.Min.Y, 0)}, Max: render.Point{X: math.Min(r.Max.X, screen.Max.X), Y: math.Min(r.Max.Y, screen.Max.Y)}}
		// A line 2 units wide at 3 px per unit along some 300 units of
		// curve is thousands of pixels; a missing curve is none.
		if n := count(shot, devicePx(r), end.col, 24); n < 1500 {
			problems = append(problems, fmt.Sprintf("%s colour %v: %d pixels inside the plot %v; want at least 1500 (no curve drawn?)", end.name, end.col, n, devicePx(r)))
		}
	}
	all := shot.Bounds()
	ground := count(shot, all, th.Surface, 6) + count(shot, all, th.Background, 6)
	if frac := float64(ground) / float64(all.Dx()*all.Dy()); frac < 0.6 {
		problems = append(problems, fmt.Sprintf("card and page colours cover %.0f %% of the screen; want at least 60 %% (blank or wrong theme?)", 100*frac))
	}
	return problems
}

// TestPhone runs the app in Chromium as a 3x phone with touch, from the
// page's plain address: the engines list first; set-up of the invented
// demo engine by taps held longer than a frame; the first-run cautions
// when the flow reaches them, their acknowledgement in IndexedDB; one
// reading typed on the keypad until the app says saved. Then the browser
// is killed outright and started again on the same profile: the
// acknowledgement and the reading must be there, and the session goes
// straight to measuring. The back gesture moves back a step inside the
// app; a session file handed to the page opens on its plan, whose words
// are in the page's live region, and whose valve curve shows in the
// theme's colours where the natively computed layout puts it (a check that
// fails on the plan's steps). Finally, with the server stopped, a reload
// still starts the app from the service worker's cache.
func TestPhone(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	profile := t.TempDir()
	ctx, _ := newBrowser(t, profile, noTierUp())

	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if got := eval[float64](t, ctx, "window.devicePixelRatio"); got != phoneScale {
		t.Fatalf("devicePixelRatio = %v; want %d", got, phoneScale)
	}
	th := render.Light()
	if eval[string](t, ctx, "window.evenbeatTheme") == "dark" {
		th = render.Dark()
	}
	tapAndWait(t, ctx, "Brackenfold (Stephenson) (invented demo)", "units")
	tapAndWait(t, ctx, "Next", "sizes")
	for eval[string](t, ctx, "window.evenbeatState") == "sizes" {
		tapLabel(t, ctx, "Next")
		time.Sleep(300 * time.Millisecond)
	}
	waitFor(t, ctx, appAnswer, `window.evenbeatState === "adjust"`)
	tapAndWait(t, ctx, "Next: start measuring", "cautions")
	if eval[bool](t, ctx, ackStoredJS) {
		t.Fatal("the acknowledgement is stored before the cautions were acknowledged")
	}
	tapAndWait(t, ctx, "I understand", "measure")
	for _, k := range []string{"2", ".", "4", "8"} {
		tapLabel(t, ctx, k)
	}
	tapLabel(t, ctx, "Next")
	waitFor(t, ctx, appAnswer, `window.evenbeatStatus === "Saved" && window.evenbeatField === "Back port mark"`)
	waitFor(t, ctx, appAnswer, ackStoredJS)
	measure := screenshot(t, ctx, "phone-measure")

	// Saved means on disk: kill the browser at once and start it again.
	killBrowser(t, ctx)
	ctx, _ = newBrowser(t, profile, noTierUp())
	within(t, ctx, 90*time.Second, "opening "+m.URL+" after the kill", chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if !eval[bool](t, ctx, ackStoredJS) {
		t.Error("after the kill the acknowledgement is not in IndexedDB")
	}
	// Acknowledged once: the session goes straight to measuring.
	tapAndWait(t, ctx, "Brackenfold (Stephenson), 1 round", "measure")
	tapAndWait(t, ctx, "All readings", "readings")
	if ts := eval[string](t, ctx, "window.evenbeatTargets"); !strings.Contains(ts, "Front port mark: 2.48 mm") {
		t.Fatalf("after the kill the reading is missing: %s", ts)
	}
	// The back gesture: one step back, still in the app.
	eval[bool](t, ctx, "(history.back(), true)")
	waitFor(t, ctx, appAnswer, `window.evenbeatState === "measure"`)

	// The demo session file imported (as a chosen file would be) opens on
	// its plan, whose words are in the page's live region. (Typing a
	// whole round by taps is tested natively in package ui: here each tap
	// costs seconds.)
	b, err := os.ReadFile(demoSessionFile)
	if err != nil {
		t.Fatal(err)
	}
	eval[bool](t, ctx, "(window.evenbeatImport("+strconv.Quote(string(b))+"), true)")
	waitFor(t, ctx, 90*time.Second, `window.evenbeatState === "plan" && window.evenbeatPlanText.includes("Plan for Brackenfold")`)
	waitFor(t, ctx, appAnswer, liveRegionJS+`.includes(": the plan\n")`)
	if words := eval[string](t, ctx, liveRegionJS); !strings.Contains(words, "Next reading: ") {
		t.Errorf("the live region does not hold the plan: %q", words)
	}
	layout := curveLayout(t, th)
	// The curve check must be able to fail: the plan's steps and the
	// keypad are not the curve.
	if len(curveProblems(t, measure, layout, th)) == 0 {
		t.Error("the curve check passes on the measuring screen; it cannot tell a missing curve")
	}
	steps := screenshot(t, ctx, "phone-plan-steps")
	if len(curveProblems(t, steps, layout, th)) == 0 {
		t.Error("the curve check passes on the plan's steps; it cannot tell a missing curve")
	}
	tapLabel(t, ctx, "Curve")
	waitFor(t, ctx, appAnswer, `JSON.parse(window.evenbeatTargets).some(t => t.Label === "Curve" && t.On)`)
	time.Sleep(time.Second) // let the frame drawn in that tick reach the screen
	for _, p := range curveProblems(t, screenshot(t, ctx, "phone-plan-curve"), layout, th) {
		t.Error(p)
	}

	waitFor(t, ctx, 90*time.Second, `navigator.serviceWorker.controller !== null && navigator.serviceWorker.controller.state === "activated"`)

	// Cut the network: stop the server, make sure it is gone, reload.
	if err := m.Close(); err != nil {
		t.Fatal(err)
	}
	if res, err := http.Get(m.URL); err == nil {
		res.Body.Close()
		t.Fatal("the server still answers after Close")
	}
	within(t, ctx, 90*time.Second, "reloading with the server stopped", chromedpReload())
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	if first := eval[string](t, ctx, "window.evenbeatFirstScreen"); first != "engines" {
		t.Errorf("offline, the first frame showed %q; want the engines list", first)
	}
	if ts := eval[string](t, ctx, "window.evenbeatTargets"); !strings.Contains(ts, "Brackenfold (Stephenson), 1 round") {
		t.Errorf("offline, the stored session is not listed: %s", ts)
	}
}
