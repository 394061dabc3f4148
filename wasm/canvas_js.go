//go:build js

package main

import (
	"image"
	"image/color"
	"math"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/vector"

	"evenbeat/render"
)

// ebitenCanvas implements render.Canvas on an *ebiten.Image: logical units
// (CSS px) times scale give device pixels. Fills go through ebiten's
// triangle rasteriser with the non-zero rule and anti-aliasing; strokes are
// filled outlines from render.Outline, so they match the PNG backend; text
// is the font's own outlines (render.GlyphPath, from the tables in
// render/font) filled the same way, once per rune, size and weight, white
// into a page of glyphs. Glyphs and convex fills are batched: one
// DrawTriangles from the glyph page (whose corner is white, for the fills)
// with each vertex in its own colour, drawn before any other drawing and at
// Flush, instead of an ebiten call per glyph and per fill. No font file or
// font parser reaches the wasm build, and the PNG backend fills the very
// same outlines.
//
// One canvas lives for the whole run so the glyph cache survives frames;
// Begin points it at the frame's target.
type ebitenCanvas struct {
	dst   *ebiten.Image
	scale float64
	w, h  float64 // logical size

	white *ebiten.Image // a white pixel, the source of every fill
	// smooth is whether fills on the screen are anti-aliased: only below
	// two device pixels per CSS pixel. Ebiten anti-aliases through an
	// offscreen of twice the target's size, flushed whenever anything else
	// (a glyph) is drawn between fills; at 3x that cost seconds a frame on
	// a software GPU, and a phone's 3x pixels hide the steps anyway.
	// Glyph pages are always filled smooth.
	smooth bool
	glyphs map[glyphKey]*glyph
	page   *glyphPage    // the page new glyphs go into
	placed []placedGlyph // the glyphs of the Text call being drawn
	vs     []ebiten.Vertex
	is     []uint16
	plain  bool // the fill being drawn needs no winding count (see plain)

	// The batch: plain fills and glyphs waiting to be drawn in one
	// DrawTriangles call, all from one source image (a glyph page, whose
	// corner holds white for the fills), each vertex in its own colour.
	// Any other drawing, a new target and Flush draw it first, so the
	// order of the calls is kept.
	bvs     []ebiten.Vertex
	bis     []uint16
	bsrc    *ebiten.Image // the batch's source; nil while empty
	bsmooth bool          // the batch is anti-aliased (plain fills below 2x)
}

// glyphKey names one cached glyph: its rune, its em size in device pixels
// (in 1/64 px), its weight, and the phase of its pen point within a pixel
// across, in quarters (as the PNG backend's masks, so letter spacing at
// one device pixel per CSS pixel is even).
type glyphKey struct {
	r      rune
	size64 int
	bold   bool
	fx     int
}

// glyphPhases is how many pen positions across one pixel glyphs are made
// for.
const glyphPhases = 4

// placedGlyph is a glyph to draw: its cache key and the device pixel that
// holds its pen point.
type placedGlyph struct {
	key    glyphKey
	px, py int
}

// glyph is one filled glyph, a part of a glyph page: img is nil for blank
// glyphs (space).
type glyph struct {
	img  *ebiten.Image // the glyph's slot on its page
	page *ebiten.Image // the whole page, the batch's source
	off  image.Point   // top-left of img from the device pixel holding the pen point
}

func newEbitenCanvas() *ebitenCanvas {
	src := ebiten.NewImage(3, 3)
	src.Fill(color.White)
	return &ebitenCanvas{
		// The inner pixel: sampling never bleeds into a neighbour on the atlas.
		white:  src.SubImage(image.Rect(1, 1, 2, 2)).(*ebiten.Image),
		glyphs: map[glyphKey]*glyph{},
	}
}

// Begin sets the target image and its scale (device pixels per logical
// unit), after drawing what is batched for the last one.
func (c *ebitenCanvas) Begin(dst *ebiten.Image, scale float64) {
	c.Flush()
	c.dst, c.scale = dst, scale
	c.smooth = scale < 2
	b := dst.Bounds()
	c.w, c.h = float64(b.Dx())/scale, float64(b.Dy())/scale
}

// Size returns the drawable size in logical units.
func (c *ebitenCanvas) Size() (w, h float64) { return c.w, c.h }

