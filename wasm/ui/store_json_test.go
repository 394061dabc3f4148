package ui

import (
	"encoding/json"
	"fmt"
	"reflect"
	"testing"
)

// The stored list of sessions is read and written as encoding/json (the
// reference) did, so lists saved by earlier versions still open and a
// damaged one is reported in the same words.
func TestIndexAsEncodingJSON(t *testing.T) {
	for _, keys := range [][]string{nil, {}, {"session/1"}, {"session/a&b", "session/<x>", "session/é\u2028\"q\""}} {
		want, _ := json.Marshal(keys)
		if got := encodeIndex(keys); string(got) != string(want) {
			t.Errorf("encodeIndex(%q) = %s, want %s", keys, got, want)
		}
	}
	for _, raw := range []string{`null`, `[]`, `["a","b"]`, `["a",null]`, `[null]`, ` ["\u00e9"] `, ``, ` `, `[`, `["a",]`,
		`{}`, `"x"`, `1`, `true`, `[1]`, `["a",true]`, `[[1]]`, `[{"a":1}]`, `[1e999]`, `["a"] x`} {
		var want []string
		wantErr := json.Unmarshal([]byte(raw), &want)
		got, err := decodeIndex([]byte(raw))
		if fmt.Sprint(err) != fmt.Sprint(wantErr) {
			t.Errorf("%q: error %v, want %v", raw, err, wantErr)
			continue
		}
		if err == nil && !reflect.DeepEqual(got, want) {
			t.Errorf("%q: %q, want %q", raw, got, want)
		}
	}
}
