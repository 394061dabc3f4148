package main

import (
	"context"
	"net/http"
	"net/http/httptest"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/input"
	"github.com/chromedp/chromedp"

	"evenbeat/render"
	"evenbeat/wasm/ui"
)

// BenchmarkFirstFrame prints the figures of the browser app: main.wasm raw
// and gzip -9 (what the server sends), and the time from navigation to the
// first drawn frame in headless Chromium as a 3x phone: cold (fresh
// profile, from the server) and warm (a reload served by the service
// worker), and for the cold start when the Go program began to run (the
// rest is ebiten's start and the first drawing). bash .ci/figures runs it and adds the brotli size. Run it alone
// with
//
//	go test -run '^$' -bench FirstFrame -benchtime 3x ./cmd/evenbeat
//
// The numbers depend on the machine; nothing here asserts a time.
func BenchmarkFirstFrame(b *testing.B) {
	needChromium(b)
	m := startServer(b)
	bundle, err := m.Bundle()
	if err != nil {
		b.Fatal(err)
	}
	var cold, warm, start time.Duration
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		ctx, closeBrowser := newBrowser(b, b.TempDir())
		within(b, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
		cold += time.Duration(waitValue[float64](b, ctx, 90*time.Second, "window.evenbeatFirstFrame") * float64(time.Millisecond))
		start += time.Duration(eval[float64](b, ctx, "window.evenbeatGoStart") * float64(time.Millisecond))
		waitFor(b, ctx, 60*time.Second, `navigator.serviceWorker.controller !== null`)
		within(b, ctx, 90*time.Second, "reloading", chromedpReload())
		warm += time.Duration(waitValue[float64](b, ctx, 90*time.Second, "window.evenbeatFirstFrame") * float64(time.Millisecond))
		closeBrowser()
	}
	b.StopTimer()
	// After the loop: ResetTimer drops metrics reported before it.
	wasm := bundle.Assets["main.wasm"]
	const mb = 1e6
	b.ReportMetric(float64(len(wasm.Data))/mb, "wasm-MB")
	b.ReportMetric(float64(len(wasm.Gzip))/mb, "gzip9-MB")
	b.ReportMetric(float64(start.Milliseconds())/float64(b.N), "ms-go-start-cold")
	b.ReportMetric(float64(cold.Milliseconds())/float64(b.N), "ms-first-frame-cold")
	b.ReportMetric(float64(warm.Milliseconds())/float64(b.N), "ms-first-frame-warm")
}

// serveBare builds the bare ebiten app (testdata/bare) with the app's
// toolchain and flags and serves it with the same wasm_exec.js on a free
// loopback port, from a page that gives its canvas the whole body as the
// app's page does. It returns the page's address and the wasm's size.
func serveBare(b *testing.B) (string, int) {
	b.Helper()
	tc, err := defaultFinder().find()
	if err != nil {
		b.Fatal(err)
	}
	root, err := moduleRoot(".")
	if err != nil {
		b.Fatal(err)
	}
	out := filepath.Join(b.TempDir(), "bare.wasm")
	args := append([]string{"build"}, wasmBuildFlags()...)
	cmd := exec.Command(tc.Go, append(args, "-o", out, "./cmd/evenbeat/testdata/bare")...)
	cmd.Dir, cmd.Env = root, wasmEnv()
	if msg, err := cmd.CombinedOutput(); err != nil {
		b.Fatalf("building the bare app: %v\n%s", err, msg)
	}
	wasm, err := os.ReadFile(out)
	if err != nil {
		b.Fatal(err)
	}
	support, err := os.ReadFile(tc.wasmExecPath())
	if err != nil {
		b.Fatal(err)
	}
	const page = `<!doctype html><html><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>html, body { margin: 0; padding: 0; width: 100%; height: 100%; overflow: hidden; touch-action: none; }</style>
</head><body><script src="wasm_exec.js"></script><script>
const go = new Go();
WebAssembly.instantiateStreaming(fetch("main.wasm"), go.importObject).then(r => go.run(r.instance));
</script></body></html>`
	files := map[string]struct {
		typ  string
		data []byte
	}{
		"/":             {"text/html; charset=utf-8", []byte(page)},
		"/wasm_exec.js": {"text/javascript; charset=utf-8", support},
		"/main.wasm":    {"application/wasm", wasm},
	}
	srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		f, ok := files[r.URL.Path]
		if !ok {
			http.NotFound(w, r)
			return
		}
		w.Header().Set("Content-Type", f.typ)
		w.Write(f.data)
	}))
	b.Cleanup(srv.Close)
	return srv.URL + "/", len(wasm)
}

