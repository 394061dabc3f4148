//go:build js

package main

import (
	"fmt"
	"math"
	"sync"
	"syscall/js"
	"time"

	"evenbeat/render"
	"evenbeat/render/raster"
)

// reportScale is the shared report's device pixels per logical unit: 960
// pixels across render.ReportWidth, as the command line's report draws it
// (about 150 dots per inch across a printed A4 page). Scale 2 took 1.8 to
// 2.2 times as long to draw, for no gain on paper.
const reportScale = 1.5

// reportStrip is the height (device pixels) of the strips the report is
// rasterised in, a few each tick, so that the page keeps drawing (the
// progress sign) while the report is made.
const reportStrip = 256

// shareBudget is how long the report's goroutine works before it gives
// the browser a moment for a frame and any input.
const shareBudget = 50 * time.Millisecond

// shareRequest is a report the user asked to share, queued for the game
// loop.
type shareRequest struct {
	name string
	m    render.ReportModel
}

// sharing is the state of the reports being made: those queued, the one
// being rasterised, and whether the progress sign is on the screen.
type sharing struct {
	queue []shareRequest
	job   *shareJob
	shown bool // the progress sign was drawn in the last frame
}

// shareJob is one report being made by a goroutine of its own with the
// Go rasteriser (render/raster), strip by strip: in the browser's
// WebAssembly it draws the demo's one-cylinder report in about 0.4 s,
// where strips drawn through the GPU took 3.4 to 6.5 s in headless
// Chromium (software GL). Between bursts of work the goroutine sleeps a
// moment, which hands the browser back its event loop, so frames (the
// progress sign) and taps go on.
type shareJob struct {
	req     shareRequest
	started time.Time

	mu     sync.Mutex
	w, h   int // pixels, once laid out
	y0     int // the next strip's top
	px     []byte
	done   bool
	layout time.Duration // laying the report out (for the figures)
}

// busy reports whether a report is queued or being made.
func (s *sharing) busy() bool { return s.job != nil || len(s.queue) > 0 }

// queueShare is the app's OnShare.
func (g *flowGame) queueShare(name string, m render.ReportModel) {
	g.share.queue = append(g.share.queue, shareRequest{name, m})
	g.window.Set("evenbeatShare", "drawing")
}

// shareTick starts the next queued report once the progress sign is on
// the screen (so the tap is seen to be heard at once), publishes how far
// the one being made has come, and hands a finished one's pixels to the
// page, which makes the PNG with the browser's own encoder and shares or
// downloads it (window.evenbeatSharePNG in site/index.html).
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
	done, y0, h := j.done, j.y0, j.h
	j.mu.Unlock()
	if !done {
		if h > 0 {
			g.window.Set("evenbeatShare", fmt.Sprintf("drawing %d %%", 100*y0/h))
		}
		return
	}
	sh.job = nil
	// For the figures: laying out, drawing and reading back, in ms.
	g.window.Set("evenbeatShareDrawMs", float64(time.Since(j.started).Microseconds())/1000)
	g.window.Set("evenbeatShareLayoutMs", float64(j.layout.Microseconds())/1000)
	f := g.window.Get("evenbeatSharePNG")
	if f.Type() != js.TypeFunction {
		println("sharing the report: the page has no evenbeatSharePNG")
		g.window.Set("evenbeatShare", "failed: the page cannot make a PNG")
		return
	}
	arr := js.Global().Get("Uint8ClampedArray").New(len(j.px))
	js.CopyBytesToJS(arr, j.px)
	f.Invoke(j.req.name, arr, j.w, j.h)
}

// run lays the report out once onto a tape, in the light theme (it is for
// paper) at reportScale, and draws it strip by strip, sleeping a moment
// after each shareBudget of work.
func (j *shareJob) run() {
	lw := float64(render.ReportWidth)
	lh := render.ReportHeight(lw, j.req.m)
	tp := &tape{w: lw, h: lh}
	render.Report(tp, j.req.m, render.Light())
	w, h := int(math.Ceil(lw*reportScale)), int(math.Ceil(lh*reportScale))
	px := make([]byte, 4*w*h)
	strip := raster.New(w, reportStrip, reportScale)
	j.mu.Lock()
	j.w, j.h, j.px, j.layout = w, h, px, time.Since(j.started)
	j.mu.Unlock()
	burst := time.Now()
	for y0 := 0; y0 < h; y0 += reportStrip {
		sh := min(reportStrip, h-y0)
		strip.Clear(render.Light().Background)
		tp.play(strip, float64(y0)/reportScale, float64(y0+sh)/reportScale)
		copy(px[4*w*y0:4*w*(y0+sh)], strip.Image().Pix[:4*w*sh])
		j.mu.Lock()
		j.y0 = y0 + sh
		j.mu.Unlock()
		if time.Since(burst) > shareBudget {
			time.Sleep(time.Millisecond) // back to the browser's event loop
			burst = time.Now()
		}
	}
	j.mu.Lock()
	j.done = true
	j.mu.Unlock()
}

