package ui

import (
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"evenbeat/render"
	"evenbeat/setting/beat"
	"evenbeat/setting/listen"
	"evenbeat/setting/session"
)

// ListenLabel is the whole-engine screen's button that goes to listening;
// StartLabel the button that asks for the microphone and starts recording.
// The glue starts the microphone inside the browser's own tap event on
// StartLabel, where browsers let a page capture and play sound.
const (
	ListenLabel = "Listen to the beat"
	StartLabel  = "Start listening"
)

// ListenSeconds is how long a recording runs before it stops by itself:
// at half a turn a second, ten turns to fold.
const ListenSeconds = 20

// Microphone is the browser's microphone as the glue offers it. The app
// asks for it only when the user taps Start; nothing recorded leaves the
// phone.
type Microphone interface {
	// Start asks for the microphone (with echo cancellation, noise
	// suppression and automatic gain off: they smear an exhaust's onset)
	// and starts recording; the glue answers with App.MicOpened, or with
	// App.MicFailed saying why not.
	Start()
	// Stop ends the recording and lets the microphone go; the glue hands
	// what was recorded to App.Recorded.
	Stop()
}

// listenStep is where listening has come to.
type listenStep uint8

// The steps of listening.
const (
	listenReady     listenStep = iota // the cautions and Start
	listenAsking                      // Start tapped: the microphone asked for
	listenRecording                   // the sign and its seconds, Stop
	listenStopping                    // Stop asked: the samples awaited
	listenWorking                     // the samples worked out in a goroutine
)

// listening is the state of listening to the engine.
type listening struct {
	step    listenStep
	pos     beat.Position // the position listened in: its circle gives the beats foreseen
	started time.Time     // when the recording began
	secs    int           // the seconds shown
	why     string        // why the last try came to nothing, said above Start
	shown   bool          // the working sign has been drawn: the analysis may start
	rec     []float32     // the recording, until its analysis starts
	rate    int
	events  []micEvent    // from the glue and the analysis, under App.mu
	heard   *heardBeat    // the latest beat heard in this run
	warmed  bool          // listen.Warm has been started in this run
	took    time.Duration // how long the latest analysis took
	seconds float64       // and the length of its recording
}

// micEvent is an answer of the microphone or of the analysis.
type micEvent struct {
	opened  bool
	why     string // the microphone refused or absent
	samples []float32
	rate    int
	heard   *heardBeat // an analysis finished
}

// heardBeat is a recording worked out and laid on the beats foreseen.
type heardBeat struct {
	s    *session.Session
	pos  string // the position's name
	r    *listen.Result
	m    *listen.Match
	err  error
	gaps []float64 // in the order the position's beat circle lists them
	took time.Duration
}

// MicOpened tells the app the microphone records. Any goroutine may call
// it.
func (a *App) MicOpened() { a.queueMic(micEvent{opened: true}) }

// MicFailed tells the app the microphone was refused or is absent, with a
// sentence saying why and what to do. Any goroutine may call it.
func (a *App) MicFailed(why string) { a.queueMic(micEvent{why: why}) }

// Recorded hands the app what the microphone recorded (mono samples from
// -1 to 1 at rate samples a second). Any goroutine may call it; the app
// owns samples from then on.
func (a *App) Recorded(samples []float32, rate int) {
	a.queueMic(micEvent{samples: samples, rate: rate})
}

// queueMic keeps an answer for Update (listenTick).
func (a *App) queueMic(e micEvent) {
	a.mu.Lock()
	a.lis.events = append(a.lis.events, e)
	a.mu.Unlock()
}

// ListenState names where listening has come to, for the page: "ready",
// "asking", "recording", "stopping" or "working".
func (a *App) ListenState() string {
	return [...]string{"ready", "asking", "recording", "stopping", "working"}[a.lis.step]
}

// ListenTime returns how long the latest recording's analysis took (the
// onsets, the rhythm, the folding and the match) and the recording's
// length in seconds; 0 before the first.
func (a *App) ListenTime() (time.Duration, float64) { return a.lis.took, a.lis.seconds }

