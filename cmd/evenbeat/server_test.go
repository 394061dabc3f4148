package main

import (
	"bytes"
	"compress/gzip"
	"encoding/json"
	"fmt"
	"image/color"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"testing/fstest"

	"evenbeat/render"
	"evenbeat/site"
)

func testBundle(t *testing.T, wasm string) *bundle {
	t.Helper()
	static := fstest.MapFS{
		"index.html":           {Data: []byte("<!doctype html><title>t</title>" + strings.Repeat(" ", 200))},
		"sw.js":                {Data: []byte("const V = \"" + site.VersionMark + "\"; const A = " + site.AssetsMark + ";")},
		"manifest.webmanifest": {Data: []byte(`{"start_url":"./"}`)},
		"embed.go":             {Data: []byte("package site")},
	}
	b, err := assembleSite(static, []byte(wasm), []byte("// wasm_exec"), map[string][]byte{"icon-192.png": []byte("\x89PNG")})
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestAssembleSite(t *testing.T) {
	b := testBundle(t, strings.Repeat("\x00asm", 100))
	var names []string
	for n := range b.Assets {
		names = append(names, n)
	}
	for _, want := range []string{"index.html", "sw.js", "manifest.webmanifest", "main.wasm", "wasm_exec.js", "icon-192.png"} {
		if b.Assets[want] == nil {
			t.Errorf("no %s in %v", want, names)
		}
	}
	if b.Assets["embed.go"] != nil {
		t.Error("the Go embedding file is served")
	}
	sw := string(b.Assets["sw.js"].Data)
	if !strings.Contains(sw, b.Version) || strings.Contains(sw, site.VersionMark) {
		t.Errorf("sw.js lacks version %s: %s", b.Version, sw)
	}
	const wantList = `["./","icon-192.png","main.wasm","manifest.webmanifest","wasm_exec.js"]`
	if !strings.Contains(sw, wantList) {
		t.Errorf("sw.js precaches the wrong list (want %s, never index.html or sw.js): %s", wantList, sw)
	}
	if b.Assets["icon-192.png"].Gzip != nil {
		t.Error("PNG was gzipped")
	}
	if b.Assets["main.wasm"].Gzip == nil {
		t.Error("main.wasm has no gzip form")
	}

	if other := testBundle(t, strings.Repeat("\x00asm", 101)); other.Version == b.Version {
		t.Error("a different main.wasm kept the same cache version: old JS could mix with new wasm")
	}
	if again := testBundle(t, strings.Repeat("\x00asm", 100)); again.Version != b.Version {
		t.Error("the same assets gave a different version")
	}
}

func TestRealSiteFiles(t *testing.T) {
	b, err := assembleSite(site.Files, []byte("wasm"), []byte("js"), map[string][]byte{"icon-192.png": nil, "icon-512.png": nil})
	if err != nil {
		t.Fatal(err)
	}
	var m struct {
		StartURL string `json:"start_url"`
		Icons    []struct{ Src, Sizes, Purpose string }
	}
	if err := json.Unmarshal(b.Assets["manifest.webmanifest"].Data, &m); err != nil {
		t.Fatalf("manifest is not JSON: %v", err)
	}
	if m.StartURL != "./" {
		t.Errorf("start_url = %q; want ./ (index.html may be redirected)", m.StartURL)
	}
	found := map[string]bool{}
	for _, ic := range m.Icons {
		found[ic.Sizes+" "+ic.Purpose] = true
		if b.Assets[ic.Src] == nil {
			t.Errorf("manifest names %s, which the site lacks", ic.Src)
		}
	}
	for _, want := range []string{"192x192 any", "512x512 any", "192x192 maskable", "512x512 maskable"} {
		if !found[want] {
			t.Errorf("manifest lacks icon %s", want)
		}
	}
	index := string(b.Assets["index.html"].Data)
	for _, want := range []string{`src="wasm_exec.js"`, `"main.wasm"`, `aria-live`, `id="loading"`, `register("sw.js")`, `rel="manifest"`} {
		if !strings.Contains(index, want) {
			t.Errorf("index.html lacks %s", want)
		}
	}
	// The page shows the theme's colours before the first frame.
	hex := func(c color.RGBA) string { return fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B) }
	for _, want := range []string{hex(render.Light().Background), hex(render.Light().Ink), hex(render.Dark().Background), hex(render.Dark().Ink)} {
		if !strings.Contains(index, want) {
			t.Errorf("index.html lacks the theme colour %s", want)
		}
	}
	if !strings.Contains(string(b.Assets["manifest.webmanifest"].Data), hex(render.Light().Background)) {
		t.Error("the manifest's background is not the light theme's")
	}
	if strings.Contains(string(b.Assets["sw.js"].Data), `"./index.html"`) {
		t.Error("sw.js caches ./index.html")
	}
}

func TestMimeTypes(t *testing.T) {
	for name, want := range map[string]string{
		"main.wasm":            "application/wasm",
		"manifest.webmanifest": "application/manifest+json",
		"wasm_exec.js":         "text/javascript; charset=utf-8",
		"sw.js":                "text/javascript; charset=utf-8",
		"index.html":           "text/html; charset=utf-8",
		"icon-512.png":         "image/png",
		"README":               "application/octet-stream",
	} {
		if got := mimeType(name); got != want {
			t.Errorf("mimeType(%s) = %q; want %q", name, got, want)
		}
	}
}

