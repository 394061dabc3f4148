package main

import (
	"fmt"
	"image"
	"image/color"
	"math"
	"net/http"
	"testing"
	"time"

	"evenbeat/render"
	"evenbeat/setting"
)

// capture is a render.Canvas that only notes where things go, so a test
// knows where to look in a screenshot: the same layout code the app runs,
// computed natively.
type capture struct {
	w, h    float64
	strokes map[color.RGBA]render.Rect // bounding box of all strokes per colour
	texts   []capturedText
}

type capturedText struct {
	at   render.Point
	text string
	s    render.TextStyle
}

func (c *capture) Size() (w, h float64)               { return c.w, c.h }
func (c *capture) Fill(render.Path, render.FillStyle) {}
func (c *capture) Text(at render.Point, text string, s render.TextStyle) {
	c.texts = append(c.texts, capturedText{at, text, s})
}
func (c *capture) Stroke(p render.Path, s render.LineStyle) {
	if c.strokes == nil {
		c.strokes = map[color.RGBA]render.Rect{}
	}
	r, ok := c.strokes[s.Color]
	if !ok {
		r = render.Rect{Min: render.Point{X: math.Inf(1), Y: math.Inf(1)}, Max: render.Point{X: math.Inf(-1), Y: math.Inf(-1)}}
	}
	for _, seg := range p {
		n := map[render.SegKind]int{render.MoveTo: 1, render.LineTo: 1, render.CubeTo: 3}[seg.Kind]
		for _, pt := range seg.Pts[:n] {
			r.Min.X, r.Min.Y = math.Min(r.Min.X, pt.X), math.Min(r.Min.Y, pt.Y)
			r.Max.X, r.Max.Y = math.Max(r.Max.X, pt.X), math.Max(r.Max.Y, pt.Y)
		}
	}
	c.strokes[s.Color] = r
}

// devicePx turns a logical rectangle into the screenshot's pixels.
func devicePx(r render.Rect) image.Rectangle {
	k := float64(phoneScale)
	return image.Rect(int(math.Floor(r.Min.X*k)), int(math.Floor(r.Min.Y*k)), int(math.Ceil(r.Max.X*k)), int(math.Ceil(r.Max.Y*k)))
}

// browserDemoEngine is the engine the app draws: the crank and cylinder of
// setting's invented demo engine.
func browserDemoEngine() setting.Engine {
	return setting.DemoStephenson().Engine
}

// checkDiagram fails t unless shot shows the piston diagram.
func checkDiagram(t *testing.T, shot image.Image, box render.Rect, th render.Theme) {
	t.Helper()
	for _, p := range diagramProblems(t, shot, box, th) {
		t.Error(p)
	}
}

// diagramProblems lists what is wrong with shot as a picture of the piston
// diagram: the theme's curve colour must run along the curve, the card and
// page colours must cover most of the screen, and dark title text must sit
// where the layout puts the title.
func diagramProblems(t *testing.T, shot image.Image, box render.Rect, th render.Theme) []string {
	t.Helper()
	var problems []string
	c := &capture{w: phoneW, h: phoneH}
	render.PistonCurve(c, browserDemoEngine(), box, th)
	curve, ok := c.strokes[th.Accent]
	if !ok {
		t.Fatal("the piston diagram strokes nothing in the accent colour; the check needs updating")
	}
	// Along the curve's bounding box: a 3-unit line at 3 px per unit over
	// some 300 units of curve is thousands of pixels; a missing curve is 0.
	if n := count(shot, devicePx(curve), th.Accent, 24); n < 2000 {
		problems = append(problems, fmt.Sprintf("curve colour %v: %d pixels inside the plot %v; want at least 2000 (no curve drawn?)", th.Accent, n, devicePx(curve)))
	}
	all := shot.Bounds()
	ground := count(shot, all, th.Surface, 6) + count(shot, all, th.Background, 6)
	if frac := float64(ground) / float64(all.Dx()*all.Dy()); frac < 0.6 {
		problems = append(problems, fmt.Sprintf("card and page colours cover %.0f %% of the screen; want at least 60 %% (blank or wrong theme?)", 100*frac))
	}
	var title render.Rect
	found := false
	for _, tx := range c.texts {
		if tx.s.Bold && tx.s.Size == render.TitleSize {
			title, found = render.TextBox(tx.at, tx.text, tx.s), true
			break
		}
	}
	if !found {
		t.Fatal("the piston diagram draws no bold title; the check needs updating")
	}
	if n := count(shot, devicePx(title), th.Ink, 40); n < 300 {
		problems = append(problems, fmt.Sprintf("title area %v: %d ink pixels; want at least 300 (no title text?)", devicePx(title), n))
	}
	return problems
}