// HeardText returns what the whole engine says of the latest beat heard
// in this run, one sentence a line ("" before one, and off the whole
// engine).
func (a *App) HeardText() string {
	h := a.lis.heard
	if h == nil || h.s != a.Session() || a.screen != Whole {
		return ""
	}
	for _, p := range a.wholeBeat().ps {
		if p.Name == h.pos {
			return strings.Join(a.heardWords(p), "\n")
		}
	}
	return ""
}

// askListen shows the cautions for listening in the position shown.
func (a *App) askListen() {
	pos, ok := a.wholeBeat().chosen()
	if !ok {
		return
	}
	a.lis.pos, a.lis.step, a.lis.why = pos, listenReady, ""
	a.navigate(Listen)
}

// startListening asks the glue for the microphone.
func (a *App) startListening() {
	a.lis.why, a.lis.step = "", listenAsking
	a.opt.Microphone.Start()
}

// stopListening ends the recording; the samples come with App.Recorded.
func (a *App) stopListening() {
	if a.lis.step == listenAsking || a.lis.step == listenRecording {
		a.lis.step = listenStopping
		a.opt.Microphone.Stop()
	}
}

// listenTick takes in the microphone's and the analysis' answers, stops a
// recording at ListenSeconds or when the screen is left, and starts the
// analysis once its sign is on the screen. Update calls it.
func (a *App) listenTick() {
	a.mu.Lock()
	evs := a.lis.events
	a.lis.events = nil
	a.mu.Unlock()
	l := &a.lis
	for _, e := range evs {
		a.dirty = true
		switch {
		case e.heard != nil:
			a.tookHeard(e.heard)
		case e.opened && l.step == listenAsking:
			l.step, l.started, l.secs = listenRecording, a.now(), 0
			if !l.warmed { // while the phone only records: the browser optimises the analysis' code
				l.warmed = true
				go listen.Warm()
			}
		case e.opened:
			a.opt.Microphone.Stop() // opened after the screen was left
		case e.why != "" && l.step >= listenAsking && l.step <= listenStopping:
			l.step, l.why = listenReady, e.why
		case l.step == listenStopping && len(e.samples) == 0: // stopped before it began
			l.step = listenReady
		case l.step == listenStopping:
			l.step, l.rec, l.rate, l.shown = listenWorking, e.samples, e.rate, false
		}
	}
	if l.step == listenAsking || l.step == listenRecording {
		if a.screen != Listen { // left by Back or the menu: nothing is kept
			a.opt.Microphone.Stop()
			l.step = listenReady
			return
		}
	}
	if l.step == listenRecording {
		el := a.now().Sub(l.started)
		if el >= ListenSeconds*time.Second {
			a.stopListening()
		}
		if s := int(el / time.Second); s != l.secs {
			l.secs, a.dirty = s, true
		}
	}
	if l.step == listenWorking && l.shown && l.rec != nil {
		a.analyse(l.rec, l.rate, l.pos)
		l.rec = nil
	}
}

// analyse works the recording out in a goroutine of its own, never in a
// frame: the onsets, the turn, the gaps, and the match against the beats
// the position's readings foresee. The answer comes as a micEvent.
func (a *App) analyse(samples []float32, rate int, pos beat.Position) {
	h := &heardBeat{s: a.Session(), pos: pos.Name}
	predicted := pos.Now.Beats()
	go func() {
		start := time.Now()
		x, r := withinRate(samples, rate)
		h.r, h.err = listen.Analyse(x, r, len(predicted))
		if h.err == nil {
			h.m, h.err = h.r.Match(predicted)
		}
		if h.err == nil {
			h.gaps = h.m.GapsFrom(predicted[0])
		}
		h.took = time.Since(start)
		a.queueMic(micEvent{heard: h})
	}()
	a.lis.seconds = float64(len(samples)) / float64(rate)
}

