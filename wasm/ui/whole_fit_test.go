package ui

import (
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting"
	"evenbeat/setting/session"
	"evenbeat/setting/trial"
)

// phoneSizes are the screens the whole engine must fit: phones from 320
// to 430 px wide, upright and sideways.
var phoneSizes = [][2]float64{{320, 568}, {360, 740}, {390, 844}, {430, 932}, {568, 320}, {844, 390}, {932, 430}}

// pellowmire is a session of an engine that is not the demo: the
// invented Pellowmire Stephenson two-cylinder drawing, each cylinder built
// by the bench with its own errors and read in a first round.
func pellowmire(t *testing.T) *session.Session {
	t.Helper()
	f, err := os.Open("../../testdata/engines/pellowmire-stephenson.json")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	spec, err := setting.DecodeEngineSpec(f)
	if err != nil {
		t.Fatal(err)
	}
	r := rand.New(rand.NewPCG(11, 5))
	adj := demoSession(t).Adjustments // a Stephenson gear's, as the demo has them
	var s *session.Session
	for _, c := range spec.Cylinders {
		e, err := trial.FromDrawing(r, spec, trial.Given{WheelMM: 120, ResMM: 0.01, GaugeSign: 1, Adjustments: adj})
		if err != nil {
			t.Fatal(err)
		}
		one, err := e.Session(r, trial.DeadCentresRound())
		if err != nil {
			t.Fatal(err)
		}
		one.Cylinders[0].Name = c.Name
		if s == nil {
			s = one
			continue
		}
		s.Cylinders = append(s.Cylinders, one.Cylinders[0])
	}
	s.Engine.Cylinders = spec.Cylinders
	s.Name = "Pellowmire"
	if len(spec.Notches) > 0 {
		s.Aims.RunningNotch = spec.Notches[0].Name
	}
	return s
}

// threeCylinders is the demo as a three-cylinder engine with cranks 120
// degrees apart, the middle cylinder read as the right.
func threeCylinders(t *testing.T) *session.Session {
	t.Helper()
	s := limpingDemo(t)
	s.Engine.Cylinders = []setting.Cylinder{{Name: "right"}, {Name: "middle", CrankAngle: 120}, {Name: "left", CrankAngle: 240}}
	mid := s.Cylinders[0]
	mid.Name = "middle"
	s.Cylinders = []session.Cylinder{s.Cylinders[0], mid, s.Cylinders[1]}
	return s
}

// TestWholeEngineFitsEveryPhone lays out the whole engine (with a beat
// heard) and listening's screens (the cautions, the recording) of the
// demo, a three-cylinder engine and an engine that is not the demo, on
// phones 320 to 430 px wide upright and sideways, scrolled from top to
// bottom: no text runs off the screen, a button's label is never cut
// short and fits its button, and the beat card's words stay inside the
// card. EVENBEAT_UI_SHOTS=DIR keeps each screen as a PNG.
func TestWholeEngineFitsEveryPhone(t *testing.T) {
	engines := map[string]*session.Session{"demo": limpingDemo(t), "three": threeCylinders(t), "pellowmire": pellowmire(t)}
	for name, s := range engines {
		pos := positionOf(t, s, s.Aims.RunningNotch)
		s.Heard = append(s.Heard, session.Heard{Date: "2026-12-01", Position: pos.Name, GapsDeg: pos.Now.Gaps, RevPerMin: 90})
		a, _, _, _ := wholeApp(t, s)
		if text, _ := flatText(a); !strings.Contains(text, "The gaps heard") {
			t.Fatalf("%s: the heard gaps are not shown:\n%s", name, text)
		}
		for _, size := range phoneSizes {
			a.Resize(size[0], size[1])
			fitsTheScreen(t, a, name+"-whole")
		}
		a.Resize(phoneW, phoneH)
		tap(t, a, ListenLabel)
		for _, size := range phoneSizes {
			a.Resize(size[0], size[1])
			fitsTheScreen(t, a, name+"-listen")
		}
		a.Resize(phoneW, phoneH)
		tap(t, a, StartLabel)
		a.MicOpened()
		a.Update()
		for _, size := range phoneSizes {
			a.Resize(size[0], size[1])
			fitsTheScreen(t, a, name+"-recording")
		}
	}
}

// fitsTheScreen checks the screen shown, scrolled from top to bottom, as
// TestWholeEngineFitsEveryPhone says.
func fitsTheScreen(t *testing.T, a *App, name string) {
	t.Helper()
	a.scroll = 0
	for step := 0; ; step++ {
		c := recorder.New(a.w, a.h)
		a.Draw(c)
		v := a.layout()
		where := name + " " + fixed(a.w, 0) + "x" + fixed(a.h, 0) + " scrolled " + fixed(a.scroll, 0)
		for _, op := range c.Ops() {
			if op.Kind != recorder.Text {
				continue
			}
			lo, hi := textSpan(op)
			if lo < -0.5 || hi > a.w+0.5 {
				t.Errorf("%s: %q runs off the screen (%.0f to %.0f)", where, op.Str, lo, hi)
			}
		}
		for _, tg := range v.targets {
			if tg.caption != "" {
				continue
			}
			found := false
			for _, op := range c.Ops() {
				if op.Kind != recorder.Text || (op.Str != tg.Label && op.Str != "* "+tg.Label) {
					continue
				}
				if lo, hi := textSpan(op); lo >= tg.Rect.Min.X && hi <= tg.Rect.Max.X {
					found = true
				}
			}
			if !found {
				t.Errorf("%s: the button %q is cut short or runs out of its box", where, tg.Label)
			}
		}
		if a.screen == Whole && v.body.W() > 0 {
			for _, op := range beatCardText(a, v.body) {
				if lo, hi := textSpan(op); lo < v.body.Min.X || hi > v.body.Max.X {
					t.Errorf("%s: the beat card's %q runs out of the card (%.0f to %.0f in %.0f to %.0f)", where, op.Str, lo, hi, v.body.Min.X, v.body.Max.X)
				}
			}
		}
		if dir := os.Getenv("EVENBEAT_UI_SHOTS"); dir != "" {
			writeShot(t, a, filepath.Join(dir, strings.ReplaceAll(where, " ", "-")+".png"))
		}
		before := a.scroll
		a.scroll += a.h - barH - 2*margin
		a.layout() // clamps the scroll
		if a.scroll <= before || step > 20 {
			break
		}
	}
	a.scroll = 0
}

// beatCardText returns the words the beat card draws in box.
func beatCardText(a *App, box render.Rect) []recorder.Op {
	pos, _ := a.wholeBeat().chosen()
	c := recorder.New(a.w, a.h)
	render.BeatCard(c, box, pos, a.heardGaps(pos), a.theme)
	var out []recorder.Op
	for _, op := range c.Ops() {
		if op.Kind == recorder.Text {
			out = append(out, op)
		}
	}
	return out
}

// textSpan is how far a text drawn by op reaches left and right.
func textSpan(op recorder.Op) (lo, hi float64) {
	w := render.TextWidth(op.Str, op.Style.Size, op.Style.Bold)
	switch op.Style.HAlign {
	case render.Center:
		return op.At.X - w/2, op.At.X + w/2
	case render.Right:
		return op.At.X - w, op.At.X
	}
	return op.At.X, op.At.X + w
}
