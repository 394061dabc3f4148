package ui

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"evenbeat/render"
	"evenbeat/setting/session"
)

// An entry typed on the keypad is judged by the domain's own checks
// before it is taken: the session file's rules (session.Encode reads back
// what it writes, so a value the file cannot hold is refused there), the
// engine's (Validate, at set-up), and the readings' contradictions
// (Session.Readiness, once every value of the record the entry belongs to
// is in). A value that fails is held at its field with one sentence, and
// the session is left as it was; one outside the field's usual range is
// taken on a second Next. The sentences name the field by its label and
// give lengths in the display unit: no key path of the file is shown.

// take sets field f to v (mm, or degrees for an angle) in the current
// session when the value can be, and returns the session file to store
// (nil when it cannot be written for another reason, which saving then
// reports). Otherwise it leaves the session as it was and returns the
// sentence that holds the field.
func (a *App) take(f field, v float64) ([]byte, string) {
	if b, why, ok := a.takeSetUp(f, v); ok {
		return b, why // a set-up value: a draft's, or an edit of the engine (setupflow.go)
	}
	s := a.Session()
	if why := a.cannotBe(f, v); why != "" {
		return nil, f.Label + ": " + why
	}
	readings := a.screen == Measure
	restore := a.snapshot(f)
	// A record that already contradicts itself may be put right one
	// value at a time: only a contradiction this entry makes holds it.
	var before []session.Problem
	if readings && a.recordTaken(f) {
		before = a.contradictions(f)
	}
	f.set(s, v)
	held := func(why string) ([]byte, string) {
		restore()
		a.engine = nil
		return nil, f.Label + ": " + why
	}
	if a.screen == Sizes {
		if why := a.assembles(); why != "" {
			return held(a.inWords(why))
		}
	}
	b, err := a.encode(s)
	if err != nil && !a.cur.unencodable {
		return held(a.valueReason(f, err))
	}
	if readings && len(before) == 0 && a.recordTaken(f) {
		if ps := a.contradictions(f); len(ps) > 0 {
			says := make([]string, len(ps))
			for i, p := range ps {
				says[i] = a.inWords(p.Message)
			}
			return held(strings.Join(says, " "))
		}
	}
	if ask := a.askOnce(f, v); ask != "" {
		restore()
		return nil, ask
	}
	return b, ""
}

// askOnce returns the sentence that asks for a second look at an unusual
// value on its first Next, or "" when v is usual or this is its second.
func (a *App) askOnce(f field, v float64) string {
	if !a.unusual(f, v) || a.confirmed == f.Key+"="+a.text {
		a.confirmed = ""
		return ""
	}
	a.confirmed = f.Key + "=" + a.text
	return a.unusualNote(f) + " Check it; tap Next again to keep it."
}

// cannotBe returns why v cannot be the value of f on its own, or "": a
// steam lap of a round (given as laps) beyond half the valve's travel in
// full gear keeps its port shut all the turn.
func (a *App) cannotBe(f field, v float64) string {
	if !strings.HasSuffix(f.Key, "_lap_mm") {
		return ""
	}
	travel := a.fullTravel()
	if travel <= 0 || v <= travel/2 {
		return ""
	}
	inch := a.unit() == session.UnitInch
	return fmt.Sprintf("%s %s cannot be a steam lap here: the valve travels %s %s in full gear as the gear is set up, and a lap of more than half that (%s %s) would keep the port shut all the turn; the steam edges cannot be where these laps put them. Take the laps and the gauge reading at valve centre again.",
		a.text, a.unitLabel(), formatNumber(travel, inch), a.unitLabel(), formatNumber(travel/2, inch), a.unitLabel())
}

// fullTravel returns the valve's travel in full gear (the larger of
// forward and back) of the engine as set up, from the domain's valve
// events; 0 when the engine cannot be drawn.
func (a *App) fullTravel() float64 {
	s := a.Session()
	if a.engine == nil || a.engineOf != s {
		m, err := render.NewEngineModel(s.Engine)
		if err != nil {
			return 0
		}
		a.engine, a.engineOf = m, s
	}
	travel := 0.0
	for _, p := range a.engine.Positions {
		travel = math.Max(travel, p.NowEvents.ValveTravel())
	}
	return travel
}

// unusual reports whether v lies outside field f's usual range.
func (a *App) unusual(f field, v float64) bool { return v < f.Lo || v > f.Hi }

