package session

import (
	"go/parser"
	"go/token"
	"os"
	"strconv"
	"strings"
	"testing"
)

// The package imports only the standard library, evenbeat/setting and
// evenbeat/setting/jsonx (itself standard library only), so it builds for
// the browser and the command line alike.
func TestImportsOnlyStandardLibraryAndSetting(t *testing.T) {
	ents, err := os.ReadDir(".")
	if err != nil {
		t.Fatal(err)
	}
	fset := token.NewFileSet()
	for _, e := range ents {
		if !strings.HasSuffix(e.Name(), ".go") || strings.HasSuffix(e.Name(), "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, e.Name(), nil, parser.ImportsOnly)
		if err != nil {
			t.Fatal(err)
		}
		for _, im := range f.Imports {
			path, _ := strconv.Unquote(im.Path.Value)
			first, _, _ := strings.Cut(path, "/")
			ours := path == "evenbeat/setting" || path == "evenbeat/setting/jsonx"
			if !ours && strings.Contains(first, ".") || strings.HasPrefix(path, "evenbeat/") && !ours || path == "syscall/js" {
				t.Errorf("%s imports %s", e.Name(), path)
			}
		}
	}
}
