// Package jsonx reads and writes JSON without reflection, so that the
// browser build does not carry encoding/json.
//
// Reading: Parse turns a document into a tree of Values, keys kept in file
// order, numbers kept as the text written, every value with its byte span.
// It accepts exactly what encoding/json accepts (RFC 8259 grammar; bytes of
// invalid UTF-8 inside strings are taken as U+FFFD, as encoding/json does),
// and a refusal is a *SyntaxError with encoding/json's wording and offset, so
// messages built on it read the same as before. Options add what a strict
// file format wants: a depth bound and refusing a key written twice.
//
// Writing: AppendString and AppendFloat write strings and numbers as
// encoding/json does (same escapes, same number forms); Writer lays out a
// whole document, compact or indented like json.MarshalIndent.
//
// It imports only the standard library.
package jsonx
