//go:build js

package main

import (
	"strings"
	"sync"
	"syscall/js"
	"time"

	"github.com/hajimehoshi/ebiten/v2"

	"evenbeat/render"
	"evenbeat/wasm/ui"
)

// uiStore is the IndexedDB store as package ui's Store.
type uiStore struct{ st *store }

func (s uiStore) Get(key string) ([]byte, bool, error) {
	v, ok, err := s.st.Get(key)
	return []byte(v), ok, err
}

func (s uiStore) Put(key string, value []byte, done func(error)) {
	s.st.Put(key, string(value), done)
}

func (s uiStore) Delete(key string, done func(error)) { s.st.Delete(key, done) }

// flowGame runs package ui's app on the game's plumbing (size, pointer
// queue, taps, polled touches, keys) and canvas.
type flowGame struct {
	*game
	ui     *ui.App
	window js.Value

	mu      sync.Mutex
	backs   int      // popstate events not yet handled
	imports [][]byte // files chosen, not yet imported
	live    js.Value // the hidden live region mirroring the screen (ui.App.Mirror)
	mirror  []string // its lines, as shown
	// mirrorDue: the screen changed since the live region was brought up
	// to date, at mirrorAt.
	mirrorDue bool
	mirrorAt  time.Time
	dark      *bool // the page's colour scheme changed to dark (true) or light, for the next tick (under mu)
	draws     int   // frames really drawn, published as evenbeatDraws
	// drawTime is the Go side of all those frames (the app drawing through
	// ebiten, not the GPU's work), published as evenbeatDrawMs.
	drawTime time.Duration

	name        *nameBox // the engine-name box, when open (under mu)
	names       []string // names typed in the box, not yet taken (under mu)
	share       sharing  // reports to draw and share (game loop only)
	updateWaits bool     // the page reported a new version waiting (under mu)
	bannerShown bool     // the app shows the new-version banner
	restart     bool     // the user chose Restart; waits for the writes

	// The rename and import buttons and the engine's name as last
	// published (under mu), so that a tap on a button opens the name box
	// or the file chooser inside the browser's own event, where iOS allows
	// it (see tapInGesture).
	gestureAt map[string]render.Rect
	barBottom float64 // above it a tap is the top bar's
	nameNow   string
	// chooserOpened: the file chooser was opened by the tap's own event;
	// the app's handling of that tap on the next tick must not open
	// another (under mu). copiedInGesture likewise for the clipboard.
	chooserOpened   bool
	copiedInGesture bool
	copyText        string  // the plan's words as last published (under mu)
	copies          []error // how clipboard writes went, for the next tick (under mu)
	mic             *microphone
}

// runFlow starts the app in theme th; dark is the page's media query for
// a dark colour scheme, whose changes the app follows while it runs.
func runFlow(st *store, th render.Theme, dark js.Value) error {
	g := &flowGame{game: newGame(), window: js.Global(), gestureAt: map[string]render.Rect{}, mic: &microphone{}}
	g.queue.onUp = g.tapInGesture
	opt := ui.Options{Theme: th, OnExport: download, OnImport: g.chooseFile,
		OnName: g.openName, OnShare: g.queueShare, OnUpdate: g.askRestart, OnCopy: g.copyWords, Microphone: g.mic}
	if st != nil {
		opt.Store = uiStore{st}
	}
	g.ui = ui.New(opt)
	g.mic.app = g.ui
	g.live = liveRegion()
	g.window.Set("evenbeatDraws", 0)
	g.window.Set("evenbeatPlanMs", -1)
	g.listenForUpdate()
	// The OS's colour scheme may change while the app runs (dusk, a
	// setting): the app takes the new theme on the next tick.
	dark.Call("addEventListener", "change", js.FuncOf(func(_ js.Value, args []js.Value) any {
		d := len(args) > 0 && args[0].Get("matches").Bool()
		g.mu.Lock()
		g.dark = &d
		g.mu.Unlock()
		return nil
	}))
	// The page (a dropped file, a test) may hand over a session file's
	// text: it is imported on the next tick like a chosen file.
	g.window.Set("evenbeatImport", js.FuncOf(func(_ js.Value, args []js.Value) any {
		if len(args) > 0 {
			g.queueImport([]byte(args[0].String()))
		}
		return nil
	}))
	// One guard entry in the page's history: the back gesture pops it, the
	// app moves back a step and puts it back; when the app has nowhere to
	// go back to, the browser leaves. With the name box open, the gesture
	// closes the box.
	hist := g.window.Get("history")
	hist.Call("pushState", "evenbeat", "")
	g.window.Call("addEventListener", "popstate", js.FuncOf(func(js.Value, []js.Value) any {
		// The back gesture closes a box shown over the canvas (the name
		// box, the page's box asking to share the report) and stays.
		if g.closeName() || closeShareBox() {
			hist.Call("pushState", "evenbeat", "")
			return nil
		}
		g.mu.Lock()
		g.backs++
		g.mu.Unlock()
		return nil
	}))
	return ebiten.RunGame(g)
}

