package ui

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"time"

	"evenbeat/render"
	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Screen is which page the app shows.
type Screen uint8

// The screens, in the order of the flow.
const (
	Engines     Screen = iota // saved engines, the invented demo engines, a new engine
	Gear                      // set-up: the gear type first
	Units                     // set-up: mm or inch, the gauge's division
	Sizes                     // set-up: the dimensions, on the keypad
	Adjust                    // set-up: which adjustments this engine has
	Cautions                  // the safety card: first run, and from the menu
	Measure                   // one reading at a time, on the keypad
	Readings                  // every reading of the round, to choose one to edit
	Plan                      // the plan's steps, balance, valve curve, motion; what-if
	History                   // the rounds so far
	Menu                      // everywhere else from anywhere
	Where                     // the engine drawn where it stands for the reading asked
	Lead                      // the plan's target lead, on the keypad
	EngineSheet               // what was worked out and given of the engine: the end of set-up, and its editing
	Whole                     // the whole engine: the beat, each end's work, the quartering
	Listen                    // listening to the beat: the cautions, the recording
)

// String names the screen for the page's state (tests, the History API).
func (s Screen) String() string {
	names := [...]string{"engines", "gear", "units", "sizes", "adjust", "cautions", "measure", "readings", "plan", "history", "menu", "where", "lead", "engine", "whole", "listen"}
	if int(s) < len(names) {
		return names[s]
	}
	return "screen" + strconv.Itoa(int(s))
}

// IntentKind is what the user means, whatever the device.
type IntentKind uint8

// Intent kinds.
const (
	Tap     IntentKind = iota // a short press and release at At
	Drag                      // a finger moving by Delta, now at At
	Confirm                   // Enter or Space: the screen's main action
)

// Intent is one user action, folded from pointer events and keys by the
// glue.
type Intent struct {
	Kind  IntentKind
	At    render.Point
	Delta render.Point
}

// Options configure an App.
type Options struct {
	// Store keeps sessions; nil keeps nothing (the app says so).
	Store Store
	// Theme is the palette; the zero Theme means render.Light().
	Theme render.Theme
	// Now dates new rounds; nil means time.Now.
	Now func() time.Time
	// OnExport, when set, is called with a file name and the bytes to
	// save when the user asks for an export (the glue offers a download or
	// Web Share).
	OnExport func(name string, data []byte)
	// OnImport, when set, is called when the user asks to import a file;
	// the glue opens a file chooser and hands the bytes to App.Import.
	OnImport func()
	// OnName, when set, is called with the engine's current name when the
	// user asks to rename it; the glue shows a text box over the canvas,
	// then calls App.Rename.
	OnName func(current string)
	// OnShare, when set, is called with a file name and the report to
	// draw when the user asks to share the plan; the glue draws
	// render.Report and shares or downloads the PNG.
	OnShare func(fileName string, m render.ReportModel)
	// OnUpdate, when set, is called when the user chose to restart into
	// the new version (after SetUpdateReady(true)).
	OnUpdate func()
	// OnCopy, when set, is called with the plan's words when the user asks
	// to copy them; the glue puts them on the clipboard and reports how it
	// went through App.CopyDone.
	OnCopy func(text string)
	// Microphone, when set, records the engine's exhaust (listen.go).
	Microphone Microphone
}

