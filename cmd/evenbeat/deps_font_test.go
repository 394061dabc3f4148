package main

import (
	"slices"
	"strings"
	"testing"
)

// TestAppCarriesNoFontFiles guards the size of main.wasm: the browser app
// draws text from the glyph tables in render/font, so neither a font
// parser (freetype), the TrueType files (gofont) nor x/image/font may be
// reached from ./wasm built for js/wasm. Together they cost several
// hundred kilobytes of gzipped wasm.
func TestAppCarriesNoFontFiles(t *testing.T) {
	pkgs := goListDeps(t, []string{"GOOS=js", "GOARCH=wasm"}, "{{.ImportPath}}", "./wasm")
	if len(pkgs) < 20 || !slices.Contains(pkgs, "evenbeat/render/font") {
		t.Fatalf("go list listed %d packages, without render/font: %q", len(pkgs), pkgs)
	}
	for _, pkg := range pkgs {
		if strings.HasPrefix(pkg, "github.com/golang/freetype") ||
			strings.HasPrefix(pkg, "golang.org/x/image/font/gofont") ||
			pkg == "golang.org/x/image/font" ||
			pkg == "evenbeat/render/font/fontfile" {
			t.Errorf("the wasm app depends on %s; text is drawn from render/font's tables", pkg)
		}
	}
}
