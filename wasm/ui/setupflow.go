package ui

import (
	"bytes"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// setUp is what the set-up screens keep beside the session: while a new
// engine is being set up, which values the setter has given (a value not
// yet given is asked, never taken from anywhere), and the forms chosen
// for asking them (the laps of each end apart, the eccentric's throw
// rather than the travel, a thread's pitch rather than its threads per
// inch). A new engine is not a session the store keeps until it is whole
// and worked out; until then what was given is kept as a draft (DraftKey)
// so that a reload loses nothing.
type setUp struct {
	given     map[string]bool   // nil when no new engine is being set up
	apart     map[string]bool   // the valve's values asked per end
	forms     map[string]string // an adjuster thread's form: "pitch" or "tpi"
	throwForm bool              // the eccentric's throw asked, not the travel
	noNotch   bool              // the setter said there is no running notch
	err       string            // why the engine could not be worked out
}

// DraftKey is the store's key of the new engine being set up.
const DraftKey = "setup_in_progress"

// newSetUp returns the set-up state of a new engine (given) or of one
// already whole.
func newSetUp(given bool) setUp {
	su := setUp{apart: map[string]bool{}, forms: map[string]string{}}
	if given {
		su.given = map[string]bool{}
	}
	return su
}

// active reports whether a new engine is being set up.
func (su *setUp) active() bool { return su.given != nil }

// track makes field f of a new engine count as there only once given,
// and marks it given when set or chosen.
func (su *setUp) track(f field) field {
	if su.given == nil {
		return f
	}
	key, get, set := f.Key, f.get, f.set
	f.get = func(s *session.Session) (float64, bool) {
		if !su.given[key] {
			return 0, false
		}
		return get(s)
	}
	if set != nil {
		f.set = func(s *session.Session, v float64) { su.given[key] = true; set(s, v) }
	}
	cs := make([]choice, len(f.Choices))
	for i, c := range f.Choices {
		c0 := c
		cs[i] = choice{Label: c.Label, set: func(s *session.Session) { su.given[key] = true; c0.set(s) },
			on: func(s *session.Session) bool { return su.given[key] && c0.on(s) }}
	}
	if len(cs) > 0 {
		f.Choices = cs
	}
	return f
}

// pitchForm reports whether the thread of adj is asked as a pitch: as
// the setter chose, else as it was given, else as the display unit is
// (threads per inch for inches).
func (su *setUp) pitchForm(s *session.Session, adj session.Adjustment, form string) bool {
	if f := su.forms[form]; f != "" {
		return f == "pitch"
	}
	if i := adjustmentIndex(s, adj); i >= 0 {
		if t := s.Adjustments[i].Thread; t.TPI > 0 || t.PitchMM > 0 {
			return t.PitchMM > 0
		}
	}
	return s.DisplayUnit != session.UnitInch
}

// piston reports whether s's valve is a piston valve: one with a liner,
// or as the setter chose while its diameter is still to give.
func (su *setUp) piston(s *session.Session) bool {
	if f := su.forms["valve"]; f != "" {
		return f == "piston"
	}
	return s.Engine.Valve.LinerDiameter > 0
}

// blankSession returns a new engine of the gear kind with nothing given:
// one cylinder, a 0.01 mm gauge until the unit says otherwise, the valve
// on its spindle as an adjuster still to describe, and a design whose
// every derivable part is to be derived.
func blankSession(kind string) *session.Session {
	name := strings.TrimSuffix(gearName(kind), " gear") + " engine"
	spec := setting.EngineSpec{Name: name, Gear: setting.GearSpec{Kind: kind},
		Design: &setting.Design{Derived: setting.DerivableKeys(kind)}}
	switch kind {
	case setting.KindSingleEccentric:
		spec.Gear.SingleEccentric = &setting.SingleEccentric{}
	case setting.KindStephenson:
		spec.Gear.Stephenson = &setting.Stephenson{}
	case setting.KindWalschaerts:
		spec.Gear.Walschaerts = &setting.Walschaerts{}
	}
	return &session.Session{Name: name, DisplayUnit: session.UnitMM, Engine: spec,
		Measuring:   session.Measuring{GaugeResolutionMM: 0.01, MarkError: session.Mark{Scale: session.TyreMM, Value: 0.3}},
		Adjustments: []session.Adjustment{{Kind: session.ValveOnSpindle}}, Cylinders: []session.Cylinder{{Name: "right"}}}
}

// newEngine starts setting up a new engine of the gear kind.
func (a *App) newEngine(kind string) {
	a.su = newSetUp(true)
	a.cur = &Stored{Session: blankSession(kind), pending: true}
	a.clearPlan()
	a.cyl = 0
	a.saveDraft()
	a.navigate(Units)
}

// sizeFields lists the set-up questions of the session open.
func (a *App) sizeFields() []field { return setupFields(a.Session(), &a.su) }

// startSizes opens the set-up questions at the first not yet answered.
func (a *App) startSizes() {
	a.fields = a.sizeFields()
	a.setField(0)
	a.toMissing()
	a.navigate(Sizes)
}

// toMissing moves to the first question not yet answered, if any, and
// reports whether there was one.
func (a *App) toMissing() bool {
	for i, f := range a.fields {
		if _, ok := f.get(a.Session()); !ok && !(f.skip && a.su.noNotch) {
			a.setField(i)
			return true
		}
	}
	return false
}

// refreshSizes lists the set-up questions again after an answer (the
// list follows the answers) and keeps the one shown by its key.
func (a *App) refreshSizes() {
	key := a.fields[a.fi].Key
	a.fields = a.sizeFields()
	for i, f := range a.fields {
		if f.Key == key {
			a.fi = i
			return
		}
	}
	a.fi = min(a.fi, len(a.fields)-1)
}

// refreshFields lists the questions of a set-up or a round again after
// an answer, keeping the one shown: set-up's list follows the answers, a
// round's words the marks taken (a dead centre's place on the tyre).
func (a *App) refreshFields() {
	switch a.screen {
	case Sizes:
		if len(a.fields) > 0 && (a.fields[0].Step == stepEngine) {
			a.refreshSizes()
		}
	case Measure:
		if a.fieldsFor.s == a.Session() && a.round < len(a.Session().Cylinders[a.cyl].Rounds) {
			fi := a.fi
			a.fields = a.roundFields(a.round)
			a.fi = min(fi, len(a.fields)-1)
		}
	}
}

// takeSetUp takes v as the value of set-up field f, and reports whether
// f is one (ok; otherwise the entry is a reading's, taken by take). An
// unusual value is taken on a second Next (askOnce). While a new engine is
// set up the value is simply set: its answers are a draft, written by
// saveDraft, and checked once all are in. A value of an engine kept is
// changed as an edit of its profile (session.Edit: derived parts worked
// out again, the change recorded in the engine's history, every reading
// kept); an edit that would not read as a file is held at its field with
// the reason in words, and nothing changes. b is the session file to
// write (nil for a draft).
func (a *App) takeSetUp(f field, v float64) (b []byte, why string, ok bool) {
	if a.screen != Sizes || !isSetUp(f) {
		return nil, "", false
	}
	if f.set == nil {
		return nil, f.Label + ": choose one of the answers with a tap.", true
	}
	change := func(s *session.Session) { f.set(s, v) }
	if !a.su.active() {
		// What cannot be is said before what is only unusual: the edit
		// tried on a copy first.
		try := *a.Session()
		try.Engine, try.Adjustments = try.Engine.Clone(), slices.Clone(try.Adjustments)
		if err := a.editOf(&try, change); err != nil {
			return nil, f.Label + ": " + a.inWords(sentence(err)) + " Nothing was changed; correct the value typed.", true
		}
	}
	if ask := a.askOnce(f, v); ask != "" {
		return nil, ask, true
	}
	if a.su.active() {
		change(a.Session())
		return nil, "", true
	}
	if err := a.edit(change); err != nil {
		return nil, f.Label + ": " + a.inWords(sentence(err)) + " Nothing was changed; correct the value typed.", true
	}
	b, err := a.encode(a.Session())
	if err != nil {
		return nil, f.Label + ": " + a.inWords(sentence(err)), true
	}
	return b, "", true
}

// edit makes change on a copy of the profile of the engine open and
// gives it to session.Edit, dated today; while a new engine is set up the
// change is made as it is (there is nothing to record yet).
func (a *App) edit(change func(*session.Session)) error {
	s := a.Session()
	if a.su.active() {
		change(s)
		return nil
	}
	if err := a.editOf(s, change); err != nil {
		return err
	}
	a.engine = nil
	a.clearPlan()             // made again from the readings, on the engine as it now is
	a.fieldsFor = fieldsKey{} // a round's words listed again (the unit, the valve)
	return nil
}

// editOf makes change on a copy of s's profile and gives it to s.Edit,
// dated today.
func (a *App) editOf(s *session.Session, change func(*session.Session)) error {
	p := s.Profile()
	tmp := &session.Session{Engine: p.Engine, Adjustments: p.Adjustments, Measuring: p.Measuring, DisplayUnit: p.DisplayUnit}
	change(tmp)
	p = session.Profile{Engine: tmp.Engine, Adjustments: tmp.Adjustments, Measuring: tmp.Measuring, DisplayUnit: tmp.DisplayUnit}
	_, err := s.Edit(p, a.today())
	return err
}

// choose answers the question shown with its i-th choice and goes on.
func (a *App) choose(i int) {
	f := a.fields[a.fi]
	if err := a.edit(f.Choices[i].set); err != nil {
		a.note = f.Label + ": " + a.inWords(sentence(err)) + " Nothing was changed."
		return
	}
	a.gen++
	a.note = ""
	a.refreshSizes()
	a.save()
	a.advance()
}

// toggleForm asks the value shown the other way (see field.form).
func (a *App) toggleForm() {
	f := a.fields[a.fi]
	if err := a.edit(func(s *session.Session) { f.toggle(&a.su, s) }); err != nil {
		a.note = f.Label + ": " + a.inWords(sentence(err)) + " Nothing was changed."
		return
	}
	if f.skip {
		a.su.given[f.Key] = true
		a.save()
		a.refreshSizes()
		a.advance()
		return
	}
	a.refreshSizes()
	a.setField(a.fi)
}

// sizesDone goes on from the last set-up question: to the first still to
// answer, else to the engine's sheet of what was worked out (an engine
// with a design), or to the adjustments (a demo engine, drawn whole).
func (a *App) sizesDone() {
	s := a.Session()
	if a.su.active() && a.toMissing() {
		a.note = a.fields[a.fi].Label + ": still to give; type it, then Next."
		return
	}
	if s.Engine.Design == nil {
		a.navigate(Adjust)
		return
	}
	a.workOut()
	a.navigate(EngineSheet)
}

// workOut derives the engine's parts from what was given; why it cannot
// is kept for the engine's sheet.
func (a *App) workOut() {
	s := a.Session()
	a.su.err = ""
	a.engine = nil
	if err := deriveEngine(&s.Engine, *s.Engine.Design); err != nil {
		a.su.err = sentence(err)
		return
	}
	if err := s.Engine.Validate(); err != nil {
		a.su.err = sentence(err)
	}
}

// finishSetUp keeps the new engine, now whole, as a session of the store
// and starts measuring.
func (a *App) finishSetUp() {
	a.su = newSetUp(false)
	a.remove(DraftKey)
	a.save() // kept now: the session and the list of sessions
	a.startMeasuring()
}

// saveDraft keeps what has been given of the new engine being set up,
// and reports whether it did (false when no new engine is being set up).
func (a *App) saveDraft() bool {
	if !a.su.active() || a.cur == nil || a.cur.Key != "" {
		return false
	}
	a.put(DraftKey, a.draft())
	return true
}

// draft writes what has been given of the new engine, one line each: the
// gear, name, unit and gauge, then each answer as its key and value (the
// value as shown, in mm for a length) in the order asked, and the forms
// they were asked in (which the values shown depend on).
func (a *App) draft() []byte {
	s := a.Session()
	var b bytes.Buffer
	fmt.Fprintf(&b, "evenbeat-setup 1\ngear %s\nunit %s\ndivision %s\ncylinders %d\nname %s\n", s.Engine.Gear.Kind, s.DisplayUnit,
		strconv.FormatFloat(s.Measuring.GaugeResolutionMM, 'g', -1, 64), len(s.Cylinders), s.Name)
	for _, f := range a.sizeFields() {
		v, ok := f.get(s)
		switch {
		case !ok:
		case len(f.Choices) > 0:
			fmt.Fprintf(&b, "choice %s %d\n", f.Key, int(v))
		default:
			fmt.Fprintf(&b, "value %s %s\n", f.Key, strconv.FormatFloat(v, 'g', -1, 64))
		}
		if f.skip && a.su.given[f.Key] && !ok {
			fmt.Fprintf(&b, "skip %s\n", f.Key)
		}
	}
	for k, v := range a.su.forms {
		fmt.Fprintf(&b, "form %s %s\n", k, v)
	}
	if a.su.throwForm {
		b.WriteString("throw\n")
	}
	for k := range a.su.apart {
		fmt.Fprintf(&b, "apart %s\n", k)
	}
	return b.Bytes()
}

// readDraft rebuilds the new engine a draft was written of: the answers
// replayed through the questions, each once, the list made again after
// each (an answer may ask more). Lines it cannot use are passed over.
func readDraft(b []byte) (*session.Session, setUp, bool) {
	lines := strings.Split(string(b), "\n")
	if len(lines) < 2 || lines[0] != "evenbeat-setup 1" {
		return nil, setUp{}, false
	}
	su := newSetUp(true)
	var s *session.Session
	answers := map[string]string{}
	for _, ln := range lines[1:] {
		word, rest, _ := strings.Cut(ln, " ")
		switch word {
		case "gear":
			s = blankSession(rest)
		case "unit":
			if s != nil && rest == string(session.UnitInch) {
				s.DisplayUnit = session.UnitInch
			}
		case "division":
			if v, err := strconv.ParseFloat(rest, 64); err == nil && v > 0 && s != nil {
				s.Measuring.GaugeResolutionMM = v
			}
		case "cylinders":
			if n, err := strconv.Atoi(rest); err == nil && s != nil {
				for len(s.Cylinders) < min(n, len(cylinderNames())) {
					s.Cylinders = append(s.Cylinders, session.Cylinder{Name: cylinderNames()[len(s.Cylinders)]})
				}
			}
		case "name":
			if s != nil && rest != "" {
				s.Name, s.Engine.Name = rest, rest
			}
		case "choice", "value", "skip":
			key, v, _ := strings.Cut(rest, " ")
			answers[key] = word + " " + v
		case "apart":
			su.apart[rest] = true
		case "form":
			k, v, _ := strings.Cut(rest, " ")
			su.forms[k] = v
		case "throw":
			su.throwForm = true
		}
	}
	if s == nil || s.Engine.Gear.Kind == "" || setting.DerivableKeys(s.Engine.Gear.Kind) == nil {
		return nil, setUp{}, false
	}
	done := map[string]bool{}
	for changed := true; changed; {
		changed = false
		for _, f := range setupFields(s, &su) {
			ans, ok := answers[f.Key]
			if !ok || done[f.Key] {
				continue
			}
			done[f.Key], changed = true, true
			word, text, _ := strings.Cut(ans, " ")
			v, err := strconv.ParseFloat(text, 64)
			switch {
			case word == "skip" && f.toggle != nil:
				f.toggle(&su, s)
				su.given[f.Key] = true
			case err != nil:
			case word == "choice" && int(v) >= 0 && int(v) < len(f.Choices):
				f.Choices[int(v)].set(s)
			case word == "value" && f.set != nil:
				f.set(s, v)
			}
			break
		}
	}
	return s, su, true
}

// loadDraft takes in the new engine a set-up left unfinished, to be
// carried on from the engines list.
func (a *App) loadDraft() {
	if a.opt.Store == nil {
		return
	}
	b, ok, err := a.opt.Store.Get(DraftKey)
	if err != nil || !ok || len(b) == 0 {
		return
	}
	if s, su, ok := readDraft(b); ok {
		a.draftSession, a.draftSetUp = s, su
	}
}

// carryOn opens the new engine a set-up left unfinished where it stopped.
func (a *App) carryOn() {
	a.su = a.draftSetUp
	a.cur = &Stored{Session: a.draftSession, pending: true}
	a.draftSession = nil
	a.clearPlan()
	a.cyl = 0
	a.navigate(Units)
}

// workedOut is the step of the parts the design works out.
const workedOut = "Worked out"

// setUnit sets the display unit. While a new engine is set up, a dial
// gauge not yet chosen follows it (0.01 mm, or 0.001 in), shown chosen.
func (a *App) setUnit(u session.Unit) {
	s := a.Session()
	a.dirty = true
	if s.DisplayUnit == u {
		return
	}
	err := a.edit(func(s *session.Session) {
		s.DisplayUnit = u
		if a.su.active() && !a.su.given["measuring.gauge_resolution_mm"] {
			s.Measuring.GaugeResolutionMM = 0.01
			if u == session.UnitInch {
				s.Measuring.GaugeResolutionMM = 0.0254
			}
		}
	})
	if err != nil {
		a.note = sentence(err)
		return
	}
	a.save()
}

// setDivision sets the dial gauge's smallest division (mm).
func (a *App) setDivision(mm float64) {
	s := a.Session()
	a.dirty = true
	if a.su.active() {
		a.su.given["measuring.gauge_resolution_mm"] = true
	}
	if s.Measuring.GaugeResolutionMM == mm {
		return
	}
	if err := a.edit(func(s *session.Session) { s.Measuring.GaugeResolutionMM = mm }); err != nil {
		a.note = sentence(err)
		return
	}
	a.save()
}

// nameRow offers to name the engine (the glue's name box, opened from
// the button labelled RenameLabel).
func (a *App) nameRow(l *layouter) {
	if a.opt.OnName != nil {
		l.muted("The engine's name: " + a.Session().Name)
		l.button(RenameLabel, false, a.rename)
	}
}

// choiceView lays out a set-up question answered with buttons: its words,
// its sketch when it has one, a button per answer (the one given marked)
// and Next to keep the answer given.
func (a *App) choiceView(l *layouter) {
	f := a.fields[a.fi]
	s := a.Session()
	l.title(f.Step)
	l.text(f.Say, false)
	if hasSketch(f.Key, a.theme) {
		l.v.sketch = rect(l.x, l.y, l.w, 150)
		l.y += 150 + gap
	}
	l.para(f.Label+" ("+a.fieldCount()+")", render.BodySize+2, true, false, false)
	chosen, ok := f.get(s)
	for i, c := range f.Choices {
		l.button(c.Label, ok && int(chosen) == i, func() { a.choose(i) })
	}
	l.para(a.note, render.BodySize, false, true, false)
	if ok {
		l.button("Next", false, func() { a.key(KeyNext) })
	}
}

// enoughForPlan reports whether the round's last reading a plan needs has
// just been taken: the rest of the round is optional, and the plan comes
// next (the optional steps stay a tap away, under More readings).
func (a *App) enoughForPlan() bool {
	if a.screen != Measure || a.fi+1 >= len(a.fields) {
		return false
	}
	return !a.fields[a.fi].Optional && a.fields[a.fi+1].Optional && a.ready()
}