func TestAcceptsGzip(t *testing.T) {
	for header, want := range map[string]bool{
		"":                        false,
		"gzip":                    true,
		"gzip, deflate, br, zstd": true,
		"br;q=1.0, gzip;q=0.8":    true,
		"GZIP":                    true,
		"gzip;q=0":                false,
		"gzip; q=0.000":           false,
		"*":                       true,
		"*;q=0":                   false,
		"identity":                false,
		"deflate, br":             false,
		"*, gzip;q=0":             false,
		"x-gzip":                  true,
		"gzip;q=bogus":            false,
	} {
		if got := acceptsGzip(header); got != want {
			t.Errorf("acceptsGzip(%q) = %v; want %v", header, got, want)
		}
	}
}

func TestServe(t *testing.T) {
	b := testBundle(t, strings.Repeat("\x00asm", 100))
	srv := httptest.NewServer(b)
	defer srv.Close()
	// Go's client would add Accept-Encoding and decode for us; ask
	// explicitly to see what goes over the wire.
	tr := &http.Transport{DisableCompression: true}
	client := &http.Client{Transport: tr}
	get := func(method, path string, header map[string]string) (*http.Response, []byte) {
		t.Helper()
		req, _ := http.NewRequest(method, srv.URL+path, nil)
		for k, v := range header {
			req.Header.Set(k, v)
		}
		res, err := client.Do(req)
		if err != nil {
			t.Fatal(err)
		}
		defer res.Body.Close()
		body, _ := io.ReadAll(res.Body)
		return res, body
	}

	res, body := get("GET", "/main.wasm", map[string]string{"Accept-Encoding": "gzip, br"})
	if res.StatusCode != 200 || res.Header.Get("Content-Type") != "application/wasm" || res.Header.Get("Content-Encoding") != "gzip" {
		t.Fatalf("main.wasm with gzip: %d %v", res.StatusCode, res.Header)
	}
	if !strings.Contains(res.Header.Get("Vary"), "Accept-Encoding") {
		t.Error("gzip response has no Vary: Accept-Encoding")
	}
	zr, err := gzip.NewReader(bytes.NewReader(body))
	if err != nil {
		t.Fatal(err)
	}
	plain, _ := io.ReadAll(zr)
	if !bytes.Equal(plain, b.Assets["main.wasm"].Data) {
		t.Error("gzip body does not decode to main.wasm")
	}
	gzTag := res.Header.Get("ETag")

	res, body = get("GET", "/main.wasm", nil)
	if res.Header.Get("Content-Encoding") != "" || !bytes.Equal(body, b.Assets["main.wasm"].Data) {
		t.Errorf("client without gzip got encoding %q", res.Header.Get("Content-Encoding"))
	}
	if res.Header.Get("ETag") == gzTag {
		t.Error("plain and gzip bodies share an ETag")
	}
	res, _ = get("GET", "/main.wasm", map[string]string{"Accept-Encoding": "gzip", "If-None-Match": gzTag})
	if res.StatusCode != http.StatusNotModified {
		t.Errorf("If-None-Match with the current tag: %d; want 304", res.StatusCode)
	}

	if res, body = get("GET", "//", nil); res.StatusCode != 200 || !bytes.Equal(body, b.Assets["index.html"].Data) {
		t.Errorf("//: %d; want index.html", res.StatusCode)
	}
	res, body = get("GET", "/", nil)
	if res.StatusCode != 200 || res.Header.Get("Content-Type") != "text/html; charset=utf-8" || !bytes.Equal(body, b.Assets["index.html"].Data) {
		t.Errorf("/ : %d %v", res.StatusCode, res.Header)
	}
	res, body = get("HEAD", "/manifest.webmanifest", nil)
	if res.StatusCode != 200 || res.Header.Get("Content-Type") != "application/manifest+json" || len(body) != 0 {
		t.Errorf("HEAD manifest: %d %v %q", res.StatusCode, res.Header, body)
	}
	res, _ = get("GET", "/sw.js", nil)
	if res.Header.Get("Cache-Control") != "no-cache" {
		t.Errorf("sw.js Cache-Control = %q; a stale worker would pin an old version", res.Header.Get("Cache-Control"))
	}
	if res, _ = get("GET", "/nope.js", nil); res.StatusCode != 404 {
		t.Errorf("unknown file: %d; want 404", res.StatusCode)
	}
	if res, _ = get("POST", "/", nil); res.StatusCode != 405 {
		t.Errorf("POST: %d; want 405", res.StatusCode)
	}
}

func TestWriteSite(t *testing.T) {
	b := testBundle(t, strings.Repeat("\x00asm", 100))
	dir := filepath.Join(t.TempDir(), "out")
	if err := b.write(dir); err != nil {
		t.Fatal(err)
	}
	for name, a := range b.Assets {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil || !bytes.Equal(got, a.Data) {
			t.Errorf("%s not written faithfully: %v", name, err)
		}
		_, err = os.Stat(filepath.Join(dir, name+".gz"))
		if (a.Gzip != nil) != (err == nil) {
			t.Errorf("%s.gz present = %v; want %v", name, err == nil, a.Gzip != nil)
		}
	}
}
