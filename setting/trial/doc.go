// Package trial tries plans on as-built engines the planner never saw: it
// draws random engines of every gear and size, builds each one with errors
// of every kind a fitter would name (not only the deviations the planner's
// fit knows), takes a round of readings from it as a setter would (gauge
// quantisation, a gauge not quite square to the spindle,
// bracketed dead centres with marking errors, now and then a mistyped
// reading), hands the round to the planner, makes the plan's changes on
// the true engine and scores what the engine then does. The best any
// allowed change could reach is found by direct optimisation with the
// truth known, so a plan is judged against what was possible.
//
// It is the project's bench for the plan: TestTrials runs it and prints
// its table (go test -run TestTrials -v ./setting/trial; EVENBEAT_TRIALS=600
// for the full figures), TestStepUncertaintyCoversTheScatter checks each
// step's +/- against repeated rounds (StepCoverage).
// EVENBEAT_TRIAL_FAILS=all lists every priority's failures with their
// second round; TestDiagnose (EVENBEAT_DIAG=12:leads,40:cut-offs, with
// EVENBEAT_DIAG_SHORT=1 for a line a position) prints what one engine's
// plan believed of each position today and after, against the truth, and
// the true effect of each adjustment: it tells a wrong state (the fit)
// from a wrong move (the planner). Nothing in the app
// imports it. It imports the standard
// library and evenbeat/setting, evenbeat/setting/session and
// evenbeat/setting/plan.
//
// # The true engine
//
// An Engine holds the drawing the setter enters and the truth: the same
// engine with every dimension off by a build error (rod, throw and lap
// errors, a Stephenson lifting link, link suspension and weighshaft arm, a
// Walschaerts return crank's throw, combination lever pins, union link and
// crosshead arm, the die's place in the link at each notch), the valve's
// place on its spindle, and the measuring set-up (gauge zero and scale,
// the datum and the marks; lost motion is left out, since the setter
// turns the wheels the way the engine runs). A plan's step is made on the
// truth the way the planner's sign conventions say (package session's
// adjustment kinds): the spindle moves the valve, a sheave's angle of
// advance, a rod's length, a return crank's angle.
//
// # Scores
//
// Per engine and priority: the worst front-minus-back difference over the
// planned positions (full forward, the running notches, full back) of the
// leads (mm) and cut-offs (% of stroke), before the plan, after its ideal
// (continuous) amounts (Plan.Ideal), after its rounded amounts, and the
// best reachable with the truth known: without turning a sheave (a setter
// turns one for a lead wanted, not to share one) and without leaving a
// position worse than before. Equal leads pass at 0.02 mm on a 5 in
// gauge engine (in proportion to the crank on a larger one) or within
// half that of the best reachable where no change reaches it; equal
// cut-offs within 0.5 % of stroke of the best reachable; rounded amounts
// within that and one step of the finest adjuster acting on the worst
// position. A plan is "worse" when a position ends farther from equal
// than before by more than the readings can tell (0.02 mm, 0.5 %, or
// for a balance the whole objective), and a "refusal" when it changes
// nothing while whole steps could gain more than that (a plan that names
// the mistyped reading for taking again and waits for it is not one: the
// setter is told what to do). The second round
// makes the first plan's rounded steps, reads the engine again and plans
// again.
package trial