// App is the phone app's screens and flow. Handle, Update, Back, Resize,
// Import and Draw must be called from one goroutine (the game loop); the
// store's answers may arrive on any goroutine and are taken in by Update.
type App struct {
	opt    Options
	theme  render.Theme
	w, h   float64
	screen Screen
	stack  []Screen // where Back returns to
	scroll float64  // how far a list or card is scrolled up
	dirty  bool

	stored   []*Stored
	index    []string // the stored sessions' keys
	cur      *Stored  // the session being set
	loadNote string   // a sentence about loading, shown on the engines list
	acked    bool
	after    Screen // where acknowledging the cautions leads (Measure), or Menu for Back

	// The keypad form: set-up dimensions or a round's readings.
	fields []field
	fi     int
	cyl    int    // the cylinder being measured or planned (index)
	round  int    // the round being measured (index)
	text   string // what has been typed for fields[fi]
	typed  bool
	// editing is set while one reading chosen from a round's list is
	// typed again: Next saves it and returns to the list.
	editing bool
	// The forms new readings are asked in: cut-offs as tyre marks rather
	// than crosshead travel, steam edges as laps rather than port marks
	// (app state: the session file keeps each reading in its own form).
	tyreCutOffs, lapsForm bool
	note                  string // a sentence under the entry: implausible, or an error
	warn                  string // a warning about the entry just committed

	// Saving.
	mu      sync.Mutex
	answers []saveResult
	seq     int                // writes asked for so far
	open    int                // writes not yet answered
	failed  map[string]failure // the keys whose last write failed, until a later write of each succeeds
	okSeq   map[string]int     // each key's latest write that succeeded
	noStore string             // the sentence when the browser gives no storage
	saveErr string             // the failure shown: the current engine's, or the app's own keys'
	status  string
	retired map[string]bool // keys of engines deleted in this run: never given to another

	// Entries and records (entry.go, records.go).
	confirmed string            // the unusual entry a second Next takes: field key and text
	drafts    map[draftKey]bool // cylinders whose latest round was made and has no value yet
	undoing   *undoOffer        // the Undo bar's offer, after a delete
	asking    *importAsk        // an import of an engine already here, waiting for the answer

	// The plan.
	planRound  int // the round planned, counting from 1; 0 the latest
	fit        *plan.Fit
	plan       *plan.Plan
	model      *render.Model
	planNote   []string // why there is no plan, or what weakens it
	diagram    render.Diagram
	position   int
	crankDeg   float64
	what       whatIf
	importErr  string
	copyNote   string        // how the last copy of the plan's words went, on the menu
	copyFailed bool          // copyNote says why it failed
	engine     *render.Model // the engine as drawn, for the drawing of where
	engineOf   *session.Session

	updateReady bool          // a new version waits: the banner shows
	planTime    time.Duration // how long the last fit, plan and model took
	otherTime   time.Duration // how long the other priority's plan took, made after
	// words are PlanText's words for the plan wordsOf in wordsUnit.
	wordsOf   *plan.Plan
	wordsUnit session.Unit
	words     string
	drawnPlan bool // the plan has been drawn while its other priority waits

	// The keypad's fields while the target lead is typed, given back after.
	leadFields []field
	leadFi     int
	fieldsFor  fieldsKey // what the reading fields were listed for
	needK      needKey   // the plan card's height, worked out for needK
	needV      float64
	paths      map[pathKey]render.Path // the buttons' outlines, kept between frames
	hist       historyCache            // the rounds' history (history.go)

	// su is the set-up's state (setupflow.go); draftSession and
	// draftSetUp a new engine's set-up left unfinished, to carry on;
	// sheetGen the change the engine's sheet last worked out.
	su setUp
	findingsCache
	draftSession *session.Session
	draftSetUp   setUp
	sheetGen     int

	// gen counts changes to the session; readiness is worked out again
	// only when it, the session or the cylinder changes.
	gen    int
	readyK readyKey
	readyV bool

	whole wholeEngine // the whole engine's beat (whole.go)
	lis   listening   // listening to it (listen.go)
}

// readyKey is what the cached readiness was worked out for.
type readyKey struct {
	s        *session.Session
	cyl, gen int
}

// ready reports whether the shown cylinder's readings are enough for a
// plan (no blocking problem), worked out once per change.
func (a *App) ready() bool {
	k := readyKey{a.Session(), a.cyl, a.gen}
	if k.s == nil {
		return false
	}
	if k != a.readyK {
		a.readyK, a.readyV = k, !hasBlocking(k.s.Readiness(a.cyl))
	}
	return a.readyV
}

