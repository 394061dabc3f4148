package beat

import (
	"math"
	"sort"
	"strconv"

	"evenbeat/setting"
)

// LeadingCranks says which crank leads running forward, as the engine's
// list of cylinders sets them (each one's crank angle ahead of the
// first's), each crank against the next in the order they come round:
// "Running forward, the right crank leads the left by 90 degrees." It is
// "" for fewer than two cylinders.
func LeadingCranks(cyls []setting.Cylinder) string {
	if len(cyls) < 2 {
		return ""
	}
	type crank struct {
		name string
		deg  float64 // ahead of the first, in (-180, 180]
		i    int     // in the engine's list: the order of cranks alike
	}
	cs := make([]crank, len(cyls))
	for i, c := range cyls {
		d := math.Mod(c.CrankAngle-cyls[0].CrankAngle, 360)
		switch {
		case d > 180:
			d -= 360
		case d <= -180:
			d += 360
		}
		cs[i] = crank{c.Name, d, i}
	}
	sort.Slice(cs, func(i, j int) bool { // sort.Slice: one sort routine in the app's build
		return cs[i].deg > cs[j].deg || cs[i].deg == cs[j].deg && cs[i].i < cs[j].i
	})
	by := func(a, b crank) string { return strconv.FormatFloat(a.deg-b.deg, 'f', -1, 64) + " degrees" }
	if len(cs) == 2 && cs[0].deg-cs[1].deg == 180 {
		return "The " + cyls[0].Name + " and " + cyls[1].Name + " cranks are 180 degrees apart: neither leads."
	}
	s := "Running forward, the " + cs[0].name + " crank leads the " + cs[1].name + " by " + by(cs[0], cs[1])
	for i := 1; i+1 < len(cs); i++ {
		s += ", the " + cs[i].name + " the " + cs[i+1].name + " by " + by(cs[i], cs[i+1])
	}
	return s + "."
}
