package jsonxtest

import (
	"math/rand/v2"
	"strings"
)

// alphabet is what an inserted byte is drawn from: JSON's own punctuation,
// digits and literal letters, plus a NUL, a byte of invalid UTF-8 and the
// first byte of a two-byte letter.
const alphabet = "{}[]:,\"\\ \n0123456789.eE+-truefalsn\x00\xff\xc3"

// Edit returns a copy of base with up to max (at least one) random edits:
// a byte dropped, a byte put in, or a stretch of up to 40 bytes doubled.
func Edit(rng *rand.Rand, base []byte, max int) []byte {
	b := append([]byte(nil), base...)
	for range 1 + rng.IntN(max) {
		if len(b) == 0 {
			return b
		}
		i := rng.IntN(len(b))
		switch rng.IntN(3) {
		case 0:
			b = append(b[:i], b[i+1:]...)
		case 1:
			b = append(b[:i], append([]byte{alphabet[rng.IntN(len(alphabet))]}, b[i:]...)...)
		default:
			j := min(len(b), i+1+rng.IntN(40))
			b = append(b[:j], append(append([]byte(nil), b[i:j]...), b[j:]...)...)
		}
	}
	return b
}

// ReplaceNth replaces the nth occurrence (from 1) of old in s; s is
// returned as it is when there are fewer.
func ReplaceNth(s, old, new string, n int) string {
	i := -1
	for ; n > 0; n-- {
		j := strings.Index(s[i+1:], old)
		if j < 0 {
			return s
		}
		i += 1 + j
	}
	return s[:i] + new + s[i+len(old):]
}