// New starts the app: it loads the stored sessions (keeping any that
// cannot be read, with the reason) and opens on the engines list.
func New(opt Options) *App {
	a := &App{opt: opt, theme: opt.Theme, dirty: true, status: "Not saved yet", su: newSetUp(false)}
	if a.theme == (render.Theme{}) {
		a.theme = render.Light()
	}
	if opt.Store == nil {
		a.loadNote = "This browser gives the app no storage: nothing you enter will be kept. Export the session file before you close the page."
		a.noStore = "Not saved: this browser gives the app no storage. Export the session file (Menu, Export) to keep it."
		a.setStatus()
		return a
	}
	stored, index, err := loadAll(opt.Store)
	if err != nil {
		a.loadNote = err.Error()
	}
	a.stored, a.index = stored, index
	if _, ok, err := opt.Store.Get(AckKey); err == nil && ok {
		a.acked = true
	}
	a.loadDraft()
	return a
}

// Screen returns the screen shown.
func (a *App) Screen() Screen { return a.screen }

// Status returns the saving state shown on every screen: "Saved" only once
// the store has reported the latest write complete.
func (a *App) Status() string { return a.status }

// Note returns the sentence under the keypad entry ("" when none).
func (a *App) Note() string { return a.note }

// Field returns the label of the value the keypad is entering ("" off
// the keypad screens).
func (a *App) Field() string {
	if !a.keypadScreen() || len(a.fields) == 0 {
		return ""
	}
	return a.fields[a.fi].Label
}

// Session returns the session being set, or nil.
func (a *App) Session() *session.Session {
	if a.cur == nil {
		return nil
	}
	return a.cur.Session
}

// StoredSessions returns every stored session, readable or not.
func (a *App) StoredSessions() []*Stored { return a.stored }

// Dirty reports whether the screen changed since the last Draw.
func (a *App) Dirty() bool { return a.dirty }

// Resize sets the screen size in logical units.
func (a *App) Resize(w, h float64) {
	if w != a.w || h != a.h {
		a.w, a.h, a.dirty = w, h, true
	}
}

// Update takes in the store's answers; call it once a tick. It reports
// whether the screen must be drawn again.
func (a *App) Update() bool {
	a.mu.Lock()
	ans := a.answers
	a.answers = nil
	a.mu.Unlock()
	for _, r := range ans {
		a.open--
		a.answered(r)
		a.dirty = true
	}
	a.expireUndo()
	a.listenTick()
	if a.drawnPlan {
		a.finishPlan()
	}
	a.setStatus()
	return a.dirty
}

// save writes the current session through the store as a whole session
// file, when it changed.
func (a *App) save() {
	if a.saveDraft() { // a new engine not yet whole: its answers are a draft
		a.gen++
		return
	}
	a.saveStored(a.cur, nil)
}

// addSession makes s the current session: stored at once under a new key
// (keep, an import), or held until its first change (a demo engine looked
// at is never stored).
func (a *App) addSession(s *session.Session, keep bool) {
	e := &Stored{Session: s, pending: true}
	e.Raw, _ = a.encode(s) // what "changed" is measured against
	a.cur = e
	a.clearPlan()
	a.cyl = 0
	a.gen++
	if keep {
		a.keep(e)
	}
	a.setStatus()
}

// navigate shows screen s, remembering where Back returns to.
func (a *App) navigate(s Screen) {
	if s == a.screen {
		return
	}
	a.copyNote = "" // said on the menu, about the menu's last copy
	a.stack = append(a.stack, a.screen)
	a.screen, a.scroll, a.dirty = s, 0, true
	a.editing = false
	a.setStatus() // the saved line is the engine's shown
}

