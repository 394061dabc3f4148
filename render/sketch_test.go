package render_test

import (
	"fmt"
	"math"
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/setting/cpubench"
)

// sketchKeys are the set-up values the set-up screens show a sketch for:
// the session-file paths of the engine's dimensions, the valve's laps and
// ports, the wheel, and every gear's dimensions by their JSON names in
// setting/eccentric.go, stephenson.go and walschaerts.go.
var sketchKeys = []string{
	"engine.engine.crank_radius",
	"engine.engine.rod_length",
	"engine.engine.offset",
	"engine.valve.front.steam_lap",
	"engine.valve.back.steam_lap",
	"engine.valve.front.exhaust_lap",
	"engine.valve.back.exhaust_lap",
	"engine.valve.front.port_width",
	"engine.valve.back.port_width",
	"measuring.wheel_diameter_mm",
	"engine.gear.single_eccentric.eccentric.throw",
	"engine.gear.single_eccentric.eccentric.advance",
	"engine.gear.single_eccentric.eccentric.rod",
	"engine.gear.stephenson.forward.throw",
	"engine.gear.stephenson.forward.advance",
	"engine.gear.stephenson.forward.rod",
	"engine.gear.stephenson.backward.throw",
	"engine.gear.stephenson.backward.advance",
	"engine.gear.stephenson.backward.rod",
	"engine.gear.stephenson.link.radius",
	"engine.gear.stephenson.link.pin_spacing",
	"engine.gear.stephenson.lifting_link",
	"engine.gear.stephenson.reverse_arm",
	"engine.gear.walschaerts.return_crank",
	"engine.gear.walschaerts.return_angle",
	"engine.gear.walschaerts.eccentric_rod",
	"engine.gear.walschaerts.link_radius",
	"engine.gear.walschaerts.radius_rod",
	"engine.gear.walschaerts.lever.valve_pin",
	"engine.gear.walschaerts.lever.union_pin",
	"engine.gear.walschaerts.union_link",
}

// sketchBoxes span the sizes the set-up screens use, 120x80 to 390x200:
// a grid over that range, a few odd sizes and one wider box, placed away
// from the origin.
func sketchBoxes() []render.Rect {
	var out []render.Rect
	add := func(w, h float64) {
		out = append(out, render.Rect{Min: render.Point{X: 20.5, Y: 30.25}, Max: render.Point{X: 20.5 + w, Y: 30.25 + h}})
	}
	add(120, 80)
	add(390, 200)
	for w := 120.0; w <= 390; w += 45 {
		for h := 80.0; h <= 200; h += 30 {
			add(w, h)
		}
	}
	add(155.5, 93.25)
	add(121, 199)
	add(389, 81)
	add(812, 150) // a landscape phone's full width
	return out
}

// checkFinite fails on any recorded coordinate or size that is NaN or
// infinite.
func checkFinite(t *testing.T, c *recorder.Canvas) {
	t.Helper()
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	for i, op := range c.Ops() {
		for _, s := range op.Path {
			for _, p := range s.Pts[:s.Kind.NumPoints()] {
				if bad(p.X) || bad(p.Y) {
					t.Fatalf("call %d has a path point %v", i, p)
				}
			}
		}
		if bad(op.At.X) || bad(op.At.Y) || bad(op.Line.Width) || bad(op.Style.Size) {
			t.Fatalf("call %d has a bad anchor, width or size: %+v", i, op)
		}
	}
}

func TestDimensionSketchEveryKeyInsideBox(t *testing.T) {
	for _, key := range sketchKeys {
		for _, box := range sketchBoxes() {
			for _, th := range []render.Theme{render.Light(), render.Dark()} {
				c := recorder.New(900, 300)
				if !render.DimensionSketch(c, box, key, th) {
					t.Fatalf("%s: no sketch", key)
				}
				if len(c.Ops()) < 4 {
					t.Fatalf("%s in %v: only %d calls", key, box, len(c.Ops()))
				}
				checkLayout(t, c, box)
				checkFinite(t, c)
				if t.Failed() {
					t.Fatalf("%s in %gx%g", key, box.W(), box.H())
				}
			}
		}
	}
}

// Each sketch draws its dimension in the accent colour: a stroke (the
// dimension line) and a fill (an arrowhead), and its label in accent too.
func TestDimensionSketchDrawsADimension(t *testing.T) {
	th := render.Light()
	for _, key := range sketchKeys {
		c := recorder.New(500, 300)
		render.DimensionSketch(c, sketchBoxes()[1], key, th)
		var line, head, label bool
		for _, op := range c.Ops() {
			switch op.Kind {
			case recorder.Stroke:
				line = line || op.Line.Color == th.Accent
			case recorder.Fill:
				head = head || op.Fill.Color == th.Accent
			case recorder.Text:
				label = label || (op.Style.Color == th.Accent && op.Str != "")
			}
		}
		if !line || !head || !label {
			t.Errorf("%s: accent dimension line %v, arrowhead %v, label %v; want all three", key, line, head, label)
		}
	}
}