// unusualNote says that the typed value of f is unusual, and what is
// usual, in the display unit.
func (a *App) unusualNote(f field) string {
	return fmt.Sprintf("%s: %s %s is unusual here (between %s and %s %s is usual).", f.Label, a.text, a.fieldUnit(f),
		a.showValue(f, f.Lo), a.showValue(f, f.Hi), a.fieldUnit(f))
}

// warningAt returns the domain's warning about the value of f just
// taken (Session.Check), in words, or "".
func (a *App) warningAt(f field) string {
	s := a.Session()
	path := f.Path(s)
	for _, w := range s.Check() {
		if (strings.HasPrefix(w.Field, path) || strings.HasPrefix(path, w.Field)) && !(f.open != nil && f.open(s)) {
			return f.Label + ": " + a.inWords(w.Message)
		}
	}
	return ""
}

// snapshot returns what puts back the part of the session that setting
// f can change: a set-up value itself, or the readings of the cylinder's
// dead centres and of the round measured.
func (a *App) snapshot(f field) func() {
	s := a.Session()
	if a.screen != Measure {
		old, ok := f.get(s)
		return func() {
			if ok {
				f.set(s, old)
			}
		}
	}
	ci, ri := a.cyl, a.round
	c := &s.Cylinders[ci]
	dcs := append([]session.DeadCentre(nil), c.DeadCentres...)
	r := cloneRound(c.Rounds[ri])
	return func() {
		c := &s.Cylinders[ci]
		c.DeadCentres = dcs
		c.Rounds[ri] = r
	}
}

// cloneRound returns a copy of r that shares nothing a field's set
// changes in place.
func cloneRound(r session.Round) session.Round {
	if r.PortMarks != nil {
		pm := *r.PortMarks
		r.PortMarks = &pm
	}
	if r.Laps != nil {
		l := *r.Laps
		r.Laps = &l
	}
	r.AdjustmentsBefore = append([]session.Change(nil), r.AdjustmentsBefore...)
	r.DeadCentreReadings = append([]session.DeadCentreReading(nil), r.DeadCentreReadings...)
	r.CutOffs = append([]session.CutOff(nil), r.CutOffs...)
	r.FeelerOpenings = append([]session.FeelerOpening(nil), r.FeelerOpenings...)
	sweeps := r.Sweeps
	r.Sweeps = nil
	for _, w := range sweeps {
		w.Readings = append([]session.SweepReading(nil), w.Readings...)
		r.Sweeps = append(r.Sweeps, w)
	}
	return r
}

// recordTaken reports whether every value of the record f belongs to (the
// two port marks, the two laps, a dead centre's two marks, a sweep
// reading's mark and gauge reading...) is in. The gauge reading at valve
// centre does not count: no contradiction of the laps depends on it.
func (a *App) recordTaken(f field) bool {
	s := a.Session()
	rec := f.Path(s)
	for _, g := range a.fields {
		if g.Path(s) != rec || strings.HasSuffix(g.Key, ".centre_gauge_mm") {
			continue
		}
		if _, ok := g.get(s); !ok {
			return false
		}
	}
	return true
}

// contradictions returns the problems that block a plan for the cylinder
// measured and concern the record f belongs to, or its list (the dead
// centres, a sweep), as Session.Readiness finds them.
func (a *App) contradictions(f field) []session.Problem {
	s := a.Session()
	rec := f.Path(s)
	var out []session.Problem
	for _, p := range s.Readiness(a.cyl) {
		if p.Blocking && concerns(p.Field, rec) {
			out = append(out, p)
		}
	}
	return out
}

// concerns reports whether a problem at path pf is about the record at
// rec: the record, a value in it, its list, or a list or record holding
// it, but not its round or cylinder as a whole (those say what is still
// to take). Port marks and laps are the same record given two ways.
func concerns(pf, rec string) bool {
	box := containerOf(rec)
	if len(pf) <= len(box) {
		return false
	}
	recs := []string{rec, strings.TrimRight(strings.TrimSuffix(rec, lastIndex(rec)), ".")}
	switch {
	case strings.HasSuffix(rec, ".laps"):
		recs = append(recs, box+".port_marks")
	case strings.HasSuffix(rec, ".port_marks"):
		recs = append(recs, box+".laps")
	}
	for _, r := range recs {
		if hasPathPrefix(pf, r) || hasPathPrefix(r, pf) {
			return true
		}
	}
	return false
}

