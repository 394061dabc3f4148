package ui

import (
	"testing"

	"evenbeat/setting/session"
)

// TestFractionKeys: inch lengths are typed as they are written off a
// drawing ("1 3/16"): the space once, after whole inches; the bar once,
// after the numerator, never in a decimal; a point never in a fraction.
// The text is one session.ParseLength reads, and a fraction is whole once
// its bottom is 2 to 64.
func TestFractionKeys(t *testing.T) {
	for _, c := range []struct {
		keys  []Key
		want  string
		whole bool
	}{
		{[]Key{Key1, KeySpace, Key3, KeySlash, Key1, Key6}, "1 3/16", true},
		{[]Key{Key3, KeySlash, Key3, Key2}, "3/32", true},
		{[]Key{Key3, KeySlash, Key3}, "3/3", false},
		{[]Key{KeySpace, Key1, KeySpace, KeySpace, Key1, KeySlash, KeySlash, Key4}, "1 1/4", true},
		{[]Key{Key1, KeyPoint, Key5, KeySlash, KeySpace}, "1.5", false},
		{[]Key{Key1, KeySlash, KeyPoint, Key8}, "1/8", true},
		{[]Key{KeySign, Key1, KeySlash, Key6, Key4}, "-1/64", true},
		{[]Key{Key5, KeySpace, KeyDelete, KeySlash, Key2}, "5/2", true},
	} {
		text := ""
		for _, k := range c.keys {
			text = press(text, k)
		}
		if text != c.want || wholeFraction(text) != c.whole {
			t.Errorf("%v: typed %q (whole %v), want %q (whole %v)", c.keys, text, wholeFraction(text), c.want, c.whole)
		}
		if _, err := session.ParseLength(text, session.UnitInch); err != nil && c.whole {
			t.Errorf("%q does not read: %v", text, err)
		}
	}
}
