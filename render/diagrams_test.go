package render_test

import (
	"flag"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

// testEngine is invented for these tests (not a real engine): a 5 in gauge
// two-cylinder tank engine's cylinder, 76 mm stroke with a rod of five
// cranks.
var testEngine = setting.Engine{CrankRadius: 38, RodLength: 190}

// offsetEngine is invented too: the same cylinder with its line 20 mm above
// the axle centre and inclined 1 in 12, so back dead centre is not at 180.
var offsetEngine = setting.Engine{CrankRadius: 38, RodLength: 190, Offset: 20, Inclination: 4.76}

// Phone boxes in CSS px: a 390x844 portrait screen and its landscape turn,
// each less a 16 px margin.
var (
	portrait  = render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 374, Y: 828}}
	landscape = render.Rect{Min: render.Point{X: 16, Y: 16}, Max: render.Point{X: 828, Y: 374}}
)

// golden compares got with testdata/name.golden, rewriting it under -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join("testdata", name+".golden")
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./render -run %s -update to create it)", err, t.Name())
	}
	if got != string(want) {
		gl, wl := strings.Split(got, "\n"), strings.Split(string(want), "\n")
		for i := 0; i < len(gl) && i < len(wl); i++ {
			if gl[i] != wl[i] {
				t.Fatalf("%s differs from the golden at line %d:\n got: %.300s\nwant: %.300s\n(if the change is intended, run with -update and review the diff)", name, i+1, gl[i], wl[i])
			}
		}
		t.Fatalf("%s differs from the golden in length: %d lines, want %d", name, len(gl), len(wl))
	}
}

// checkLayout applies the checks every diagram must pass: everything
// inside the box, no two labels overlapping, no text under 14 units.
func checkLayout(t *testing.T, c *recorder.Canvas, box render.Rect) {
	t.Helper()
	if err := c.CheckInside(box); err != nil {
		t.Error(err)
	}
	if err := c.CheckLabels(); err != nil {
		t.Error(err)
	}
	if err := c.CheckTextSize(14); err != nil {
		t.Error(err)
	}
}

func TestPistonCurveGolden(t *testing.T) {
	cases := []struct {
		name string
		e    setting.Engine
		box  render.Rect
		th   render.Theme
	}{
		{"piston_portrait_light", testEngine, portrait, render.Light()},
		{"piston_offset_landscape_dark", offsetEngine, landscape, render.Dark()},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			c := recorder.New(390, 844)
			render.PistonCurve(c, tc.e, tc.box, tc.th)
			checkLayout(t, c, tc.box)
			golden(t, tc.name, c.String())
		})
	}
}

// The plotted curve must be the exact slider-crank: at 90 degrees a rod of
// five cranks puts the piston at (1 - cos 90 + L/R - sqrt((L/R)^2 - sin^2 90))
// / 2 = (1 + 5 - sqrt 24) / 2 = 55.05 % of the stroke (the standard
// slider-crank displacement formula; common practice, no source needed).
func TestPistonCurveCaption(t *testing.T) {
	c := recorder.New(390, 844)
	render.PistonCurve(c, testEngine, portrait, render.Light())
	want := fmt.Sprintf("%.1f %%", 100*(6-math.Sqrt(24))/2)
	if want != "55.1 %" {
		t.Fatalf("formula check: %s", want)
	}
	if !strings.Contains(c.String(), "55.1 %") {
		t.Errorf("caption should give 55.1 %% at 90 degrees:\n%s", c.String())
	}
}

func TestPistonCurveInvalidEngine(t *testing.T) {
	c := recorder.New(390, 844)
	render.PistonCurve(c, setting.Engine{CrankRadius: 50, RodLength: 40}, portrait, render.Light())
	out := c.String()
	if !strings.Contains(out, "shorter than the crank radius") && !strings.Contains(out, "longer") {
		t.Errorf("an invalid engine should show the validation message, got:\n%s", out)
	}
	if strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
		t.Errorf("NaN or Inf in the drawing:\n%s", out)
	}
	checkLayout(t, c, portrait)
}

// Narrow and short boxes still keep the drawing in the box as long as the
// plot gets its minimum height.
func TestPistonCurveFitsBoxes(t *testing.T) {
	for _, box := range []render.Rect{
		{Max: render.Point{X: 320, Y: 600}},
		{Max: render.Point{X: 390, Y: 500}},
		{Min: render.Point{X: 100, Y: 200}, Max: render.Point{X: 1100, Y: 900}},
	} {
		c := recorder.New(1200, 1000)
		render.PistonCurve(c, offsetEngine, box, render.Light())
		checkLayout(t, c, box)
	}
}

