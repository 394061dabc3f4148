package ui

import (
	"os"
	"strings"
	"testing"

	"evenbeat/setting/jsonx"
	"evenbeat/setting/session"
	"evenbeat/setting/session/badinput"
)

// The catalogue of bad and hostile input (setting/session/badinput, issue
// 13) fed to the app through package ui: every session file of it as an
// import, and each kind a setter can type as entries on the keypad. The
// command line runs the same cases (cmd/evenbeat TestCatalogueOfBadInput).

// catalogue returns the catalogue's session cases.
func catalogue(t *testing.T) []badinput.Case {
	t.Helper()
	sess, err := os.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	eng, err := os.ReadFile("../../testdata/engines/brackenfold-walschaerts.json")
	if err != nil {
		t.Fatal(err)
	}
	cases, err := badinput.Catalogue(sess, eng)
	if err != nil {
		t.Fatal(err)
	}
	var out []badinput.Case
	for _, c := range cases {
		if c.Kind == badinput.Session {
			out = append(out, c)
		}
	}
	if len(out) < 40 {
		t.Fatalf("the catalogue holds %d kinds of bad session file; issue 13 asks for at least 40", len(out))
	}
	return out
}

// saysCase checks that msg, the app's sentence about case c, says c's
// words and one of its fixes (ignoring case), and shows no key path of
// the session file.
func saysCase(t *testing.T, c badinput.Case, msg string) {
	t.Helper()
	low := strings.ToLower(msg)
	for _, w := range c.Words {
		if !strings.Contains(low, strings.ToLower(w)) {
			t.Errorf("the app's words lack %q:\n%s", w, msg)
		}
	}
	fixed := len(c.Fix) == 0
	for _, f := range c.Fix {
		fixed = fixed || strings.Contains(low, strings.ToLower(f))
	}
	if !fixed {
		t.Errorf("the app's words do not say what to do (one of %q):\n%s", c.Fix, msg)
	}
	noKeyPath(t, msg)
}

// noKeyPath fails when msg quotes a key path of the session file.
func noKeyPath(t *testing.T, msg string) {
	t.Helper()
	for i := range msg {
		if j := pathAt(msg, i); j > i {
			t.Errorf("a key path is shown, %q:\n%s", msg[i:j], msg)
			return
		}
	}
}

// cylinderOf returns the index of the cylinder the case's command plans
// (its -cylinder flag; the first without one).
func cylinderOf(s *session.Session, c badinput.Case) int {
	for i, arg := range c.Args {
		if arg == "-cylinder" && i+1 < len(c.Args) {
			for ci, cy := range s.Cylinders {
				if cy.Name == c.Args[i+1] {
					return ci
				}
			}
		}
	}
	return 0
}

// TestCatalogueAsFiles imports every session file of the catalogue: a file
// the reader refuses is refused with a sentence naming the field in words
// and saying what to do, no key path, nothing stored; a file whose
// readings contradict one another is stored, and its plan is refused with
// the reasons; an unusual file is planned.
func TestCatalogueAsFiles(t *testing.T) {
	for _, c := range catalogue(t) {
		t.Run(c.Name, func(t *testing.T) {
			st := newMemStore()
			a := newTestApp(t, st)
			file := c.File
			if file == nil {
				file = []byte{} // no such file: the app is handed nothing
			}
			err := a.Import(file)
			shown, _ := drawText(a)
			switch {
			case c.Refused && !c.Blocked:
				if err == nil {
					t.Fatalf("imported")
				}
				if c.File != nil {
					saysCase(t, c, err.Error())
				}
				noKeyPath(t, shown)
				if a.Screen() != Engines || len(st.puts) != 0 || len(a.StoredSessions()) != 0 {
					t.Errorf("a refused import: screen %s, writes %q", a.Screen(), st.puts)
				}
			case c.Blocked:
				if err != nil {
					t.Fatalf("refused: %v", err)
				}
				a.cyl = cylinderOf(a.Session(), c)
				a.planRound = 0
				a.navigate(Plan)
				a.makePlan()
				if a.plan != nil {
					t.Fatalf("planned from a blocked session:\n%s", a.PlanText())
				}
				saysCase(t, c, strings.Join(a.planNote, "\n"))
				shown, _ = drawText(a)
				noKeyPath(t, shown)
			default:
				if err != nil {
					t.Fatalf("refused: %v", err)
				}
				a.planRound = 0
				a.navigate(Plan)
				a.makePlan()
				if a.plan == nil {
					t.Fatalf("not planned: %q", a.planNote)
				}
			}
		})
	}
}

