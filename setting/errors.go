package setting

import "errors"

// Error is an error meant for the user: a full sentence that names the field
// at fault and, where it can, the fix.
//
// Field is a path of snake_case keys as in the engine file ("rod_length",
// "valve.front.steam_lap", "gear.walschaerts.radius_rod"); Message is the
// sentence to show the user. Error() gives both, "field: message", for logs
// and command-line tools.
type Error struct {
	Field   string // the input at fault, as a key path ("valve.front.port_width")
	Message string // a full sentence
}

// Error returns "field: message", or the message alone when Field is empty.
func (e *Error) Error() string {
	if e.Field == "" {
		return e.Message
	}
	return e.Field + ": " + e.Message
}

// within returns err with its field path placed under prefix: an *Error
// "rod_length" under "engine" becomes "engine.rod_length". Any other error
// becomes an *Error on prefix carrying err's text.
func within(prefix string, err error) error {
	if err == nil {
		return nil
	}
	var e *Error
	if errors.As(err, &e) {
		f := prefix
		if e.Field != "" && prefix != "" {
			f = prefix + "." + e.Field
		} else if e.Field != "" {
			f = e.Field
		}
		return &Error{f, e.Message}
	}
	return &Error{prefix, err.Error()}
}