// Back moves one step back: the previous field on the keypad, else the
// previous screen. It returns false when there is nowhere to go back to
// (the glue then lets the browser leave the app).
func (a *App) Back() bool {
	a.dirty = true
	if a.keypadScreen() && a.fi > 0 && !a.editing {
		a.setField(a.fi - 1)
		return true
	}
	if len(a.stack) == 0 {
		return false
	}
	from := a.screen
	a.editing = false
	if from == Lead {
		a.leaveLead()
	}
	a.screen = a.stack[len(a.stack)-1]
	a.stack = a.stack[:len(a.stack)-1]
	a.scroll = 0
	if a.keypadScreen() && from != Where { // the drawing keeps what was typed
		a.setField(a.fi)
	}
	return true
}

// unit returns the session's display unit.
func (a *App) unit() session.Unit {
	if s := a.Session(); s != nil && s.DisplayUnit == session.UnitInch {
		return session.UnitInch
	}
	return session.UnitMM
}

// unitLabel is the display unit as shown beside an entry.
func (a *App) unitLabel() string {
	if a.unit() == session.UnitInch {
		return "in"
	}
	return "mm"
}

// openSession makes a stored session current and goes to its plan when
// the readings are enough for one, else to the first reading not yet
// taken.
func (a *App) openSession(e *Stored) {
	a.cur = e
	a.clearPlan()
	a.setStatus()
	s := e.Session
	a.cyl = 0
	if len(s.Cylinders[0].Rounds) == 0 {
		a.navigate(Adjust)
		return
	}
	a.round = len(s.Cylinders[0].Rounds) - 1
	a.fields = a.roundFields(a.round)
	a.setField(0)
	ready := !hasBlocking(s.Readiness(a.cyl)) // enough for a plan: show it; every reading is a tap away
	for i, f := range a.fields {
		if ready {
			break
		}
		if _, ok := f.get(s); !ok && !f.Optional {
			a.fi = i
			a.navigate(Measure)
			a.setField(i)
			return
		}
	}
	a.planRound = 0
	a.navigate(Plan)
	a.makePlan()
}

// startSetUp opens a demo engine's design to look at: it is kept as a
// session of its own only once something is changed or measured.
func (a *App) startSetUp(spec setting.EngineSpec) {
	s := newSession(spec, session.UnitMM)
	a.su = newSetUp(false)
	a.addSession(s, false)
	a.navigate(Units)
}

// startMeasuring opens round ri's first field, after the cautions when
// they were never acknowledged.
func (a *App) startMeasuring() {
	a.cyl = min(a.cyl, len(a.Session().Cylinders)-1)
	a.latestRound()
	if !a.acked {
		a.after = Measure
		a.navigate(Cautions)
		return
	}
	a.navigate(Measure)
}

// now is the time: Options.Now, else the clock.
func (a *App) now() time.Time {
	if a.opt.Now != nil {
		return a.opt.Now()
	}
	return time.Now()
}

// today is the date of a new round.
func (a *App) today() string { return a.now().Format("2006-01-02") }

// nextRound starts a new round after the plan's changes were made: the
// changes are recorded as made before it. The round is a draft until its
// first value (records.go): nothing is stored for it before, and a second
// Next round takes the same draft.
func (a *App) nextRound() {
	s := a.Session()
	c := &s.Cylinders[a.cyl]
	if !a.isDraft(s, a.cyl) {
		r := session.Round{Date: a.today()}
		if a.plan != nil {
			for _, st := range a.plan.Steps {
				if st.Amount != 0 {
					r.AdjustmentsBefore = append(r.AdjustmentsBefore, session.Change{Kind: st.Kind, Eccentric: st.Eccentric, Amount: st.Amount, Note: "as planned"})
				}
			}
		}
		c.Rounds = append(c.Rounds, r)
		a.markDraft(s, a.cyl)
	}
	a.round = len(c.Rounds) - 1
	a.fields = a.roundFields(a.round)
	a.setField(0)
	a.navigate(Measure)
}

