package main

import (
	"io"
	"os"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// progress is a bar on stderr when it is a terminal, nothing otherwise.
type progress struct {
	bar *progressbar.ProgressBar
}

// newProgress returns a progress bar from 0 to 1 drawn on stderr when
// stderr is a terminal and --quiet is not set.
func newProgress(g *globalOptions, stderr io.Writer, what string) *progress {
	f, ok := stderr.(*os.File)
	if g.quiet || !ok || !term.IsTerminal(int(f.Fd())) {
		return &progress{}
	}
	return &progress{bar: progressbar.NewOptions(1000, progressbar.OptionSetWriter(stderr),
		progressbar.OptionSetDescription(what), progressbar.OptionShowElapsedTimeOnFinish(),
		progressbar.OptionSetPredictTime(true), progressbar.OptionClearOnFinish())}
}

// set shows the fraction done, 0–1.
func (p *progress) set(fraction float64) {
	if p.bar != nil {
		p.bar.Set(int(min(1, max(0, fraction)) * 1000))
	}
}

func (p *progress) done() {
	if p.bar != nil {
		p.bar.Finish()
	}
}
