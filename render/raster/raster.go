// Package raster is a render.Canvas that draws into an *image.RGBA:
// anti-aliased fills with golang.org/x/image/vector (strokes become fills
// through render.Outline), text with the embedded font through
// golang/freetype's truetype faces, each alpha-blended over the pixels
// already there. It makes the PNG report and the app icons, and is the
// reference for what the browser backend should show.
//
// Units: the canvas is wPx by hPx device pixels; the drawing is in logical
// units (CSS px) multiplied by scale, so the logical size is px/scale.
// Origin top-left, y down. The package imports render, x/image and
// freetype; never ebiten or syscall/js.
package raster

import (
	"image"
	"image/color"
	"image/draw"
	"image/png"
	"io"
	"math"

	"golang.org/x/image/font"
	"golang.org/x/image/math/fixed"
	"golang.org/x/image/vector"

	"evenbeat/render"
)

// Canvas draws into an RGBA image. Use New. It is not safe for concurrent
// use.
type Canvas struct {
	img   *image.RGBA
	scale float64
	z     vector.Rasterizer
	faces map[faceKey]font.Face
}

type faceKey struct {
	size float64
	bold bool
}

// New returns a transparent canvas of wPx by hPx device pixels drawing
// logical units at scale device pixels each. A size below one pixel is
// taken as one; a scale that is not positive and finite is taken as 1.
func New(wPx, hPx int, scale float64) *Canvas {
	wPx, hPx = max(wPx, 1), max(hPx, 1)
	if !(scale > 0) || math.IsInf(scale, 0) {
		scale = 1
	}
	return &Canvas{
		img:   image.NewRGBA(image.Rect(0, 0, wPx, hPx)),
		scale: scale,
		faces: map[faceKey]font.Face{},
	}
}

// Image returns the image drawn into (the canvas's own, not a copy).
func (c *Canvas) Image() *image.RGBA { return c.img }

// Scale returns device pixels per logical unit.
func (c *Canvas) Scale() float64 { return c.scale }

// Size returns the logical size: pixels divided by scale.
func (c *Canvas) Size() (w, h float64) {
	b := c.img.Bounds()
	return float64(b.Dx()) / c.scale, float64(b.Dy()) / c.scale
}

// Clear sets every pixel to col, replacing what was there.
func (c *Canvas) Clear(col color.RGBA) {
	draw.Draw(c.img, c.img.Bounds(), image.NewUniform(col), image.Point{}, draw.Src)
}

// WritePNG encodes the image as PNG.
func (c *Canvas) WritePNG(w io.Writer) error { return png.Encode(w, c.img) }

// Fill fills p with the non-zero rule, anti-aliased, blended over the image.
func (c *Canvas) Fill(p render.Path, s render.FillStyle) {
	if s.Color.A == 0 || len(p) == 0 {
		return
	}
	// Rasterize only the path's pixel box: the rasterizer's buffer is as
	// big as the area it covers, and a full 1170x2532 frame per fill would
	// cost 12 MB of clearing each time.
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, seg := range p {
		n := segPoints(seg.Kind)
		for _, pt := range seg.Pts[:n] {
			if !finitePt(pt) {
				continue
			}
			minX, minY = math.Min(minX, pt.X), math.Min(minY, pt.Y)
			maxX, maxY = math.Max(maxX, pt.X), math.Max(maxY, pt.Y)
		}
	}
	if minX > maxX {
		return
	}
	k := c.scale
	r := image.Rect(int(math.Floor(minX*k)), int(math.Floor(minY*k)),
		int(math.Ceil(maxX*k))+1, int(math.Ceil(maxY*k))+1).Intersect(c.img.Bounds())
	if r.Empty() {
		return
	}
	ox, oy := float64(r.Min.X), float64(r.Min.Y)
	// The rasterizer clips to its own size, so points outside r are fine.
	c.z.Reset(r.Dx(), r.Dy())
	tx := func(pt render.Point) (float32, float32) {
		return float32(pt.X*k - ox), float32(pt.Y*k - oy)
	}
	open := false
	for _, seg := range p {
		switch seg.Kind {
		case render.MoveTo:
			if !finitePt(seg.Pts[0]) {
				continue
			}
			if open {
				c.z.ClosePath()
			}
			c.z.MoveTo(tx(seg.Pts[0]))
			open = true
		case render.LineTo:
			if open && finitePt(seg.Pts[0]) {
				c.z.LineTo(tx(seg.Pts[0]))
			}
		case render.CubeTo:
			if open && finitePt(seg.Pts[0]) && finitePt(seg.Pts[1]) && finitePt(seg.Pts[2]) {
				x1, y1 := tx(seg.Pts[0])
				x2, y2 := tx(seg.Pts[1])
				x3, y3 := tx(seg.Pts[2])
				c.z.CubeTo(x1, y1, x2, y2, x3, y3)
			}
		case render.Close:
			if open {
				c.z.ClosePath()
				open = false
			}
		}
	}
	if open {
		c.z.ClosePath()
	}
	c.z.Draw(c.img, r, image.NewUniform(s.Color), image.Point{})
}

func segPoints(k render.SegKind) int {
	switch k {
	case render.CubeTo:
		return 3
	case render.Close:
		return 0
	}
	return 1
}

func finitePt(p render.Point) bool {
	return !math.IsNaN(p.X) && !math.IsNaN(p.Y) && !math.IsInf(p.X, 0) && !math.IsInf(p.Y, 0)
}

// Stroke fills render.Outline(p, s).
func (c *Canvas) Stroke(p render.Path, s render.LineStyle) {
	if s.Color.A == 0 {
		return
	}
	c.Fill(render.Outline(p, s), render.FillStyle{Color: s.Color})
}

// Text draws one line of text with the embedded font at the style's size
// times the scale, from render.TextOrigin.
func (c *Canvas) Text(at render.Point, text string, s render.TextStyle) {
	if text == "" || s.Color.A == 0 || !finitePt(at) {
		return
	}
	size := s.Size
	if !(size > 0) || math.IsInf(size, 0) {
		size = render.DefaultTextSize
	}
	key := faceKey{size * c.scale, s.Bold}
	f, ok := c.faces[key]
	if !ok {
		f = render.NewFace(key.size, s.Bold)
		c.faces[key] = f
	}
	o := render.TextOrigin(at, text, s)
	d := font.Drawer{
		Dst:  c.img,
		Src:  image.NewUniform(s.Color),
		Face: f,
		Dot:  fixed.Point26_6{X: fixed.Int26_6(math.Round(o.X * c.scale * 64)), Y: fixed.Int26_6(math.Round(o.Y * c.scale * 64))},
	}
	d.DrawString(text)
}
