package beat

import (
	"evenbeat/setting"
	"evenbeat/setting/listen"
)

// Beats returns the circle's exhausts as the beats a recording is laid
// against (listen.Result.Match): each release in degrees of the first
// cylinder's crank counted in the direction of running, so that a circle
// of an engine running backward reads as the ear hears it. The command
// line's listen and the app's both take their predicted beats from here.
func (c Circle) Beats() []listen.Beat {
	out := make([]listen.Beat, len(c.Exhausts))
	for i, e := range c.Exhausts {
		deg := e.Deg
		if c.Direction == setting.Backward {
			deg = 360 - deg
		}
		out[i] = listen.Beat{Deg: deg, Cylinder: e.Cylinder, Front: e.End == setting.Front}
	}
	return out
}
