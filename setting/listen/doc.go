// Package listen hears an engine's beat: from a recording of the exhaust,
// made with the engine on blocks or rollers and run slowly on air, it finds
// each exhaust's onset, the turn of the wheel from their rhythm, folds the
// beats onto turns and averages the gaps between them in degrees of crank;
// then it lays the heard gaps against the beats the readings predict and
// names the cylinder end of the beat that comes late or early. Nothing
// leaves the caller: the samples in, the figures out.
//
// It is pure Go on the standard library alone, built for js/wasm as for the
// command line: no ebiten, syscall/js or encoding/json (the app's build
// carries none), sorting with sort.Slice (one sort routine for every
// element type in the app's build).
//
// # Input
//
// Mono samples from -1 to 1 at 8000 to 48000 samples a second, at most ten
// minutes (10 to 20 s is plenty), and the beats a turn: every cylinder end
// exhausts once a turn, so 4 for two cylinders, 6 for three (2 to 12
// taken). The count cannot come from the sound: an even four-beat engine
// at one speed sounds as an even six-beat engine at two thirds of it.
// ReadWAV reads a WAV file (PCM of 8, 16, 24 or 32 bits, 32- or 64-bit
// float, plain or extensible, mono or channels averaged) with a refusal
// naming what is wrong, its length checked before anything is allocated.
// The app hands Analyse the microphone's samples directly (captured with
// the browser's echo cancellation, noise suppression and automatic gain
// off: they smear an onset).
//
// # Onsets
//
// A recording made faster than about 16 kHz is thinned to it (each d
// samples averaged: what is folded down is more noise to an energy
// detector), and everything under 40 Hz taken out. The onset function is
// a spectral flux on a few bands: in 1 ms blocks, the energy under 500,
// 500 to 1500, 1500 to 4000 and above 4000 Hz (edges under 0.4 of the
// rate); at each block, the rise in
// dB of each band's mean over the 8 ms after against the 16 ms before,
// rises only, summed over the bands (each band's energy has a floor 25 dB
// under the recording's mean power, so a nearly empty band adds nothing).
// An exhaust's rise shows most in the band where the continuous roar is
// weakest. An onset is a peak of that function (the largest within 10 ms
// either side) above an adaptive threshold: at least 6 dB and 30 % of
// the third-largest peak within two seconds either side, so it follows a
// louder roar or a quieter microphone, and one loud knock does not set
// it.
//
// Each onset is then placed to the sample: the split of the stretch from
// 20 ms before to 9 ms after it that best parts a quieter stretch from a
// louder one, each band (split at 400, 800, 1600, 3200, 6400 and 12800 Hz,
// edges under 0.4 of the rate) taken as steady noise either side (a change of variance by maximum
// likelihood), each band weighed by its width, the bands filtered forward
// and backward so nothing is delayed. Splits are tried every 0.25 ms
// within 8 ms before and 4 ms after the peak, then to the sample.
//
// # Rhythm and folding
//
// A rough turn is the beats a turn times the onsets' mean spacing (a
// missed and a spurious onset cancel), moved to the strongest lag of the
// onset train within 0.4 of a beat. Each onset is paired with the onset a
// turn later (within a quarter of a beat); the turn's time through the
// recording is a least-squares polynomial in time (a quadratic over eight
// turns or more, a line over four, else constant) through those pairs,
// pairs far off it left out, three times: the speed may drift (5 % over
// a recording is ordinary). The wheel's place at each onset, in turns, is
// the integral of 1 / turn time. The beats' places in the turn are the
// highest peaks of a circular histogram of the onsets' places (0.5 degree
// bins smoothed over 3), each at least half an even beat from the others;
// each onset goes to the nearest place within a fifth of an even beat,
// one onset a beat a turn (the one that rose more); the rest are spurious
// and left out of every figure.
//
// With the rhythm known, each onset is placed again, its likelihood
// weighed by a normal spread about where its beat is due (the median place
// of that beat's onsets, give or take 1.4826 median absolute deviations of
// them, at least 0.25 ms): an onset placed a few ms off on a quiet burst
// or a loud moment of the roar is drawn back, and one more than six
// spreads and 3 ms off is left out. Where a beat was due but none was
// heard, the largest rise within 6 ms of the due time is taken if it rose
// 6 dB and a fifth of that beat's median rise (a burst quietened by the one
// before it); a missed beat's silence has no such rise and stays missed.
//
// # Figures
//
// Each beat's place is the mean of its onsets' places in their turns; the
// gaps are the differences of the places (so they sum to 360), their
// scatter the standard deviation of the gap turn by turn. A beat's offset
// is its place less an even beat's, the even beats placed to fit all
// (mean offset zero); positive is late. The beats are numbered round the
// turn from the one whose offset is largest, the odd beat (Result.Beats[0]);
// it stands out when it is off by a degree and three standard errors, and
// by three standard errors more than any other beat. The evenness is the
// largest gap over the smallest (1 is even).
//
// # Matching
//
// Result.Match lays the heard places against the predicted beats (a crank
// angle for each cylinder end's release round one turn, in the direction
// of running, any datum): for each way round, the heard places shifted to
// fit the predicted ones by least squares; the best way round has the
// least squared difference. Another way round is as good, and the match
// ambiguous, when its squared difference is within 2 s^2 ln 20 of the best
// (a likelihood at least a twentieth of the best's, s^2 the heard places'
// variance plus PredictionDoubtDeg squared, or what the best fit leaves
// when that is more): an even prediction fits every way round, a
// prediction with a half-turn symmetry two, and a beat the readings do not
// foresee (the best fit leaving over twice the doubt allowed, Disagrees)
// may fit any. The odd beat is named for each way round that fits.
// Match.GapsFrom gives the heard gaps from any predicted exhaust round the
// turn, as a beat circle drawn from that exhaust lists its gaps.
//
// # Speed
//
// A 20 s recording at 48 kHz takes about 25 ms of CPU natively
// (BenchmarkAnalyse20s) and about 120 ms in the browser, where a
// recording's one analysis would otherwise run its hot loops in
// WebAssembly's first, plain compile throughout: Warm works out a short
// made-up recording first (the app calls it as the first recording
// begins), so the browser has compiled them optimised. Same answers
// cheaper: a logarithm only where the sound rises, the backward filter
// run in place, the smoothing weights worked out once.
//
// # Tests
//
// listentest synthesises recordings of invented engines: exhaust bursts
// of low noise rising over 0.3 to 1 ms and dying away, at the releases of
// an engine with one end 5 to 12 degrees late or early, turning at 0.5 to
// 4 rev/s and drifting up to 5 %, over a brighter continuous roar 10 dB
// under the beats and hiss, with a beat missed and a spurious burst.
// TestListeningTrials runs 200 of them (issue 15). The detector's
// settings were chosen on such recordings; real recordings may want them
// looked at again.
package listen
