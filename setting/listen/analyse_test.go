package listen_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"evenbeat/setting/listen"
	"evenbeat/setting/listen/listentest"
)

// take synthesises a recording of beats at 1.5 rev/s for 15 s at 16 kHz,
// with the roar, hiss, a missed and a spurious beat of the trials.
func take(seed uint64, beats []listen.Beat) listentest.Recording {
	rng := rand.New(rand.NewPCG(7, seed))
	return listentest.Synthesise(rng, listentest.Take{
		Beats: beats, RevPerSec: 1.5, SpeedChange: 0.02, Seconds: 15, Rate: 16000,
		RoarDB: -10, HissDB: -35, Missed: 1, Extra: 1,
	})
}

// evenBeats is a two-cylinder engine with equal events and true
// quartering: its four releases a quarter turn apart.
func evenBeats() []listen.Beat {
	return []listen.Beat{
		{Deg: 150, Cylinder: "right", Front: true}, {Deg: 240, Cylinder: "left", Front: true},
		{Deg: 330, Cylinder: "right"}, {Deg: 60, Cylinder: "left"},
	}
}

// TestAnalyseRefusals: input the analysis cannot use is refused with an
// *Error naming the field, in a sentence.
func TestAnalyseRefusals(t *testing.T) {
	rec := take(1, evenBeats())
	nan := append([]float32(nil), rec.Samples...)
	nan[1000] = float32(math.NaN())
	inf := append([]float32(nil), rec.Samples...)
	inf[5] = float32(math.Inf(-1))
	cases := []struct {
		name    string
		samples []float32
		rate, n int
		field   string
		says    string
	}{
		{"beats a turn 0", rec.Samples, 16000, 0, "beats a turn", "from 2 to 12"},
		{"beats a turn 13", rec.Samples, 16000, 13, "beats a turn", "(4 for two cylinders, 6 for three; got 13)"},
		{"rate", rec.Samples, 4000, 4, "recording", "4000 Hz"},
		{"empty", nil, 16000, 4, "recording", "empty"},
		{"silent", make([]float32, 16000*5), 16000, 4, "recording", "silent"},
		{"not numbers", nan, 16000, 4, "recording", "not numbers"},
		{"infinite", inf, 16000, 4, "recording", "not numbers"},
		{"eleven minutes", make([]float32, 8000*660), 8000, 4, "recording", "11.0 minutes"},
		{"one second", rec.Samples[:16000], 16000, 4, "recording", "too few"},
		{"three samples", []float32{0.1, 0.2, 0.3}, 48000, 4, "recording", "only 0.00 s long"},
	}
	for _, c := range cases {
		_, err := listen.Analyse(c.samples, c.rate, c.n)
		var le *listen.Error
		switch {
		case err == nil:
			t.Errorf("%s: analysed, want a refusal saying %q", c.name, c.says)
		case !errors.As(err, &le) || le.Field != c.field:
			t.Errorf("%s: %v is not a refusal of the %s", c.name, err, c.field)
		case !strings.Contains(err.Error(), c.says) || !strings.HasSuffix(err.Error(), "."):
			t.Errorf("%s: %q does not say %q in a sentence", c.name, err, c.says)
		}
	}
}

// TestAnalyseNoise: noise, a tone and scattered clicks have no beat; each is
// refused with a sentence or gives finite figures, never a panic.
func TestAnalyseNoise(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 3))
	const rate = 8000
	noise := make([]float32, rate*10)
	tone := make([]float32, rate*10)
	clicks := make([]float32, rate*10)
	for i := range noise {
		noise[i] = float32(0.3 * rng.NormFloat64())
		tone[i] = float32(0.5 * math.Sin(2*math.Pi*440*float64(i)/rate))
		clicks[i] = float32(0.01 * rng.NormFloat64())
	}
	for range 40 {
		at := rng.IntN(len(clicks) - 100)
		for j := range 100 {
			clicks[at+j] += float32(0.8 * rng.NormFloat64() * math.Exp(-float64(j)/20))
		}
	}
	for name, s := range map[string][]float32{"noise": noise, "tone": tone, "clicks": clicks} {
		for _, n := range []int{4, 6} {
			r, err := listen.Analyse(s, rate, n)
			if err != nil {
				var le *listen.Error
				if !errors.As(err, &le) {
					t.Errorf("%s, %d beats: %v is not a refusal", name, n, err)
				}
				continue
			}
			checkFinite(t, name, r)
		}
	}
}

// checkFinite fails on any figure of r that is NaN or infinite.
func checkFinite(t *testing.T, name string, r *listen.Result) {
	t.Helper()
	vals := []float64{r.RevPerMin, r.SpeedChange, r.Evenness, r.Odd.Deg, r.Odd.Doubt}
	for _, b := range r.Beats {
		vals = append(vals, b.Deg, b.Offset, b.OffsetDoubt, b.Gap.Deg, b.Gap.Scatter)
	}
	for _, v := range vals {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Errorf("%s: a figure is %g: %+v", name, v, r)
			return
		}
	}
}

