package listen

import "fmt"

// Error is a refusal meant for the user: Message is a full sentence saying
// what is wrong with the input and what to do about it; Field names the
// input at fault in the user's words ("recording", "beats a turn",
// "predicted beats").
type Error struct {
	Field   string
	Message string
}

// Error returns the sentence; the field is for whoever shows it.
func (e *Error) Error() string { return e.Message }

// refuse is a refusal of the recording.
func refuse(format string, args ...any) error {
	return &Error{Field: "recording", Message: fmt.Sprintf(format, args...)}
}
