package main

import (
	"bytes"
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
	v2 := changedPage(t, v1)
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
}

func contains2(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// changedPage returns b with a marker added to index.html: a new version.
func changedPage(t *testing.T, b *bundle) *bundle {
	t.Helper()
	static := fstest.MapFS{}
	err := fs.WalkDir(site.Files, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := fs.ReadFile(site.Files, p)
		if p == "index.html" {
			data = bytes.Replace(data, []byte("<title>"), []byte(`<meta name="evenbeat-test" content="v2"><title>`), 1)
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