// accentBounds returns the box of the accent strokes (the dimension) of
// key's sketch drawn in box.
func accentBounds(key string, box render.Rect, th render.Theme) render.Rect {
	c := recorder.New(box.Max.X, box.Max.Y)
	render.DimensionSketch(c, box, key, th)
	d := recorder.New(box.Max.X, box.Max.Y)
	for _, op := range c.Ops() {
		if op.Kind == recorder.Stroke && op.Line.Color == th.Accent {
			d.Stroke(op.Path, op.Line)
		}
	}
	return d.Bounds()
}

// The front and back variants of a valve dimension sit at their own end
// of the valve: screen right is the front (cover) end, as in the motion
// drawing, so the front's dimension lies right of the middle and the
// back's left of it.
func TestDimensionSketchEndsDiffer(t *testing.T) {
	box := render.Rect{Max: render.Point{X: 390, Y: 200}}
	for _, which := range []string{"steam_lap", "exhaust_lap", "port_width"} {
		for _, end := range []string{"front", "back"} {
			b := accentBounds("engine.valve."+end+"."+which, box, render.Light())
			mid := (b.Min.X + b.Max.X) / 2
			if right := mid > box.W()/2; right != (end == "front") {
				t.Errorf("%s %s: dimension centred at x = %.1f in a box %g wide", end, which, mid, box.W())
			}
		}
	}
}

// The angle of advance is taken in the eccentric's running direction:
// with the crank at front dead centre pointing at the cylinder (screen
// right), forward running turns clockwise on screen, so the forward
// eccentric's angle lies below the crank and the backward one's above.
func TestDimensionSketchAdvanceFollowsRunning(t *testing.T) {
	box := render.Rect{Max: render.Point{X: 390, Y: 200}}
	crankY := map[bool]float64{}
	for _, fwd := range []bool{true, false} {
		key := "engine.gear.stephenson.backward.advance"
		if fwd {
			key = "engine.gear.stephenson.forward.advance"
		}
		// The crank is the one heavy ink stroke.
		c := recorder.New(390, 200)
		render.DimensionSketch(c, box, key, render.Light())
		for _, op := range c.Ops() {
			if op.Kind == recorder.Stroke && op.Line.Color == render.Light().Ink && op.Line.Width > 4 {
				crankY[fwd] = op.Path[0].Pts[0].Y
			}
		}
		b := accentBounds(key, box, render.Light())
		if below := b.Min.Y > crankY[fwd]; below != fwd {
			t.Errorf("%s: angle spans y %.1f to %.1f, crank at y %.1f", key, b.Min.Y, b.Max.Y, crankY[fwd])
		}
	}
}

func TestDimensionSketchUnknownKeys(t *testing.T) {
	for _, key := range []string{
		"", "engine", "engine.engine", "engine.engine.crank_radius.x", "x.engine.engine.crank_radius",
		"engine.engine.inclination", "engine.valve.admission", "engine.valve.middle.steam_lap",
		"engine.gear.stephenson.forward", "engine.gear.stephenson.link", "engine.gear.stephenson.link.suspension",
		"engine.gear.walschaerts.lever", "engine.gear.walschaerts.forward.throw",
		"engine.gear.single_eccentric.throw", "engine.gear.single-eccentric.eccentric.throw",
		"engine.gear.stephenson.return_crank", "Engine.Engine.Crank_Radius", "measuring.wheel_diameter",
	} {
		c := recorder.New(500, 300)
		if render.DimensionSketch(c, sketchBoxes()[1], key, render.Light()) {
			t.Errorf("%q: a sketch for a key with none", key)
		}
		if n := len(c.Ops()); n != 0 {
			t.Errorf("%q: %d calls for an unknown key", key, n)
		}
	}
}

