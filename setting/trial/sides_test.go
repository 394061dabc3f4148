package trial

import (
	"fmt"
	"maps"
	"math"
	"math/rand/v2"
	"testing"

	"evenbeat/setting"
	"evenbeat/setting/beat"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// Two sides of one engine, built alike but for the die's place in a
// running notch (one side's reversing linkage off by as much as sets the
// sides' cut-offs there 2 to 8 % of stroke apart, either way), each side read with its
// cut-offs at the crosshead and planned on its own: the whole engine says
// how far each die wants to move. Made on the true engines, each side's
// plan and die move bring the sides' cut-offs in that notch as near each
// other as the readings can tell (0.5 % of stroke, what the whole engine
// calls alike, or twice the standard deviation of the difference that the
// plans state, where that is more: about 1.4 % with cut-offs read at the
// crosshead), from several % apart, in at least 90 % of random link-gear
// engines of every size (the bench's own, with every build error it
// knows).
func TestSidesCutOffAlikeByTheDie(t *testing.T) {
	n := 100
	if testing.Short() {
		n = 12
	}
	tried, alike := 0, 0
	var before, first, second []float64
	noMoves := 0
	for i := 0; i < n; i++ {
		r := rand.New(rand.NewPCG(11, uint64(i)))
		kind := []string{setting.KindStephenson, setting.KindWalschaerts}[i%2]
		var right Engine
		var err error
		for try := 0; try < 20; try++ {
			if right, err = NewEngine(r, kind, Options{}); err == nil {
				break
			}
		}
		if err != nil {
			t.Fatal(err)
		}
		notch := -1
		for k, p := range right.Positions {
			if math.Abs(float64(p.Reverser)) < 1 && p.Dir == setting.Forward {
				notch = k
				break
			}
		}
		if notch < 0 {
			continue
		}
		pos := right.Positions[notch]
		// The left side: its die moved by dieMM through the reverser's
		// error in that notch, as much as sets the sides 2 to 8 % of
		// stroke apart there.
		perRev, err := dieTravel(right, pos.Reverser)
		if err != nil {
			t.Fatal(err)
		}
		perMM, err := cutPerDie(right, pos, perRev)
		if err != nil {
			t.Fatal(err)
		}
		dieMM := uniform(r, 2, 8) / perMM
		if r.Float64() < 0.5 {
			dieMM = -dieMM
		}
		left := right.clone()
		left.RevErr = maps.Clone(right.RevErr)
		left.RevErr[pos.Reverser] += dieMM / perRev
		// Each round: read both sides, plan each, make the steps and move
		// the dies as the whole engine says.
		rd := Round{Wild: -1, Tyre: true, CutOffs: true}
		sides := [2]Engine{right, left}
		var spread [3]float64 // after the first round's plans alone, after each round's moves
		tell := 0.0
		failed := false
		for round := 0; round < 2 && !failed; round++ {
			wp, plans, err := sidesPlanned(r, sides, rd, pos)
			if err != nil {
				t.Logf("engine %d (%s) round %d: %v", i, kind, round+1, err)
				failed = true
				break
			}
			moves, _, ok := wp.DieMoves()
			if !ok {
				// A port that never opens or never closes in the notch
				// on one side: the words ask for the dies' places to be
				// checked, and say no figure.
				t.Logf("engine %d (%s) round %d: no die moves in %s", i, kind, round+1, pos.Name)
				noMoves++
				failed = true
				break
			}
			// What the readings can tell of the sides' difference: twice
			// its standard deviation from each end's stated one.
			v := 0.0
			for k := range plans {
				pn := plans[k].Now[findPos(plans[k].Now, pos.Name)]
				v += (sq(pn.Front.CutOffSigmaPct) + sq(pn.Back.CutOffSigmaPct)) / 4
			}
			tell = math.Max(0.5, 2*math.Sqrt(v))
			var cut [2][2]float64 // [before the moves, after][side]
			for k, e := range sides {
				made, err := e.Made(plans[k].Steps)
				if err != nil {
					t.Fatal(err)
				}
				made.RevErr = maps.Clone(e.RevErr)
				if round == 0 {
					if cut[0][k], err = meanCut(made, pos); err != nil {
						t.Fatal(err)
					}
				}
				per, err := dieTravel(made, pos.Reverser)
				if err != nil {
					t.Fatal(err)
				}
				made.RevErr[pos.Reverser] += moves[k] / per
				if cut[1][k], err = meanCut(made, pos); err != nil {
					t.Fatal(err)
				}
				sides[k] = made
			}
			if round == 0 {
				spread[0] = math.Abs(cut[0][0] - cut[0][1])
			}
			spread[round+1] = math.Abs(cut[1][0] - cut[1][1])
		}
		tried++
		if failed {
			continue
		}
		first, second = append(first, spread[1]), append(second, spread[2])
		before = append(before, spread[0])
		if spread[2] <= tell {
			alike++
		} else {
			t.Logf("engine %d (%s %s, die %+.2f mm): cut-offs %.1f %% apart after the plans, %.1f %% after the first round's die moves, %.1f %% after the second's (the readings tell %.1f %%)", i, kind, right.Size, dieMM, spread[0], spread[1], spread[2], tell)
		}
	}
	t.Logf("no die moves (a port that never opens or closes in the notch) in %d engines", noMoves)
	t.Logf("sides alike after two rounds in %d of %d engines; apart after the plans alone: median %.1f %%; after the first round's die moves: median %.2f %%, worst %.2f %%; after the second's: median %.2f %%, worst %.2f %%", alike, tried, quantile(before, 0.5), quantile(first, 0.5), quantile(first, 1), quantile(second, 0.5), quantile(second, 1))
	if tried < n/2 || float64(alike) < 0.9*float64(tried) {
		t.Errorf("sides alike in %d of %d engines (want 90 %%)", alike, tried)
	}
}

// dieTravel returns how far (mm) the true die moves from the middle of
// its link per unit of the drawing's reverser at r, the mean over a turn.
func dieTravel(e Engine, r setting.Reverser) (float64, error) {
	g, err := e.Truth.Gear.Gear()
	if err != nil {
		return 0, err
	}
	pg := g.(setting.PosedGear)
	middle, ends := "link middle", [2]string{"forward rod pin", "backward rod pin"}
	if e.Truth.Gear.Kind == setting.KindWalschaerts {
		middle, ends = "link trunnion", [2]string{"link top", "link bottom"}
	}
	at := func(rt setting.Reverser) (float64, error) {
		s := 0.0
		for j := 0; j < 36; j++ {
			p, err := pg.Pose(e.Truth.Engine, 10*float64(j), rt)
			if err != nil {
				return 0, err
			}
			die, _ := p.Joint("die block")
			mid, _ := p.Joint(middle)
			a, _ := p.Joint(ends[0])
			b, _ := p.Joint(ends[1])
			s += die.Sub(mid).Dot(a.Sub(b).Scale(1/a.Sub(b).Len())) / 36
		}
		return s, nil
	}
	rt := r + setting.Reverser(e.RevErr[r])
	const h = 0.01
	hi, err := at(rt + h)
	if err != nil {
		return 0, err
	}
	lo, err := at(rt - h)
	if err != nil {
		return 0, err
	}
	here, err := at(rt)
	if err != nil {
		return 0, err
	}
	// Away from the middle: along the link on the die's side of it.
	return (hi - lo) / (2 * h) * math.Copysign(1, here), nil
}

// findPos returns the index of the position named name in ps (0 when
// none is).
func findPos(ps []plan.PositionState, name string) int {
	for i, p := range ps {
		if p.Notch == name {
			return i
		}
	}
	return 0
}

// sidesPlanned reads both sides (a session of two cylinders, the second
// a quarter behind), plans each for equal cut-offs and puts them together
// as the whole engine does; it returns position pos of the beat and the
// plans.
func sidesPlanned(r *rand.Rand, sides [2]Engine, rd Round, pos Position) (*beat.Position, []*plan.Plan, error) {
	s, err := sides[0].Session(r, rd)
	if err != nil {
		return nil, nil, err
	}
	sl, err := sides[1].Session(r, rd)
	if err != nil {
		return nil, nil, err
	}
	s.Engine.Cylinders = []setting.Cylinder{{Name: "right"}, {Name: "left", CrankAngle: -90}}
	c := sl.Cylinders[0]
	c.Name = "left"
	s.Cylinders = append(s.Cylinders, c)
	plans, err := beat.PlanAll(s, plan.Options{Priority: plan.EqualCutOffs, Unit: session.UnitMM})
	if err != nil {
		return nil, nil, err
	}
	ps, err := beat.FromPlans(s, plans, beat.DefaultSteam)
	if err != nil {
		return nil, nil, err
	}
	for k := range ps {
		if ps[k].Name == pos.Name && ps[k].Direction == setting.Forward {
			return &ps[k], plans, nil
		}
	}
	return nil, nil, fmt.Errorf("no %s on the beat circle", pos.Name)
}

// meanCut is the true mean cut-off of e's two ends in position p.
func meanCut(e Engine, p Position) (float64, error) {
	set, err := e.Events(p)
	return (cutPercent(set.Front) + cutPercent(set.Back)) / 2, err
}

// cutPerDie is the true mean cut-off's growth in position p per mm the
// die moves away from the middle of its link (perRev: dieTravel).
func cutPerDie(e Engine, p Position, perRev float64) (float64, error) {
	c0, err := meanCut(e, p)
	if err != nil {
		return 0, err
	}
	m := e.clone()
	m.RevErr = maps.Clone(e.RevErr)
	m.RevErr[p.Reverser] += 0.1 / perRev
	c1, err := meanCut(m, p)
	return (c1 - c0) / 0.1, err
}