// containerOf returns the round (or, for a cylinder's own records such as
// its dead centres, the cylinder) a record's path lies in.
func containerOf(rec string) string {
	if i := strings.Index(rec, ".rounds["); i >= 0 {
		if j := strings.IndexByte(rec[i:], ']'); j >= 0 {
			return rec[:i+j+1]
		}
	}
	if j := strings.IndexByte(rec, ']'); j >= 0 {
		return rec[:j+1]
	}
	return rec
}

// lastIndex returns the "[i]" that ends path, or "".
func lastIndex(path string) string {
	if !strings.HasSuffix(path, "]") {
		return ""
	}
	return path[strings.LastIndexByte(path, '['):]
}

// hasPathPrefix reports whether path is pre or lies inside it.
func hasPathPrefix(path, pre string) bool {
	return strings.HasPrefix(path, pre) && (len(path) == len(pre) || path[len(pre)] == '.' || path[len(pre)] == '[')
}

// valueReason words why the session file refuses the typed value of f:
// the domain's sentence without its asides about the file (the key's
// description, "got ..."), a range in the display unit, after the value
// as typed.
func (a *App) valueReason(f field, err error) string {
	msg := dropAsides(sentence(err))
	if i := strings.Index(msg, "between "); i >= 0 && !f.Angle {
		if lo, n1 := number(msg, i+len("between ")); n1 > 0 && strings.HasPrefix(msg[n1:], " and ") {
			if hi, n2 := number(msg, n1+len(" and ")); n2 > 0 && !strings.HasPrefix(msg[n2:], " mm") {
				inch := a.unit() == session.UnitInch
				msg = msg[:i] + "between " + formatNumber(lo, inch) + " and " + formatNumber(hi, inch) + " " + a.unitLabel() + msg[n2:]
			}
		}
	}
	return fmt.Sprintf("%s %s cannot be taken: %s", a.text, a.fieldUnit(f), lowerFirst(a.inWords(msg)))
}

// dropAsides removes a sentence's asides in brackets and its ", got ..."
// (the value as the file holds it).
func dropAsides(msg string) string {
	for {
		i := strings.Index(msg, " (")
		j := strings.IndexByte(msg[max(i, 0):], ')')
		if i < 0 || j < 0 {
			break
		}
		msg = msg[:i] + msg[i+j+1:]
	}
	if i := strings.Index(msg, ", got "); i >= 0 {
		end := strings.Index(msg[i:], ". ")
		if end < 0 {
			msg = strings.TrimRight(msg[:i], ".") + "."
		} else {
			msg = msg[:i] + msg[i+end:]
		}
	}
	return msg
}

// lowerFirst returns s with its first letter small.
func lowerFirst(s string) string {
	if s == "" || s[0] < 'A' || s[0] > 'Z' {
		return s
	}
	return string(s[0]-'A'+'a') + s[1:]
}

// inWords puts a sentence of the domain in the setter's words: each key
// path of the session file it quotes named as the app names that value,
// and (in an inch session) each length in mm given in inches.
func (a *App) inWords(msg string) string { return wordsIn(msg, a.unit(), a.pathWords) }

// wordsIn is words for unit, naming paths with name (nil: keyWords).
func wordsIn(msg string, unit session.Unit, name func(path string) string) string {
	if name == nil {
		name = func(p string) string { return keyWords(p, nil) }
	}
	inch := unit == session.UnitInch
	var b strings.Builder
	for i := 0; i < len(msg); {
		if j := pathAt(msg, i); j > i {
			b.WriteString(name(msg[i:j]))
			i = j
			continue
		}
		if inch && (i == 0 || !isWordByte(msg[i-1]) && msg[i-1] != '.') {
			if v, j := number(msg, i); j > i {
				// A range shares its unit: "0.1 to 0.4 mm".
				for _, sep := range []string{" to ", " and "} {
					if v2, k := number(msg, j+len(sep)); strings.HasPrefix(msg[j:], sep) && k > j+len(sep) && isMM(msg, k) {
						b.WriteString(formatNumber(v, true) + sep + formatNumber(v2, true) + " in")
						i = k + len(" mm")
						break
					}
				}
				if i > j {
					continue
				}
				if isMM(msg, j) {
					b.WriteString(formatNumber(v, true) + " in")
					i = j + len(" mm")
					continue
				}
				b.WriteString(msg[i:j])
				i = j
				continue
			}
		}
		b.WriteByte(msg[i])
		i++
	}
	return b.String()
}

// isMM reports whether msg has the unit " mm" at i, ending a word.
func isMM(msg string, i int) bool {
	return strings.HasPrefix(msg[i:], " mm") && (len(msg) == i+3 || !isWordByte(msg[i+3]))
}

