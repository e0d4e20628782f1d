package snapshot

import (
	"errors"
	"fmt"
	"os"
)

// ReadCloser is a Reader of a snapshot file opened by Open; Close releases
// both the decoder and the file.
type ReadCloser struct {
	*Reader
	f *os.File
}

// Open opens the snapshot file name and reads its header and frame index
// (see NewReader). The caller must Close it.
func Open(name string) (*ReadCloser, error) {
	f, err := os.Open(name)
	if err != nil {
		return nil, err
	}
	info, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, err
	}
	if !info.Mode().IsRegular() {
		f.Close()
		return nil, fmt.Errorf("snapshot: %s is not a regular file", name)
	}
	r, err := NewReader(f, info.Size())
	if err != nil {
		f.Close()
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	return &ReadCloser{Reader: r, f: f}, nil
}

// Close releases the decoder and closes the file.
func (rc *ReadCloser) Close() error {
	return errors.Join(rc.Reader.Close(), rc.f.Close())
}
