package ui

import (
	"fmt"
	"strconv"
	"strings"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// The plausible ranges of the set-up values span the smallest live-steam
// models (3.5 in gauge) to full-size engines: common practice, no source;
// the figures are from memory. Outside them an entry is taken with a
// sentence asking for a second look.

// Set-up asks what a setter can measure on the engine or read off its
// drawing, in the trade's terms: the stroke (the crank radius is half of
// it), the valve travel in full gear (or the eccentric's throw), the laps
// and the port once for both ends (unless they differ), the lead the
// drawing asks for, the rods and links, then how each adjuster is made.
// The questions with a few answers (which way the gauge grows, the valve,
// open or crossed rods) are asked with buttons, one tap each. What the
// model needs besides is derived (setting.Derive; see design.go) and
// shown on the derived screen. Each value's Key is its place in the
// session file, so a warning about it names the same field, and its
// sketch (render.DimensionSketch) is found by it.

// Set-up steps, as headings.
const (
	stepEngine    = "The engine"
	stepGear      = "The gear"
	stepAdjusters = "Adjusters"
)

// setupFields lists the set-up questions for s's engine in the order a
// setter answers them: the engine's, its gear's, then the adjusters'. The
// list depends on the answers (a piston valve's diameter, an adjuster's
// own thread), so it is made again after each. While a new engine is set
// up (su.given not nil) a value counts as there only once it was given.
func setupFields(s *session.Session, su *setUp) []field {
	fs := engineFields(s, su)
	fs = append(fs, gearFields(s, su)...)
	fs = append(fs, adjusterFields(s, su)...)
	for i := range fs {
		fs[i] = su.track(fs[i])
	}
	return fs
}

// length is a set-up length at the session's place p, shown as k times
// the value kept (the stroke is twice the crank radius, the travel twice
// the throw; -1 for a drop kept as a negative height); also are places
// given the same value (the back port's lap with the front one's). Lo and
// Hi bound the value shown.
func length(key, step, label, say string, lo, hi, k float64, p func(*session.Session) *float64, also ...func(*session.Session) *float64) field {
	return field{Key: key, Step: step, Label: label, Say: say, Lo: lo, Hi: hi,
		get: func(s *session.Session) (float64, bool) {
			if v := p(s); v != nil {
				return k * *v, true
			}
			return 0, false
		},
		set: func(s *session.Session, v float64) {
			for _, q := range append([]func(*session.Session) *float64{p}, also...) {
				if x := q(s); x != nil {
					*x = v / k
				}
			}
		}}
}

// plainNumber is a set-up number that is not a length: degrees, a
// percentage, threads per inch (unit names it).
func plainNumber(f field, unit string) field {
	f.Plain = unit
	f.Angle = unit == "deg"
	return f
}

// question is a question with a few answers, each a button.
func question(key, step, label, say string, cs ...choice) field {
	f := field{Key: key, Step: step, Label: label, Say: say, Choices: cs}
	f.get = func(s *session.Session) (float64, bool) {
		for i, c := range cs {
			if c.on(s) {
				return float64(i), true
			}
		}
		return 0, false
	}
	return f
}

// choice is one answer of a question asked with buttons.
type choice struct {
	Label string
	on    func(s *session.Session) bool
	set   func(s *session.Session)
}

// place returns where the session keeps the value at key, a session-file
// path: an engine's number by its engine-file key (EngineSpec.Number), or
// the wheel's diameter; nil when there is none (a gear member not given).
func place(key string) func(*session.Session) *float64 {
	if key == "measuring.wheel_diameter_mm" {
		return func(s *session.Session) *float64 { return &s.Measuring.WheelDiameterMM }
	}
	part := strings.TrimPrefix(key, "engine.")
	return func(s *session.Session) *float64 { return s.Engine.Number(part) }
}

// ask is a question of a set-up length, by the keys of the values it sets
// (the first is its own: shown, and named in warnings; the others are set
// alike, as the back port's lap with the front one's).
type ask struct {
	keys       []string
	label, say string
	lo, hi, k  float64 // the plausible range shown, and the value shown per value kept
	step       string
	form       string // see field.form
	toggleForm func(su *setUp, s *session.Session)
}

// field makes the question a field.
func (q ask) field() field {
	var also []func(*session.Session) *float64
	for _, k := range q.keys[1:] {
		also = append(also, place(k))
	}
	k := q.k
	if k == 0 {
		k = 1
	}
	f := length(q.keys[0], q.step, q.label, q.say, q.lo, q.hi, k, place(q.keys[0]), also...)
	f.form, f.toggle = q.form, q.toggleForm
	return f
}

// choiceOf is an answer that sets the engine's value at key (a Boolean
// choice of the gear: slip, crossed) to on.
func choiceOf(label string, on bool, set func(s *session.Session, on bool), get func(s *session.Session) (bool, bool)) choice {
	return choice{Label: label,
		on: func(s *session.Session) bool {
			v, ok := get(s)
			return ok && v == on
		},
		set: func(s *session.Session) { set(s, on) }}
}

// engineFields are the engine's own questions: how it is measured, its
// valve, its crank and rod, the laps, the port and the lead drawn.
func engineFields(s *session.Session, su *setUp) []field {
	admission := func(label string, adm setting.Admission, piston bool) choice {
		return choice{Label: label,
			on: func(s *session.Session) bool {
				return s.Engine.Valve.Admission == adm && su.piston(s) == piston
			},
			set: func(s *session.Session) {
				s.Engine.Valve.Admission = adm
				su.forms["valve"] = map[bool]string{true: "piston", false: "slide"}[piston]
				if !piston {
					s.Engine.Valve.LinerDiameter = 0
				}
			}}
	}
	grows := func(label string, end session.End) choice {
		return choice{Label: label, on: func(s *session.Session) bool { return s.Measuring.GaugeIncreases == end },
			set: func(s *session.Session) { s.Measuring.GaugeIncreases = end }}
	}
	fs := []field{
		question("measuring.gauge_increases", stepEngine, "Gauge reading grows", "Which way does the dial gauge's reading grow? It grows as its plunger is pushed in: with the gauge ahead of the spindle's end that is as the valve moves forward, toward the front cover; with it behind, as the valve moves back.",
			grows("As the valve moves forward", session.GaugeFront), grows("As the valve moves back", session.GaugeBack)),
		question("engine.valve.admission", stepEngine, "The valve", "Which valve does the engine have? It decides which way the valve moves to open each port to steam.",
			admission("Slide valve (steam outside)", setting.External, false),
			admission("Piston valve (steam inside)", setting.Internal, true),
			admission("Piston valve (steam outside)", setting.External, true)),
	}
	qs := []ask{
		{keys: []string{"engine.engine.crank_radius"}, label: "Stroke", say: "The piston's stroke, from the drawing or between the crosshead's two ends of travel on the slide bar.", lo: 10, hi: 1200, k: 2},
		{keys: []string{"engine.engine.rod_length"}, label: "Connecting rod", say: "Centre to centre of the connecting rod, crosshead pin to crank pin.", lo: 20, hi: 4000},
		{keys: []string{"measuring.wheel_diameter_mm"}, label: "Wheel diameter", say: "Diameter of the driving wheel on the tread, where you will mark the tyre.", lo: 40, hi: 2500},
	}
	if su.piston(s) {
		qs = append(qs, ask{keys: []string{"engine.valve.liner_diameter"}, label: "Piston valve diameter", say: "The piston valve's diameter (the liner's bore).", lo: 5, hi: 600})
	}
	ends := func(key, label, say, sayBack string, lo, hi float64) {
		front, back := "engine.valve.front."+key, "engine.valve.back."+key
		if su.apart[key] || *place(front)(s) != *place(back)(s) {
			lower := strings.ToLower(label[:1]) + label[1:]
			qs = append(qs, ask{keys: []string{front}, label: "Front " + lower, say: say, lo: lo, hi: hi},
				ask{keys: []string{back}, label: "Back " + lower, say: sayBack, lo: lo, hi: hi})
			return
		}
		qs = append(qs, ask{keys: []string{front, back}, label: label, say: say + " The same at both ends; if they differ, tap Front and back differ.", lo: lo, hi: hi,
			form: "Front and back differ", toggleForm: func(su *setUp, _ *session.Session) { su.apart[key] = true }})
	}
	ends("steam_lap", "Steam lap", "How far the valve overlaps the port's steam edge with the valve central, from the drawing or measured with the cover off.", "The same overlap at the back port.", 0, 60)
	ends("exhaust_lap", "Exhaust lap", "How far the valve overlaps the port's exhaust edge with the valve central; negative when the port is already open to exhaust (clearance), 0 for line and line.", "The same at the back port.", -20, 30)
	if s.Engine.Valve.Front.Holes == 0 && s.Engine.Valve.Back.Holes == 0 {
		ends("port_width", "Port width", "The steam port's width along the cylinder, edge to edge on the port face.", "The back steam port's width, edge to edge.", 0.5, 120)
	}
	if s.Engine.Design != nil {
		qs = append(qs, ask{keys: []string{"engine.design.lead"}, label: "Lead as drawn", say: "The lead the drawing asks for in full gear: how far each steam port is open with the piston on dead centre (0 for line and line).", lo: -3, hi: 10})
	}
	for _, q := range qs {
		q.step = stepEngine
		fs = append(fs, q.field())
	}
	return fs
}

// gearFields are the questions of s's gear that a setter can answer from
// the engine or its drawing.
func gearFields(s *session.Session, su *setUp) []field {
	var fs []field
	var qs []ask
	switch g := s.Engine.Gear; g.Kind {
	case setting.KindSingleEccentric:
		const p = "engine.gear.single_eccentric."
		fs = append(fs, question(p+"slip", stepGear, "The eccentric", "Is the sheave keyed to the axle, or a slip eccentric driven by a stop, which reverses the engine?",
			choiceOf("Fixed (keyed)", false, setSlip, slip), choiceOf("Slip eccentric", true, setSlip, slip)),
			travelField(su, p+"eccentric.throw"))
		qs = []ask{{keys: []string{p + "eccentric.rod"}, label: "Eccentric rod", say: "The eccentric rod from the sheave's centre to the pin at its far end.", lo: 20, hi: 4000}}
	case setting.KindStephenson:
		const p = "engine.gear.stephenson."
		fs = append(fs, question(p+"crossed", stepGear, "The eccentric rods", "With the crank on the dead centre away from the link, do the two eccentric rods run to the link without crossing (open) or cross each other (crossed)?",
			choiceOf("Open rods", false, setCrossed, crossed), choiceOf("Crossed rods", true, setCrossed, crossed)),
			travelField(su, p+"forward.throw", p+"backward.throw"))
		qs = []ask{
			{keys: []string{p + "forward.rod"}, label: "Eccentric rods", say: "The forward eccentric rod, sheave centre to its pin on the link. The backward rod is worked out for equal leads in full back, as a drawing sets it; you may give it on the next screen.", lo: 20, hi: 4000},
			{keys: []string{p + "link.radius"}, label: "Link radius", say: "The expansion link's radius, to the centre line of its slot: from the drawing, or from a template laid in the slot.", lo: 20, hi: 4000},
			{keys: []string{p + "link.pin_spacing"}, label: "Link pin spacing", say: "Straight across from the forward eccentric rod's pin to the backward one's on the link.", lo: 5, hi: 1000},
			{keys: []string{p + "reverse_arm"}, label: "Reverse arm", say: "Weighshaft centre to the lifting link's pin on the reverse arm.", lo: 5, hi: 1500},
			{keys: []string{p + "lifting_link"}, label: "Lifting link", say: "The lifting link, centre to centre of its pins.", lo: 5, hi: 1500},
		}
	case setting.KindWalschaerts:
		const p = "engine.gear.walschaerts."
		qs = []ask{
			{keys: []string{p + "return_crank"}, label: "Return crank", say: "Main crank-pin centre to the return crank's pin.", lo: 2, hi: 500},
			{keys: []string{p + "link_radius"}, label: "Link radius", say: "The expansion link's radius, to the centre line of its slot.", lo: 20, hi: 4000},
			{keys: []string{p + "trunnion.u"}, label: "Link trunnion ahead of the axle", say: "From the driving axle's centre forward to the link's trunnion (its pivot), along the cylinder line.", lo: 10, hi: 5000},
			{keys: []string{p + "trunnion.w"}, label: "Link trunnion above the axle", say: "From the axle's centre up to the trunnion, square to the cylinder line.", lo: -2000, hi: 3000},
			{keys: []string{p + "link_foot.w"}, label: "Link foot below the trunnion", say: "From the trunnion down to the link foot's pin, where the eccentric rod works the link, with the link upright.", lo: 5, hi: 3000, k: -1},
			{keys: []string{p + "full_gear_die"}, label: "Die in full forward", say: "Along the slot from the trunnion to the die block in full forward gear: positive above the trunnion, negative below (as the drawing or the reverser's stop puts it).", lo: -2000, hi: 2000},
			{keys: []string{p + "lever.union_pin"}, label: "Combination lever", say: "Along the combination lever from the radius rod's pin down to the union link's pin.", lo: 5, hi: 3000},
			{keys: []string{p + "union_link"}, label: "Union link", say: "The union link, crosshead-arm pin to the lever's pin, centre to centre.", lo: 5, hi: 1500},
			{keys: []string{p + "crosshead_arm.w"}, label: "Crosshead arm drop", say: "From the crosshead pin down to the union link's pin on the crosshead arm.", lo: 0, hi: 1500, k: -1},
			{keys: []string{p + "guide"}, label: "Valve spindle above the axle", say: "From the axle's centre up to the valve spindle's line, square to the cylinder line.", lo: -2000, hi: 3000},
		}
	}
	for _, q := range qs {
		q.step = stepGear
		fs = append(fs, q.field())
	}
	if s.Engine.Gear.Kind != setting.KindSingleEccentric {
		fs = append(fs, notchField(su))
	}
	return fs
}

// slip and crossed read a gear's choice (ok is false without the gear);
// setSlip and setCrossed set it.
func slip(s *session.Session) (bool, bool) {
	g := s.Engine.Gear.SingleEccentric
	return g != nil && g.Slip, g != nil
}
func crossed(s *session.Session) (bool, bool) {
	g := s.Engine.Gear.Stephenson
	return g != nil && g.Crossed, g != nil
}
func setSlip(s *session.Session, on bool)    { s.Engine.Gear.SingleEccentric.Slip = on }
func setCrossed(s *session.Session, on bool) { s.Engine.Gear.Stephenson.Crossed = on }

// travelField is the valve travel in full gear (twice the eccentric's
// throw, for a gear without a rocker), or the throw itself when the
// setter chose to give that; keys are the throws it sets (a Stephenson
// gear's two eccentrics alike).
func travelField(su *setUp, keys ...string) field {
	toggle := func(su *setUp, _ *session.Session) { su.throwForm = !su.throwForm }
	if su.throwForm {
		return ask{keys: keys, step: stepGear, label: "Eccentric throw", say: "Axle centre to the sheave's centre: half the travel it gives; measure the sheave's widest and narrowest sides from the axle and halve the difference.", lo: 1, hi: 300,
			form: "Valve travel instead", toggleForm: toggle}.field()
	}
	return ask{keys: keys, step: stepGear, label: "Valve travel", say: "How far the valve moves end to end in full gear, from the drawing or with the gauge over a turn: twice the eccentric's throw.", lo: 2, hi: 600, k: 2,
		form: "Eccentric throw instead", toggleForm: toggle}.field()
}

// notchField is where the running notch sits, as a percentage of the
// reverser's travel from mid gear to full forward; the setter may say the
// engine has none.
func notchField(su *setUp) field {
	f := field{Key: "engine.notches[0].reverser", Step: stepGear, Label: "Running notch", Plain: "%", Lo: 10, Hi: 95,
		Say: "Where the notch the engine mostly runs in sits, from mid gear (0) to full forward (100): count its notch on the quadrant (the 3rd of 8 is 38), or the screw's turns. Readings are taken there too.",
		get: func(s *session.Session) (float64, bool) {
			for _, n := range s.Engine.Notches {
				if n.Reverser > 0 {
					return 100 * float64(n.Reverser), true
				}
			}
			return 0, false
		},
		set: func(s *session.Session, v float64) {
			for i, n := range s.Engine.Notches {
				if n.Reverser > 0 {
					s.Engine.Notches[i].Reverser = setting.Reverser(v / 100)
					return
				}
			}
			s.Engine.Notches = append(s.Engine.Notches, setting.Notch{Name: "running notch", Reverser: setting.Reverser(v / 100)})
		}}
	f.form = "No running notch"
	f.toggle = func(su *setUp, s *session.Session) {
		kept := s.Engine.Notches[:0]
		for _, n := range s.Engine.Notches {
			if n.Reverser <= 0 {
				kept = append(kept, n)
			}
		}
		s.Engine.Notches = kept
		su.noNotch = true
	}
	f.skip = true
	return f
}

// Adjuster questions. An adjuster's values are kept in the session's
// list of adjustments; the valve on its spindle is always there (the plan
// needs at least one), the rods and sheaves when the setter says they can
// be changed.

// adjusterFields are the questions of how each adjuster is made: the
// valve spindle's thread, its flats a turn and how far it may go; then
// whether the rods and the sheaves (or a Walschaerts return crank) can be
// changed, and on what.
func adjusterFields(s *session.Session, su *setUp) []field {
	fs := threadFields(s, []session.Adjustment{{Kind: session.ValveOnSpindle}}, "Valve spindle", "the valve on its spindle (the spindle nut or buckle)", su)
	rods := rodKinds(s.Engine.Gear.Kind)
	fs = append(fs, rodsQuestion(rods))
	if r := adjustmentIndex(s, rods[0]); r >= 0 && !sameAsSpindle(s, s.Adjustments[r]) {
		fs = append(fs, threadFields(s, rods, "Rod ends", "the rods' ends", su)...)
	}
	turn := turnKinds(s.Engine.Gear.Kind)
	fs = append(fs, turnQuestion(s.Engine.Gear.Kind, turn))
	if adjustmentIndex(s, turn[0]) >= 0 {
		if turn[0].Kind == session.EccentricAngle {
			fs = append(fs, adjLength(turn, "sheave_diameter_mm", "Sheave diameter", "The eccentric sheave's diameter: a turn of it is marked as a distance round its rim.", 5, 1500,
				func(a *session.Adjustment) *float64 { return &a.SheaveDiameterMM }))
		}
		fs = append(fs, limitField(turn, "Turning limit", "How far it can be turned either way before something fouls, in degrees.", true))
	}
	return fs
}

// rodKinds are the rod adjusters of a gear of the kind given. (Appended,
// not slice literals: a literal of n adjustments makes the compiler an
// [n]Adjustment type and an equality function for it, code the browser
// build carries.)
func rodKinds(kind string) []session.Adjustment {
	var out []session.Adjustment
	switch kind {
	case setting.KindStephenson:
		out = append(out, session.Adjustment{Kind: session.EccentricRodLength, Eccentric: session.ForwardEccentric})
		return append(out, session.Adjustment{Kind: session.EccentricRodLength, Eccentric: session.BackwardEccentric})
	case setting.KindWalschaerts:
		out = append(out, session.Adjustment{Kind: session.EccentricRodLength})
		return append(out, session.Adjustment{Kind: session.RadiusRodLength})
	}
	return append(out, session.Adjustment{Kind: session.EccentricRodLength})
}

// turnKinds are the adjusters a gear of the kind given turns: its
// eccentric sheaves, or a Walschaerts return crank.
func turnKinds(kind string) []session.Adjustment {
	var out []session.Adjustment
	switch kind {
	case setting.KindStephenson:
		out = append(out, session.Adjustment{Kind: session.EccentricAngle, Eccentric: session.ForwardEccentric})
		return append(out, session.Adjustment{Kind: session.EccentricAngle, Eccentric: session.BackwardEccentric})
	case setting.KindWalschaerts:
		return append(out, session.Adjustment{Kind: session.ReturnCrankAngle})
	}
	return append(out, session.Adjustment{Kind: session.EccentricAngle})
}

// adjustmentIndex returns the index of the session's adjustment of adj's
// kind and eccentric, or -1.
func adjustmentIndex(s *session.Session, adj session.Adjustment) int {
	return findAdjustment(s.Adjustments, adj)
}

// adjustmentOf returns the session's adjustment of adj's kind and
// eccentric, added when missing.
func adjustmentFor(s *session.Session, adj session.Adjustment) *session.Adjustment {
	i := adjustmentIndex(s, adj)
	if i < 0 {
		s.Adjustments = append(s.Adjustments, adj)
		i = len(s.Adjustments) - 1
	}
	return &s.Adjustments[i]
}

// adjKey is the key of an adjuster's value: its place in the session's
// list named by its kind (and eccentric), then the value's own key.
func adjKey(adj session.Adjustment, key string) string {
	name := string(adj.Kind)
	if adj.Eccentric != "" {
		name += " " + string(adj.Eccentric)
	}
	return "adjustments[" + name + "]." + key
}

// adjPath gives the adjuster's value its place in the file as it stands.
func adjPath(adj session.Adjustment, key string) func(*session.Session) string {
	return func(s *session.Session) string {
		return fmt.Sprintf("adjustments[%d].%s", adjustmentIndex(s, adj), key)
	}
}

// adjLength is a length of the adjusters adjs (one value for all of
// them, kept in each).
func adjLength(adjs []session.Adjustment, key, label, say string, lo, hi float64, q func(*session.Adjustment) *float64) field {
	f := length(adjKey(adjs[0], key), stepAdjusters, label, say, lo, hi, 1, func(s *session.Session) *float64 { return q(adjustmentFor(s, adjs[0])) })
	f.set = func(s *session.Session, v float64) {
		for _, adj := range adjs {
			*q(adjustmentFor(s, adj)) = v
		}
	}
	f.path = adjPath(adjs[0], key)
	return f
}

// limitField is how far the adjusters adjs may be moved either way: a
// length, or degrees for a turn.
func limitField(adjs []session.Adjustment, label, say string, angle bool) field {
	f := adjLength(adjs, "max", label, say, 0.05, 100, func(a *session.Adjustment) *float64 { return &a.Max })
	if angle {
		f = plainNumber(f, "deg")
		f.Lo, f.Hi = 1, 45
	}
	set := f.set
	f.set = func(s *session.Session, v float64) {
		set(s, v)
		for _, adj := range adjs {
			adjustmentFor(s, adj).Min = -v
		}
	}
	return f
}

// threadFields are the thread the adjusters adjs (made alike) move on,
// in threads per inch or as a pitch, their flats a turn and their limit.
func threadFields(s *session.Session, adjs []session.Adjustment, name, what string, su *setUp) []field {
	adj := adjs[0]
	form := adjKey(adj, "thread")
	pitch := su.pitchForm(s, adj, form)
	var th field
	if pitch {
		th = adjLength(adjs, "thread.pitch_mm", name+": thread pitch", "The pitch of the thread "+what+" moves on: the distance from one thread to the next.", 0.1, 8,
			func(a *session.Adjustment) *float64 { return &a.Thread.PitchMM })
		th.form, th.toggle = "Threads per inch instead", func(su *setUp, _ *session.Session) { su.forms[form] = "tpi" }
	} else {
		th = plainNumber(adjLength(adjs, "thread.tpi", name+": threads per inch", "The thread "+what+" moves on, in threads per inch (40 for a 1/4 in ME thread).", 4, 80,
			func(a *session.Adjustment) *float64 { return &a.Thread.TPI }), "TPI")
		th.form, th.toggle = "Pitch instead", func(su *setUp, _ *session.Session) { su.forms[form] = "pitch" }
	}
	set := th.set
	th.set = func(s *session.Session, v float64) {
		set(s, v)
		for _, a := range adjs { // a thread is given one way: the other is cleared
			if t := &adjustmentFor(s, a).Thread; pitch {
				t.TPI = 0
			} else {
				t.PitchMM = 0
			}
		}
	}
	flats := func(n int, label string) choice {
		return choice{Label: label,
			on: func(s *session.Session) bool {
				i := adjustmentIndex(s, adjs[0])
				return i >= 0 && s.Adjustments[i].Thread.FlatsPerTurn == n
			},
			set: func(s *session.Session) {
				for _, a := range adjs {
					adjustmentFor(s, a).Thread.FlatsPerTurn = n
				}
			}}
	}
	fl := question(adjKey(adj, "thread.flats_per_turn"), stepAdjusters, name+": steps a turn", "How finely can it be turned: by flats of a hex nut (6), of a square one (4), or only by half turns (a fork end that must line up)?",
		flats(6, "6 (hex nut)"), flats(4, "4 (square nut)"), flats(2, "2 (half turns)"))
	fl.path = adjPath(adj, "thread")
	return []field{th, fl, limitField(adjs, name+": limit", "How far "+what+" can be moved either way before something fouls or the thread runs out.", false)}
}

// sameAsSpindle reports whether a rod adjuster is made on the spindle's
// thread, flats and limits.
func sameAsSpindle(s *session.Session, a session.Adjustment) bool {
	i := adjustmentIndex(s, session.Adjustment{Kind: session.ValveOnSpindle})
	if i < 0 {
		return false
	}
	sp := s.Adjustments[i]
	return a.Thread == sp.Thread && a.Min == sp.Min && a.Max == sp.Max
}

// rodsQuestion asks whether the rods' lengths can be changed, and on what.
func rodsQuestion(rods []session.Adjustment) field {
	words := "the eccentric rod"
	switch {
	case rods[0].Eccentric != "":
		words = "the eccentric rods"
	case len(rods) > 1:
		words = "the eccentric rod and the radius rod"
	}
	const same, own, none = 0, 1, 2
	pick := func(label string, k int) choice {
		return choice{Label: label,
			on: func(s *session.Session) bool {
				i := adjustmentIndex(s, rods[0])
				switch k {
				case none:
					return i < 0
				case same:
					return i >= 0 && sameAsSpindle(s, s.Adjustments[i])
				}
				return i >= 0 && !sameAsSpindle(s, s.Adjustments[i])
			},
			set: func(s *session.Session) {
				sp := *adjustmentFor(s, session.Adjustment{Kind: session.ValveOnSpindle})
				for _, r := range rods {
					i := adjustmentIndex(s, r)
					switch {
					case k == none && i >= 0:
						s.Adjustments = append(s.Adjustments[:i:i], s.Adjustments[i+1:]...)
					case k == same:
						a := adjustmentFor(s, r)
						a.Thread, a.Min, a.Max = sp.Thread, sp.Min, sp.Max
					case k == own && (i < 0 || sameAsSpindle(s, s.Adjustments[i])):
						a := adjustmentFor(s, r)
						a.Thread, a.Min, a.Max = session.Thread{}, 0, 0
					}
				}
			}}
	}
	f := question(adjKey(rods[0], "thread"), stepAdjusters, "Rod lengths", "Can the length of "+words+" be changed (a screwed end with a lock nut), and on what thread?",
		pick("Yes, on the spindle's thread", same), pick("Yes, on a thread of their own", own), pick("No", none))
	f.path = func(s *session.Session) string { return "adjustments" }
	return f
}

// turnQuestion asks whether the sheaves (or the return crank) can be
// turned.
func turnQuestion(kind string, turn []session.Adjustment) field {
	words, say := "The eccentric sheave", "Can the eccentric sheave be turned on the axle (set screws), or is it keyed?"
	switch kind {
	case setting.KindStephenson:
		words, say = "The eccentric sheaves", "Can the eccentric sheaves be turned on the axle (set screws), or are they keyed?"
	case setting.KindWalschaerts:
		words, say = "The return crank", "Can the return crank be turned on the crank pin (a clamp or a fitted bolt to redrill), or is it fixed?"
	}
	pick := func(label string, on bool) choice {
		return choice{Label: label,
			on: func(s *session.Session) bool { return (adjustmentIndex(s, turn[0]) >= 0) == on },
			set: func(s *session.Session) {
				for _, t := range turn {
					i := adjustmentIndex(s, t)
					switch {
					case !on && i >= 0:
						s.Adjustments = append(s.Adjustments[:i:i], s.Adjustments[i+1:]...)
					case on:
						adjustmentFor(s, t)
					}
				}
			}}
	}
	f := question(adjKey(turn[0], "turn"), stepAdjusters, words, say, pick("Can be turned", true), pick("Fixed", false))
	f.path = func(s *session.Session) string { return "adjustments" }
	return f
}

// parseEntry reads the typed text of field f: a plain number for an angle,
// a percentage or a count, else a length in the display unit turned into
// mm.
func (a *App) parseEntry(f field, text string) (float64, error) {
	if f.Angle || f.Plain != "" {
		v, err := strconv.ParseFloat(text, 64)
		if err != nil {
			return 0, fmt.Errorf("%q is not a number of %s.", text, plainWords(f))
		}
		return v, nil
	}
	return session.ParseLength(text, a.unit())
}

// plainWords names the unit of a plain number in words.
func plainWords(f field) string {
	switch f.Plain {
	case "%":
		return "per cent"
	case "TPI":
		return "threads per inch"
	}
	return "degrees"
}

// fieldUnit is the unit shown beside field f's entry.
func (a *App) fieldUnit(f field) string {
	switch {
	case f.Plain != "":
		return f.Plain
	case f.Angle:
		return "deg"
	}
	return a.unitLabel()
}

// showValue is v of field f as the keypad would have typed it: an inch
// dimension of the set-up as a fraction when it is one.
func (a *App) showValue(f field, v float64) string {
	switch {
	case f.Angle || f.Plain != "":
		return strings.TrimSuffix(strings.TrimRight(strconv.FormatFloat(v, 'f', 2, 64), "0"), ".")
	case a.unit() == session.UnitInch && isSetUp(f):
		return session.FormatInches(v)
	}
	return formatNumber(v, a.unit() == session.UnitInch)
}

// isSetUp reports whether f is a set-up value (not a reading).
func isSetUp(f field) bool { return !strings.HasPrefix(f.Key, "cylinders[") }

// fractions reports whether the keypad offers the fraction keys: an inch
// length is being typed.
func (a *App) fractions() bool {
	if a.unit() != session.UnitInch || len(a.fields) == 0 {
		return false
	}
	f := a.fields[min(a.fi, len(a.fields)-1)]
	return !f.Angle && f.Plain == "" && len(f.Choices) == 0
}

// assembles checks the engine after a set-up value changed: the sentence
// from setting naming the part that does not fit (a link that cannot
// close, a lever pin on the wrong side...), or "". A new engine is not
// checked until every value is in and worked out (see setUp); an engine
// kept is changed only by edits that read (session.Edit).
func (a *App) assembles() string {
	if a.su.active() {
		return ""
	}
	if err := a.Session().Engine.Validate(); err != nil {
		return sentence(err)
	}
	return ""
}

// hasSketch reports whether render draws a sketch for key.
func hasSketch(key string, th render.Theme) bool {
	return render.DimensionSketch(nopCanvas{}, render.Rect{}, key, th)
}

// nopCanvas draws nothing: hasSketch asks render whether a key has a
// sketch with it.
type nopCanvas struct{}

func (nopCanvas) Size() (float64, float64)                    { return 0, 0 }
func (nopCanvas) Fill(render.Path, render.FillStyle)          {}
func (nopCanvas) Stroke(render.Path, render.LineStyle)        {}
func (nopCanvas) Text(render.Point, string, render.TextStyle) {}
