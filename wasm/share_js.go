//go:build js

package main

import (
	"math"
	"syscall/js"

	"github.com/hajimehoshi/ebiten/v2"

	"evenbeat/render"
)

// reportScale is the shared report's device pixels per logical unit: 960
// pixels across render.ReportWidth, as the command line's report draws it
// (about 150 dots per inch across a printed A4 page).
const reportScale = 1.5

// reportStrip is the tallest strip (device pixels) of the report drawn on
// one offscreen image: every WebGL2 device takes a texture this size, while
// a whole report may be taller than a phone's limit.
const reportStrip = 2048

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
		w, h, px := g.drawReport(r.m)
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
// reportScale, strip by strip, and returns its size in pixels and its RGBA
// pixels (opaque, so premultiplied or not makes no difference).
func (g *flowGame) drawReport(m render.ReportModel) (w, h int, px []byte) {
	lw := float64(render.ReportWidth)
	lh := render.ReportHeight(lw, m)
	w, h = int(math.Ceil(lw*reportScale)), int(math.Ceil(lh*reportScale))
	px = make([]byte, 4*w*h)
	th := render.Light()
	for y0 := 0; y0 < h; y0 += reportStrip {
		sh := min(reportStrip, h-y0)
		img := ebiten.NewImage(w, sh)
		g.canvas.Begin(img, reportScale)
		s := strip{c: g.canvas, w: lw, h: lh, top: float64(y0) / reportScale, bottom: float64(y0+sh) / reportScale}
		render.Report(s, m, th)
		img.ReadPixels(px[4*w*y0 : 4*w*(y0+sh)])
		img.Deallocate()
	}
	return w, h, px
}

// strip is the part of a tall canvas from top to bottom (logical units)
// drawn on a shorter one: everything moves up by top, and what lies
// wholly outside the strip is skipped.
type strip struct {
	c           render.Canvas
	w, h        float64 // the whole canvas
	top, bottom float64
}

// stripMargin is how far (logical units) beyond its points a stroke or a
// line of text may reach.
const stripMargin = 40

func (s strip) Size() (float64, float64) { return s.w, s.h }

func (s strip) Fill(p render.Path, st render.FillStyle) {
	if q, ok := s.move(p); ok {
		s.c.Fill(q, st)
	}
}

func (s strip) Stroke(p render.Path, st render.LineStyle) {
	if q, ok := s.move(p); ok {
		s.c.Stroke(q, st)
	}
}

func (s strip) Text(at render.Point, text string, st render.TextStyle) {
	if at.Y < s.top-stripMargin || at.Y > s.bottom+stripMargin {
		return
	}
	at.Y -= s.top
	s.c.Text(at, text, st)
}

// move returns p moved up by top, and false when it lies wholly outside
// the strip.
func (s strip) move(p render.Path) (render.Path, bool) {
	lo, hi := math.Inf(1), math.Inf(-1)
	q := make(render.Path, len(p))
	for i, seg := range p {
		for k := range seg.Pts {
			if seg.Kind != render.Close && (k == 0 || seg.Kind == render.CubeTo) {
				lo, hi = math.Min(lo, seg.Pts[k].Y), math.Max(hi, seg.Pts[k].Y)
			}
			seg.Pts[k].Y -= s.top
		}
		q[i] = seg
	}
	return q, hi >= s.top-stripMargin && lo <= s.bottom+stripMargin
}