func TestCautionsGolden(t *testing.T) {
	for _, tc := range []struct {
		name string
		box  render.Rect
		th   render.Theme
	}{
		{"cautions_portrait_light", portrait, render.Light()},
		{"cautions_landscape_dark", landscape, render.Dark()},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := recorder.New(844, 844)
			ack := render.Cautions(c, tc.box, tc.th)
			checkLayout(t, c, tc.box)
			if ack.H() < 48 {
				t.Errorf("button %v is %g tall, want at least 48 CSS px", ack, ack.H())
			}
			if !tc.box.ContainsRect(ack) {
				t.Errorf("button %v outside the box %v", ack, tc.box)
			}
			// Every caution is shown, word for word, in order.
			var text []string
			for _, op := range c.Ops() {
				if op.Kind == recorder.Text {
					text = append(text, op.Str)
				}
			}
			all := strings.Join(text, " ")
			for _, s := range setting.Cautions() {
				if !strings.Contains(all, s) {
					t.Errorf("caution missing or broken: %q", s)
				}
			}
			if !strings.Contains(all, render.AckLabel) {
				t.Error("no acknowledge label")
			}
			golden(t, tc.name, c.String())
		})
	}
}

// A box shorter than the card needs keeps the button inside the box, where
// the finger can reach it.
func TestCautionsShortBoxKeepsButton(t *testing.T) {
	box := render.Rect{Max: render.Point{X: 358, Y: 300}}
	c := recorder.New(358, 300)
	ack := render.Cautions(c, box, render.Light())
	if !box.ContainsRect(ack) || ack.H() < 48 {
		t.Errorf("button %v not a full-size button inside %v", ack, box)
	}
	if h := render.CautionsHeight(358); !(h > 300 && h < 844) {
		t.Errorf("CautionsHeight(358) = %g, want more than 300 and less than a phone screen", h)
	}
}

func TestIconGolden(t *testing.T) {
	const size = 192
	c := recorder.New(size, size)
	render.Icon(c, size)
	ops := c.Ops()
	if len(ops) < 2 {
		t.Fatal("icon drew nothing")
	}
	// The ground covers the whole square.
	if b := recorder.New(size, size); true {
		b.Fill(ops[0].Path, ops[0].Fill)
		if got := b.Bounds(); got != (render.Rect{Max: render.Point{X: size, Y: size}}) {
			t.Errorf("the ground covers %v, want the whole icon", got)
		}
	}
	// Everything else lies inside the maskable safe circle (80 % of the side).
	safe := render.IconSafe * size / 2
	ctr := render.Point{X: size / 2, Y: size / 2}
	for i, op := range ops[1:] {
		hw := 0.0
		if op.Kind == recorder.Stroke {
			hw = op.Line.Width / 2
		}
		for _, seg := range op.Path {
			for _, pt := range seg.Pts[:seg.Kind.NumPoints()] {
				if d := math.Hypot(pt.X-ctr.X, pt.Y-ctr.Y) + hw; d > safe {
					t.Fatalf("call %d reaches %.1f px from the centre, beyond the safe radius %.1f", i+1, d, safe)
				}
			}
		}
	}
	golden(t, "icon_192", c.String())
}

// render and setting must never pull in ebiten or syscall/js: they build
// and test natively, and the browser code depends on them, not the other
// way round.
func TestImportsStayNative(t *testing.T) {
	goBin, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go command on PATH")
	}
	out, err := exec.Command(goBin, "list", "-deps", "evenbeat/setting", "evenbeat/render", "evenbeat/render/raster", "evenbeat/render/recorder", "evenbeat/render/report").CombinedOutput()
	if err != nil {
		t.Fatalf("go list: %v\n%s", err, out)
	}
	for _, dep := range strings.Fields(string(out)) {
		if strings.Contains(dep, "ebiten") || dep == "syscall/js" {
			t.Errorf("render or setting depends on %s", dep)
		}
	}
}

// Boxes a caller should never pass draw nothing rather than NaN.
func TestDiagramsIgnoreUnusableBoxes(t *testing.T) {
	nan := math.NaN()
	for _, box := range []render.Rect{
		{},
		{Min: render.Point{X: 100, Y: 100}, Max: render.Point{X: 50, Y: 300}},
		{Max: render.Point{X: nan, Y: 300}},
		{Max: render.Point{X: math.Inf(1), Y: 300}},
	} {
		c := recorder.New(390, 844)
		render.PistonCurve(c, testEngine, box, render.Light())
		ack := render.Cautions(c, box, render.Light())
		if len(c.Ops()) != 0 || ack != (render.Rect{}) {
			t.Errorf("box %v: drew %d calls, button %v; want nothing", box, len(c.Ops()), ack)
		}
	}
	// Tiny but valid boxes overflow rather than produce NaN.
	c := recorder.New(390, 844)
	render.PistonCurve(c, testEngine, render.Rect{Max: render.Point{X: 5, Y: 5}}, render.Light())
	render.Cautions(c, render.Rect{Max: render.Point{X: 5, Y: 5}}, render.Light())
	if s := c.String(); strings.Contains(s, "NaN") || strings.Contains(s, "Inf") {
		t.Error("NaN or Inf drawn for a tiny box")
	}
}
