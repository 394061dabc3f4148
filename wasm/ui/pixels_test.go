package ui

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/raster"
	"evenbeat/render/recorder"
	"evenbeat/render/report"
	"evenbeat/setting/session"
)

// tourSizes are the screens the pixel test walks the tour on: phones
// 320 to 430 CSS px wide, upright and on their side.
func tourSizes() [][2]float64 {
	return [][2]float64{{320, 568}, {360, 740}, {390, 844}, {430, 932}, {568, 320}, {740, 360}, {844, 390}, {932, 430}}
}

// walkTour walks every screen of the app on a w by h phone in theme th,
// calling visit on each: the engines list, the demo engine's set-up
// (units, every dimension, what can be adjusted), the cautions, a reading
// (typed, and one the app finds unusual), where the engine stands, the
// menu, the round's readings and the rounds; then the demo session's
// plan: every tab, each priority, the target lead's keypad and the plan
// made for it, a what-if dragged on the balance and its steps, and the
// history of two rounds with the next round begun.
func walkTour(t *testing.T, w, h float64, th render.Theme, visit func(name string, a *App)) {
	t.Helper()
	st := newMemStore()
	a := newTestApp(t, st)
	a.Resize(w, h)
	a.SetTheme(th)
	at := func(name string) { t.Helper(); visit(name, a) }
	at("engines")
	tap(t, a, "Brackenfold (Stephenson) (invented demo)")
	at("units")
	tap(t, a, "Next")
	for n := 0; a.Screen() == Sizes; n++ {
		at(fmt.Sprintf("sizes %d (%s)", n+1, a.Field()))
		if n > 200 {
			t.Fatal("set-up does not end")
		}
		tap(t, a, "Next")
	}
	at(a.Screen().String())
	tap(t, a, "Next: start measuring")
	at("cautions")
	tap(t, a, render.AckLabel)
	at("measure")
	typeKeys(t, a, "129")
	at("measure, unusual")
	tap(t, a, "Where")
	at("where")
	a.Back()
	tap(t, a, "Menu")
	at("menu")
	tap(t, a, "All readings")
	at("readings")
	tap(t, a, "Menu")
	tap(t, a, "History")
	at("history, nothing read")
	tap(t, a, "Menu")
	tap(t, a, "Edit the engine")
	at("engine sheet")
	tap(t, a, "Menu")
	tap(t, a, "Engines")
	tap(t, a, "New engine")
	at("gear")

	p := planApp(t)
	p.Resize(w, h)
	p.SetTheme(th)
	a = p
	for _, tab := range planTabNames() {
		tap(t, a, tab)
		at("plan " + tab)
	}
	tap(t, a, "Steps")
	tap(t, a, "Balanced")
	at("plan, balanced")
	tap(t, a, "Equal cut-offs")
	at("plan, equal cut-offs")
	tap(t, a, "Equal leads")
	tap(t, a, "Target lead")
	at("target lead")
	typeKeys(t, a, "0.04") // inches: 1 mm, more than the sheaves' limits give
	for n := 0; a.Screen() == Lead && n < 2; n++ {
		tap(t, a, "Next") // a second Next takes a lead the app finds unusual
	}
	at("plan, a target lead it cannot meet")
	tap(t, a, "Balance")
	v := a.layout()
	a.Handle(Intent{Kind: Drag, At: render.Point{X: v.slider.Min.X + 0.8*v.slider.W(), Y: (v.slider.Min.Y + v.slider.Max.Y) / 2}})
	at("balance, what-if dragged")
	tap(t, a, "Steps")
	at("steps, what-if")
	tap(t, a, "Back to plan")
	tap(t, a, "Menu")
	at("menu, plan")
	tap(t, a, "Plan")
	tap(t, a, "Next round")
	at("measure, round 2")
	tap(t, a, "Menu")
	tap(t, a, "History of rounds")
	at("history")
	walkWhole(t, w, h, th, visit)
}