// setField makes field i current with nothing typed.
func (a *App) setField(i int) {
	if i >= len(a.fields) {
		i = len(a.fields) - 1
	}
	if i < 0 {
		i = 0
	}
	a.fi, a.text, a.typed, a.note, a.confirmed = i, "", false, "", ""
	a.dirty = true
}

// key handles one keypad key.
func (a *App) key(k Key) {
	a.dirty = true
	if k == KeyNext {
		a.commit()
		return
	}
	a.text = press(a.text, k)
	a.typed = true
	a.check()
	if a.note == "" && a.fractions() && wholeFraction(a.text) {
		a.commit() // a fraction is whole once its bottom is typed
	}
}

// check judges the typed text as it stands: a sentence when the number
// is outside the field's plausible range.
func (a *App) check() {
	a.note = ""
	if len(a.fields) == 0 || a.text == "" || strings.HasSuffix(a.text, ".") || a.text == "-" {
		return
	}
	f := a.fields[a.fi]
	if v, err := a.parseEntry(f, a.text); err == nil && a.unusual(f, v) {
		a.note = a.unusualNote(f) + " Check it before Next."
	}
}

// commit takes the typed text into the session, saves it and moves on. A
// value that cannot be is held at the field with a sentence saying why,
// and the flow stays; an unusual one is taken on a second Next (entry.go).
func (a *App) commit() {
	if len(a.fields) == 0 {
		return
	}
	f := a.fields[a.fi]
	s := a.Session()
	if !a.typed || a.text == "" {
		if _, ok := f.get(s); !ok {
			a.note = f.Label + ": type the value with the keypad, then Next."
			if len(f.Choices) > 0 {
				a.note = f.Label + ": choose one."
			}
			return
		}
		if a.screen == Sizes {
			if why := a.assembles(); why != "" {
				a.note = f.Label + ": " + a.inWords(why)
				return
			}
		}
		a.advance()
		return
	}
	v, err := a.parseEntry(f, a.text)
	if err != nil {
		a.note = f.Label + ": " + a.inWords(sentence(err))
		return
	}
	if a.screen == Lead {
		if v < session.MinTargetLeadMM || v > session.MaxTargetLeadMM {
			a.note = fmt.Sprintf("%s: %s %s cannot be a lead; the target lead must be between %s and %s %s. Type it again.", f.Label, a.text, a.unitLabel(),
				formatNumber(session.MinTargetLeadMM, a.unit() == session.UnitInch), formatNumber(session.MaxTargetLeadMM, a.unit() == session.UnitInch), a.unitLabel())
			return
		}
		if a.note = a.askOnce(f, v); a.note != "" {
			return
		}
		f.set(s, v)
		a.gen++
		a.Back() // the plan, made again for the target
		a.makePlan()
		return
	}
	b, why := a.take(f, v)
	if why != "" {
		a.note = why
		return
	}
	if a.screen == Sizes {
		a.engine = nil // drawn again with the new size
	}
	a.refreshFields() // the questions follow the answers
	if !a.saveDraft() {
		a.saveStored(a.cur, b)
	}
	a.warn = a.warningAt(f)
	a.advance()
}

// advance goes to the next field, or on from the last one; a reading
// chosen from a round's list goes back to the list.
func (a *App) advance() {
	if a.editing {
		a.Back()
		return
	}
	if a.fi+1 < len(a.fields) && !a.enoughForPlan() {
		a.setField(a.fi + 1)
		return
	}
	switch a.screen {
	case Lead:
		a.Back()
		a.makePlan()
	case Sizes:
		a.sizesDone()
	case Measure:
		a.planRound = 0
		a.navigate(Plan)
		a.makePlan()
	}
}

// skipStep skips the rest of the current optional step.
func (a *App) skipStep() {
	step := a.fields[a.fi].Step
	i := a.fi
	for i < len(a.fields) && a.fields[i].Step == step {
		i++
	}
	a.fi = i - 1
	a.advance()
}

