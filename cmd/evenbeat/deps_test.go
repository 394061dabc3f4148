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

// TestDomainAndDrawingStayPortable guards the import direction setting <-
// render <- wasm: the domain and the diagrams must build and test natively,
// with no display, so neither may depend on ebiten or syscall/js. Natively
// no dependency may be either; for js/wasm the standard library itself uses
// syscall/js, so there no package of this module may import it directly,
// and ebiten must still be absent.
func TestDomainAndDrawingStayPortable(t *testing.T) {
	for _, target := range [][]string{nil, {"GOOS=js", "GOARCH=wasm"}} {
		lines := goListDeps(t, target, importsFormat, "./setting/...", "./render/...")
		n := 0
		for _, line := range lines {
			f := strings.Fields(line)
			pkg, imports := f[0], f[1:]
			n++
			if strings.HasPrefix(pkg, "github.com/hajimehoshi/ebiten") || (target == nil && pkg == "syscall/js") {
				t.Errorf("setting or render depends on %s (target %v); keep ebiten and syscall/js in wasm/", pkg, target)
			}
			if pkg == "evenbeat" || strings.HasPrefix(pkg, "evenbeat/") {
				for _, imp := range imports {
					if imp == "syscall/js" {
						t.Errorf("%s imports syscall/js (target %v); keep browser code in wasm/", pkg, target)
					}
				}
			}
		}
		if n < 3 {
			t.Fatalf("go list listed only %d packages: %q", n, lines)
		}
	}
}

// TestBrowserBuildLeavesOutEncodingJSON: encoding/json and the reflection
// it brings cost the app about 100 KB gzipped, so the js/wasm build of the
// app must not depend on it; setting/jsonx reads and writes the app's
// JSON instead. Command-line-only code may use encoding/json.
func TestBrowserBuildLeavesOutEncodingJSON(t *testing.T) {
	lines := goListDeps(t, []string{"GOOS=js", "GOARCH=wasm"}, importsFormat, "./wasm")
	var importers []string
	n := 0
	for _, line := range lines {
		f := strings.Fields(line)
		n++
		if slices.Contains(f[1:], "encoding/json") {
			importers = append(importers, f[0])
		}
	}
	if n < 10 {
		t.Fatalf("go list listed only %d packages: %q", n, lines)
	}
	if len(importers) > 0 {
		t.Errorf("the browser build depends on encoding/json through %s; read and write JSON there with evenbeat/setting/jsonx, or keep command-line-only JSON code out of the js build (a //go:build !js file)", strings.Join(importers, ", "))
	}
}

// goListDeps runs `go list -deps -f FORMAT PATTERNS...` in the module root
// with the toolchain running the test and env added, and returns one line
// per package.
func goListDeps(t *testing.T, env []string, format string, patterns ...string) []string {
	t.Helper()
	root, err := moduleRoot(".")
	if err != nil {
		t.Fatal(err)
	}
	goBin := filepath.Join(runtime.GOROOT(), "bin", "go") //nolint:staticcheck // the toolchain running this test
	cmd := exec.Command(goBin, append([]string{"list", "-deps", "-f", format}, patterns...)...)
	cmd.Dir = root
	cmd.Env = append(os.Environ(), env...)
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go list %v (%v): %v\n%s", patterns, env, err, out)
	}
	return strings.Split(strings.TrimSpace(string(out)), "\n")
}

// importsFormat lists a package and its imports on one line.
const importsFormat = "{{.ImportPath}} {{join .Imports \" \"}}"