// walkWhole walks the whole engine (issue 15) on a w by h phone in theme
// th: the demo with a beat heard, in each position, listening's cautions
// and its recording; a three-cylinder engine and the bench-built
// Pellowmire with a beat heard.
func walkWhole(t *testing.T, w, h float64, th render.Theme, visit func(name string, a *App)) {
	t.Helper()
	heard := func(s *session.Session) *session.Session {
		pos := positionOf(t, s, s.Aims.RunningNotch)
		s.Heard = append(s.Heard, session.Heard{Date: "2026-12-01", Position: pos.Name, GapsDeg: pos.Now.Gaps, RevPerMin: 90})
		return s
	}
	for _, e := range []struct {
		name string
		s    *session.Session
	}{{"demo", limpingDemo(t)}, {"three cylinders", threeCylinders(t)}, {"Pellowmire", pellowmire(t)}} {
		a, _, _, _ := wholeApp(t, heard(e.s))
		a.Resize(w, h)
		a.SetTheme(th)
		visit("whole engine, "+e.name+", a beat heard", a)
		if e.name != "demo" {
			continue
		}
		tap(t, a, "Full back")
		visit("whole engine, full back", a)
		tap(t, a, "Running notch")
		tap(t, a, ListenLabel)
		visit("listen", a)
		tap(t, a, StartLabel)
		a.MicOpened()
		a.Update()
		visit("listen, recording", a)
	}
}

// TestTextStaysInItsBox is the pixel test of the tour (walkTour) on
// phones 320 to 430 CSS px wide, upright and on their side, in both
// themes (with -short: the narrowest and a common phone, both ways up):
// each screen is drawn by the raster backend with and without its text,
// and every line of text must
//
//   - lie inside its box: a button's label inside the button (and whole,
//     on one line or two, never shortened with "..."), the entry's,
//     sketch's and diagram's text inside them, the top bar's in the bar,
//     any other within the screen's width and clear of every button;
//   - show: the pixels its glyphs cover differ between the two drawings
//     (nothing drawn over it, nothing cut by the screen's edge), for all
//     text within the screen's height; on a screen that does not scroll,
//     all of it must be within the height.
func TestTextStaysInItsBox(t *testing.T) {
	screens := 0
	pc := &pixelCheck{own: map[ownKey]int{}}
	for _, sz := range tourSizes() {
		if testing.Short() && sz[0] != 320 && sz[0] != 390 && sz[0] != 568 && sz[0] != 844 {
			continue
		}
		for _, th := range []render.Theme{render.Light(), render.Dark()} {
			walkTour(t, sz[0], sz[1], th, func(name string, a *App) {
				t.Helper()
				screens++
				for _, e := range pc.problems(a) {
					t.Errorf("%gx%g %s, %s: %s", sz[0], sz[1], themeName(th), name, e)
				}
			})
		}
	}
	t.Logf("%d screens checked", screens)
}

// themeName names a theme for messages.
func themeName(th render.Theme) string {
	if th == render.Dark() {
		return "dark"
	}
	return "light"
}

// pixelCheck draws screens for the pixel test: the two drawings of the
// screen size last checked (kept, with their glyphs) and the pixels each
// line of text covers alone.
type pixelCheck struct {
	with, without *raster.Canvas
	scratch       *raster.Canvas
	own           map[ownKey]int
}

// ownKey is a line of text as ownPixels counts it.
type ownKey struct {
	text string
	size float64
	bold bool
}

