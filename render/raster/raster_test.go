package raster_test

import (
	"bytes"
	"flag"
	"image"
	"image/color"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/report"
	"evenbeat/setting"
	"evenbeat/setting/session"
)

var update = flag.Bool("update", false, "rewrite the PNG goldens in testdata")

func TestSizeIsPixelsOverScale(t *testing.T) {
	c := raster.New(1170, 2532, 3)
	if w, h := c.Size(); w != 390 || h != 844 {
		t.Errorf("Size() = %g x %g, want 390 x 844", w, h)
	}
	if b := c.Image().Bounds(); b.Dx() != 1170 || b.Dy() != 2532 {
		t.Errorf("image %v", b)
	}
	if w, _ := raster.New(10, 10, 0).Size(); w != 10 {
		t.Errorf("scale 0 should be taken as 1, size %g", w)
	}
}

func rgbaAt(c *raster.Canvas, x, y int) color.RGBA { return c.Image().RGBAAt(x, y) }

func TestFillCoverageAndBlending(t *testing.T) {
	c := raster.New(40, 40, 2)
	white := color.RGBA{255, 255, 255, 255}
	c.Clear(white)
	// Logical (5,5)-(10,10.25) is pixels (10,10)-(20,20.5).
	c.Fill(render.RectPath(render.Rect{Min: render.Point{X: 5, Y: 5}, Max: render.Point{X: 10, Y: 10.25}}), render.FillStyle{Color: color.RGBA{0, 0, 255, 255}})
	if got := rgbaAt(c, 15, 15); got != (color.RGBA{0, 0, 255, 255}) {
		t.Errorf("inside: %v", got)
	}
	if got := rgbaAt(c, 9, 15); got != white {
		t.Errorf("outside: %v", got)
	}
	// Pixel row 20 is half covered: about half blue, half white.
	if got := rgbaAt(c, 15, 20); got.R < 120 || got.R > 135 || got.B != 255 {
		t.Errorf("half-covered edge pixel: %v, want R about 127", got)
	}
	// Premultiplied half-transparent red over white gives pink.
	c.Fill(render.RectPath(render.Rect{Min: render.Point{X: 12, Y: 12}, Max: render.Point{X: 18, Y: 18}}), render.FillStyle{Color: color.RGBA{128, 0, 0, 128}})
	if got := rgbaAt(c, 30, 30); !near(got, color.RGBA{255, 127, 127, 255}, 2) {
		t.Errorf("blended: %v, want about (255,127,127)", got)
	}
}

func near(a, b color.RGBA, tol int) bool {
	d := func(x, y uint8) bool { v := int(x) - int(y); return v >= -tol && v <= tol }
	return d(a.R, b.R) && d(a.G, b.G) && d(a.B, b.B) && d(a.A, b.A)
}

func TestStrokeWidth(t *testing.T) {
	c := raster.New(40, 20, 1)
	var p render.Path
	p.MoveTo(render.Point{X: 5, Y: 10})
	p.LineTo(render.Point{X: 35, Y: 10})
	c.Stroke(p, render.LineStyle{Color: color.RGBA{0, 0, 0, 255}, Width: 2})
	// A 2-unit line on y=10 covers pixel rows 9 and 10 fully, 8 and 11 not.
	for y, want := range map[int]uint8{8: 0, 9: 255, 10: 255, 11: 0} {
		if a := rgbaAt(c, 20, y).A; a != want {
			t.Errorf("row %d alpha %d, want %d", y, a, want)
		}
	}
}

// Text ink stays inside render.TextBox (scaled), and a centred label's ink
// is centred on its anchor: the backends and the layout agree.
func TestTextInkInsideTextBox(t *testing.T) {
	for _, scale := range []float64{1, 3} {
		c := raster.New(int(300*scale), int(60*scale), scale)
		at := render.Point{X: 150, Y: 30}
		s := render.TextStyle{Color: color.RGBA{0, 0, 0, 255}, Size: 18, HAlign: render.Center, VAlign: render.Middle}
		const text = "Cut-off 75 % (back)"
		c.Text(at, text, s)
		ink := inkBounds(c.Image())
		if ink.Empty() {
			t.Fatalf("scale %g: no ink", scale)
		}
		box := render.TextBox(at, text, s)
		px := image.Rect(int(box.Min.X*scale)-1, int(box.Min.Y*scale)-1, int(box.Max.X*scale)+2, int(box.Max.Y*scale)+2)
		if !ink.In(px) {
			t.Errorf("scale %g: ink %v outside the text box %v", scale, ink, px)
		}
		mid := float64(ink.Min.X+ink.Max.X) / 2 / scale
		if d := mid - at.X; d < -1.5 || d > 1.5 {
			t.Errorf("scale %g: centred ink is off its anchor by %.2f units", scale, d)
		}
	}
}

func inkBounds(img *image.RGBA) image.Rectangle {
	var r image.Rectangle
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			if img.RGBAAt(x, y).A > 0 {
				r = r.Union(image.Rect(x, y, x+1, y+1))
			}
		}
	}
	return r
}

