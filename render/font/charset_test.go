package font

import (
	"go/scanner"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestCharset fails when a string or rune literal in the Go sources of
// setting, render or wasm (tests left out) holds a rune the tables lack: it
// would be drawn as the fallback box. Add the rune to charset and run
// EVENBEAT_WRITE_GLYPHS=1 go test -run TestTablesAreCurrent ./render/font.
// setting/jsonx is left out: its literals are JSON's syntax and the
// characters it escapes (\b, \f, U+2028), written to files, never drawn.
func TestCharset(t *testing.T) {
	root := filepath.Join("..", "..")
	if _, err := os.Stat(filepath.Join(root, "go.mod")); err != nil {
		t.Fatalf("module root not found: %v", err)
	}
	files := 0
	for _, dir := range []string{"setting", "render", "wasm"} {
		err := filepath.WalkDir(filepath.Join(root, dir), func(path string, d fs.DirEntry, err error) error {
			if err == nil && d.IsDir() && path == filepath.Join(root, "setting", "jsonx") {
				return filepath.SkipDir
			}
			if err != nil || d.IsDir() || !strings.HasSuffix(path, ".go") || strings.HasSuffix(path, "_test.go") || filepath.Base(path) == tablesFile {
				return err
			}
			files++
			for _, r := range missingRunes(t, path) {
				t.Errorf("%s: a literal holds %q (U+%04X), which is not in charset", path, r, r)
			}
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
	if files < 20 {
		t.Fatalf("scanned only %d files", files)
	}
}

// missingRunes returns the runes of the file's string and rune literals
// that Index does not know, each once.
func missingRunes(t *testing.T, path string) []rune {
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var s scanner.Scanner
	fset := token.NewFileSet()
	s.Init(fset.AddFile(path, -1, len(src)), src, func(pos token.Position, msg string) { t.Errorf("%s: %s", pos, msg) }, 0)
	seen := map[rune]bool{}
	var out []rune
	for {
		_, tok, lit := s.Scan()
		if tok == token.EOF {
			return out
		}
		if tok != token.STRING && tok != token.CHAR {
			continue
		}
		v, err := strconv.Unquote(lit)
		if err != nil {
			t.Errorf("%s: literal %s: %v", path, lit, err)
			continue
		}
		for _, r := range v {
			// Layout characters are never drawn as glyphs.
			if r == '\n' || r == '\t' || r == '\r' || seen[r] {
				continue
			}
			seen[r] = true
			if Index(r) == Fallback {
				out = append(out, r)
			}
		}
	}
}
