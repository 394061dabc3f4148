package plan

import (
	"math"

	"evenbeat/setting"
)

// CutOffPerDieMM returns how much position i's mean cut-off (the mean of
// its two ends, % of stroke) grows for each mm its die block stands
// further from the middle of its expansion link, on the fitted gear. In a
// notch, each side's reversing linkage (its lifting link, its arm on the
// weighshaft) sets where its die stands in the link, and so its cut-off
// against the other sides'. ok is false in full gear and mid gear, on a
// gear without an expansion link, and where the events cannot be found
// on the fitted gear or the drawing's.
func (p *Plan) CutOffPerDieMM(i int) (float64, bool) {
	if p == nil || p.fit == nil || i < 0 || i >= len(p.Now) {
		return 0, false
	}
	ps := p.Now[i]
	r := setting.Reverser(ps.Reverser)
	if s, ok := p.fit.Model.cutPerDie(r, ps.Direction); ok {
		return s, true
	}
	// A port that never opens or never closes near the notch on the
	// fitted gear (its die far out of place): the drawing's figure, to
	// bring the die back toward where a cut-off can be had.
	return Model{Spec: p.fit.Model.Spec}.cutPerDie(r, ps.Direction)
}

// dieSpan is the reverser travel either side of a notch over which
// cutPerDie takes its differences.
const dieSpan = 0.02

// cutPerDie is CutOffPerDieMM at reverser r running dir: the change of
// the mean cut-off over the change of the die's distance from the link's
// middle (the mean over a turn) between r - dieSpan and r + dieSpan.
func (m Model) cutPerDie(r setting.Reverser, dir setting.Direction) (float64, bool) {
	x := float64(r)
	if math.Abs(x) > 1-2*dieSpan || math.Abs(x) < 0.1 || !(dir == setting.Forward || dir == setting.Backward) {
		return 0, false
	}
	g, err := m.Gear()
	if err != nil {
		return 0, false
	}
	pg, ok := g.(setting.PosedGear)
	middle, ends := linkJoints(m.Spec.Gear.Kind)
	if !ok || middle == "" {
		return 0, false
	}
	// The die's distance from the link's middle along the link, the mean
	// over a turn (the die slips in the link as it turns).
	along := func(r setting.Reverser) (float64, bool) {
		const n = 12
		s := 0.0
		for j := 0; j < n; j++ {
			pose, err := pg.Pose(m.Spec.Engine, 360*float64(j)/n, r)
			if err != nil {
				return 0, false
			}
			die, ok1 := pose.Joint("die block")
			mid, ok2 := pose.Joint(middle)
			a, ok3 := pose.Joint(ends[0])
			b, ok4 := pose.Joint(ends[1])
			l := a.Sub(b).Len()
			if !(ok1 && ok2 && ok3 && ok4) || !(l > 0) {
				return 0, false
			}
			s += die.Sub(mid).Dot(a.Sub(b).Scale(1/l)) / n
		}
		return s, true
	}
	revs := []setting.Reverser{setting.Reverser(x - dieSpan), setting.Reverser(x + dieSpan)}
	cs, err := gearCurves(m.Spec, m.Dev.vec(), revs, curveTrig, true)
	if err != nil {
		return 0, false
	}
	var cut, at [2]float64
	for k, c := range cs {
		set, err := setting.Events(m.Spec.Engine, m.Valve(), c.motion(), dir)
		if err != nil {
			return 0, false
		}
		for _, e := range []setting.EndEvents{set.Front, set.Back} {
			if e.NeverOpens || e.NeverCloses {
				return 0, false
			}
		}
		cut[k] = (set.Front.CutOff.StrokePercent + set.Back.CutOff.StrokePercent) / 2
		if at[k], ok = along(revs[k]); !ok {
			return 0, false
		}
	}
	here, ok := along(r)
	if !ok || at[1] == at[0] {
		return 0, false
	}
	// Away from the middle is along the link on the die's side of it.
	s := (cut[1] - cut[0]) / (at[1] - at[0])
	if here < 0 {
		s = -s
	}
	if !(s > 0) || math.IsInf(s, 0) {
		return 0, false
	}
	return s, true
}

// linkJoints names, in a gear's Pose, the joint at the middle of its
// expansion link and the two joints that give the link's direction; ""
// for a gear without a link.
func linkJoints(kind string) (middle string, ends [2]string) {
	switch kind {
	case setting.KindStephenson:
		return "link middle", [2]string{"forward rod pin", "backward rod pin"}
	case setting.KindWalschaerts:
		return "link trunnion", [2]string{"link top", "link bottom"}
	}
	return "", ends
}
