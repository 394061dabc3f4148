package session

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"evenbeat/setting"
)

// Decode reads a session file and validates every value. A bad value gives
// a *setting.Error whose Field is the JSON-path-like name of the value
// ("cylinders[1].rounds[0].sweeps[2].readings[5].gauge_mm") and whose
// Message is a full sentence starting with that name. A file of another
// format or of a newer version is refused before anything else is read.
// Empty lists decode as nil. Implausible but possible values are not
// errors: see Check.
func Decode(r io.Reader) (*Session, error) {
	root, _, err := readTree(r)
	if err != nil {
		return nil, err
	}
	version, err := checkHeader(root)
	if err != nil {
		return nil, err
	}
	d := &decoder{version: version}
	s := d.session(root)
	if d.err != nil {
		return nil, d.err
	}
	return s, nil
}

// checkHeader refuses files that are not sessions or are of another version,
// before any other field is looked at; it returns the file's version.
func checkHeader(root *node) (int, error) {
	if root.kind != nodeObject {
		return 0, userError("", fmt.Sprintf("A session file is one JSON object {...}; this file holds %s.", root.describe()))
	}
	f := root.get("format")
	switch {
	case f == nil:
		return 0, userError("format", "This file has no \"format\" field, so it is not an Evenbeat session file (one starts with \"format\": \"evenbeat-session\").")
	case f.kind != nodeString:
		return 0, userError("format", fmt.Sprintf("The format must be the text \"evenbeat-session\", got %s.", f.describe()))
	case f.text != Format:
		if strings.HasPrefix(f.text, "evenbeat-") {
			kind := strings.TrimPrefix(f.text, "evenbeat-")
			return 0, userError("format", fmt.Sprintf("This is an Evenbeat %s file, not a session; open it where %s files are read.", kind, kind))
		}
		return 0, userError("format", fmt.Sprintf("The format %q is not one Evenbeat reads; a session file says \"evenbeat-session\".", f.text))
	}
	v := root.get("version")
	if v == nil {
		return 0, userError("version", "The file has no \"version\" field; a session file says which version of the format it uses (\"version\": 1).")
	}
	n, err := strconv.Atoi(v.text)
	if v.kind != nodeNumber || err != nil {
		return 0, userError("version", fmt.Sprintf("The version must be a whole number, got %s.", v.describe()))
	}
	switch {
	case n > Version:
		return 0, userError("version", fmt.Sprintf("This file was written by a newer Evenbeat (session version %d); this version reads versions 1 to %d. Update the app.", n, Version))
	case n < 1:
		return 0, userError("version", fmt.Sprintf("Version %d is not a session version; versions start at 1.", n))
	}
	return n, nil
}

// decoder turns the tree into a Session, keeping the first error.
type decoder struct {
	err *setting.Error
	// version is the file's version.
	version int
	// info holds the engine's facts once the engine object is read (the
	// cylinder's own, with its differences, while its rounds are read).
	info specInfo
}

// fail records the first error.
func (d *decoder) fail(field, format string, args ...any) {
	if d.err == nil {
		d.err = userError(field, sentence(field, fmt.Sprintf(format, args...)))
	}
}

// obj reads one JSON object, checking that it has no keys but allowed ones.
type obj struct {
	d    *decoder
	n    *node
	path string
}

