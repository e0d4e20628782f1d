package main

import (
	"errors"
	"io"

	"slipfront/dfn"
	"slipfront/scenarios"
)

// statusWriter is where status lines go: stderr, or nowhere with --quiet.
func statusWriter(g *globalOptions, stderr io.Writer) io.Writer {
	if g.quiet {
		return io.Discard
	}
	return stderr
}

// generateNetwork generates realization r, marking a scenario that would
// make too many fractures as bad input.
func generateNetwork(s *scenarios.Scenario, r int) (*dfn.Network, error) {
	net, err := dfn.Generate(s, r)
	if errors.Is(err, dfn.ErrTooManyFractures) {
		return nil, badInput(err)
	}
	return net, err
}
