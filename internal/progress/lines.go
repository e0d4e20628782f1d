package progress

import (
	"fmt"
	"io"
	"sync"
	"time"
)

// DefaultInterval is the longest time between two lines while work runs.
const DefaultInterval = time.Minute

// Status is the advance of the work when a line is written.
type Status struct {
	// Done of Total, in the caller's units; Total 0 means not yet known.
	Done, Total float64
	// Elapsed wall time since Start.
	Elapsed time.Duration
}

// Percent is the share done, 0–100, rounded down.
func (s Status) Percent() int {
	if !(s.Total > 0) {
		return 0
	}
	return int(min(1, max(0, s.Done/s.Total)) * 100)
}

// Left is the time the rest of the work will take at the pace so far,
// rounded to the second; ok is false before any work is done.
func (s Status) Left() (left time.Duration, ok bool) {
	if !(s.Done > 0) || !(s.Total >= s.Done) {
		return 0, false
	}
	return time.Duration(float64(s.Elapsed) * (s.Total - s.Done) / s.Done).Round(time.Second), true
}

// LeftText is Left as "about 2m30s left", or "" when not known.
func (s Status) LeftText() string {
	if left, ok := s.Left(); ok {
		return fmt.Sprintf("about %s left", left)
	}
	return ""
}

// Lines writes progress lines to a writer. Its methods are safe for
// concurrent use.
type Lines struct {
	w     io.Writer
	line  func(Status) string
	every time.Duration
	now   func() time.Time

	mu          sync.Mutex
	t0, last    time.Time
	done, total float64
	tenth       int
	stopped     bool

	stop chan struct{}
	wg   sync.WaitGroup
}

// Start returns Lines that write line(status) and a newline to w whenever
// Set reaches another tenth of the total, and, from a goroutine, whenever
// every has passed without a line (every ≤ 0 means DefaultInterval). Stop
// ends it.
func Start(w io.Writer, every time.Duration, line func(Status) string) *Lines {
	if every <= 0 {
		every = DefaultInterval
	}
	l := newLines(w, every, line, time.Now)
	l.stop = make(chan struct{})
	l.wg.Go(func() {
		t := time.NewTicker(every / 4) // a line at most every/4 late
		defer t.Stop()
		for {
			select {
			case <-l.stop:
				return
			case <-t.C:
				l.tick()
			}
		}
	})
	return l
}

// newLines returns Lines without the goroutine, on the clock now.
func newLines(w io.Writer, every time.Duration, line func(Status) string, now func() time.Time) *Lines {
	l := &Lines{w: w, line: line, every: every, now: now}
	l.t0 = now()
	l.last = l.t0
	return l
}

// Set records done of total and writes a line when another tenth is done.
func (l *Lines) Set(done, total float64) {
	l.mu.Lock()
	defer l.mu.Unlock()
	l.done, l.total = done, total
	tenth := 0
	if total > 0 {
		tenth = int(min(1, done/total) * 10)
	}
	if tenth > l.tenth {
		l.tenth = tenth
		l.write()
	}
}

// tick writes a line when every has passed since the last one.
func (l *Lines) tick() {
	l.mu.Lock()
	defer l.mu.Unlock()
	if l.now().Sub(l.last) >= l.every {
		l.write()
	}
}

// write writes the line of the current status; l.mu is held.
func (l *Lines) write() {
	if l.stopped {
		return
	}
	now := l.now()
	l.last = now
	fmt.Fprintln(l.w, l.line(Status{Done: l.done, Total: l.total, Elapsed: now.Sub(l.t0)}))
}

// Stop ends the lines; none is written after it returns. It may be called
// more than once.
func (l *Lines) Stop() {
	l.mu.Lock()
	already := l.stopped
	l.stopped = true
	l.mu.Unlock()
	if l.stop != nil && !already {
		close(l.stop)
		l.wg.Wait()
	}
}
