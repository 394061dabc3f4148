package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
)

// toolchain is the Go installation that builds the WebAssembly program. Its
// wasm_exec.js must come from the same release as the compiler.
type toolchain struct {
	GOROOT string
	Go     string // path of the go command inside GOROOT
}

// noToolchainError says what to install when no Go toolchain can be found.
type noToolchainError struct{}

func (noToolchainError) Error() string {
	return "no Go toolchain found to build the WebAssembly app " +
		"(looked at $GOROOT, the Go release that built this program, and `go` on PATH). " +
		"Install Go 1.26 or newer from https://go.dev/dl/ and make sure the `go` command is on PATH"
}

// toolchainFinder holds what findToolchain consults, so tests can replace it.
type toolchainFinder struct {
	Getenv   func(string) string
	Built    string // runtime.GOROOT() of this program; may be empty
	LookPath func(string) (string, error)
	GoEnv    func(goBin, name string) (string, error)
}

// defaultFinder consults the real environment.
func defaultFinder() toolchainFinder {
	return toolchainFinder{
		Getenv:   os.Getenv,
		Built:    runtime.GOROOT(), //nolint:staticcheck // the toolchain this program runs under
		LookPath: exec.LookPath,
		GoEnv: func(goBin, name string) (string, error) {
			out, err := exec.Command(goBin, "env", name).Output()
			return strings.TrimSpace(string(out)), err
		},
	}
}

// find returns the first usable toolchain: $GOROOT, then the GOROOT this
// program was built by (the toolchain `go run` runs under), then `go` on PATH.
// A GOROOT is usable when it has bin/go and lib/wasm/wasm_exec.js.
func (f toolchainFinder) find() (toolchain, error) {
	var candidates []string
	if r := f.Getenv("GOROOT"); r != "" {
		candidates = append(candidates, r)
	}
	if f.Built != "" {
		candidates = append(candidates, f.Built)
	}
	if goBin, err := f.LookPath("go"); err == nil {
		if r, err := f.GoEnv(goBin, "GOROOT"); err == nil && r != "" {
			candidates = append(candidates, r)
		}
	}
	for _, r := range candidates {
		t := toolchain{GOROOT: r, Go: filepath.Join(r, "bin", "go"+exeSuffix())}
		if fileExists(t.Go) && fileExists(t.wasmExecPath()) {
			return t, nil
		}
	}
	return toolchain{}, noToolchainError{}
}

func exeSuffix() string {
	if runtime.GOOS == "windows" {
		return ".exe"
	}
	return ""
}

func fileExists(path string) bool {
	st, err := os.Stat(path)
	return err == nil && !st.IsDir()
}

// wasmExecPath is the JavaScript support file of this Go release.
func (t toolchain) wasmExecPath() string {
	return filepath.Join(t.GOROOT, "lib", "wasm", "wasm_exec.js")
}

// wasmEnv is the environment of every go command run for the wasm build.
func wasmEnv() []string {
	return append(os.Environ(), "GOOS=js", "GOARCH=wasm", "CGO_ENABLED=0")
}

// wasmBuildFlags returns the flags of the wasm build; they are part of the
// cache key. Inlining is off in this module's own packages (-l): the
// download is about 100 KB (gzip) smaller. Package setting, the linkages
// every fit, plan and what-if solves thousands of times, keeps it (the
// later pattern wins): its small helpers (points, turns, roots) as real
// calls made the plan 2.3x slower as wasm, for 11 KB gzip (see
// DEVELOPERS.md, figures). The patterns name only this module, so a bare
// app built with the same flags is built exactly as it would be without
// them.
func wasmBuildFlags() []string {
	return []string{"-trimpath", "-ldflags=-s -w", "-gcflags=evenbeat/...=-l", "-gcflags=evenbeat/setting="}
}

// wasmPackage is the main package of the browser app, relative to the
// module root.
const wasmPackage = "./wasm"

// version returns the toolchain's Go version, e.g. "go1.26.8".
func (t toolchain) version(src string) (string, error) {
	cmd := exec.Command(t.Go, "env", "GOVERSION")
	cmd.Dir = src
	out, err := cmd.Output()
	if err != nil {
		return "", fmt.Errorf("running %s env GOVERSION: %w", t.Go, err)
	}
	return strings.TrimSpace(string(out)), nil
}

// inputFiles lists, relative to the module root src, every file the wasm
// build reads from this module: go.mod, go.sum, and the Go and embedded
// files of every package of this module that the app depends on (other
// modules are pinned by go.sum).
func (t toolchain) inputFiles(src string) ([]string, error) {
	const format = `{{if .Module}}{{if .Module.Main}}{{$d := .Dir}}` +
		`{{range .GoFiles}}{{$d}}/{{.}}{{"\n"}}{{end}}` +
		`{{range .EmbedFiles}}{{$d}}/{{.}}{{"\n"}}{{end}}{{end}}{{end}}`
	cmd := exec.Command(t.Go, "list", "-deps", "-f", format, wasmPackage)
	cmd.Dir = src
	cmd.Env = wasmEnv()
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		return nil, fmt.Errorf("listing the app's source files: %v\n%s", err, stderr.String())
	}
	files := []string{"go.mod", "go.sum"}
	for _, line := range strings.Split(string(out), "\n") {
		if line == "" {
			continue
		}
		rel, err := filepath.Rel(src, line)
		if err != nil {
			return nil, err
		}
		files = append(files, filepath.ToSlash(rel))
	}
	return files, nil
}