// A box under the minimum, or one that is not finite, draws nothing; the
// key is still known.
func TestDimensionSketchSmallOrBadBox(t *testing.T) {
	for _, box := range []render.Rect{
		{Max: render.Point{X: render.SketchMinW - 1, Y: 200}},
		{Max: render.Point{X: 390, Y: render.SketchMinH - 1}},
		{},
		{Min: render.Point{X: 10, Y: 10}, Max: render.Point{X: math.NaN(), Y: 200}},
		{Max: render.Point{X: math.Inf(1), Y: 200}},
		{Min: render.Point{X: 400, Y: 0}, Max: render.Point{X: 0, Y: 200}},
	} {
		c := recorder.New(500, 300)
		if !render.DimensionSketch(c, box, "engine.engine.crank_radius", render.Light()) {
			t.Errorf("%v: a known key should return true", box)
		}
		if n := len(c.Ops()); n != 0 {
			t.Errorf("%v: %d calls in a box too small to draw in", box, n)
		}
	}
	c := recorder.New(500, 300)
	box := render.Rect{Max: render.Point{X: render.SketchMinW, Y: render.SketchMinH}}
	render.DimensionSketch(c, box, "engine.engine.crank_radius", render.Light())
	if len(c.Ops()) == 0 {
		t.Error("the minimum box should be drawn in")
	}
}

// The drawing keeps its aspect: a wider box of the same height gives the
// same drawing, moved across to stay centred.
func TestDimensionSketchKeepsAspect(t *testing.T) {
	bounds := func(w float64) render.Rect {
		c := recorder.New(500, 300)
		render.DimensionSketch(c, render.Rect{Max: render.Point{X: w, Y: 150}}, "engine.engine.rod_length", render.Light())
		// Drop the card fill (call 0) and the label (last call).
		ops := c.Ops()
		d := recorder.New(500, 300)
		for _, op := range ops[1 : len(ops)-1] {
			d.Stroke(op.Path, op.Line)
		}
		return d.Bounds()
	}
	a, b := bounds(390), bounds(500)
	if dw, ah := math.Abs(a.W()-b.W()), math.Abs(a.H()-b.H()); dw > 0.01 || ah > 0.01 {
		t.Errorf("drawing %v in 390 wide, %v in 500 wide: should be the same size", a, b)
	}
	if shift := b.Min.X - a.Min.X; math.Abs(shift-55) > 0.01 {
		t.Errorf("drawing moved %g across, want 55 (half the extra width)", shift)
	}
}

func TestDimensionSketchGoldens(t *testing.T) {
	small := render.Rect{Min: render.Point{X: 8, Y: 8}, Max: render.Point{X: 128, Y: 88}}
	wide := render.Rect{Min: render.Point{X: 8, Y: 8}, Max: render.Point{X: 398, Y: 208}}
	for _, tc := range []struct {
		name, key string
		box       render.Rect
		th        render.Theme
	}{
		{"sketch_crank_radius_light", "engine.engine.crank_radius", wide, render.Light()},
		{"sketch_front_steam_lap_dark", "engine.valve.front.steam_lap", wide, render.Dark()},
		{"sketch_stephenson_backward_advance_light", "engine.gear.stephenson.backward.advance", small, render.Light()},
		{"sketch_walschaerts_return_angle_dark", "engine.gear.walschaerts.return_angle", small, render.Dark()},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := recorder.New(410, 220)
			render.DimensionSketch(c, tc.box, tc.key, tc.th)
			checkLayout(t, c, tc.box)
			golden(t, tc.name, c.String())
		})
	}
}

// BenchmarkDimensionSketches draws every sketch once into a 390x200 box
// through the recorder: the drawing code alone.
func BenchmarkDimensionSketches(b *testing.B) {
	c := recorder.New(390, 200)
	box := render.Rect{Max: render.Point{X: 390, Y: 200}}
	th := render.Light()
	b.ReportAllocs()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		c.Reset()
		for _, key := range sketchKeys {
			render.DimensionSketch(c, box, key, th)
		}
	}
}

// BenchmarkDimensionSketchesRaster paints every sketch once at a phone's
// 3x device scale, what one set-up screen costs per sketch shown.
func BenchmarkDimensionSketchesRaster(b *testing.B) {
	c := raster.New(1170, 600, 3)
	box := render.Rect{Max: render.Point{X: 390, Y: 200}}
	th := render.Light()
	defer cpubench.Report(b, cpubench.Now())
	for b.Loop() {
		for _, key := range sketchKeys {
			c.Clear(th.Background)
			render.DimensionSketch(c, box, key, th)
		}
	}
}

func ExampleDimensionSketch() {
	c := recorder.New(390, 200)
	box := render.Rect{Max: render.Point{X: 390, Y: 200}}
	known := render.DimensionSketch(c, box, "engine.engine.rod_length", render.Light())
	unknown := render.DimensionSketch(c, box, "engine.engine.colour", render.Light())
	fmt.Println(known, unknown, c.CheckInside(box))
	// Output: true false <nil>
}
