package batch

import (
	"fmt"
	"io"
	"time"

	"slipfront/internal/plural"

	"github.com/schollz/progressbar/v3"
)

// progress reports a batch's advance. Calls are serialized by the caller.
type progress interface {
	// start: todo results to compute now, resumed already done of owned.
	start(todo, resumed, owned int)
	// step: one more result done.
	step()
	// finish: the run ended (ok false: failed or interrupted).
	finish(ok bool)
}

func newProgress(w io.Writer, terminal bool, every time.Duration) progress {
	switch {
	case w == nil:
		return silentProgress{}
	case terminal:
		return &barProgress{w: w}
	}
	if every <= 0 {
		every = 30 * time.Second
	}
	return &lineProgress{w: w, every: every, now: time.Now}
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
// done, or when every has passed since the last line.
type lineProgress struct {
	w                   io.Writer
	every               time.Duration
	now                 func() time.Time
	t0, last            time.Time
	todo, done, resumed int
	owned, tenth        int
}

func (p *lineProgress) start(todo, resumed, owned int) {
	p.todo, p.resumed, p.owned = todo, resumed, owned
	p.t0 = p.now()
	p.last = p.t0
	if resumed > 0 {
		fmt.Fprintf(p.w, "batch: %d of %s already done, %d to run\n", resumed, plural.S(owned, "result"), todo)
	} else {
		fmt.Fprintf(p.w, "batch: %s to run\n", plural.S(todo, "result"))
	}
}

func (p *lineProgress) step() {
	p.done++
	now := p.now()
	tenth := p.done * 10 / max(p.todo, 1)
	if tenth == p.tenth && now.Sub(p.last) < p.every {
		return
	}
	p.tenth, p.last = tenth, now
	elapsed := now.Sub(p.t0)
	rate := float64(p.done) / elapsed.Seconds()
	left := time.Duration(float64(p.todo-p.done) / rate * float64(time.Second))
	fmt.Fprintf(p.w, "batch: %d/%d done (%d%%), %.3g per s, about %s left\n",
		p.done, p.todo, p.done*100/max(p.todo, 1), rate, left.Round(time.Second))
}

func (p *lineProgress) finish(ok bool) {
	elapsed := p.now().Sub(p.t0).Round(time.Millisecond)
	if ok {
		fmt.Fprintf(p.w, "batch: %s computed in %s\n", plural.S(p.done, "result"), elapsed)
		return
	}
	fmt.Fprintf(p.w, "batch: stopped after %d of %s (%s)\n", p.done, plural.S(p.todo, "result"), elapsed)
}