// Clear fills the whole target with col.
func (c *ebitenCanvas) Clear(col color.RGBA) {
	c.Flush()
	c.dst.Fill(col)
}

// Flush draws the batch on the target. Call it when a frame is done, and
// before reading the target's pixels.
func (c *ebitenCanvas) Flush() {
	if c.bsrc == nil {
		return
	}
	if len(c.bis) > 0 {
		op := &ebiten.DrawTrianglesOptions{AntiAlias: c.bsmooth, ColorScaleMode: ebiten.ColorScaleModePremultipliedAlpha}
		c.dst.DrawTriangles(c.bvs, c.bis, c.bsrc, op)
	}
	c.bvs, c.bis, c.bsrc = c.bvs[:0], c.bis[:0], nil
}

// batchFor makes the batch ready for n more vertices from src, drawn
// smooth or not: a batch of another source or smoothness, or one too full
// for uint16 indices, is drawn first. It returns the index of the first
// new vertex.
func (c *ebitenCanvas) batchFor(src *ebiten.Image, smooth bool, n int) uint16 {
	if c.bsrc != nil && (c.bsrc != src || c.bsmooth != smooth || len(c.bvs)+n > 60000 || len(c.bis)+3*n > ebiten.MaxIndicesCount-3) {
		c.Flush()
	}
	c.bsrc, c.bsmooth = src, smooth
	return uint16(len(c.bvs))
}

// Fill fills p with the non-zero winding rule. Convex shapes (most of a
// screen: backgrounds, buttons, bars, dots, straight strokes) skip the
// winding count: ebiten fills them as plain triangles, which it batches
// with the fills and glyphs around them into one draw, where a counted
// fill costs a draw of its own through the stencil.
func (c *ebitenCanvas) Fill(p render.Path, s render.FillStyle) {
	c.fill(c.dst, p, float32(c.scale), s.Color, c.smooth)
}

// plain reports whether ebiten may fill p in col without the winding
// count: every sub-path convex (its fan covers it once) and, with more
// than one sub-path, an opaque colour (where sub-paths overlap, drawing
// twice changes nothing).
func plain(p render.Path, col color.RGBA) bool {
	ok, n := render.Convex(p)
	return ok && (n == 1 || col.A == 0xff)
}

// fill fills p, scaled by k, on dst.
func (c *ebitenCanvas) fill(dst *ebiten.Image, p render.Path, k float32, col color.RGBA, smooth bool) {
	c.vs, c.is = c.vs[:0], c.is[:0]
	c.plain = dst == c.dst && plain(p, col)
	if !c.plain && dst == c.dst {
		c.Flush() // what is batched goes under this fill
	}
	var sub vector.Path
	open := false
	flushSub := func() {
		if !open {
			return
		}
		nv, ni := len(c.vs), len(c.is)
		c.vs, c.is = sub.AppendVerticesAndIndicesForFilling(c.vs, c.is)
		// Keep within one DrawTriangles call's uint16 indices: draw what
		// came before this sub-path and start again with it.
		if nv > 0 && (len(c.vs) > 60000 || len(c.is) > ebiten.MaxIndicesCount-3) {
			c.vs, c.is = c.vs[:nv], c.is[:ni]
			c.draw(dst, col, smooth)
			c.vs, c.is = sub.AppendVerticesAndIndicesForFilling(c.vs[:0], c.is[:0])
		}
		sub = vector.Path{}
		open = false
	}
	for _, seg := range p {
		pt := seg.Pts
		switch seg.Kind {
		case render.MoveTo:
			flushSub()
			sub.MoveTo(float32(pt[0].X)*k, float32(pt[0].Y)*k)
			open = true
		case render.LineTo:
			if !open {
				continue
			}
			sub.LineTo(float32(pt[0].X)*k, float32(pt[0].Y)*k)
		case render.CubeTo:
			if !open {
				continue
			}
			sub.CubicTo(float32(pt[0].X)*k, float32(pt[0].Y)*k, float32(pt[1].X)*k, float32(pt[1].Y)*k, float32(pt[2].X)*k, float32(pt[2].Y)*k)
		case render.Close:
			if open {
				sub.Close()
			}
		}
	}
	flushSub()
	c.draw(dst, col, smooth)
}

