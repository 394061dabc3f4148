//go:build js

package main

import (
	"encoding/binary"
	"math"
	"sync"
	"syscall/js"

	"evenbeat/wasm/ui"
)

// microphone is the app's ui.Microphone: the browser's media capture
// (getUserMedia, asked only when the user taps Start, with echo
// cancellation, noise suppression and automatic gain off: they smear an
// exhaust's onset) feeding a small AudioWorklet (recorderJS) that posts
// chunks of samples from the audio thread; they are copied into Go as they
// come. A ScriptProcessor on the page's own thread lost and repeated
// chunks whenever a frame kept the thread busy (measured in headless
// Chromium: clicks half a second apart came back 8192 samples apart);
// the worklet's messages queue instead. Nothing leaves the page: the
// samples go to the app, which keeps only the gaps it works out.
type microphone struct {
	app *ui.App

	mu      sync.Mutex
	state   micState
	stop    bool // Stop asked while the microphone was being asked for
	ctx     js.Value
	stream  js.Value
	src     js.Value
	node    js.Value
	funcs   []js.Func
	samples []float32
	rate    int
	buf     []byte // one chunk's bytes
}

// micState is where the microphone is.
type micState uint8

const (
	micIdle     micState = iota
	micStarting          // asked for, not yet answered
	micRunning           // recording
)

// micConstraints asks for the raw microphone: the browser's echo
// cancellation, noise suppression and automatic gain smear an exhaust's
// sharp onset (written as JSON: a Go map converted would cost more code).
const micConstraints = `{"audio": {"echoCancellation": false, "noiseSuppression": false, "autoGainControl": false, "channelCount": 1}, "video": false}`

// recorderJS is the AudioWorklet processor: it gathers the first input
// channel's 128-sample blocks into chunks of 4096 (about 85 ms at 48 kHz)
// and posts each to the page, handing over its buffer.
const recorderJS = `registerProcessor("evenbeat-recorder", class extends AudioWorkletProcessor {
  constructor() { super(); this.b = new Float32Array(4096); this.n = 0; }
  process(inputs) {
    const c = inputs[0] && inputs[0][0];
    for (let i = 0; c && i < c.length; i++) {
      this.b[this.n++] = c[i];
      if (this.n === 4096) { this.port.postMessage(this.b, [this.b.buffer]); this.b = new Float32Array(4096); this.n = 0; }
    }
    return true;
  }
});`

// Start asks for the microphone and starts recording (ui.Microphone). It
// is first called inside the tap's own event on ui.StartLabel
// (tapInGesture), where browsers let a page start sound; the app's own
// call on the next tick then finds it started.
func (m *microphone) Start() {
	m.mu.Lock()
	if m.state != micIdle {
		m.mu.Unlock()
		return
	}
	m.state, m.stop, m.samples = micStarting, false, nil
	m.mu.Unlock()
	global := js.Global()
	devices := global.Get("navigator").Get("mediaDevices")
	audio := global.Get("AudioContext")
	if !devices.Truthy() || devices.Get("getUserMedia").Type() != js.TypeFunction || !audio.Truthy() || global.Get("AudioWorkletNode").Type() != js.TypeFunction {
		m.failed("This browser gives the page no microphone: sound can be recorded only on a secure page (https) in a browser that allows it. The rest of the app works as before.")
		return
	}
	m.ctx = audio.New()
	m.then(devices.Call("getUserMedia", global.Get("JSON").Call("parse", micConstraints)), m.opened)
}

// then calls ok with the promise's value, or fails with the browser's
// refusal.
func (m *microphone) then(p js.Value, ok func(js.Value)) {
	var yes, no js.Func
	yes = js.FuncOf(func(_ js.Value, args []js.Value) any {
		yes.Release()
		no.Release()
		ok(args[0])
		return nil
	})
	no = js.FuncOf(func(_ js.Value, args []js.Value) any {
		yes.Release()
		no.Release()
		m.failed(refusal(args[0]))
		return nil
	})
	p.Call("then", yes, no)
}

// opened loads the recorder into the audio context, unless Stop came
// first.
func (m *microphone) opened(stream js.Value) {
	m.mu.Lock()
	m.stream = stream
	stop := m.stop
	m.mu.Unlock()
	if stop {
		m.finish()
		return
	}
	global := js.Global()
	blob := global.Get("Blob").New([]any{recorderJS}, map[string]any{"type": "text/javascript"})
	url := global.Get("URL").Call("createObjectURL", blob)
	m.then(m.ctx.Get("audioWorklet").Call("addModule", url), func(js.Value) {
		global.Get("URL").Call("revokeObjectURL", url)
		m.record()
	})
}

