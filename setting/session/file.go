package session

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
)

// ReadFile reads and checks the session file at path (see Decode); a
// decoding error says which file.
func ReadFile(path string) (*Session, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, openError(path, err)
	}
	defer f.Close()
	s, err := Decode(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return s, nil
}

// openError says in a sentence that the file at path cannot be opened, and
// why (without repeating the path, as os's errors do).
func openError(path string, err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		err = pe.Err
	}
	return fmt.Errorf("%s: the file cannot be opened (%v); check its name and the folder it is in", path, err)
}
