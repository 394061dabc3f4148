package session

// HasMarks reports whether a round gives its own steam edges: port marks
// or laps.
func (r Round) HasMarks() bool { return r.PortMarks != nil || r.Laps != nil }

// KeptMarks finds the earlier round whose port marks (or laps) still hold
// in round ri: the latest earlier round with marks, as long as the valve
// has not been moved on its spindle since. Round ri's own marks are not
// looked at; a round with its own uses them.
//
// The reason: the gauge reads the valve spindle, and the marks are the
// gauge readings where each steam edge cracks. Turning an eccentric or
// changing a rod's length moves the spindle and the valve together, so the
// edges stay where the gauge saw them; moving the valve on its spindle
// moves the edges against the spindle, so the marks taken before no longer
// hold (common practice, no source; the file format's rule for rounds
// without marks, setting/session/format.md, rounds[]). A gauge moved or re-set
// also ends them, but the file does not record that; the setter is asked.
//
// moved is the round (counting from 0) whose change of the valve on its
// spindle ended the search, or -1. A round out of range has no kept marks.
func (c *Cylinder) KeptMarks(ri int) (from, moved int, ok bool) {
	if c == nil || ri <= 0 || ri >= len(c.Rounds) {
		return 0, -1, false
	}
	for k := ri; k > 0; k-- {
		for _, ch := range c.Rounds[k].AdjustmentsBefore {
			if ch.Kind == ValveOnSpindle {
				return 0, k, false
			}
		}
		if c.Rounds[k-1].HasMarks() {
			return k - 1, -1, true
		}
	}
	return 0, -1, false
}

// MarksFor returns the round whose steam edges hold in round ri: ri itself
// when it has its own port marks or laps, else the earlier round
// KeptMarks finds.
func (c *Cylinder) MarksFor(ri int) (from int, ok bool) {
	if c == nil || ri < 0 || ri >= len(c.Rounds) {
		return 0, false
	}
	if c.Rounds[ri].HasMarks() {
		return ri, true
	}
	from, _, ok = c.KeptMarks(ri)
	return from, ok
}
