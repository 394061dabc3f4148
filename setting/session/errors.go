package session

import (
	"strings"
	"unicode"

	"evenbeat/setting"
)

// userError builds the error type the whole program uses for bad input.
func userError(field, message string) *setting.Error {
	return &setting.Error{Field: field, Message: message}
}

// Warning is a value that is possible but unusual: worth a second look, not
// a reason to refuse the file.
type Warning struct {
	Field   string // JSON-path-like field name
	Message string // a full sentence
}

// String returns "field: message", as setting.Error does.
func (w Warning) String() string { return w.Field + ": " + w.Message }

// Problem is something that stops or weakens a plan for one cylinder: too
// few readings, readings that are all the same, readings that contradict.
type Problem struct {
	Field string // the field at fault, or the list that is too short
	// Blocking is true when no plan can be made until it is put right;
	// false when a plan can be made but will be weaker.
	Blocking bool
	Message  string // a full sentence saying what to do
}

// String returns "field: message", as setting.Error does.
func (p Problem) String() string { return p.Field + ": " + p.Message }

// sentence makes a message a full sentence: a message that starts with a
// lower-case word ("must be a number ...") gets the field's name in words
// as its subject ("The gauge reading must be a number ...").
func sentence(field, msg string) string {
	if msg == "" || !unicode.IsLower([]rune(msg)[0]) {
		return msg
	}
	return subject(field) + " " + msg
}

// fieldWords names the fields in words for messages.
var fieldWords = map[string]string{
	"gauge_mm":               "The gauge reading",
	"wheel_diameter_mm":      "The wheel diameter",
	"gauge_resolution_mm":    "The gauge resolution",
	"gauge_increases_toward": "The gauge direction",
	"mark_error_tyre_mm":     "The tyre-mark error",
	"mark_error_deg":         "The mark error",
	"display_unit":           "The display unit",
	"kind":                   "The kind",
	"eccentric":              "The eccentric",
	"min_mm":                 "The lower limit",
	"min_deg":                "The lower limit",
	"max_mm":                 "The upper limit",
	"max_deg":                "The upper limit",
	"thread":                 "The thread",
	"pitch_mm":               "The thread pitch",
	"tpi":                    "The threads per inch",
	"flats_per_turn":         "The number of flats per turn",
	"sheave_diameter_mm":     "The sheave diameter",
	"name":                   "The name",
	"note":                   "The note",
	"invented":               "The invented mark",
	"differences":            "The differences",
	"date":                   "The date",
	"front_gauge_mm":         "The front port mark",
	"back_gauge_mm":          "The back port mark",
	"front_lap_mm":           "The front lap",
	"back_lap_mm":            "The back lap",
	"centre_gauge_mm":        "The gauge reading at valve centre",
	"end":                    "The end",
	"port":                   "The port",
	"reverser":               "The reverser position",
	"direction":              "The direction",
	"tyre_mm":                "The tyre mark",
	"deg":                    "The degree mark",
	"crosshead_mm":           "The crosshead position",
	"dead_centre":            "The dead centre",
	"opening_mm":             "The opening",
	"change_mm":              "The change",
	"change_deg":             "The change",
	"marks_tyre_mm":          "The bracketing marks",
	"marks_deg":              "The bracketing marks",
	"engine":                 "The engine",
	"measuring":              "The measuring set-up",
	"port_marks":             "The port marks",
	"laps":                   "The laps",
	"cylinders":              "The list of cylinders",
	"rounds":                 "The list of rounds",
	"sweeps":                 "The list of sweeps",
	"readings":               "The list of readings",
	"adjustments":            "The list of adjustments",
	"adjustments_before":     "The list of changes",
	"dead_centres":           "The list of dead centres",
	"dead_centre_readings":   "The list of dead-centre readings",
	"cut_offs":               "The list of cut-off points",
	"feeler_openings":        "The list of feeler openings",
	"priority":               "The plan's priority",
	"target_lead_mm":         "The target lead",
	"lead_share":             "The share given to leads",
	"running_notch":          "The running notch",
	"engine_changes":         "The engine's history",
	"key":                    "The key",
	"before":                 "The value before",
	"after":                  "The value after",
	"derived":                "The derived mark",
}

// itemWords names one entry of a list.
var itemWords = map[string]string{
	"cylinders":            "This cylinder",
	"rounds":               "This round",
	"sweeps":               "This sweep",
	"readings":             "This reading",
	"adjustments":          "This adjustment",
	"adjustments_before":   "This change",
	"dead_centres":         "This dead centre",
	"dead_centre_readings": "This dead-centre reading",
	"cut_offs":             "This cut-off point",
	"feeler_openings":      "This feeler opening",
	"marks_tyre_mm":        "This mark",
	"marks_deg":            "This mark",
	"engine_changes":       "This record of the engine's history",
}

// subject names the value at field in words: "The gauge reading".
func subject(field string) string {
	if field == "" {
		return "The file"
	}
	last := field[strings.LastIndex(field, ".")+1:]
	if i := strings.IndexByte(last, '['); i >= 0 {
		if w, ok := itemWords[last[:i]]; ok {
			return w
		}
		return "This entry"
	}
	if w, ok := fieldWords[last]; ok {
		return w
	}
	return "The value"
}
