package session

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"evenbeat/setting/cpubench"
)

func readExample(t testing.TB) []byte {
	t.Helper()
	b, err := os.ReadFile(examplePath)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestExampleObservationsMatchTheEngine turns the example's readings into
// observations and checks each against the invented engine with the errors
// the readings were made with: the crank angles from tyre marks and
// bracketed dead centres, the gauge direction, the laps and the crosshead
// cut-offs must all land where the gear model puts them. The allowance is
// the gauge's half division plus the valve's movement over 0.3 degrees of
// crank (marks are made to half a mm, about half a degree, and dead centre
// is the midpoint of two).
func TestExampleObservationsMatchTheEngine(t *testing.T) {
	s, err := Decode(bytes.NewReader(readExample(t)))
	if err != nil {
		t.Fatal(err)
	}
	models := []*exampleModel{newExampleModel(t, s.Engine, rightAsFound), newExampleModel(t, s.Engine, rightRound2)}
	left := newExampleModel(t, s.Engine, leftAsFound)
	lap := s.Engine.Valve.Front.SteamLap
	n := 0
	for ci := range s.Cylinders {
		obs, err := s.Observations(ci)
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range obs {
			m := left
			if ci == 0 {
				m = models[o.Round]
			}
			slope := math.Abs(m.valve(o.CrankDeg+0.5, o.Reverser)-m.valve(o.CrankDeg-0.5, o.Reverser)) / 1 // mm per degree
			switch o.Kind {
			case AtDeadCentre, InSweep:
				want := m.tr.gaugeZero + m.valve(o.CrankDeg, o.Reverser) - m.tr.valveOffset
				if tol := 0.005 + 0.3*slope; math.Abs(o.GaugeMM-want) > tol {
					t.Errorf("%s: reading %.3f, the engine gives %.3f (allowed %.3f)", o.Label, o.GaugeMM, want, tol)
				}
			case CutOffKind:
				// The valve is back at the port's steam edge.
				edge := -lap
				if o.End == Back {
					edge = lap
				}
				// Crosshead read to half a mm: allow its effect on the angle.
				if tol := 0.01 + slope*(2*o.CrankSigmaDeg+0.3); math.Abs(m.valve(o.CrankDeg, o.Reverser)-edge) > tol {
					t.Errorf("%s: valve %.3f at crank %.2f, steam edge at %.3f (allowed %.3f)", o.Label, m.valve(o.CrankDeg, o.Reverser), o.CrankDeg, edge, tol)
				}
			case PortMarkKind:
				want := m.portMarks().FrontGaugeMM
				if o.End == Back {
					want = m.portMarks().BackGaugeMM
				}
				if math.Abs(o.GaugeMM-want) > 0.011 {
					t.Errorf("%s: %.3f, the engine gives %.3f", o.Label, o.GaugeMM, want)
				}
			case FeelerKind:
				x := m.valve(o.CrankDeg, o.Reverser)
				want := -x - lap
				if o.End == Back {
					want = x - lap
				}
				if math.Abs(o.OpeningMM-want) > 0.025+0.3*slope {
					t.Errorf("%s: %.3f, the engine gives %.3f", o.Label, o.OpeningMM, want)
				}
			}
			n++
		}
	}
	if n < 30 {
		t.Errorf("only %d observations checked", n)
	}
	// The example is ready for a plan, with nothing blocking.
	for ci := range s.Cylinders {
		for _, p := range s.Readiness(ci) {
			if p.Blocking {
				t.Errorf("%s", p)
			}
		}
	}
}

// Decoding the example session: the figure for the app opening a file.
func BenchmarkDecode(b *testing.B) {
	defer cpubench.Report(b, cpubench.Now())
	data := readExample(b)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Decode(bytes.NewReader(data)); err != nil {
			b.Fatal(err)
		}
	}
}

// Encoding the example session: the figure for saving after each entry.
func BenchmarkEncode(b *testing.B) {
	defer cpubench.Report(b, cpubench.Now())
	s, err := Decode(bytes.NewReader(readExample(b)))
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		var buf bytes.Buffer
		if err := Encode(&buf, s); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkObservations(b *testing.B) {
	s, err := Decode(bytes.NewReader(readExample(b)))
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := s.Observations(0); err != nil {
			b.Fatal(err)
		}
	}
}

