package raster

import (
	"encoding/binary"
	"image"
	"image/color"
	"image/draw"
	"math"

	"golang.org/x/image/vector"

	"evenbeat/render"
)

// Canvas draws into an RGBA image. Use New. It is not safe for concurrent
// use.
type Canvas struct {
	img    *image.RGBA
	scale  float64
	z      vector.Rasterizer
	mask   []byte // coverage of the current fill, reused between fills
	solid  []byte // a row of the current opaque colour, reused between fills
	glyphs map[glyphKey]*glyphMask
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
		img:    image.NewRGBA(image.Rect(0, 0, wPx, hPx)),
		scale:  scale,
		glyphs: map[glyphKey]*glyphMask{},
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

// Clear sets every pixel to col, replacing what was there. (A loop, not
// draw.Draw: that would carry image/draw's general drawing into the
// browser app, which clears a strip of the report with it.)
func (c *Canvas) Clear(col color.RGBA) {
	px := c.img.Pix
	if len(px) < 4 {
		return
	}
	px[0], px[1], px[2], px[3] = col.R, col.G, col.B, col.A
	for n := 4; n < len(px); n *= 2 {
		copy(px[n:], px[:n])
	}
}

// maxCoord is the largest distance from the origin, in device pixels, of a
// point Fill will draw: x/image/vector's integer path overflows some way
// beyond it (a million pixels is far outside any screen or report).
const maxCoord = 1 << 20

// Fill fills p with the non-zero rule, anti-aliased, blended over the image.
// A path with a point more than maxCoord device pixels from the origin is
// not drawn at all, rather than drawn wrong.
func (c *Canvas) Fill(p render.Path, s render.FillStyle) {
	if s.Color.A == 0 || len(p) == 0 {
		return
	}
	// Rasterize only the path's pixel box: the rasterizer's work and buffer
	// grow with the area it covers.
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, seg := range p {
		for _, pt := range seg.Pts[:seg.Kind.NumPoints()] {
			if !finitePt(pt) {
				continue
			}
			minX, minY = math.Min(minX, pt.X), math.Min(minY, pt.Y)
			maxX, maxY = math.Max(maxX, pt.X), math.Max(maxY, pt.Y)
		}
	}
	k := c.scale
	if minX > maxX || math.Max(math.Max(-minX, maxX), math.Max(-minY, maxY))*k > maxCoord {
		return
	}
	r := image.Rect(int(math.Floor(minX*k)), int(math.Floor(minY*k)),
		int(math.Ceil(maxX*k))+1, int(math.Ceil(maxY*k))+1).Intersect(c.img.Bounds())
	if r.Empty() {
		return
	}
	// Large areas go in tiles of at most tileSize pixels square, so the
	// rasterizer keeps to its integer path: x/image/vector switches to
	// float32 above 512 pixels, and that path ran up to fifteen times
	// slower in some test binaries on this machine (the same drawing,
	// flat time in floatingAccumulateOpSrcSIMD; cause not found, possibly
	// denormal floats). The rasterizer clips the path to each tile, so the
	// coverage is the same as in one piece.
	for y0 := r.Min.Y; y0 < r.Max.Y; y0 += tileSize {
		for x0 := r.Min.X; x0 < r.Max.X; x0 += tileSize {
			tile := image.Rect(x0, y0, min(x0+tileSize, r.Max.X), min(y0+tileSize, r.Max.Y))
			c.rasterize(p, tile, c.scale)
			c.composite(tile, s.Color)
		}
	}
}

// tileSize is the side of the tiles a large fill is rasterized in: the
// largest x/image/vector keeps on its integer path.
const tileSize = 512

// rasterize loads the rasterizer with p, scaled by k to device pixels,
// relative to r.
func (c *Canvas) rasterize(p render.Path, r image.Rectangle, k float64) {
	ox, oy := float64(r.Min.X), float64(r.Min.Y)
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
}

// composite blends col over the image through the rasterizer's coverage
// in r. The coverage goes to an alpha mask first (the rasterizer's fast
// path) and the blend skips uncovered pixels, which are most of a thin
// stroke's box; the arithmetic is x/image/vector's own Over formula, so
// the pixels are the ones vector's RGBA path would give.
func (c *Canvas) composite(r image.Rectangle, col color.RGBA) {
	c.blend(r, c.coverage(r.Dx(), r.Dy()), r.Dx(), col)
}

// coverage draws the rasterizer's coverage into the reused w by h mask.
func (c *Canvas) coverage(w, h int) []byte {
	if cap(c.mask) < w*h {
		c.mask = make([]byte, w*h)
	}
	mask := &image.Alpha{Pix: c.mask[:w*h], Stride: w, Rect: image.Rect(0, 0, w, h)}
	c.z.DrawOp = draw.Src
	c.z.Draw(mask, mask.Rect, image.Opaque, image.Point{})
	return mask.Pix
}

// blend blends col over the pixels of r (inside the image) through the
// coverage mask, whose rows are stride bytes apart.
func (c *Canvas) blend(r image.Rectangle, mask []byte, stride int, col color.RGBA) {
	w, h := r.Dx(), r.Dy()
	sr, sg, sb, sa := uint32(col.R)*0x101, uint32(col.G)*0x101, uint32(col.B)*0x101, uint32(col.A)*0x101
	opaque := col.A == 0xff
	full := binary.LittleEndian.Uint32([]byte{col.R, col.G, col.B, col.A})
	// A row of the opaque colour, copied over runs of full coverage: the
	// inside of a large fill (a card's ground) costs a memory copy.
	var solid []byte
	if opaque {
		if cap(c.solid) < 4*w {
			c.solid = make([]byte, 4*w)
		}
		solid = c.solid[:4*w]
		for i := 0; i < len(solid); i += 4 {
			binary.LittleEndian.PutUint32(solid[i:], full)
		}
	}
	const all = ^uint64(0)
	for y := 0; y < h; y++ {
		mrow := mask[y*stride : y*stride+w]
		drow := c.img.Pix[c.img.PixOffset(r.Min.X, r.Min.Y+y):]
		for x := 0; x < len(mrow); x++ {
			// Skip uncovered pixels eight at a time.
			if x+8 <= len(mrow) && binary.LittleEndian.Uint64(mrow[x:]) == 0 {
				x += 7
				continue
			}
			m := mrow[x]
			if m == 0 {
				continue
			}
			i := 4 * x
			if m == 0xff && opaque {
				// The run of full coverage from x, eight at a time.
				e := x + 1
				for e+8 <= len(mrow) && binary.LittleEndian.Uint64(mrow[e:]) == all {
					e += 8
				}
				for e < len(mrow) && mrow[e] == 0xff {
					e++
				}
				copy(drow[i:4*e], solid[:4*(e-x)])
				x = e - 1
				continue
			}
			d := drow[i : i+4 : i+4]
			ma := uint32(m) * 0x101
			a := 0xffff - sa*ma/0xffff
			d[0] = uint8((uint32(d[0])*0x101*a + sr*ma) / 0xffff >> 8)
			d[1] = uint8((uint32(d[1])*0x101*a + sg*ma) / 0xffff >> 8)
			d[2] = uint8((uint32(d[2])*0x101*a + sb*ma) / 0xffff >> 8)
			d[3] = uint8((uint32(d[3])*0x101*a + sa*ma) / 0xffff >> 8)
		}
	}
}

func finitePt(p render.Point) bool {
	return !math.IsNaN(p.X) && !math.IsNaN(p.Y) && !math.IsInf(p.X, 0) && !math.IsInf(p.Y, 0)
}

// Stroke fills render.Outline(p, s). An opaque stroke is filled one
// sub-path at a time, so a grid of separate lines costs the area of its
// lines rather than of the whole box they span; where two opaque
// sub-paths cross, painting one over the other gives the same colour. A
// translucent stroke is filled in one piece, so crossings are not painted
// twice.
func (c *Canvas) Stroke(p render.Path, s render.LineStyle) {
	if s.Color.A == 0 {
		return
	}
	fs := render.FillStyle{Color: s.Color}
	if s.Color.A != 0xff {
		c.Fill(render.Outline(p, s), fs)
		return
	}
	start := 0
	for i := 1; i <= len(p); i++ {
		if i == len(p) || p[i].Kind == render.MoveTo {
			c.Fill(render.Outline(p[start:i], s), fs)
			start = i
		}
	}
}

// Text draws one line of text: each glyph's outline (render.GlyphPath,
// the outlines the browser fills too) filled once per rune, size, weight
// and quarter-pixel phase of its pen point into a coverage mask kept by the
// canvas, then blended in the style's colour at render.PlaceGlyphs' pen
// points. A pen point more than maxCoord pixels out is not drawn.
func (c *Canvas) Text(at render.Point, text string, s render.TextStyle) {
	if text == "" || s.Color.A == 0 || !finitePt(at) {
		return
	}
	size := s.Size
	if !(size > 0) || math.IsInf(size, 0) {
		size = render.DefaultTextSize
	}
	size64 := int(math.Round(size * c.scale * 64))
	bounds := c.img.Bounds()
	for _, pg := range render.PlaceGlyphs(at, text, s) {
		x, y := pg.At.X*c.scale, pg.At.Y*c.scale
		if !(math.Abs(x) <= maxCoord && math.Abs(y) <= maxCoord) {
			continue
		}
		// The pen point to a quarter pixel: a whole pixel and a phase.
		qx, qy := int(math.Round(x*glyphPhases)), int(math.Round(y*glyphPhases))
		px, fx := floorDiv(qx, glyphPhases)
		py, fy := floorDiv(qy, glyphPhases)
		m := c.glyph(glyphKey{r: pg.Rune, size64: size64, bold: s.Bold, fx: fx, fy: fy})
		r := image.Rect(px+m.off.X, py+m.off.Y, px+m.off.X+m.w, py+m.off.Y+m.h)
		rc := r.Intersect(bounds)
		if rc.Empty() {
			continue
		}
		c.blend(rc, m.pix[(rc.Min.Y-r.Min.Y)*m.w+rc.Min.X-r.Min.X:], m.w, s.Color)
	}
}

// glyphPhases is how many pen positions per pixel, across and down, the
// glyph masks are made for: a quarter pixel, as freetype's faces did.
const glyphPhases = 4

// glyphKey names one cached glyph mask: rune, em size in device pixels (in
// 1/64 px), weight, and the pen point's phase within its pixel.
type glyphKey struct {
	r      rune
	size64 int
	bold   bool
	fx, fy int
}

// glyphMask is one glyph's coverage, w by h, its top-left corner off from
// the pixel holding the pen point.
type glyphMask struct {
	pix  []byte
	w, h int
	off  image.Point
}

// glyph returns the cached mask for key, filling the outline on first use.
func (c *Canvas) glyph(key glyphKey) *glyphMask {
	if m, ok := c.glyphs[key]; ok {
		return m
	}
	size := float64(key.size64) / 64
	pen := render.Point{X: float64(key.fx) / glyphPhases, Y: float64(key.fy) / glyphPhases}
	m := &glyphMask{}
	if b := render.GlyphBounds(key.r, size, key.bold); b.W() > 0 && b.H() > 0 {
		m.off = image.Pt(int(math.Floor(pen.X+b.Min.X)), int(math.Floor(pen.Y+b.Min.Y)))
		m.w = int(math.Ceil(pen.X+b.Max.X)) - m.off.X + 1
		m.h = int(math.Ceil(pen.Y+b.Max.Y)) - m.off.Y + 1
		p := render.GlyphPath(key.r, size, key.bold, render.Point{X: pen.X - float64(m.off.X), Y: pen.Y - float64(m.off.Y)})
		c.rasterize(p, image.Rect(0, 0, m.w, m.h), 1)
		m.pix = append([]byte(nil), c.coverage(m.w, m.h)...)
	}
	c.glyphs[key] = m
	return m
}

// floorDiv returns q = floor(a/b) and a - q*b, for b > 0.
func floorDiv(a, b int) (q, r int) {
	q, r = a/b, a%b
	if r < 0 {
		q, r = q-1, r+b
	}
	return q, r
}
