package main

import (
	"bytes"
	"context"
	"io/fs"
	"net"
	"net/http"
	"sync/atomic"
	"testing"
	"testing/fstest"
	"time"

	"github.com/chromedp/chromedp"

	"evenbeat/site"
)

// TestNewVersionNeverMixes serves one version, lets the service worker take
// it, then deploys a second version (a changed page) and checks that the
// running version keeps serving everything from its own cache while the new
// worker waits; only when no page uses the old version any more does the
// new one take over, and the old cache is deleted.
func TestNewVersionNeverMixes(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	v1, err := (&Main{Src: "."}).Bundle()
	if err != nil {
		t.Fatal(err)
	}
	v2 := changedPage(t, v1, "v2")
	if v1.Version == v2.Version {
		t.Fatal("a changed page kept the version key")
	}

	var current atomic.Pointer[bundle]
	current.Store(v1)
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	srv := &http.Server{Handler: http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		current.Load().ServeHTTP(w, r)
	})}
	go srv.Serve(ln)
	t.Cleanup(func() { srv.Close() })
	url := "http://" + ln.Addr().String() + "/"

	ctx, _ := newBrowser(t, t.TempDir(), noTierUp())
	within(t, ctx, 90*time.Second, "opening "+url, chromedpNavigate(url))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn !== undefined && navigator.serviceWorker.controller !== null`)

	current.Store(v2) // deploy
	within(t, ctx, 90*time.Second, "reloading after the deploy", chromedpReload())
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn !== undefined`)
	if eval[bool](t, ctx, `document.querySelector('meta[name="evenbeat-test"]') !== null`) {
		t.Fatal("the page of the new version was served while the old version's worker controls the page")
	}
	// The browser fetched the new sw.js on the navigation; it installs and
	// must wait.
	waitFor(t, ctx, 90*time.Second, `navigator.serviceWorker.getRegistration().then(r => r && r.waiting !== null)`)
	keys := eval[[]string](t, ctx, `caches.keys()`)
	if !contains2(keys, v1.Version) || !contains2(keys, v2.Version) {
		t.Errorf("caches while the new worker waits: %v; want both %s and %s", keys, v1.Version, v2.Version)
	}
	// The running version's cache still holds the old page: nothing of the
	// new version crept in.
	if eval[bool](t, ctx, `caches.open("`+v1.Version+`").then(c => c.match("./")).then(r => r.text()).then(s => s.includes("evenbeat-test"))`) {
		t.Error("the old version's cache holds the new page")
	}

	// Leave the app, so no page uses the old version, and come back. The
	// waiting worker activates a moment after the last page has gone; a
	// page opened before that is still the old version's, as on a phone,
	// so come back until the new version shows (a bounded number of times).
	const tries = 10
	for i := 1; ; i++ {
		within(t, ctx, 30*time.Second, "leaving the app", chromedpNavigate("about:blank"), chromedp.Sleep(time.Second))
		within(t, ctx, 90*time.Second, "opening the app again", chromedpNavigate(url))
		waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn !== undefined`)
		if eval[bool](t, ctx, `document.querySelector('meta[name="evenbeat-test"]') !== null`) {
			break
		}
		if i == tries {
			t.Fatalf("after leaving and opening the app %d times the new version has not taken over", tries)
		}
	}
	waitFor(t, ctx, 90*time.Second, `caches.keys().then(k => k.length === 1 && k[0] === "`+v2.Version+`")`)
	if eval[bool](t, ctx, "window.evenbeatUpdateReady") {
		t.Error("the app offers a new version while none waits")
	}

	// Offered in the app: a third version deployed while the second runs
	// waits, the page notices and the app shows its banner; Restart makes
	// the waiting worker take over and reloads into the third version,
	// every file of it.
	v3 := changedPage(t, v1, "v3")
	current.Store(v3)
	within(t, ctx, 90*time.Second, "reloading after the third deploy", chromedpReload())
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn !== undefined`)
	waitFor(t, ctx, 90*time.Second, `navigator.serviceWorker.getRegistration().then(r => r && r.waiting !== null)`)
	waitFor(t, ctx, 90*time.Second, `window.evenbeatUpdateReady === true && JSON.parse(window.evenbeatTargets).some(t => t.Label === "Restart")`)
	if tag := eval[string](t, ctx, pageTagJS); tag != "v2" {
		t.Fatalf("with the third version waiting the page is %q; want v2 until Restart", tag)
	}
	if keys := eval[[]string](t, ctx, `caches.keys()`); !contains2(keys, v2.Version) || !contains2(keys, v3.Version) {
		t.Errorf("caches while the third version waits: %v; want both %s and %s", keys, v2.Version, v3.Version)
	}
	eval[bool](t, ctx, "(window.evenbeatBefore = true)")
	tapRestart(t, ctx)
	// The page reloads by itself (evenbeatBefore is gone) into the third
	// version, served whole from its own cache, the second's deleted.
	waitThroughReload(t, ctx, 90*time.Second, `window.evenbeatBefore === undefined && window.evenbeatDrawn !== undefined`)
	if tag := eval[string](t, ctx, pageTagJS); tag != "v3" {
		t.Fatalf("after Restart the page is %q; want v3", tag)
	}
	waitFor(t, ctx, 90*time.Second, `caches.keys().then(k => k.length === 1 && k[0] === "`+v3.Version+`")`)
	if !eval[bool](t, ctx, `caches.open("`+v3.Version+`").then(c => c.match("./")).then(r => r.text()).then(s => s.includes('content="v3"'))`) {
		t.Error("the third version's cache does not hold its own page")
	}
	if eval[bool](t, ctx, "window.evenbeatUpdateReady") {
		t.Error("after Restart the app still offers a new version")
	}
}