// TestPhone runs the app in Chromium as a 3x phone with touch: the cautions
// card comes first; a tap on its button shows the diagram and stores the
// acknowledgement; the browser is then killed outright and started again on
// the same profile, and must go straight to the diagram (the entry was on
// disk when the app called it saved); finally, with the server stopped, a
// reload still starts the app from the service worker's cache.
func TestPhone(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test; drop -short to run it")
	}
	needChromium(t)
	m := startServer(t)
	profile := t.TempDir()
	ctx, _ := newBrowser(t, profile, noTierUp())

	within(t, ctx, 90*time.Second, "opening "+m.URL, chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "cautions"`)
	if got := eval[float64](t, ctx, "window.devicePixelRatio"); got != phoneScale {
		t.Fatalf("devicePixelRatio = %v; want %d", got, phoneScale)
	}
	th := render.Light()
	if eval[string](t, ctx, "window.evenbeatTheme") == "dark" {
		th = render.Dark()
	}
	type rect struct{ X, Y, W, H float64 }
	ack := eval[rect](t, ctx, "window.evenbeatAck")
	box := eval[rect](t, ctx, "window.evenbeatBox")
	content := render.Rect{Min: render.Point{X: box.X, Y: box.Y}, Max: render.Point{X: box.X + box.W, Y: box.Y + box.H}}
	// The button the app hit-tests is the one render lays out natively.
	want := render.Cautions(&capture{w: phoneW, h: phoneH}, content, th)
	if math.Abs(want.Min.X-ack.X) > 0.01 || math.Abs(want.Min.Y-ack.Y) > 0.01 || math.Abs(want.W()-ack.W) > 0.01 || math.Abs(want.H()-ack.H) > 0.01 {
		t.Fatalf("app's button %+v differs from render's layout %+v", ack, want)
	}
	shot := screenshot(t, ctx, "phone-cautions")
	// The diagram check must be able to fail: the cautions card is not
	// the diagram.
	if len(diagramProblems(t, shot, content, th)) == 0 {
		t.Error("the diagram check passes on the cautions card; it cannot tell a missing diagram")
	}
	if n := count(shot, devicePx(want), th.Accent, 6); n < int(want.W()*want.H()*phoneScale*phoneScale/2) {
		t.Errorf("the acknowledgement button %v shows only %d accent pixels", devicePx(want), n)
	}

	// A real tap: finger down, held longer than a frame, finger up.
	tap(t, ctx, ack.X+ack.W/2, ack.Y+ack.H/2, 200*time.Millisecond)
	waitFor(t, ctx, 30*time.Second, `window.evenbeatDrawn === "diagram" && window.evenbeatAckSaved === true`)

	// Saved means on disk: kill the browser at once and start it again.
	killBrowser(t, ctx)
	ctx, _ = newBrowser(t, profile, noTierUp())
	within(t, ctx, 90*time.Second, "opening "+m.URL+" after the kill", chromedpNavigate(m.URL))
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "diagram"`)
	if first := eval[string](t, ctx, "window.evenbeatFirstScreen"); first != "diagram" {
		t.Errorf("after the kill the first frame showed %q; want the diagram (acknowledgement lost?)", first)
	}
	checkDiagram(t, screenshot(t, ctx, "phone-diagram"), content, th)

	waitFor(t, ctx, 90*time.Second, `navigator.serviceWorker.controller !== null && navigator.serviceWorker.controller.state === "activated"`)

	// Cut the network: stop the server, make sure it is gone, reload.
	if err := m.Close(); err != nil {
		t.Fatal(err)
	}
	if res, err := http.Get(m.URL); err == nil {
		res.Body.Close()
		t.Fatal("the server still answers after Close")
	}
	within(t, ctx, 90*time.Second, "reloading with the server stopped", chromedpReload())
	waitFor(t, ctx, 90*time.Second, `window.evenbeatDrawn === "diagram"`)
	if first := eval[string](t, ctx, "window.evenbeatFirstScreen"); first != "diagram" {
		t.Errorf("offline, the first frame showed %q; want the diagram", first)
	}
	checkDiagram(t, screenshot(t, ctx, "phone-offline-diagram"), content, th)
}