// entryRecord names, for the contradictions of the catalogue whose field
// is a list or the record given another way, the record whose values are
// typed again.
func entryRecord(c badinput.Case) string {
	switch c.Name {
	case "dead centres far from half a turn apart":
		return "cylinders[0].dead_centres[1]"
	case "negative laps":
		return "cylinders[1].rounds[0].laps"
	}
	return c.Field
}

// valueEntries are the catalogue's values that cannot be (or are unusual)
// as a setter types them: the screen, the field and the keys.
func valueEntries() map[string][3]string {
	return map[string][3]string{
		"negative wheel":       {"sizes", "Wheel diameter", "-115"},
		"port mark of 999 in":  {"measure", "Front port mark", "25374.6"},
		"target lead of 99 mm": {"lead", "Target lead", "99"},
		"wheel of 999 in":      {"sizes", "Wheel diameter", "25374.6"},
	}
}

// fileOnly are the catalogue's session cases no keypad entry can make:
// the file itself, its keys and lists, and values the app sets by choice
// (the date, a notch, the gauge's division).
func fileOnly() []string {
	return []string{"gauge reading too large for a float", "NaN written in the file", "date that cannot be read", "reverser beyond full gear",
		"notch not the engine's", "zero gauge resolution", "crank of 1e308", // the keypad's reader refuses a length beyond 100 m (TestHeldValues)
		"cylinder named twice", "misspelt key", "misspelt required key of the engine",
		"key written twice", "unknown key", "syntax error", "cut short", "empty file", "a list, not an object", "nested too deep",
		"newer version", "an engine file given to plan", "byte-order mark", "UTF-16", "invalid UTF-8 in a name", "no such file",
		"100,000 sweep readings", "2000 notches", "13 cylinders", "2001 dead-centre readings in a round", "larger than 16 MB",
		"everything typed in inches", "no rounds yet",
		// The engine's history is written by the app's edits
		// (TestEditEngineKeepsReadings), never typed.
		"history of a reading",
		// A valve centre that shuts a port: set-up derives the centre, and
		// holds an engine that does not work (the set-up's tests).
		"engine whose port never opens"}
}

// TestCatalogueAsEntries types the catalogue's bad values on the keypad as
// a setter would: each contradiction by typing its record's values again
// into the file without it, each value that cannot be into its field. The
// app holds the field: it stays on it, says the case's words and what to
// do with the field's name and no key path, and keeps the value out of
// the session; an unusual value is taken on a second Next. Every session
// case is typed here, or listed as one no keypad can make.
func TestCatalogueAsEntries(t *testing.T) {
	only := map[string]bool{}
	for _, n := range fileOnly() {
		only[n] = true
	}
	for _, c := range catalogue(t) {
		v, isValue := valueEntries()[c.Name]
		switch {
		case only[c.Name]:
			continue
		case isValue:
			t.Run(c.Name, func(t *testing.T) { typeValue(t, c, v) })
		case c.Blocked:
			t.Run(c.Name, func(t *testing.T) { typeRecord(t, c) })
		default:
			t.Errorf("%s: neither typed as entries nor listed as a case no keypad can make", c.Name)
		}
	}
}

