package main

import (
	"bytes"
	"context"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"os"
	"path/filepath"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/input"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// chromiumPath is Debian's Chromium, which bash .ci/test installs.
const chromiumPath = "/usr/bin/chromium"

// Phone emulated in the browser tests: CSS px and device pixel ratio.
const (
	phoneW, phoneH = 390, 844
	phoneScale     = 3
)

// needChromium skips when Chromium is missing on a developer machine and
// fails under CI, where bash .ci/test must have installed it.
func needChromium(t testing.TB) {
	t.Helper()
	if _, err := os.Stat(chromiumPath); err == nil {
		return
	}
	msg := chromiumPath + " is missing; `bash .ci/test` installs it (apt-get install -y chromium)"
	if os.Getenv("CI") == "true" {
		t.Fatal(msg)
	}
	t.Skip(msg)
}

// startServer builds the site and serves it on a free loopback port.
func startServer(t testing.TB) *Main {
	t.Helper()
	m := &Main{Addr: "127.0.0.1:0", Src: "."}
	if testing.Verbose() {
		m.Log = os.Stderr
	}
	if err := m.Run(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { m.Close() })
	return m
}

// newBrowser starts headless Chromium with a fresh profile in profile
// (flags from the measured browser notes: SwiftShader WebGL, nothing that
// reaches beyond loopback) and returns a tab context and a function that
// closes the browser gracefully (also called at cleanup). extra adds flags.
func newBrowser(t testing.TB, profile string, extra ...chromedp.ExecAllocatorOption) (context.Context, func()) {
	t.Helper()
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.UserDataDir(profile),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("use-angle", "swiftshader"),
		chromedp.Flag("enable-unsafe-swiftshader", true),
	}
	opts = append(opts, extra...)
	actx, acancel := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancel := chromedp.NewContext(actx)
	var once sync.Once
	closeBrowser := func() {
		once.Do(func() {
			cctx, ccancel := context.WithTimeout(ctx, 10*time.Second)
			defer ccancel()
			chromedp.Cancel(cctx)
			cancel()
			acancel()
		})
	}
	t.Cleanup(closeBrowser)
	// The first Run starts the browser; it must not carry a timeout.
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(phoneW, phoneH,
		chromedp.EmulateScale(phoneScale), chromedp.EmulateMobile, chromedp.EmulateTouch, chromedp.EmulatePortrait)); err != nil {
		t.Fatalf("starting Chromium: %v", err)
	}
	return ctx, closeBrowser
}

// noTierUp keeps V8 on its baseline WebAssembly compiler. On a busy 2-core
// machine the optimising recompile of the 11 MB module competes with the
// page for the CPU (the first screenshot after load took 50 s with it, 11 s
// without, in one measurement); the browser test checks behaviour, not
// speed, so it skips that work. The figures benchmark leaves it on.
func noTierUp() chromedp.ExecAllocatorOption { return chromedp.Flag("js-flags", "--no-wasm-tier-up") }

// within runs steps with a time limit, failing the test with what on error.
func within(t testing.TB, ctx context.Context, d time.Duration, what string, steps ...chromedp.Action[chromedp.Void]) {
	t.Helper()
	tctx, cancel := context.WithTimeout(ctx, d)
	defer cancel()
	if err := chromedp.Do(tctx, steps...); err != nil {
		t.Fatalf("%s: %v", what, err)
	}
}

// waitFor polls a JavaScript condition until it holds.
func waitFor(t testing.TB, ctx context.Context, d time.Duration, cond string) {
	t.Helper()
	waitValue[chromedp.Void](t, ctx, d, cond)
}

// waitValue polls a JavaScript expression until it is truthy and returns
// its value.
func waitValue[T any](t testing.TB, ctx context.Context, d time.Duration, expr string) T {
	t.Helper()
	start := time.Now()
	tctx, cancel := context.WithTimeout(ctx, d+5*time.Second)
	defer cancel()
	v, err := chromedp.Run(tctx, chromedp.Poll[T](expr, chromedp.WithPollingTimeout(d), chromedp.WithPollingInterval(50*time.Millisecond)))
	if err != nil {
		t.Fatalf("waiting for %s: %v", expr, err)
	}
	t.Logf("%s after %v", expr, time.Since(start).Round(time.Millisecond))
	return v
}

