package batch

import (
	"fmt"
	"io"
	"time"

	"slipfront/internal/plural"
	"slipfront/internal/progress"

	"github.com/schollz/progressbar/v3"
)

// reporter reports a batch's advance. Calls are serialized by the caller.
type reporter interface {
	// start: todo results to compute now, resumed already done of owned.
	start(todo, resumed, owned int)
	// step: one more result done.
	step()
	// finish: the run ended (ok false: failed or interrupted).
	finish(ok bool)
}

func newReporter(w io.Writer, terminal bool, every time.Duration) reporter {
	switch {
	case w == nil:
		return silentProgress{}
	case terminal:
		return &barProgress{w: w}
	}
	return &lineProgress{w: w, every: every}
}

type silentProgress struct{}

func (silentProgress) start(int, int, int) {}
func (silentProgress) step()               {}
func (silentProgress) finish(bool)         {}

// barProgress redraws one line with a bar, count, rate and time left.
type barProgress struct {
	w   io.Writer
	bar *progressbar.ProgressBar
}

func (p *barProgress) start(todo, resumed, owned int) {
	if todo == 0 {
		fmt.Fprintf(p.w, "batch: all %s already done\n", plural.S(owned, "result"))
		return
	}
	desc := "realizations"
	if resumed > 0 {
		desc = fmt.Sprintf("realizations (%d of %d resumed)", resumed, owned)
	}
	p.bar = progressbar.NewOptions(todo,
		progressbar.OptionSetWriter(p.w),
		progressbar.OptionSetDescription(desc),
		progressbar.OptionShowCount(),
		progressbar.OptionShowIts(),
		progressbar.OptionSetItsString("real"),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionSetElapsedTime(true),
		progressbar.OptionSetWidth(30),
		progressbar.OptionThrottle(100*time.Millisecond),
		progressbar.OptionSetRenderBlankState(true),
		progressbar.OptionOnCompletion(func() { fmt.Fprintln(p.w) }),
	)
}

func (p *barProgress) step() { _ = p.bar.Add(1) }

func (p *barProgress) finish(ok bool) {
	if p.bar == nil {
		return
	}
	if ok {
		_ = p.bar.Finish()
		return
	}
	_ = p.bar.Exit()
	fmt.Fprintln(p.w)
}

// lineProgress writes a plain line whenever another tenth of the work is
// done, and at least every interval while it runs (internal/progress).
type lineProgress struct {
	w          io.Writer
	every      time.Duration
	lines      *progress.Lines
	t0         time.Time
	todo, done int
}

func (p *lineProgress) start(todo, resumed, owned int) {
	p.todo, p.t0 = todo, time.Now()
	if resumed > 0 {
		fmt.Fprintf(p.w, "batch: %d of %s already done, %d to run\n", resumed, plural.S(owned, "result"), todo)
	} else {
		fmt.Fprintf(p.w, "batch: %s to run\n", plural.S(todo, "result"))
	}
	if todo == 0 {
		return
	}
	p.lines = progress.Start(p.w, p.every, func(s progress.Status) string {
		rate := s.Done / s.Elapsed.Seconds()
		line := fmt.Sprintf("batch: %.0f/%.0f done (%d%%), %.3g per s", s.Done, s.Total, s.Percent(), rate)
		if left := s.LeftText(); left != "" {
			line += ", " + left
		}
		return line
	})
}

func (p *lineProgress) step() {
	p.done++
	p.lines.Set(float64(p.done), float64(p.todo))
}

func (p *lineProgress) finish(ok bool) {
	if p.lines != nil {
		p.lines.Stop()
	}
	elapsed := time.Since(p.t0).Round(time.Millisecond)
	if ok {
		fmt.Fprintf(p.w, "batch: %s computed in %s\n", plural.S(p.done, "result"), elapsed)
		return
	}
	fmt.Fprintf(p.w, "batch: stopped after %d of %s (%s)\n", p.done, plural.S(p.todo, "result"), elapsed)
}
