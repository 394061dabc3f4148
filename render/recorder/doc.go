// Package recorder is a render.Canvas that draws nothing and logs every
// call as a line of text with coordinates rounded to 0.01 logical units, so
// a diagram's output can be compared as a text golden, identically on
// every machine. It also keeps the calls, so tests can check that a
// diagram stays inside its box and that its labels do not overlap.
//
// Units are render's: logical units (CSS px), origin top-left, y down. The
// package imports only render and the standard library.
package recorder
