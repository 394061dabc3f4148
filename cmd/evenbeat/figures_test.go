package main

import (
	"testing"
	"time"
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
