// Package setting is Evenbeat's domain: the kinematics of a steam engine's
// crank, valve and valve gear, the valve events they give, and (built on
// those) fitting the readings a setter takes and solving for the
// adjustments that even the beat.
//
// What is here:
//
//   - Engine and Crank: the exact slider-crank of one cylinder (finite
//     connecting rod, cylinder line inclined and offset from the axle),
//     dead centres from the geometry, piston travel from either end and its
//     exact inverse.
//   - Valve and End: admission (internal or external), laps, and ports as
//     slots or rings of drilled holes, with open areas.
//   - Gear: a valve gear as a valve-motion function of crank angle and
//     reverser position (single eccentric, Stephenson, Walschaerts).
//   - Events: admission, cut-off, release and compression of each end, lead
//     at each dead centre and the largest openings, for ANY valve motion
//     (a gear, a fitted curve, measured points); Table: the same for a
//     gear per reverser position and running direction.
//   - EngineSpec: a whole engine as JSON, validated value by value.
//     EnginePatch: how one cylinder differs from it, an RFC 7396 merge
//     patch in the file's terms, applied to the values (never by writing
//     the engine out and reading it back).
//
// Units and conventions, everywhere in the package:
//
//   - Lengths are millimetres; angles are degrees at the API unless a name
//     says Rad.
//   - Front is the cylinder-cover end (ahead), back the gland end (toward
//     the crank).
//   - Crank angle is measured from front dead centre in the forward running
//     direction of the wheel. Back dead centre is 180 degrees only when the
//     cylinder line passes through the axle centre (Crank.BackDeadCentre).
//     Running backward, time turns the crank angle downward; events are
//     still quoted in this one crank angle.
//   - Valve displacement is measured from the valve's central position,
//     positive forward (toward the front cover). External admission opens
//     the front port to steam when the valve moves back, internal when it
//     moves forward (see Admission).
//   - Percentages of stroke are measured from the end concerned (Event).
//   - Lead is signed: negative means the port is still lapped at dead
//     centre.
//
// Errors meant for the user are *Error values: a key path naming the field
// ("valve.front.port_width") and a full sentence. No function panics on bad
// input or returns NaN or Inf.
//
// The package imports only the standard library and evenbeat/setting/jsonx
// (JSON without reflection, so the browser build carries no encoding/json);
// it never imports ebiten or syscall/js, so it tests natively and serves
// the browser app, the drawing code and the command-line tool alike.
package setting
