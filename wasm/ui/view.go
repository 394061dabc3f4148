package ui

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

// Screen layout sizes, logical units.
const (
	margin  = 12                // screen edge to content
	barH    = render.HitMin     // the top bar: Back, status, Menu
	rowH    = render.HitMin + 4 // a list row or a button in a row
	gap     = 8                 // between rows
	entryH  = 64                // the typed entry's box
	sliderH = 56                // the what-if slider's band
)

// Target is one touch target of the screen shown: its words and where it
// is, for the glue's accessibility mirror and for tests.
type Target struct {
	Label string
	Rect  render.Rect
	On    bool // a chosen option of a group
	act   func()
	bar   bool // in the top bar, drawn over scrolled content
	over  bool // in the Undo bar, drawn over the content (records.go)
	track bool // the what-if's track, drawn as a slider (whatif.go)
	// caption is drawn instead of Label when set (a row's Delete, whose
	// Label names the record).
	caption string
}

// view is what one screen shows, laid out.
type view struct {
	title   string
	paras   []para
	targets []Target
	keypad  []KeyRect
	entry   render.Rect // the typed entry's box (keypad screens)
	body    render.Rect // the diagram's box (plan, cautions)
	slider  render.Rect // the what-if track (plan, balance)
	sketch  render.Rect // the set-up value's sketch (sizes)
	scrolls bool        // the plan's card is taller than the room left: the screen scrolls
	tall    bool        // a keypad screen's words and keys are taller than the screen: it scrolls
	bottom  float64     // the lowest y of the content, for scrolling
}

// para is a paragraph of the screen's text.
type para struct {
	lines []string
	at    render.Point
	size  float64
	bold  bool
	warn  bool
	muted bool
}

// layout lays out the current screen. Handle and Draw both use it, so a
// tap lands on what is drawn.
func (a *App) layout() *view {
	v := &view{}
	lay := &layouter{a: a, v: v, x: margin, w: a.w - 2*margin, y: barH + 2*margin}
	if len(a.stack) > 0 {
		v.targets = append(v.targets, Target{Label: "Back", Rect: rect(margin, margin/2, 80, barH), act: func() { a.Back() }, bar: true})
	}
	if a.screen != Menu {
		v.targets = append(v.targets, Target{Label: "Menu", Rect: rect(a.w-margin-80, margin/2, 80, barH), act: func() { a.navigate(Menu) }, bar: true})
	}
	if a.saveErr != "" && a.screen != Plan && a.screen != Cautions {
		lay.text(a.saveErr, true)
	}
	a.updateBanner(lay)
	switch a.screen {
	case Measure, Readings, Where:
		a.syncFields()
	case Sizes:
		if s := a.Session(); s != nil && (len(a.fields) == 0 || a.fields[0].Step != stepEngine && a.fields[0].Step != workedOut) {
			a.fields = a.sizeFields() // back from measuring: the last size
			a.setField(len(a.fields) - 1)
		}
	}
	switch a.screen {
	case Engines:
		a.enginesView(lay)
	case Gear:
		lay.title("New engine: which valve gear?")
		lay.text("Choose the gear first: the dimensions asked next depend on it. You give what you can measure or read off the drawing; the rest is worked out and shown.", false)
		for _, kind := range []string{setting.KindSingleEccentric, setting.KindStephenson, setting.KindWalschaerts} {
			lay.button(gearName(kind), false, func() { a.newEngine(kind) })
		}
	case Units:
		a.unitsView(lay)
	case Sizes, Measure, Lead:
		a.keypadView(lay)
	case Adjust:
		a.adjustView(lay)
	case EngineSheet:
		a.sheetView(lay)
	case Cautions:
		v.body = render.Rect{Min: render.Point{X: margin, Y: lay.y}, Max: render.Point{X: a.w - margin, Y: a.h - margin}}
		if !render.LayoutCautions(v.body, setting.Cautions()).Fits {
			v.body.Max.Y = v.body.Min.Y + render.CautionsHeight(v.body.W())
		}
		lay.y = v.body.Max.Y
		ack := render.LayoutCautions(v.body, setting.Cautions()).Ack
		v.targets = append(v.targets, Target{Label: render.AckLabel, Rect: ack, act: a.acknowledge})
	case Readings:
		a.readingsView(lay)
	case Plan:
		a.planView(lay)
	case History:
		a.historyView(lay)
	case Menu:
		a.menuView(lay)
	case Whole:
		a.wholeView(lay)
	case Listen:
		a.listenView(lay)
	case Where:
		f := a.fields[a.fi]
		lay.muted(f.Label + ": the engine as drawn, about where it stands for this reading. Drag sideways to turn the wheel.")
		v.body = render.Rect{Min: render.Point{X: margin, Y: lay.y}, Max: render.Point{X: a.w - margin, Y: a.h - margin}}
		if need := render.LayoutMotion(v.body, a.engine, a.wherePosition()).NeedH; need > v.body.H() {
			v.body.Max.Y, v.tall = v.body.Min.Y+need, true // a short phone on its side: the screen scrolls
		}
		lay.y = v.body.Max.Y
	}
	v.bottom = lay.y + a.undoRoom()
	a.scrolled(v)
	a.undoBar(v)
	return v
}

