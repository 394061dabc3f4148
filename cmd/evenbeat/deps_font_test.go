package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
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
	root, err := moduleRoot(".")
	if err != nil {
		t.Fatal(err)
	}
	goBin := filepath.Join(runtime.GOROOT(), "bin", "go") //nolint:staticcheck // the toolchain running this test
	cmd := exec.Command(goBin, "list", "-deps", "./wasm")
	cmd.Dir = root
	cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	pkgs := strings.Fields(string(out))
	if len(pkgs) < 20 || !slices.Contains(pkgs, "evenbeat/render/font") {
		t.Fatalf("go list listed %d packages, without render/font: %s", len(pkgs), out)
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
