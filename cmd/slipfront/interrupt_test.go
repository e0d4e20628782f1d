package main

import (
	"bytes"
	"context"
	"strings"
	"testing"
	"time"
)

// After an interrupt the program stops within the grace period even when
// the command does not return, with the interrupted exit code and a
// message; the signal handler is released first so that a second
// interrupt acts at once.
func TestStopAfterGrace(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	var stderr bytes.Buffer
	stopped := make(chan struct{})
	exited := make(chan int, 1)
	go stopAfterGrace(ctx, func() { close(stopped) }, 10*time.Millisecond, &stderr, func(code int) { exited <- code })
	select {
	case <-exited:
		t.Fatal("exited before the interrupt")
	case <-time.After(30 * time.Millisecond):
	}
	cancel()
	select {
	case code := <-exited:
		if code != exitInterrupted {
			t.Errorf("exit code %d, want %d", code, exitInterrupted)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("did not exit after the grace period")
	}
	select {
	case <-stopped:
	default:
		t.Error("the signal handler was not released")
	}
	if !strings.Contains(stderr.String(), "still busy") || !strings.Contains(stderr.String(), ".partial") {
		t.Errorf("message %q", stderr.String())
	}
}
