package beat

import (
	"fmt"

	"evenbeat/setting"
	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// CrankAngles returns each of the session's cylinders' crank angle ahead
// of the first one's (degrees), from the engine's list of cylinders, by
// name. With one cylinder it is 0; a cylinder the engine does not list
// cannot be placed on the crank circle and is an error naming it.
func CrankAngles(s *session.Session) ([]float64, error) {
	out := make([]float64, len(s.Cylinders))
	if len(s.Cylinders) < 2 {
		return out, nil
	}
	design := map[string]float64{}
	for _, c := range s.Engine.Cylinders {
		design[c.Name] = c.CrankAngle
	}
	for i, c := range s.Cylinders {
		a, ok := design[c.Name]
		if !ok {
			return nil, &setting.Error{Field: fmt.Sprintf("cylinders[%d].name", i), Message: fmt.Sprintf("The engine does not list a %s cylinder, so its crank's angle to the others is not known: add it to the engine's cylinders with its crank angle.", c.Name)}
		}
		out[i] = a
	}
	first := out[0]
	for i := range out {
		out[i] -= first
	}
	return out, nil
}

// Position is the whole engine in one planned position: its beat, the
// work of every end, and each cylinder's mean lead and cut-off, today and
// after every cylinder's plan.
type Position struct {
	Name      string // the position in words, "full forward"
	Direction setting.Direction
	Now       Circle
	After     Circle
	// WorkNow and WorkAfter are every end's work, in the plans' order
	// (front then back of each); nil when the diagram cannot be drawn.
	WorkNow, WorkAfter []Work
	// Sides are each cylinder's mean of its two ends, in the plans'
	// order: how the cylinders compare with one another.
	Sides []SideMeans
}

// SideMeans is one cylinder's mean lead (mm) and mean cut-off (% of
// stroke) over its two ends, today and after its plan.
type SideMeans struct {
	Cylinder               string
	LeadNow, LeadAfter     float64
	CutOffNow, CutOffAfter float64
	// CutOffPerDieMM is how much the mean cut-off grows for each mm the
	// die stands further from the middle of its link in this notch
	// (plan.Plan.CutOffPerDieMM); 0 where that does not apply.
	CutOffPerDieMM float64
}

// meansOf returns the means of a cylinder's two ends in set.
func meansOf(set setting.EventSet) (lead, cut float64) {
	return (set.Front.Lead + set.Back.Lead) / 2, (set.Front.CutOff.StrokePercent + set.Back.CutOff.StrokePercent) / 2
}

// FromPlans puts the plans of every cylinder of a session (plans[i] for
// s.Cylinders[i], each made by plan.Make or FromFit, so that they carry
// their event sets) together: the beat and the work in each position
// they all plan. A position some plan does not cover is left out.
func FromPlans(s *session.Session, plans []*plan.Plan, st Steam) ([]Position, error) {
	if len(plans) != len(s.Cylinders) || len(plans) == 0 {
		return nil, fmt.Errorf("There are %d plans for %d cylinders.", len(plans), len(s.Cylinders))
	}
	angles, err := CrankAngles(s)
	if err != nil {
		return nil, err
	}
	type sets struct{ now, after []setting.EventSet }
	all := make([]sets, len(plans))
	for i, p := range plans {
		if p == nil {
			return nil, fmt.Errorf("The %s cylinder has no plan.", s.Cylinders[i].Name)
		}
		all[i].now, all[i].after = p.EventSets()
		if len(all[i].now) != len(p.Now) {
			return nil, fmt.Errorf("The %s cylinder's plan carries no events to put on the beat circle.", s.Cylinders[i].Name)
		}
	}
	var out []Position
	for _, ps := range plans[0].Now {
		pos := Position{Name: ps.Notch, Direction: ps.Direction}
		var now, after []Side
		for i, p := range plans {
			j := findPosition(p.Now, ps)
			if j < 0 {
				now = nil
				break
			}
			name := s.Cylinders[i].Name
			now = append(now, Side{Name: name, CrankDeg: angles[i], Set: all[i].now[j]})
			a := all[i].now[j] // no steps: after is as now
			if all[i].after != nil {
				a = all[i].after[j]
			}
			after = append(after, Side{Name: name, CrankDeg: angles[i], Set: a})
			var sm SideMeans
			sm.Cylinder = name
			sm.LeadNow, sm.CutOffNow = meansOf(all[i].now[j])
			sm.LeadAfter, sm.CutOffAfter = meansOf(a)
			sm.CutOffPerDieMM, _ = p.CutOffPerDieMM(j)
			pos.Sides = append(pos.Sides, sm)
		}
		if now == nil {
			pos.Sides = nil
			continue
		}
		if pos.Now, err = NewCircle(now); err != nil {
			return nil, err
		}
		if pos.After, err = NewCircle(after); err != nil {
			return nil, err
		}
		pos.WorkNow, _ = st.Works(now)
		pos.WorkAfter, _ = st.Works(after)
		out = append(out, pos)
	}
	return out, nil
}

// findPosition returns the index in list of the position like ps (same
// notch and direction), or -1.
func findPosition(list []plan.PositionState, ps plan.PositionState) int {
	for i, q := range list {
		if q.Notch == ps.Notch && q.Direction == ps.Direction {
			return i
		}
	}
	return -1
}

// PlanAll plans every cylinder of s with opt (its Cylinder set to each in
// turn), for FromPlans. A cylinder without readings, or whose plan cannot
// be made, is an error naming it: the whole engine's beat needs them all.
func PlanAll(s *session.Session, opt plan.Options) ([]*plan.Plan, error) {
	plans := make([]*plan.Plan, len(s.Cylinders))
	for i, c := range s.Cylinders {
		field := fmt.Sprintf("cylinders[%d]", i)
		if len(c.Rounds) == 0 {
			return nil, &setting.Error{Field: field, Message: "The " + c.Name + " cylinder has no readings yet, so its exhausts cannot be placed on the beat circle; take a round of readings on every cylinder first."}
		}
		o := opt
		o.Cylinder = i
		p, err := plan.Make(s, o)
		if err != nil {
			return nil, &setting.Error{Field: field, Message: "The " + c.Name + " cylinder's exhausts cannot be placed on the beat circle: " + err.Error()}
		}
		plans[i] = p
	}
	return plans, nil
}

// Whole plans every cylinder of s with opt (PlanAll) and puts the plans
// together (FromPlans): the whole engine's beat and work in every
// position they all plan.
func Whole(s *session.Session, opt plan.Options, st Steam) ([]Position, error) {
	plans, err := PlanAll(s, opt)
	if err != nil {
		return nil, err
	}
	return FromPlans(s, plans, st)
}
