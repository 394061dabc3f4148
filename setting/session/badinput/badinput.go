// Package badinput is a catalogue of bad and hostile input, for tests: the
// session files, engine files and command-line flags a new user (or a
// slip of the finger) gives, each with what a good refusal or warning
// says. It serves every front end from the same table: cmd/evenbeat's
// catalogue test runs each case through the command line; the app's tests
// can feed the session cases to the app (an import) and check that the
// field is held with the same words.
//
// Cases are built from the demo files the caller reads
// (testdata/sessions/brackenfold-stephenson.json and
// testdata/engines/brackenfold-walschaerts.json), edited one way each, so
// that every case is the demo with one thing wrong. The demo data are
// invented.
//
// The package is imported only by tests; it imports the standard library.
package badinput

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf16"
)

// Kind says which reader a case is for.
type Kind string

// Kinds of case.
const (
	Session Kind = "session" // a session file (plan, report, the app's import)
	Engine  Kind = "engine"  // an engine file (events)
	Flag    Kind = "flag"    // a command-line flag or argument, on the demo session
)

// Case is one bad or hostile input and what must be said of it.
type Case struct {
	Name string
	Kind Kind
	// Command is the evenbeat subcommand the case is run with: "plan",
	// "report" or "events".
	Command string
	// Args are the command's flags and arguments; "FILE" stands for the
	// case's file (appended when no argument is "FILE"). "OUT" stands for
	// a file to write (report's -o).
	Args []string
	// File is the file the command reads; nil for a file that does not
	// exist (the path is then "nowhere.json").
	File []byte
	// Refused: the command exits with an error, and writes no plan, table
	// or report. False: it plans (or tabulates), and Warns is said on
	// stderr.
	Refused bool
	// Blocked: the file reads, but its readings block the plan (the
	// refusal comes from Session.Readiness, as in the app before its plan).
	Blocked bool
	// Field is the key path the refusal names ("cylinders[0].rounds[1].
	// port_marks", or the flag "-weight"); "" for the file as a whole.
	Field string
	// Words name the field (or the file's fault) in words: each must be
	// in the message, ignoring case.
	Words []string
	// Fix says what to do: at least one of these must be in the message,
	// ignoring case.
	Fix []string
	// Warns is a warning that must be written (stderr), for a case that
	// is not refused, or that is refused for another reason.
	Warns string
}

// Catalogue returns the cases, built from the demo session and engine
// files. It fails when a demo file is not as the edits expect (the demo
// changed): then the catalogue must follow.
func Catalogue(demoSession, demoEngine []byte) ([]Case, error) {
	b := builder{session: string(demoSession), engine: string(demoEngine)}
	cs := b.cases()
	if b.err != nil {
		return nil, b.err
	}
	return cs, nil
}

type builder struct {
	session, engine string
	err             error
}

// edit returns base with old replaced by new, once (the first), or notes
// that base has no old.
func (b *builder) edit(base, old, new string) string {
	if !strings.Contains(base, old) {
		if b.err == nil {
			b.err = fmt.Errorf("badinput: the demo file has no %q", old)
		}
		return base
	}
	return strings.Replace(base, old, new, 1)
}

// s edits the demo session; e the demo engine.
func (b *builder) s(old, new string) []byte { return []byte(b.edit(b.session, old, new)) }
func (b *builder) e(old, new string) []byte { return []byte(b.edit(b.engine, old, new)) }

// latin1 writes s as ISO 8859-1, one byte a letter: not UTF-8 beyond
// ASCII (the name typed in another encoding).
func latin1(s string) string {
	var b []byte
	for _, r := range s {
		b = append(b, byte(r))
	}
	return string(b)
}

// emptied returns the demo session with the list opened by list (such as
// "\"rounds\": [") that first follows after emptied.
func (b *builder) emptied(after, list string) []byte {
	return []byte(b.filled(b.session, after, list, ""))
}

// filled returns base with the list opened by list that first follows
// after holding content instead.
func (b *builder) filled(base, after, list, content string) string {
	i := strings.Index(base, after)
	j := strings.Index(base[max(i, 0):], list)
	if i < 0 || j < 0 {
		if b.err == nil {
			b.err = fmt.Errorf("badinput: the demo session has no %q after %q", list, after)
		}
		return base
	}
	start := i + j + len(list)
	depth := 1
	end := start
	for ; end < len(base) && depth > 0; end++ {
		switch base[end] {
		case '[', '{':
			depth++
		case ']', '}':
			depth--
		}
	}
	return base[:start] + content + "]" + base[end:]
}