// fitted reports whether the screen laid out in v is fitted to the
// screen's height rather than scrolled.
func (a *App) fitted(v *view) bool {
	return v.keypad != nil && !v.tall || a.screen == Plan && !v.scrolls || a.screen == Where && !v.tall
}

// scrolled moves the content (not the top bar) up by the scroll.
func (a *App) scrolled(v *view) {
	maxS := math.Max(0, v.bottom+margin-a.h)
	if a.fitted(v) {
		maxS = 0
	}
	a.scroll = math.Max(0, math.Min(a.scroll, maxS))
	if a.scroll == 0 {
		return
	}
	dy := -a.scroll
	for i := range v.paras {
		v.paras[i].at.Y += dy
	}
	for i := range v.targets {
		if !v.targets[i].bar {
			v.targets[i].Rect = shift(v.targets[i].Rect, dy)
		}
	}
	v.body = shift(v.body, dy)
	v.slider = shift(v.slider, dy)
	v.entry = shift(v.entry, dy)
	v.sketch = shift(v.sketch, dy)
}

// cardNeed is the height the plan screen's card needs in box: the tabs
// and the diagram at its least (render.ScreenNeedH). It is worked out
// once per model, tab, position and box.
func (a *App) cardNeed(box render.Rect) float64 {
	k := needKey{a.shownModel(), a.diagram, a.position, box}
	if k == a.needK {
		return a.needV
	}
	a.needK, a.needV = k, render.ScreenNeedH(k.m, a.renderScreen(), box)
	return a.needV
}

// needKey is what the plan card's height was worked out for.
type needKey struct {
	m   *render.Model
	d   render.Diagram
	pos int
	box render.Rect
}

// layouter stacks a screen's parts down the page.
type layouter struct {
	a    *App
	v    *view
	x, w float64
	y    float64
}

// rect returns the box at (x, y) of size w by h.
func rect(x, y, w, h float64) render.Rect {
	return render.Rect{Min: render.Point{X: x, Y: y}, Max: render.Point{X: x + w, Y: y + h}}
}

// shift moves r down by dy.
func shift(r render.Rect, dy float64) render.Rect {
	r.Min.Y += dy
	r.Max.Y += dy
	return r
}

func (l *layouter) title(t string) {
	l.v.title = t
	l.para(t, render.TitleSize, true, false, false)
}

func (l *layouter) text(t string, warn bool) {
	l.para(t, render.BodySize+2, false, warn, false)
}

func (l *layouter) muted(t string) {
	size := float64(render.BodySize)
	if l.a.screen == Plan {
		size = legibleSize // read at arm's length by the engine
	}
	l.para(t, size, false, false, true)
}

// legibleSize is the least text size of the plan screen and the top bar,
// read at arm's length outdoors (15 CSS px; common practice, no source).
const legibleSize = 15

func (l *layouter) para(t string, size float64, bold, warn, muted bool) {
	if t == "" {
		return
	}
	lines := render.Wrap(t, l.w, size, bold)
	l.v.paras = append(l.v.paras, para{lines: lines, at: render.Point{X: l.x, Y: l.y}, size: size, bold: bold, warn: warn, muted: muted})
	l.y += float64(len(lines))*size*render.LineHeight + gap
}

