//go:build js

package main

import (
	"bytes"
	"sync"
	"syscall/js"
	"time"

	"evenbeat/render"
	"evenbeat/render/pdf"
)

// shareRequest is a report the user asked to share, queued for the game
// loop.
type shareRequest struct {
	name string
	m    render.ReportModel
}

// sharing is the state of the reports being made: those queued, the one
// being made, and whether the progress sign is on the screen.
type sharing struct {
	queue []shareRequest
	job   *shareJob
	shown bool // the progress sign was drawn in the last frame
}

// shareJob is one report being made by a goroutine of its own: laid out
// and written as a PDF of A4 pages (render/pdf), in about a tenth of a
// second natively and well under a second in the browser for the demo's
// whole engine, where a tall PNG of it took 2.6 s to rasterise and 4 to 5
// s more for the browser to encode in headless Chromium. The goroutine
// sleeps a moment between the layout and the writing, which hands the
// browser back its event loop for a frame.
type shareJob struct {
	req     shareRequest
	started time.Time

	mu   sync.Mutex
	file []byte
	err  error
	done bool
	half bool // laid out: half way
}

// busy reports whether a report is queued or being made.
func (s *sharing) busy() bool { return s.job != nil || len(s.queue) > 0 }

// queueShare is the app's OnShare.
func (g *flowGame) queueShare(name string, m render.ReportModel) {
	g.share.queue = append(g.share.queue, shareRequest{name, m})
	g.window.Set("evenbeatShare", "drawing")
}

// shareTick starts the next queued report once the progress sign is on
// the screen (so the tap is seen to be heard at once) and hands a
// finished one to the page, which shares it where the browser can share
// files and downloads it otherwise (window.evenbeatShareFile in
// site/index.html).
func (g *flowGame) shareTick() {
	sh := &g.share
	if sh.job == nil {
		if len(sh.queue) == 0 || !sh.shown {
			return
		}
		sh.job = &shareJob{req: sh.queue[0], started: time.Now()}
		sh.queue = sh.queue[1:]
		go sh.job.run()
		return
	}
	j := sh.job
	j.mu.Lock()
	done := j.done
	j.mu.Unlock()
	if !done {
		return
	}
	sh.job = nil
	// For the figures: laying out and writing the file, in ms, and when
	// it was ready.
	g.window.Set("evenbeatShareDrawMs", float64(time.Since(j.started).Microseconds())/1000)
	g.window.Set("evenbeatShareFileAt", g.window.Get("performance").Call("now"))
	if j.err != nil {
		println("sharing the report:", j.err.Error())
		g.window.Set("evenbeatShare", "failed: "+j.err.Error())
		return
	}
	f := g.window.Get("evenbeatShareFile")
	if f.Type() != js.TypeFunction {
		println("sharing the report: the page has no evenbeatShareFile")
		g.window.Set("evenbeatShare", "failed: the page cannot share a file")
		return
	}
	arr := js.Global().Get("Uint8Array").New(len(j.file))
	js.CopyBytesToJS(arr, j.file)
	f.Invoke(j.req.name, arr, "application/pdf")
}

// run lays the report out and writes it as a PDF.
func (j *shareJob) run() {
	lw := float64(render.ReportWidth)
	c := pdf.New(lw, render.ReportHeight(lw, j.req.m))
	render.Report(c, j.req.m, render.Light())
	j.mu.Lock()
	j.half = true
	j.mu.Unlock()
	time.Sleep(time.Millisecond) // back to the browser's event loop
	var buf bytes.Buffer
	err := c.Write(&buf, j.req.m.Model.Spec.Name+": valve setting report")
	j.mu.Lock()
	j.file, j.err, j.done = buf.Bytes(), err, true
	j.mu.Unlock()
}

// drawShareProgress draws, while a report is made, a sign at the foot of
// the screen: what is happening and how far it has come.
func (g *flowGame) drawShareProgress() {
	sh := &g.share
	was := sh.shown
	sh.shown = sh.busy()
	if !sh.shown {
		return
	}
	if !was { // for the figures: the first frame that shows the sign
		g.window.Set("evenbeatShareSignAt", g.window.Get("performance").Call("now"))
	}
	done := 0.0
	if j := sh.job; j != nil {
		j.mu.Lock()
		if j.half {
			done = 0.5
		}
		j.mu.Unlock()
	}
	render.Progress(g.canvas, float64(g.outW), float64(g.outH), "Drawing the report to share", done, g.ui.Theme())
}

// closeShareBox closes the page's box asking for a tap to share the report
// (site/index.html, window.evenbeatCloseShareBox), if it is open, and
// reports whether it was.
func closeShareBox() bool {
	f := js.Global().Get("evenbeatCloseShareBox")
	return f.Type() == js.TypeFunction && f.Invoke().Truthy()
}