// draw fills the pending triangles in col on dst, anti-aliased when
// smooth: a plain fill (see plain) joins the batch, the rest are drawn at
// once with the winding count.
func (c *ebitenCanvas) draw(dst *ebiten.Image, col color.RGBA, smooth bool) {
	if len(c.is) == 0 {
		return
	}
	r, g, b, a := float32(col.R)/255, float32(col.G)/255, float32(col.B)/255, float32(col.A)/255
	if c.plain {
		page := c.currentPage()
		base := c.batchFor(page.img, smooth, len(c.vs))
		wx, wy := float32(page.white.X), float32(page.white.Y)
		for _, v := range c.vs {
			v.SrcX, v.SrcY = wx, wy
			v.ColorR, v.ColorG, v.ColorB, v.ColorA = r, g, b, a
			c.bvs = append(c.bvs, v)
		}
		for _, i := range c.is {
			c.bis = append(c.bis, base+i)
		}
		return
	}
	for i := range c.vs {
		v := &c.vs[i]
		v.SrcX, v.SrcY = 1, 1
		v.ColorR, v.ColorG, v.ColorB, v.ColorA = r, g, b, a
	}
	// An RGBA value from image/color is premultiplied already.
	rule := ebiten.FillRuleNonZero
	if c.plain {
		rule = ebiten.FillRuleFillAll
	}
	op := &ebiten.DrawTrianglesOptions{
		FillRule:       rule,
		AntiAlias:      smooth,
		ColorScaleMode: ebiten.ColorScaleModePremultipliedAlpha,
	}
	dst.DrawTriangles(c.vs, c.is, c.white, op)
}

// Stroke fills the outline render.Outline makes of p.
func (c *ebitenCanvas) Stroke(p render.Path, s render.LineStyle) {
	c.Fill(render.Outline(p, s), render.FillStyle{Color: s.Color})
}

// Text draws one line of text anchored at at: each glyph from the cache,
// its pen point (render.PlaceGlyphs) taken to a quarter pixel across and a
// whole pixel down.
func (c *ebitenCanvas) Text(at render.Point, text string, s render.TextStyle) {
	size := s.Size
	if !(size > 0) || math.IsInf(size, 0) {
		size = render.DefaultTextSize
	}
	size64 := int(math.Round(size * c.scale * 64))
	c.placed = c.placed[:0]
	for _, pg := range render.PlaceGlyphs(at, text, s) {
		x, y := pg.At.X*c.scale, pg.At.Y*c.scale
		if !(math.Abs(x) <= 1<<20 && math.Abs(y) <= 1<<20) {
			continue
		}
		qx := int(math.Round(x * glyphPhases))
		px, fx := qx/glyphPhases, qx%glyphPhases
		if fx < 0 {
			px, fx = px-1, fx+glyphPhases
		}
		c.placed = append(c.placed, placedGlyph{key: glyphKey{r: pg.Rune, size64: size64, bold: s.Bold, fx: fx}, px: px, py: int(math.Round(y))})
	}
	c.cacheGlyphs(c.placed)
	col := s.Color
	r, gg, b, a := float32(col.R)/255, float32(col.G)/255, float32(col.B)/255, float32(col.A)/255
	for _, pg := range c.placed {
		g := c.glyphs[pg.key]
		if g == nil || g.img == nil {
			continue
		}
		// One quad from the glyph's slot on its page to whole device
		// pixels, tinted by the vertex colours (the page is white).
		base := c.batchFor(g.page, false, 4)
		sr := g.img.Bounds()
		x0, y0 := float32(pg.px+g.off.X), float32(pg.py+g.off.Y)
		x1, y1 := x0+float32(sr.Dx()), y0+float32(sr.Dy())
		sx0, sy0, sx1, sy1 := float32(sr.Min.X), float32(sr.Min.Y), float32(sr.Max.X), float32(sr.Max.Y)
		c.bvs = append(c.bvs,
			ebiten.Vertex{DstX: x0, DstY: y0, SrcX: sx0, SrcY: sy0, ColorR: r, ColorG: gg, ColorB: b, ColorA: a},
			ebiten.Vertex{DstX: x1, DstY: y0, SrcX: sx1, SrcY: sy0, ColorR: r, ColorG: gg, ColorB: b, ColorA: a},
			ebiten.Vertex{DstX: x0, DstY: y1, SrcX: sx0, SrcY: sy1, ColorR: r, ColorG: gg, ColorB: b, ColorA: a},
			ebiten.Vertex{DstX: x1, DstY: y1, SrcX: sx1, SrcY: sy1, ColorR: r, ColorG: gg, ColorB: b, ColorA: a})
		c.bis = append(c.bis, base, base+1, base+2, base+1, base+3, base+2)
	}
}