// problems draws the screen shown with and without its text and says
// what text is out of its box or does not show (see TestTextStaysInItsBox).
func (pc *pixelCheck) problems(a *App) []string {
	v := a.layout()
	rec := recorder.New(a.w, a.h)
	a.Draw(rec)
	if pc.with == nil || pc.with.Image().Bounds().Dx() != int(a.w) || pc.with.Image().Bounds().Dy() != int(a.h) {
		pc.with, pc.without = raster.New(int(a.w), int(a.h), 1), raster.New(int(a.w), int(a.h), 1)
	}
	with, without := pc.with, pc.without
	for _, op := range rec.Ops() {
		for _, c := range []*raster.Canvas{with, without} {
			switch op.Kind {
			case recorder.Fill:
				c.Fill(op.Path, op.Fill)
			case recorder.Stroke:
				c.Stroke(op.Path, op.Line)
			case recorder.Text:
				if c == with {
					c.Text(op.At, op.Str, op.Style)
				}
			}
		}
	}
	var out []string
	top := a.BarBottom()
	fixed := a.fitted(v)
	labels := map[*Target][]string{}
	var order []*Target
	for _, op := range rec.Ops() {
		if op.Kind != recorder.Text || strings.TrimSpace(op.Str) == "" {
			continue
		}
		ink := inkBox(op)
		box, own := textBox(a, v, op.At)
		if own != nil {
			if labels[own] == nil {
				order = append(order, own)
			}
			labels[own] = append(labels[own], op.Str)
		}
		if !box.Inset(-1).ContainsRect(ink) {
			out = append(out, fmt.Sprintf("%q reaches %v, outside its box %v", op.Str, ink, box))
		}
		if own == nil {
			for _, tg := range v.targets {
				if tg.Rect.Overlaps(ink.Inset(1)) && !tg.track {
					out = append(out, fmt.Sprintf("%q %v runs under the button %q %v", op.Str, ink, tg.Label, tg.Rect))
				}
			}
		}
		if fixed && ink.Max.Y > a.h+1 {
			out = append(out, fmt.Sprintf("%q %v is below the screen, which does not scroll", op.Str, ink))
		}
		onScreen := ink.Min.Y >= 0 && ink.Max.Y <= a.h && (ink.Min.Y >= top || op.At.Y < top)
		if onScreen {
			if shown, whole := shownPixels(with, without, ink), pc.ownPixels(op); float64(shown) < 0.75*float64(whole) {
				out = append(out, fmt.Sprintf("%q %v shows %d of its %d pixels", op.Str, ink, shown, whole))
			}
		}
	}
	// A button's label whole, on one line or two.
	for _, tg := range order {
		want := tg.Label
		if tg.caption != "" {
			want = tg.caption
		}
		if got := strings.TrimPrefix(strings.Join(labels[tg], " "), "* "); got != want {
			out = append(out, fmt.Sprintf("button %q is labelled %q", want, labels[tg]))
		}
	}
	return out
}

// textBox returns the box a line of text anchored at at must stay in: the
// smallest button holding the anchor (and the button), else the entry,
// the sketch or the diagram holding it, else the top bar or the screen's
// width.
func textBox(a *App, v *view, at render.Point) (render.Rect, *Target) {
	var own *Target
	for i := range v.targets {
		tg := &v.targets[i]
		if !tg.track && tg.Rect.Contains(at) && (own == nil || tg.Rect.W()*tg.Rect.H() < own.Rect.W()*own.Rect.H()) {
			own = tg
		}
	}
	if own != nil {
		return own.Rect, own
	}
	for _, r := range []render.Rect{v.entry, v.sketch, v.body} {
		if r.W() > 0 && r.Contains(at) {
			return r, nil
		}
	}
	if at.Y < a.BarBottom() {
		return rect(0, 0, a.w, a.BarBottom()), nil
	}
	return rect(0, 0, a.w, math.Inf(1)), nil
}

// inkBox returns the box the glyphs of a recorded line of text cover.
func inkBox(op recorder.Op) render.Rect {
	size := op.Style.Size
	if size == 0 {
		size = render.DefaultTextSize
	}
	var b render.Rect
	first := true
	for _, g := range render.PlaceGlyphs(op.At, op.Str, op.Style) {
		gb := render.GlyphBounds(g.Rune, size, op.Style.Bold)
		if !(gb.W() > 0) {
			continue
		}
		gb = render.Rect{Min: render.Point{X: g.At.X + gb.Min.X, Y: g.At.Y + gb.Min.Y}, Max: render.Point{X: g.At.X + gb.Max.X, Y: g.At.Y + gb.Max.Y}}
		if first {
			b, first = gb, false
			continue
		}
		b.Min.X, b.Min.Y = math.Min(b.Min.X, gb.Min.X), math.Min(b.Min.Y, gb.Min.Y)
		b.Max.X, b.Max.Y = math.Max(b.Max.X, gb.Max.X), math.Max(b.Max.Y, gb.Max.Y)
	}
	return b
}

