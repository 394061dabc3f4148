package ui

import (
	"fmt"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// portMarksStep is the heading of the port marks' fields.
const portMarksStep = "Port marks"

// marksAdvice is the sentence and the one-tap choice the port marks' step
// shows in a later round: keep an earlier round's marks when they still
// hold, or why they must be taken again. label is "" when there is nothing
// to offer.
func (a *App) marksAdvice() (say, label string) {
	s := a.Session()
	c := &s.Cylinders[a.cyl]
	if a.round == 0 || a.round >= len(c.Rounds) {
		return "", ""
	}
	if r := c.Rounds[a.round]; r.Laps != nil && r.Laps.Note == "" || r.PortMarks != nil && r.PortMarks.Note == "" { // its own, all taken
		return "", ""
	}
	from, moved, ok := c.KeptMarks(a.round)
	if !ok {
		if moved >= 0 {
			return fmt.Sprintf("Take the port marks again: the valve was moved on its spindle before round %d, and that moves the marks as the gauge sees them.", moved+1), ""
		}
		return "", ""
	}
	return fmt.Sprintf("The marks of round %d still hold: only the valve moved on its spindle (or a moved gauge) would shift them, and neither happened since. If the gauge was moved, take them again.", from+1),
		fmt.Sprintf("Keep the marks from round %d", from+1)
}

// keepMarks uses the earlier round's port marks for this round (the round
// is left without its own, as the file format reads it) and goes on past
// the port marks.
func (a *App) keepMarks() {
	s := a.Session()
	r := &s.Cylinders[a.cyl].Rounds[a.round]
	r.PortMarks, r.Laps = nil, nil
	a.save()
	for a.fi < len(a.fields) && a.fields[a.fi].Step == portMarksStep {
		a.fi++
	}
	a.fi--
	a.advance()
}

// formChoice is the button that asks the step shown in its other form:
// the steam edges as laps or as port marks (while the round has neither),
// a cut-off as a tyre mark or as crosshead travel (while it is not taken).
// label is "" when there is no choice.
func (a *App) formChoice() (label string, act func()) {
	f := a.fields[a.fi]
	s := a.Session()
	if a.cyl >= len(s.Cylinders) || a.round >= len(s.Cylinders[a.cyl].Rounds) {
		return "", nil
	}
	r := s.Cylinders[a.cyl].Rounds[a.round]
	switch {
	case f.Step == portMarksStep && r.PortMarks == nil && r.Laps == nil:
		label = "Laps instead"
		if a.lapsForm {
			label = "Port marks instead"
		}
		return label, func() {
			a.lapsForm = !a.lapsForm
			a.fields = a.roundFields(a.round)
			for a.fi > 0 && a.fields[min(a.fi, len(a.fields)-1)].Step != portMarksStep {
				a.fi--
			}
			a.setField(min(a.fi, len(a.fields)-1))
		}
	case strings.HasPrefix(f.Step, "Cut-off points"):
		if _, ok := f.get(s); ok {
			return "", nil
		}
		label = "As a tyre mark"
		if strings.HasSuffix(f.Key, "tyre_mm") {
			label = "As crosshead travel"
		}
		return label, func() {
			a.tyreCutOffs = !strings.HasSuffix(f.Key, "tyre_mm")
			a.fields = a.roundFields(a.round)
			a.setField(a.fi)
		}
	}
	return "", nil
}

// portMarkWords are the port marks' instructions for s's valve: which way
// the valve moves to crack each port to steam (back for the front port of
// a valve with steam outside, whose steam edges are its outer edges;
// forward with steam inside), how to move it, and how to see the edge.
func portMarkWords(s *session.Session) (front, back string) {
	v := s.Engine.Valve
	toFront, toBack := "back", "forward"
	edge := "its %s edge just uncovers the %s port's outer edge (line and line)"
	if v.Admission == setting.Internal {
		toFront, toBack = "forward", "back"
		edge = "its %s head's inner (steam) edge is just line and line with the %s port's edge"
	}
	see := "with the steam-chest cover off"
	if v.LinerDiameter > 0 {
		see = "seen with a light or a thin wire through the port passage"
	}
	move := "turn the wheels, or push the valve with its rod disconnected"
	front = fmt.Sprintf("Move the valve %s (%s) until "+edge+", %s, and type the dial gauge reading.", toFront, move, "front", "front", see)
	back = fmt.Sprintf("Now move the valve %s until "+edge+", and type the gauge reading.", toBack, "back", "back")
	return front, back
}

// deadCentreAt is where cylinder ci's dead centre at end is on the tyre,
// midway between its two marks (turning dir, or else the other way), in
// the display unit; "" while no pair is whole.
func deadCentreAt(s *session.Session, ci int, end session.End, dir session.Direction) string {
	var found *session.DeadCentre
	for i := range s.Cylinders[ci].DeadCentres {
		d := &s.Cylinders[ci].DeadCentres[i]
		if d.End != end || d.Note != "" || d.Scale != session.TyreMM {
			continue
		}
		if found == nil || d.Direction == dir {
			found = d
		}
	}
	if found == nil || s.Measuring.WheelDiameterMM <= 0 {
		return ""
	}
	mm := found.Mark(s.Measuring.WheelDiameterMM).Value
	if s.DisplayUnit == session.UnitInch {
		return session.FormatInches(mm) + " in"
	}
	return formatNumber(mm, false) + " mm"
}

// deadCentreFound says where the dead centre whose second mark was just
// typed (the field before the one shown) is on the tyre, to set the
// pointer to; "" otherwise.
func (a *App) deadCentreFound() string {
	if a.fi == 0 || a.fi > len(a.fields) {
		return ""
	}
	prev := a.fields[a.fi-1]
	if prev.open == nil || !strings.HasSuffix(prev.Key, "[1]") || prev.open(a.Session()) {
		return ""
	}
	if _, ok := prev.get(a.Session()); !ok {
		return ""
	}
	end, dir := session.Front, session.Forward
	if strings.Contains(prev.Key, "[back ") {
		end = session.Back
	}
	if strings.Contains(prev.Key, " backward]") {
		dir = session.Backward
	}
	at := deadCentreAt(a.Session(), a.cyl, end, dir)
	if at == "" {
		return ""
	}
	return fmt.Sprintf("%s dead centre found: %s round the tyre, midway between the two marks. Set the pointer there for its readings.", title(string(end)), at)
}
