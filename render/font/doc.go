// Package font holds the one font family every Evenbeat backend draws with:
// Go Regular and Go Bold, the Go fonts by Bigelow & Holmes, under the
// BSD-style licence in the LICENSE file beside this one.
//
// The TrueType bytes come from golang.org/x/image/font/gofont; they are
// parsed once, on first use, with github.com/golang/freetype/truetype, so the
// PNG backend and the browser draw the very same glyph outlines.
//
// Freetype-Go is used under the FreeType License (FTL.txt beside this
// file), which asks for this credit: portions of this software are
// copyright 2010 The FreeType Project (www.freetype.org). All rights
// reserved.
//
// The package imports only x/image and freetype; never ebiten or syscall/js.
package font