// typeRecord imports case c's file less its record, types the record's
// values (read from the case's file) from its round's list of readings,
// and checks the last is held.
func typeRecord(t *testing.T, c badinput.Case) {
	rec := entryRecord(c)
	s, err := session.Decode(strings.NewReader(string(c.File)))
	if err != nil {
		t.Fatal(err)
	}
	root, err := jsonx.Parse(c.File, jsonx.Options{})
	if err != nil || !dropAt(root, rec) {
		t.Fatalf("the case's file has no %s", rec)
	}
	w := &jsonx.Writer{}
	w.Value(root)
	less, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	a := newTestApp(t, newMemStore())
	if err := a.Import(less); err != nil {
		t.Fatalf("the file less %s: %v", rec, err)
	}
	p := parsePath(rec)
	ci, ri := p[0].i, 0
	if len(p) > 1 && p[1].key == "rounds" {
		ri = p[1].i
	}
	a.Session().DisplayUnit = session.UnitMM // the case's values are mm
	a.cyl, a.lapsForm = ci, strings.HasSuffix(rec, ".laps")
	a.showRound(ri)
	var held bool
	for _, f := range measureFields(s, ci, ri, false, a.lapsForm) {
		v, ok := f.get(s)
		if f.Path(s) != rec || !ok {
			continue
		}
		tap(t, a, f.Label+":")
		typeKeys(t, a, formatNumber(v, false))
		tap(t, a, "Next")
		if a.Screen() == Measure {
			if a.Field() != f.Label || !strings.HasPrefix(a.Note(), f.Label+": ") {
				t.Fatalf("held at %q with %q; want the field %q named", a.Field(), a.Note(), f.Label)
			}
			if got, ok := f.get(a.Session()); ok && got == v && !strings.HasSuffix(f.Key, "centre_gauge_mm") {
				t.Errorf("%s = %v held, but the value is in the session", f.Label, got)
			}
			saysCase(t, c, a.Note())
			t.Logf("held: %s", a.Note())
			held = true
			break
		}
		if a.Screen() != Readings {
			t.Fatalf("after %s: screen %s (%q)", f.Label, a.Screen(), a.Note())
		}
	}
	if !held {
		t.Fatalf("every value of %s was taken", rec)
	}
}

// typeValue types one value that cannot be (or is unusual) into its
// field on the screen named by v.
func typeValue(t *testing.T, c badinput.Case, v [3]string) {
	st := newMemStore()
	a := newTestApp(t, st)
	switch v[0] {
	case "sizes":
		tap(t, a, "Brackenfold (Stephenson) (invented demo)")
		tap(t, a, "mm")
		tap(t, a, "Next")
		for a.Field() != v[1] {
			tap(t, a, "Next")
		}
	case "measure":
		a = planApp(t)
		a.Session().DisplayUnit = session.UnitMM
		st = a.opt.Store.(*memStore)
		a.showRound(0)
		tap(t, a, v[1]+":")
	case "lead":
		a = planApp(t)
		a.Session().DisplayUnit = session.UnitMM
		st = a.opt.Store.(*memStore)
		a.enterLead()
	}
	before, _ := encodeSession(a.Session())
	writes := len(st.puts)
	typeKeys(t, a, v[2])
	tap(t, a, "Next")
	after, _ := encodeSession(a.Session())
	if a.Field() != v[1] || string(after) != string(before) || len(st.puts) != writes {
		t.Fatalf("%s %s: field %q after Next, session changed %v, %d writes; want it held", v[1], v[2], a.Field(), string(after) != string(before), len(st.puts)-writes)
	}
	if !strings.HasPrefix(a.Note(), v[1]+": ") {
		t.Errorf("the sentence does not name the field %q first: %q", v[1], a.Note())
	}
	t.Logf("held: %s", a.Note())
	if c.Refused {
		saysCase(t, c, a.Note())
		return
	}
	// Unusual, not impossible: a second Next takes it, and the domain's
	// warning follows, in words.
	if !strings.Contains(a.Note(), "unusual") || !strings.Contains(a.Note(), "Next again") {
		t.Errorf("an unusual value held without asking for a second Next: %q", a.Note())
	}
	tap(t, a, "Next")
	if a.Field() == v[1] {
		t.Fatalf("a second Next did not take %s %s: %q", v[1], v[2], a.Note())
	}
	text, _ := drawText(a)
	if !strings.Contains(strings.Join(strings.Fields(text), " "), c.Warns[:40]) {
		t.Errorf("the warning %q is not shown after the entry:\n%s", c.Warns, text)
	}
	noKeyPath(t, text)
}
