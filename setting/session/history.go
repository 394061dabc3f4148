package session

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"evenbeat/setting"
)

// A setter may change the engine, the adjusters, the measuring set-up and
// the display unit at any time, readings or not: readings are
// measurements, kept whatever the engine is later found to be. Each
// change is kept in the file's history of the engine (EngineChanges), one
// record per value changed, so that an old round can be read against the
// engine as it was when it was taken.

// EngineChange is one value of the session's profile (the engine, the
// adjustments, the measuring set-up, the display unit) changed after it
// was set up: a record of the file's history of the engine.
type EngineChange struct {
	// Date is when the change was made: "2026-11-28" or an RFC 3339 date
	// and time, as a round's date.
	Date string
	// Key is the value's key path in the session file:
	// "engine.engine.rod_length", "adjustments[0].thread.tpi",
	// "measuring.wheel_diameter_mm", "display_unit".
	Key string
	// Before and After are the value as the file wrote it before and
	// after the change, as JSON ("132", "\"inch\"", a list of key paths
	// for the design's derived parts); "" when the key was not there (a
	// value added or taken out).
	Before, After string
	// Derived is true for a value set by derivation from the engine's
	// design (setting.Derive), not by the setter.
	Derived bool
}

// MaxEngineChanges bounds the records of the engine's history: a hundred
// edits of every value of an engine. When an edit would pass it, Edit lets
// go of the oldest records.
const MaxEngineChanges = 1000

// Profile is what a setter may change at any time after set-up: the
// engine, what may be adjusted and how, the measuring set-up and the
// display unit.
type Profile struct {
	Engine      setting.EngineSpec
	Adjustments []Adjustment
	Measuring   Measuring
	DisplayUnit Unit
}

// Profile returns a copy of the session's profile, sharing nothing with
// it: change it and give it to Edit.
func (s *Session) Profile() Profile {
	return Profile{Engine: s.Engine.Clone(), Adjustments: slices.Clone(s.Adjustments), Measuring: s.Measuring, DisplayUnit: s.DisplayUnit}
}

// Edit makes p the session's profile on date ("2026-11-28" or RFC 3339)
// and returns what changed, one record per value, as it appends them to
// the engine's history (EngineChanges). Every reading is kept.
//
// When the engine has a design (setting.Design): a part listed as derived
// whose value p changes is the setter's from then on, taken out of the
// derived list (unless p changes the list itself); and when a dimension
// the derived parts depend on changed (anything of the engine's crank,
// valve or gear not derived, the design's lead or die share) or a part
// was newly listed as derived, the derived parts are derived again
// (setting.Derive with the design's aims). A derived part that moves by
// less than a millionth of a mm (or degree) keeps its value, so that
// nothing is recorded for the rounding of the derivation.
//
// The edited session must read as a file would: an engine that validates,
// adjustments its gear has, readings whose notches, cylinders and changes
// it still knows. Otherwise, or when the derivation fails, the error
// names the field and the session is left as it was. Nothing changed
// gives no records and leaves the session alone.
func (s *Session) Edit(p Profile, date string) ([]EngineChange, error) {
	if _, err := parseDate(date); err != nil {
		return nil, userError("date", fmt.Sprintf("The date %q of the change cannot be read; give it as year-month-day, \"2026-11-28\" (or with a time, \"2026-11-28T14:30:00Z\").", date))
	}
	old := s.Profile()
	asGiven := p.Engine.Clone()
	next := Profile{Engine: p.Engine.Clone(), Adjustments: slices.Clone(p.Adjustments), Measuring: p.Measuring, DisplayUnit: p.DisplayUnit}
	if err := rederive(&next.Engine, old.Engine); err != nil {
		return nil, within("engine", err)
	}
	edited := *s
	edited.Engine, edited.Adjustments, edited.Measuring, edited.DisplayUnit = next.Engine, next.Adjustments, next.Measuring, next.DisplayUnit
	e := &encoder{}
	root := e.session(&edited)
	if e.err != nil {
		return nil, e.err
	}
	d := &decoder{version: Version}
	if d.session(root); d.err != nil {
		return nil, d.err
	}
	before, err := profileLeaves(old)
	if err != nil {
		return nil, err
	}
	after, err := profileLeaves(next)
	if err != nil {
		return nil, err
	}
	given, err := engineLeaves(asGiven)
	if err != nil {
		return nil, err
	}
	var out []EngineChange
	for _, key := range unionKeys(before, after) {
		b, a := before.text[key], after.text[key]
		if a == b {
			continue
		}
		part, inEngine := strings.CutPrefix(key, "engine.")
		derived := inEngine && next.Engine.Design != nil && slices.Contains(next.Engine.Design.Derived, part) && given.text[part] == b
		out = append(out, EngineChange{Date: date, Key: key, Before: b, After: a, Derived: derived})
	}
	if len(out) == 0 {
		return nil, nil
	}
	s.Engine, s.Adjustments, s.Measuring, s.DisplayUnit = next.Engine, next.Adjustments, next.Measuring, next.DisplayUnit
	s.EngineChanges = append(s.EngineChanges, out...)
	if n := len(s.EngineChanges) - MaxEngineChanges; n > 0 {
		s.EngineChanges = slices.Delete(s.EngineChanges, 0, n)
	}
	return out, nil
}