// TestEvenEngine: an engine with equal events and true quartering beats
// evenly: the gaps are 90 degrees within a degree, the evenness 1 within
// 0.03, no beat stands out and the match names none.
func TestEvenEngine(t *testing.T) {
	rec := take(2, evenBeats())
	r, err := listen.Analyse(rec.Samples, rec.Rate, 4)
	if err != nil {
		t.Fatal(err)
	}
	checkFinite(t, "even", r)
	for j, b := range r.Beats {
		if math.Abs(b.Gap.Deg-90) > 1 || math.Abs(b.Gap.Share(4)-100) > 1.2 {
			t.Errorf("gap %d: %.2f deg, %.1f %% of an even beat; want 90 deg", j+1, b.Gap.Deg, b.Gap.Share(4))
		}
	}
	if r.Evenness > 1.03 || r.Odd.StandsOut {
		t.Errorf("evenness %.3f, odd beat %+.2f +/- %.2f deg standing out %v; want an even beat", r.Evenness, r.Odd.Deg, r.Odd.Doubt, r.Odd.StandsOut)
	}
	if math.Abs(r.RevPerMin-1.5*60*1.01) > 1 {
		t.Errorf("%.2f rev/min, want about %.1f (1.5 rev/s drifting 2 %%)", r.RevPerMin, 1.5*60*1.01)
	}
	m, err := r.Match(evenBeats())
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Odd) != 0 || !m.Ambiguous {
		t.Errorf("even against even: odd %v, ambiguous %v; want none named, ambiguous", m.Odd, m.Ambiguous)
	}
}

// TestAmbiguousMatch: a recording whose left front limps 8 degrees late,
// laid against predictions that cannot tell its ends apart, is reported
// ambiguous with every candidate named; laid against the right
// prediction, it names the left front alone.
func TestAmbiguousMatch(t *testing.T) {
	limping := evenBeats()
	limping[1].Deg += 8 // left front late
	rec := take(3, limping)
	r, err := listen.Analyse(rec.Samples, rec.Rate, 4)
	if err != nil {
		t.Fatal(err)
	}
	if !r.Odd.StandsOut || !r.Odd.Late() || math.Abs(r.Odd.Deg-6) > 0.5 {
		t.Fatalf("odd beat %+.2f +/- %.2f deg (stands out %v), want 6 deg late (8 deg less its share of the mean)", r.Odd.Deg, r.Odd.Doubt, r.Odd.StandsOut)
	}
	m, err := r.Match(limping)
	if err != nil {
		t.Fatal(err)
	}
	if m.Ambiguous || m.Disagrees || len(m.Odd) != 1 || m.Odd[0].String() != "left front" {
		t.Errorf("against the true beats: ambiguous %v, disagrees %v, odd %v; want the left front alone", m.Ambiguous, m.Disagrees, m.Odd)
	}
	// Both fronts late alike: the prediction has a half-turn symmetry.
	sym := []listen.Beat{
		{Deg: 0, Cylinder: "right", Front: true}, {Deg: 98, Cylinder: "left", Front: true},
		{Deg: 180, Cylinder: "right"}, {Deg: 278, Cylinder: "left"},
	}
	cases := []struct {
		name      string
		predicted []listen.Beat
		odd       int // candidates named
	}{
		{"even prediction", evenBeats(), 4},
		{"half-turn symmetric prediction", sym, 2},
	}
	for _, c := range cases {
		m, err := r.Match(c.predicted)
		if err != nil {
			t.Fatal(err)
		}
		if !m.Ambiguous || len(m.Odd) != c.odd {
			t.Errorf("%s: ambiguous %v, odd %v; want ambiguous with %d candidates", c.name, m.Ambiguous, m.Odd, c.odd)
		}
		// Neither foresees one front limping alone.
		if !m.Disagrees {
			t.Errorf("%s: agrees (%.1f deg rms), want it to disagree", c.name, m.RMSDeg)
		}
	}
}

// TestMatchRefusals: predictions that cannot be laid against the beats are
// refused in a sentence naming them.
func TestMatchRefusals(t *testing.T) {
	r := &listen.Result{BeatsPerTurn: 4, Beats: make([]listen.BeatHeard, 4)}
	for j := range r.Beats {
		r.Beats[j].Deg = float64(j) * 90
	}
	six := append(evenBeats(), evenBeats()[:2]...)
	nan := evenBeats()
	nan[2].Deg = math.NaN()
	for name, p := range map[string][]listen.Beat{"six beats": six, "NaN": nan, "none": nil} {
		_, err := r.Match(p)
		var le *listen.Error
		if !errors.As(err, &le) || le.Field != "predicted beats" || !strings.HasSuffix(err.Error(), ".") {
			t.Errorf("%s: %v, want a refusal of the predicted beats", name, err)
		}
	}
}