// isWordByte reports whether c can be part of a word or a number.
func isWordByte(c byte) bool {
	return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_'
}

// number reads a decimal number at msg[i:] ("-0.25", "12"), returning it
// and where it ends (i when there is none).
func number(msg string, i int) (float64, int) {
	j := i
	if j < len(msg) && msg[j] == '-' {
		j++
	}
	digits := j
	for j < len(msg) && (msg[j] >= '0' && msg[j] <= '9' || msg[j] == '.' && j+1 < len(msg) && msg[j+1] >= '0' && msg[j+1] <= '9') {
		j++
	}
	if j == digits {
		return 0, i
	}
	v, err := strconv.ParseFloat(msg[i:j], 64)
	if err != nil {
		return 0, i
	}
	return v, j
}

// pathRoots start the key paths of a session file that the domain's
// sentences quote.
func pathRoots() [6]string {
	return [6]string{"cylinders[", "cylinders.", "engine.", "measuring.", "adjustments[", "plan_aims."}
}

// pathAt returns where a key path starting at msg[i] ends, or i when
// none starts there. A key typed in quotes ("wheel_diametr_mm") is not a
// path: it is what the user wrote.
func pathAt(msg string, i int) int {
	if i > 0 && (isWordByte(msg[i-1]) || msg[i-1] == '"' || msg[i-1] == '.') {
		return i
	}
	found := false
	for _, r := range pathRoots() {
		found = found || strings.HasPrefix(msg[i:], r)
	}
	if !found {
		return i
	}
	j := i
	for j < len(msg) && (isWordByte(msg[j]) || msg[j] == '.' || msg[j] == '[' || msg[j] == ']') {
		j++
	}
	for j > i && msg[j-1] == '.' {
		j-- // the sentence's full stop
	}
	return j
}

// pathWords names the value at a session file's key path as the app
// names it: the label of its field when it is one, else keyWords.
func (a *App) pathWords(p string) string {
	s := a.Session()
	if s != nil {
		for _, f := range a.fields {
			if f.Key == p || f.Path(s) == p {
				return "the " + lowerFirst(f.Label)
			}
		}
		if strings.HasPrefix(p, "engine.") || strings.HasPrefix(p, "measuring.") {
			for _, f := range a.sizeFields() {
				if f.Key == p {
					return "the " + lowerFirst(f.Label)
				}
			}
		}
	}
	return keyWords(p, s)
}

// keyWords names a key path in words: its last key (a list's entry, a
// round's part) with the round and, on an engine of more than one
// cylinder, the cylinder.
func keyWords(p string, s *session.Session) string {
	name, round, cyl := "", -1, -1
	for _, seg := range strings.Split(p, ".") {
		key, idx := seg, -1
		if i := strings.IndexByte(seg, '['); i >= 0 {
			key = seg[:i]
			if n, err := strconv.Atoi(strings.Trim(seg[i:], "[]")); err == nil {
				idx = n
			}
		}
		switch key {
		case "cylinders":
			cyl = idx
		case "rounds":
			round = idx
		}
		name = key
	}
	w := ""
	if i := strings.Index(keyNames, "\n"+name+"\t"); i >= 0 {
		w = keyNames[i+len(name)+2:]
		w = w[:strings.IndexByte(w, '\n')]
	} else {
		w = "the " + strings.ReplaceAll(strings.TrimSuffix(strings.TrimSuffix(name, "_mm"), "_deg"), "_", " ")
	}
	if round >= 0 && name != "rounds" {
		w += " of round " + strconv.Itoa(round+1)
	}
	if s != nil && cyl >= 0 && cyl < len(s.Cylinders) && len(s.Cylinders) > 1 {
		w += " (" + s.Cylinders[cyl].Name + " cylinder)"
	}
	return w
}

// keyNames are the words for keys whose name alone reads badly, a line
// each: the key, a tab, the words (a table, not a map: the app carries
// less code).
const keyNames = `
gauge_increases_toward	which way the gauge reading grows
port_marks	the port marks
laps	the laps
dead_centres	the dead-centre marks
dead_centre_readings	the readings at dead centre
sweeps	the sweep
readings	the sweep's readings
cut_offs	the cut-off
feeler_openings	the feeler opening
marks_tyre_mm	the tyre marks
rounds	the rounds
differences	the cylinder's differences
target_lead_mm	the target lead
`