// Largest returns the demo session grown to about size bytes (at most
// 16 MB, the largest session file read) within every bound of the format:
// the right cylinder's 200 rounds and then the left cylinder's, each
// round of 2000 readings (full sweeps of 720 readings in full forward
// and full back, 552 in the running notch, and the demo's dead-centre
// readings and cut-offs), the readings a smooth valve curve. The heaviest
// file a command can be given: what the figures time.
func Largest(demoSession []byte, size int) ([]byte, error) {
	b := builder{session: string(demoSession)}
	sweep := func(n int, rev, dir string) string {
		var s strings.Builder
		fmt.Fprintf(&s, `{"reverser": %q, "direction": %q, "readings": [`, rev, dir)
		for i := 0; i < n; i++ {
			if i > 0 {
				s.WriteString(", ")
			}
			deg := 360 * float64(i) / float64(n)
			fmt.Fprintf(&s, `{"deg": %.2f, "gauge_mm": %.2f}`, deg, 5.1+4.95*math.Sin((deg+100)*math.Pi/180))
		}
		s.WriteString("]}")
		return s.String()
	}
	dcr := strings.TrimSuffix(strings.Repeat(`{"end": "front", "reverser": "full forward", "direction": "forward", "gauge_mm": 2.41}, {"end": "back", "reverser": "full forward", "direction": "forward", "gauge_mm": 7.62}, `, 3), ", ")
	round := `{"date": "2026-11-23", "port_marks": {"front_gauge_mm": 2.6, "back_gauge_mm": 7.4}, "dead_centre_readings": [` + dcr + `], "sweeps": [` +
		sweep(720, "full forward", "forward") + ", " + sweep(720, "full back", "backward") + ", " + sweep(552, "running notch", "forward") +
		`], "cut_offs": [{"end": "front", "reverser": "full forward", "direction": "forward", "crosshead_mm": 33.5}, {"end": "back", "reverser": "full forward", "direction": "forward", "crosshead_mm": 32.5}]}`
	size = min(size, 16<<20)
	room := size - len(demoSession)
	right := min(room/(len(round)+2), 200) // rounds a cylinder
	left := min(max(room/(len(round)+2)-right, 0), 200)
	rounds := func(n int) string { return strings.TrimSuffix(strings.Repeat(round+", ", n), ", ") }
	out := b.filled(b.session, "\"name\": \"right\",\n      \"dead_centres\"", "\"rounds\": [", rounds(right))
	if left > 0 {
		out = b.filled(out, "\"name\": \"left\",\n      \"dead_centres\"", "\"rounds\": [", rounds(left))
	}
	return []byte(out), b.err
}

// inches writes every length of the demo session divided by 25.4, as if
// typed in inches where the file holds mm.
func (b *builder) inches() []byte {
	angles := map[string]bool{"version": true, "inclination": true, "advance": true, "mid_arm_angle": true, "arm_swing": true,
		"crank_angle": true, "min_deg": true, "max_deg": true, "tpi": true, "flats_per_turn": true, "reverser": true}
	number := regexp.MustCompile(`"(\w+)": (-?[0-9.]+)`)
	list := regexp.MustCompile(`"marks_tyre_mm": \[\s*(-?[0-9.]+),\s*(-?[0-9.]+)\s*\]`)
	div := func(s string) string {
		f, _ := strconv.ParseFloat(s, 64)
		return strconv.FormatFloat(f/25.4, 'f', 4, 64)
	}
	out := number.ReplaceAllStringFunc(b.session, func(m string) string {
		g := number.FindStringSubmatch(m)
		if angles[g[1]] {
			return m
		}
		return `"` + g[1] + `": ` + div(g[2])
	})
	out = list.ReplaceAllStringFunc(out, func(m string) string {
		g := list.FindStringSubmatch(m)
		return `"marks_tyre_mm": [` + div(g[1]) + ", " + div(g[2]) + "]"
	})
	return []byte(out)
}

