package main

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/report"
	"evenbeat/site"
)

// asset is one file of the site, with its precompressed form.
type asset struct {
	Name string // path below the site root, e.g. "main.wasm"
	Type string // Content-Type
	Data []byte
	Gzip []byte // gzip -9 of Data; nil when compression does not pay (PNG)
	ETag string // quoted strong validator of Data
}

// bundle is the complete site: every asset, and the version key the service
// worker caches them under.
type bundle struct {
	Assets  map[string]*asset
	Version string
}

// iconSizes are the square icon sizes (px) the manifest names.
func iconSizes() []int { return []int{192, 512} }

// drawIcon renders the app icon at size x size pixels as PNG.
func drawIcon(size int) ([]byte, error) {
	c := raster.New(size, size, 1)
	render.Icon(c, float64(size))
	var buf bytes.Buffer
	if err := report.EncodePNG(&buf, c); err != nil {
		return nil, fmt.Errorf("drawing the %d px icon: %w", size, err)
	}
	return buf.Bytes(), nil
}

// assembleSite puts together the embedded static files, the built app, Go's
// wasm_exec.js and the icons; it fills in the service worker's version (a
// hash of every other asset) and its precache list.
func assembleSite(static fs.FS, wasm, wasmExec []byte, icons map[string][]byte) (*bundle, error) {
	files := map[string][]byte{"main.wasm": wasm, "wasm_exec.js": wasmExec}
	for name, data := range icons {
		files[name] = data
	}
	var template []byte
	err := fs.WalkDir(static, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || strings.HasSuffix(p, ".go") {
			return err
		}
		data, err := fs.ReadFile(static, p)
		if err != nil {
			return err
		}
		if p == "sw.js" {
			template = data
		} else {
			files[p] = data
		}
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("reading the site files: %w", err)
	}
	if template == nil {
		return nil, fmt.Errorf("the site files have no sw.js")
	}
	if _, ok := files["index.html"]; !ok {
		return nil, fmt.Errorf("the site files have no index.html")
	}
	version := siteVersion(files)
	sw, err := fillWorker(template, version, precacheList(files))
	if err != nil {
		return nil, err
	}
	files["sw.js"] = sw

	b := &bundle{Assets: map[string]*asset{}, Version: version}
	for name, data := range files {
		a := &asset{Name: name, Type: mimeType(name), Data: data, ETag: etag(data)}
		if compressible(name) {
			gz, err := gzipBest(data)
			if err != nil {
				return nil, err
			}
			if len(gz) < len(data) {
				a.Gzip = gz
			}
		}
		b.Assets[name] = a
	}
	return b, nil
}

// siteVersion is the cache key: a hash of every asset's name and content.
func siteVersion(files map[string][]byte) string {
	names := make([]string, 0, len(files))
	for n := range files {
		names = append(names, n)
	}
	sort.Strings(names)
	h := sha256.New()
	for _, n := range names {
		fmt.Fprintf(h, "%q %d\n", n, len(files[n]))
		h.Write(files[n])
	}
	return "evenbeat-" + hex.EncodeToString(h.Sum(nil))[:16]
}

// precacheList is what the worker caches: "./" for the page (never
// "./index.html", which some servers redirect) and every other asset.
func precacheList(files map[string][]byte) []string {
	list := []string{"./"}
	for n := range files {
		if n != "index.html" && n != "sw.js" {
			list = append(list, n)
		}
	}
	sort.Strings(list[1:])
	return list
}

// fillWorker writes the version and asset list into the worker template.
func fillWorker(template []byte, version string, assets []string) ([]byte, error) {
	if !bytes.Contains(template, []byte(site.VersionMark)) || !bytes.Contains(template, []byte(site.AssetsMark)) {
		return nil, fmt.Errorf("sw.js lacks %s or %s", site.VersionMark, site.AssetsMark)
	}
	list, err := json.Marshal(assets)
	if err != nil {
		return nil, err
	}
	out := bytes.ReplaceAll(template, []byte(site.VersionMark), []byte(version))
	return bytes.ReplaceAll(out, []byte(site.AssetsMark), list), nil
}

// mimeType returns the Content-Type for a site file, set explicitly so it
// does not depend on the host's MIME tables.
func mimeType(name string) string {
	switch path.Ext(name) {
	case ".html":
		return "text/html; charset=utf-8"
	case ".js":
		return "text/javascript; charset=utf-8"
	case ".wasm":
		return "application/wasm"
	case ".webmanifest":
		return "application/manifest+json"
	case ".png":
		return "image/png"
	case ".json":
		return "application/json"
	case ".css":
		return "text/css; charset=utf-8"
	case ".svg":
		return "image/svg+xml"
	}
	return "application/octet-stream"
}

// compressible reports whether gzip is worth trying (PNG is compressed
// already).
func compressible(name string) bool {
	return path.Ext(name) != ".png"
}

func gzipBest(data []byte) ([]byte, error) {
	var buf bytes.Buffer
	zw, err := gzip.NewWriterLevel(&buf, gzip.BestCompression)
	if err != nil {
		return nil, err
	}
	if _, err := zw.Write(data); err != nil {
		return nil, err
	}
	if err := zw.Close(); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

func etag(data []byte) string {
	sum := sha256.Sum256(data)
	return `"` + hex.EncodeToString(sum[:12]) + `"`
}

// write stores the site in dir as static files, with a .gz beside each
// compressible file for hosts that serve precompressed files.
func (b *bundle) write(dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("creating the output directory (-o): %w", err)
	}
	for _, a := range b.Assets {
		p := filepath.Join(dir, filepath.FromSlash(a.Name))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			return err
		}
		if err := os.WriteFile(p, a.Data, 0o644); err != nil {
			return fmt.Errorf("writing the site: %w", err)
		}
		if a.Gzip != nil {
			if err := os.WriteFile(p+".gz", a.Gzip, 0o644); err != nil {
				return fmt.Errorf("writing the site: %w", err)
			}
		}
	}
	return nil
}