// drawsNow is the page's count of frames drawn and its clock (ms).
const drawsNowJS = `[window.evenbeatDraws || 0, performance.now()]`

// dragRate keeps a finger dragging back and forth between x0 and x1 at
// height y for d, with touch events fingerStep apart, and returns the
// frames the page drew per second meanwhile, by the page's own count and
// clock.
func dragRate(b *testing.B, ctx context.Context, x0, x1, y float64, d time.Duration) float64 {
	b.Helper()
	within(b, ctx, 2*time.Minute, "putting a finger down", touchEvent(input.DispatchTouchEventTypeTouchStart, x0, y))
	// Past the tap slop first, so the app sees a drag from the start.
	within(b, ctx, 2*time.Minute, "moving the finger", touchEvent(input.DispatchTouchEventTypeTouchMove, x0+(x1-x0)/4, y))
	first := eval[[]float64](b, ctx, drawsNowJS)
	const sweep = 40 // events from one end to the other
	start := time.Now()
	for i := 0; time.Since(start) < d; i++ {
		f := float64(i%(2*sweep)) / sweep
		if f > 1 {
			f = 2 - f
		}
		// A touch event waits while the software GPU finishes a frame,
		// which may take tens of seconds on the shared test machine.
		within(b, ctx, 2*time.Minute, "moving the finger", chromedp.Sleep(fingerStep), touchEvent(input.DispatchTouchEventTypeTouchMove, x0+f*(x1-x0), y))
	}
	last := eval[[]float64](b, ctx, drawsNowJS)
	within(b, ctx, 2*time.Minute, "lifting the finger", touchEvent(input.DispatchTouchEventTypeTouchEnd, x1, y))
	if len(first) != 2 || len(last) != 2 || last[1] <= first[1] {
		b.Fatalf("frame counts %v then %v", first, last)
	}
	return (last[0] - first[0]) / (last[1] - first[1]) * 1000
}

// whatIfSlider finds, natively, where the plan's Balance card puts its
// what-if slider for the demo session on the phone: the track, a target
// named "What if: ..." by the change it sets, where a drag changes the
// amount. It returns the track's ends and middle height (CSS px).
func whatIfSlider(b *testing.B) (x0, x1, y float64) {
	b.Helper()
	src, err := os.ReadFile(demoSessionFile)
	if err != nil {
		b.Fatal(err)
	}
	a := ui.New(ui.Options{})
	a.Resize(phoneW, phoneH)
	if err := a.Import(src); err != nil {
		b.Fatal(err)
	}
	a.Update()
	label := func(prefix string) render.Rect {
		for _, tg := range a.Targets() {
			if strings.HasPrefix(tg.Label, prefix) {
				return tg.Rect
			}
		}
		b.Fatalf("no target %q on the plan", prefix)
		return render.Rect{}
	}
	r := label("Balance")
	a.Handle(ui.Intent{Kind: ui.Tap, At: render.Point{X: (r.Min.X + r.Max.X) / 2, Y: (r.Min.Y + r.Max.Y) / 2}})
	a.Update()
	track := label("What if")
	return track.Min.X + 8, track.Max.X - 8, (track.Min.Y + track.Max.Y) / 2
}

