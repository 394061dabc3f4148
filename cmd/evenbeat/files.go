package main

import (
	"bufio"
	"errors"
	"flag"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime/debug"
	"slices"
	"strconv"
	"strings"

	"evenbeat/render/report"
	"evenbeat/setting"
	"evenbeat/setting/beat"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// planFlags are the setter's choices shared by plan and report. The plan
// aims a flag sets override the session file's; those not given come from
// the file's "plan_aims".
type planFlags struct {
	cylinder   string
	priority   string
	weight     float64
	targetLead float64
	unit       string
	fs         *flag.FlagSet // to tell which flags were given
}

func (p *planFlags) register(fs *flag.FlagSet) {
	p.fs = fs
	fs.StringVar(&p.cylinder, "cylinder", "", "cylinder to plan, by name (default: the first in the file)")
	fs.StringVar(&p.priority, "priority", "", "what to make equal front against back: leads, cut-offs or balanced (default: the file's plan_aims, else leads)")
	fs.Float64Var(&p.weight, "weight", 0, "with -priority balanced: share given to leads, 0 to 1 (0 means one half; default: the file's plan_aims)")
	fs.Float64Var(&p.targetLead, "target-lead", -1, "lead wanted at both ends, mm (eccentric gears only; -1: none, whatever the file says; default: the file's plan_aims, else keep today's mean)")
	fs.StringVar(&p.unit, "unit", "", "units of the words: mm or inch (default: the session's)")
}

// given reports whether flag name was on the command line.
func (p *planFlags) given(name string) bool {
	found := false
	if p.fs != nil {
		p.fs.Visit(func(f *flag.Flag) { found = found || f.Name == name })
	}
	return found
}

// options turns the session's plan aims and the flags into plan options
// for session s, naming the flag at fault.
func (p *planFlags) options(s *session.Session) (plan.Options, error) {
	opt := plan.AimsOptions(s.Aims)
	if p.given("priority") {
		switch pr := plan.Priority(p.priority); pr {
		case plan.EqualLeads, plan.EqualCutOffs, plan.Balanced:
			opt.Priority = pr
		default:
			return opt, fmt.Errorf("flag -priority: %q is not a priority; use leads, cut-offs or balanced", p.priority)
		}
	}
	if p.given("weight") {
		// Written so that NaN, which no comparison holds for, is refused.
		if !(p.weight >= 0 && p.weight <= 1) {
			return opt, fmt.Errorf("flag -weight: the share given to leads must be a number from 0 to 1 (got %g); give e.g. -weight 0.5", p.weight)
		}
		opt.Weight = p.weight
	}
	if p.given("target-lead") {
		opt.TargetLeadMM = nil
		if p.targetLead != -1 {
			// The bounds a session file's target_lead_mm holds; NaN is refused.
			if !(p.targetLead >= session.MinTargetLeadMM && p.targetLead <= session.MaxTargetLeadMM) {
				return opt, fmt.Errorf("flag -target-lead: the lead wanted must be a number of mm from %d to %d (got %g); give millimetres, e.g. -target-lead 0.2, or -1 for none",
					session.MinTargetLeadMM, session.MaxTargetLeadMM, p.targetLead)
			}
			t := p.targetLead
			opt.TargetLeadMM = &t
		}
	}
	switch u := session.Unit(p.unit); u {
	case "", session.UnitMM, session.UnitInch:
		opt.Unit = u
	default:
		return opt, fmt.Errorf("flag -unit: %q is not a unit; use mm or inch", p.unit)
	}
	if p.cylinder != "" {
		var names []string
		opt.Cylinder = -1
		for i, c := range s.Cylinders {
			names = append(names, c.Name)
			if strings.EqualFold(c.Name, p.cylinder) {
				opt.Cylinder = i
			}
		}
		if opt.Cylinder < 0 {
			return opt, fmt.Errorf("flag -cylinder: this session has no cylinder %q (it has %s)", p.cylinder, strings.Join(names, ", "))
		}
	}
	return opt, nil
}

// load reads the session file at path and the plan options for it.
func (p *planFlags) load(path string) (*session.Session, plan.Options, error) {
	s, err := session.ReadFile(path)
	if err != nil {
		return nil, plan.Options{}, err
	}
	opt, err := p.options(s)
	return s, opt, err
}

// checkSession runs the checks the app runs before its plan: it writes the
// session's warnings (Session.Check) and what weakens the plan of cylinder
// cyl (Session.Readiness) to stderr, and refuses, with every reason, a
// cylinder whose readings block a plan. Each line is "field: sentence",
// the field as the file names it.
func checkSession(s *session.Session, cyl int, stderr io.Writer) error {
	for _, w := range s.Check() {
		fmt.Fprintf(stderr, "evenbeat: warning: %s\n", w)
	}
	var blocking []string
	for _, p := range s.Readiness(cyl) {
		if p.Blocking {
			blocking = append(blocking, p.String())
		} else {
			fmt.Fprintf(stderr, "evenbeat: note: %s\n", p)
		}
	}
	if len(blocking) > 0 {
		return fmt.Errorf("no plan for the %s cylinder until these are put right:\n  %s", s.Cylinders[cyl].Name, strings.Join(blocking, "\n  "))
	}
	return nil
}

// limitMemory sets a soft memory limit for the file commands, unless
// GOMEMLIMIT is set: the garbage collector then works harder as the heap
// nears it instead of letting the heap grow to twice what is live, so
// reading the largest session file (16 MB) stays near 300 MB. It never
// refuses memory.
func limitMemory() {
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(256 << 20)
	}
}

