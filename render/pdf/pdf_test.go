package pdf_test

import (
	"bytes"
	"compress/zlib"
	"io"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/pdf"
	"evenbeat/render/report"
	"evenbeat/setting/session"
)

// demoReport draws the demo session's whole-engine report on a PDF canvas.
func demoReport(t testing.TB) *pdf.Canvas {
	t.Helper()
	f, err := os.Open("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := session.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	rm, err := report.Build(s, report.Options{})
	if err != nil {
		t.Fatal(err)
	}
	w := float64(render.ReportWidth)
	c := pdf.New(w, render.ReportHeight(w, rm))
	render.Report(c, rm, render.Light())
	return c
}

// The file is a PDF a reader can follow (ISO 32000-1, 7.5: header,
// objects, a cross-reference table whose offsets land on their objects,
// trailer): every offset points at its object, every page stream
// inflates, and the page count is the report's height over a page's.
func TestReportPDF(t *testing.T) {
	c := demoReport(t)
	var buf bytes.Buffer
	if err := c.Write(&buf, "Brackenfold (Stephenson): report"); err != nil {
		t.Fatal(err)
	}
	b := buf.Bytes()
	if !bytes.HasPrefix(b, []byte("%PDF-1.4\n")) || !bytes.HasSuffix(b, []byte("%%EOF\n")) {
		t.Fatal("not a PDF's header and end")
	}
	m := regexp.MustCompile(`startxref\n(\d+)\n`).FindSubmatch(b)
	if m == nil {
		t.Fatal("no startxref")
	}
	at, _ := strconv.Atoi(string(m[1]))
	if !bytes.HasPrefix(b[at:], []byte("xref\n0 ")) {
		t.Fatalf("startxref %d does not point at the table", at)
	}
	lines := strings.Split(string(b[at:]), "\n")
	n, _ := strconv.Atoi(strings.Fields(lines[1])[1])
	for i := 1; i < n; i++ {
		off, _ := strconv.Atoi(strings.Fields(lines[2+i])[0])
		if want := strconv.Itoa(i) + " 0 obj\n"; !bytes.HasPrefix(b[off:], []byte(want)) {
			t.Fatalf("object %d's offset %d points at %q", i, off, b[off:min(len(b), off+12)])
		}
	}
	pages := 0
	for _, s := range regexp.MustCompile(`(?s)stream\n(.*?)\nendstream`).FindAllSubmatch(b, -1) {
		r, err := zlib.NewReader(bytes.NewReader(s[1]))
		if err != nil {
			t.Fatal(err)
		}
		body, err := io.ReadAll(r)
		if err != nil {
			t.Fatal(err)
		}
		if bytes.Contains(body, []byte("NaN")) || bytes.Contains(body, []byte("Inf")) {
			t.Fatal("a stream holds NaN or Inf")
		}
		if bytes.HasPrefix(body, []byte("q ")) {
			pages++
		}
	}
	if got := bytes.Count(b, []byte("/Type /Page ")); got != pages || pages < 5 {
		t.Errorf("%d pages and %d page streams; want equal and several for the whole engine", got, pages)
	}
	t.Logf("%d pages, %d bytes", pages, len(b))
	if dir := os.Getenv("EVENBEAT_PDF_DIR"); dir != "" {
		os.WriteFile(dir+"/report.pdf", b, 0o644)
	}
}

// Pages are cut in the gaps between things: no page's top falls inside
// anything drawn that is shorter than a page.
func TestPagesCutBetweenThings(t *testing.T) {
	c := pdf.New(100, 1000)
	for y := 0.0; y < 1000; y += 70 {
		c.Fill(render.RectPath(render.Rect{Min: render.Point{X: 0, Y: y}, Max: render.Point{X: 100, Y: y + 60}}), render.FillStyle{Color: render.Light().Ink})
	}
	tops := c.Pages(300)
	for _, top := range tops[1:] {
		if r := int(top) % 70; r < 60 && r != 0 {
			t.Errorf("a page starts at %g, inside a block", top)
		}
	}
	if len(tops) < 4 {
		t.Errorf("tops %v", tops)
	}
}

// BenchmarkReportPDF lays out the demo's whole-engine report and writes
// it as PDF: what the app does when the setter taps Share report.
func BenchmarkReportPDF(b *testing.B) {
	f, err := os.Open("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		b.Fatal(err)
	}
	s, err := session.Decode(f)
	f.Close()
	if err != nil {
		b.Fatal(err)
	}
	rm, err := report.Build(s, report.Options{})
	if err != nil {
		b.Fatal(err)
	}
	w := float64(render.ReportWidth)
	for b.Loop() {
		c := pdf.New(w, render.ReportHeight(w, rm))
		render.Report(c, rm, render.Light())
		if err := c.Write(io.Discard, "report"); err != nil {
			b.Fatal(err)
		}
	}
}
