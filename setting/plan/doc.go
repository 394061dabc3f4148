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
// as-built errors: the valve's place on its spindle, eccentric angles and
// rod lengths, the Walschaerts return crank angle and radius rod length,
// the gauge zero, and the error of the marked front dead centre.
// Model.Predict gives the reading each observation should have shown.
//
// # Fit (a), with dimensions
//
// FitObservations (FitSession for a session) finds the deviations by
// nonlinear least squares by Levenberg-Marquardt on the normal equations
// (Cholesky, plain Go), weighting each reading by its error
// sqrt(gauge^2 + (valve slope x crank-angle error)^2) with the gauge error
// resolution / sqrt(12) (uniform quantisation) and the crank-angle error
// from the tyre marks. Every deviation carries a Gaussian prior (2 mm for
// lengths, 3 degrees for angles on a 25 mm crank, scaled with the crank; the
// dead-centre mark by its stated error), so that deviations the readings
// cannot tell apart (a spindle error and equal errors of both Stephenson
// rods; a mismarked dead centre and an eccentric angle) share the change
// the way the drawing makes likely; the events do not depend on how they
// share it. Fit.Undecided names those the readings left at their prior.
//
// The linkage is solved at 32 crank angles per reverser position and held
// as its trigonometric interpolant (better than 1e-4 mm, about 1e-9 mm on
// the test engines); derivatives by each deviation are effect curves
// sampled at 24 angles. A reading more
// than 3 robust standard deviations (1.4826 x the median absolute
// normalised residual, each at least the gauge resolution) from the fit is
// named ("recheck: back dead centre, full forward, 0.31 mm off the fit"),
// left out, and the fit repeated (up to three readings). Readings that no
// state of the gear follows within ten times their errors are refused as
// contradictory.
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
// only full forward): leads (per 0.01 mm) for EqualLeads; the running
// notch's cut-offs (per 0.1 % of stroke) for EqualCutOffs; both (per
// 0.05 mm and per 1 %) by Options.Weight for Balanced. Each position
// counts by how well the readings know its difference (a position nobody
// measured counts for little). A mean-lead term holds the lead at
// Options.TargetLeadMM in full gear, or at the drawing's, only where an
// eccentric sheave may be turned, since nothing else changes the lead
// itself.
//
// Eccentric sheaves are turned only for a target lead, when the mean lead
// of the gear an eccentric drives is far from the drawing's (a slipped
// sheave; the plan says so), or when the profile allows nothing else: a
// spindle or rod change shares the lead between the ends, a sheave
// changes it at both. A knob that acts mainly where the readings pin
// nothing down (a backward rod with no readings in back gear) is left
// alone, and the plan says which readings to take.
//
// Every set of the usable knobs is solved by least squares, linear in the
// changes about today (the events' gradients by the implicit-function
// rule: a lead moves with the valve at dead centre, a cut-off's crank angle
// by -(dx/dp)/(dx/dtheta)), and each knob rounded to the whole steps
// either side of its ideal. For cut-offs, whose events are far from
// linear (a port may not open at all today), the whole set and the
// favourite set are solved again by bounded Gauss-Newton on the events
// themselves, and their roundings judged there. A plan is refused when it
// leaves any position worse than today by more than the readings can tell
// (the lead differences, for EqualLeads; the running notch's cut-off
// difference, for EqualCutOffs; the whole objective, for Balanced). Of the
// rest the plan with the fewest steps is taken whose worst weighted
// difference comes within what the setter can measure of the best any
// plan reaches (two gauge divisions, or the uncertainty of the
// differences, whichever is larger), then the smallest changes; an
// adjustment rounded to nothing is no step. So a plan does not buy a
// hundredth of a millimetre with large changes that cancel one another.
// The favourite is checked on the linkage solved afresh with its rounded
// changes, and the next taken when it does not hold up.
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
// The fit's covariance (J^T W J + P)^-1, scaled by the reduced chi-square
// when that exceeds one, is carried by linearised propagation to each lead
// and cut-off and to each ideal change (-(A^T A)^-1 A^T B: A the objective's
// gradients by the knobs the plan moves, B by the fitted deviations); a
// step's error is given with the other steps made as planned (the
// conditional standard deviation), since knobs that act alike can leave
// single changes uncertain while their sum is not. When an event in some
// position stays uncertain (a lead to more than 0.05 mm, a cut-off to
// more than 1 %), Plan.NextReading says which reading to take.
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
// ("leads", "cut-offs", "balanced"), steps, now, after, other, notes,
// recheck, next_reading, fit_rms_mm, deviations, cautions. Each step:
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