// button adds a full-width row.
func (l *layouter) button(label string, on bool, act func()) {
	l.row([]string{label}, []bool{on}, []func(){act})
}

// row adds buttons side by side sharing the width, in as many rows as it
// takes to keep each a fingertip (render.HitMin) wide and its label whole
// (on one line or two).
func (l *layouter) row(labels []string, on []bool, acts []func()) {
	per := max(1, int((l.w+gap)/(render.HitMin+gap)))
	for per > 1 && !labelsFit(labels[:min(per, len(labels))], on, l.w) {
		per--
	}
	if len(labels) > per {
		l.row(labels[:per], on[:per], acts[:per])
		l.row(labels[per:], on[per:], acts[per:])
		return
	}
	n := float64(len(labels))
	w := (l.w - (n-1)*gap) / n
	for i, lab := range labels {
		l.v.targets = append(l.v.targets, Target{Label: lab, Rect: rect(l.x+float64(i)*(w+gap), l.y, w, rowH), On: on[i], act: acts[i]})
	}
	l.y += rowH + gap
}

// labelsFit reports whether every label fits its button, on one line or
// two at 15 px or more, when they share the width w in one row (see
// drawPlain; a chosen option's label, on[i], is marked "* ").
func labelsFit(labels []string, on []bool, w float64) bool {
	bw := (w-float64(len(labels)-1)*gap)/float64(len(labels)) - 16
	for i, lab := range labels {
		if on[i] {
			lab = "* " + lab
		}
		if _, size := render.ButtonLines(lab, bw, rowH-4); size < legibleSize {
			return false
		}
	}
	return true
}

// gearName names a gear kind for the user.
func gearName(kind string) string {
	switch kind {
	case setting.KindStephenson:
		return "Stephenson link motion"
	case setting.KindWalschaerts:
		return "Walschaerts gear"
	case setting.KindSingleEccentric:
		return "Single (slip) eccentric"
	}
	return kind
}

func (a *App) enginesView(l *layouter) {
	l.title("Engines")
	l.text(a.loadNote, true)
	l.text(a.importErr, true)
	a.importQuestion(l)
	for _, e := range a.stored {
		e := e
		if e.Session == nil {
			l.text(e.Err, true)
			a.rowWithDelete(l, "Export the unreadable "+e.Key, "the unreadable "+e.Key, func() {
				if a.opt.OnExport != nil {
					a.opt.OnExport(strings.ReplaceAll(e.Key, "/", "-")+".json", e.Raw)
				}
			}, func() { a.deleteEngine(e) })
			continue
		}
		a.rowWithDelete(l, a.engineLabel(e), e.Session.Name, func() { a.openSession(e) }, func() { a.deleteEngine(e) })
	}
	if a.draftSession != nil {
		l.button("Carry on setting up "+a.draftSession.Name, false, a.carryOn)
	}
	l.muted("Start from an invented demo engine (made up, not a real locomotive), or set up your own:")
	for _, spec := range setting.DemoEngines() {
		spec := spec
		l.button(spec.Name+" (invented demo)", false, func() { a.startSetUp(spec) })
	}
	l.button("New engine", false, func() { a.navigate(Gear) })
	if a.opt.OnImport != nil {
		l.button(ImportLabel, false, a.opt.OnImport)
	}
}

func (a *App) unitsView(l *layouter) {
	s := a.Session()
	l.title("Units and dial gauge")
	l.text("How do you read lengths? Numbers you type are in this unit; the file keeps mm.", false)
	set := func(u session.Unit) func() {
		return func() { a.setUnit(u) }
	}
	l.row([]string{"mm", "inch"}, []bool{s.DisplayUnit != session.UnitInch, s.DisplayUnit == session.UnitInch}, []func(){set(session.UnitMM), set(session.UnitInch)})
	l.text("The smallest division of your dial gauge:", false)
	res := []float64{0.01, 0.02, 0.0254, 0.0127}
	labels := []string{"0.01 mm", "0.02 mm", "0.001 in", "0.0005 in"}
	on := make([]bool, len(res))
	acts := make([]func(), len(res))
	for i, r := range res {
		on[i] = s.Measuring.GaugeResolutionMM == r
		acts[i] = func() { a.setDivision(r) }
	}
	l.row(labels[:2], on[:2], acts[:2])
	l.row(labels[2:], on[2:], acts[2:])
	a.cylinderCountRow(l)
	a.nameRow(l)
	if a.su.active() || len(a.stack) == 0 || a.stack[len(a.stack)-1] != Menu {
		l.button("Next", false, a.startSizes)
		return
	}
	l.button("Done", false, a.done)
}