// Update runs one tick: size, queued back gestures and files, input,
// the store's answers, and the state published for the page.
func (g *flowGame) Update() error {
	if g.scale > 0 {
		g.ui.Resize(float64(g.outW), float64(g.outH))
	}
	g.mu.Lock()
	backs, files, dark := g.backs, g.imports, g.dark
	g.backs, g.imports, g.dark = 0, nil, nil
	g.mu.Unlock()
	if dark != nil {
		th, name := themeOf(*dark)
		g.ui.SetTheme(th)
		g.window.Set("evenbeatTheme", name)
	}
	hist := g.window.Get("history")
	for range backs {
		if g.ui.Back() {
			hist.Call("pushState", "evenbeat", "")
		} else {
			hist.Call("back")
		}
	}
	for _, b := range files {
		if err := g.ui.Import(b); err != nil {
			println(err.Error())
		}
	}
	g.renameTick()
	g.copyTick()
	g.feed(func(in intent) { g.ui.Handle(uiIntent(in)) })
	g.shareTick()
	g.updateTick()
	if g.ui.Update() {
		g.publish()
	}
	g.mirrorTick()
	g.mu.Lock()
	g.chooserOpened, g.copiedInGesture = false, false // the tap has been handled
	g.mu.Unlock()
	return nil
}

// uiIntent is the glue's intent as package ui's.
func uiIntent(in intent) ui.Intent {
	switch in.Kind {
	case intentScroll:
		return ui.Intent{Kind: ui.Drag, At: in.At, Delta: in.Delta}
	case intentConfirm:
		return ui.Intent{Kind: ui.Confirm}
	}
	return ui.Intent{Kind: ui.Tap, At: in.At}
}

// publish tells the page (and tests) the screen, the saving state, the
// touch targets in CSS px (and whether each is a chosen option) and the
// plan's words, and marks the live region due to mirror the screen
// (mirrorTick).
func (g *flowGame) publish() {
	g.window.Set("evenbeatState", g.ui.Screen().String())
	g.window.Set("evenbeatStatus", g.ui.Status())
	g.window.Set("evenbeatField", g.ui.Field())
	g.window.Set("evenbeatNote", g.ui.Note())
	targets := g.ui.Targets()
	g.window.Set("evenbeatTargets", targetsJSON(targets))
	// The plan's words, unless the plan waits for its other priority (made
	// on the tick after its first frame): asking for them would make it
	// now, before the plan is drawn.
	words, pending := "", g.ui.PlanPending()
	if !pending {
		words = g.ui.PlanText() // kept per plan: cheap
	}
	copyText := words
	g.mu.Lock()
	g.barBottom, g.copyText = g.ui.BarBottom(), copyText
	clear(g.gestureAt)
	for _, t := range targets {
		if t.Label == ui.RenameLabel || t.Label == ui.ImportLabel || t.Label == ui.CopyLabel || t.Label == ui.StartLabel {
			g.gestureAt[t.Label] = t.Rect
		}
	}
	g.mu.Unlock()
	// The page shows the words on the plan screen only; while the plan
	// waits, those shown are left as they were.
	switch {
	case g.ui.Screen() != ui.Plan:
		words = ""
	case pending:
		words = g.window.Get("evenbeatPlanText").String()
	}
	g.window.Set("evenbeatPlanText", words)
	g.window.Set("evenbeatSettled", g.settled())
	g.publishListen()
	// How long the last plan took, in ms; -1 before the first.
	planMs := -1.0
	if d := g.ui.PlanTime(); d > 0 {
		planMs = float64(d.Microseconds()) / 1000
	}
	g.window.Set("evenbeatPlanMs", planMs)
	if d := g.ui.OtherTime(); d > 0 {
		g.window.Set("evenbeatOtherMs", float64(d.Microseconds())/1000)
	}
	name := ""
	if s := g.ui.Session(); s != nil {
		name = s.Name
	}
	g.window.Set("evenbeatName", name)
	g.mu.Lock()
	g.nameNow = name
	g.mu.Unlock()
	g.mirrorDue = true
}

// mirrorEvery is the least time between two changes of the live region:
// a finger dragging the what-if changes the screen at every frame, and a
// screen reader is not to be flooded with the figures of each.
const mirrorEvery = 500 * time.Millisecond

// mirrorTick brings the live region up to date with the screen when it
// changed, at once after a quiet spell and then at most every
// mirrorEvery; while the plan waits for its other priority, the mirror
// it had is left as it was.
func (g *flowGame) mirrorTick() {
	if !g.mirrorDue || time.Since(g.mirrorAt) < mirrorEvery || g.ui.Screen() == ui.Plan && g.ui.PlanPending() {
		return
	}
	g.mirrorDue, g.mirrorAt = false, time.Now()
	g.showMirror(g.ui.Mirror())
}

