//go:build js

package main

import (
	"math"
	"syscall/js"
	"time"

	"github.com/hajimehoshi/ebiten/v2"

	"evenbeat/render"
)

// reportScale is the shared report's device pixels per logical unit: 960
// pixels across render.ReportWidth, as the command line's report draws it
// (about 150 dots per inch across a printed A4 page). Scale 2 took 1.8 to
// 2.2 times as long to draw, for no gain on paper.
const reportScale = 1.5

// reportStrip is the height (device pixels) of the strips of the report
// drawn one at a time on an offscreen image: far below any WebGL2 device's
// texture limit (a whole report may be taller than a phone's), and small
// enough that each strip's drawing is cheap. Measured in headless Chromium
// (SwiftShader, a busy 2-core machine) for the demo report, 960x5541 px:
// 2048-px strips 13-17 s, 512 4-8 s, 256 3.4-6.5 s, 128 3.6-3.9 s.
const reportStrip = 256

// shareRequest is a report the user asked to share, queued for the game
// loop (ebiten images are drawn there).
type shareRequest struct {
	name string
	m    render.ReportModel
}

// queueShare is the app's OnShare.
func (g *flowGame) queueShare(name string, m render.ReportModel) {
	g.shares = append(g.shares, shareRequest{name, m})
	g.window.Set("evenbeatShare", "drawing")
}

// shareTick draws each queued report and hands its pixels to the page,
// which makes the PNG with the browser's own encoder and shares or
// downloads it (window.evenbeatSharePNG in site/index.html).
func (g *flowGame) shareTick() {
	if len(g.shares) == 0 {
		return
	}
	reqs := g.shares
	g.shares = nil
	for _, r := range reqs {
		start := time.Now()
		w, h, px := g.drawReport(r.m)
		// For the figures: drawing and reading back the pixels, in ms.
		g.window.Set("evenbeatShareDrawMs", float64(time.Since(start).Microseconds())/1000)
		f := g.window.Get("evenbeatSharePNG")
		if f.Type() != js.TypeFunction {
			println("sharing the report: the page has no evenbeatSharePNG")
			g.window.Set("evenbeatShare", "failed: the page cannot make a PNG")
			continue
		}
		arr := js.Global().Get("Uint8ClampedArray").New(len(px))
		js.CopyBytesToJS(arr, px)
		f.Invoke(r.name, arr, w, h)
	}
}

// drawReport draws render.Report in the light theme (it is for paper) at
// reportScale and returns its size in pixels and its RGBA pixels (opaque,
// so premultiplied or not makes no difference). The report is laid out
// once onto a tape, then played strip by strip, each strip given only the
// calls that reach it: the GPU's work for a strip grows with its height
// (see reportStrip).
func (g *flowGame) drawReport(m render.ReportModel) (w, h int, px []byte) {
	lw := float64(render.ReportWidth)
	lh := render.ReportHeight(lw, m)
	tp := &tape{w: lw, h: lh}
	render.Report(tp, m, render.Light())
	w, h = int(math.Ceil(lw*reportScale)), int(math.Ceil(lh*reportScale))
	px = make([]byte, 4*w*h)
	for y0 := 0; y0 < h; y0 += reportStrip {
		sh := min(reportStrip, h-y0)
		img := ebiten.NewImage(w, sh)
		g.canvas.Begin(img, reportScale)
		tp.play(g.canvas, float64(y0)/reportScale, float64(y0+sh)/reportScale)
		g.canvas.Flush()
		img.ReadPixels(px[4*w*y0 : 4*w*(y0+sh)])
		img.Deallocate()
	}
	return w, h, px
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
