package ui

import (
	"fmt"
	"slices"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// The engine's sheet: what was worked out from the dimensions given
// (setting.Derive), each value a tap away from being given instead, the
// checks that the engine as described works (EngineSpec.Works), and every
// value the setter gave, each a tap away from being typed again. It ends
// a new engine's set-up and is where the engine is edited at any time.

// derivedNames are the words for each part setting.Derive works out, by
// its key in the engine file, and whether it is an angle.
func derivedNames() map[string]struct {
	label string
	angle bool
} {
	type n = struct {
		label string
		angle bool
	}
	const st, wa = "gear.stephenson.", "gear.walschaerts."
	return map[string]n{
		"gear.single_eccentric.eccentric.advance": {"Angle of advance", true},
		"gear.single_eccentric.valve_centre_u":    {"Valve central at", false},
		st + "forward.advance":                    {"Forward eccentric: advance", true},
		st + "backward.advance":                   {"Backward eccentric: advance", true},
		st + "mid_arm_angle":                      {"Reverse arm, mid gear", true},
		st + "arm_swing":                          {"Reverse arm's swing", true},
		st + "backward.rod":                       {"Backward eccentric rod", false},
		st + "valve_centre_u":                     {"Valve central at", false},
		wa + "lever.valve_pin":                    {"Lever: radius rod to valve pin", false},
		wa + "return_angle":                       {"Return crank angle", true},
		wa + "eccentric_rod":                      {"Eccentric rod", false},
		wa + "radius_rod":                         {"Radius rod", false},
		wa + "valve_centre_u":                     {"Valve central at", false},
	}
}

// derivedFields are the parts of s's gear that the design works out, each
// a value the setter may give instead: giving it takes it off the
// design's list of derived parts, so it is kept from then on. A Stephenson
// gear's weighshaft, placed by rule (placeReverser), follows.
func derivedFields(s *session.Session) []field {
	var fs []field
	names := derivedNames()
	for _, key := range setting.DerivableKeys(s.Engine.Gear.Kind) {
		key := key
		n := names[key]
		p := func(s *session.Session) *float64 { return s.Engine.Number(key) }
		lo, hi := 5.0, 5000.0
		if strings.HasSuffix(key, "valve_pin") {
			lo, hi = -500, 500
		}
		f := length("engine."+key, workedOut, n.label, "Worked out so that the gear as drawn gives the lead asked for. Type the value you have measured or read off the drawing to keep it instead.", lo, hi, 1, p)
		if n.angle {
			f = plainNumber(f, "deg")
			f.Lo, f.Hi = -180, 180
		}
		set := f.set
		f.set = func(s *session.Session, v float64) {
			if d := s.Engine.Design; d != nil {
				d.Derived = slices.DeleteFunc(slices.Clone(d.Derived), func(k string) bool { return k == key })
			}
			set(s, v)
		}
		fs = append(fs, f)
	}
	if g := s.Engine.Gear.Stephenson; g != nil {
		const p = "engine.gear.stephenson.weighshaft."
		say := "Placed so that the reverse arm is level and the lifting link upright in mid gear; give the place you measure to keep it instead."
		fs = append(fs,
			length(p+"u", workedOut, "Weighshaft ahead of axle", say, -3000, 3000, 1, func(s *session.Session) *float64 { return &s.Engine.Gear.Stephenson.Weighshaft.U }),
			length(p+"w", workedOut, "Weighshaft above axle", say, -3000, 3000, 1, func(s *session.Session) *float64 { return &s.Engine.Gear.Stephenson.Weighshaft.W }))
	}
	return fs
}

// isDerived reports whether the design works out the part at key (an
// engine-file key of setting.DerivableKeys).
func isDerived(e setting.EngineSpec, key string) bool {
	return e.Design != nil && slices.Contains(e.Design.Derived, key)
}

// openSheet shows the engine's sheet.
func (a *App) openSheet() {
	if s := a.Session(); s != nil && s.Engine.Design != nil {
		a.workOut()
	}
	a.navigate(EngineSheet)
}

// editValue types field i of fs again on the keypad, coming back to the
// sheet after Next.
func (a *App) editValue(fs []field, i int) {
	a.fields = fs
	a.setField(i)
	a.navigate(Sizes)
	a.editing = true
}

// sheetView lays out the engine's sheet.
func (a *App) sheetView(l *layouter) {
	s := a.Session()
	if s == nil {
		return
	}
	if a.sheetGen != a.gen && s.Engine.Design != nil {
		a.sheetGen = a.gen
		a.workOut()
	}
	newOne := a.su.active()
	if newOne {
		l.title("Worked out from your dimensions")
	} else {
		l.title(s.Name + ": the engine")
	}
	if a.su.err != "" {
		l.text(a.su.err, true)
		l.button("Back to the dimensions", false, a.startSizes)
	} else if d := s.Engine.Design; d != nil {
		l.muted(fmt.Sprintf("Worked out so that the gear as drawn gives a lead of %s in full gear, and the valve is central. Tap one to give your own value; it is then kept as given.", session.FormatLength(d.Lead, a.unit())))
		ds := derivedFields(s)
		for i, f := range ds {
			v, _ := f.get(s)
			label := fmt.Sprintf("%s: %s %s", f.Label, a.showValue(f, v), a.fieldUnit(f))
			if k := strings.TrimPrefix(f.Key, "engine."); !isDerived(s.Engine, k) && !strings.Contains(k, "weighshaft") {
				label = "Given: " + label // the setter's own, kept
			}
			l.button(label, false, func() { a.editValue(ds, i) })
		}
		l.muted(assumptions(s))
		for _, err := range s.Engine.Works() {
			l.text(sentence(err), true)
		}
	}
	switch {
	case newOne && a.su.err == "":
		l.button("Next: start measuring", false, a.finishSetUp)
	case !newOne:
		l.button("Done", false, a.done)
	}
	l.muted("What you gave (tap one to change it):")
	fs := a.sizeFields()
	for i, f := range fs {
		val := "not given"
		if v, ok := f.get(s); ok {
			val = a.showValue(f, v) + " " + a.fieldUnit(f)
			if len(f.Choices) > 0 {
				val = f.Choices[int(v)].Label
			}
		}
		l.button(f.Label+": "+val, false, func() { a.editValue(fs, i) })
	}
}

// assumptions says what the model takes as it is, beyond what was given
// and worked out: where the valve's guide runs, how the link hangs, how
// well a tyre mark is made.
func assumptions(s *session.Session) string {
	var as []string
	switch g := s.Engine.Gear; {
	case g.Stephenson != nil:
		as = append(as, "the die block's guide in line with the axle centre", "the link hung by its middle")
	case g.SingleEccentric != nil:
		as = append(as, "the valve spindle in line with the axle centre")
	}
	as = append(as, "each tyre mark good to "+session.FormatLength(s.Measuring.MarkError.Value, s.DisplayUnit))
	return "Taken as: " + strings.Join(as, "; ") + "."
}

// done leaves an edit of the engine for the screen it was opened from,
// past the menu.
func (a *App) done() {
	a.Back()
	if a.screen == Menu {
		a.Back()
	}
	if a.screen == Plan {
		a.planRound = 0
		a.makePlan() // for the engine as it now is
	}
}
