// Package session reads, writes and checks Evenbeat session files: one
// engine being set, with its profile (geometry, what can be adjusted and
// how, how it is measured) and every cylinder's readings, round by round,
// as a setter takes them with a dial gauge on the valve spindle and marks
// on the wheel tyre. The format is described in format.md, beside this
// package's files.
//
// Units and conventions (the same as package setting):
//
//   - Lengths are mm, always, in the file and at the API; the display unit
//     (mm or inch) only says how to show them. ParseLength reads what the
//     user types ("0.005in", "5 thou", "1/16", "1 3/16", "0.13 mm");
//     FormatLength shows a reading to the gauge's hundredth or thou,
//     FormatInches a dimension as a drawing gives it ("1 3/16", "0.012").
//   - Angles are degrees. Crank angle is measured from front dead centre
//     in the forward running direction of the wheel.
//   - Marks round the wheel are mm round the tyre (TyreMM) or degrees
//     (Deg) from a datum the setter chooses, numbered so that they grow as
//     the wheel turns forward. Dead centre is midway between two bracketing
//     marks (Midway).
//   - Gauge readings are stored as read. Observations normalise them so
//     that they grow as the valve moves toward the front cover.
//
// Decode validates every value, reads files of this version (Version) and
// every older one, and refuses files of another format or a newer version;
// Encode always writes this version; Check gives warnings for values that
// are possible but unusual; Readiness says what a plan for a cylinder still
// lacks, and refuses readings that contradict one another (port marks,
// laps and the valve's travel; bracketed dead centres), naming the
// readings to take again, and an engine that could not run as described
// (a port that never opens in full gear), naming the dimension; the app and the command line run both before a
// plan, alike. Observations (RoundObservations, one round) turns the
// readings into the list a fitter works on. Heard keeps the beats heard
// in recordings of the exhaust: their gaps only, never the sound. Lists
// are bounded (MaxRounds, MaxRoundReadings, MaxSweepReadings, MaxChanges,
// MaxHeard, and
// setting's MaxCylinders and MaxNotches), generously for any engine, so
// that every command stays fast and small whatever the file.
// Version 2 added PlanAims, what the setter asks of the plan; a version 1
// file is read with none and written back as version 2. The profile (the
// engine, adjustments, measuring set-up and display unit) may be changed
// at any time by Edit, readings or not: the readings are kept, derived
// parts of the engine's design are derived again, and each value changed
// is kept in the file's history of the engine (EngineChanges). A cylinder that
// differs from the engine carries its Differences (a setting.EnginePatch),
// applied to the engine's values by CylinderEngine.
//
// The package imports only the standard library, evenbeat/setting and
// evenbeat/setting/jsonx.
package session
