package main

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

func TestInputsHash(t *testing.T) {
	files := map[string]string{"go.mod": "module evenbeat\n", "a/a.go": "package a\n", "b/b.go": "package b\n"}
	read := func(name string) ([]byte, error) {
		s, ok := files[name]
		if !ok {
			return nil, errors.New("no such file " + name)
		}
		return []byte(s), nil
	}
	hash := func(ver string, flags, names []string) string {
		t.Helper()
		h, err := inputsHash(ver, flags, names, read)
		if err != nil {
			t.Fatal(err)
		}
		return h
	}
	names := []string{"go.mod", "a/a.go", "b/b.go"}
	flags := wasmBuildFlags()
	base := hash("go1.26.8", flags, names)

	if got := hash("go1.26.8", flags, []string{"b/b.go", "go.mod", "a/a.go"}); got != base {
		t.Errorf("order of files changed the hash: %s != %s", got, base)
	}
	if got := hash("go1.26.9", flags, names); got == base {
		t.Error("a different Go release gave the same hash; its wasm_exec.js and wasm differ")
	}
	if got := hash("go1.26.8", []string{"-trimpath"}, names); got == base {
		t.Error("different build flags gave the same hash")
	}
	if got := hash("go1.26.8", flags, names[:2]); got == base {
		t.Error("dropping a file gave the same hash")
	}
	files["a/a.go"] = "package a // edited\n"
	if got := hash("go1.26.8", flags, names); got == base {
		t.Error("editing a source file gave the same hash: a stale build would be served")
	}
	// Moving content between files must change the hash too.
	files["a/a.go"], files["b/b.go"] = "package a\npackage b\n", ""
	if got := hash("go1.26.8", flags, names); got == base {
		t.Error("moving text between files gave the same hash")
	}
	if _, err := inputsHash("go1.26.8", flags, []string{"missing.go"}, read); err == nil {
		t.Error("a missing input file gave no error")
	}
}

func TestCachedWasm(t *testing.T) {
	dir := t.TempDir()
	if _, ok := cachedWasm(dir); ok {
		t.Error("an empty cache directory counted as a build")
	}
	// A build interrupted before its rename leaves only a temporary file.
	if err := os.WriteFile(filepath.Join(dir, "main-123.wasm.tmp"), []byte("partial"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, ok := cachedWasm(dir); ok {
		t.Error("a half-written build counted as cached")
	}
	if err := os.WriteFile(filepath.Join(dir, "main.wasm"), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, ok := cachedWasm(dir); ok {
		t.Error("an empty main.wasm counted as cached")
	}
	if err := os.WriteFile(filepath.Join(dir, "main.wasm"), []byte("\x00asm"), 0o644); err != nil {
		t.Fatal(err)
	}
	if p, ok := cachedWasm(dir); !ok || p != filepath.Join(dir, "main.wasm") {
		t.Errorf("cachedWasm = %q, %v; want the complete build", p, ok)
	}
}

func TestStaleBuilds(t *testing.T) {
	root := t.TempDir()
	base := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	for i, name := range []string{"a", "b", "c", "d", "e", "f"} {
		dir := filepath.Join(root, name)
		if err := os.Mkdir(dir, 0o755); err != nil {
			t.Fatal(err)
		}
		// a is the newest, f the oldest.
		when := base.Add(-time.Duration(i) * time.Hour)
		if err := os.Chtimes(dir, when, when); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(root, "stray-file"), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	got := staleBuilds(root, 4)
	want := []string{filepath.Join(root, "e"), filepath.Join(root, "f")}
	if strings.Join(got, ",") != strings.Join(want, ",") {
		t.Errorf("staleBuilds = %v; want the two oldest %v", got, want)
	}
	pruneCache(root, 4, io.Discard)
	for _, name := range []string{"a", "b", "c", "d", "stray-file"} {
		if _, err := os.Stat(filepath.Join(root, name)); err != nil {
			t.Errorf("%s was removed: %v", name, err)
		}
	}
	if staleBuilds(filepath.Join(root, "missing"), 1) != nil {
		t.Error("a missing cache root lists builds")
	}
}

func TestFindToolchain(t *testing.T) {
	good := t.TempDir()
	for _, p := range []string{"bin/go", "lib/wasm/wasm_exec.js"} {
		full := filepath.Join(good, filepath.FromSlash(p))
		if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(full, []byte("x"), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	empty := t.TempDir()
	noPath := func(string) (string, error) { return "", errors.New("not found") }
	env := func(m map[string]string) func(string) string { return func(k string) string { return m[k] } }
	goEnv := func(root string) func(string, string) (string, error) {
		return func(string, string) (string, error) { return root, nil }
	}
	tests := []struct {
		name string
		f    toolchainFinder
		want string // GOROOT, or "" for the not-found error
	}{
		{"GOROOT set", toolchainFinder{Getenv: env(map[string]string{"GOROOT": good}), LookPath: noPath}, good},
		{"built-in GOROOT", toolchainFinder{Getenv: env(nil), Built: good, LookPath: noPath}, good},
		{"bad GOROOT falls back", toolchainFinder{Getenv: env(map[string]string{"GOROOT": empty}), Built: good, LookPath: noPath}, good},
		{"go on PATH", toolchainFinder{Getenv: env(nil), LookPath: func(string) (string, error) { return "/x/go", nil }, GoEnv: goEnv(good)}, good},
		{"nothing", toolchainFinder{Getenv: env(nil), Built: empty, LookPath: noPath}, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := tc.f.find()
			if tc.want == "" {
				if err == nil {
					t.Fatalf("found %+v; want an error", got)
				}
				for _, w := range []string{"Install Go", "https://go.dev/dl/", "PATH"} {
					if !strings.Contains(err.Error(), w) {
						t.Errorf("error %q does not say %q", err, w)
					}
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if got.GOROOT != tc.want || got.Go != filepath.Join(tc.want, "bin", "go"+exeSuffix()) {
				t.Errorf("found %+v; want GOROOT %s", got, tc.want)
			}
		})
	}
}

func TestModuleRoot(t *testing.T) {
	root, err := moduleRoot(".")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(root, "wasm")); err != nil {
		t.Errorf("module root %s has no wasm/: %v", root, err)
	}
	if _, err := moduleRoot(t.TempDir()); err == nil || !strings.Contains(err.Error(), "-src") {
		t.Errorf("outside the tree: err = %v; want one naming -src", err)
	}
	for gomod, want := range map[string]bool{
		"module evenbeat\n\ngo 1.26\n":  true,
		"// x\nmodule \"evenbeat\"\n":   true,
		"module evenbeatx\n":            false,
		"module example.com/evenbeat\n": false,
	} {
		if got := isEvenbeatModule([]byte(gomod)); got != want {
			t.Errorf("isEvenbeatModule(%q) = %v; want %v", gomod, got, want)
		}
	}
}
