package raster_test

import (
	"image"
	"math"
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/setting"
)

// The raster draws where the recorder says: the accent-coloured pixels of
// the piston card (the main curve and its legend sample) lie inside the
// recorded accent strokes' bounds, and the cautions button's pixels fill
// the rectangle Cautions returns.
func TestRasterAgreesWithRecorder(t *testing.T) {
	const scale = 2
	th := render.Light()
	box := render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 700}}
	e := setting.Engine{CrankRadius: 38, RodLength: 190} // invented, for this test

	rec := recorder.New(390, 716)
	render.PistonCurve(rec, e, box, th)
	want := render.Rect{Min: render.Point{X: math.Inf(1), Y: math.Inf(1)}, Max: render.Point{X: math.Inf(-1), Y: math.Inf(-1)}}
	for _, op := range rec.Ops() {
		if op.Kind == recorder.Stroke && op.Line.Color == th.Accent {
			one := recorder.New(390, 716)
			one.Stroke(op.Path, op.Line)
			b := one.Bounds()
			want.Min.X, want.Min.Y = math.Min(want.Min.X, b.Min.X), math.Min(want.Min.Y, b.Min.Y)
			want.Max.X, want.Max.Y = math.Max(want.Max.X, b.Max.X), math.Max(want.Max.Y, b.Max.Y)
		}
	}
	c := raster.New(390*scale, 716*scale, scale)
	c.Clear(th.Background)
	render.PistonCurve(c, e, box, th)
	got := colourBounds(c.Image(), th.Accent)
	if got.Empty() {
		t.Fatal("no accent pixels drawn")
	}
	px := image.Rect(int(want.Min.X*scale)-1, int(want.Min.Y*scale)-1, int(want.Max.X*scale)+1, int(want.Max.Y*scale)+1)
	if !got.In(px) {
		t.Errorf("accent pixels %v outside the recorded strokes %v", got, px)
	}

	c.Clear(th.Background)
	ack := render.Cautions(c, box, th)
	btn := colourBounds(c.Image(), th.Accent)
	wantBtn := image.Rect(int(ack.Min.X*scale), int(ack.Min.Y*scale), int(ack.Max.X*scale), int(ack.Max.Y*scale))
	if btn.Dx() < wantBtn.Dx()-2 || btn.Dy() < wantBtn.Dy()-2 || !btn.In(wantBtn.Inset(-1)) {
		t.Errorf("button pixels %v, want the hit rectangle %v", btn, wantBtn)
	}
}

// colourBounds returns the box of pixels exactly of colour col.
func colourBounds(img *image.RGBA, col interface{ RGBA() (r, g, b, a uint32) }) image.Rectangle {
	r0, g0, b0, _ := col.RGBA()
	var r image.Rectangle
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			p := img.RGBAAt(x, y)
			if uint32(p.R)*0x101 == r0 && uint32(p.G)*0x101 == g0 && uint32(p.B)*0x101 == b0 {
				r = r.Union(image.Rect(x, y, x+1, y+1))
			}
		}
	}
	return r
}
