package trial

import (
	"fmt"
	"os"
	"strconv"
	"strings"
	"testing"

	"evenbeat/setting/plan"
	"evenbeat/setting/session"
)

// TestDiagnose prints, for EVENBEAT_DIAG="index:priority" (seed
// EVENBEAT_TRIAL_SEED, default 1), the plan's view of each position's
// difference today and after against the true engine's.
func TestDiagnose(t *testing.T) {
	spec := os.Getenv("EVENBEAT_DIAG")
	if spec == "" {
		t.Skip("EVENBEAT_DIAG not set")
	}
	seed := uint64(1)
	if v, err := strconv.ParseUint(os.Getenv("EVENBEAT_TRIAL_SEED"), 10, 64); err == nil {
		seed = v
	}
	for _, one := range strings.Split(spec, ",") {
		f := strings.Split(one, ":")
		i, _ := strconv.Atoi(f[0])
		prio := plan.Priority(f[1])
		e, rd, s := benchRound(t, seed, i, false)
		c := Case{Seed: seed, Index: i, Engine: e, Round: rd}
		res, err := e.Try(s, prio)
		if err != nil {
			t.Fatal(err)
		}
		c.Results = []Result{res}
		var b strings.Builder
		c.Describe(&b, prio)
		p, err := plan.Make(s, plan.Options{Priority: prio, Unit: session.UnitMM})
		if err != nil {
			t.Logf("%s\nplan error: %v", b.String(), err)
			continue
		}
		d0, _ := e.diffs()
		ks := knobsOf(e.Adjustments)
		tr, _ := e.with(ks, res.RoundedAmounts)
		d1, _ := tr.diffs()
		ti, _ := e.with(ks, res.IdealAmounts)
		d2, _ := ti.diffs()
		fmt.Fprintf(&b, "  adjustments:")
		for _, a := range e.Adjustments {
			fmt.Fprintf(&b, " %s/%s[%g,%g]", a.Kind, a.Eccentric, a.Min, a.Max)
		}
		fmt.Fprintf(&b, "\n  rounded %v\n", fmtAmounts(res.RoundedAmounts))
		fmt.Fprintf(&b, "  %-14s %-8s | lead: plan now  true now (sd) | plan after true after(rnd) true after(ideal) | cut: plan now true now | plan after true after\n", "pos", "dir")
		for k, pos := range e.Positions {
			n, a := p.Now[k], p.After[k]
			fmt.Fprintf(&b, "  %-14s %-8v | %+.4f %+.4f (%.4f/%.4f) | %+.4f %+.4f %+.4f | %+.2f %+.2f | %+.2f %+.2f %+.2f\n", pos.Name, pos.Dir,
				n.Front.LeadMM-n.Back.LeadMM, d0.Lead[k], n.Front.LeadSigmaMM, n.Back.LeadSigmaMM,
				a.Front.LeadMM-a.Back.LeadMM, d1.Lead[k], d2.Lead[k],
				n.Front.CutOffPercent-n.Back.CutOffPercent, d0.Cut[k],
				a.Front.CutOffPercent-a.Back.CutOffPercent, d1.Cut[k], d2.Cut[k])
		}
		// True effect of each knob, per unit, on each position's lead and cut difference.
		for j, kb := range ks {
			u := make([]float64, len(ks))
			h := 0.1
			u[j] = h
			tu, err := e.with(ks, u)
			if err != nil {
				continue
			}
			du, _ := tu.diffs()
			fmt.Fprintf(&b, "  true effect of %s/%s per unit:", kb.kind, kb.ecc)
			for k := range e.Positions {
				fmt.Fprintf(&b, " L%+.3f C%+.2f", (du.Lead[k]-d0.Lead[k])/h, (du.Cut[k]-d0.Cut[k])/h)
			}
			b.WriteString("\n")
		}
		for _, st := range p.Steps {
			fmt.Fprintf(&b, "  step %s %s ideal %+.4f amount %+.4f sd %.4f\n", st.Kind, st.Eccentric, st.IdealAmount, st.Amount, st.SigmaAmount)
		}
		for _, n := range p.Notes {
			fmt.Fprintf(&b, "  note: %s\n", n)
		}
		fmt.Fprintf(&b, "  recheck %v findings dev %+v\n", res.Rechecked, p.Deviations)
		if os.Getenv("EVENBEAT_DIAG_SHORT") != "" {
			var sb strings.Builder
			fmt.Fprintf(&sb, "%d %s %s %s sw%g co%v wild%d before %.3f rounded %.3f best %.3f steps:", i, prio, e.Kind[:4], e.Size, rd.SweepStepDeg, rd.CutOffs, rd.Wild, res.Before, res.Rounded, res.Best)
			for _, st := range p.Steps {
				fmt.Fprintf(&sb, " %s/%s %+.3f(%+.3f)", st.Kind, st.Eccentric, st.Amount, st.IdealAmount)
			}
			sb.WriteString("\n")
			for k, pos := range e.Positions {
				n, a := p.Now[k], p.After[k]
				pn, pa := n.Front.LeadMM-n.Back.LeadMM, a.Front.LeadMM-a.Back.LeadMM
				tn, ta := d0.Lead[k], d1.Lead[k]
				if prio == plan.EqualCutOffs {
					pn, pa = n.Front.CutOffPercent-n.Back.CutOffPercent, a.Front.CutOffPercent-a.Back.CutOffPercent
					tn, ta = d0.Cut[k], d1.Cut[k]
				}
				flag := ""
				if abs(ta)-abs(tn) > e.tolerance(prio) {
					flag = "WORSE"
				}
				fmt.Fprintf(&sb, "   %-12s plan %+.3f -> %+.3f (worse by %+.3f)  true %+.3f -> %+.3f (worse by %+.3f) sd %.3f/%.3f %s\n", pos.Name, pn, pa, abs(pa)-abs(pn), tn, ta, abs(ta)-abs(tn), sdA(prio, n.Front), sdA(prio, n.Back), flag)
			}
			t.Log(sb.String())
			continue
		}
		t.Log("\n" + b.String())
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func sdA(prio plan.Priority, e plan.EndState) float64 {
	if prio == plan.EqualCutOffs {
		return e.CutOffSigmaPct
	}
	return e.LeadSigmaMM
}