// BenchmarkFrameRate prints the frames really drawn per second on the
// busiest screen, the plan's Balance card while a finger drags the
// what-if slider (each move changes the step's amount, rebuilds the model
// and redraws; wasm/ui's BenchmarkFramePlan and BenchmarkWhatIf make it the
// costliest frame), against the bare ebiten app (testdata/bare) under the
// same drag, both as a 390x844 phone at 3x with touch in headless Chromium
// with WebAssembly tier-up on. Each run drags for 5 s after a 2 s warm-up.
// Run it alone with
//
//	go test -run '^$' -bench FrameRate -benchtime 3x ./cmd/evenbeat
//
// Software WebGL on a shared 2-core machine is far slower than a phone's
// GPU: compare the ratio, not the absolute rates. Beside them, the Go side
// of the app's frames (window.evenbeatDrawMs: laying out and drawing
// through ebiten, not the GPU's work), the part a faster GPU cannot help.
func BenchmarkFrameRate(b *testing.B) {
	needChromium(b)
	m := startServer(b)
	bareURL, _ := serveBare(b)
	src, err := os.ReadFile(demoSessionFile)
	if err != nil {
		b.Fatal(err)
	}
	x0, x1, y := whatIfSlider(b)
	const warm, run = 2 * time.Second, 5 * time.Second

	// One browser at a time: the bare app redraws every frame and would
	// take the CPU from the app's measurement.
	appCtx, closeApp := newBrowser(b, b.TempDir())
	within(b, appCtx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(b, appCtx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	eval[bool](b, appCtx, "(window.evenbeatImport("+strconv.Quote(string(src))+"), true)")
	waitFor(b, appCtx, 90*time.Second, `window.evenbeatDrawn === "plan"`)
	readyForTouch(b, appCtx)
	bal := waitValue[[]float64](b, appCtx, 30*time.Second, `(t => t && [t.X + t.W/2, t.Y + t.H/2])(JSON.parse(window.evenbeatTargets).find(t => t.Label === "Balance"))`)
	tap(b, appCtx, bal[0], bal[1], 60*time.Millisecond)
	waitFor(b, appCtx, 60*time.Second, `JSON.parse(window.evenbeatTargets).some(t => t.Label.startsWith("What if"))`)

	const whatIfJS = `JSON.parse(window.evenbeatTargets).find(t => t.Label.startsWith("What if")).Label`
	before := eval[string](b, appCtx, whatIfJS)
	var app, bare float64
	b.ResetTimer()
	dragRate(b, appCtx, x0, x1, y, warm)
	if after := eval[string](b, appCtx, whatIfJS); after == before {
		b.Fatalf("the drag did not move the what-if amount: %q", after)
	}
	var drawMs, frames float64
	for i := 0; i < b.N; i++ {
		ms0, n0 := eval[float64](b, appCtx, "window.evenbeatDrawMs"), eval[float64](b, appCtx, "window.evenbeatDraws")
		r := dragRate(b, appCtx, x0, x1, y, run)
		ms1, n1 := eval[float64](b, appCtx, "window.evenbeatDrawMs"), eval[float64](b, appCtx, "window.evenbeatDraws")
		b.Logf("run %d: app %.2f frames/s, the app's Go drawing %.1f ms a frame", i+1, r, (ms1-ms0)/max(1, n1-n0))
		app += r
		drawMs, frames = drawMs+ms1-ms0, frames+n1-n0
	}
	if !strings.HasPrefix(eval[string](b, appCtx, "window.evenbeatDrawn"), "plan") {
		b.Fatal("the drag left the plan screen")
	}
	closeApp()

	bareCtx, closeBare := newBrowser(b, b.TempDir())
	within(b, bareCtx, 90*time.Second, "opening the bare app", chromedpNavigate(bareURL))
	waitFor(b, bareCtx, 90*time.Second, `window.evenbeatDraws > 0`)
	readyForTouch(b, bareCtx)
	dragRate(b, bareCtx, x0, x1, y, warm)
	for i := 0; i < b.N; i++ {
		r := dragRate(b, bareCtx, x0, x1, y, run)
		b.Logf("run %d: bare app %.2f frames/s", i+1, r)
		bare += r
	}
	closeBare()
	b.StopTimer()
	if bare == 0 {
		b.Fatal("the bare app drew no frames")
	}
	b.ReportMetric(app/float64(b.N), "app-frames/s")
	b.ReportMetric(bare/float64(b.N), "bare-frames/s")
	b.ReportMetric(app/bare, "app/bare")
	b.ReportMetric(drawMs/max(1, frames), "app-go-draw-ms/frame")
}

// BenchmarkPlanLatency prints how long the app takes inside Chromium to
// fit and plan the demo session and build the diagrams' model
// (window.evenbeatPlanMs, the app's own measure: the time until the plan
// can be drawn) when the session file is imported. Each run opens a fresh
// browser and imports the file 5 times, each after the last is saved and a
// second's pause, as a user reads a plan before the next: the median and
// the worst of all those imports (goal: under 16 ms) and the first after
// the page loads (its code is compiled on that first call) are reported.
// Then 5 imports straight after one another (the browser still drawing and
// compiling for the last: the median, "burst"). Then the page is reloaded
// from the service worker and the file imported once more: the first plan
// after a reload. Beside them, the plan with the
// other priority, made on the tick after the plan's first frame
// (window.evenbeatOtherMs). Run it alone with
//
//	go test -run '^$' -bench PlanLatency -benchtime 3x ./cmd/evenbeat
func BenchmarkPlanLatency(b *testing.B) {
	needChromium(b)
	m := startServer(b)
	src, err := os.ReadFile(demoSessionFile)
	if err != nil {
		b.Fatal(err)
	}
	// plan imports the demo session and returns the app's two times.
	plan := func(ctx context.Context) (float64, float64) {
		// Clear what the page shows, so the wait sees this import's
		// answer and not the last one's.
		eval[bool](b, ctx, `(window.evenbeatState = "", window.evenbeatPlanMs = undefined, window.evenbeatOtherMs = undefined, true)`)
		eval[bool](b, ctx, "(window.evenbeatImport("+strconv.Quote(string(src))+"), true)")
		waitQuiet(b, ctx, 60*time.Second, `window.evenbeatState === "plan" && window.evenbeatPlanMs !== undefined && window.evenbeatOtherMs !== undefined`)
		v := eval[float64](b, ctx, "window.evenbeatPlanMs")
		if v < 0 {
			b.Skip("the app does not report its plan time yet (window.evenbeatPlanMs is -1)")
		}
		return v, eval[float64](b, ctx, "window.evenbeatOtherMs")
	}
	// paced waits as a user would between plans: the last one saved and a
	// second with nothing to do, so the browser has drawn and compiled
	// what the last one asked of it.
	paced := func(ctx context.Context) {
		waitFor(b, ctx, 60*time.Second, `!window.evenbeatStatus || window.evenbeatStatus === "Saved" || window.evenbeatStatus === "Not saved yet"`)
		time.Sleep(time.Second)
	}
	var ms, other, first, reload, burst []float64
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		ctx, closeBrowser := newBrowser(b, b.TempDir())
		within(b, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
		waitFor(b, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
		for k := range 5 {
			paced(ctx)
			v, o := plan(ctx)
			ms, other = append(ms, v), append(other, o)
			if k == 0 {
				first = append(first, v)
			}
		}
		for range 5 { // one import straight after the other
			v, _ := plan(ctx)
			burst = append(burst, v)
		}
		waitFor(b, ctx, 60*time.Second, `navigator.serviceWorker.controller !== null`)
		within(b, ctx, 90*time.Second, "reloading", chromedpReload())
		waitFor(b, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
		paced(ctx)
		v, _ := plan(ctx)
		reload = append(reload, v)
		closeBrowser()
	}
	b.StopTimer()
	b.Logf("plan ms, 5 paced imports after each load: %v", ms)
	b.Logf("other priority ms: %v", other)
	b.Logf("plan ms, 5 more imports straight after one another: %v", burst)
	b.Logf("first plan after a reload from the service worker, ms: %v", reload)
	for _, x := range [][]float64{ms, other, first, reload, burst} {
		sort.Float64s(x)
	}
	b.ReportMetric(ms[len(ms)/2], "plan-ms-median")
	b.ReportMetric(ms[len(ms)-1], "plan-ms-worst")
	b.ReportMetric(first[len(first)/2], "plan-ms-first-median")
	b.ReportMetric(burst[len(burst)/2], "plan-ms-burst-median")
	b.ReportMetric(reload[len(reload)/2], "plan-ms-reload-median")
	b.ReportMetric(other[len(other)/2], "other-ms-median")
}

// BenchmarkShareReport prints how soon Share report answers a tap on the
// demo session (the whole engine: both cylinders and the beat), in
// headless Chromium as a 3x phone with touch: from the finger's lift
// (touchend) to the first frame that shows the report's progress sign
// (window.evenbeatShareSignAt; goal: within 100 ms) and to the PDF ready
// for the share sheet (window.evenbeatShareFileAt; goal: under 3 s),
// median and worst, and the report's own making (evenbeatShareDrawMs).
// The share sheet is a stub that keeps the file. Run it alone with
//
//	go test -run '^$' -bench ShareReport -benchtime 3x ./cmd/evenbeat
func BenchmarkShareReport(b *testing.B) {
	needChromium(b)
	m := startServer(b)
	src, err := os.ReadFile(demoSessionFile)
	if err != nil {
		b.Fatal(err)
	}
	ctx, closeBrowser := newBrowser(b, b.TempDir())
	defer closeBrowser()
	within(b, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(b, ctx, 90*time.Second, `window.evenbeatDrawn === "engines"`)
	eval[bool](b, ctx, "(window.evenbeatImport("+strconv.Quote(string(src))+"), true)")
	waitFor(b, ctx, 90*time.Second, `window.evenbeatDrawn === "plan" && window.evenbeatSettled`)
	eval[bool](b, ctx, stubShareJS)
	eval[bool](b, ctx, `(addEventListener("touchend", () => { window.evenbeatLiftAt = performance.now(); }, {capture: true}), true)`)
	const done = `window.evenbeatShare === "shared" || window.evenbeatShare === "downloaded" || (window.evenbeatShare || "").startsWith("failed")`
	var sign, file, making []float64
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		tapLabel(b, ctx, "Menu")
		waitFor(b, ctx, appAnswer, `window.evenbeatDrawn === "menu"`)
		time.Sleep(time.Second) // a user's pause, the menu's frame on the screen
		eval[bool](b, ctx, `(window.evenbeatShare = "", window.evenbeatShareSignAt = undefined, window.evenbeatShareFileAt = undefined, true)`)
		tapLabel(b, ctx, "Share report")
		lift := eval[float64](b, ctx, "window.evenbeatLiftAt") // before a tap on the page's own Share
		waitFor(b, ctx, appAnswer, done+` || window.evenbeatShare === "asking"`)
		if eval[string](b, ctx, "window.evenbeatShare") == "asking" {
			tapElement(b, ctx, "evenbeat-share-ok")
			waitFor(b, ctx, 30*time.Second, done)
		}
		if how := eval[string](b, ctx, "window.evenbeatShare"); how != "shared" {
			b.Fatalf("sharing the report: %s", how)
		}
		sign = append(sign, eval[float64](b, ctx, "window.evenbeatShareSignAt")-lift)
		file = append(file, eval[float64](b, ctx, "window.evenbeatShareFileAt")-lift)
		making = append(making, eval[float64](b, ctx, "window.evenbeatShareDrawMs"))
		tapLabel(b, ctx, "Plan")
		waitFor(b, ctx, appAnswer, `window.evenbeatDrawn === "plan"`)
	}
	b.StopTimer()
	b.Logf("share report, ms from the lift: to the progress sign's frame %v, to the file %v; the report's making %v", sign, file, making)
	for _, x := range [][]float64{sign, file, making} {
		sort.Float64s(x)
	}
	b.ReportMetric(sign[len(sign)/2], "sign-ms-median")
	b.ReportMetric(sign[len(sign)-1], "sign-ms-worst")
	b.ReportMetric(file[len(file)/2], "file-ms-median")
	b.ReportMetric(file[len(file)-1], "file-ms-worst")
	b.ReportMetric(making[len(making)/2], "making-ms-median")
}
