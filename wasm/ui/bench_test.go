package ui

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting/cpubench"
)

// BenchmarkFramePlan draws one frame of the busiest screen, the plan's
// balance card with the what-if track after a drag, into the recorder.
func BenchmarkFramePlan(b *testing.B) {
	a := planApp(b)
	tap(b, a, "Balance")
	if err := a.SetWhatIf(0, a.plan.Steps[0].Amount+0.1); err != nil {
		b.Fatal(err)
	}
	c := recorder.New(phoneW, phoneH)
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Reset()
		a.Draw(c)
	}
}

// BenchmarkFrameMotion draws one frame of the motion drawing turning.
func BenchmarkFrameMotion(b *testing.B) {
	a := planApp(b)
	tap(b, a, "Motion")
	c := recorder.New(phoneW, phoneH)
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		a.Handle(Intent{Kind: Drag, At: render.Point{X: 200, Y: 400}, Delta: render.Point{X: 3}})
		c.Reset()
		a.Draw(c)
	}
}

// BenchmarkWhatIf is one what-if update: a step's amount changed and the
// diagrams' model rebuilt.
func BenchmarkWhatIf(b *testing.B) {
	a := planApp(b)
	amt := a.plan.Steps[0].Amount
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	i := 0
	for b.Loop() {
		i++
		if err := a.SetWhatIf(0, amt+float64(i%10)*0.01); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFrameMeasure draws one frame of a measuring step late in the
// round (the keypad, the step's words, the plausibility check).
func BenchmarkFrameMeasure(b *testing.B) {
	a := planApp(b)
	tap(b, a, "Menu")
	tap(b, a, "All readings")
	tap(b, a, "Back dead centre, full back")
	c := recorder.New(phoneW, phoneH)
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Reset()
		a.Draw(c)
	}
}

// BenchmarkMakePlan is what the app does when a round is finished or a
// session file is imported: fit, plan and the diagrams' model of the demo
// session as shipped (issue 6's goal: under 16 ms inside the browser; run
// it as wasm under node with
// GOOS=js GOARCH=wasm go test -exec "$(go env GOROOT)/lib/wasm/go_js_wasm_exec").
func BenchmarkMakePlan(b *testing.B) {
	a := newTestApp(b, newMemStore())
	src, err := encodeSession(demoSession(b))
	if err != nil {
		b.Fatal(err)
	}
	if err := a.Import(src); err != nil {
		b.Fatal(err)
	}
	if a.plan == nil {
		b.Fatalf("no plan: %q", a.planNote)
	}
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		a.makePlan()
	}
}
