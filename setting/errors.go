package setting

// Error is an error meant for the user: a full sentence that names the field
// at fault and, where it can, the fix.
type Error struct {
	Field   string // the input at fault, as the user knows it ("connecting rod length")
	Message string // a full sentence
}

func (e *Error) Error() string { return e.Message }