// showMirror puts the screen's words into the live region, a line per
// element, changing only the lines that differ from those shown: a
// screen reader then announces what changed (a typed digit, a warning,
// a new screen's lines), not the whole screen at each change, and the
// region's text is the whole mirror.
func (g *flowGame) showMirror(text string) {
	if !g.live.Truthy() {
		return
	}
	lines := strings.SplitAfter(text, "\n")
	if len(lines) > 0 && lines[len(lines)-1] == "" {
		lines = lines[:len(lines)-1]
	}
	kids := g.live.Get("children")
	for i, l := range lines {
		switch {
		case i >= len(g.mirror):
			el := g.window.Get("document").Call("createElement", "div")
			el.Set("textContent", l)
			g.live.Call("appendChild", el)
		case g.mirror[i] != l:
			kids.Index(i).Set("textContent", l)
		}
	}
	for n := len(g.mirror); n > len(lines); n-- {
		g.live.Call("removeChild", kids.Index(n-1))
	}
	g.mirror = lines
}

// Draw draws the app when it changed.
func (g *flowGame) Draw(screen *ebiten.Image) {
	if g.outW == 0 {
		return
	}
	if !g.ui.Dirty() {
		// The screen keeps its pixels between frames: while a report is
		// made only its progress sign is drawn again.
		if g.share.busy() {
			g.canvas.Begin(screen, g.scale)
			g.drawShareProgress()
			g.canvas.Flush()
			return
		}
		if !g.share.shown {
			return
		}
	}
	start := time.Now()
	g.canvas.Begin(screen, g.scale)
	g.ui.Draw(g.canvas)
	g.drawShareProgress()
	g.canvas.Flush()
	g.drawTime += time.Since(start)
	g.window.Set("evenbeatDrawMs", float64(g.drawTime.Microseconds())/1000)
	g.draws++
	g.window.Set("evenbeatDraws", g.draws)
	g.window.Set("evenbeatDrawn", g.ui.Screen().String())
	if !g.drawn {
		g.drawn = true
		g.window.Set("evenbeatFirstFrame", g.window.Get("performance").Call("now"))
		g.window.Set("evenbeatFirstScreen", g.ui.Screen().String())
		if el := g.window.Get("document").Call("getElementById", "loading"); el.Truthy() {
			el.Get("style").Set("display", "none")
		}
	}
}

// liveRegion adds a visually hidden element that screen readers announce
// when its lines change.
func liveRegion() js.Value {
	doc := js.Global().Get("document")
	el := doc.Call("createElement", "div")
	el.Set("id", "evenbeat-words")
	el.Call("setAttribute", "aria-live", "polite")
	el.Call("setAttribute", "aria-atomic", "false") // the lines changed, not all
	el.Call("setAttribute", "style", "position:absolute;left:-10000px;width:1px;height:1px;overflow:hidden")
	doc.Get("body").Call("appendChild", el)
	return el
}

// download offers data as a file.
func download(name string, data []byte) {
	doc := js.Global().Get("document")
	arr := js.Global().Get("Uint8Array").New(len(data))
	js.CopyBytesToJS(arr, data)
	blob := js.Global().Get("Blob").New([]any{arr}, map[string]any{"type": "application/json"})
	url := js.Global().Get("URL").Call("createObjectURL", blob)
	a := doc.Call("createElement", "a")
	a.Set("href", url)
	a.Set("download", name)
	a.Call("click")
	js.Global().Get("URL").Call("revokeObjectURL", url)
}

// queueImport keeps a file's bytes for the next tick to import.
func (g *flowGame) queueImport(b []byte) {
	g.mu.Lock()
	g.imports = append(g.imports, b)
	g.mu.Unlock()
}

// chooseFile is the app's OnImport: it opens the browser's file chooser,
// unless the tap's own event has just opened it (see tapInGesture); the
// chosen file's bytes are imported on the next tick.
func (g *flowGame) chooseFile() {
	g.mu.Lock()
	opened := g.chooserOpened
	g.chooserOpened = false
	g.mu.Unlock()
	if !opened {
		g.openChooser()
	}
}

// openChooser opens the browser's file chooser for a session file.
func (g *flowGame) openChooser() {
	doc := js.Global().Get("document")
	in := doc.Call("createElement", "input")
	in.Set("type", "file")
	in.Set("accept", ".json,application/json")
	var onChange js.Func
	onChange = js.FuncOf(func(js.Value, []js.Value) any {
		onChange.Release()
		files := in.Get("files")
		if files.Length() == 0 {
			return nil
		}
		var then js.Func
		then = js.FuncOf(func(_ js.Value, args []js.Value) any {
			then.Release()
			arr := js.Global().Get("Uint8Array").New(args[0])
			b := make([]byte, arr.Length())
			js.CopyBytesToGo(b, arr)
			g.queueImport(b)
			return nil
		})
		files.Index(0).Call("arrayBuffer").Call("then", then)
		return nil
	})
	in.Call("addEventListener", "change", onChange)
	in.Call("click")
}
