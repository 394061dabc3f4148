package main

import (
	"testing"

	"evenbeat/render"
	"evenbeat/render/recorder"
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