// glyphPageSize is the side of a glyph page in pixels: a 1024 square holds
// some six hundred glyphs of 14 CSS px text at 3x.
const glyphPageSize = 1024

// glyphPage is one image glyphs are packed into, in rows, a pixel apart;
// its top-left corner is a white 3x3 block whose inner pixel, white, is
// the source of the fills batched with the page's glyphs.
type glyphPage struct {
	img        *ebiten.Image
	white      image.Point // the white pixel
	x, y, rowH int
}

// newGlyphPage returns an empty page with its white block.
func newGlyphPage() *glyphPage {
	p := &glyphPage{img: ebiten.NewImage(glyphPageSize, glyphPageSize)}
	at, _ := p.place(3, 3)
	p.img.SubImage(image.Rectangle{Min: at, Max: at.Add(image.Pt(3, 3))}).(*ebiten.Image).Fill(color.White)
	p.white = at.Add(image.Pt(1, 1))
	return p
}

// currentPage returns the page new glyphs go into, making the first.
func (c *ebitenCanvas) currentPage() *glyphPage {
	if c.page == nil {
		c.page = newGlyphPage()
	}
	return c.page
}

// place reserves a w by h slot, or reports that the page is full.
func (p *glyphPage) place(w, h int) (image.Point, bool) {
	if p.x+w > glyphPageSize {
		p.x, p.y, p.rowH = 0, p.y+p.rowH+1, 0
	}
	if w > glyphPageSize || p.y+h > glyphPageSize {
		return image.Point{}, false
	}
	at := image.Pt(p.x, p.y)
	p.x += w + 1
	p.rowH = max(p.rowH, h)
	return at, true
}

// cacheGlyphs fills the glyphs of placed that are not cached yet: each
// outline (render.GlyphPath) white and anti-aliased, with a pixel of
// margin, into a slot of the current glyph page. All of one call's new
// glyphs go in one fill, since every anti-aliased fill of an image costs
// ebiten an offscreen of its own. A glyph wider or taller than a page is
// left blank.
func (c *ebitenCanvas) cacheGlyphs(placed []placedGlyph) {
	var batch render.Path
	white := color.RGBA{0xff, 0xff, 0xff, 0xff}
	for _, pg := range placed {
		key := pg.key
		if _, ok := c.glyphs[key]; ok {
			continue
		}
		g := &glyph{}
		c.glyphs[key] = g
		size := float64(key.size64) / 64
		b := render.GlyphBounds(key.r, size, key.bold)
		if !(b.W() > 0 && b.H() > 0) {
			continue
		}
		pen := float64(key.fx) / glyphPhases
		g.off = image.Pt(int(math.Floor(pen+b.Min.X))-1, int(math.Floor(b.Min.Y))-1)
		w, h := int(math.Ceil(pen+b.Max.X))+1-g.off.X, int(math.Ceil(b.Max.Y))+1-g.off.Y
		at, ok := c.currentPage().place(w, h)
		if !ok {
			if w > glyphPageSize || h > glyphPageSize {
				continue
			}
			c.fill(c.page.img, batch, 1, white, true)
			batch = batch[:0]
			c.page = newGlyphPage()
			at, _ = c.page.place(w, h)
		}
		g.img = c.page.img.SubImage(image.Rectangle{Min: at, Max: at.Add(image.Pt(w, h))}).(*ebiten.Image)
		g.page = c.page.img
		origin := render.Point{X: pen + float64(at.X-g.off.X), Y: float64(at.Y - g.off.Y)}
		batch = append(batch, render.GlyphPath(key.r, size, key.bold, origin)...)
	}
	if len(batch) > 0 {
		c.fill(c.page.img, batch, 1, white, true)
	}
}