// makePlan fits and plans the round chosen and builds the diagrams'
// model, or says why it cannot.
func (a *App) makePlan() {
	start := time.Now()
	defer func() { a.planTime = time.Since(start) }()
	a.clearPlan()
	s := a.Session()
	if s == nil {
		return
	}
	round := a.planRound
	if n := len(s.Cylinders[a.cyl].Rounds); round == 0 && n > 1 && a.isDraft(s, a.cyl) {
		round = n - 1 // a next round not yet begun: the steps still to do are the last round's
	}
	if round == 0 {
		for _, p := range s.Readiness(a.cyl) {
			if p.Blocking {
				a.planNote = append(a.planNote, a.inWords(p.Message))
			}
		}
		if len(a.planNote) > 0 {
			return
		}
	}
	fit, err := plan.FitSession(s, a.cyl, plan.FitOptions{Round: round})
	if err != nil {
		a.planNote = []string{a.inWords(sentence(err))}
		return
	}
	opt := plan.AimsOptions(s.Aims) // the session's own aims
	opt.Unit, opt.Cylinder, opt.Fit = a.unit(), a.cyl, plan.FitOptions{Round: round}
	// The plan with the other priority (a note and the words' other
	// choice) is made on the tick after the plan is first drawn.
	opt.OtherLater = true
	p, err := plan.FromFit(fit, s.Adjustments, opt)
	if err != nil {
		a.planNote = []string{a.inWords(sentence(err))}
		return
	}
	p.Cylinder = s.Cylinders[a.cyl].Name
	m, err := render.NewModel(s, a.cyl, fit, p)
	if err != nil {
		a.planNote = []string{a.inWords(sentence(err))}
		return
	}
	a.fit, a.plan, a.model = fit, p, m
	a.resetWhatIf()
}

// PlanPending reports whether the plan shown still waits for its other
// priority's plan, which the first Update after the plan is drawn makes
// (or PlanText, which needs it).
func (a *App) PlanPending() bool { return a.plan != nil && a.plan.OtherPending() }

// finishPlan makes the plan's other priority if it is still to make.
func (a *App) finishPlan() {
	if !a.PlanPending() {
		return
	}
	start := time.Now()
	a.plan.AddOther()
	a.otherTime = time.Since(start)
	a.drawnPlan = false
	a.dirty = true
}

// clearPlan forgets the plan shown.
func (a *App) clearPlan() {
	a.fit, a.plan, a.model, a.planNote = nil, nil, nil, nil
	a.what = whatIf{}
	a.diagram, a.position = render.PlanDiagram, 0
	a.dirty = true
}

// PlanText returns the plan in words, as plain text (for the page's live
// region and for copying), or why there is no plan; "" off the plan.
func (a *App) PlanText() string {
	a.finishPlan()
	if a.plan == nil {
		return strings.Join(a.planNote, "\n")
	}
	// The words are written once per plan and unit: the glue asks for them
	// after every change, many a second while the what-if is dragged.
	if a.wordsOf == a.plan && a.wordsUnit == a.unit() {
		return a.words
	}
	var b strings.Builder
	if err := plan.WriteText(&b, a.plan, a.unit()); err != nil {
		return sentence(err)
	}
	a.wordsOf, a.wordsUnit, a.words = a.plan, a.unit(), b.String()
	return a.words
}

// ExportJSON returns the current session as a session file, the same
// JSON the command line reads.
func (a *App) ExportJSON() ([]byte, error) {
	if a.cur == nil {
		return nil, fmt.Errorf("There is no session open to export.")
	}
	if a.cur.Session == nil {
		return a.cur.Raw, nil // kept as stored
	}
	return a.encode(a.cur.Session)
}