func (a *App) adjustView(l *layouter) {
	s := a.Session()
	l.title("What can you adjust on this engine?")
	l.text("Tap to turn each on or off. The plan only changes what is on.", false)
	for _, adj := range defaultAdjustments(s.Engine.Gear.Kind) {
		adj := adj
		i := findAdjustment(s.Adjustments, adj)
		l.button(adjustmentName(adj), i >= 0, func() {
			if j := findAdjustment(s.Adjustments, adj); j >= 0 {
				s.Adjustments = append(s.Adjustments[:j:j], s.Adjustments[j+1:]...)
			} else {
				s.Adjustments = append(s.Adjustments, adj)
			}
			a.save()
			a.dirty = true
		})
	}
	l.button("Next: start measuring", false, a.startMeasuring)
}

// findAdjustment returns the index of the adjustment of adj's kind and
// eccentric in list, or -1.
func findAdjustment(list []session.Adjustment, adj session.Adjustment) int {
	for i, b := range list {
		if b.Kind == adj.Kind && b.Eccentric == adj.Eccentric {
			return i
		}
	}
	return -1
}

// keypadLevels is how many ways the keypad screens have to make their
// words fit above the keypad: as laid out, then the instructions in the
// smaller size, then the rows of buttons merged into one.
const keypadLevels = 3

// keypadView lays out a keypad screen (set-up sizes, a reading): the
// step's words and the entry above the keypad on a phone held upright,
// beside it on one held sideways. The keys shrink from KeyHeight to
// render.HitMin when the words need the room, and the words tighten (see
// keypadLevels) when that is not enough.
func (a *App) keypadView(l *layouter) {
	if len(a.fields) == 0 {
		return
	}
	if a.screen == Sizes && len(a.fields[a.fi].Choices) > 0 {
		a.choiceView(l)
		return
	}
	side := a.w > a.h // landscape: the keypad in the right half
	if side {
		l.w = (a.w - 3*margin) / 2
	}
	y0, nt, np := l.y, len(l.v.targets), len(l.v.paras)
	var box render.Rect
	for level := 0; level < keypadLevels; level++ {
		l.y, l.v.targets, l.v.paras = y0, l.v.targets[:nt], l.v.paras[:np]
		a.keypadWords(l, level)
		if side {
			box = render.Rect{Min: render.Point{X: a.w/2 + margin/2, Y: y0}, Max: render.Point{X: a.w - margin, Y: a.h - margin}}
			if l.y <= a.h-margin {
				break
			}
		} else {
			box = render.Rect{Min: render.Point{X: margin, Y: l.y}, Max: render.Point{X: a.w - margin, Y: a.h - margin}}
			if box.H() >= KeypadMinHeight {
				break
			}
		}
	}
	// A short phone (320 x 568) has too little height for the words and
	// the keys even at the tightest level: the keys go under the words
	// at their least height, and the screen scrolls.
	if !side && box.H() < KeypadMinHeight {
		box.Max.Y = box.Min.Y + KeypadMinHeight
		l.y, l.v.tall = box.Max.Y, true
	}
	l.v.tall = l.v.tall || side && l.y > a.h-margin
	l.v.keypad = LayoutKeypad(box, a.fractions())
	for _, k := range l.v.keypad {
		k := k
		l.v.targets = append(l.v.targets, Target{Label: k.Key.Label(), Rect: k.Rect, act: func() { a.key(k.Key) }})
	}
}

