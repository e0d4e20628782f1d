package main

import (
	"bytes"
	"context"
	"path/filepath"
	"strings"
	"testing"

	"github.com/spf13/cobra"

	"slipfront/batch"
	"slipfront/scenarios"
)

// A panic is a bug in slipfront, never bad input: the command line exits
// 3 with "internal error", the stack and how to report it, whether the
// panic happens in the command itself or in a batch worker's goroutine
// (batch.Run recovers it there and hands it back). No command panics on
// purpose, so the test adds two that do to the real root command.
func TestPanicIsInternalError(t *testing.T) {
	out := filepath.Join(t.TempDir(), "batch")
	panicking := []struct {
		cmd  *cobra.Command
		want string // the panic's value and where it happened
	}{
		{&cobra.Command{Use: "index", RunE: func(*cobra.Command, []string) error {
			var empty []int
			_ = empty[len(out)] // index out of range
			return nil
		}}, "runtime error: index out of range"},
		{&cobra.Command{Use: "worker", RunE: func(cmd *cobra.Command, _ []string) error {
			_, err := batch.Run(cmd.Context(), batch.Options{
				Load: func(extra ...scenarios.Override) (*scenarios.Scenario, error) {
					return scenarios.LoadExample("single-fracture", extra...)
				},
				Realizations: 1, Workers: 1, Out: out,
				Run: func(context.Context, *scenarios.Scenario, int) (*batch.Outcome, error) {
					panic("a realization failed an internal check")
				},
			})
			return err
		}}, "a realization failed an internal check"},
	}
	for _, tc := range panicking {
		c := tc.cmd
		t.Run(c.Use, func(t *testing.T) {
			var g globalOptions
			var stdout, stderr bytes.Buffer
			root := newRootCmd(&g, &stdout, &stderr)
			root.AddCommand(c)
			root.SetArgs([]string{c.Use})
			code := execute(context.Background(), root, &stderr)
			msg := stderr.String()
			if code != exitInternal {
				t.Errorf("exit %d, want %d (internal error)\n%s", code, exitInternal, msg)
			}
			for _, want := range []string{"slipfront: internal error: " + tc.want, "TestPanicIsInternalError", "this is a bug in slipfront", "please report it"} {
				if !strings.Contains(msg, want) {
					t.Errorf("stderr lacks %q:\n%s", want, msg)
				}
			}
			if strings.Contains(msg, "interrupted") {
				t.Errorf("a panic reported as an interrupt:\n%s", msg)
			}
		})
	}
}
