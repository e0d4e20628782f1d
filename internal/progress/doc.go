// Package progress writes progress as plain lines for logs, where a
// redrawn bar would be noise or nothing at all: a Slurm output file, a
// pipe, a file. A line is written whenever another tenth of the work is
// done, and at least every interval (DefaultInterval, one minute) while
// the work runs, so that a long step or realization still shows that the
// job is alive.
//
// # Units
//
// Done and Total are in the caller's units (results, simulated seconds);
// times are wall-clock durations.
//
// # Conventions
//
// The time left is the elapsed time scaled by the work left over the work
// done: a linear extrapolation, unknown until some work is done.
//
// # References
//
// None: common practice, no source.
package progress