// keypadWords lays out what a keypad screen says above the keys, tighter
// at each level.
func (a *App) keypadWords(l *layouter, level int) {
	f := a.fields[a.fi]
	s := a.Session()
	head := f.Step
	if a.screen == Measure {
		head = fmt.Sprintf("Round %d: %s", a.round+1, f.Step)
		if len(s.Cylinders) > 1 {
			head = fmt.Sprintf("%s, round %d: %s", a.cylinderName(), a.round+1, f.Step)
		}
	}
	l.title(head)
	if level == 0 {
		l.text(f.Say, false)
	} else {
		l.para(f.Say, render.BodySize, false, false, false)
	}
	if a.screen == Sizes && hasSketch(f.Key, a.theme) {
		h := [keypadLevels]float64{150, 110, render.SketchMinH}[level]
		l.v.sketch = rect(l.x, l.y, l.w, h)
		l.y += h + gap
	}
	l.para(f.Label+" ("+a.fieldCount()+")", render.BodySize+2, true, false, false)
	l.v.entry = rect(l.x, l.y, l.w, entryH)
	l.y += entryH + gap
	note := a.note
	if note == "" && a.warn != "" {
		note = "Check the last entry: " + a.warn
	}
	l.para(note, render.BodySize, false, true, false)
	if a.screen == Lead {
		l.button("No target lead", false, a.clearTargetLead)
	}
	if a.screen == Sizes && f.form != "" {
		l.button(f.form, false, a.toggleForm)
	}
	if a.fractions() && level == 0 && !strings.HasSuffix(f.Key, "gauge_mm") { // a dial gauge reads in decimals
		l.muted("A fraction goes in as soon as its bottom (2 to 64) is typed.")
	}
	if a.screen != Measure {
		return
	}
	l.muted(a.deadCentreFound())
	var extra []string
	var extraActs []func()
	if f.Step == portMarksStep {
		say, keep := a.marksAdvice()
		l.muted(say)
		if keep != "" {
			extra, extraActs = append(extra, keep), append(extraActs, a.keepMarks)
		}
	}
	if label, act := a.formChoice(); label != "" {
		extra, extraActs = append(extra, label), append(extraActs, act)
	}
	if len(extra) > 0 {
		l.row(extra, make([]bool, len(extra)), extraActs)
	}
	labels := []string{"Where", "All readings"}
	acts := []func(){a.showWhere, func() { a.navigate(Readings) }}
	if f.Optional {
		labels = append(labels, "Skip")
		acts = append(acts, a.skipStep)
	}
	if del := a.deleteHere(); del != nil {
		labels = append(labels, RemoveLabel)
		acts = append(acts, del)
	}
	if a.ready() {
		labels = append(labels, "Plan")
		acts = append(acts, func() { a.planRound = 0; a.navigate(Plan); a.makePlan() })
	}
	on := make([]bool, len(labels))
	if level >= 2 && len(s.Cylinders) > 1 && len(labels)+len(s.Cylinders) <= 6 {
		labels[1] = "Readings"
		for i, c := range s.Cylinders {
			labels = append(labels, title(c.Name))
			on = append(on, i == a.cyl)
			acts = append(acts, func() { a.switchCylinder(i) })
		}
		l.row(labels, on, acts)
		return
	}
	l.row(labels, on, acts)
	a.cylinderRow(l)
}

// hasBlocking reports whether any problem stops a plan.
func hasBlocking(ps []session.Problem) bool {
	for _, p := range ps {
		if p.Blocking {
			return true
		}
	}
	return false
}

func (a *App) readingsView(l *layouter) {
	s := a.Session()
	if len(s.Cylinders) > 1 {
		l.title(fmt.Sprintf("%s, round %d: every reading", a.cylinderName(), a.round+1))
	} else {
		l.title(fmt.Sprintf("Round %d: every reading", a.round+1))
	}
	a.cylinderRow(l)
	l.button(fmt.Sprintf("Plan from round %d", a.round+1), false, a.showRoundPlan)
	l.muted("Tap a reading to type it again; Next saves it and comes back here.")
	for i, f := range a.fields {
		i := i
		val := "not taken"
		if v, ok := f.get(s); ok {
			val = a.showValue(f, v) + " " + a.fieldUnit(f)
		}
		l.button(f.Label+": "+val, false, func() {
			a.setField(i)
			a.navigate(Measure)
			a.editing = true
		})
	}
}

