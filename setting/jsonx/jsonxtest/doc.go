// Package jsonxtest makes broken and bent JSON documents for tests that
// compare a reader with a reference: byte-level random edits and
// replacements of one occurrence. It imports only the standard library.
package jsonxtest