// within places an error of the engine under the session's key path.
func within(prefix string, err error) error {
	var e *setting.Error
	if !errors.As(err, &e) {
		return userError(prefix, err.Error())
	}
	return userError(joinPath(prefix, e.Field), e.Message)
}

// rederive applies an engine's design to an edit of it: spec is the
// engine as edited, was the engine before. When the gear's kind changed,
// the old gear's parts leave the derived list. A derived part whose value
// the edit changed is taken out of the derived list (unless the edit
// changed the list); then, when a dimension the derived parts depend on changed
// or a part was newly listed as derived, the derived parts are derived
// again, each keeping its value when it moves by less than a millionth.
func rederive(spec *setting.EngineSpec, was setting.EngineSpec) error {
	d := spec.Design
	if d == nil {
		return nil
	}
	var wasDerived []string
	if was.Design != nil {
		wasDerived = was.Design.Derived
	}
	if spec.Gear.Kind != was.Gear.Kind {
		// Another gear: the old gear's parts are nothing to derive.
		keys := setting.DerivableKeys(spec.Gear.Kind)
		d.Derived = slices.DeleteFunc(d.Derived, func(key string) bool { return !slices.Contains(keys, key) })
	}
	if slices.Equal(d.Derived, wasDerived) {
		d.Derived = slices.DeleteFunc(d.Derived, func(key string) bool {
			now, then := spec.Number(key), was.Number(key)
			return now != nil && then != nil && *now != *then
		})
	}
	fresh := slices.ContainsFunc(d.Derived, func(key string) bool { return !slices.Contains(wasDerived, key) })
	if !fresh && !dependsChanged(*spec, was) {
		return nil
	}
	kept := map[string]float64{}
	for _, key := range d.Derived {
		if v := was.Number(key); v != nil {
			kept[key] = *v
		}
	}
	if err := setting.Derive(spec, d.Aims()); err != nil {
		return err
	}
	for key, v := range kept {
		if now := spec.Number(key); now != nil && math.Abs(*now-v) < 1e-6 {
			*now = v
		}
	}
	return nil
}

// dependsChanged reports whether a value the derived parts of spec's
// design depend on differs from was: the design's lead or die share, or
// any number or choice of the crank, the valve or the gear that is not
// itself derived.
func dependsChanged(spec, was setting.EngineSpec) bool {
	if was.Design == nil || spec.Design.Lead != was.Design.Lead || spec.Design.FullGearShare != was.Design.FullGearShare {
		return true
	}
	now, err1 := engineLeaves(spec)
	then, err2 := engineLeaves(was)
	if err1 != nil || err2 != nil {
		return true
	}
	for _, key := range unionKeys(now, then) {
		dep := strings.HasPrefix(key, "engine.") || strings.HasPrefix(key, "valve.") || strings.HasPrefix(key, "gear.")
		if dep && !slices.Contains(spec.Design.Derived, key) && now.text[key] != then.text[key] {
			return true
		}
	}
	return false
}

// leafSet is the values of a tree by key path, as compact JSON, with
// the paths in the tree's order.
type leafSet struct {
	text  map[string]string
	order []string
}

// add collects the leaves of n at path: each value that is neither an
// object nor a list of objects (a list of words, such as the design's
// derived parts, is one value).
func (l *leafSet) add(path string, n *node) {
	switch {
	case n.kind == nodeObject:
		for i, k := range n.keys {
			l.add(joinPath(path, k), n.vals[i])
		}
		return
	case n.kind == nodeArray && slices.ContainsFunc(n.elems, func(e *node) bool { return e.kind == nodeObject }):
		for i, e := range n.elems {
			l.add(fmt.Sprintf("%s[%d]", path, i), e)
		}
		return
	}
	var b bytes.Buffer
	n.writeCompact(&b)
	l.text[path] = b.String()
	l.order = append(l.order, path)
}

// engineLeaves returns the values of an engine as the engine file writes
// them, by engine-file key path.
func engineLeaves(spec setting.EngineSpec) (leafSet, error) {
	l := leafSet{text: map[string]string{}}
	n, err := encodeTree(spec)
	if err != nil {
		return l, userError("engine", fmt.Sprintf("The engine cannot be written: %v.", err))
	}
	l.add("", n)
	return l, nil
}