func (a *App) menuView(l *layouter) {
	l.title("Menu")
	l.button("Engines", false, func() { a.navigate(Engines) })
	l.button("Cautions", false, func() { a.after = 0; a.navigate(Cautions) })
	if a.Session() != nil {
		l.button("All readings", false, func() {
			if a.fieldsFor.s != a.Session() || a.fieldsFor.cyl != a.cyl || a.screen == Sizes || a.screen == Lead {
				a.round = len(a.Session().Cylinders[a.cyl].Rounds) - 1
				if a.round < 0 {
					return
				}
				a.fields = a.roundFields(a.round)
			}
			a.navigate(Readings)
		})
		l.button("Plan", false, func() { a.planRound = 0; a.navigate(Plan); a.makePlan() })
		l.button("History of rounds", false, func() { a.navigate(History) })
		l.button(WholeLabel, false, a.showWhole)
		l.button("Edit the engine", false, a.openSheet)
		l.button("Units and dial gauge", false, func() { a.navigate(Units) })
		l.button("Export the session file", false, a.export)
		if a.opt.OnName != nil {
			l.button(RenameLabel, false, a.rename)
		}
		if a.opt.OnShare != nil && a.model != nil {
			l.button("Share report", false, a.share)
		}
		if a.opt.OnCopy != nil && a.plan != nil {
			l.button(CopyLabel, false, a.copyWords)
			l.text(a.copyNote, a.copyFailed)
		}
	}
	if a.opt.OnImport != nil {
		l.button(ImportLabel, false, a.opt.OnImport)
	}
	l.text(a.importErr, true)
}

// acknowledge records the cautions as read and goes on.
func (a *App) acknowledge() {
	if !a.acked {
		a.acked = true
		a.put(AckKey, []byte("true"))
	}
	if a.after == Measure {
		a.after = 0
		a.screen = Measure // the cautions are not a step to go back to
		a.dirty = true
		return
	}
	a.Back()
}

// planTabNames name the plan screen's tabs, one per diagram of planTabs.
func planTabNames() [4]string { return [4]string{"Steps", "Balance", "Curve", "Motion"} }

// planTabs are the plan screen's diagrams.
func planTabs() [4]render.Diagram {
	return [4]render.Diagram{render.PlanDiagram, render.BalanceDiagram, render.ValveCurveDiagram, render.MotionDiagram}
}

func (a *App) planView(l *layouter) {
	side := a.w > a.h // landscape: one row of cylinders, tabs and actions, the most room for the diagram
	if !side || a.model == nil {
		a.cylinderRow(l)
	}
	if a.model == nil {
		l.title("Plan")
		if len(a.planNote) == 0 {
			l.text("No plan yet: take the readings first.", false)
		}
		for _, n := range a.planNote {
			l.text(n, true)
		}
		l.button("All readings", false, func() { a.navigate(Readings) })
		return
	}
	names := planTabNames()
	labels := names[:]
	on := make([]bool, len(labels))
	acts := make([]func(), len(labels))
	for i, d := range planTabs() {
		d := d
		on[i] = a.diagram == d
		acts[i] = func() { a.diagram = d; a.dirty = true }
	}
	if side {
		labels = append(labels, "Next round", "Rounds", moreReadings)
		on = append(on, false, false, false)
		acts = append(acts, a.nextRound, func() { a.navigate(History) }, a.moreReadings)
		if cs := a.Session().Cylinders; len(cs) > 1 {
			var cl []string
			var con []bool
			var cact []func()
			for i, c := range cs {
				cl, con, cact = append(cl, title(c.Name)), append(con, i == a.cyl), append(cact, func() { a.switchCylinder(i) })
			}
			labels, on, acts = append(cl, labels...), append(con, on...), append(cact, acts...)
		}
	}
	l.row(labels, on, acts)
	a.findingRows(l)
	bottom := a.h - margin - rowH
	if side {
		bottom = a.h
	}
	switch a.diagram {
	case render.BalanceDiagram:
		a.whatIfRows(l)
	case render.PlanDiagram:
		a.priorityRows(l)
	}
	l.v.body = render.Rect{Min: render.Point{X: margin, Y: l.y}, Max: render.Point{X: a.w - margin, Y: bottom - gap}}
	if need := a.cardNeed(l.v.body); need > l.v.body.H() {
		// The card keeps its height and the screen scrolls to it.
		l.v.body.Max.Y = l.v.body.Min.Y + need
		l.v.scrolls = true
		l.y = l.v.body.Max.Y + gap
		if !side {
			l.row([]string{"Next round", "Rounds", moreReadings}, []bool{false, false, false}, []func(){a.nextRound, func() { a.navigate(History) }, a.moreReadings})
		}
		return
	}
	if side {
		return
	}
	y := l.y
	l.y = bottom
	l.row([]string{"Next round", "Rounds", moreReadings}, []bool{false, false, false}, []func(){a.nextRound, func() { a.navigate(History) }, a.moreReadings})
	l.y = math.Max(l.y, y)
}

