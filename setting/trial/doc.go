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
// It is the project's bench for the plan (see Run and the test that prints
// its table); nothing in the app imports it. It imports the standard
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
// place on its spindle, and the measuring set-up (gauge zero, scale and
// the datum and the marks). A plan's step is made on the
// truth the way the planner's sign conventions say (package session's
// adjustment kinds): the spindle moves the valve, a sheave's angle of
// advance, a rod's length, a return crank's angle.
//
// # Scores
//
// Per engine and priority: the worst front-minus-back difference over the
// planned positions (full forward, the running notches, full back) of the
// leads (mm) and cut-offs (% of stroke), before the plan, after its ideal
// (continuous) amounts, after its rounded amounts, and the best reachable
// with the truth known. Equal leads pass at 0.02 mm (continuous);
// rounded amounts pass within one step of the finest adjuster acting
// there. Equal cut-offs pass within 0.5 % of stroke of the best reachable.
// A plan is "worse" when any position ends farther from equal than before
// by more than the readings can tell (0.02 mm, 0.5 %), and a "refusal"
// when it changes nothing while the best reachable gains more than that.
package trial
