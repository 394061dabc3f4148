//go:build !js

package plan

import (
	"bytes"
	"errors"
	"os"
	"strconv"
	"strings"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// FuzzCheckAndPlan puts arbitrary numbers into the demo session where a
// slip or a contradiction does its harm (port marks, laps, the engine's
// steam laps, bracketing marks, a dead-centre reading, the wheel and the
// crank) and runs what the app and the command line run: decode, Check,
// Readiness, and a plan when nothing blocks it. Nothing may panic; every
// refusal is a *setting.Error sentence; no warning, problem, plan text or
// plan JSON shows NaN or Inf; a plan made holds finite leads and steps
// within the adjustments' limits. Run:
// go test -fuzz=FuzzCheckAndPlan -fuzzminimizetime=5s ./setting/plan
func FuzzCheckAndPlan(f *testing.F) {
	demo, err := os.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		f.Fatal(err)
	}
	// The demo's own numbers; then the contradictions of issue 13.
	f.Add(2.6, 7.4, 2.4, 2.4, 2.4, 349.0, 37.0, 2.41, 115.0, 22.0, uint8(0))
	f.Add(7.4, 2.6, 2.4, 2.4, 2.4, 349.0, 37.0, 2.41, 115.0, 22.0, uint8(1))    // port marks swapped
	f.Add(5.0, 5.0, 10.0, 10.0, 2.4, 20.0, 20.0, 2.41, 115.0, 22.0, uint8(2))   // equal marks, laps 10, same marks
	f.Add(2.6, 7.4, -3.0, 999.0, 10.0, 349.0, 37.0, 2.41, 4.5, 0.875, uint8(3)) // inches, laps beyond
	f.Add(0.1, 11.0, 2.4, 2.4, 2.4, 300.0, 37.0, 7.62, 115.0, 22.0, uint8(4))   // marks beyond the travel
	f.Fuzz(func(t *testing.T, pmF, pmB, lapF, lapB, steamLap, m1, m2, g, wheel, crank float64, mode uint8) {
		num := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
		in := string(demo)
		for _, r := range [][2]string{
			{"\"front_gauge_mm\": 2.6,\n            \"back_gauge_mm\": 7.4", "\"front_gauge_mm\": " + num(pmF) + ",\n            \"back_gauge_mm\": " + num(pmB)},
			{"\"front_lap_mm\": 2.4,\n            \"back_lap_mm\": 2.4,", "\"front_lap_mm\": " + num(lapF) + ",\n            \"back_lap_mm\": " + num(lapB) + ","},
			{"\"marks_tyre_mm\": [\n            349,\n            37\n          ]", "\"marks_tyre_mm\": [" + num(m1) + ", " + num(m2) + "]"},
			{`"gauge_mm": 2.41`, `"gauge_mm": ` + num(g)},
			{`"wheel_diameter_mm": 115,`, `"wheel_diameter_mm": ` + num(wheel) + ","},
			{`"crank_radius": 22,`, `"crank_radius": ` + num(crank) + ","},
		} {
			if !strings.Contains(in, r[0]) {
				t.Fatalf("the demo session has no %q", r[0])
			}
			in = strings.Replace(in, r[0], r[1], 1)
		}
		if mode&4 != 0 {
			in = strings.ReplaceAll(in, `"steam_lap": 2.4,`, `"steam_lap": `+num(steamLap)+",")
		}
		s, err := session.Decode(strings.NewReader(in))
		if err != nil {
			sentenceError(t, err)
			return
		}
		for _, w := range s.Check() {
			finiteWords(t, w.String())
		}
		cyl := int(mode) % 2
		blocked := false
		for _, p := range s.Readiness(cyl) {
			finiteWords(t, p.String())
			blocked = blocked || p.Blocking
		}
		if blocked {
			return
		}
		p, err := Make(s, Options{Cylinder: cyl, Priority: []Priority{EqualLeads, EqualCutOffs, Balanced}[int(mode/8)%3]})
		if err != nil {
			sentenceError(t, err)
			return
		}
		for _, st := range p.Now {
			if !finite(st.Front.LeadMM) || !finite(st.Back.LeadMM) {
				t.Fatalf("a lead now is not a number: %+v", st)
			}
		}
		for _, st := range p.Steps {
			for _, a := range s.Adjustments {
				if a.Kind == st.Kind && a.Eccentric == st.Eccentric && (st.Amount < a.Min-1e-9 || st.Amount > a.Max+1e-9) {
					t.Fatalf("step %s %g beyond its limits %g to %g", st.Kind, st.Amount, a.Min, a.Max)
				}
			}
		}
		var txt, js bytes.Buffer
		if err := WriteText(&txt, p, session.UnitMM); err != nil {
			t.Fatal(err)
		}
		finiteWords(t, txt.String())
		if err := WriteJSON(&js, p, session.UnitInch); err != nil {
			t.Fatal(err)
		}
		scanFinite(t, js.Bytes())
	})
}

// sentenceError fails unless err is a *setting.Error whose message is a
// sentence free of NaN and Inf.
func sentenceError(t *testing.T, err error) {
	t.Helper()
	var e *setting.Error
	if !errors.As(err, &e) || e.Message == "" {
		t.Fatalf("error %T %v is not a *setting.Error with a message", err, err)
	}
	if c := e.Message[0]; c < 'A' || c > 'Z' {
		t.Fatalf("%q does not start a sentence", e.Message)
	}
	finiteWords(t, e.Message)
}

// finiteWords fails when text shows a NaN or an infinity.
func finiteWords(t *testing.T, text string) {
	t.Helper()
	if strings.Contains(text, "NaN") || strings.Contains(text, "Inf") {
		t.Fatalf("shows a non-number: %s", text)
	}
}
