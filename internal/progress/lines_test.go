package progress

import (
	"bytes"
	"fmt"
	"strings"
	"testing"
	"time"
)

// fakeClock is a clock the test moves by hand.
type fakeClock struct{ t time.Time }

func (c *fakeClock) now() time.Time      { return c.t }
func (c *fakeClock) add(d time.Duration) { c.t = c.t.Add(d) }
func countLines(b *bytes.Buffer) int     { return strings.Count(b.String(), "\n") }
func plain(s Status) string {
	return fmt.Sprintf("%g/%g %d%% %s", s.Done, s.Total, s.Percent(), s.LeftText())
}
func newTest(every time.Duration) (*Lines, *bytes.Buffer, *fakeClock) {
	var b bytes.Buffer
	c := &fakeClock{t: time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC)}
	return newLines(&b, every, plain, c.now), &b, c
}

// One line per tenth, however many updates fall within it.
func TestLinesPerTenth(t *testing.T) {
	l, b, c := newTest(time.Minute)
	for i := 1; i <= 1000; i++ {
		c.add(10 * time.Millisecond)
		l.Set(float64(i), 1000)
	}
	if n := countLines(b); n != 10 {
		t.Errorf("%d lines for 1000 updates, want 10 (one per tenth):\n%s", n, b)
	}
	if last := strings.Split(strings.TrimSpace(b.String()), "\n")[9]; last != "1000/1000 100% about 0s left" {
		t.Errorf("last line %q", last)
	}
}

// A tenth that takes longer than the interval still gets a line every
// interval, from tick; a tick within the interval writes none.
func TestLinesEveryInterval(t *testing.T) {
	l, b, c := newTest(time.Minute)
	l.Set(1, 100)
	c.add(30 * time.Second)
	l.tick()
	if n := countLines(b); n != 0 {
		t.Fatalf("a line after 30 s of a one-minute interval:\n%s", b)
	}
	c.add(30 * time.Second)
	l.tick()
	c.add(10 * time.Second)
	l.tick()
	c.add(50 * time.Second)
	l.tick()
	if n := countLines(b); n != 2 {
		t.Fatalf("%d lines after two minutes of ticks, want 2:\n%s", n, b)
	}
	// 1 of 100 done in 60 s: 99 more take 99 min at that pace.
	if first := strings.Split(b.String(), "\n")[0]; first != "1/100 1% about 1h39m0s left" {
		t.Errorf("first line %q", first)
	}
	l.Stop()
	c.add(time.Hour)
	l.tick()
	l.Set(100, 100)
	if n := countLines(b); n != 2 {
		t.Errorf("a line after Stop:\n%s", b)
	}
}

func TestStatus(t *testing.T) {
	tests := []struct {
		s       Status
		percent int
		left    string
	}{
		{Status{Done: 0, Total: 10, Elapsed: time.Second}, 0, ""},
		{Status{Done: 5, Total: 10, Elapsed: 10 * time.Second}, 50, "about 10s left"},
		{Status{Done: 3, Total: 0, Elapsed: time.Second}, 0, ""},
		{Status{Done: 12, Total: 10, Elapsed: time.Second}, 100, ""},
	}
	for _, tc := range tests {
		if p, left := tc.s.Percent(), tc.s.LeftText(); p != tc.percent || left != tc.left {
			t.Errorf("%+v: %d%% %q, want %d%% %q", tc.s, p, left, tc.percent, tc.left)
		}
	}
}

// The goroutine of Start writes lines while nothing calls Set, and none
// after Stop.
func TestStartWritesWhileIdle(t *testing.T) {
	var b safeBuffer
	l := Start(&b, 4*time.Millisecond, plain)
	l.Set(1, 10)
	deadline := time.Now().Add(10 * time.Second) // a bound, not a timing check
	for b.lines() < 3 && time.Now().Before(deadline) {
		time.Sleep(time.Millisecond)
	}
	l.Stop()
	n := b.lines()
	if n < 3 {
		t.Fatalf("%d lines while idle, want at least 3", n)
	}
	time.Sleep(20 * time.Millisecond)
	if b.lines() != n {
		t.Errorf("lines written after Stop")
	}
}