// inputsHash hashes the toolchain version, the build flags and the named
// files (relative paths and contents). The order of files does not matter.
func inputsHash(goVersion string, flags []string, files []string, read func(string) ([]byte, error)) (string, error) {
	sorted := append([]string(nil), files...)
	sort.Strings(sorted)
	h := sha256.New()
	fmt.Fprintf(h, "go %q\nflags %q\n", goVersion, flags)
	for _, name := range sorted {
		data, err := read(name)
		if err != nil {
			return "", fmt.Errorf("reading build input: %w", err)
		}
		fmt.Fprintf(h, "file %q %d\n", name, len(data))
		h.Write(data)
	}
	return hex.EncodeToString(h.Sum(nil))[:32], nil
}

// cachedWasm returns the path of a previously built main.wasm in dir, and
// whether it is there and complete (a build writes to a temporary name and
// renames it into place only after it succeeds).
func cachedWasm(dir string) (string, bool) {
	p := filepath.Join(dir, "main.wasm")
	st, err := os.Stat(p)
	return p, err == nil && st.Mode().IsRegular() && st.Size() > 0
}

// buildWasm returns the app's main.wasm for the sources in src, building it
// only when no build for the same inputs is cached under cacheRoot.
func (t toolchain) buildWasm(src, cacheRoot string, log io.Writer) ([]byte, error) {
	ver, err := t.version(src)
	if err != nil {
		return nil, err
	}
	files, err := t.inputFiles(src)
	if err != nil {
		return nil, err
	}
	hash, err := inputsHash(ver, wasmBuildFlags(), files, func(name string) ([]byte, error) {
		return os.ReadFile(filepath.Join(src, filepath.FromSlash(name)))
	})
	if err != nil {
		return nil, err
	}
	dir := filepath.Join(cacheRoot, hash)
	if p, ok := cachedWasm(dir); ok {
		fmt.Fprintf(log, "using cached app build %s\n", dir)
		return os.ReadFile(p)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("creating the build cache: %w", err)
	}
	fmt.Fprintf(log, "building the app with %s (GOOS=js GOARCH=wasm); the first build takes a few minutes...\n", ver)
	tmp, err := os.CreateTemp(dir, "main-*.wasm.tmp")
	if err != nil {
		return nil, fmt.Errorf("creating the build cache: %w", err)
	}
	tmp.Close()
	defer os.Remove(tmp.Name())
	args := append([]string{"build"}, wasmBuildFlags()...)
	args = append(args, "-o", tmp.Name(), wasmPackage)
	cmd := exec.Command(t.Go, args...)
	cmd.Dir = src
	cmd.Env = wasmEnv()
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	cmd.Stdout = &stderr
	if err := cmd.Run(); err != nil {
		return nil, fmt.Errorf("building the WebAssembly app failed: %v\n%s", err, stderr.String())
	}
	p, _ := cachedWasm(dir)
	if err := os.Rename(tmp.Name(), p); err != nil {
		return nil, fmt.Errorf("storing the app build: %w", err)
	}
	pruneCache(cacheRoot, keepBuilds, log)
	return os.ReadFile(p)
}

// keepBuilds is how many app builds the cache keeps (about 11 MB each).
const keepBuilds = 4

// pruneCache removes all but the keep most recently built entries of the
// build cache. Failures only cost disk space, so they are reported and
// otherwise ignored.
func pruneCache(root string, keep int, log io.Writer) {
	for _, dir := range staleBuilds(root, keep) {
		if err := os.RemoveAll(dir); err != nil {
			fmt.Fprintf(log, "could not remove an old app build: %v\n", err)
		}
	}
}

// staleBuilds lists the build directories under root beyond the keep
// newest (by modification time; ties broken by name so the choice is
// stable).
func staleBuilds(root string, keep int) []string {
	entries, err := os.ReadDir(root)
	if err != nil {
		return nil
	}
	type build struct {
		path string
		mod  int64
	}
	var builds []build
	for _, e := range entries {
		if !e.IsDir() {
			continue
		}
		info, err := e.Info()
		if err != nil {
			continue
		}
		builds = append(builds, build{filepath.Join(root, e.Name()), info.ModTime().UnixNano()})
	}
	sort.Slice(builds, func(i, j int) bool {
		if builds[i].mod != builds[j].mod {
			return builds[i].mod > builds[j].mod
		}
		return builds[i].path < builds[j].path
	})
	var stale []string
	for i, b := range builds {
		if i >= keep {
			stale = append(stale, b.path)
		}
	}
	return stale
}

// moduleRoot walks up from dir to the directory holding go.mod of module
// evenbeat.
func moduleRoot(dir string) (string, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return "", err
	}
	for d := abs; ; {
		if data, err := os.ReadFile(filepath.Join(d, "go.mod")); err == nil && isEvenbeatModule(data) {
			return d, nil
		}
		parent := filepath.Dir(d)
		if parent == d {
			return "", fmt.Errorf("the Evenbeat sources (go.mod of module evenbeat) are not in %s or above it; run from the source tree or pass -src", abs)
		}
		d = parent
	}
}

// isEvenbeatModule reports whether a go.mod declares module evenbeat.
func isEvenbeatModule(gomod []byte) bool {
	for _, line := range strings.Split(string(gomod), "\n") {
		if f := strings.Fields(line); len(f) == 2 && f[0] == "module" && strings.Trim(f[1], `"`) == "evenbeat" {
			return true
		}
	}
	return false
}