// Targets returns the touch targets of the screen shown, in drawing
// order: for the glue's accessibility mirror and for tests.
func (a *App) Targets() []Target {
	v := a.layout()
	if a.screen == Plan && a.model != nil {
		hits := render.LayoutScreen(a.shownModel(), a.renderScreen(), v.body)
		for i, r := range hits.Positions {
			v.targets = append(v.targets, Target{Label: a.model.PositionNames()[i], Rect: r})
		}
	}
	return v.targets
}

// renderScreen is what the plan screen's diagram shows.
func (a *App) renderScreen() render.Screen {
	return render.Screen{Diagram: a.diagram, Position: a.position, CrankDeg: a.crankDeg}
}

// Handle acts on one intent.
func (a *App) Handle(in Intent) {
	v := a.layout()
	switch in.Kind {
	case Confirm:
		switch a.screen {
		case Sizes, Measure, Lead:
			a.key(KeyNext)
		case Cautions:
			a.acknowledge()
		}
	case Drag:
		a.dirty = true
		if a.screen == Plan && v.slider.Inset(-gap).Contains(in.At) && v.slider.W() > 0 {
			t := (in.At.X - v.slider.Min.X) / v.slider.W()
			_ = a.SetWhatIfAdjustment(a.what.adj, a.what.lo+math.Max(0, math.Min(1, t))*(a.what.hi-a.what.lo))
			return
		}
		// Sideways on the motion drawing turns the wheel; up and down
		// scrolls a screen too short for it.
		if (a.screen == Plan && a.diagram == render.MotionDiagram || a.screen == Where) && math.Abs(in.Delta.X) >= math.Abs(in.Delta.Y) {
			a.crankDeg = math.Mod(a.crankDeg+in.Delta.X+360, 360)
			return
		}
		a.scroll -= in.Delta.Y
	case Tap:
		underBar := in.At.Y < barH+margin
		for _, t := range v.targets {
			if t.act != nil && t.Rect.Contains(in.At) && t.bar == underBar {
				a.dirty = true
				t.act()
				return
			}
		}
		if a.screen == Plan && a.model != nil {
			hits := render.LayoutScreen(a.shownModel(), a.renderScreen(), v.body)
			for i, r := range hits.Positions {
				if r.Contains(in.At) {
					a.position, a.dirty = i, true
				}
			}
			for i, r := range hits.Steps {
				if r.Contains(in.At) {
					a.setWhatStep(i)
					a.diagram, a.dirty = render.BalanceDiagram, true
				}
			}
		}
	}
}

// fieldCount says where the current field stands among its kind: the
// readings a plan needs ("4 of 12"), or the optional ones, a tap away
// under More readings ("2 of 96 more"), so a round never looks longer
// than the setter's part of it.
func (a *App) fieldCount() string {
	f := a.fields[a.fi]
	k, n := 0, 0
	for i, g := range a.fields {
		if g.Optional == f.Optional {
			n++
			if i <= a.fi {
				k++
			}
		}
	}
	if f.Optional {
		return strconv.Itoa(k) + " of " + strconv.Itoa(n) + " more"
	}
	return strconv.Itoa(k) + " of " + strconv.Itoa(n)
}