// Edits of the demo session's text.
const (
	portMarks1  = "\"front_gauge_mm\": 2.6,\n            \"back_gauge_mm\": 7.4"
	frontMarks  = "\"marks_tyre_mm\": [\n            349,\n            37\n          ]"
	backMarks   = "\"marks_tyre_mm\": [\n            168.5,\n            217.5\n          ]"
	leftLaps    = "\"front_lap_mm\": 2.4,\n            \"back_lap_mm\": 2.4,"
	wheel       = `"wheel_diameter_mm": 115,`
	sessionName = `"name": "Brackenfold: setting the valves after the winter overhaul",`
	firstGauge  = `"gauge_mm": 2.41`
	firstSweep  = "\"readings\": [\n                {\n                  \"tyre_mm\": 12.5,"
	notches     = "\"notches\": [\n      {\n        \"name\": \"running notch\",\n        \"reverser\": 0.4\n      }\n    ],"
	engineCyls  = "\"cylinders\": [\n      {\n        \"name\": \"right\","
)

func (b *builder) cases() []Case {
	sweep := func(n int) string {
		var s strings.Builder
		s.WriteString(`"readings": [`)
		for i := 0; i < n; i++ {
			fmt.Fprintf(&s, `{"deg": %d, "gauge_mm": 5}, `, i%360)
		}
		return s.String() + "\n                {\n                  \"tyre_mm\": 12.5,"
	}
	manyNotches := func(n int) string {
		var s strings.Builder
		s.WriteString(`"notches": [`)
		for i := 0; i < n; i++ {
			fmt.Fprintf(&s, `{"name": "notch %d", "reverser": %g}, `, i, 0.9-1.8*float64(i)/float64(n))
		}
		return s.String() + `{"name": "running notch", "reverser": 0.4}],`
	}
	manyReadings := func(n int) string {
		return "\"dead_centre_readings\": [" + strings.Repeat(`{"end": "front", "reverser": "full forward", "direction": "forward", "gauge_mm": 2.41}, `, n)
	}
	utf16le := func(s string) []byte {
		out := []byte{0xff, 0xfe}
		for _, u := range utf16.Encode([]rune(s)) {
			out = append(out, byte(u), byte(u>>8))
		}
		return out
	}
	session := []byte(b.session)
	r0, r1 := "cylinders[0].rounds[0]", "cylinders[0].rounds[1]"
	cs := []Case{
		// Readings that contradict one another: the file reads, the plan is refused.
		{Name: "port marks swapped", Kind: Session, Command: "plan", File: b.s(portMarks1, "\"front_gauge_mm\": 7.4,\n            \"back_gauge_mm\": 2.6"),
			Refused: true, Blocked: true, Field: r1 + ".port_marks", Words: []string{"port marks", "wrong way round"}, Fix: []string{"Check which mark is which"}},
		{Name: "port marks equal", Kind: Session, Command: "plan", File: b.s(portMarks1, "\"front_gauge_mm\": 5,\n            \"back_gauge_mm\": 5"),
			Refused: true, Blocked: true, Field: r1 + ".port_marks", Words: []string{"port marks", "same reading"}, Fix: []string{"Re-take the port marks"}},
		{Name: "port marks further apart than the travel", Kind: Session, Command: "report", Args: []string{"-o", "OUT", "FILE"}, File: b.s(portMarks1, "\"front_gauge_mm\": 0.1,\n            \"back_gauge_mm\": 11"),
			Refused: true, Blocked: true, Field: r1 + ".port_marks", Words: []string{"steam edges", "valve travels"}, Fix: []string{"Take the port marks again"}},
		{Name: "identical dead-centre marks", Kind: Session, Command: "plan", File: b.s(frontMarks, `"marks_tyre_mm": [20, 20]`),
			Refused: true, Blocked: true, Field: "cylinders[0].dead_centres[0]", Words: []string{"bracketing marks", "front dead centre"}, Fix: []string{"mark the tyre once a little before dead centre and once after"}},
		{Name: "dead centres far from half a turn apart", Kind: Session, Command: "plan", File: b.s(backMarks, `"marks_tyre_mm": [218.5, 267.5]`),
			Refused: true, Blocked: true, Field: "cylinders[0].dead_centres", Words: []string{"front and back dead centres"}, Fix: []string{"Bracket both dead centres again"}},
		{Name: "a dead centre bracketed each way far apart", Kind: Session, Command: "plan", File: b.s("\"marks_tyre_mm\": [\n            37,\n            349\n          ]", `"marks_tyre_mm": [90, 40]`),
			Refused: true, Blocked: true, Field: "cylinders[0].dead_centres[0]", Words: []string{"front dead centre", "turning forward and turning backward"}, Fix: []string{"Bracket the front dead centre again both ways"}},
		{Name: "laps beyond half the travel", Kind: Session, Command: "plan", Args: []string{"-cylinder", "left", "FILE"}, File: b.s(leftLaps, "\"front_lap_mm\": 10,\n            \"back_lap_mm\": 10,"),
			Refused: true, Blocked: true, Field: "cylinders[1].rounds[0].laps", Words: []string{"steam edges", "laps"}, Fix: []string{"Take the laps and the gauge reading at valve centre again"}},
		{Name: "laps of 999 mm", Kind: Session, Command: "plan", Args: []string{"-cylinder", "left", "FILE"}, File: b.s(leftLaps, "\"front_lap_mm\": 999,\n            \"back_lap_mm\": 999,"),
			Refused: true, Blocked: true, Field: "cylinders[1].rounds[0].laps", Words: []string{"steam edges"}, Fix: []string{"Take the laps"}},
		{Name: "negative laps", Kind: Session, Command: "plan", Args: []string{"-cylinder", "left", "FILE"}, File: b.s(leftLaps, "\"front_lap_mm\": -3,\n            \"back_lap_mm\": -3,"),
			Refused: true, Blocked: true, Field: "cylinders[1].rounds[0].port_marks", Words: []string{"port marks", "wrong way round"}, Fix: []string{"Check which mark is which"}},
		{Name: "engine's laps against the port marks", Kind: Session, Command: "plan", File: []byte(strings.ReplaceAll(b.session, `"steam_lap": 2.4,`, `"steam_lap": 10,`)),
			Refused: true, Blocked: true, Field: r1 + ".port_marks", Words: []string{"steam edges", "engine's steam laps"}, Fix: []string{"correct the steam laps"}},
		{Name: "the same reading at both dead centres", Kind: Session, Command: "plan", File: b.s("\"gauge_mm\": 7.62\n            },\n            {\n              \"end\": \"front\",\n              \"reverser\": \"full back\",\n              \"direction\": \"backward\",\n              \"gauge_mm\": 2.65\n            },\n            {\n              \"end\": \"back\",\n              \"reverser\": \"full back\",\n              \"direction\": \"backward\",\n              \"gauge_mm\": 7.85\n            }\n          ]\n        }",
			"\"gauge_mm\": 7.62\n            },\n            {\n              \"end\": \"front\",\n              \"reverser\": \"full back\",\n              \"direction\": \"backward\",\n              \"gauge_mm\": 2.65\n            },\n            {\n              \"end\": \"back\",\n              \"reverser\": \"full back\",\n              \"direction\": \"backward\",\n              \"gauge_mm\": 2.65\n            }\n          ]\n        }"),
			Refused: true, Blocked: true, Field: r1 + ".dead_centre_readings[3]", Words: []string{"the gauge read the same at both dead centres"}, Fix: []string{"Check that the gauge is on the valve spindle"}},
		{Name: "no rounds yet", Kind: Session, Command: "plan", Args: []string{"-cylinder", "left", "FILE"}, File: b.emptied("\"name\": \"left\",\n      \"dead_centres\"", "\"rounds\": ["),
			Refused: true, Blocked: true, Field: "cylinders[1].rounds", Words: []string{"no readings for the left cylinder"}, Fix: []string{"Take a round"}},

		// Values that cannot be: refused by the reader, naming the field.
		{Name: "negative wheel", Kind: Session, Command: "plan", File: b.s(wheel, `"wheel_diameter_mm": -115,`),
			Refused: true, Field: "measuring.wheel_diameter_mm", Words: []string{"wheel diameter"}, Fix: []string{"more than zero"}},
		{Name: "port mark of 999 in", Kind: Session, Command: "plan", File: b.s(portMarks1, "\"front_gauge_mm\": 25374.6,\n            \"back_gauge_mm\": 7.4"),
			Refused: true, Field: r1 + ".port_marks.front_gauge_mm", Words: []string{"front port mark"}, Fix: []string{"between -1000 and 1000"}},
		{Name: "crank of 1e308", Kind: Session, Command: "plan", File: b.s(`"crank_radius": 22,`, `"crank_radius": 1e308,`),
			Refused: true, Field: "engine.engine.crank_radius", Words: []string{"crank radius"}, Fix: []string{"check the number"}},
		{Name: "gauge reading too large for a float", Kind: Session, Command: "plan", File: b.s(firstGauge, `"gauge_mm": 1e400`),
			Refused: true, Field: r0 + ".dead_centre_readings[0].gauge_mm", Words: []string{"1e400", "too large"}, Fix: []string{"the gauge reading in mm"}},
		{Name: "NaN written in the file", Kind: Session, Command: "plan", File: b.s(firstGauge, `"gauge_mm": NaN`),
			Refused: true, Words: []string{"not valid JSON", "line"}, Fix: []string{"column"}},
		{Name: "date that cannot be read", Kind: Session, Command: "plan", File: b.s(`"date": "2026-11-21",`, `"date": "21/11/2026",`),
			Refused: true, Field: r0 + ".date", Words: []string{"date"}, Fix: []string{"year-month-day"}},
		{Name: "reverser beyond full gear", Kind: Session, Command: "plan", File: b.s(`"reverser": "full forward",`, `"reverser": 1.5,`),
			Refused: true, Field: r0 + ".dead_centre_readings[0].reverser", Words: []string{"reverser position"}, Fix: []string{"from -1 (full back)"}},
		{Name: "notch not the engine's", Kind: Session, Command: "plan", File: b.s(`"reverser": "full forward",`, `"reverser": "first notch",`),
			Refused: true, Field: r0 + ".dead_centre_readings[0].reverser", Words: []string{"notch", "first notch"}, Fix: []string{"use one of"}},
		{Name: "zero gauge resolution", Kind: Session, Command: "plan", File: b.s(`"gauge_resolution_mm": 0.01,`, `"gauge_resolution_mm": 0,`),
			Refused: true, Field: "measuring.gauge_resolution_mm", Words: []string{"gauge resolution"}, Fix: []string{"more than zero"}},
		{Name: "target lead of 99 mm", Kind: Session, Command: "plan", File: b.s(`"priority": "leads",`, `"priority": "leads", "target_lead_mm": 99,`),
			Refused: true, Field: "plan_aims.target_lead_mm", Words: []string{"target lead"}, Fix: []string{"between -5 and 25"}},
		{Name: "cylinder named twice", Kind: Session, Command: "plan", File: b.s(`"name": "left",
      "dead_centres"`, `"name": "RIGHT",
      "dead_centres"`),
			Refused: true, Field: "cylinders[1].name", Words: []string{"already used"}, Fix: []string{"each cylinder needs its own name"}},

		// Keys and the file itself.
		{Name: "misspelt key", Kind: Session, Command: "plan", File: b.s(wheel, `"wheel_diametr_mm": 115,`),
			Refused: true, Field: "measuring.wheel_diametr_mm", Words: []string{`"wheel_diametr_mm"`}, Fix: []string{`did you mean "wheel_diameter_mm"?`}},
		{Name: "misspelt required key of the engine", Kind: Session, Command: "plan", File: b.s(`"rod_length": 132,`, `"rod_lenght": 132,`),
			Refused: true, Field: "engine.engine.rod_lenght", Words: []string{`"rod_lenght"`}, Fix: []string{`did you mean "rod_length"?`}},
		{Name: "key written twice", Kind: Session, Command: "plan", File: b.s(wheel, `"wheel_diameter_mm": 115, "wheel_diameter_mm": 125,`),
			Refused: true, Field: "measuring.wheel_diameter_mm", Words: []string{`"wheel_diameter_mm"`, "written twice"}, Fix: []string{"keep one of them"}},
		{Name: "unknown key", Kind: Session, Command: "plan", File: b.s(wheel, `"colour": "green", `+wheel),
			Refused: true, Field: "measuring.colour", Words: []string{`"colour"`}, Fix: []string{"remove it or correct its name"}},
		{Name: "syntax error", Kind: Session, Command: "plan", File: b.s(wheel, `"wheel_diameter_mm": 115,,`),
			Refused: true, Words: []string{"not valid JSON", "line 86"}, Fix: []string{"column"}},
		{Name: "cut short", Kind: Session, Command: "plan", File: session[:len(session)/2],
			Refused: true, Words: []string{"ends too early"}, Fix: []string{"cut short or a bracket is missing"}},
		{Name: "empty file", Kind: Session, Command: "plan", File: []byte("\n"),
			Refused: true, Words: []string{"empty"}, Fix: []string{`starts with {"format": "evenbeat-session"`}},
		{Name: "a list, not an object", Kind: Session, Command: "plan", File: []byte(`[1, 2, 3]`),
			Refused: true, Words: []string{"one JSON object"}, Fix: []string{"this file holds a list"}},
		{Name: "nested too deep", Kind: Session, Command: "plan", File: []byte(strings.Repeat("[", 100) + strings.Repeat("]", 100)),
			Refused: true, Words: []string{"nests lists and objects more than 64 deep"}, Fix: []string{"not a session file"}},
		{Name: "newer version", Kind: Session, Command: "plan", File: b.s(`"version": 2,`, `"version": 3,`),
			Refused: true, Field: "version", Words: []string{"newer Evenbeat"}, Fix: []string{"Update the app"}},
		{Name: "an engine file given to plan", Kind: Session, Command: "plan", File: []byte(b.engine),
			Refused: true, Field: "format", Words: []string{"\"format\" field"}, Fix: []string{"one starts with \"format\": \"evenbeat-session\""}},
		{Name: "byte-order mark", Kind: Session, Command: "plan", File: append([]byte{0xef, 0xbb, 0xbf}, session...),
			Warns: "The lead at front dead centre, full forward is 0.07 mm"},
		{Name: "UTF-16", Kind: Session, Command: "plan", File: utf16le(b.session),
			Refused: true, Words: []string{"UTF-16"}, Fix: []string{"save the file as UTF-8"}},
		{Name: "invalid UTF-8 in a name", Kind: Session, Command: "plan", File: b.s(sessionName, "\"name\": \"Brackenfold "+latin1("été")+" 1926\","),
			Refused: true, Words: []string{"not UTF-8", "line 4, column 24"}, Fix: []string{"save the file as UTF-8"}},
		{Name: "no such file", Kind: Session, Command: "plan",
			Refused: true, Words: []string{"nowhere.json", "cannot be opened"}, Fix: []string{"check its name"}},

		// Files beyond the bounds that keep every command small.
		{Name: "100,000 sweep readings", Kind: Session, Command: "report", Args: []string{"-o", "OUT", "FILE"}, File: b.s(firstSweep, sweep(100000)),
			Refused: true, Field: r0 + ".sweeps[0].readings", Words: []string{"readings round the turn", "100012"}, Fix: []string{"at most 720"}},
		{Name: "2000 notches", Kind: Session, Command: "report", Args: []string{"-o", "OUT", "FILE"}, File: b.s(notches, manyNotches(1999)),
			Refused: true, Field: "engine.notches", Words: []string{"2000 notches"}, Fix: []string{"at most 40"}},
		{Name: "13 cylinders", Kind: Session, Command: "plan", File: b.s(engineCyls, "\"cylinders\": ["+strings.Repeat(`{"name": "x", "crank_angle": 0}, `, 11)+"{\n        \"name\": \"right\","),
			Refused: true, Field: "engine.cylinders", Words: []string{"13 cylinders"}, Fix: []string{"at most 12"}},
		{Name: "2001 dead-centre readings in a round", Kind: Session, Command: "plan", File: b.s(`"dead_centre_readings": [`, manyReadings(1995)),
			Refused: true, Field: r0 + ".dead_centre_readings", Words: []string{"gauge readings at dead centres", "2001"}, Fix: []string{"split them into rounds"}},
		{Name: "larger than 16 MB", Kind: Session, Command: "plan", File: b.s(`"note": "Invented example`, `"note": "`+strings.Repeat("x", 17<<20)+`Invented example`),
			Refused: true, Words: []string{"larger than 16 MB"}, Fix: []string{"Is this the right file?"}},
		{Name: "engine whose port never opens", Kind: Session, Command: "plan", File: b.s(`"valve_centre_u": 129.94`, `"valve_centre_u": 139.94`),
			Refused: true, Blocked: true, Field: "engine.valve.back.steam_lap", Words: []string{"back port never opens"}, Fix: []string{"the valve's central position"}},
		{Name: "history of a reading", Kind: Session, Command: "plan", File: []byte(strings.TrimSuffix(strings.TrimSpace(b.session), "}") +
			`, "engine_changes": [{"date": "2026-12-01", "key": "cylinders[0].rounds[0].port_marks.front_gauge_mm", "before": 2.48, "after": 2.5}]}`),
			Refused: true, Field: "engine_changes[0].key", Words: []string{"not a value of the engine's history"}, Fix: []string{"give the key path"}},
		{Name: "heard gaps that are not a turn", Kind: Session, Command: "plan", File: []byte(strings.TrimSuffix(strings.TrimSpace(b.session), "}") +
			`, "heard": [{"date": "2026-12-03", "position": "running notch", "gaps_deg": [88.6, 91.2, 89.7, 99.5], "rev_per_min": 72.4}]}`),
			Refused: true, Field: "heard[0].gaps_deg", Words: []string{"369 degrees"}, Fix: []string{"add up to 360"}},

		// Unusual but possible: planned, with a warning.
		{Name: "everything typed in inches", Kind: Session, Command: "plan", File: b.inches(),
			Warns: "The engine's lengths look like inches typed where mm are asked"},
		{Name: "wheel of 999 in", Kind: Session, Command: "plan", File: b.s(wheel, `"wheel_diameter_mm": 25374.6,`),
			Warns: "A wheel of 25374.6 mm is unusual for an engine with valve gear; check that the diameter is in mm"},

		// Engine files.
		{Name: "engine: misspelt key", Kind: Engine, Command: "events", File: b.e(`"rod_length": 132,`, `"rod_lenght": 132,`),
			Refused: true, Field: "engine.rod_lenght", Words: []string{`"rod_lenght"`}, Fix: []string{`did you mean "rod_length"?`}},
		{Name: "engine: key missing", Kind: Engine, Command: "events", File: b.e(`"invented": true,`, ``),
			Refused: true, Field: "invented", Words: []string{"The invented mark"}, Fix: []string{`add "invented" with true or false`}},
		{Name: "engine: key written twice", Kind: Engine, Command: "events", File: b.e(`"rod_length": 132,`, `"rod_length": 132, "rod_length": 140,`),
			Refused: true, Field: "engine.rod_length", Words: []string{`"rod_length"`, "written twice"}, Fix: []string{"keep one of them"}},
		{Name: "engine: syntax error", Kind: Engine, Command: "events", File: b.e(`"rod_length": 132,`, `"rod_length": 132,,`),
			Refused: true, Words: []string{"engine file is not valid JSON", "line 7"}, Fix: []string{"column"}},
		{Name: "engine: crank of 1e308", Kind: Engine, Command: "events", File: b.e(`"crank_radius": 22,`, `"crank_radius": 1e308,`),
			Refused: true, Field: "engine.crank_radius", Words: []string{"crank radius"}, Fix: []string{"check the number"}},
		{Name: "engine: UTF-16", Kind: Engine, Command: "events", File: utf16le(b.engine),
			Refused: true, Words: []string{"UTF-16"}, Fix: []string{"save the file as UTF-8"}},
		{Name: "engine: byte-order mark", Kind: Engine, Command: "events", File: append([]byte{0xef, 0xbb, 0xbf}, b.engine...)},
		{Name: "engine: a wide exhaust clearance", Kind: Engine, Command: "events", File: b.e(`"exhaust_lap": 0,`, `"exhaust_lap": -3,`),
			Warns: "evenbeat: warning: The front exhaust clearance is 3.00 mm; more than 1.6 mm is unusual. Check the sign of the exhaust lap"},
		{Name: "engine: larger than 1 MB", Kind: Engine, Command: "events", File: b.e(`"invented": true,`, `"invented": true, "notes": "`+strings.Repeat("x", 1<<20)+`",`),
			Refused: true, Words: []string{"larger than 1 MB"}, Fix: []string{"Is this the right file?"}},
		{Name: "engine: a port that never opens", Kind: Engine, Command: "events", File: []byte(strings.ReplaceAll(b.engine, `"steam_lap": 2.4,`, `"steam_lap": 6,`)),
			Warns: "evenbeat: warning: In full forward the front port never opens to steam: the front steam lap is more than the valve travels past centre"},
		{Name: "engine: full-gear cut-off short", Kind: Engine, Command: "events", File: b.e(`"full_gear_die": 14.05,`, `"full_gear_die": 9,`),
			Warns: "evenbeat: warning: In full forward the front cut-off is 54 % of the stroke; 65 to 85 % is usual"},
		{Name: "engine: a derivable part left out without a design", Kind: Engine, Command: "events", File: b.e(`"return_angle": 149.72,`, ``),
			Refused: true, Field: "gear.walschaerts.return_angle", Words: []string{"The return angle", "missing"}, Fix: []string{`give the engine's "design"`}},
		{Name: "engine: a design the gear cannot give", Kind: Engine, Command: "events", File: []byte(b.edit(string(b.e(`"valve_pin": 7.09,`, ``)), `"notches": [`, `"design": {"lead": 20}, "notches": [`)),
			Refused: true, Field: "design.lead", Words: []string{"crank radius"}, Fix: []string{"must be less than"}},
		{Name: "engine: a derived part of another gear", Kind: Engine, Command: "events", File: b.e(`"notches": [`, `"design": {"lead": 0.2, "derived": ["gear.stephenson.arm_swing"]}, "notches": [`),
			Refused: true, Field: "design.derived[0]", Words: []string{"gear.stephenson.arm_swing"}, Fix: []string{"the parts it derives are"}},
		{Name: "engine: 41 notches", Kind: Engine, Command: "events", File: b.e("\"notches\": [\n    {\n      \"name\": \"running notch\",\n      \"reverser\": 0.4\n    }\n  ],", manyNotches(40)),
			Refused: true, Field: "notches", Words: []string{"41 notches"}, Fix: []string{"at most 40"}},

		// Flags.
		{Name: "-weight NaN", Kind: Flag, Command: "plan", Args: []string{"-priority", "balanced", "-weight", "NaN", "FILE"}, File: session,
			Refused: true, Field: "-weight", Words: []string{"share given to leads"}, Fix: []string{"-weight 0.5"}},
		{Name: "-weight 2", Kind: Flag, Command: "plan", Args: []string{"-weight", "2", "FILE"}, File: session,
			Refused: true, Field: "-weight", Words: []string{"share given to leads"}, Fix: []string{"from 0 to 1"}},
		{Name: "-target-lead NaN", Kind: Flag, Command: "plan", Args: []string{"-target-lead", "NaN", "FILE"}, File: session,
			Refused: true, Field: "-target-lead", Words: []string{"lead wanted"}, Fix: []string{"-target-lead 0.2"}},
		{Name: "-target-lead Inf", Kind: Flag, Command: "report", Args: []string{"-o", "OUT", "-target-lead", "+Inf", "FILE"}, File: session,
			Refused: true, Field: "-target-lead", Words: []string{"lead wanted"}, Fix: []string{"give millimetres"}},
		{Name: "-priority unknown", Kind: Flag, Command: "plan", Args: []string{"-priority", "fast", "FILE"}, File: session,
			Refused: true, Field: "-priority", Words: []string{"not a priority"}, Fix: []string{"use leads, cut-offs or balanced"}},
		{Name: "-unit unknown", Kind: Flag, Command: "plan", Args: []string{"-unit", "cubit", "FILE"}, File: session,
			Refused: true, Field: "-unit", Words: []string{"not a unit"}, Fix: []string{"use mm or inch"}},
		{Name: "-cylinder unknown", Kind: Flag, Command: "plan", Args: []string{"-cylinder", "middle", "FILE"}, File: session,
			Refused: true, Field: "-cylinder", Words: []string{`no cylinder "middle"`}, Fix: []string{"it has right, left"}},
		{Name: "report without -o", Kind: Flag, Command: "report", Args: []string{"FILE"}, File: session,
			Refused: true, Field: "-o", Words: []string{"file to write"}, Fix: []string{"-o report.png"}},
		{Name: "two files", Kind: Flag, Command: "plan", Args: []string{"FILE", "FILE"}, File: session,
			Refused: true, Words: []string{"reads one session file"}, Fix: []string{"give one file"}},
		{Name: "no file", Kind: Flag, Command: "plan", Args: []string{"-json"},
			Refused: true, Words: []string{"needs one session file"}, Fix: []string{"e.g. evenbeat plan"}},
	}
	return cs
}
