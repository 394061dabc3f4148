package listen

import (
	"fmt"
	"math"
)

// Beat is one exhaust release the readings predict, round one turn of the
// wheel: a cylinder end's release at a crank angle.
type Beat struct {
	// Deg is the crank angle of the release, degrees in the direction of
	// running, from any datum fixed for the whole list (e.g. the first
	// cylinder's front dead centre).
	Deg      float64
	Cylinder string // the cylinder's name, e.g. "left", "right", "middle"
	Front    bool   // the front end's exhaust; false: the back end's
}

// String names the cylinder end, e.g. "left front".
func (b Beat) String() string {
	end := "back"
	if b.Front {
		end = "front"
	}
	if b.Cylinder == "" {
		return end
	}
	return b.Cylinder + " " + end
}

// PredictionDoubtDeg is the standard error taken for a predicted beat's
// place, degrees of crank: what the readings a prediction comes from can
// tell (a value from memory: a dial-gauge reading within a few hundredths
// of a millimetre moves a release by about a degree).
const PredictionDoubtDeg = 1.0

// Match is the heard beats laid against the predicted ones.
type Match struct {
	// Beats[j] is the predicted beat matched to the heard beat j
	// (Result.Beats[j]), with where it was heard on the prediction's
	// datum.
	Beats []MatchedBeat
	// RMSDeg is the root mean square difference of the heard places from
	// the predicted ones, degrees, after the best turn and shift.
	RMSDeg float64
	// Ambiguous is set when another way round fits nearly as well (a
	// likelihood of at least a twentieth of the best's, the places' doubt
	// taken as the larger of what the recording and PredictionDoubtDeg
	// allow and what the best fit leaves): an even prediction fits every
	// way round, and so does any when the heard beat is far from what the
	// readings foresee.
	Ambiguous bool
	// Disagrees is set when even the best way round leaves the heard
	// places further from the predicted ones than the doubts allow (by a
	// root mean square over twice what they allow): the engine does not
	// beat as the readings foresee; take them again, or look at the
	// quartering.
	Disagrees bool
	// Odd names the cylinder end the odd beat (Result.Beats[0]) most likely
	// is: one beat when the match is sure, each candidate when it is
	// ambiguous, none when no beat stands out in the recording.
	Odd []Beat
}

// MatchedBeat is one predicted beat and where it was heard.
type MatchedBeat struct {
	Beat             // the predicted beat
	HeardDeg float64 // where it was heard, degrees on the prediction's datum
}

