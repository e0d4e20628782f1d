package progress

import (
	"bytes"
	"strings"
	"sync"
)

// safeBuffer is a bytes.Buffer for one writer goroutine and a reader.
type safeBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *safeBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *safeBuffer) lines() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return strings.Count(s.b.String(), "\n")
}
