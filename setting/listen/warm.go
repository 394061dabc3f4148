package listen

import "math"

// Warm works out a short recording made up here (an uneven four-beat
// engine at two turns a second, 4 s at 16 kHz: bursts of noise dying
// away over a little hiss) and drops the answer. It exists for the
// browser: WebAssembly's code is first compiled quickly and plainly, and
// only what is seen running hot is compiled again, optimised, for its
// next call. A recording's analysis calls each of its hot loops only a
// few times, so unwarmed it runs plainly to the end (a 20 s recording:
// about 320 to 420 ms under Node against 120 ms warmed, and as slow in
// Chromium). The app calls Warm once while the first recording runs, when
// the phone has nothing else to do; natively it is merely wasted work.
// It reports whether the made-up recording was heard as made, which the
// tests check, so Warm runs the whole analysis.
func Warm() bool {
	const (
		rate    = 16000
		seconds = 4
		turn    = 0.5 // seconds
	)
	beats := [...]float64{0, 0.25, 0.5, 0.78} // of a turn: the last one late
	x := make([]float32, seconds*rate)
	seed := uint32(2463534242)
	noise := func() float32 { // xorshift32: enough for noise, no state kept
		seed ^= seed << 13
		seed ^= seed >> 17
		seed ^= seed << 5
		return float32(seed)/(1<<31) - 1
	}
	for i := range x {
		x[i] = 0.003 * noise()
	}
	for k := 0.0; k < seconds/turn; k++ {
		for _, b := range beats {
			at := int((k + b + 0.1) * turn * rate)
			for i := 0; at+i < len(x) && i < rate/20; i++ {
				x[at+i] += 0.8 * float32(math.Exp(-float64(i)/(0.015*rate))) * noise()
			}
		}
	}
	r, err := Analyse(x, rate, len(beats))
	return err == nil && r.Turns >= 6 && math.Abs(r.RevPerMin-60/turn) < 1
}