// displayUnit is the unit the plan's words use: the flag's, else the session's.
func displayUnit(opt plan.Options, s *session.Session) session.Unit {
	if opt.Unit != "" {
		return opt.Unit
	}
	return s.DisplayUnit
}

// oneFile parses flags and expects exactly one file argument, with the
// flags before or after it.
func oneFile(fs *flag.FlagSet, args []string, what string) (string, error) {
	files, err := parseAnyOrder(fs, args)
	if err != nil {
		return "", fmt.Errorf("%s: %w", fs.Name(), err)
	}
	switch len(files) {
	case 1:
		return files[0], nil
	case 0:
		return "", fmt.Errorf("%s needs one %s file, e.g. evenbeat %s testdata/%s (flags: %s)",
			fs.Name(), what, fs.Name(), exampleFile[fs.Name()], flagNames(fs))
	}
	return "", fmt.Errorf("%s reads one %s file, but %q follows %q; give one file, with flags before or after it (flags: %s)",
		fs.Name(), what, files[1], files[0], flagNames(fs))
}

// parseAnyOrder parses the flags among args wherever they stand, before,
// between or after the other arguments (`plan FILE -json` as well as
// `plan -json FILE`), and returns the other arguments in order. The flag
// package stops at the first non-flag, so parsing starts again after each;
// "--" ends the flags.
func parseAnyOrder(fs *flag.FlagSet, args []string) ([]string, error) {
	var others []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, err
		}
		rest := fs.Args()
		if n := len(args) - len(rest); n > 0 && args[n-1] == "--" {
			return append(others, rest...), nil
		}
		if len(rest) == 0 {
			return others, nil
		}
		others = append(others, rest[0])
		args = rest[1:]
	}
}

var exampleFile = map[string]string{
	"plan":   "sessions/brackenfold-stephenson.json",
	"report": "sessions/brackenfold-stephenson.json",
	"events": "engines/brackenfold-walschaerts.json",
}

// runPlan is `evenbeat plan [flags] SESSION.json`: the plan as text, or as
// JSON with -json.
func runPlan(args []string, stdout, stderr io.Writer) error {
	limitMemory()
	fs := flag.NewFlagSet("plan", flag.ContinueOnError)
	fs.SetOutput(stderr)
	asJSON := fs.Bool("json", false, "write JSON (signed amounts in mm or degrees, sign conventions beside them)")
	var pf planFlags
	pf.register(fs)
	path, err := oneFile(fs, args, "session")
	if err != nil {
		return err
	}
	s, opt, err := pf.load(path)
	if err != nil {
		return err
	}
	writeDerived(stderr, s.Engine, nil)
	if err := checkSession(s, opt.Cylinder, stderr); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	p, err := plan.Make(s, opt)
	if err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	return buffered(stdout, func(w io.Writer) error {
		if *asJSON {
			return plan.WriteJSON(w, p, displayUnit(opt, s))
		}
		if err := plan.WriteText(w, p, displayUnit(opt, s)); err != nil {
			return err
		}
		if len(s.Cylinders) < 2 {
			return nil
		}
		return writeWholeEngine(w, s, p, opt)
	})
}

