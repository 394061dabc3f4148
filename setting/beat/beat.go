// Package beat looks at the engine as a whole: every cylinder's exhausts
// round one turn of the wheel (the beat the ear hears), the angle between
// the cranks as the dead-centre marks show it (quartering), and the work
// each cylinder end does per stroke from its events (a simple indicator
// diagram). A two-cylinder engine quartered at 90 degrees gives four
// exhausts a turn, a three-cylinder one at 120 degrees six; with equal
// events and true quartering they fall evenly, and a "limping" beat comes
// from unequal events or from cranks not truly quartered, which no valve
// adjustment cures (the primer's section 10).
//
// Conventions are package setting's: crank angles in degrees from the
// first cylinder's front dead centre in the forward running direction; a
// cylinder's CrankDeg is how far its crank leads the first one's.
//
// The package imports only the standard library, evenbeat/setting and
// evenbeat/setting/session.
package beat

import (
	"fmt"
	"math"
	"sort"

	"evenbeat/setting"
)

// Side is one cylinder's events in one position and running direction.
type Side struct {
	Name string
	// CrankDeg is how far this cylinder's crank leads the first one's,
	// degrees (setting.Cylinder.CrankAngle).
	CrankDeg float64
	Set      setting.EventSet
}

// Exhaust is one exhaust beat: the release of one cylinder end.
type Exhaust struct {
	// Deg is where it comes, as the first cylinder's crank angle, [0, 360).
	Deg      float64
	Cylinder string
	End      setting.CylinderEnd
}

// Label names the beat: "left front".
func (e Exhaust) Label() string { return e.Cylinder + " " + e.End.String() }

// Circle is the beat of a whole engine in one position and running
// direction: its exhausts in the order they come as the wheel turns that
// way, from the first cylinder's front end, and the gaps between them.
type Circle struct {
	Direction setting.Direction
	Exhausts  []Exhaust
	// Gaps[i] is the crank angle from Exhausts[i] to the next one (the
	// last to the first, a turn later), degrees; they sum to 360.
	Gaps []float64
	// Silent names the ends whose exhaust never opens (no beat).
	Silent []string
}

// NewCircle puts the exhausts of every side on one crank circle. All sides
// must run the same way. An end whose exhaust edge never opens gives no
// beat and is listed in Silent; one that never closes has no release
// either and is listed too.
func NewCircle(sides []Side) (Circle, error) {
	var c Circle
	if len(sides) == 0 {
		return c, fmt.Errorf("There are no cylinders to put on the beat circle.")
	}
	c.Direction = sides[0].Set.Direction
	for _, s := range sides {
		if s.Set.Direction != c.Direction {
			return c, fmt.Errorf("The %s cylinder's events run %s, the %s cylinder's %s: a beat circle takes one running direction.", s.Name, s.Set.Direction, sides[0].Name, c.Direction)
		}
		if !finite(s.CrankDeg) {
			return c, fmt.Errorf("The %s cylinder's crank angle is not a number.", s.Name)
		}
		for _, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
			ev := s.Set.End(end)
			if ev.ExhaustNeverOpens || ev.ExhaustNeverCloses {
				c.Silent = append(c.Silent, s.Name+" "+end.String())
				continue
			}
			c.Exhausts = append(c.Exhausts, Exhaust{Deg: wrap360(ev.Release.CrankDeg - s.CrankDeg), Cylinder: s.Name, End: end})
		}
	}
	if len(c.Exhausts) == 0 {
		return c, nil
	}
	// In the order the wheel brings them, from the first cylinder's front
	// exhaust (or the first there is).
	first := c.Exhausts[0].Deg
	ahead := func(d float64) float64 {
		if c.Direction == setting.Backward {
			return wrap360(first - d)
		}
		return wrap360(d - first)
	}
	sort.SliceStable(c.Exhausts, func(i, j int) bool { return ahead(c.Exhausts[i].Deg) < ahead(c.Exhausts[j].Deg) })
	n := len(c.Exhausts)
	c.Gaps = make([]float64, n)
	for i := range c.Exhausts {
		next := ahead(c.Exhausts[(i+1)%n].Deg)
		if i == n-1 {
			next += 360
		}
		c.Gaps[i] = next - ahead(c.Exhausts[i].Deg)
	}
	return c, nil
}

// Shares returns each gap as a percentage of an even beat (360 / beats).
func (c Circle) Shares() []float64 {
	out := make([]float64, len(c.Gaps))
	for i, g := range c.Gaps {
		out[i] = 100 * g * float64(len(c.Gaps)) / 360
	}
	return out
}

// Evenness returns the largest gap over the smallest: 1 for an even beat;
// +Inf never (0 when there are fewer than two beats, or two beats fall
// together).
func (c Circle) Evenness() float64 {
	if len(c.Gaps) < 2 {
		return 0
	}
	lo, hi := math.Inf(1), 0.0
	for _, g := range c.Gaps {
		lo, hi = math.Min(lo, g), math.Max(hi, g)
	}
	if !(lo > 1e-9) {
		return 0
	}
	return hi / lo
}

// deviations returns how far each exhaust comes from where the even beat
// laid on them best (least squares) puts it, degrees, positive late.
func (c Circle) deviations() []float64 {
	n := len(c.Exhausts)
	offs := make([]float64, n)
	at, mean := 0.0, 0.0
	for k := range offs {
		offs[k] = at - float64(k)*360/float64(n)
		at += c.Gaps[k]
		mean += offs[k] / float64(n)
	}
	for k := range offs {
		offs[k] -= mean
	}
	return offs
}

// Late returns the index of the exhaust that comes furthest from where an
// even beat would put it, and by how much (degrees, positive late): the
// even beat laid on the exhausts so that the sum of squared offsets is
// least. -1 when there are fewer than two beats.
func (c Circle) Late() (int, float64) {
	if len(c.Exhausts) < 2 {
		return -1, 0
	}
	worst, by := -1, 0.0
	for i, d := range c.deviations() {
		if worst < 0 || math.Abs(d) > math.Abs(by) {
			worst, by = i, d
		}
	}
	return worst, by
}

// Odd returns the exhaust that stands out from an even beat: the one
// Late names, when it is off by at least minDeg and by half as much again
// as any other (a beat limping in pairs, front ends against back, has no
// one odd exhaust). ok is false when none stands out.
func (c Circle) Odd(minDeg float64) (i int, by float64, ok bool) {
	i, by = c.Late()
	if i < 0 || math.Abs(by) < minDeg {
		return i, by, false
	}
	for k, d := range c.deviations() {
		if k != i && math.Abs(d)*1.5 > math.Abs(by) {
			return i, by, false
		}
	}
	return i, by, true
}

func wrap360(x float64) float64 {
	x = math.Mod(x, 360)
	if x < 0 {
		x += 360
	}
	if x >= 360 {
		x = 0
	}
	return x
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
