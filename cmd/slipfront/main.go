// Command slipfront generates stochastic fracture networks, simulates
// injection into them and maps the stimulated area. Run "slipfront help"
// for the commands.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
	"time"
)

// interruptGrace is how long slipfront lets a command wind down after an
// interrupt before it stops anyway: most work checks for the interrupt
// between steps, but some cannot stop midway (drawing a large network,
// building the elastic operator), and a batch scheduler's SIGTERM is
// followed by SIGKILL after a while (30 s by default in Slurm; common
// practice, no source).
const interruptGrace = 10 * time.Second

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	go stopAfterGrace(ctx, stop, interruptGrace, os.Stderr, os.Exit)
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// stopAfterGrace waits for ctx to end (an interrupt), restores the default
// signal behaviour with stop (so a second interrupt stops the program at
// once), and, if the program is still running grace later, says so and
// exits with the interrupted code: what was written is kept (outputs are
// written under temporary names, a run's folder as DIR.partial).
func stopAfterGrace(ctx context.Context, stop func(), grace time.Duration, stderr io.Writer, exit func(int)) {
	<-ctx.Done()
	stop()
	time.Sleep(grace)
	fmt.Fprintf(stderr, "slipfront: still busy %v after the interrupt (in work that cannot stop midway); stopping now; files already written are kept, a run's in its .partial folder\n", grace)
	exit(exitInterrupted)
}