// runEvents is `evenbeat events [-json] ENGINE.json`: the event table of an
// engine file (or of the engine inside a session file).
func runEvents(args []string, stdout, stderr io.Writer) error {
	limitMemory()
	fs := flag.NewFlagSet("events", flag.ContinueOnError)
	fs.SetOutput(stderr)
	asJSON := fs.Bool("json", false, "write JSON")
	path, err := oneFile(fs, args, "engine")
	if err != nil {
		return err
	}
	spec, leftOut, err := readEngine(path)
	if err != nil {
		return err
	}
	writeDerived(stderr, spec, leftOut)
	for _, w := range spec.Warnings() {
		fmt.Fprintf(stderr, "evenbeat: warning: %s\n", w)
	}
	return buffered(stdout, func(w io.Writer) error {
		if *asJSON {
			return plan.WriteEventsJSON(w, spec)
		}
		if err := plan.WriteEventsText(w, spec); err != nil {
			return err
		}
		// An engine of several cylinders: its beat as drawn, every
		// cylinder alike at its crank angle.
		ps, err := beat.Designed(spec, beat.DefaultSteam)
		if err != nil || len(ps) == 0 {
			return err
		}
		fmt.Fprintln(w, "\nAs drawn, every cylinder alike at its crank angle:")
		return beat.WriteText(w, ps, nil, session.UnitMM)
	})
}

// writeWholeEngine writes the whole engine after a cylinder's plan: every
// other cylinder planned with the same choices, then the beat, the work
// and the quartering. A cylinder without readings is named instead.
func writeWholeEngine(w io.Writer, s *session.Session, main *plan.Plan, opt plan.Options) error {
	plans := make([]*plan.Plan, len(s.Cylinders))
	plans[opt.Cylinder] = main
	for i, c := range s.Cylinders {
		if i == opt.Cylinder {
			continue
		}
		if len(c.Rounds) == 0 {
			_, err := fmt.Fprintf(w, "\nThe whole engine's beat needs readings of every cylinder: the %s cylinder has none yet.\n", c.Name)
			return err
		}
		o := opt
		o.Cylinder, o.Fit = i, plan.FitOptions{}
		p, err := plan.Make(s, o)
		if err != nil {
			_, err = fmt.Fprintf(w, "\nThe whole engine's beat needs a plan of every cylinder: the %s cylinder's: %v\n", c.Name, err)
			return err
		}
		plans[i] = p
	}
	ps, err := beat.FromPlans(s, plans, beat.DefaultSteam)
	if err != nil {
		_, err = fmt.Fprintf(w, "\nThe whole engine's beat cannot be drawn: %v\n", err)
		return err
	}
	qs, _ := beat.Quarterings(s)
	fmt.Fprintln(w)
	return beat.WriteText(w, ps, qs, displayUnit(opt, s))
}

// readEngine reads an engine file; a session file is accepted too, for its
// engine. It returns the keys an engine file left out under its design
// (setting.DecodeEngineFile; none for a session's engine, which the app
// writes whole).
func readEngine(path string) (setting.EngineSpec, []string, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return setting.EngineSpec{}, nil, fmt.Errorf("%s: the file cannot be opened (%v); check its name and the folder it is in", path, err)
	}
	if strings.Contains(string(data), `"evenbeat-session"`) {
		s, err := session.Decode(strings.NewReader(string(data)))
		if err != nil {
			return setting.EngineSpec{}, nil, fmt.Errorf("%s: %w", path, err)
		}
		return s.Engine, nil, nil
	}
	spec, leftOut, err := setting.DecodeEngineFile(strings.NewReader(string(data)))
	if err != nil {
		return setting.EngineSpec{}, nil, fmt.Errorf("%s: %w", path, err)
	}
	return spec, leftOut, nil
}