// record connects the microphone to the recorder and starts taking its
// chunks.
func (m *microphone) record() {
	m.mu.Lock()
	stop := m.stop
	m.rate = m.ctx.Get("sampleRate").Int()
	m.samples = make([]float32, 0, ui.ListenSeconds*m.rate) // never longer, however late the app's tick stops it
	m.mu.Unlock()
	if stop {
		m.finish()
		return
	}
	m.src = m.ctx.Call("createMediaStreamSource", m.stream)
	m.node = js.Global().Get("AudioWorkletNode").New(m.ctx, "evenbeat-recorder")
	f := js.FuncOf(func(_ js.Value, args []js.Value) any {
		m.chunk(args[0].Get("data"))
		return nil
	})
	m.funcs = append(m.funcs, f)
	m.node.Get("port").Set("onmessage", f)
	m.src.Call("connect", m.node)
	m.node.Call("connect", m.ctx.Get("destination")) // pulled by the output, it plays silence
	m.ctx.Call("resume")
	m.mu.Lock()
	m.state = micRunning
	m.mu.Unlock()
	m.app.MicOpened()
}

// chunk copies one chunk of samples (a Float32Array) into Go; beyond
// ui.ListenSeconds nothing more is kept (the part of a chunk that fits
// is).
func (m *microphone) chunk(data js.Value) {
	m.mu.Lock()
	defer m.mu.Unlock()
	n := min(data.Get("length").Int(), cap(m.samples)-len(m.samples))
	if m.state != micRunning || n <= 0 {
		return
	}
	if len(m.buf) < 4*n {
		m.buf = make([]byte, 4*n)
	}
	b := m.buf[:4*n]
	js.CopyBytesToGo(b, js.Global().Get("Uint8Array").New(data.Get("buffer"), data.Get("byteOffset"), 4*n))
	for i := range n {
		m.samples = append(m.samples, math.Float32frombits(binary.LittleEndian.Uint32(b[4*i:])))
	}
}

// Stop ends the recording, lets the microphone go and hands the app what
// was recorded (ui.Microphone).
func (m *microphone) Stop() {
	m.mu.Lock()
	if m.state == micStarting {
		m.stop = true // opened or failed finishes
		m.mu.Unlock()
		return
	}
	m.mu.Unlock()
	m.finish()
}

// finish lets the microphone and the audio context go and hands the app
// the samples (none when the recording never began).
func (m *microphone) finish() {
	m.release()
	m.mu.Lock()
	samples, rate := m.samples, m.rate
	m.samples, m.state = nil, micIdle
	m.mu.Unlock()
	m.app.Recorded(samples, rate)
}

// failed tells the app why there is no recording.
func (m *microphone) failed(why string) {
	m.release()
	m.mu.Lock()
	m.state = micIdle
	m.mu.Unlock()
	m.app.MicFailed(why)
}

// release disconnects the nodes, stops the stream's tracks (the browser's
// recording sign goes) and closes the audio context.
func (m *microphone) release() {
	if m.node.Truthy() {
		m.node.Get("port").Set("onmessage", js.Null())
		m.node.Call("disconnect")
		m.src.Call("disconnect")
	}
	if m.stream.Truthy() {
		tracks := m.stream.Call("getTracks")
		for i := range tracks.Length() {
			tracks.Index(i).Call("stop")
		}
	}
	if m.ctx.Truthy() {
		m.ctx.Call("close")
	}
	for _, f := range m.funcs {
		f.Release()
	}
	m.funcs, m.node, m.src, m.stream, m.ctx = nil, js.Undefined(), js.Undefined(), js.Undefined(), js.Undefined()
}

// refusal says, in a sentence, why the browser gave no microphone.
func refusal(err js.Value) string {
	name := ""
	if err.Type() == js.TypeObject {
		name = err.Get("name").String()
	}
	switch name {
	case "NotAllowedError", "SecurityError":
		return "The microphone was refused, so the app cannot listen. Allow the microphone for this page in the browser's settings for the site, then tap Start listening again."
	case "NotFoundError", "OverconstrainedError":
		return "No microphone was found. Connect one, or use a phone, then tap Start listening again."
	case "NotReadableError", "AbortError":
		return "The microphone is in use by another app or could not be started. Close the other app, then tap Start listening again."
	}
	return "The microphone could not be started (" + name + "). Tap Start listening to try again."
}

// publishListen tells the page where listening has come to
// (evenbeatListen), what the whole engine says of the beat heard
// (evenbeatHeard), and how long the latest recording's analysis took in
// the browser (evenbeatListenMs, for a recording of evenbeatListenSeconds).
func (g *flowGame) publishListen() {
	g.window.Set("evenbeatListen", g.ui.ListenState())
	g.window.Set("evenbeatHeard", g.ui.HeardText())
	if d, secs := g.ui.ListenTime(); d > 0 {
		g.window.Set("evenbeatListenMs", float64(d.Microseconds())/1000)
		g.window.Set("evenbeatListenSeconds", secs)
	}
}
