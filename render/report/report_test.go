package report_test

import (
	"bytes"
	"fmt"
	"image/png"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/report"
	"evenbeat/setting"
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

// A report stays short whatever the engine: with 30 notches it draws six
// valve curves a cylinder (full forward, the first notches, full back) and
// names the others; each cylinder's event table (two rows a notch) and
// balance card (a row a notch) grow, by less than a valve curve's card a
// notch and cylinder, and the whole engine's beat is drawn in three
// positions at most.
func TestReportOfManyNotchesStaysShort(t *testing.T) {
	s := demoSession(t)
	base, err := report.Build(s, report.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < 30; i++ {
		s.Engine.Notches = append(s.Engine.Notches, setting.Notch{Name: fmt.Sprintf("notch %d", i+2), Reverser: setting.Reverser(0.9 - 0.06*float64(i))})
	}
	many, err := report.Build(s, report.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(many.Model.Positions) != 33 {
		t.Fatalf("%d positions, want 33", len(many.Model.Positions))
	}
	h0, h := render.ReportHeight(render.ReportWidth, base), render.ReportHeight(render.ReportWidth, many)
	curve := render.LayoutValveCurve(render.Rect{Max: render.Point{X: render.ReportWidth, Y: 1e6}}, many.Model, 0).NeedH
	cyls := float64(1 + len(many.Others))
	if len(many.Others) != 1 || len(many.Beat) != 33 {
		t.Fatalf("the demo's report covers %d other cylinders and %d positions of the beat, want 1 and 33", len(many.Others), len(many.Beat))
	}
	if h-h0 > 30*cyls*curve {
		t.Errorf("the report of 33 positions is %.0f units tall, the demo's (3 positions) %.0f: %.0f a notch and cylinder, a valve curve's card is %.0f", h, h0, (h-h0)/30/cyls, curve)
	}
}
