package main

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
	"evenbeat/setting"
)

func TestCautionsThenDiagram(t *testing.T) {
	a := newApp(demoEngine(), render.Light(), false)
	if a.screen != screenCautions {
		t.Fatalf("first run shows %v; want the cautions", a.screen)
	}
	a.Resize(390, 844)
	want := render.Cautions(measure{390, 844}, a.content(), a.theme)
	if a.ack != want || a.ack.W() <= 0 || a.ack.H() < 48 {
		t.Fatalf("ack button %+v; want render's %+v, at least 48 units tall", a.ack, want)
	}
	a.dirty = false
	if a.Handle(intent{Kind: intentTap, At: render.Point{X: 5, Y: 5}}) || a.screen != screenCautions || a.dirty {
		t.Fatal("a tap outside the button acknowledged the cautions")
	}
	mid := render.Point{X: (a.ack.Min.X + a.ack.Max.X) / 2, Y: (a.ack.Min.Y + a.ack.Max.Y) / 2}
	if !a.Handle(intent{Kind: intentTap, At: mid}) {
		t.Fatal("a tap on the button did not acknowledge")
	}
	if a.screen != screenDiagram || !a.dirty {
		t.Fatalf("after the tap: screen %v, dirty %v; want the diagram, to be drawn", a.screen, a.dirty)
	}
	if a.Handle(intent{Kind: intentTap, At: mid}) {
		t.Error("a tap on the diagram acknowledged again")
	}
}

func TestAcknowledgedStartsOnDiagram(t *testing.T) {
	a := newApp(demoEngine(), render.Dark(), true)
	if a.screen != screenDiagram || a.screen.String() != "diagram" {
		t.Fatalf("returning user sees %v; want the diagram", a.screen)
	}
}

func TestDrawScreens(t *testing.T) {
	for _, acked := range []bool{false, true} {
		a := newApp(demoEngine(), render.Light(), acked)
		a.Resize(390, 844)
		rec := recorder.New(390, 844)
		a.Draw(rec)
		ops := rec.Ops()
		if len(ops) < 10 {
			t.Fatalf("screen %v drew only %d calls", a.screen, len(ops))
		}
		if ops[0].Kind != recorder.Fill || ops[0].Fill.Color != a.theme.Background {
			t.Errorf("screen %v does not start by filling the page colour: %+v", a.screen, ops[0])
		}
		titles := map[screen]string{screenCautions: render.CautionsTitle, screenDiagram: "Piston position against crank angle"}
		found := false
		for _, op := range ops {
			found = found || (op.Kind == recorder.Text && op.Str == titles[a.screen])
		}
		if !found {
			t.Errorf("screen %v has no title %q", a.screen, titles[a.screen])
		}
	}
}

// TestCautionsScrollOnSmallPhone: on a 320x568 screen the card does not fit
// even at its smallest text, so it takes the height it needs and scrolls;
// the button is hit where it shows.
func TestCautionsScrollOnSmallPhone(t *testing.T) {
	a := newApp(demoEngine(), render.Light(), false)
	a.Resize(320, 568)
	max := a.maxScroll()
	if max <= 0 {
		t.Fatalf("maxScroll %v on a 320x568 screen; the card does not fit there and must scroll", max)
	}
	if l := render.LayoutCautions(a.card, setting.Cautions()); !l.Fits {
		t.Fatalf("the scrolling card %+v still does not fit its text", a.card)
	}
	a.Handle(intent{Kind: intentScroll, Delta: render.Point{Y: 40}})
	if a.scroll != 0 {
		t.Errorf("scrolled to %v by pulling down at the top; want 0", a.scroll)
	}
	a.Handle(intent{Kind: intentScroll, Delta: render.Point{Y: -1000}})
	if a.scroll != max {
		t.Fatalf("scrolled to %v by a long push up; want the end, %v", a.scroll, max)
	}
	b := a.AckButton()
	if b.Max.Y > a.h || b.Min.Y < 0 {
		t.Fatalf("scrolled to the end, the button %+v is not fully on the %v-high screen", b, a.h)
	}
	mid := render.Point{X: (b.Min.X + b.Max.X) / 2, Y: (b.Min.Y + b.Max.Y) / 2}
	if !a.Handle(intent{Kind: intentTap, At: mid}) {
		t.Error("a tap on the scrolled button did not acknowledge")
	}

	// What is drawn is moved by the scroll: the card's top edge goes up.
	rec := recorder.New(320, 568)
	c := newApp(demoEngine(), render.Light(), false)
	c.Resize(320, 568)
	c.Handle(intent{Kind: intentScroll, Delta: render.Point{Y: -10}})
	c.Draw(rec)
	top := 1e9
	for _, op := range rec.Ops()[1:] { // after the page fill
		for _, seg := range op.Path {
			if seg.Kind != render.Close {
				top = min(top, seg.Pts[0].Y)
			}
		}
	}
	if top > margin-10+0.5 || top < margin-10-0.5 {
		t.Errorf("scrolled by 10, the card's top is at %v; want %v", top, margin-10)
	}
}

func TestResizeLaysOutAgain(t *testing.T) {
	a := newApp(demoEngine(), render.Light(), false)
	a.Resize(320, 568)
	a.Handle(intent{Kind: intentScroll, Delta: render.Point{Y: -1000}})
	a.dirty = false
	a.Resize(390, 844) // turned or resized: now it fits
	if a.scroll != 0 || !a.dirty || a.maxScroll() != 0 {
		t.Errorf("after growing: scroll %v, dirty %v, maxScroll %v; want 0, true, 0", a.scroll, a.dirty, a.maxScroll())
	}
}

func TestEnterAcknowledges(t *testing.T) {
	a := newApp(demoEngine(), render.Light(), false)
	a.Resize(390, 844)
	if !a.Handle(intent{Kind: intentConfirm}) || a.screen != screenDiagram {
		t.Errorf("Enter on the cautions: screen %v; want the diagram", a.screen)
	}
	if a.Handle(intent{Kind: intentConfirm}) {
		t.Error("Enter on the diagram acknowledged again")
	}
}