// exportName is the file name offered for an export.
func (a *App) exportName() string {
	name := "session"
	if s := a.Session(); s != nil && s.Name != "" {
		name = strings.Map(func(r rune) rune {
			if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' {
				return r
			}
			return '-'
		}, s.Name)
	}
	return name + ".json"
}

// export hands the current session to the glue's OnExport.
func (a *App) export() {
	b, err := a.ExportJSON()
	if err != nil {
		a.importErr = err.Error()
		return
	}
	if a.opt.OnExport != nil {
		a.opt.OnExport(a.exportName(), b)
	}
}

// Import reads a session file the user chose: decoded and validated, it
// is stored as a new session and opened; otherwise the sentence naming
// the field at fault (in words, never its key path) is shown on the
// engines list and returned. A file of an engine already here is opened
// as that engine when it holds the same, else the engines list asks
// whether to replace it or keep both (records.go).
func (a *App) Import(b []byte) error {
	a.dirty = true
	a.asking = nil
	s, err := decodeSession(b)
	if err != nil {
		a.importErr = "The file cannot be imported: " + wordsIn(err.Error(), session.UnitMM, nil)
		if a.screen != Engines {
			a.navigate(Engines)
		}
		return fmt.Errorf("%s", a.importErr)
	}
	a.importErr = ""
	if a.alreadyHere(s) {
		return nil
	}
	a.addSession(s, true)
	a.openSession(a.cur)
	return nil
}

// showWhere draws the engine where it stands for the current reading.
func (a *App) showWhere() {
	s := a.Session()
	if a.engine == nil || a.engineOf != s {
		m, err := render.NewEngineModel(s.Engine)
		if err != nil {
			a.note = a.inWords(sentence(err))
			return
		}
		a.engine, a.engineOf = m, s
	}
	a.crankDeg = math.Mod(a.fields[a.fi].CrankDeg+360, 360)
	a.navigate(Where)
}

// wherePosition is the engine model's position of the current reading.
func (a *App) wherePosition() int {
	f := a.fields[a.fi]
	for i, n := range a.engine.PositionNames() {
		if n == f.Notch {
			return i
		}
	}
	return 0
}

// shownModel is the model the plan screen draws: the what-if's when there
// is one.
func (a *App) shownModel() *render.Model {
	if a.what.model != nil {
		return a.what.model
	}
	return a.model
}

// showRound lists round ri's readings, to edit any of them or to see its
// plan.
func (a *App) showRound(ri int) {
	a.round = ri
	a.fields = a.roundFields(ri)
	a.setField(0)
	a.navigate(Readings)
}

// showRoundPlan fits and plans the round listed, as its readings now
// stand.
func (a *App) showRoundPlan() {
	a.planRound = a.round + 1
	if a.round == len(a.Session().Cylinders[a.cyl].Rounds)-1 {
		a.planRound = 0 // the latest round: the plan to act on
	}
	a.navigate(Plan)
	a.makePlan()
}

// roundFields lists round ri's readings of the cylinder shown, in the
// forms chosen.
func (a *App) roundFields(ri int) []field {
	a.fieldsFor = fieldsKey{a.Session(), a.cyl, ri}
	return measureFields(a.Session(), a.cyl, ri, a.tyreCutOffs, a.lapsForm)
}

// fieldsKey is the session, cylinder and round the keypad's reading
// fields were listed for.
type fieldsKey struct {
	s       *session.Session
	cyl, ri int
}

// syncFields lists the readings again when the fields shown belong to
// another session, cylinder or round than the one open (a Back through
// screens of an engine since closed, a cylinder dropped): the latest round
// of the cylinder shown.
func (a *App) syncFields() {
	s := a.Session()
	if s == nil {
		return
	}
	a.cyl = max(0, min(a.cyl, len(s.Cylinders)-1))
	if a.fieldsFor == (fieldsKey{s, a.cyl, a.round}) && a.round < len(s.Cylinders[a.cyl].Rounds) && len(a.fields) > 0 {
		return
	}
	a.latestRound()
}
