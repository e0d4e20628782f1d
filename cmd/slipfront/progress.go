package main

import (
	"fmt"
	"io"
	"os"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"

	"slipfront/internal/progress"
)

// progressView shows a long task's advance on stderr: a redrawn bar when
// stderr is a terminal, plain lines otherwise (a Slurm log, a pipe: one
// every tenth of the work and at least every minute), nothing with
// --quiet.
type progressView struct {
	bar   *progressbar.ProgressBar
	lines *progress.Lines
}

// newProgress returns the view of a task named what (e.g. "simulating")
// whose advance is given as done of total; unit names the units of done
// and total in the lines, with scale dividing the values first (e.g. "h"
// and 3600 for simulated seconds shown in hours).
func newProgress(g *globalOptions, stderr io.Writer, what, unit string, scale float64) *progressView {
	if g.quiet {
		return &progressView{}
	}
	if f, ok := stderr.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		return &progressView{bar: progressbar.NewOptions(1000, progressbar.OptionSetWriter(stderr),
			progressbar.OptionSetDescription(what), progressbar.OptionShowElapsedTimeOnFinish(),
			progressbar.OptionSetPredictTime(true), progressbar.OptionClearOnFinish())}
	}
	return &progressView{lines: progress.Start(stderr, progress.DefaultInterval, func(s progress.Status) string {
		return progressLine(what, unit, scale, s)
	})}
}

// progressLine is one line of a task's advance: "simulating: 40% (1.2 of
// 3 h), 35s elapsed, about 52s left".
func progressLine(what, unit string, scale float64, s progress.Status) string {
	line := fmt.Sprintf("%s: %d%% (%.3g of %.3g %s), %s elapsed", what, s.Percent(), s.Done/scale, s.Total/scale, unit, s.Elapsed.Round(1e9))
	if left := s.LeftText(); left != "" {
		line += ", " + left
	}
	return line
}

// set shows done of total.
func (p *progressView) set(done, total float64) {
	switch {
	case p.bar != nil && total > 0:
		p.bar.Set(int(min(1, max(0, done/total)) * 1000))
	case p.lines != nil:
		p.lines.Set(done, total)
	}
}

// done ends the view.
func (p *progressView) done() {
	switch {
	case p.bar != nil:
		p.bar.Finish()
	case p.lines != nil:
		p.lines.Stop()
	}
}
