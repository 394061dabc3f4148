package beat

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"evenbeat/setting"
	"evenbeat/setting/session"
)

// WriteText writes the whole engine as the command line prints it, with
// lengths in unit: which crank leads (from the engine's cylinders, cyls);
// for each position, every exhaust in the order it comes
// with the gap to the next (today, and after the plans), the evenness,
// each end's work as a share of the mean, and the cylinders against one
// another (mean lead and cut-off of each, and what would match them);
// then the quartering the marks show, when they show it.
func WriteText(w io.Writer, cyls []setting.Cylinder, ps []Position, qs []Quartering, unit session.Unit) error {
	var b strings.Builder
	b.WriteString("The whole engine: exhausts round one turn of the wheel (gaps in degrees of crank; an even beat has them all alike)\n")
	if c := LeadingCranks(cyls); c != "" {
		b.WriteString(c + "\n")
	}
	for _, p := range ps {
		fmt.Fprintf(&b, "\n  %s, running %s: largest gap over smallest %.2f today", p.Name, p.Direction, p.Now.Evenness())
		if len(p.After.Gaps) == len(p.Now.Gaps) {
			fmt.Fprintf(&b, ", %.2f after the plans", p.After.Evenness())
		}
		b.WriteString("\n")
		for i, e := range p.Now.Exhausts {
			fmt.Fprintf(&b, "    %-16s then %5.1f", e.Label(), p.Now.Gaps[i])
			if i < len(p.After.Gaps) {
				fmt.Fprintf(&b, " -> %5.1f", p.After.Gaps[i])
			}
			b.WriteString("\n")
		}
		if late, by, ok := p.Now.Odd(1); ok {
			word := "late"
			if by < 0 {
				word, by = "early", -by
			}
			fmt.Fprintf(&b, "    The %s exhaust comes %.1f degrees %s against an even beat today.\n", p.Now.Exhausts[late].Label(), by, word)
		}
		if len(p.WorkNow) > 0 {
			b.WriteString("    work, % of the mean:")
			for k, wk := range p.WorkNow {
				fmt.Fprintf(&b, " %s %.0f", wk.Cylinder+" "+wk.End.String(), wk.Share)
				if k < len(p.WorkAfter) {
					fmt.Fprintf(&b, " -> %.0f", p.WorkAfter[k].Share)
				}
				if k < len(p.WorkNow)-1 {
					b.WriteString(";")
				}
			}
			b.WriteString("\n")
		}
		for _, s := range p.Now.Silent {
			fmt.Fprintf(&b, "    The %s exhaust never opens: no beat.\n", s)
		}
		writeSides(&b, p, unit)
	}
	for _, q := range qs {
		fmt.Fprintf(&b, "\n  Quartering: the marks put the %s crank %.1f degrees from the %s crank (drawing %.0f), %.1f +/- %.1f off.", q.Other, q.Measured, q.First, q.Design, q.Error, q.Uncertainty())
		if q.Told {
			b.WriteString(" More than the marks can tell: the cranks are not truly quartered. No valve adjustment cures that; it is work on the wheels for a fitter, with the usual precautions.\n")
		} else {
			b.WriteString(" Within what the marks can tell (both wheels' datums must be at the same angle).\n")
		}
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// Sides apart by more than these are named: a lead difference the gauge
// tells (0.02 mm on a small engine) and a cut-off difference of half a per
// cent of stroke (common practice, no source; the bench's tolerances).
const (
	sideLeadTolMM = 0.02
	sideCutTolPct = 0.5
)

// writeSides writes how the cylinders compare in position p: each one's
// mean lead and cut-off, and, where they differ by more than the
// readings tell, what sets each between the sides.
func writeSides(b *strings.Builder, p Position, unit session.Unit) {
	if len(p.Sides) < 2 {
		return
	}
	b.WriteString("    cylinder against cylinder (mean of both ends):")
	for k, sd := range p.Sides {
		fmt.Fprintf(b, " %s lead %s -> %s, cut-off %.1f -> %.1f %%", sd.Cylinder, session.FormatLength(sd.LeadNow, unit), session.FormatLength(sd.LeadAfter, unit), sd.CutOffNow, sd.CutOffAfter)
		if k < len(p.Sides)-1 {
			b.WriteString(";")
		}
	}
	b.WriteString("\n")
	for _, w := range SideWords(p, unit) {
		b.WriteString("    " + w + "\n")
	}
}

// SideWords says how the cylinders compare in p after the plans where
// they differ by more than the readings tell (their mean leads, their
// cut-offs), each with what would match them; nil when they are alike.
func SideWords(p Position, unit session.Unit) []string {
	if len(p.Sides) < 2 {
		return nil
	}
	loL, hiL, loC, hiC := p.Sides[0].LeadAfter, p.Sides[0].LeadAfter, p.Sides[0].CutOffAfter, p.Sides[0].CutOffAfter
	mean := 0.0
	for _, sd := range p.Sides {
		loL, hiL = min(loL, sd.LeadAfter), max(hiL, sd.LeadAfter)
		loC, hiC = min(loC, sd.CutOffAfter), max(hiC, sd.CutOffAfter)
		mean += sd.LeadAfter / float64(len(p.Sides))
	}
	var out []string
	if hiL-loL > sideLeadTolMM {
		// A target lead is a lead in full gear: the mean of this
		// position's leads is one only there.
		eg := " (the lead wanted in full gear)."
		if p.Name == session.FullForward || p.Name == session.FullBack {
			eg = ", e.g. " + session.FormatLength(mean, unit) + "."
		}
		out = append(out, "The cylinders' leads stay "+session.FormatLength(hiL-loL, unit)+" apart after the plans: only the eccentric sheaves (or return cranks) move a cylinder's mean lead; to match them, plan every cylinder with the same target lead"+eg)
	}
	if hiC-loC > sideCutTolPct {
		out = append(out, cutApartWords(p, hiC-loC, unit))
	}
	return out
}

// DieMoves returns how far each side's die wants to move in position p,
// in the order of p.Sides (mm, further from the middle of its link
// positive), for every side to cut off at the sides' mean after the
// plans, and that mean; ok is false unless every side's cut-off per mm of
// die is known (a notch of a link gear).
func (p Position) DieMoves() (moves []float64, mean float64, ok bool) {
	if len(p.Sides) < 2 {
		return nil, 0, false
	}
	for _, sd := range p.Sides {
		if !(sd.CutOffPerDieMM > 0) {
			return nil, 0, false
		}
		mean += sd.CutOffAfter / float64(len(p.Sides))
	}
	for _, sd := range p.Sides {
		moves = append(moves, (mean-sd.CutOffAfter)/sd.CutOffPerDieMM)
	}
	return moves, mean, true
}

// cutApartWords says that p's sides cut off apart by spread % after the
// plans, what sets that, and, where every side's cut-off per mm of die
// is known, how far each die wants to move to cut off alike at the
// sides' mean (DieMoves).
func cutApartWords(p Position, spread float64, unit session.Unit) string {
	pct := func(x float64) string { return strconv.FormatFloat(x, 'f', 1, 64) + " %" }
	var each []string
	for _, sd := range p.Sides {
		each = append(each, sd.Cylinder+" "+pct(sd.CutOffAfter))
	}
	w := "The cylinders cut off " + pct(spread) + " of stroke apart after the plans (" + strings.Join(each, ", ") + "). In a notch, each side's reversing linkage (lifting link, arm on the weighshaft, reach rod) sets where its die stands in the link; the plans do not change it."
	moves, mean, ok := p.DieMoves()
	if !ok {
		return w + " Check the die's place in each link with the reverser in that notch."
	}
	var say []string
	per := 0.0
	for i, d := range moves {
		sd := p.Sides[i]
		per += sd.CutOffPerDieMM / float64(len(moves))
		if math.Abs(d) < 0.05 {
			say = append(say, "leave the "+sd.Cylinder+" die where it is")
			continue
		}
		way := "further from the middle of its link"
		if d < 0 {
			way = "nearer to the middle of its link"
		}
		say = append(say, "move the "+sd.Cylinder+" die about "+session.FormatLength(math.Abs(d), unit)+" "+way)
	}
	// How much a cut-off moves for a step of die a setter can measure.
	step, stepWords := 1.0, "each mm"
	if unit == session.UnitInch {
		step, stepWords = 0.254, "each 0.01 in"
	}
	return w + " To cut off alike at " + pct(mean) + ": " + strings.Join(say, ", and ") + " (" + stepWords + " moves a cut-off about " + pct(per*step) + "). First measure each die's distance from the middle of its link with the reverser in this notch: change the side that differs from the drawing."
}

// Designed returns the beat of an engine as designed: every cylinder the
// spec lists, each the same design at its crank angle, in full forward,
// each running notch and full back (the way its gear runs there), with
// the work of every end. An engine of one cylinder gives nothing.
func Designed(spec setting.EngineSpec, st Steam) ([]Position, error) {
	if len(spec.Cylinders) < 2 {
		return nil, nil
	}
	g, err := spec.Gear.Gear()
	if err != nil {
		return nil, err
	}
	notches := append([]setting.Notch{{Name: "full forward", Reverser: 1}}, spec.Notches...)
	notches = append(notches, setting.Notch{Name: "full back", Reverser: -1})
	var out []Position
	for _, n := range notches {
		dir := setting.RunningDirections(n.Reverser)[0]
		set, err := setting.Events(spec.Engine, spec.Valve, func(th float64) (float64, error) { return g.Valve(spec.Engine, th, n.Reverser) }, dir)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", n.Name, err)
		}
		var sides []Side
		for _, c := range spec.Cylinders {
			sides = append(sides, Side{Name: c.Name, CrankDeg: c.CrankAngle - spec.Cylinders[0].CrankAngle, Set: set})
		}
		circ, err := NewCircle(sides)
		if err != nil {
			return nil, err
		}
		works, _ := st.Works(sides)
		out = append(out, Position{Name: n.Name, Direction: dir, Now: circ, WorkNow: works})
	}
	return out, nil
}
