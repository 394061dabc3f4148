package font

import (
	"sync"

	"github.com/golang/freetype/truetype"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
)

// regular and bold parse the embedded fonts once. They are set when the
// package loads and never reassigned; the parsed fonts are read-only.
var (
	regular = sync.OnceValue(func() *truetype.Font { return mustParse(goregular.TTF) })
	bold    = sync.OnceValue(func() *truetype.Font { return mustParse(gobold.TTF) })
)

// mustParse parses embedded font bytes. They are fixed at build time, so a
// failure is a programmer error and panics.
func mustParse(ttf []byte) *truetype.Font {
	f, err := truetype.Parse(ttf)
	if err != nil {
		panic("render/font: embedded font does not parse: " + err.Error())
	}
	return f
}

// Regular returns the parsed Go Regular font. The value is shared and must
// be treated as read-only; it is safe for concurrent use.
func Regular() *truetype.Font { return regular() }

// Bold returns the parsed Go Bold font, shared and read-only like Regular.
func Bold() *truetype.Font { return bold() }

// Get returns Bold when bold is true, else Regular.
func Get(bold bool) *truetype.Font {
	if bold {
		return Bold()
	}
	return Regular()
}