// fixed writes x with dec decimals.
func fixed(x float64, dec int) string { return strconv.FormatFloat(x, 'f', dec, 64) }

// withinRate returns samples at a rate the analysis takes: a recording
// made faster than listen.MaxRate has each pair of samples averaged, as
// often as it takes. x is overwritten.
func withinRate(x []float32, rate int) ([]float32, int) {
	for rate > listen.MaxRate {
		n := len(x) / 2
		for i := range n {
			x[i] = (x[2*i] + x[2*i+1]) / 2
		}
		x, rate = x[:n], rate/2
	}
	return x, rate
}

// tookHeard takes in a finished analysis: the gaps kept in the session
// and the whole engine shown with them, or the refusal said above Start.
func (a *App) tookHeard(h *heardBeat) {
	l := &a.lis
	l.step, l.took = listenReady, h.took
	if h.err != nil {
		l.why = a.inWords(sentence(h.err))
		return
	}
	for i, g := range h.gaps { // as the session keeps them: shown now as when opened again
		h.gaps[i] = math.Round(g*100) / 100
	}
	l.heard = h
	s := h.s
	if s != a.Session() || len(h.gaps) == 0 || !(h.r.RevPerMin > 0 && h.r.RevPerMin <= session.MaxRevPerMin) {
		return
	}
	gaps := append([]float64(nil), h.gaps...)
	s.Heard = append(s.Heard, session.Heard{Date: a.today(), Position: h.pos, GapsDeg: gaps, RevPerMin: math.Round(h.r.RevPerMin*10) / 10})
	if n := len(s.Heard); n > session.MaxHeard {
		s.Heard = s.Heard[n-session.MaxHeard:] // the oldest let go
	}
	a.save()
	if a.screen == Listen {
		a.Back()
	}
}

// heardWords says what was heard in position pos: this run's recording,
// its odd beat's cylinder end (or why it cannot be told) and what to do;
// else the latest the session keeps.
func (a *App) heardWords(pos beat.Position) []string {
	h := a.lis.heard
	if h == nil || h.s != a.Session() || h.pos != pos.Name {
		if st := latestHeard(a.Session(), pos); st != nil {
			return []string{"Heard on " + st.Date + " at " + fixed(st.RevPerMin, 0) + " rev/min (the squares): largest gap over smallest " + fixed(evenness(st.GapsDeg), 2) + ".", gapsWords(pos, st.GapsDeg)}
		}
		return nil
	}
	r, m := h.r, h.m
	out := []string{"Heard over " + strconv.Itoa(r.Turns) + " turns at " + fixed(r.RevPerMin, 0) + " rev/min (the squares): largest gap over smallest " + fixed(r.Evenness, 2) + ", where today's readings foresee " + fixed(pos.Now.Evenness(), 2) + ".", gapsWords(pos, h.gaps)}
	word := "late"
	if !r.Odd.Late() {
		word = "early"
	}
	ends := make([]string, len(m.Odd))
	for i, b := range m.Odd {
		ends[i] = "the " + b.String()
	}
	switch {
	case len(m.Odd) == 0:
		out = append(out, "No one beat stands out from an even beat in what was heard.")
	case m.Disagrees:
		out = append(out, "The beat heard is not the one the readings foresee, so they cannot tell which end comes "+word+": it may be "+strings.Join(ends, " or ")+" exhaust.")
	case m.Ambiguous:
		out = append(out, "The match is ambiguous: the readings foresee a beat that fits more than one way round, so the "+word+" beat may be "+strings.Join(ends, " or ")+" exhaust.")
	default:
		out = append(out, "The "+word+" beat is "+ends[0]+" exhaust, "+fixed(math.Abs(r.Odd.Deg), 1)+"° "+word+" against an even beat.")
	}
	return append(append(out, whatToDo(pos, m)), r.Notes...)
}