// eval evaluates a JavaScript expression (awaiting it if it is a promise)
// and decodes its value. The limit is long: a promise waiting for an
// animation frame waits for the software GPU on the shared machine.
func eval[T any](t testing.TB, ctx context.Context, expr string) T {
	t.Helper()
	tctx, cancel := context.WithTimeout(ctx, 3*time.Minute)
	defer cancel()
	v, err := chromedp.Run(tctx, chromedp.Evaluate[T](expr, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("evaluating %s: %v", expr, err)
	}
	return v
}

// waitQuiet polls a JavaScript condition until it holds, without logging:
// for the many small waits of a typed round.
func waitQuiet(t testing.TB, ctx context.Context, d time.Duration, cond string) {
	t.Helper()
	tctx, cancel := context.WithTimeout(ctx, d+5*time.Second)
	defer cancel()
	if _, err := chromedp.Run(tctx, chromedp.Poll[chromedp.Void](cond, chromedp.WithPollingTimeout(d), chromedp.WithPollingInterval(10*time.Millisecond))); err != nil {
		t.Fatalf("waiting for %s: %v", cond, err)
	}
}

// touchEvent sends one touch event of one finger at (x, y) CSS px (no point for
// the end of a touch).
func touchEvent(typ input.DispatchTouchEventType, x, y float64) chromedp.Action[chromedp.Void] {
	return chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		pts := []*input.TouchPoint{{X: x, Y: y}}
		if typ == input.DispatchTouchEventTypeTouchEnd {
			pts = []*input.TouchPoint{}
		}
		_, err := cdp.Call(ctx, tg, input.DispatchTouchEvent, input.DispatchTouchEventParams{Type: typ, TouchPoints: pts})
		return err
	})
}

// tap presses one finger at (x, y) CSS px, holds it for hold, and lifts it.
func tap(t testing.TB, ctx context.Context, x, y float64, hold time.Duration) {
	t.Helper()
	// The limit only guards against a hung browser: on the shared test
	// machine a touch event may wait seconds for the software GPU.
	within(t, ctx, 3*time.Minute+hold, fmt.Sprintf("tapping at %.0f,%.0f", x, y),
		touchEvent(input.DispatchTouchEventTypeTouchStart, x, y),
		chromedp.Sleep(hold),
		touchEvent(input.DispatchTouchEventTypeTouchEnd, x, y))
}

// readyForTouch waits until the page takes touch events, and reports how
// long that took. After the first frame the software GPU here stays busy
// for a while (about 20 s measured on the shared 2-core machine, with
// script evaluation answering within milliseconds meanwhile), and the
// browser holds the first touch event until it is done; later touches
// pass in tens of milliseconds. A touch in the corner, on no target,
// waits that out, so the taps that follow are timed on their own.
func readyForTouch(t testing.TB, ctx context.Context) time.Duration {
	t.Helper()
	start := time.Now()
	within(t, ctx, 120*time.Second, "the first touch",
		touchEvent(input.DispatchTouchEventTypeTouchStart, 1, phoneH-1),
		touchEvent(input.DispatchTouchEventTypeTouchEnd, 1, phoneH-1))
	d := time.Since(start)
	t.Logf("the page took its first touch after %v", d.Round(time.Millisecond))
	return d
}

// fingerStep is the time between a moving finger's touch events: a phone's
// touch screen reports about 60 times a second.
const fingerStep = 16 * time.Millisecond

