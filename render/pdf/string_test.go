package pdf

import (
	"testing"
)

// A PDF text string escapes its brackets and backslashes (PDF 32000-1:2008,
// 7.3.4.2, literal strings); text beyond printable ASCII is UTF-16 in hex
// with its byte-order mark (7.9.2.2).
func TestPDFString(t *testing.T) {
	for in, want := range map[string]string{
		"Brackenfold (demo)": `(Brackenfold \(demo\))`,
		`a\b`:                `(a\\b)`,
		"":                   "()",
		"90°":                "<FEFF0039003000B0>",
	} {
		if got := pdfString(in); got != want {
			t.Errorf("pdfString(%q) = %s, want %s", in, got, want)
		}
	}
}
