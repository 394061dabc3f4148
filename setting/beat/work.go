package beat

import (
	"fmt"
	"math"

	"evenbeat/setting"
)

// Steam is what the simple indicator diagram assumes of the steam: the
// boiler pressure and the drop to the steam chest, the exhaust's back
// pressure, and the clearance volume (port and cylinder-end space, as a
// share of the swept volume). Pressures are gauge, in bar.
type Steam struct {
	BoilerBar      float64 // boiler pressure, bar gauge
	DropShare      float64 // drop from boiler to cylinder during admission, share of the absolute boiler pressure
	BackBar        float64 // exhaust back pressure, bar gauge
	ClearanceShare float64 // clearance volume, share of the swept volume
}

// atmosphereBar is the standard atmosphere in bar (ISO 2533: 101 325 Pa).
const atmosphereBar = 1.01325

// DefaultSteam is a small engine run on air or steam at 5.5 bar (80 psi)
// with a 10 % drop, 0.1 bar back pressure and 10 % clearance (the
// primer's section 10: clearance roughly 8-12 % of the swept volume;
// common practice, no source).
var DefaultSteam = Steam{BoilerBar: 5.5, DropShare: 0.10, BackBar: 0.1, ClearanceShare: 0.10}

// Check says what is wrong with s, naming the value.
func (s Steam) Check() error {
	switch {
	case !(s.BoilerBar > 0 && s.BoilerBar < 400):
		return fmt.Errorf("The boiler pressure must be more than 0 and less than 400 bar (got %g).", s.BoilerBar)
	case !(s.DropShare >= 0 && s.DropShare < 1):
		return fmt.Errorf("The pressure drop must be a share from 0 to under 1 (got %g).", s.DropShare)
	case !(s.BackBar >= -1 && s.BackBar < s.BoilerBar):
		return fmt.Errorf("The back pressure must be less than the boiler pressure (got %g bar against %g).", s.BackBar, s.BoilerBar)
	case !(s.ClearanceShare > 0 && s.ClearanceShare < 1):
		return fmt.Errorf("The clearance volume must be a share of the swept volume, more than 0 and under 1 (got %g).", s.ClearanceShare)
	}
	return nil
}

// MeanPressure returns the mean effective pressure of one cylinder end
// (bar): the work of one stroke over the swept volume, from a simple
// indicator diagram of its events. Admission at the boiler's absolute
// pressure less the drop, from the dead centre to cut-off; hyperbolic
// expansion (pV constant, volumes counted with the clearance) to release;
// exhaust at the back pressure to compression; hyperbolic compression to
// the dead centre (capped at the admission pressure). Lead and the
// pressure's fall through the port are left out. A port that never
// opens to steam only compresses and exhausts; one that never closes is
// open to release.
func (s Steam) MeanPressure(ev setting.EndEvents) (float64, error) {
	if err := s.Check(); err != nil {
		return 0, err
	}
	if ev.ExhaustNeverOpens || ev.ExhaustNeverCloses {
		return 0, fmt.Errorf("The exhaust edge never opens or never closes, so the stroke has no release and compression to work from.")
	}
	c0 := s.ClearanceShare
	pa := (s.BoilerBar + atmosphereBar) * (1 - s.DropShare)
	pb := s.BackBar + atmosphereBar
	r := clamp01(ev.Release.StrokePercent / 100)
	k := clamp01(ev.Compression.StrokePercent / 100)
	cut := clamp01(ev.CutOff.StrokePercent / 100)
	switch {
	case ev.NeverOpens:
		cut = 0
	case ev.NeverCloses || cut > r:
		cut = r
	}
	// Forward stroke: admission to cut-off, expansion to release; the
	// rest of that stroke and the return stroke to compression at back
	// pressure cancel to the return stroke from release to compression.
	work := pa * cut
	if cut > 0 {
		work += pa * (c0 + cut) * math.Log((c0+r)/(c0+cut))
	} else {
		// No admission: the clearance's steam (at back pressure after
		// the last exhaust) expands with the piston.
		work += pb * c0 * math.Log((c0+r)/c0)
	}
	work -= pb * (r - k)
	// Compression from k to the dead centre, hyperbolic, at most to the
	// admission pressure (beyond it the valve would open).
	if pc := pb * (c0 + k) / c0; pc <= pa || cut == 0 {
		work -= pb * (c0 + k) * math.Log((c0+k)/c0)
	} else {
		xs := pb*(c0+k)/pa - c0 // where the compression meets the admission pressure
		work -= pb*(c0+k)*math.Log((c0+k)/(c0+xs)) + pa*xs
	}
	return work, nil
}

// Work is one cylinder end's mean effective pressure and its share of the
// mean over every end.
type Work struct {
	Cylinder string
	End      setting.CylinderEnd
	// Bar is the mean effective pressure; Share is it as a percentage of
	// the mean over every end (100 for an engine whose ends all work
	// alike).
	Bar, Share float64
}

// Works returns the work of every end of every side, front then back, in
// the sides' order. An end the diagram cannot be drawn for (its exhaust
// never opens) is an error naming it.
func (s Steam) Works(sides []Side) ([]Work, error) {
	var out []Work
	mean := 0.0
	for _, sd := range sides {
		for _, end := range []setting.CylinderEnd{setting.Front, setting.Back} {
			p, err := s.MeanPressure(sd.Set.End(end))
			if err != nil {
				return nil, fmt.Errorf("%s %s end: %w", sd.Name, end, err)
			}
			out = append(out, Work{Cylinder: sd.Name, End: end, Bar: p})
			mean += p
		}
	}
	mean /= float64(len(out))
	for i := range out {
		if mean != 0 {
			out[i].Share = 100 * out[i].Bar / mean
		}
	}
	return out, nil
}

func clamp01(x float64) float64 { return math.Max(0, math.Min(1, x)) }
