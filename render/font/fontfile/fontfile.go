// Package fontfile reads Go Regular and Go Bold from their TrueType files
// (golang.org/x/image/font/gofont) with github.com/golang/freetype: the
// reference the glyph tables in render/font are made from and checked
// against. Only tests import it, so no font file or parser reaches a
// program.
package fontfile

import (
	"github.com/golang/freetype/truetype"
	"golang.org/x/image/font"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/math/fixed"
)

// Parse returns Go Regular and Go Bold, in that order.
func Parse() ([2]*truetype.Font, error) {
	var fs [2]*truetype.Font
	for i, ttf := range [][]byte{goregular.TTF, gobold.TTF} {
		f, err := truetype.Parse(ttf)
		if err != nil {
			return fs, err
		}
		fs[i] = f
	}
	return fs, nil
}

// VMetrics returns f's ascent and descent (both positive) in font units,
// from its horizontal header.
func VMetrics(f *truetype.Font) (ascent, descent int) {
	upe := f.FUnitsPerEm()
	// At upe/64 pixels per em one 26.6 unit is one font unit, so the face
	// reports the header's values exactly.
	m := truetype.NewFace(f, &truetype.Options{Size: float64(upe) / 64, DPI: 72, Hinting: font.HintingNone}).Metrics()
	return int(m.Ascent), int(m.Descent)
}

// Units returns the em size at which freetype's 26.6 values are font units.
func Units(f *truetype.Font) fixed.Int26_6 { return fixed.Int26_6(f.FUnitsPerEm()) }