// pageTagJS is the version marker of the page shown ("" for the first).
const pageTagJS = `(document.querySelector('meta[name="evenbeat-test"]') || {content: ""}).content`

// waitThroughReload polls a JavaScript condition until it holds, across
// the page reloading (which ends an evaluation in flight).
func waitThroughReload(t *testing.T, ctx context.Context, d time.Duration, cond string) {
	t.Helper()
	start := time.Now()
	var last error
	for time.Since(start) < d {
		ectx, cancel := context.WithTimeout(ctx, 10*time.Second)
		ok, err := chromedp.Run(ectx, chromedp.Evaluate[bool](cond))
		cancel()
		if err == nil && ok {
			t.Logf("%s after %v", cond, time.Since(start).Round(time.Millisecond))
			return
		}
		last = err
		time.Sleep(200 * time.Millisecond)
	}
	t.Fatalf("waiting for %s: not true after %v (last error: %v)", cond, d, last)
}

// tapRestart taps the app's Restart button, allowing the busy page a
// minute to take the touch.
func tapRestart(t *testing.T, ctx context.Context) {
	t.Helper()
	for _, tg := range targets(t, ctx) {
		if tg.Label == "Restart" {
			touch(t, ctx, tg.X+tg.W/2, tg.Y+tg.H/2)
			return
		}
	}
	t.Fatal("no Restart target")
}

func contains2(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// changedPage returns b with a marker (meta evenbeat-test, content tag)
// added to index.html: a new version.
func changedPage(t *testing.T, b *bundle, tag string) *bundle {
	t.Helper()
	static := fstest.MapFS{}
	err := fs.WalkDir(site.Files, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := fs.ReadFile(site.Files, p)
		if p == "index.html" {
			data = bytes.Replace(data, []byte("<title>"), []byte(`<meta name="evenbeat-test" content="`+tag+`"><title>`), 1)
		}
		static[p] = &fstest.MapFile{Data: data}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	icons := map[string][]byte{}
	for name, a := range b.Assets {
		if a.Type == "image/png" {
			icons[name] = a.Data
		}
	}
	v2, err := assembleSite(static, b.Assets["main.wasm"].Data, b.Assets["wasm_exec.js"].Data, icons)
	if err != nil {
		t.Fatal(err)
	}
	return v2
}
