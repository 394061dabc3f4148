package font

import (
	"os"
	"strings"
	"testing"
)

func TestFontsParseAndDiffer(t *testing.T) {
	r, b := Regular(), Bold()
	if r == nil || b == nil || r == b {
		t.Fatal("regular and bold must both parse and differ")
	}
	if Regular() != r || Get(true) != b || Get(false) != r {
		t.Error("the parsed fonts should be parsed once and shared")
	}
	if got := r.Name(4); got != "Go Regular" {
		t.Errorf("regular full name %q", got)
	}
	if got := b.Name(4); got != "Go Bold" {
		t.Errorf("bold full name %q", got)
	}
	for _, ch := range "0123456789°%–·abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ,.;:'\"()-" {
		if r.Index(ch) == 0 || b.Index(ch) == 0 {
			t.Errorf("no glyph for %q", ch)
		}
	}
}

// The licences ship with the font: the Go fonts' licence, and the FreeType
// licence under which the rasteriser is used.
func TestLicencesPresent(t *testing.T) {
	for file, want := range map[string]string{
		"LICENSE": "Bigelow & Holmes",
		"FTL.txt": "FreeType Project",
	} {
		b, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(b), want) {
			t.Errorf("%s does not mention %q", file, want)
		}
	}
}