// drawShareProgress draws, while a report is made, a sign at the foot of
// the screen: what is happening and how far it has come.
func (g *flowGame) drawShareProgress() {
	sh := &g.share
	sh.shown = sh.busy()
	if !sh.shown {
		return
	}
	done := 0.0
	if j := sh.job; j != nil {
		j.mu.Lock()
		if j.h > 0 {
			done = float64(j.y0) / float64(j.h)
		}
		j.mu.Unlock()
	}
	render.Progress(g.canvas, float64(g.outW), float64(g.outH), "Drawing the report to share", done, g.ui.Theme())
}

// tape is a render.Canvas that keeps the calls made on it, each with its
// vertical extent, to play them later onto another canvas in strips.
type tape struct {
	w, h float64
	ops  []tapeOp
}

// tapeOp is one kept call.
type tapeOp struct {
	kind   tapeKind
	path   render.Path
	fill   render.FillStyle
	line   render.LineStyle
	at     render.Point
	text   string
	style  render.TextStyle
	lo, hi float64 // top and bottom, logical units (points only)
}

// tapeKind says which Canvas method a tapeOp keeps.
type tapeKind uint8

const (
	tapeFill tapeKind = iota
	tapeStroke
	tapeText
)

// stripMargin is how far (logical units) beyond its points a stroke or a
// line of text may reach.
const stripMargin = 40

func (t *tape) Size() (float64, float64) { return t.w, t.h }

func (t *tape) Fill(p render.Path, s render.FillStyle) {
	lo, hi := extent(p)
	t.ops = append(t.ops, tapeOp{kind: tapeFill, path: p, fill: s, lo: lo, hi: hi})
}

func (t *tape) Stroke(p render.Path, s render.LineStyle) {
	lo, hi := extent(p)
	t.ops = append(t.ops, tapeOp{kind: tapeStroke, path: p, line: s, lo: lo, hi: hi})
}

func (t *tape) Text(at render.Point, text string, s render.TextStyle) {
	t.ops = append(t.ops, tapeOp{kind: tapeText, at: at, text: text, style: s, lo: at.Y, hi: at.Y})
}

// play draws the calls that reach the strip from top to bottom (logical
// units) onto c, moved up by top.
func (t *tape) play(c render.Canvas, top, bottom float64) {
	for _, op := range t.ops {
		if op.hi < top-stripMargin || op.lo > bottom+stripMargin {
			continue
		}
		if op.kind == tapeText {
			c.Text(render.Point{X: op.at.X, Y: op.at.Y - top}, op.text, op.style)
			continue
		}
		q := make(render.Path, len(op.path))
		for i, seg := range op.path {
			for k := range seg.Pts {
				seg.Pts[k].Y -= top
			}
			q[i] = seg
		}
		if op.kind == tapeStroke {
			c.Stroke(q, op.line)
		} else {
			c.Fill(q, op.fill)
		}
	}
}

// extent returns the top and bottom of a path's points (control points
// included).
func extent(p render.Path) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, seg := range p {
		n := 1
		switch seg.Kind {
		case render.CubeTo:
			n = 3
		case render.Close:
			n = 0
		}
		for _, pt := range seg.Pts[:n] {
			lo, hi = math.Min(lo, pt.Y), math.Max(hi, pt.Y)
		}
	}
	return lo, hi
}

// closeShareBox closes the page's box asking for a tap to share the report
// (site/index.html, window.evenbeatCloseShareBox), if it is open, and
// reports whether it was.
func closeShareBox() bool {
	f := js.Global().Get("evenbeatCloseShareBox")
	return f.Type() == js.TypeFunction && f.Invoke().Truthy()
}