// gapsWords lists the gaps heard in pos beside those today's readings
// foresee, both in the order of pos's beat circle.
func gapsWords(pos beat.Position, heard []float64) string {
	list := func(gaps []float64) string {
		var b strings.Builder
		for i, g := range gaps {
			switch {
			case i == len(gaps)-1 && i > 0:
				b.WriteString(" and ")
			case i > 0:
				b.WriteString(", ")
			}
			b.WriteString(fixed(g, 1))
		}
		return b.String() + "°"
	}
	return "The gaps heard from the " + pos.Now.Exhausts[0].Label() + " exhaust on: " + list(heard) + " (today's readings foresee " + list(pos.Now.Gaps) + ")."
}

// whatToDo says what to do about the beat heard in pos.
func whatToDo(pos beat.Position, m *listen.Match) string {
	switch {
	case m.Disagrees:
		return "What to do: take every cylinder's readings again (a reading may be wrong, or something has moved), and mark both wheels' datums at the same angle to see the quartering. Cranks out of quarter are a fitter's job on the wheels, never the valves'."
	case pos.After.Evenness() < pos.Now.Evenness()-0.005:
		return "What to do: make each cylinder's planned steps (on its plan); they bring the largest gap over the smallest to " + fixed(pos.After.Evenness(), 2) + ". Then listen again."
	case len(m.Odd) == 0:
		return "What to do: nothing for the beat; it is as even as the recording and the readings can tell."
	}
	var cyls []string
	for _, b := range m.Odd {
		if !slices.Contains(cyls, b.Cylinder) {
			cyls = append(cyls, b.Cylinder)
		}
	}
	return "What to do: the readings foresee this beat and no adjustment this engine has evens it, so the cause is in a valve as built: look at the exhaust laps and port edges of the " + strings.Join(cyls, " or the ") + " cylinder's valve with the chest open."
}

// listenView lays out listening: the cautions and Start, the microphone
// asked for, the recording's sign with Stop, or the working out.
func (a *App) listenView(l *layouter) {
	lis := &a.lis
	l.title("Listen to the beat, " + lis.pos.Name)
	switch lis.step {
	case listenReady:
		l.text("Run the engine in "+lis.pos.Name+", slowly and steadily on air, and let the phone hear its exhaust for up to "+strconv.Itoa(ListenSeconds)+" seconds. Nothing leaves the phone: the recording is worked out here and only the gaps between the beats are kept.", false)
		l.para("Before the air goes on:", render.BodySize+2, true, false, false)
		for _, c := range listen.Cautions() {
			l.text("- "+c, false)
		}
		l.text(lis.why, true)
		if a.opt.Microphone == nil {
			l.text("This browser gives the app no microphone, so it cannot listen here: open the app in a browser that may record sound.", true)
			return
		}
		l.button(StartLabel, false, a.startListening)
	case listenAsking:
		l.text("Asking for the microphone: allow it when the browser asks.", false)
	case listenRecording:
		l.v.body = rect(l.x, l.y, l.w, 72)
		l.y += 72 + gap
		l.text("Hold the phone at the chimney or exhaust, never within reach of the motion. The recording stops by itself after "+strconv.Itoa(ListenSeconds)+" seconds.", false)
		l.button("Stop", false, a.stopListening)
	default:
		l.text("Working out the beat from the recording...", false)
	}
}

// drawListen draws the recording's sign with its seconds, and notes that
// the working out's words are on the screen.
func (a *App) drawListen(c render.Canvas, v *view) {
	switch a.lis.step {
	case listenRecording:
		mid := (v.body.Min.Y + v.body.Max.Y) / 2
		c.Fill(render.Circle(render.Point{X: v.body.Min.X + 24, Y: mid}, 14), render.FillStyle{Color: a.theme.Warn})
		c.Text(render.Point{X: v.body.Min.X + 56, Y: mid}, "Recording "+strconv.Itoa(a.lis.secs)+" s", render.TextStyle{Color: a.theme.Ink, Size: 30, Bold: true, VAlign: render.Middle})
	case listenWorking:
		a.lis.shown = true
	}
}
