package setting

import (
	"strings"
	"testing"
	"unicode"
)

// TestCautionsCoverSection8 checks that every point of the cautions the
// product must show is present. The list of points is the product's own
// safety brief (common practice, no source).
func TestCautionsCoverSection8(t *testing.T) {
	all := strings.ToLower(strings.Join(Cautions(), " "))
	for _, want := range []string{
		"cold", "no steam", "air", "drain cocks", "regulator", "chock",
		"fingers", "motion", "never test", "anyone", "full-size",
		"railway's own procedures", "competent-person", "local codes", "licensed practice",
	} {
		if !strings.Contains(all, want) {
			t.Errorf("cautions do not mention %q", want)
		}
	}
}

func TestCautionsAreFullSentences(t *testing.T) {
	c := Cautions()
	if len(c) < 4 {
		t.Fatalf("only %d cautions", len(c))
	}
	for i, s := range c {
		r := []rune(s)
		if len(r) < 20 || !unicode.IsUpper(r[0]) || !strings.HasSuffix(s, ".") {
			t.Errorf("caution %d is not a full sentence: %q", i, s)
		}
	}
}

func TestCautionsFreshSlice(t *testing.T) {
	a := Cautions()
	a[0] = "changed"
	if Cautions()[0] == "changed" {
		t.Error("Cautions shares its slice between calls")
	}
}