// object opens n as an object allowing only the given keys. On error the
// returned obj reads nothing.
func (d *decoder) object(n *node, path, what string, allowed ...string) obj {
	o := obj{d: d, path: path}
	if d.err != nil {
		return o
	}
	if n.kind != nodeObject {
		d.fail(path, "must be %s, written {...}, got %s.", what, n.describe())
		return o
	}
	for _, k := range n.keys {
		if !contains(allowed, k) {
			if near := setting.NearestKey(k, allowed); near != "" {
				d.fail(joinPath(path, k), "The key %q is not known in %s; did you mean %q? Correct its name.", k, what, near)
			} else {
				d.fail(joinPath(path, k), "The key %q is not part of %s in a version %d session file; remove it or correct its name.", k, what, d.version)
			}
			return o
		}
	}
	o.n = n
	return o
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// field returns the value of key, or nil; when required and missing it
// records an error saying what the field is.
func (o obj) field(key string, required bool, what string) *node {
	if o.n == nil || o.d.err != nil {
		return nil
	}
	v := o.n.get(key)
	if v == nil && required {
		o.d.fail(joinPath(o.path, key), "is missing; give %s.", what)
	}
	return v
}

// has reports whether key is present.
func (o obj) has(key string) bool {
	return o.n != nil && o.n.get(key) != nil
}

// text reads a string field.
func (o obj) text(key string, required bool, what string) string {
	v := o.field(key, required, what)
	if v == nil {
		return ""
	}
	if v.kind != nodeString {
		o.d.fail(joinPath(o.path, key), "must be text in quotes (%s), got %s.", what, v.describe())
		return ""
	}
	return v.text
}

// choice reads a string field that must be one of the given values.
func (o obj) choice(key string, required bool, what string, values ...string) string {
	s := o.text(key, required, what)
	if o.d.err != nil || (s == "" && !o.has(key)) {
		return ""
	}
	if !contains(values, s) {
		o.d.fail(joinPath(o.path, key), "must be one of %s (%s), got %q.", quoteList(values), what, s)
		return ""
	}
	return s
}

func quoteList(values []string) string {
	q := make([]string, len(values))
	for i, v := range values {
		q[i] = strconv.Quote(v)
	}
	if len(q) == 1 {
		return q[0]
	}
	return strings.Join(q[:len(q)-1], ", ") + " or " + q[len(q)-1]
}

// flag reads a boolean field.
func (o obj) flag(key string) bool {
	v := o.field(key, false, "")
	if v == nil {
		return false
	}
	if v.kind != nodeBool {
		o.d.fail(joinPath(o.path, key), "must be true or false, got %s.", v.describe())
		return false
	}
	return v.b
}

// number reads a finite number field.
func (o obj) number(key string, required bool, what string) float64 {
	v := o.field(key, required, what)
	if v == nil {
		return 0
	}
	return o.d.number(v, joinPath(o.path, key), what)
}

// number reads a finite number.
func (d *decoder) number(v *node, path, what string) float64 {
	if d.err != nil {
		return 0
	}
	if v.kind != nodeNumber {
		d.fail(path, "must be a number (%s), got %s.", what, v.describe())
		return 0
	}
	f, err := strconv.ParseFloat(v.text, 64)
	if err != nil || math.IsNaN(f) || math.IsInf(f, 0) {
		d.fail(path, "The number %s is too large to use (%s).", v.text, what)
		return 0
	}
	return f
}

// positive reads a number that must be above zero.
func (o obj) positive(key string, required bool, what string) float64 {
	f := o.number(key, required, what)
	if o.d.err == nil && o.has(key) && !(f > 0) {
		o.d.fail(joinPath(o.path, key), "must be more than zero (%s), got %s.", what, fmtNum(f))
	}
	return f
}

// bounded reads a number that must lie within [lo, hi].
func (o obj) bounded(key string, required bool, what string, lo, hi float64) float64 {
	f := o.number(key, required, what)
	if o.d.err == nil && o.has(key) && (f < lo || f > hi) {
		o.d.fail(joinPath(o.path, key), "must be between %s and %s (%s), got %s.", fmtNum(lo), fmtNum(hi), what, fmtNum(f))
	}
	return f
}

// list reads an array field; empty lists give nil.
func (o obj) list(key string, required bool, what string) []*node {
	v := o.field(key, required, what)
	if v == nil {
		return nil
	}
	if v.kind != nodeArray {
		o.d.fail(joinPath(o.path, key), "must be a list [...] of %s, got %s.", what, v.describe())
		return nil
	}
	if n, most, fix := len(v.elems), 0, ""; o.d.err == nil {
		switch key {
		case "cylinders":
			most, fix = setting.MaxCylinders, "engines have one to four; remove the others"
		case "rounds":
			most, fix = MaxRounds, "start a new session for the next rounds and keep this file as the record"
		case "readings":
			most, fix = MaxSweepReadings, "one every half degree; a reading every 10 to 30 degrees is plenty"
		case "adjustments_before":
			most, fix = MaxChanges, "record the changes made since the round before"
		case "dead_centre_readings", "cut_offs", "feeler_openings":
			most, fix = MaxRoundReadings, "split them into rounds, one for each set of adjustments"
		case "engine_changes":
			most, fix = MaxEngineChanges, "keep the most recent; the engine as it is now is in \"engine\""
		}
		if most > 0 && n > most {
			o.d.fail(joinPath(o.path, key), "The list of %s holds %d; a session file holds at most %d (%s).", what, n, most, fix)
			return nil
		}
	}
	return v.elems
}

// Bounds on a session file's lists: generous for any engine, they keep
// every command fast and small whatever the file (format.md states them).
const (
	// MaxRounds bounds the rounds of one cylinder: a setting takes a few.
	MaxRounds = 200
	// MaxRoundReadings bounds one round's readings: dead-centre readings,
	// sweep readings, cut-offs and feeler openings together.
	MaxRoundReadings = 2000
	// MaxSweepReadings bounds one sweep: a reading every half degree.
	MaxSweepReadings = 720
	// MaxChanges bounds the changes recorded before one round.
	MaxChanges = 50
)

// oneOf reads exactly one of the given keys, which must be present; it
// returns the key used.
func (o obj) oneOf(what string, keys ...string) string {
	if o.n == nil || o.d.err != nil {
		return ""
	}
	var found []string
	for _, k := range keys {
		if o.has(k) {
			found = append(found, k)
		}
	}
	switch len(found) {
	case 0:
		o.d.fail(o.path, "Give %s as one of %s.", what, quoteList(keys))
		return ""
	case 1:
		return found[0]
	default:
		o.d.fail(joinPath(o.path, found[1]), "Give %s only once: %q and %q are both here; keep one.", what, found[0], found[1])
		return ""
	}
}

// Reasonable bounds, to catch typing slips rather than judge the engine.
const (
	maxGaugeMM = 1000   // a gauge reading further from zero is a slip
	maxMark    = 100000 // mm round a tyre or degrees from the datum
	maxLength  = 100000 // mm
)

func (d *decoder) session(root *node) *Session {
	keys := []string{"format", "version", "name", "invented", "note", "display_unit", "engine", "measuring", "adjustments", "plan_aims", "cylinders", "engine_changes"}
	if d.version < 2 && root.get("plan_aims") != nil {
		d.fail("plan_aims", "Plan aims are part of session files from version 2 on, and this file says it is version %d; change its \"version\" to 2, or remove \"plan_aims\".", d.version)
	}
	o := d.object(root, "", "a session", keys...)
	s := &Session{}
	s.Name = o.text("name", false, "the session's title")
	s.Invented = o.flag("invented")
	s.Note = o.text("note", false, "a note")
	s.DisplayUnit = Unit(o.choice("display_unit", true, "the unit lengths are shown in", string(UnitMM), string(UnitInch)))
	engine := o.field("engine", true, "the engine object: crank geometry, valve and ports, gear and notches")
	if engine != nil {
		s.Engine, d.info = d.engine(engine, "engine")
	}
	if m := o.field("measuring", true, "the measuring set-up: wheel diameter, gauge resolution and direction, mark error"); m != nil {
		s.Measuring = d.measuring(m, "measuring")
	}
	for i, a := range o.list("adjustments", false, "adjustments") {
		s.Adjustments = append(s.Adjustments, d.adjustment(a, fmt.Sprintf("adjustments[%d]", i)))
		for j := 0; j < i && d.err == nil; j++ {
			if s.Adjustments[j].Kind == s.Adjustments[i].Kind && s.Adjustments[j].Eccentric == s.Adjustments[i].Eccentric {
				d.fail(fmt.Sprintf("adjustments[%d]", i), "This adjustment is listed twice (also adjustments[%d]); keep one.", j)
			}
		}
	}
	if a := o.field("plan_aims", false, ""); a != nil {
		s.Aims = d.aims(a, "plan_aims")
	}
	cyls := o.list("cylinders", true, "cylinders")
	if d.err == nil && len(cyls) == 0 {
		d.fail("cylinders", "The list of cylinders is empty; a session has at least one cylinder.")
	}
	for i, c := range cyls {
		cy := d.cylinder(c, fmt.Sprintf("cylinders[%d]", i), s, engine)
		for j := 0; j < i && d.err == nil; j++ {
			if strings.EqualFold(s.Cylinders[j].Name, cy.Name) {
				d.fail(fmt.Sprintf("cylinders[%d].name", i), "The name %q is already used by cylinders[%d]; each cylinder needs its own name.", cy.Name, j)
			}
		}
		if d.err == nil && len(d.info.cylinders) > 0 && !contains(d.info.cylinders, cy.Name) {
			d.fail(fmt.Sprintf("cylinders[%d].name", i), "The engine has no cylinder called %q; its cylinders are %s.", cy.Name, quoteList(d.info.cylinders))
		}
		s.Cylinders = append(s.Cylinders, cy)
	}
	for i, c := range o.list("engine_changes", false, "records of the engine's history") {
		s.EngineChanges = append(s.EngineChanges, d.engineChange(c, fmt.Sprintf("engine_changes[%d]", i)))
	}
	if d.err != nil {
		return nil
	}
	return s
}

// priorities lists the plan's priorities in the order documented.
var priorities = []string{string(PriorityLeads), string(PriorityCutOffs), string(PriorityBalanced)}

func (d *decoder) aims(n *node, path string) PlanAims {
	o := d.object(n, path, "the plan's aims", "priority", "target_lead_mm", "lead_share", "running_notch")
	var a PlanAims
	a.Priority = Priority(o.choice("priority", false, "what the plan makes equal, front against back", priorities...))
	if o.has("target_lead_mm") {
		t := o.bounded("target_lead_mm", true, "the lead wanted at both ends in full gear, in mm", MinTargetLeadMM, MaxTargetLeadMM)
		a.TargetLeadMM = &t
	}
	if o.has("lead_share") {
		a.LeadShare = o.bounded("lead_share", true, "the share of the balance given to leads", 0, 1)
		switch {
		case d.err != nil:
		case a.LeadShare == 0:
			d.fail(path+".lead_share", "must be more than zero (the share of the balance given to leads); leave it out for one half, or choose the priority \"cut-offs\".")
		case a.Priority != PriorityBalanced:
			d.fail(path+".lead_share", "The share given to leads is used only when the priority is \"balanced\"; set \"priority\": \"balanced\" or remove \"lead_share\".")
		}
	}
	if o.has("running_notch") {
		a.RunningNotch = o.text("running_notch", true, "the notch whose cut-offs are made equal")
		if ok := runningNotches(d.info.notchOrder); d.err == nil && !contains(ok, a.RunningNotch) {
			d.fail(path+".running_notch", "The notch %q is not one the plan works in; use one of %s.", a.RunningNotch, quoteList(ok))
		}
	}
	return a
}

// runningNotches lists the notches a plan may make its cut-offs equal in:
// full forward and the engine's own notches, of the reverser positions
// named (in the reverser's order).
func runningNotches(names []string) []string {
	ok := []string{FullForward}
	for _, n := range names {
		if n != FullForward && n != MidGear && n != FullBack {
			ok = append(ok, n)
		}
	}
	return ok
}

func (d *decoder) measuring(n *node, path string) Measuring {
	o := d.object(n, path, "the measuring set-up", "wheel_diameter_mm", "gauge_resolution_mm", "gauge_increases_toward", "mark_error_tyre_mm", "mark_error_deg", "datums_matched")
	var m Measuring
	m.WheelDiameterMM = o.positive("wheel_diameter_mm", true, "the tyre diameter where the marks are measured, in mm")
	if d.err == nil && (m.WheelDiameterMM > maxLength || m.WheelDiameterMM < 1) {
		d.fail(path+".wheel_diameter_mm", "The wheel diameter %s mm is not the size of any wheel; give the tyre diameter in mm.", fmtNum(m.WheelDiameterMM))
	}
	m.GaugeResolutionMM = o.positive("gauge_resolution_mm", true, "the smallest division of the dial gauge, in mm")
	if d.err == nil && m.GaugeResolutionMM > 10 {
		d.fail(path+".gauge_resolution_mm", "The gauge resolution %s mm is not a dial-gauge division; give it in mm (0.01 for a metric gauge, 0.0254 for a thou gauge).", fmtNum(m.GaugeResolutionMM))
	}
	m.GaugeIncreases = End(o.choice("gauge_increases_toward", true, "which way the valve moves when the gauge reading grows", string(Front), string(Back)))
	m.DatumsMatched = o.flag("datums_matched")
	switch o.oneOf("the error of one mark round the wheel", "mark_error_tyre_mm", "mark_error_deg") {
	case "mark_error_tyre_mm":
		m.MarkError = Mark{TyreMM, o.positive("mark_error_tyre_mm", true, "the error of one tyre mark, in mm round the tyre")}
		if half := math.Pi * m.WheelDiameterMM / 2; d.err == nil && m.MarkError.Value > half {
			d.fail(path+".mark_error_tyre_mm", "The error of one tyre mark (%s mm) is more than half the way round the tyre (%s mm); give it in mm round the tyre.", fmtNum(m.MarkError.Value), fmtNum(math.Round(half)))
		}
	case "mark_error_deg":
		m.MarkError = Mark{Deg, o.bounded("mark_error_deg", true, "the error of one degree mark", 0, 90)}
		if d.err == nil && m.MarkError.Value == 0 {
			d.fail(path+".mark_error_deg", "must be more than zero (the error of one degree mark); no mark is perfect.")
		}
	}
	return m
}

// adjustmentKinds lists the kinds in the order documented.
var adjustmentKinds = []string{string(ValveOnSpindle), string(EccentricAngle), string(EccentricRodLength), string(ReturnCrankAngle), string(RadiusRodLength), string(LiftingLinkLength)}

func (d *decoder) adjustment(n *node, path string) Adjustment {
	o := d.object(n, path, "an adjustment", "kind", "eccentric", "min_mm", "max_mm", "min_deg", "max_deg", "thread", "sheave_diameter_mm", "note")
	var a Adjustment
	a.Kind = AdjustmentKind(o.choice("kind", true, "what can be adjusted", adjustmentKinds...))
	a.Eccentric = d.eccentric(o, a.Kind)
	unit, other := "mm", "deg"
	if a.Kind.Angular() {
		unit, other = "deg", "mm"
	}
	for _, k := range []string{"min_", "max_"} {
		if o.has(k+other) && d.err == nil {
			d.fail(joinPath(path, k+other), "A %s adjustment is set in %s; use %q.", a.Kind, unitWord(unit), k+unit)
		}
	}
	a.Min = o.bounded("min_"+unit, true, "the largest change the other way, "+unitWord(unit), -maxLength, 0)
	a.Max = o.bounded("max_"+unit, true, "the largest change this way, "+unitWord(unit), 0, maxLength)
	if d.err == nil && a.Min == 0 && a.Max == 0 {
		d.fail(path, "Both min_%s and max_%s are zero, so nothing can be changed; remove the adjustment or give its range.", unit, unit)
	}
	if t := o.field("thread", false, ""); t != nil {
		if a.Kind.Angular() {
			d.fail(path+".thread", "This adjustment (%s) is not made on a thread; remove \"thread\".", a.Kind)
		}
		a.Thread = d.thread(t, path+".thread")
	}
	if a.Kind == EccentricAngle {
		a.SheaveDiameterMM = o.positive("sheave_diameter_mm", true, "the eccentric sheave's diameter in mm, to measure the turn round its rim")
		if d.err == nil && a.SheaveDiameterMM > maxLength {
			d.fail(path+".sheave_diameter_mm", "The sheave diameter %s mm is larger than any sheave.", fmtNum(a.SheaveDiameterMM))
		}
	} else if o.has("sheave_diameter_mm") && d.err == nil {
		d.fail(path+".sheave_diameter_mm", "Only an eccentric_angle adjustment has a sheave diameter; remove it here.")
	}
	a.Note = o.text("note", false, "a note")
	if d.err == nil {
		if msg := d.info.allows(a.Kind, a.Eccentric); msg != "" {
			d.fail(path+".kind", "%s", msg)
		}
	}
	return a
}

func unitWord(unit string) string {
	if unit == "deg" {
		return "degrees"
	}
	return "mm"
}

// eccentric reads the "eccentric" field of an adjustment or change.
func (d *decoder) eccentric(o obj, kind AdjustmentKind) Eccentric {
	needs := (kind == EccentricAngle || kind == EccentricRodLength) && d.info.twoEccentrics
	if !needs {
		if o.has("eccentric") && d.err == nil {
			d.fail(joinPath(o.path, "eccentric"), "This engine's %s has no choice of eccentric here; remove \"eccentric\".", d.info.gearName)
		}
		return ""
	}
	return Eccentric(o.choice("eccentric", true, "which eccentric", string(ForwardEccentric), string(BackwardEccentric)))
}

func (d *decoder) thread(n *node, path string) Thread {
	o := d.object(n, path, "a thread", "pitch_mm", "tpi", "flats_per_turn")
	var t Thread
	switch o.oneOf("the thread's pitch", "pitch_mm", "tpi") {
	case "pitch_mm":
		t.PitchMM = o.bounded("pitch_mm", true, "the thread pitch in mm", 0, 100)
		if d.err == nil && t.PitchMM == 0 {
			d.fail(path+".pitch_mm", "must be more than zero (the thread pitch in mm).")
		}
	case "tpi":
		t.TPI = o.bounded("tpi", true, "threads per inch", 0, 1000)
		if d.err == nil && t.TPI == 0 {
			d.fail(path+".tpi", "must be more than zero (threads per inch).")
		}
	}
	f := o.number("flats_per_turn", true, "how many steps a turn is divided into: 6 for a hex nut, 2 for a fork end")
	if d.err == nil && (f != math.Trunc(f) || f < 1 || f > 360) {
		d.fail(path+".flats_per_turn", "must be a whole number from 1 to 360 (6 for a hex nut, 4 for a square nut, 2 for a fork end), got %s.", fmtNum(f))
	}
	t.FlatsPerTurn = int(f)
	return t
}

func (d *decoder) cylinder(n *node, path string, s *Session, engine *node) Cylinder {
	o := d.object(n, path, "a cylinder", "name", "differences", "dead_centres", "rounds", "note")
	var c Cylinder
	c.Name = strings.TrimSpace(o.text("name", true, "the cylinder's name, such as \"left\" or \"right\""))
	if d.err == nil && c.Name == "" {
		d.fail(path+".name", "is empty; give the cylinder a name such as \"left\" or \"right\".")
	}
	info := d.info
	if p := o.field("differences", false, ""); p != nil && d.err == nil {
		if p.kind != nodeObject {
			d.fail(path+".differences", "must be an object {...} holding the engine fields that differ for this cylinder, got %s.", p.describe())
			return c
		}
		if len(p.keys) > 0 {
			var buf bytes.Buffer
			p.writeCompact(&buf)
			patch, err := setting.ReadEnginePatch(buf.Bytes())
			if err != nil {
				d.engineError(path+".differences", err)
				return c
			}
			c.Differences = patch
			if engine != nil {
				if spec, err := patch.Apply(s.Engine); err != nil {
					d.engineError(path+".differences", err)
				} else {
					info = infoOf(spec)
				}
			}
		}
	}
	for i, dc := range o.list("dead_centres", false, "dead centres") {
		x := d.deadCentre(dc, fmt.Sprintf("%s.dead_centres[%d]", path, i))
		for j, y := range c.DeadCentres {
			if d.err == nil && x.End == y.End && x.Direction == y.Direction {
				d.fail(fmt.Sprintf("%s.dead_centres[%d]", path, i), "The %s dead centre turning %s is given twice (also dead_centres[%d]); keep the better one.", x.End, x.Direction, j)
			}
		}
		c.DeadCentres = append(c.DeadCentres, x)
	}
	saved := d.info
	d.info = info
	for i, r := range o.list("rounds", false, "rounds of readings") {
		c.Rounds = append(c.Rounds, d.round(r, fmt.Sprintf("%s.rounds[%d]", path, i), s))
	}
	d.info = saved
	c.Note = o.text("note", false, "a note")
	return c
}

func (d *decoder) deadCentre(n *node, path string) DeadCentre {
	o := d.object(n, path, "a dead centre", "end", "direction", "marks_tyre_mm", "marks_deg", "note")
	var x DeadCentre
	x.End = End(o.choice("end", true, "which dead centre", string(Front), string(Back)))
	x.Direction = Direction(o.choice("direction", true, "the way the wheel was turned", string(Forward), string(Backward)))
	key := o.oneOf("the two bracketing marks", "marks_tyre_mm", "marks_deg")
	if key == "" {
		return x
	}
	x.Scale = Scale(strings.TrimPrefix(key, "marks_"))
	marks := o.list(key, true, "two marks")
	if d.err == nil && len(marks) != 2 {
		d.fail(path+"."+key, "must hold exactly two marks, the one before dead centre and the one after, got %d.", len(marks))
		return x
	}
	if d.err == nil {
		x.First = d.mark(marks[0], path+"."+key+"[0]")
		x.Second = d.mark(marks[1], path+"."+key+"[1]")
	}
	x.Note = o.text("note", false, "a note")
	return x
}

// mark reads a mark round the wheel.
func (d *decoder) mark(n *node, path string) float64 {
	f := d.number(n, path, "a mark round the wheel")
	if d.err == nil && math.Abs(f) > maxMark {
		d.fail(path, "The mark %s is too far from the datum to be a mark round the wheel; check the number.", fmtNum(f))
	}
	return f
}

func (d *decoder) round(n *node, path string, s *Session) Round {
	o := d.object(n, path, "a round of readings", "date", "adjustments_before", "port_marks", "laps", "dead_centre_readings", "sweeps", "cut_offs", "feeler_openings", "note")
	var r Round
	r.Date = o.text("date", true, "the date the readings were taken, as \"2026-11-28\"")
	if d.err == nil {
		if _, err := time.Parse("2006-01-02", r.Date); err != nil {
			if _, err := time.Parse(time.RFC3339, r.Date); err != nil {
				d.fail(path+".date", "The date %q cannot be read; write it as year-month-day, \"2026-11-28\" (or with a time, \"2026-11-28T14:30:00Z\").", r.Date)
			}
		}
	}
	for i, c := range o.list("adjustments_before", false, "changes made before this round") {
		r.AdjustmentsBefore = append(r.AdjustmentsBefore, d.change(c, fmt.Sprintf("%s.adjustments_before[%d]", path, i), s))
	}
	if o.has("port_marks") && o.has("laps") && d.err == nil {
		d.fail(path+".laps", "Give the steam edges once: as \"port_marks\" or as \"laps\", not both.")
	}
	if p := o.field("port_marks", false, ""); p != nil {
		po := d.object(p, path+".port_marks", "the port marks", "front_gauge_mm", "back_gauge_mm", "note")
		r.PortMarks = &PortMarks{
			FrontGaugeMM: d.gauge(po, "front_gauge_mm", "the gauge reading where the front steam edge cracks"),
			BackGaugeMM:  d.gauge(po, "back_gauge_mm", "the gauge reading where the back steam edge cracks"),
			Note:         po.text("note", false, "a note"),
		}
	}
	if p := o.field("laps", false, ""); p != nil {
		lo := d.object(p, path+".laps", "the laps", "front_lap_mm", "back_lap_mm", "centre_gauge_mm", "note")
		r.Laps = &Laps{
			FrontMM:       lo.bounded("front_lap_mm", true, "the steam lap at the front port in mm", -maxGaugeMM, maxGaugeMM),
			BackMM:        lo.bounded("back_lap_mm", true, "the steam lap at the back port in mm", -maxGaugeMM, maxGaugeMM),
			CentreGaugeMM: d.gauge(lo, "centre_gauge_mm", "the gauge reading with the valve central"),
			Note:          lo.text("note", false, "a note"),
		}
	}
	for i, x := range o.list("dead_centre_readings", false, "gauge readings at dead centres") {
		p := fmt.Sprintf("%s.dead_centre_readings[%d]", path, i)
		ro := d.object(x, p, "a dead-centre reading", "end", "reverser", "direction", "gauge_mm", "note")
		r.DeadCentreReadings = append(r.DeadCentreReadings, DeadCentreReading{
			End:       End(ro.choice("end", true, "which dead centre", string(Front), string(Back))),
			Reverser:  d.reverser(ro),
			Direction: d.direction(ro),
			GaugeMM:   d.gauge(ro, "gauge_mm", "the gauge reading"),
			Note:      ro.text("note", false, "a note"),
		})
	}
	for i, x := range o.list("sweeps", false, "sweeps") {
		r.Sweeps = append(r.Sweeps, d.sweep(x, fmt.Sprintf("%s.sweeps[%d]", path, i)))
	}
	for i, x := range o.list("cut_offs", false, "cut-off points") {
		r.CutOffs = append(r.CutOffs, d.cutOff(x, fmt.Sprintf("%s.cut_offs[%d]", path, i)))
	}
	for i, x := range o.list("feeler_openings", false, "feeler openings") {
		r.FeelerOpenings = append(r.FeelerOpenings, d.feeler(x, fmt.Sprintf("%s.feeler_openings[%d]", path, i)))
	}
	if n := r.Readings(); n > MaxRoundReadings && d.err == nil {
		d.fail(path, "This round holds %d readings; a round holds at most %d (dead-centre readings, sweep readings, cut-offs and feeler openings together). Split them into rounds, one for each set of adjustments.", n, MaxRoundReadings)
	}
	r.Note = o.text("note", false, "a note")
	return r
}

func (d *decoder) change(n *node, path string, s *Session) Change {
	o := d.object(n, path, "a change", "kind", "eccentric", "change_mm", "change_deg", "note")
	var c Change
	c.Kind = AdjustmentKind(o.choice("kind", true, "what was adjusted", adjustmentKinds...))
	c.Eccentric = d.eccentric(o, c.Kind)
	unit, other := "change_mm", "change_deg"
	if c.Kind.Angular() {
		unit, other = other, unit
	}
	if o.has(other) && d.err == nil {
		d.fail(path+"."+other, "A %s change is given in %s; use %q.", c.Kind, strings.TrimPrefix(unit, "change_"), unit)
	}
	c.Amount = o.bounded(unit, true, "the signed change made", -maxLength, maxLength)
	c.Note = o.text("note", false, "a note")
	if d.err == nil {
		found := false
		for _, a := range s.Adjustments {
			found = found || (a.Kind == c.Kind && a.Eccentric == c.Eccentric)
		}
		if !found {
			which := string(c.Kind)
			if c.Eccentric != "" {
				which = fmt.Sprintf("%s of the %s eccentric", c.Kind, c.Eccentric)
			}
			d.fail(path+".kind", "The session's \"adjustments\" list has no %s; add it there (with its limits) before recording a change to it.", which)
		}
	}
	return c
}

// gauge reads a dial-gauge reading in mm.
func (d *decoder) gauge(o obj, key, what string) float64 {
	return o.bounded(key, true, what+" in mm", -maxGaugeMM, maxGaugeMM)
}

// direction reads the turning direction of a reading.
func (d *decoder) direction(o obj) Direction {
	return Direction(o.choice("direction", true, "the way the wheel was turned", string(Forward), string(Backward)))
}

// reverser reads a reverser position: a notch name or a number.
func (d *decoder) reverser(o obj) ReverserPosition {
	v := o.field("reverser", true, "the reverser position: a notch name such as \"full forward\", or a number from -1 to 1")
	if v == nil {
		return ReverserPosition{}
	}
	path := joinPath(o.path, "reverser")
	switch v.kind {
	case nodeString:
		if _, ok := d.info.notches[v.text]; !ok {
			d.fail(path, "The notch %q is not one of this engine's; use one of %s, or a number from -1 (full back) to 1 (full forward).", v.text, quoteList(d.info.notchOrder))
			return ReverserPosition{}
		}
		return ReverserPosition{Notch: v.text}
	case nodeNumber:
		f := d.number(v, path, "the reverser position")
		if d.err == nil && (f < -1 || f > 1) {
			d.fail(path, "must be from -1 (full back) through 0 (mid gear) to 1 (full forward), got %s.", fmtNum(f))
		}
		return ReverserPosition{Value: setting.Reverser(f)}
	}
	d.fail(path, "must be a notch name in quotes or a number from -1 to 1, got %s.", v.describe())
	return ReverserPosition{}
}

// at reads a position given by one of the allowed keys: "tyre_mm", "deg",
// "dead_centre" or "crosshead_mm".
func (d *decoder) at(o obj, what string, keys ...string) (key string, m Mark, end End, crosshead float64) {
	key = o.oneOf(what, keys...)
	switch key {
	case "tyre_mm", "deg":
		v := o.field(key, true, "")
		m = Mark{Scale(key), d.mark(v, joinPath(o.path, key))}
	case "dead_centre":
		end = End(o.choice(key, true, "which dead centre the crank was on", string(Front), string(Back)))
	case "crosshead_mm":
		crosshead = o.bounded(key, true, "the crosshead's travel from that end's dead-centre position", 0, maxLength)
		if d.err == nil && crosshead == 0 {
			d.fail(joinPath(o.path, key), "is zero: that is the dead centre itself, not a cut-off; give the crosshead's travel from the dead-centre position in mm.")
		}
		if d.err == nil && d.info.stroke > 0 && crosshead >= d.info.stroke {
			d.fail(joinPath(o.path, key), "The crosshead position %s mm is not less than the stroke (%s mm); give the crosshead's travel from that end's dead-centre position.", fmtNum(crosshead), fmtNum(d.info.stroke))
		}
	}
	return key, m, end, crosshead
}

func (d *decoder) sweep(n *node, path string) Sweep {
	o := d.object(n, path, "a sweep", "reverser", "direction", "readings", "note")
	var w Sweep
	w.Reverser = d.reverser(o)
	w.Direction = d.direction(o)
	readings := o.list("readings", true, "readings round the turn")
	if d.err == nil && len(readings) == 0 {
		d.fail(path+".readings", "The list is empty; a sweep holds readings round the turn.")
	}
	w.Readings = make([]SweepReading, 0, len(readings))
	for i, x := range readings {
		p := fmt.Sprintf("%s.readings[%d]", path, i)
		ro := d.object(x, p, "a sweep reading", "tyre_mm", "deg", "gauge_mm", "note")
		_, m, _, _ := d.at(ro, "where the reading was taken", "tyre_mm", "deg")
		w.Readings = append(w.Readings, SweepReading{At: m, GaugeMM: d.gauge(ro, "gauge_mm", "the gauge reading"), Note: ro.text("note", false, "a note")})
	}
	w.Note = o.text("note", false, "a note")
	return w
}

func (d *decoder) cutOff(n *node, path string) CutOff {
	o := d.object(n, path, "a cut-off point", "end", "reverser", "direction", "tyre_mm", "deg", "crosshead_mm", "note")
	var c CutOff
	c.End = End(o.choice("end", true, "which end's steam port closes", string(Front), string(Back)))
	c.Reverser = d.reverser(o)
	c.Direction = d.direction(o)
	_, c.At, _, c.CrossheadMM = d.at(o, "where the port closed", "tyre_mm", "deg", "crosshead_mm")
	c.Note = o.text("note", false, "a note")
	return c
}

func (d *decoder) feeler(n *node, path string) FeelerOpening {
	o := d.object(n, path, "a feeler opening", "port", "reverser", "direction", "dead_centre", "tyre_mm", "deg", "opening_mm", "note")
	var f FeelerOpening
	f.Port = End(o.choice("port", true, "which steam port was measured", string(Front), string(Back)))
	f.Reverser = d.reverser(o)
	f.Direction = d.direction(o)
	_, f.At, f.DeadCentre, _ = d.at(o, "where the crank was", "dead_centre", "tyre_mm", "deg")
	f.OpeningMM = o.bounded("opening_mm", true, "the port opening in mm (negative when covered)", -maxGaugeMM, maxGaugeMM)
	f.Note = o.text("note", false, "a note")
	return f
}