// drag puts a finger down at (x0, y0), moves it to (x1, y1) in steps
// events fingerStep apart, and lifts it.
func drag(t testing.TB, ctx context.Context, x0, y0, x1, y1 float64, steps int) {
	t.Helper()
	acts := []chromedp.Action[chromedp.Void]{touchEvent(input.DispatchTouchEventTypeTouchStart, x0, y0)}
	for i := 1; i <= steps; i++ {
		f := float64(i) / float64(steps)
		acts = append(acts, chromedp.Sleep(fingerStep), touchEvent(input.DispatchTouchEventTypeTouchMove, x0+f*(x1-x0), y0+f*(y1-y0)))
	}
	acts = append(acts, touchEvent(input.DispatchTouchEventTypeTouchEnd, x1, y1))
	within(t, ctx, 30*time.Second, fmt.Sprintf("dragging from %.0f,%.0f to %.0f,%.0f", x0, y0, x1, y1), acts...)
}

// screenshot captures the viewport at device resolution and keeps a copy in
// $EVENBEAT_SHOTS (when set) or the test's temporary directory.
func screenshot(t testing.TB, ctx context.Context, name string) image.Image {
	t.Helper()
	tctx, cancel := context.WithTimeout(ctx, 120*time.Second)
	defer cancel()
	start := time.Now()
	// PNG is lossless, so colours can be compared exactly; the fast
	// encoder matters at 1170x2532 pixels on a busy machine.
	buf, err := chromedp.Run(tctx, chromedp.Action[[]byte](func(ctx context.Context, tg *chromedp.Target) ([]byte, error) {
		yes := true
		res, err := cdp.Call(ctx, tg, page.CaptureScreenshot, page.CaptureScreenshotParams{FromSurface: &yes, OptimizeForSpeed: &yes})
		return res.Data, err
	}))
	t.Logf("screenshot took %v", time.Since(start))
	if err != nil {
		t.Fatalf("screenshot %s: %v", name, err)
	}
	dir := os.Getenv("EVENBEAT_SHOTS")
	if dir == "" {
		dir = t.TempDir()
	}
	p := filepath.Join(dir, name+".png")
	if err := os.WriteFile(p, buf, 0o644); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(buf))
	if err != nil {
		t.Fatalf("screenshot %s: %v", name, err)
	}
	if b := img.Bounds(); b.Dx() != phoneW*phoneScale || b.Dy() != phoneH*phoneScale {
		t.Fatalf("screenshot %s is %v; want %dx%d device pixels", name, b, phoneW*phoneScale, phoneH*phoneScale)
	}
	t.Logf("screenshot %s: %s", name, p)
	return img
}

// near reports whether c is within tol of want in every channel.
func near(c color.Color, want color.RGBA, tol int) bool {
	r, g, b, _ := c.RGBA()
	d := func(a uint32, w uint8) bool {
		v := int(a>>8) - int(w)
		return v >= -tol && v <= tol
	}
	return d(r, want.R) && d(g, want.G) && d(b, want.B)
}

// count counts the pixels of img inside r (device pixels) that are near col.
func count(img image.Image, r image.Rectangle, col color.RGBA, tol int) int {
	n := 0
	r = r.Intersect(img.Bounds())
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			if near(img.At(x, y), col, tol) {
				n++
			}
		}
	}
	return n
}

func chromedpNavigate(url string) chromedp.Action[chromedp.Void] { return chromedp.Navigate(url) }

func chromedpReload() chromedp.Action[chromedp.Void] { return chromedp.Reload() }

// killBrowser ends the browser process with SIGKILL, as a phone's system
// may end an app without warning: nothing gets a chance to flush.
func killBrowser(t testing.TB, ctx context.Context) {
	t.Helper()
	c := chromedp.FromContext(ctx)
	if c == nil || c.Browser == nil || c.Browser.Process() == nil {
		t.Fatal("no browser process to kill")
	}
	p := c.Browser.Process()
	if err := p.Kill(); err != nil {
		t.Fatalf("killing the browser (pid %d): %v", p.Pid, err)
	}
	// chromedp waits for the process and then ends the context.
	select {
	case <-ctx.Done():
	case <-time.After(30 * time.Second):
		t.Fatalf("the browser (pid %d) did not end after SIGKILL", p.Pid)
	}
}
