package main

import (
	"net/http"
	"path"
	"strconv"
	"strings"
)

// ServeHTTP serves the bundle: "/" is index.html; every response carries its
// exact Content-Type, and the gzip form when the client accepts it.
func (b *bundle) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	if r.Method != http.MethodGet && r.Method != http.MethodHead {
		w.Header().Set("Allow", "GET, HEAD")
		http.Error(w, "method not allowed", http.StatusMethodNotAllowed)
		return
	}
	name := strings.TrimPrefix(path.Clean("/"+r.URL.Path), "/")
	if name == "" {
		name = "index.html"
	}
	a, ok := b.Assets[name]
	if !ok {
		http.NotFound(w, r)
		return
	}
	h := w.Header()
	h.Set("Content-Type", a.Type)
	h.Set("X-Content-Type-Options", "nosniff")
	// Revalidate every time: the service worker holds the offline copy, and
	// sw.js must never be stale.
	h.Set("Cache-Control", "no-cache")
	body, tag := a.Data, a.ETag
	if a.Gzip != nil {
		h.Set("Vary", "Accept-Encoding")
		if acceptsGzip(r.Header.Get("Accept-Encoding")) {
			body = a.Gzip
			tag = strings.TrimSuffix(a.ETag, `"`) + `-gz"`
			h.Set("Content-Encoding", "gzip")
		}
	}
	h.Set("ETag", tag)
	if match := r.Header.Get("If-None-Match"); match != "" && etagMatches(match, tag) {
		w.WriteHeader(http.StatusNotModified)
		return
	}
	h.Set("Content-Length", strconv.Itoa(len(body)))
	w.WriteHeader(http.StatusOK)
	if r.Method != http.MethodHead {
		w.Write(body)
	}
}

// acceptsGzip reports whether an Accept-Encoding header allows gzip: a
// "gzip" or "*" coding with a non-zero quality (RFC 9110, section 12.5.3).
func acceptsGzip(header string) bool {
	gzip, star := -1.0, -1.0
	for _, part := range strings.Split(header, ",") {
		fields := strings.Split(part, ";")
		coding := strings.ToLower(strings.TrimSpace(fields[0]))
		q := 1.0
		for _, p := range fields[1:] {
			k, v, ok := strings.Cut(strings.TrimSpace(p), "=")
			if ok && strings.EqualFold(strings.TrimSpace(k), "q") {
				f, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
				if err != nil {
					f = 0
				}
				q = f
			}
		}
		switch coding {
		case "gzip", "x-gzip":
			gzip = q
		case "*":
			star = q
		}
	}
	if gzip >= 0 {
		return gzip > 0
	}
	return star > 0
}

// etagMatches reports whether an If-None-Match header names tag (weak
// comparison, as RFC 9110 asks for If-None-Match).
func etagMatches(header, tag string) bool {
	if strings.TrimSpace(header) == "*" {
		return true
	}
	for _, t := range strings.Split(header, ",") {
		t = strings.TrimPrefix(strings.TrimSpace(t), "W/")
		if t == tag {
			return true
		}
	}
	return false
}
