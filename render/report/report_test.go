package report_test

import (
	"bytes"
	"image/png"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/report"
	"evenbeat/setting/cpubench"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

func demoSession(t testing.TB) *session.Session {
	t.Helper()
	s, err := session.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// The report is a tall PNG of the report's height at the asked scale,
// painted down to the bottom.
func TestWritePNG(t *testing.T) {
	s := demoSession(t)
	var buf bytes.Buffer
	if err := report.WritePNG(&buf, s, report.Options{Scale: 1.5}); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	rm, err := report.Build(s, report.Options{})
	if err != nil {
		t.Fatal(err)
	}
	h := render.ReportHeight(render.ReportWidth, rm)
	b := img.Bounds()
	if b.Dx() != render.ReportWidth*3/2 || b.Dy() < int(h*1.5) || b.Dy() > int(h*1.5)+1 {
		t.Errorf("image %v, want %d x %.0f", b, render.ReportWidth*3/2, h*1.5)
	}
	if b.Dy() < 2*b.Dx() {
		t.Errorf("image %v is not a tall page", b)
	}
	// The bottom row is the page's ground, not left transparent.
	if _, _, _, a := img.At(b.Dx()/2, b.Dy()-1).RGBA(); a != 0xffff {
		t.Errorf("bottom pixel alpha %x", a)
	}
}

// A session the plan cannot use gives the plan's sentence naming the
// field, and writes nothing.
func TestWritePNGBadSession(t *testing.T) {
	s := demoSession(t)
	var buf bytes.Buffer
	err := report.WritePNG(&buf, s, report.Options{Plan: plan.Options{Cylinder: 5}})
	if err == nil || !strings.Contains(err.Error(), "cylinder") || buf.Len() != 0 {
		t.Errorf("err %v, %d bytes written", err, buf.Len())
	}
}

// BenchmarkReportPNG is the whole report command's work: fit, plan,
// layout, drawing at scale 2 and PNG encoding. Issue goal: under 300 ms.
func BenchmarkReportPNG(b *testing.B) {
	s := demoSession(b)
	var buf bytes.Buffer
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		buf.Reset()
		if err := report.WritePNG(&buf, s, report.Options{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(buf.Len()), "png-bytes")
}

// BenchmarkReportDraw is the drawing alone, without fit, plan or PNG.
func BenchmarkReportDraw(b *testing.B) {
	rm, err := report.Build(demoSession(b), report.Options{})
	if err != nil {
		b.Fatal(err)
	}
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		report.Draw(rm, report.Options{})
	}
}