func TestWritePNG(t *testing.T) {
	c := raster.New(8, 4, 1)
	c.Clear(color.RGBA{1, 2, 3, 255})
	var buf bytes.Buffer
	if err := report.EncodePNG(&buf, c); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if r, g, b, _ := img.At(7, 3).RGBA(); r>>8 != 1 || g>>8 != 2 || b>>8 != 3 {
		t.Errorf("decoded pixel %v", img.At(7, 3))
	}
}

// Non-finite input draws nothing and does not panic.
func TestBadInputDrawsNothing(t *testing.T) {
	c := raster.New(20, 20, 1)
	var p render.Path
	nan := 0.0
	nan /= nan
	p.MoveTo(render.Point{X: nan, Y: 1})
	p.LineTo(render.Point{X: 5, Y: nan})
	c.Fill(p, render.FillStyle{Color: color.RGBA{0, 0, 0, 255}})
	c.Text(render.Point{X: nan}, "x", render.TextStyle{Color: color.RGBA{0, 0, 0, 255}})
	c.Fill(render.RectPath(render.Rect{Min: render.Point{X: 100, Y: 100}, Max: render.Point{X: 200, Y: 200}}), render.FillStyle{Color: color.RGBA{0, 0, 0, 255}})
	if !inkBounds(c.Image()).Empty() {
		t.Error("bad or off-canvas input drew pixels")
	}
	// Far-flung points (beyond a million device pixels) are not drawn, and
	// a large but sane path still covers the canvas.
	cover := func(far float64) int {
		c := raster.New(100, 100, 1)
		c.Fill(render.RectPath(render.Rect{Min: render.Point{X: -far, Y: -far}, Max: render.Point{X: far, Y: far}}), render.FillStyle{Color: color.RGBA{0, 0, 0, 255}})
		n := 0
		for i := 3; i < len(c.Image().Pix); i += 4 {
			if c.Image().Pix[i] == 255 {
				n++
			}
		}
		return n
	}
	if n := cover(1e5); n != 100*100 {
		t.Errorf("a square 1e5 px each way covers %d of 10000 pixels", n)
	}
	if n := cover(1e7); n != 0 {
		t.Errorf("a square 1e7 px each way should not be drawn, covered %d pixels", n)
	}
}

// Text blends cached glyph masks made for the pen point to a quarter
// pixel; filling render.TextPath (the exact outline) must give nearly the
// same pixels: a shift of at most an eighth of a pixel each way changes an
// edge pixel's coverage by at most about a quarter, and in all some 12 % of
// the ink of 14 px text at scale 1 (measured; the figures are logged),
// while misplaced, missing or doubled glyphs would differ by far more. A
// pen point on a quarter pixel gives the outline's own pixels. Off-canvas
// and partly clipped text must not panic.
func TestTextMatchesItsOutline(t *testing.T) {
	black := color.RGBA{0, 0, 0, 255}
	for _, scale := range []float64{1, 2.5, 3} {
		for _, st := range []render.TextStyle{{Color: black, Size: 14}, {Color: black, Size: 19, Bold: true, HAlign: render.Center}} {
			const text = "Lead 0.79 mm, cut-off 75 % ±2° — valve travel ½ in"
			at := render.Point{X: 7.3, Y: 20.6}
			if st.HAlign == render.Center {
				at.X = 200.13
			}
			a, b := raster.New(int(420*scale), int(40*scale), scale), raster.New(int(420*scale), int(40*scale), scale)
			a.Text(at, text, st)
			b.Fill(render.TextPath(at, text, st), render.FillStyle{Color: black})
			sum, worst, ink := 0, 0, 0
			for i := 3; i < len(a.Image().Pix); i += 4 {
				d := int(a.Image().Pix[i]) - int(b.Image().Pix[i])
				if d < 0 {
					d = -d
				}
				sum, worst = sum+d, max(worst, d)
				ink += int(b.Image().Pix[i])
			}
			t.Logf("scale %g bold %v: worst %d, total difference %.1f%% of the ink", scale, st.Bold, worst, 100*float64(sum)/float64(ink))
			if worst > 96 || float64(sum) > 0.15*float64(ink) {
				t.Errorf("scale %g bold %v: text differs from its outline by up to %d, in all %.1f%% of the ink", scale, st.Bold, worst, 100*float64(sum)/float64(ink))
			}
		}
	}
	for _, r := range "Wg°é" {
		st := render.TextStyle{Color: black, Size: 17}
		at := render.Point{X: 10.25, Y: 20.5}
		a, b := raster.New(100, 80, 2), raster.New(100, 80, 2)
		a.Text(at, string(r), st)
		b.Fill(render.TextPath(at, string(r), st), render.FillStyle{Color: black})
		for i := 3; i < len(a.Image().Pix); i += 4 {
			if d := int(a.Image().Pix[i]) - int(b.Image().Pix[i]); d > 1 || d < -1 {
				t.Fatalf("%q on a quarter pixel: coverage %d against the outline's %d", r, a.Image().Pix[i], b.Image().Pix[i])
			}
		}
	}
	c := raster.New(50, 20, 1)
	for _, at := range []render.Point{{X: -5, Y: 10}, {X: 45, Y: 25}, {X: -1e9, Y: 1e9}, {X: 1e300, Y: 0}} {
		c.Text(at, "Wg", render.TextStyle{Color: black})
	}
	if inkBounds(c.Image()).Empty() {
		t.Error("text partly on the canvas drew nothing")
	}
}