// ownPixels counts the pixels a line of text covers well (half or more)
// when drawn alone.
func (pc *pixelCheck) ownPixels(op recorder.Op) int {
	k := ownKey{op.Str, op.Style.Size, op.Style.Bold}
	if n, ok := pc.own[k]; ok {
		return n
	}
	ink := inkBox(op)
	w, h := int(math.Ceil(ink.W()))+4, int(math.Ceil(ink.H()))+4
	if pc.scratch == nil || pc.scratch.Image().Bounds().Dx() < w || pc.scratch.Image().Bounds().Dy() < h {
		pc.scratch = raster.New(max(w, 1200), max(h, 120), 1)
	}
	c := pc.scratch
	c.Clear(color.RGBA{})
	st := op.Style
	st.Color = color.RGBA{A: 255}
	c.Text(render.Point{X: op.At.X - ink.Min.X + 2, Y: op.At.Y - ink.Min.Y + 2}, op.Str, st)
	n := 0
	img := c.Image()
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			if img.Pix[img.PixOffset(x, y)+3] >= 128 {
				n++
			}
		}
	}
	pc.own[k] = n
	return n
}

// shownPixels counts the pixels inside ink that differ clearly between
// the screen drawn with its text and without.
func shownPixels(with, without *raster.Canvas, ink render.Rect) int {
	a, b := with.Image(), without.Image()
	r := image.Rect(int(math.Floor(ink.Min.X)), int(math.Floor(ink.Min.Y)), int(math.Ceil(ink.Max.X)), int(math.Ceil(ink.Max.Y))).Intersect(a.Bounds())
	n := 0
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			i := a.PixOffset(x, y)
			d := 0
			for k := 0; k < 3; k++ {
				d += absInt(int(a.Pix[i+k]) - int(b.Pix[i+k]))
			}
			if d > 96 {
				n++
			}
		}
	}
	return n
}

// absInt is |x|.
func absInt(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// TestTourShots writes every screen of the tour (walkTour) at each of the
// pixel test's sizes, light and dark, as PNGs under $EVENBEAT_UI_SHOTS
// (tour-WxH-theme/NN-screen.png), for a look by eye; it does nothing
// without it. EVENBEAT_UI_SHOTS_SIZE=WxH takes one size only.
func TestTourShots(t *testing.T) {
	dir := os.Getenv("EVENBEAT_UI_SHOTS")
	if dir == "" {
		t.Skip("set EVENBEAT_UI_SHOTS to a directory to write the screens")
	}
	for _, sz := range tourSizes() {
		name := fmt.Sprintf("%gx%g", sz[0], sz[1])
		if only := os.Getenv("EVENBEAT_UI_SHOTS_SIZE"); only != "" && only != name {
			continue
		}
		for _, th := range []render.Theme{render.Light(), render.Dark()} {
			sub := filepath.Join(dir, "tour-"+name+"-"+themeName(th))
			if err := os.MkdirAll(sub, 0o755); err != nil {
				t.Fatal(err)
			}
			n := 0
			walkTour(t, sz[0], sz[1], th, func(screen string, a *App) {
				n++
				c := raster.New(int(a.w), int(a.h), 1)
				a.Draw(c)
				f, err := os.Create(filepath.Join(sub, fmt.Sprintf("%02d-%s.png", n, strings.NewReplacer(" ", "-", "/", "-", ",", "", "(", "", ")", "", ":", "").Replace(screen))))
				if err != nil {
					t.Fatal(err)
				}
				defer f.Close()
				if err := report.EncodePNG(f, c); err != nil {
					t.Fatal(err)
				}
			})
		}
	}
}

// TestPlanStepsLegible: on the tour's phones, upright and sideways, the
// plan screen's Steps view (as planned, with another priority, with a
// target lead, with a what-if) draws no text under 15 px, and the plan
// card's table gives each position's leads and cut-offs now and after as
// the plan's words do.
func TestPlanStepsLegible(t *testing.T) {
	for _, sz := range tourSizes() {
		walkTour(t, sz[0], sz[1], render.Light(), func(name string, a *App) {
			if a.Screen() != Plan || a.diagram != render.PlanDiagram {
				return
			}
			c := recorder.New(a.w, 1e5)
			a.Draw(c)
			if err := c.CheckTextSize(legibleSize); err != nil {
				t.Errorf("%gx%g %s: %v", sz[0], sz[1], name, err)
			}
		})
	}
}