// Match finds the way round of the heard beats that best fits the
// predicted ones (one beat for each heard beat, in any order and datum):
// for each of the turn's rotations, the heard places shifted to fit the
// predicted places by least squares, and the rotation with the least
// squared difference. It then names the cylinder end of the odd beat.
func (r *Result) Match(predicted []Beat) (*Match, error) {
	n := r.BeatsPerTurn
	if len(predicted) != n || len(r.Beats) != n {
		return nil, &Error{Field: "predicted beats", Message: fmt.Sprintf("The readings predict %d beats a turn but the recording was analysed for %d; analyse it with the engine's beats a turn (4 for two cylinders, 6 for three).", len(predicted), n)}
	}
	pred := make([]Beat, n)
	for i, b := range predicted {
		if math.IsNaN(b.Deg) || math.IsInf(b.Deg, 0) {
			return nil, &Error{Field: "predicted beats", Message: fmt.Sprintf("The predicted release of the %s is not a number of degrees.", b)}
		}
		b.Deg = math.Mod(b.Deg, 360)
		if b.Deg < 0 {
			b.Deg += 360
		}
		pred[i] = b
	}
	sortBeats(pred)
	heard := make([]float64, n)
	s2 := PredictionDoubtDeg * PredictionDoubtDeg
	for j, b := range r.Beats {
		heard[j] = b.Deg
		s2 += b.OffsetDoubt * b.OffsetDoubt / float64(n)
	}
	// cost[rot]: the heard beat rot matched to pred[0], rot+1 to pred[1]...
	cost := make([]float64, n)
	shift := make([]float64, n)
	for rot := range n {
		d := make([]float64, n)
		mean := 0.0
		for c := range n {
			d[c] = rotated(heard, rot, c) - (pred[c].Deg - pred[0].Deg)
			mean += d[c] / float64(n)
		}
		for c := range n {
			cost[rot] += (d[c] - mean) * (d[c] - mean)
		}
		shift[rot] = mean
	}
	best := 0
	for rot := range n {
		if cost[rot] < cost[best] {
			best = rot
		}
	}
	m := &Match{RMSDeg: math.Sqrt(cost[best] / float64(n))}
	// When even the best way round fits worse than the doubts allow (the
	// readings do not foresee what was heard), the doubt is what the fit
	// leaves: n places less the one shift fitted.
	left := cost[best] / float64(n-1)
	m.Disagrees = left > 4*s2
	s2 = max(s2, left)
	// A likelihood ratio of 20 between Gaussian fits: 2 s^2 ln 20.
	limit := 2 * s2 * math.Log(20)
	var ways []int
	for rot := range n {
		if cost[rot]-cost[best] <= limit {
			ways = append(ways, rot)
		}
	}
	m.Ambiguous = len(ways) > 1
	m.Beats = make([]MatchedBeat, n)
	for c := range n {
		j := (c + best) % n
		at := rotated(heard, best, c) - shift[best] + pred[0].Deg
		m.Beats[j] = MatchedBeat{Beat: pred[c], HeardDeg: math.Mod(at+720, 360)}
	}
	if r.Odd.StandsOut {
		for _, rot := range ways {
			// Heard beat 0 is matched to pred[c] with (c + rot) % n == 0.
			b := pred[(n-rot)%n]
			if !containsBeat(m.Odd, b) {
				m.Odd = append(m.Odd, b)
			}
		}
	}
	return m, nil
}

// GapsFrom returns the heard gaps (degrees of crank, summing to 360) in
// order round the turn from the heard beat matched to the cylinder end
// of first: what a beat circle drawn from that exhaust shows beside its
// predicted gaps. It is nil when no heard beat was matched to that end.
// When the match is ambiguous it follows the best way round.
func (m *Match) GapsFrom(first Beat) []float64 {
	n := len(m.Beats)
	for j, b := range m.Beats {
		if b.Cylinder != first.Cylinder || b.Front != first.Front {
			continue
		}
		gaps := make([]float64, n)
		for k := range n {
			from, to := m.Beats[(j+k)%n].HeardDeg, m.Beats[(j+k+1)%n].HeardDeg
			gaps[k] = math.Mod(to-from+720, 360)
			if n == 1 {
				gaps[k] = 360
			}
		}
		return gaps
	}
	return nil
}

// rotated is the place of heard beat (rot + c) % n counted from heard beat
// rot, degrees, 0 to 360.
func rotated(heard []float64, rot, c int) float64 {
	n := len(heard)
	j := (rot + c) % n
	v := heard[j] - heard[rot]
	if j < rot {
		v += 360
	}
	return v
}

// sortBeats sorts beats round the turn by angle (then by name, so equal
// angles keep one order).
func sortBeats(b []Beat) {
	for i := 1; i < len(b); i++ {
		for j := i; j > 0 && beatBefore(b[j], b[j-1]); j-- {
			b[j], b[j-1] = b[j-1], b[j]
		}
	}
}

func beatBefore(a, b Beat) bool {
	if a.Deg != b.Deg {
		return a.Deg < b.Deg
	}
	return a.String() < b.String()
}

func containsBeat(list []Beat, b Beat) bool {
	for _, x := range list {
		if x.Cylinder == b.Cylinder && x.Front == b.Front {
			return true
		}
	}
	return false
}
