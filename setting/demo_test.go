package setting

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

var updateDemo = flag.Bool("update-demo", false, "rewrite testdata/engines/*.json from DemoEngines")

// demoFile names the JSON file of a demo engine: "brackenfold-stephenson.json".
func demoFile(s EngineSpec) string {
	n := strings.ToLower(s.Name)
	n = strings.NewReplacer(" (", "-", ")", "", " ", "-").Replace(n)
	return filepath.Join("..", "testdata", "engines", n+".json")
}

// The demo engines must be plausible for 5 in gauge in every way a setter
// looks first: full-gear cut-off 70-80 % and lead 0.1-0.3 mm at both ends,
// running forward in full forward gear and backward in full back gear
// (common practice, no source: the primer's typical values; the engine is
// invented).
func TestDemoEnginesArePlausible(t *testing.T) {
	for _, s := range DemoEngines() {
		if !s.Invented || !strings.Contains(s.Notes, "Invented") {
			t.Errorf("%s: not marked invented", s.Name)
		}
		if err := s.Validate(); err != nil {
			t.Fatalf("%s: %v", s.Name, err)
		}
		g, err := s.Gear.Gear()
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range []struct {
			r   Reverser
			dir Direction
		}{{1, Forward}, {-1, Backward}} {
			set, err := Events(s.Engine, s.Valve, func(th float64) (float64, error) { return g.Valve(s.Engine, th, c.r) }, c.dir)
			if err != nil {
				t.Fatalf("%s %v: %v", s.Name, c.dir, err)
			}
			for _, end := range []CylinderEnd{Front, Back} {
				ev := set.End(end)
				if cut := ev.CutOff.StrokePercent; cut < 70 || cut > 80 {
					t.Errorf("%s %v %v: full-gear cut-off %.1f %%, want 70-80 %%", s.Name, c.dir, end, cut)
				}
				if ev.Lead < 0.1 || ev.Lead > 0.3 {
					t.Errorf("%s %v %v: lead %.3f mm, want 0.1-0.3 mm", s.Name, c.dir, end, ev.Lead)
				}
			}
		}
	}
}

// The JSON files are the Go constructors written out; they must decode with
// DecodeEngineSpec (which validates them) and equal the constructors.
// Regenerate with: go test ./setting -run TestDemoFiles -update-demo
func TestDemoFilesMatchConstructors(t *testing.T) {
	for _, want := range DemoEngines() {
		path := demoFile(want)
		if *updateDemo {
			var b bytes.Buffer
			if err := want.Encode(&b); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		f, err := os.Open(path)
		if err != nil {
			t.Fatalf("%v (run with -update-demo to write it)", err)
		}
		got, err := DecodeEngineSpec(f)
		f.Close()
		if err != nil {
			t.Fatalf("%s: %v", path, err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s differs from %s():\n got %+v\nwant %+v", path, want.Name, got, want)
		}
	}
}
