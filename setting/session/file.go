package session

import (
	"fmt"
	"os"
)

// ReadFile reads and checks the session file at path (see Decode); a
// decoding error says which file.
func ReadFile(path string) (*Session, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	s, err := Decode(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return s, nil
}
