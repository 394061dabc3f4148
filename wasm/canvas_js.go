//go:build js

package main

import (
	"image"
	"image/color"
	"math"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/vector"
	"golang.org/x/image/font"
	"golang.org/x/image/math/fixed"

	"evenbeat/render"
)

// ebitenCanvas implements render.Canvas on an *ebiten.Image: logical units
// (CSS px) times scale give device pixels. Fills go through ebiten's
// triangle rasteriser with the non-zero rule and anti-aliasing; strokes are
// filled outlines from render.Outline, so they match the PNG backend; text
// is drawn from glyph masks of render.NewFace kept as ebiten images (ebiten
// packs them into its texture atlas), which costs far less wasm than
// ebiten's text package and draws the same glyphs as the PNG backend.
//
// One canvas lives for the whole run so the glyph cache survives frames;
// Begin points it at the frame's target.
type ebitenCanvas struct {
	dst   *ebiten.Image
	scale float64
	w, h  float64 // logical size

	white  *ebiten.Image // a white pixel, the source of every fill
	faces  map[faceKey]font.Face
	glyphs map[glyphKey]*glyph
	vs     []ebiten.Vertex
	is     []uint16
}

// faceKey names one cached face: device pixels per em (in 1/64 px) and weight.
type faceKey struct {
	size64 int
	bold   bool
}

type glyphKey struct {
	face faceKey
	r    rune
}

// glyph is one rasterised glyph: img is nil for blank glyphs (space).
type glyph struct {
	img *ebiten.Image
	off image.Point // top-left of img relative to the pen on the baseline
}

func newEbitenCanvas() *ebitenCanvas {
	src := ebiten.NewImage(3, 3)
	src.Fill(color.White)
	return &ebitenCanvas{
		// The inner pixel: sampling never bleeds into a neighbour on the atlas.
		white:  src.SubImage(image.Rect(1, 1, 2, 2)).(*ebiten.Image),
		faces:  map[faceKey]font.Face{},
		glyphs: map[glyphKey]*glyph{},
	}
}

// Begin sets the target image and its scale (device pixels per logical unit).
func (c *ebitenCanvas) Begin(dst *ebiten.Image, scale float64) {
	c.dst, c.scale = dst, scale
	b := dst.Bounds()
	c.w, c.h = float64(b.Dx())/scale, float64(b.Dy())/scale
}

// Size returns the drawable size in logical units.
func (c *ebitenCanvas) Size() (w, h float64) { return c.w, c.h }

// Clear fills the whole target with col.
func (c *ebitenCanvas) Clear(col color.RGBA) { c.dst.Fill(col) }

// Fill fills p with the non-zero winding rule.
func (c *ebitenCanvas) Fill(p render.Path, s render.FillStyle) {
	k := float32(c.scale)
	c.vs, c.is = c.vs[:0], c.is[:0]
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
			c.draw(s.Color)
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
	c.draw(s.Color)
}

// draw fills the pending triangles in col.
func (c *ebitenCanvas) draw(col color.RGBA) {
	if len(c.is) == 0 {
		return
	}
	r, g, b, a := float32(col.R)/255, float32(col.G)/255, float32(col.B)/255, float32(col.A)/255
	for i := range c.vs {
		v := &c.vs[i]
		v.SrcX, v.SrcY = 1, 1
		v.ColorR, v.ColorG, v.ColorB, v.ColorA = r, g, b, a
	}
	// An RGBA value from image/color is premultiplied already.
	op := &ebiten.DrawTrianglesOptions{
		FillRule:       ebiten.FillRuleNonZero,
		AntiAlias:      true,
		ColorScaleMode: ebiten.ColorScaleModePremultipliedAlpha,
	}
	c.dst.DrawTriangles(c.vs, c.is, c.white, op)
}

// Stroke fills the outline render.Outline makes of p.
func (c *ebitenCanvas) Stroke(p render.Path, s render.LineStyle) {
	c.Fill(render.Outline(p, s), render.FillStyle{Color: s.Color})
}

// Text draws one line of text anchored at at.
func (c *ebitenCanvas) Text(at render.Point, text string, s render.TextStyle) {
	size := s.Size
	if !(size > 0) || math.IsInf(size, 0) {
		size = render.DefaultTextSize
	}
	key := faceKey{size64: int(math.Round(size * c.scale * 64)), bold: s.Bold}
	face := c.face(key)
	o := render.TextOrigin(at, text, s)
	x := fixed.Int26_6(math.Round(o.X * c.scale * 64))
	y := math.Round(o.Y * c.scale)
	var op ebiten.DrawImageOptions
	op.ColorScale.ScaleWithColor(s.Color)
	prev := rune(-1)
	for _, r := range text {
		if prev >= 0 {
			x += face.Kern(prev, r)
		}
		g := c.glyph(face, key, r)
		if g.img != nil {
			op.GeoM.Reset()
			op.GeoM.Translate(float64(x.Round()+g.off.X), y+float64(g.off.Y))
			c.dst.DrawImage(g.img, &op)
		}
		adv, _ := face.GlyphAdvance(r)
		x += adv
		prev = r
	}
}

func (c *ebitenCanvas) face(key faceKey) font.Face {
	f, ok := c.faces[key]
	if !ok {
		f = render.NewFace(float64(key.size64)/64, key.bold)
		c.faces[key] = f
	}
	return f
}

// glyph returns the cached image of r in face, rasterising it on first use.
func (c *ebitenCanvas) glyph(face font.Face, key faceKey, r rune) *glyph {
	gk := glyphKey{key, r}
	if g, ok := c.glyphs[gk]; ok {
		return g
	}
	g := &glyph{}
	dr, mask, mp, _, ok := face.Glyph(fixed.Point26_6{}, r)
	if ok && !dr.Empty() {
		// White, premultiplied by the mask's coverage; DrawImage tints it.
		rgba := image.NewRGBA(image.Rect(0, 0, dr.Dx(), dr.Dy()))
		for y := 0; y < dr.Dy(); y++ {
			for x := 0; x < dr.Dx(); x++ {
				_, _, _, a := mask.At(mp.X+x, mp.Y+y).RGBA()
				v := uint8(a >> 8)
				i := rgba.PixOffset(x, y)
				rgba.Pix[i], rgba.Pix[i+1], rgba.Pix[i+2], rgba.Pix[i+3] = v, v, v, v
			}
		}
		g.img = ebiten.NewImageFromImage(rgba)
		g.off = dr.Min
	}
	c.glyphs[gk] = g
	return g
}
