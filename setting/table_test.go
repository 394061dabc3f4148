package setting

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// testSingle returns the invented single-eccentric engine of specJSON.
func testSingle(t testing.TB) EngineSpec {
	t.Helper()
	spec, err := DecodeEngineSpec(strings.NewReader(specJSON))
	if err != nil {
		t.Fatal(err)
	}
	return spec
}

func TestTableMatchesEvents(t *testing.T) {
	spec := testSingle(t)
	g, _ := spec.Gear.Gear()
	tab, err := Table(spec.Engine, spec.Valve, g, ReverserPositions(3), nil)
	if err != nil {
		t.Fatal(err)
	}
	// full forward runs forward, full back backward, mid gear both ways
	want := []struct {
		name string
		dir  Direction
	}{{"full forward", Forward}, {"mid gear", Forward}, {"mid gear", Backward}, {"full back", Backward}}
	if len(tab.Rows) != len(want) {
		t.Fatalf("%d rows, want %d:\n%s", len(tab.Rows), len(want), tab)
	}
	for i, w := range want {
		row := tab.Rows[i]
		if row.Notch.Name != w.name || row.Events.Direction != w.dir {
			t.Errorf("row %d is %s %s, want %s %s", i, row.Notch.Name, row.Events.Direction, w.name, w.dir)
		}
		r := row.Notch.Reverser
		set, err := Events(spec.Engine, spec.Valve, func(th float64) (float64, error) { return g.Valve(spec.Engine, th, r) }, w.dir)
		if err != nil {
			t.Fatal(err)
		}
		if set != row.Events {
			t.Errorf("row %d differs from Events:\n%+v\n%+v", i, row.Events, set)
		}
	}
	out := tab.String()
	for _, s := range []string{"full forward", "forward", "backward", "front", "back", "cut-off %"} {
		if !strings.Contains(out, s) {
			t.Errorf("formatted table lacks %q:\n%s", s, out)
		}
	}
	t.Logf("\n%s", out)
}

// A single fixed eccentric drives the engine one way only: run backward
// in full forward gear its events are those of the forward curve read
// against the other direction, so its cut-off is short of the forward one.
func TestTableAnyDirection(t *testing.T) {
	spec := testSingle(t)
	g, _ := spec.Gear.Gear()
	tab, err := Table(spec.Engine, spec.Valve, g, []Notch{{"full forward", 1}}, []Direction{Forward, Backward})
	if err != nil {
		t.Fatal(err)
	}
	if len(tab.Rows) != 2 {
		t.Fatalf("%d rows, want 2", len(tab.Rows))
	}
	f, b := tab.Rows[0].Events.Front, tab.Rows[1].Events.Front
	if f.Lead != b.Lead {
		t.Errorf("lead depends on running direction: %g and %g", f.Lead, b.Lead)
	}
	// the same open period, entered from the other side
	if math.Abs(f.Admission.CrankDeg-b.CutOff.CrankDeg) > 1e-9 || math.Abs(f.CutOff.CrankDeg-b.Admission.CrankDeg) > 1e-9 {
		t.Errorf("backward running should swap admission and cut-off: %+v / %+v", f, b)
	}
}

func TestTableErrors(t *testing.T) {
	spec := testSingle(t)
	g, _ := spec.Gear.Gear()
	bad := spec.Engine
	bad.RodLength = 20
	_, err := Table(bad, spec.Valve, g, ReverserPositions(3), nil)
	var e *Error
	if !errors.As(err, &e) || e.Field != "engine.rod_length" {
		t.Errorf("short rod: got %v", err)
	}
	_, err = Table(spec.Engine, spec.Valve, g, []Notch{{"too far", 2}}, nil)
	if !errors.As(err, &e) || e.Field != "reverser" {
		t.Errorf("reverser out of range: got %v", err)
	}
	_, err = Table(spec.Engine, spec.Valve, g, ReverserPositions(3), []Direction{0})
	if !errors.As(err, &e) || e.Field != "direction" {
		t.Errorf("bad direction: got %v", err)
	}
}

func TestReverserPositions(t *testing.T) {
	got := ReverserPositions(9)
	if len(got) != 9 || got[0].Reverser != 1 || got[4].Reverser != 0 || got[8].Reverser != -1 || got[2].Name != "forward 50 %" {
		t.Errorf("ReverserPositions(9) = %+v", got)
	}
}

// failingGear works a plain sinusoid but cannot close in back gear.
type failingGear struct{}

func (failingGear) Kind() string            { return "test gear" }
func (failingGear) Validate(e Engine) error { return nil }
func (failingGear) Valve(e Engine, th float64, r Reverser) (float64, error) {
	if r < 0 && th > 100 {
		return 0, &Error{"test_rod", "The test rod cannot reach at crank angle 101 deg."}
	}
	return -6 * sinDeg(th+30), nil
}

func TestTableNamesTheNotchOfAGearError(t *testing.T) {
	spec := testSingle(t)
	_, err := Table(spec.Engine, spec.Valve, failingGear{}, []Notch{{"full forward", 1}, {"reverse running", -0.6}}, nil)
	var e *Error
	if !errors.As(err, &e) || e.Field != "test_rod" || !strings.Contains(e.Message, "reverse running") || !strings.Contains(e.Message, "cannot reach") {
		t.Errorf("got %v, want the gear's error with the notch named", err)
	}
}

func TestEncodeRefusesAnInvalidSpec(t *testing.T) {
	spec := testSingle(t)
	spec.Valve.Front.PortWidth = 0
	var b strings.Builder
	err := spec.Encode(&b)
	var e *Error
	if !errors.As(err, &e) || e.Field != "valve.front.port_width" || b.Len() != 0 {
		t.Errorf("got %v and %d bytes written, want a valve.front.port_width error and nothing written", err, b.Len())
	}
}
