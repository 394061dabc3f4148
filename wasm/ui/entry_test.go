package ui

import (
	"strings"
	"testing"

	"evenbeat/setting/session"
)

// demoInchApp returns the demo session (shown in inches, as the file
// says) imported, on its first round's list of readings.
func demoInchApp(t *testing.T) *App {
	t.Helper()
	a := newTestApp(t, newMemStore())
	if err := a.Import(demoFile(t)); err != nil {
		t.Fatal(err)
	}
	if a.unit() != session.UnitInch {
		t.Fatal("the demo session is no longer shown in inches")
	}
	a.showRound(0)
	return a
}

// TestHeldInTheDisplayUnit: in an inch session, a port mark of 999 in is
// held at its field with a sentence in inches (the file's bound given in
// inches, no mm, no key path), and the session is left as it was; a
// value the keypad's reader refuses (a stroke of 300 m, a crank of more
// than 100 m) is held too.
func TestHeldInTheDisplayUnit(t *testing.T) {
	a := demoInchApp(t)
	old := *a.Session().Cylinders[0].Rounds[0].PortMarks
	tap(t, a, "Front port mark:")
	typeKeys(t, a, "999")
	tap(t, a, "Next")
	note := a.Note()
	if a.Field() != "Front port mark" || *a.Session().Cylinders[0].Rounds[0].PortMarks != old {
		t.Fatalf("999 in taken: field %q, marks %+v", a.Field(), *a.Session().Cylinders[0].Rounds[0].PortMarks)
	}
	if !strings.HasPrefix(note, "Front port mark: 999 in cannot be taken") || !strings.Contains(note, "39.3701 in") || strings.Contains(note, "mm") {
		t.Errorf("the sentence is not in the setter's unit: %q", note)
	}
	noKeyPath(t, note)

	b := newTestApp(t, newMemStore())
	tap(t, b, "Brackenfold (Stephenson) (invented demo)")
	tap(t, b, "mm")
	tap(t, b, "Next")
	for b.Field() != "Stroke" {
		tap(t, b, "Next")
	}
	typeKeys(t, b, "300000")
	tap(t, b, "Next")
	if b.Field() != "Stroke" || b.Session().Engine.Engine.CrankRadius != 22 || !strings.HasPrefix(b.Note(), "Stroke: ") {
		t.Fatalf("a crank of 200 m: field %q, crank %v, note %q", b.Field(), b.Session().Engine.Engine.CrankRadius, b.Note())
	}
}

// TestUnusualTakenOnASecondNext: a value outside the field's usual range
// asks once (nothing taken); a changed value asks again; the same value
// on a second Next is taken.
// A value that cannot be is held whatever the Nexts.
func TestUnusualTakenOnASecondNext(t *testing.T) {
	a := demoInchApp(t)
	a.Session().DisplayUnit = session.UnitMM
	a.showRound(1) // the latest: Readiness judges its readings
	const label = "Front dead centre, full forward"
	reading := func() float64 { return a.Session().Cylinders[0].Rounds[1].DeadCentreReadings[0].GaugeMM }
	was := reading()
	tap(t, a, label+":")
	typeKeys(t, a, "60")
	tap(t, a, "Next")
	if a.Field() != label || !strings.Contains(a.Note(), "between -50 and 50 mm is usual") || !strings.Contains(a.Note(), "Next again") || reading() != was {
		t.Fatalf("first Next on 60 mm: field %q, reading %v, note %q", a.Field(), reading(), a.Note())
	}
	tap(t, a, KeyDelete.Label())
	typeKeys(t, a, "1")
	tap(t, a, "Next")
	if a.Field() != label || reading() != was {
		t.Fatalf("a changed unusual value (61 mm) was taken without asking: %q", a.Note())
	}
	tap(t, a, "Next")
	if a.Screen() != Readings || reading() != 61 {
		t.Fatalf("a second Next on 61 mm: screen %s, reading %v, note %q", a.Screen(), reading(), a.Note())
	}
	tap(t, a, "Front port mark:")
	typeKeys(t, a, "60")
	tap(t, a, "Next")
	tap(t, a, "Next")
	if a.Screen() != Measure || !strings.Contains(a.Note(), "steam edges") || a.Session().Cylinders[0].Rounds[1].PortMarks.FrontGaugeMM == 60 {
		t.Fatalf("a front port mark of 60 mm against 7.4: screen %s, note %q", a.Screen(), a.Note())
	}
}

// TestContradictionPutRightOneValueAtATime: a file whose port marks are
// the wrong way round can be put right by typing one mark and then the
// other, although the record contradicts itself in between.
func TestContradictionPutRightOneValueAtATime(t *testing.T) {
	swapped := strings.Replace(string(demoFile(t)), "\"front_gauge_mm\": 2.6,\n            \"back_gauge_mm\": 7.4", "\"front_gauge_mm\": 7.4,\n            \"back_gauge_mm\": 2.6", 1)
	a := newTestApp(t, newMemStore())
	if err := a.Import([]byte(swapped)); err != nil {
		t.Fatal(err)
	}
	a.Session().DisplayUnit = session.UnitMM
	a.showRound(1)
	for _, e := range [][2]string{{"Front port mark", "2.6"}, {"Back port mark", "7.4"}} {
		tap(t, a, e[0]+":")
		typeKeys(t, a, e[1])
		tap(t, a, "Next")
		if a.Screen() != Readings {
			t.Fatalf("%s %s held: %q", e[0], e[1], a.Note())
		}
	}
	tap(t, a, "Plan from round 2")
	if a.plan == nil {
		t.Fatalf("no plan after the marks were put right: %q", a.planNote)
	}
}

// TestWordsOfTheDomain: key paths quoted by the domain are named as the
// app names the value, and lengths in mm are given in the display unit,
// ranges with one unit.
func TestWordsOfTheDomain(t *testing.T) {
	a := demoInchApp(t)
	for _, c := range [][2]string{
		{"Check which mark is which, and measuring.gauge_increases_toward.", "Check which mark is which, and which way the gauge reading grows."},
		{"The lead is 0.254 mm, outside the usual 0.1 to 0.4 mm.", "The lead is 0.01 in, outside the usual 0.0039 to 0.0157 in."},
		{"cylinders[0].rounds[0].port_marks.front_gauge_mm is 25.4 mm.", "the front port mark is 1 in."},
		{"cylinders[1].rounds[2].sweeps[0] has a gap.", "the sweep of round 3 (left cylinder) has a gap."},
		{`did you mean "wheel_diameter_mm"? e.g. 2.5 mm`, `did you mean "wheel_diameter_mm"? e.g. 0.0984 in`},
	} {
		if got := a.inWords(c[0]); got != c[1] {
			t.Errorf("%q in words:\n got %q\nwant %q", c[0], got, c[1])
		}
	}
}