// profileLeaves returns the values of a profile as the session file
// writes them, by session-file key path.
func profileLeaves(p Profile) (leafSet, error) {
	e := &encoder{}
	l := leafSet{text: map[string]string{}}
	l.add("display_unit", &node{kind: nodeString, text: string(p.DisplayUnit)})
	n, err := encodeTree(p.Engine)
	if err != nil {
		return l, userError("engine", fmt.Sprintf("The engine cannot be written: %v.", err))
	}
	l.add("engine", n)
	l.add("measuring", e.measuring(p.Measuring))
	for i, a := range p.Adjustments {
		l.add(fmt.Sprintf("adjustments[%d]", i), e.adjustment(a, fmt.Sprintf("adjustments[%d]", i)))
	}
	if e.err != nil {
		return l, e.err
	}
	return l, nil
}

// unionKeys lists the key paths of a, then those only b has.
func unionKeys(a, b leafSet) []string {
	keys := slices.Clone(a.order)
	for _, k := range b.order {
		if _, ok := a.text[k]; !ok {
			keys = append(keys, k)
		}
	}
	return keys
}

// historyKey reports whether key has the form of a history record's key:
// a session-file key path into the engine, the measuring set-up or an
// adjustment ("engine.gear.stephenson.arm_swing",
// "adjustments[2].thread.tpi"), or the display unit.
func historyKey(key string) bool {
	if key == "display_unit" {
		return true
	}
	parts := strings.Split(key, ".")
	if len(parts) < 2 || parts[0] != "engine" && parts[0] != "measuring" && !(strings.HasPrefix(parts[0], "adjustments[") && keyPart(parts[0])) {
		return false
	}
	for _, p := range parts[1:] {
		if !keyPart(p) {
			return false
		}
	}
	return true
}

// keyPart reports whether p is one step of a key path: a snake_case key,
// optionally with a list index ("suspension", "notches[0]").
func keyPart(p string) bool {
	name, index, listed := strings.Cut(p, "[")
	if name == "" || strings.TrimLeft(name, "abcdefghijklmnopqrstuvwxyz_") != "" {
		return false
	}
	if !listed {
		return true
	}
	digits, ok := strings.CutSuffix(index, "]")
	return ok && digits != "" && strings.TrimLeft(digits, "0123456789") == ""
}

// maxHistoryValue bounds the text of a history record's value: a number,
// a word, the engine's name or notes, the list of derived parts.
const maxHistoryValue = 64 << 10

// engineChange reads one record of the engine's history.
func (d *decoder) engineChange(n *node, path string) EngineChange {
	o := d.object(n, path, "a record of the engine's history", "date", "key", "before", "after", "derived")
	var c EngineChange
	c.Date = o.text("date", true, "the date of the change, as \"2026-11-28\"")
	if d.err == nil {
		if _, err := parseDate(c.Date); err != nil {
			d.fail(path+".date", "The date %q cannot be read; write it as year-month-day, \"2026-11-28\" (or with a time, \"2026-11-28T14:30:00Z\").", c.Date)
		}
	}
	c.Key = o.text("key", true, "the key path of the value changed, such as \"engine.engine.rod_length\"")
	if d.err == nil && !historyKey(c.Key) {
		d.fail(path+".key", "The key %q is not a value of the engine's history: give the key path of a value of the engine, the adjustments or the measuring set-up (\"engine.engine.rod_length\", \"adjustments[0].min_mm\"), or \"display_unit\".", c.Key)
	}
	value := func(key string) string {
		v := o.field(key, false, "")
		if v == nil || d.err != nil {
			return ""
		}
		if v.kind == nodeObject || v.kind == nodeArray && slices.ContainsFunc(v.elems, func(e *node) bool { return e.kind == nodeObject || e.kind == nodeArray }) {
			d.fail(joinPath(path, key), "A record of the engine's history holds one value (a number, a word, true or false, or a list of them), got %s; record each value of an object apart.", v.describe())
			return ""
		}
		var b bytes.Buffer
		v.writeCompact(&b)
		if b.Len() > maxHistoryValue {
			d.fail(joinPath(path, key), "The value holds %d characters; a record of the engine's history holds at most %d.", b.Len(), maxHistoryValue)
			return ""
		}
		return b.String()
	}
	c.Before, c.After = value("before"), value("after")
	if d.err == nil && c.Before == "" && c.After == "" {
		d.fail(path, "This record of the engine's history has neither \"before\" nor \"after\"; give the value before the change, after it, or both.")
	}
	c.Derived = o.flag("derived")
	return c
}

// engineChange writes one record of the engine's history.
func (e *encoder) engineChange(c EngineChange, path string) *node {
	o := e.obj(path)
	o.str("date", c.Date)
	o.str("key", c.Key)
	for _, v := range []struct{ key, text string }{{"before", c.Before}, {"after", c.After}} {
		if v.text == "" {
			continue
		}
		n, err := parseCompact([]byte(v.text))
		if err != nil {
			if e.err == nil {
				e.err = userError(joinPath(path, v.key), sentence(joinPath(path, v.key), fmt.Sprintf("must be a value as JSON writes it, got %q.", v.text)))
			}
			continue
		}
		o.put(v.key, n)
	}
	if c.Derived {
		o.put("derived", &node{kind: nodeBool, b: true})
	}
	return o.n
}