// PNG goldens: decoded pixels compared with a tolerance of 2 per channel
// (what x/image/vector's own tests allow between its integer and float
// paths). On failure the test writes NAME_got.png and NAME_diff.png beside
// the golden; run with -update to accept a change after looking at them.
func TestPNGGoldens(t *testing.T) {
	cases := []struct {
		name string
		draw func() *raster.Canvas
	}{
		{"piston_phone", func() *raster.Canvas {
			// Invented engine, for this test only.
			e := setting.Engine{CrankRadius: 38, RodLength: 190}
			c := raster.New(780, 1200, 2)
			c.Clear(render.Light().Background)
			render.PistonCurve(c, e, render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 584}}, render.Light())
			return c
		}},
		{"valve_curve_phone_dark", func() *raster.Canvas {
			m := sessionModel(t)
			c := raster.New(780, 1688, 2)
			th := render.Dark()
			c.Clear(th.Background)
			render.DrawScreen(c, m, render.Screen{Diagram: render.ValveCurveDiagram}, render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 828}}, th)
			return c
		}},
		{"motion_walschaerts_phone", func() *raster.Canvas {
			m, err := render.NewEngineModel(setting.DemoWalschaerts())
			if err != nil {
				t.Fatal(err)
			}
			c := raster.New(780, 900, 2)
			c.Clear(render.Light().Background)
			render.Motion(c, m, 0, 135, render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 434}}, render.Light())
			return c
		}},
		{"balance_landscape", func() *raster.Canvas {
			// The card scrolls in the app: it gets the height it needs.
			m := sessionModel(t)
			box := render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 828, Y: 374}}
			box.Max.Y = max(box.Max.Y, box.Min.Y+render.LayoutBalance(box, m).NeedH)
			c := raster.New(1688, int(2*(box.Max.Y+16)), 2)
			c.Clear(render.Light().Background)
			render.Balance(c, m, box, render.Light())
			return c
		}},
		{"icon_192", func() *raster.Canvas {
			c := raster.New(192, 192, 1)
			render.Icon(c, 192)
			return c
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := tc.draw().Image()
			path := filepath.Join("testdata", tc.name+".png")
			if *update {
				writePNG(t, path, got)
				return
			}
			want := readPNG(t, path)
			diff, n := compare(got, want, 2)
			if n > 0 {
				base := strings.TrimSuffix(path, ".png")
				writePNG(t, base+"_got.png", got)
				writePNG(t, base+"_diff.png", diff)
				t.Errorf("%d pixels differ by more than 2 per channel; see %s_got.png and %s_diff.png", n, base, base)
			}
		})
	}
}

// sessionModel is the model of the invented demo session's first
// cylinder with report.DemoFit's frozen fit and plan, so the goldens do
// not move when the solver improves.
func sessionModel(t *testing.T) *render.Model {
	t.Helper()
	s, err := session.ReadFile("../../testdata/sessions/brackenfold-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	m, err := report.DemoModel(s)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func writePNG(t *testing.T, path string, img image.Image) {
	t.Helper()
	var buf bytes.Buffer
	if err := png.Encode(&buf, img); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

func readPNG(t *testing.T, path string) *image.RGBA {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	rgba := image.NewRGBA(img.Bounds())
	for y := img.Bounds().Min.Y; y < img.Bounds().Max.Y; y++ {
		for x := img.Bounds().Min.X; x < img.Bounds().Max.X; x++ {
			rgba.Set(x, y, img.At(x, y))
		}
	}
	return rgba
}

// compare counts pixels differing by more than tol in any channel and
// returns an image marking them in red over a faded copy of want.
func compare(got, want *image.RGBA, tol int) (*image.RGBA, int) {
	if got.Bounds() != want.Bounds() {
		return got, got.Bounds().Dx() * got.Bounds().Dy()
	}
	diff := image.NewRGBA(want.Bounds())
	n := 0
	b := want.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			g, w := got.RGBAAt(x, y), want.RGBAAt(x, y)
			if near(g, w, tol) {
				v := 192 + w.R/4
				diff.SetRGBA(x, y, color.RGBA{v, v, v, 255})
				continue
			}
			n++
			diff.SetRGBA(x, y, color.RGBA{255, 0, 0, 255})
		}
	}
	return diff, n
}