// Reading a session file and listing what a fitter gets from it.
func ExampleDecode() {
	f, err := os.Open("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer f.Close()
	s, err := Decode(f)
	if err != nil {
		fmt.Println(err) // "cylinders[0]...gauge_mm: The gauge reading must be ..."
		return
	}
	obs, _ := s.Observations(0)
	for _, o := range obs[2:5] {
		fmt.Printf("%s: crank %.1f deg, gauge %.2f mm\n", o.Label, o.CrankDeg, o.GaugeMM)
	}
	// Output:
	// front dead centre, full forward: crank 0.0 deg, gauge 2.41 mm
	// back dead centre, full forward: crank 180.0 deg, gauge 7.62 mm
	// front dead centre, running notch: crank 0.0 deg, gauge 2.03 mm
}

// A newer file is refused whole.
func ExampleDecode_newerVersion() {
	_, err := Decode(strings.NewReader(`{"format": "evenbeat-session", "version": 3, "cylinders": "?"}`))
	fmt.Println(err)
	// Output:
	// version: This file was written by a newer Evenbeat (session version 3); this version reads versions 1 to 2. Update the app.
}

// Dead centre from two tyre marks either side of the chalk datum, on a
// 115 mm wheel, turning forward.
func ExampleMidway() {
	circumference := TyreMM.Circumference(115)
	dc := Midway(349, 37, circumference, Forward)
	fmt.Printf("dead centre at %.2f mm round the tyre, %.2f deg\n", dc, TyreToDeg(dc, 115))
	// Output:
	// dead centre at 12.36 mm round the tyre, 12.31 deg
}

func ExampleParseLength() {
	for _, in := range []string{"0.005in", "5 thou", "1/16", "0.13 mm"} {
		mm, _ := ParseLength(in, UnitMM)
		fmt.Printf("%s = %.4f mm\n", in, mm)
	}
	// Output:
	// 0.005in = 0.1270 mm
	// 5 thou = 0.1270 mm
	// 1/16 = 1.5875 mm
	// 0.13 mm = 0.1300 mm
}

// The leads read straight from the example: port mark against dead-centre
// reading, worked by hand from the file (slide valves, external admission,
// gauge growing toward the front: front lead = front mark - reading, back
// lead = reading - back mark).
func TestExampleLeads(t *testing.T) {
	s, err := Decode(bytes.NewReader(readExample(t)))
	if err != nil {
		t.Fatal(err)
	}
	want := [][]float64{
		{
			2.48 - 2.41, 7.62 - 7.28, // round 1, full forward
			2.48 - 2.03, 8.12 - 7.28, // running notch
			2.48 - 2.65, 7.85 - 7.28, // full back
			2.60 - 2.41, 7.62 - 7.40, // round 2, after the spindle nut
			2.60 - 2.65, 7.85 - 7.40,
		},
		{
			(4.58 - 2.4) - 1.90, 7.10 - (4.58 + 2.4), // laps and centre reading
			0.3, 0.1, // feelers on dead centre
		},
	}
	for ci := range s.Cylinders {
		leads, err := s.Leads(ci)
		if err != nil {
			t.Fatal(err)
		}
		if len(leads) != len(want[ci]) {
			t.Fatalf("cylinder %d: %d leads, want %d", ci, len(leads), len(want[ci]))
		}
		for i, l := range leads {
			if math.Abs(l.LeadMM-want[ci][i]) > 1e-9 {
				t.Errorf("%s (%s): lead %.3f, want %.3f", l.Label, l.Field, l.LeadMM, want[ci][i])
			}
			if !(l.SigmaMM > 0) {
				t.Errorf("%s: no error estimate", l.Label)
			}
		}
	}
}

// A link gear read in forward gear only can be set in forward gear only:
// the example's left cylinder says so, without blocking a plan.
func TestExampleLeftCylinderLacksBackGear(t *testing.T) {
	s, err := Decode(bytes.NewReader(readExample(t)))
	if err != nil {
		t.Fatal(err)
	}
	ps := s.Readiness(1)
	if len(ps) != 1 || ps[0].Blocking || !strings.Contains(ps[0].Message, "no readings in back gear") {
		t.Errorf("left cylinder: %v", ps)
	}
	if ps := s.Readiness(0); len(ps) != 0 {
		t.Errorf("right cylinder: %v", ps)
	}
}