// writeDerived writes to stderr what the engine's design gave it, so that
// no value is taken silently: each part derived from the design (not
// measured), with its value, then the keys the engine file left out and
// took at their usual value (leftOut less the derived parts). Nothing
// for an engine without a design.
func writeDerived(stderr io.Writer, spec setting.EngineSpec, leftOut []string) {
	d := spec.Design
	if d == nil {
		return
	}
	if len(d.Derived) > 0 {
		fmt.Fprintf(stderr, "evenbeat: note: derived from the design (lead %s mm), not measured; give a value in the file to keep it as measured:\n", trimNumber(d.Lead, 3))
		for _, key := range d.Derived {
			if v := spec.Number(key); v != nil {
				fmt.Fprintf(stderr, "evenbeat: derived: %s = %s %s\n", key, trimNumber(*v, 3), keyUnit(key))
			}
		}
	}
	var usual []string
	for _, key := range leftOut {
		if !slices.Contains(d.Derived, key) {
			usual = append(usual, key)
		}
	}
	if len(usual) > 0 {
		fmt.Fprintln(stderr, "evenbeat: note: left out of the file, so taken at their usual value:")
		for _, key := range usual {
			fmt.Fprintf(stderr, "evenbeat: usual: %s = %s\n", key, usualWords(key, spec))
		}
	}
}

// usualWords says what a key of setting.DefaultKeys left out is taken as.
func usualWords(key string, spec setting.EngineSpec) string {
	switch key[strings.LastIndex(key, ".")+1:] {
	case "inclination":
		return "0 degrees (the cylinder level)"
	case "offset":
		return "0 mm (the cylinder's line through the axle)"
	case "guide":
		return "0 mm (the valve rod's line level with the axle)"
	case "exhaust_lap":
		return "0 mm (line and line)"
	case "admission":
		return spec.Valve.Admission.String() + " (the valve's)"
	case "crossed":
		return "false (open rods)"
	case "slip":
		return "false (a fixed eccentric)"
	case "suspension":
		return "(0, 0) (the link hung by its middle)"
	case "invented":
		return "false"
	}
	return "0"
}

// keyUnit is the unit of the number at an engine-file key: degrees for an
// angle, else mm.
func keyUnit(key string) string {
	for _, angle := range []string{"advance", "angle", "arm_swing", "inclination"} {
		if strings.HasSuffix(key, angle) {
			return "degrees"
		}
	}
	return "mm"
}

// trimNumber writes v with at most places decimals, trailing zeros
// dropped.
func trimNumber(v float64, places int) string {
	s := strconv.FormatFloat(v, 'f', places, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimSuffix(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

// runReport is `evenbeat report [flags] SESSION.json -o report.png` (or
// report.pdf: A4 pages).
func runReport(args []string, stdout, stderr io.Writer) error {
	limitMemory()
	fs := flag.NewFlagSet("report", flag.ContinueOnError)
	fs.SetOutput(stderr)
	out := fs.String("o", "", "file to write (required): report.pdf for A4 pages, report.png for one tall picture")
	dark := fs.Bool("dark", false, "dark theme")
	var pf planFlags
	pf.register(fs)
	path, err := oneFile(fs, args, "session")
	if err != nil {
		return err
	}
	if *out == "" {
		return errors.New("report needs a file to write: flag -o report.png")
	}
	s, opt, err := pf.load(path)
	if err != nil {
		return err
	}
	if err := checkSession(s, opt.Cylinder, stderr); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	tmp := *out + ".part"
	f, err := os.Create(tmp)
	if err != nil {
		return fmt.Errorf("flag -o: %w", err)
	}
	w := bufio.NewWriter(f)
	if strings.EqualFold(filepath.Ext(*out), ".pdf") {
		err = report.WritePDF(w, s, report.Options{Plan: opt})
	} else {
		err = report.WritePNG(w, s, report.Options{Plan: opt, Dark: *dark})
	}
	if err == nil {
		err = w.Flush()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(tmp, *out)
	}
	if err != nil {
		os.Remove(tmp)
		return fmt.Errorf("%s: %w", path, err)
	}
	fmt.Fprintf(stdout, "report written to %s\n", *out)
	return nil
}

// buffered writes through a buffer so a failure leaves no half output on
// stdout.
func buffered(stdout io.Writer, write func(io.Writer) error) error {
	var b strings.Builder
	if err := write(&b); err != nil {
		return err
	}
	_, err := io.WriteString(stdout, b.String())
	return err
}
