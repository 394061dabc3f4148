package session

import (
	"fmt"
	"math"

	"evenbeat/setting"
)

// Heard is the beat heard in one recording of the engine's exhaust (the
// app's microphone, analysed on the phone by package setting/listen): only
// the gaps between the beats are kept, never the sound.
type Heard struct {
	// Date is when it was recorded: "2026-12-03" or an RFC 3339 date and
	// time.
	Date string
	// Position is the reverser position the engine ran in: "full
	// forward", "full back", "mid gear" or one of the engine's notches.
	Position string
	// GapsDeg are the gaps between successive exhausts round one turn of
	// the wheel, in degrees of crank (they add up to 360), in the order
	// the exhausts come as the wheel turns, from the one heard as the first
	// cylinder's front exhaust: the order a beat circle of that position
	// lists its gaps.
	GapsDeg []float64
	// RevPerMin is the engine's mean speed over the recording.
	RevPerMin float64
}

// Bounds of the heard beats a session keeps.
const (
	// MaxHeard bounds the list of heard beats: a few recordings a round.
	MaxHeard = 200
	// MaxHeardGaps bounds the gaps of one: two beats a turn for each
	// cylinder an engine may have.
	MaxHeardGaps = 2 * setting.MaxCylinders
	// MaxRevPerMin bounds the speed an engine on blocks or rollers is
	// recorded at: anything faster is a typing slip.
	MaxRevPerMin = 6000
)

// heardTurnSlack is how far the gaps may add up from a turn (degrees): a
// file rounds each gap, never more.
const heardTurnSlack = 0.5

// heard reads one heard beat.
func (d *decoder) heard(n *node, path string) Heard {
	o := d.object(n, path, "a heard beat", "date", "position", "gaps_deg", "rev_per_min")
	var h Heard
	h.Date = o.date("the date it was recorded")
	h.Position = o.text("position", true, "the reverser position the engine ran in, such as \"full forward\"")
	if _, ok := d.info.notches[h.Position]; d.err == nil && !ok {
		d.fail(path+".position", "The notch %q is not one of this engine's; use one of %s.", h.Position, quoteList(d.info.notchOrder))
	}
	gaps := o.list("gaps_deg", true, "gaps between the beats in degrees of crank")
	if d.err == nil && (len(gaps) < 2 || len(gaps) > MaxHeardGaps) {
		d.fail(path+".gaps_deg", "The list of gaps holds %d; give from 2 to %d, one for each beat of a turn (4 for two cylinders, 6 for three).", len(gaps), MaxHeardGaps)
	}
	sum := 0.0
	for i, g := range gaps {
		v := d.number(g, fmt.Sprintf("%s.gaps_deg[%d]", path, i), "a gap between two beats in degrees of crank")
		if d.err == nil && !(v > 0 && v < 360) {
			d.fail(fmt.Sprintf("%s.gaps_deg[%d]", path, i), "A gap between two beats must be more than 0 and less than 360 degrees of crank, got %s.", fmtNum(v))
		}
		h.GapsDeg = append(h.GapsDeg, v)
		sum += v
	}
	if d.err == nil && math.Abs(sum-360) > heardTurnSlack {
		d.fail(path+".gaps_deg", "The gaps add up to %s degrees; the gaps of one turn add up to 360.", fmtNum(sum))
	}
	h.RevPerMin = o.positive("rev_per_min", true, "the engine's speed in revolutions a minute")
	if d.err == nil && h.RevPerMin > MaxRevPerMin {
		d.fail(path+".rev_per_min", "The speed %s rev/min is beyond an engine run on blocks or rollers; give it in revolutions a minute (at most %d).", fmtNum(h.RevPerMin), MaxRevPerMin)
	}
	return h
}

// heard writes one heard beat.
func (e *encoder) heard(h Heard, path string) *node {
	o := e.obj(path)
	o.str("date", h.Date)
	o.str("position", h.Position)
	gaps := make([]*node, len(h.GapsDeg))
	for i, g := range h.GapsDeg {
		gaps[i] = e.num(g, fmt.Sprintf("%s.gaps_deg[%d]", path, i))
	}
	o.put("gaps_deg", &node{kind: nodeArray, elems: gaps})
	o.num("rev_per_min", h.RevPerMin)
	return o.n
}