// TestMatchWaysRound: heard beats given on any datum and from any beat are
// laid on the predicted ones however those are listed: each heard beat is
// matched to its predicted end, and placed on the prediction's datum.
func TestMatchWaysRound(t *testing.T) {
	predicted := []listen.Beat{ // listed out of order, one past 360
		{Deg: 251, Cylinder: "left", Front: true}, {Deg: 150, Cylinder: "right", Front: true},
		{Deg: 420, Cylinder: "left"}, {Deg: 327, Cylinder: "right"},
	}
	// Sorted round the turn: right front 150, left front 251, right back
	// 327, left back 60 (420). Heard from the right back.
	heardFrom := []float64{327, 420, 510, 611}
	r := &listen.Result{BeatsPerTurn: 4, Odd: listen.OddBeat{Deg: 3, StandsOut: true}}
	for _, d := range heardFrom {
		r.Beats = append(r.Beats, listen.BeatHeard{Deg: d - heardFrom[0], OffsetDoubt: 0.1})
	}
	m, err := r.Match(predicted)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"right back", "left back", "right front", "left front"}
	for j, b := range m.Beats {
		if b.String() != want[j] {
			t.Errorf("heard beat %d matched to %s, want %s", j+1, b, want[j])
		}
		if math.Abs(b.HeardDeg-math.Mod(heardFrom[j], 360)) > 1e-9 {
			t.Errorf("heard beat %d placed at %.3f deg on the prediction's datum, want %.3f", j+1, b.HeardDeg, math.Mod(heardFrom[j], 360))
		}
	}
	if m.RMSDeg > 1e-9 || m.Ambiguous || len(m.Odd) != 1 || m.Odd[0].String() != "right back" {
		t.Errorf("rms %g, ambiguous %v, odd %v; want an exact, sure match naming the right back", m.RMSDeg, m.Ambiguous, m.Odd)
	}
	// From the right front as a beat circle draws it: 101, 76, 93, 90.
	gaps := m.GapsFrom(listen.Beat{Cylinder: "right", Front: true})
	for k, want := range []float64{101, 76, 93, 90} {
		if len(gaps) != 4 || math.Abs(gaps[k]-want) > 1e-9 {
			t.Fatalf("gaps from the right front %v, want 101 76 93 90", gaps)
		}
	}
	if g := m.GapsFrom(listen.Beat{Cylinder: "middle", Front: true}); g != nil {
		t.Errorf("gaps from a middle cylinder the engine has not: %v", g)
	}
}

// TestAnalyseHardRecordings: a recording held at full scale is analysed
// with a note saying so; one with a steady offset (a microphone's DC) is
// analysed as if it had none; one of a four-beat engine analysed for six
// beats is refused or gives finite figures.
func TestAnalyseHardRecordings(t *testing.T) {
	limping := evenBeats()
	limping[2].Deg -= 7 // right back early
	rec := take(4, limping)
	clean, err := listen.Analyse(rec.Samples, rec.Rate, 4)
	if err != nil {
		t.Fatal(err)
	}
	loud := make([]float32, len(rec.Samples))
	offset := make([]float32, len(rec.Samples))
	for i, v := range rec.Samples {
		loud[i] = float32(math.Max(-1, math.Min(1, float64(v)*4)))
		offset[i] = v*0.5 + 0.3
	}
	r, err := listen.Analyse(loud, rec.Rate, 4)
	if err != nil {
		t.Fatalf("overloaded: %v", err)
	}
	if len(r.Notes) == 0 || !strings.Contains(r.Notes[0], "overloaded") {
		t.Errorf("overloaded recording: notes %q, want one saying so", r.Notes)
	}
	r, err = listen.Analyse(offset, rec.Rate, 4)
	if err != nil {
		t.Fatalf("with an offset: %v", err)
	}
	for j := range r.Beats {
		if d := r.Beats[j].Gap.Deg - clean.Beats[j].Gap.Deg; math.Abs(d) > 0.1 {
			t.Errorf("with an offset, gap %d is %.2f deg, without %.2f", j+1, r.Beats[j].Gap.Deg, clean.Beats[j].Gap.Deg)
		}
	}
	if !clean.Odd.StandsOut || clean.Odd.Late() {
		t.Errorf("the right back 7 degrees early: odd beat %+.2f deg, stands out %v", clean.Odd.Deg, clean.Odd.StandsOut)
	}
	if r, err := listen.Analyse(rec.Samples, rec.Rate, 6); err == nil {
		checkFinite(t, "six beats asked of four", r)
	}
}

// TestWarmHearsItsRecording: Warm's made-up recording is heard as made
// (every turn, the speed), so warming runs the whole analysis, folding
// and all, and not only the onsets before a refusal.
func TestWarmHearsItsRecording(t *testing.T) {
	if !listen.Warm() {
		t.Fatal("Warm's own recording was not heard as made")
	}
}
