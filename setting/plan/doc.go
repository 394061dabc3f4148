// Package plan turns a cylinder's readings into what to change: it fits the
// as-built state of the valve gear to the dial-gauge readings, solves for
// the changes of the adjustments the engine allows that make the leads or
// the cut-offs equal, front against back, and writes the changes in
// workshop words, rounded to what hands can do, with the events predicted
// after the rounded changes beside today's.
//
// It imports only the standard library, evenbeat/setting and
// evenbeat/setting/session.
//
// # Conventions
//
// As package setting: lengths in mm, angles in degrees; crank angle from
// front dead centre in the forward running direction; valve displacement
// from central, + toward the front cover; gauge readings normalised (by
// package session) to grow as the valve moves toward the front cover.
//
// # The model
//
// Model is the engine as drawn (setting.EngineSpec) plus Deviations, the
// as-built errors the fit finds: the valve's place on its spindle,
// eccentric angles and rod lengths, the Walschaerts return crank angle
// and radius rod length, the steam laps as built (the port marks measure
// them), the gauge zero, and the error of the marked front dead centre.
// A real engine has errors no such list holds (an eccentric's throw, a
// lifting link, a lever's pins, the die's place in the link at a notch),
// so each reverser position the readings were taken in also has its
// Unmodelled part: what the readings show that the drawing with its
// deviations cannot follow. With dead-centre readings alone it is an
// offset and a small phase shift of that position's own curve (the offset
// moves its leads apart, the phase together); with a sweep, a short
// Fourier series. Model.Predict gives the reading each observation should
// have shown; Model.Curve the valve curve, unmodelled part included.
//
// # Measured events first
//
// The plan works from what was measured. A lead read at a dead centre
// against its port mark, a cut-off at the crosshead, a feeler opening:
// the unmodelled parts (with a prior of 0.3 mm at 5 in gauge, scaled with
// the crank) let the model follow them within their errors, so today's
// events are the readings' where the readings measured them and the
// model's elsewhere, and the model supplies the sensitivities: how each
// adjustment moves each event. Where the readings at a dead centre differ
// from the drawing by more than their errors explain, or a deviation is
// beyond what a build would leave (three times its prior), the plan says
// so (Fit.Findings) and still works from the readings.
//
// # Fit (a), with dimensions
//
// FitObservations (FitSession for a session) finds the deviations and
// unmodelled parts by nonlinear least squares by Levenberg-Marquardt on
// the normal equations (Cholesky, plain Go), weighting each reading by its
// error sqrt(gauge^2 + (valve slope x crank-angle error)^2) with the gauge
// error resolution / sqrt(12) (uniform quantisation; a port mark adds the
// error of seeing an edge crack) and the crank-angle error from the tyre
// marks. Every deviation carries a Gaussian prior: a careful build's
// errors (1.5 mm for the spindle and rods, 2 mm for a radius rod, 3
// degrees for angles, 0.1 mm for a lap, on a 25 mm crank and scaled with
// it; the dead-centre mark by its stated error), so that deviations the
// readings cannot tell apart (a spindle error and equal errors of both
// Stephenson rods) share the change the way the drawing makes likely; the
// events do not depend on how they share it. Fit.Undecided names those
// the readings left at their prior. The dead-centre mark is fitted only
// with a sweep, whose marks show the curve's phase.
//
// A reading on a dead centre is placed on the engine's own dead centre
// (the brackets found it; see package session), and marks round the tyre
// are put in proportion to the bracketed dead centres.
//
// The linkage is solved at 32 crank angles per reverser position and held
// as its trigonometric interpolant (better than 1e-4 mm, about 1e-9 mm on
// the test engines); derivatives by each deviation are effect curves
// sampled at 24 angles.
//
// A reading the others contradict is named and left out. The deviations
// alone are fitted first (a swept position keeps its unmodelled part, which
// its sweep pins), where the readings check one another through the
// linkage: the readings whose deleted residual (r/(1-h), h the leverage)
// lies more than three of its standard deviations off (a floor of 0.15 mm
// for what unmodelled errors explain) and more than 0.15 mm are suspects
// (both at 5 in gauge, growing with the engine's size to the power 0.7: a
// full-size shop's errors are larger, not twelve times larger); the fit is
// made again without each, and the one whose leaving out makes the rest
// agree (every residual within three standard deviations, or the one left
// out twice as far off as any left in) best (the least sum of squares,
// priors included, of what is left) is named with what the fit without it
// predicts ("Take again the front dead centre, full back: the gauge read
// 4.53 mm, where the other readings put it near 3.33 mm"). Two that would
// each explain the rest nearly as well (within 4 of that sum) are named as
// a pair and both left out. Where the linkage cannot check a position's
// readings (a notch read at its dead centres alone, between swept full
// gears), the fit with its unmodelled parts tells: a real engine's
// unmodelled errors move both ends of a position together or apart, a
// mistyped reading one end alone; a position whose unmodelled part bends
// 0.3 mm (at 5 in gauge, to the power 0.7) at one end and less than a
// third of that at the other has that reading named when the fit without
// it puts it four standard deviations off. With a sweep, a knocked
// reading in it stands out against the unmodelled parts: a deleted
// residual five standard deviations off, twice any other's.
// Readings that no state of the gear follows within ten times their
// errors are refused as contradictory.
//
// # Fit (b), without dimensions
//
// FitHarmonic fits each reverser position's readings with an offset and
// the first and second harmonics of crank angle (linear least squares),
// takes the ports from the port marks, and from the fitted curve gives the
// events (setting.Events), the spindle change that equalises the leads and
// the eccentric turn that brings the mean lead to a target.
// MakeWithoutDimensions builds a plan from it (spindle for forward gear,
// then a Stephenson gear's backward rod for back gear, or a single
// eccentric's angle for a target lead), for a gear whose drawing is
// missing or wrong.
//
// # Solve
//
// The adjustments of the session's profile are the knobs. The plan is
// judged by front-minus-back differences over the positions planned (full
// forward, the engine's notches, full back; a fixed single eccentric has
// only full forward): leads (per 0.01 mm) for EqualLeads; cut-offs (per
// 0.1 % of stroke) in every position for EqualCutOffs, the running notch
// first (the others weigh 0.85: full forward and full back are not given
// away for it); both (per 0.05 mm and per 1 %) by Options.Weight for
// Balanced. Each position counts by how well the readings know its
// difference (a position nobody measured counts for little, the running
// notch of a cut-off plan always fully). A mean-lead term holds the lead
// at Options.TargetLeadMM in full gear, or at the drawing's, only where
// an eccentric sheave may be turned, since nothing else changes the lead
// itself. Where the lead after the plan misses the target by more than
// 0.02 mm in full gear, a note says why (no sheave the profile lets the
// plan turn for that gear, Walschaerts gear's combination lever, a limit,
// whole steps) and what lead the plan gives instead (target.go).
//
// Eccentric sheaves are turned only for a target lead, when the mean lead
// of the gear an eccentric drives is far from the drawing's (a slipped
// sheave; the plan says so) and more than one reading bears that out
// (both ends' leads off the same way, a sweep there, or another position
// the eccentric drives; else the plan asks for the readings again), or
// when the profile allows nothing else. A
// knob that acts mainly where the readings pin nothing down (a backward
// rod with no readings in back gear) is left alone, and the plan says
// which readings to take.
//
// The search (search.go): every set of the usable knobs is solved on the
// model linear in the changes about today (the events' gradients by the
// implicit-function rule: a lead moves with the valve at dead centre, a
// cut-off's crank angle by -(dx/dp)/(dx/dtheta)), by least squares with a
// ridge for the doubt of each knob's effect (effectDoubt, 5 %: no small
// gain bought with large changes that cancel), then its worst term
// brought down by reweighting toward the largest (Lawson's rule), tenfold
// on any position it would leave worse than today. The sets are ranked:
// those within a gauge division (cut-offs: 0.2 %) of the best, fewest
// knobs first, then the smallest changes; then the rest, closest first.
// For cut-offs the leading sets are solved on the linkage before they are
// ranked. In that order the chosen set is polished on the linkage itself
// (Gauss-Newton with Lawson's weights on curves moved by the knobs'
// effects, corrected by the linkage solved afresh at the answer: its ideal
// changes are Plan.Ideal), rounded to the whole steps of each adjuster
// either side, and the roundings judged (the best two on the linkage
// solved afresh). A plan never leaves a position worse than today by more
// than a setter reads as a change (a lead difference: two divisions of a
// 0.01 mm gauge, scaled with the crank; a cut-off difference 0.3 % of
// stroke; Balanced: the whole objective), judged with the plan's own
// doubts: a position carried past equal is taken to stand half its error
// nearer equal than read, and where large changes cancel at a position
// what is left there counts a share of each knob's doubt. A position the
// readings do not pin down is held only as the model knows it. When no
// rounding of a continuous answer holds, a few whole steps are tried (one
// adjuster up to three steps, or two together: coarse threads against
// each other make a finer step); no change is the answer only when
// nothing gains more than half a division. An adjuster whose ideal change
// rounds to nothing is named in a note with what it would want.
//
// Rounding: a length on a thread moves in whole flats (pitch / flats per
// turn; 6 when not given; a thread turned by halves is written in half
// turns); a length with no thread in 0.05 mm; an eccentric sheave in
// 0.5 mm round its rim (without a diameter, and for a return crank, 0.25
// degree). The predicted events are those of the ROUNDED changes, from
// the linkage solved afresh, and the notes say what rounding leaves: how
// far apart each position stays, and the step of the adjuster that acts
// most there.
//
// A step's words say what to change and by how much, then how: what to
// slacken (the nut on the valve's other side, a fork end's lock nut and
// pin, a sheave's grub screws, the return crank's pinch bolt), which way
// to turn as seen from a stated place (the front of the engine for the
// valve's nuts, the fork end for a rod, the engine's right-hand side for
// a sheave or crank: front to the right, running forward clockwise, as
// the app draws the engine), the amount in turns and flats or in mm round
// the rim, and what to lock again. Threads are taken as right-hand, and
// the words say so. StepFor words a what-if's change the same way.
//
// Angularity makes equal leads and equal cut-offs impossible at once:
// every plan is also made with the other priority (Plan.Other), and a note
// says what the other quantity becomes.
//
// Steps come in the order a setter works: Stephenson: forward eccentric,
// the valve on its spindle for forward gear, the forward rod, then back
// gear by its eccentric and its rod; Walschaerts: return crank angle and
// eccentric rod (the link centred at each dead centre), radius rod (the
// valve still when the reverser moves on dead centre), then the spindle to
// share the lead; single eccentric: the sheave, then the spindle.
//
// # Uncertainty
//
// The fit's covariance (J^T W J + P)^-1, over the deviations and the
// unmodelled parts, scaled by the reduced chi-square when that exceeds
// one, is carried by linearised propagation to each lead and cut-off and
// to each ideal change (-(A^T A + R)^-1 A^T B: A the objective's
// gradients by the knobs the plan moves, R the ridge, B the gradients by
// the fitted parameters). A step's +/- is
// the whole scatter of its ideal change over repeated rounds: the bench's
// TestStepUncertaintyCoversTheScatter holds it to cover about two thirds
// of that scatter. When an event in some position stays uncertain (a lead
// to more than 0.05 mm, a cut-off to more than 1 %), Plan.NextReading says
// which reading to take.
//
// # Command-line writers
//
// WriteText(w, plan, unit) and WriteJSON(w, plan, unit) write a plan (for
// "evenbeat plan SESSION.json [-json]"); WriteEventsText(w, spec) and
// WriteEventsJSON(w, spec) the event table of an engine (for "evenbeat
// events ENGINE.json [-json]"). Make(session, Options{}) builds the plan of
// cylinder 0 with equal leads; AimsOptions(session.Aims) gives the options
// the session file's plan_aims ask for, which the app and the command line
// start from.
//
// # Plan JSON (format "evenbeat-plan", version 1)
//
// Top level: format, version, display_unit, engine, cylinder, priority
// ("leads", "cut-offs", "balanced"), steps, ideal_changes (the continuous
// solution: kind, eccentric, unit, amount), now, after, other, notes,
// recheck (each with expect_mm, what the other readings put it at, and
// pair for two either of which is at fault), next_reading, fit_rms_mm,
// deviations (steam_lap_mm among them), cautions. Each step:
//
//	{"part": "backward eccentric rod", "kind": "eccentric_rod_length",
//	 "eccentric": "backward", "unit": "mm", "sign": "+ = lengthened",
//	 "ideal_amount": -0.243, "amount": -0.25, "sigma_amount": 0.01,
//	 "turns": 0, "flats": 3, "words": "Shorten the backward eccentric rod ..."}
//
// amount is the rounded change, signed in mm or degrees (unit):
// valve_on_spindle + = valve moved toward the front cover;
// eccentric_angle + = eccentric advanced (turned ahead in the running
// direction it drives); eccentric_rod_length and radius_rod_length + =
// lengthened; return_crank_angle + = turned in the forward running
// direction. rim_mm is the rounded angle as mm round the sheave rim. now
// and after list, per position, each end's lead_mm (+ = open at dead
// centre) with lead_sigma_mm, cut_off_percent (of the stroke from that end)
// with cut_off_sigma_percent, release and compression percentages and the
// largest opening. testdata/plans/README.md shows a whole example.
package plan
