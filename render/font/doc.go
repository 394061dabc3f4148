// Package font holds the one font family every Evenbeat backend draws with,
// Go Regular and Go Bold (the Go fonts by Bigelow & Holmes, under the
// BSD-style licence in the LICENSE file beside this one), as tables made
// once from the TrueType files in golang.org/x/image/font/gofont: for each
// rune of a fixed character set its outline (quadratic contours, the
// TrueType points themselves), its advance width, the kerning pairs among
// the set, and each face's ascent, descent and units per em.
//
// The tables (tables.go) are generated: gen_test.go reads the TrueType
// files (package render/font/fontfile, github.com/golang/freetype/truetype)
// and writes them when run with EVENBEAT_WRITE_GLYPHS=1, and fails when the
// committed tables differ from what it makes now. So a program that draws text needs neither the
// TrueType files nor a font parser. Freetype-Go is used by those tests under
// the FreeType License (FTL.txt beside this file), which asks for this
// credit: portions of this software are copyright 2010 The FreeType Project
// (www.freetype.org). All rights reserved.
//
// Units: font units, y up, origin at the glyph's baseline-left (pen)
// point; UnitsPerEm of them make one em. A rune outside the set is the
// Fallback glyph (the font's own missing-glyph box), which has an outline
// and an advance like any other.
//
// The package imports nothing (its tests also fontfile, freetype and
// gofont); never ebiten or syscall/js.
package font
