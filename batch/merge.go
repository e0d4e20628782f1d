package batch

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"slipfront/internal/outdir"
	"slipfront/internal/plural"
)

// Merge combines the shard folders of one batch into out and writes the
// aggregates there. The folders must hold the same batch (manifests equal
// apart from the shard index), one folder per shard 0 … n−1, each
// complete; otherwise Merge returns an error matching badinput.Err that names
// the folder and the difference or what is missing. The base scenario
// (ScenarioName) is copied from the shards that keep it, which must all
// keep the manifest's. out must not exist or
// be empty, or hold a batch when force is set (it is replaced, as by
// Options.Force; never one of the shard folders). Result files are
// hard-linked when possible, else copied. The merged folder is a complete
// batch of one shard: its files are the same bytes as those of the batch
// run in one process.
func Merge(ctx context.Context, dirs []string, out string, force bool) error {
	if len(dirs) == 0 {
		return inputErrorf("merge: no shard folders given")
	}
	for _, d := range dirs {
		if sameFolder(d, out) {
			return inputErrorf("merge: --out %s is one of the shard folders; choose a new folder", out)
		}
	}
	ms := make([]*Manifest, len(dirs))
	for i, d := range dirs {
		m, err := readManifestFile(d)
		if errors.Is(err, fs.ErrNotExist) {
			return inputErrorf("merge: %s is not a batch folder: it has no %s", d, ManifestName)
		}
		if err != nil {
			return inputError("merge", err)
		}
		if i > 0 {
			if field, want, got, differ := ms[0].difference(m, false); differ {
				return &MismatchError{Field: field, Want: want, Got: got, WantFrom: dirs[0], Dir: d}
			}
		}
		ms[i] = m
	}
	if err := checkShardSet(dirs, ms); err != nil {
		return err
	}
	for i, d := range dirs {
		if err := checkComplete(ctx, d, ms[i]); err != nil {
			return err
		}
	}
	scenario, err := shardScenario(dirs, ms[0])
	if err != nil {
		return err
	}
	if force {
		if err := clearBatchFolder(out); err != nil {
			return err
		}
	}
	if err := outdir.Prepare(out, false); err != nil {
		return inputError("merge", err)
	}
	merged := *ms[0]
	merged.Shard = Shard{Index: 0, Count: 1}
	if err := os.MkdirAll(filepath.Join(out, ResultsDir), 0o755); err != nil {
		return fmt.Errorf("batch: merge: %w", err)
	}
	if err := writeFileAtomic(out, ManifestName, func(w io.Writer) error { return WriteManifest(w, &merged) }); err != nil {
		return err
	}
	if scenario != nil {
		if err := writeBytesAtomic(out, ScenarioName, scenario); err != nil {
			return err
		}
	}
	for i, d := range dirs {
		for r := ms[i].Shard.Index; r < merged.Realizations; r += ms[i].Shard.Count {
			for c := range merged.Cases {
				if err := ctx.Err(); err != nil {
					return fmt.Errorf("batch: merge interrupted: %w", err)
				}
				if err := copyOrLink(filepath.Join(d, ResultName(c, r)), out, ResultName(c, r)); err != nil {
					return fmt.Errorf("batch: merge: %w", err)
				}
			}
		}
	}
	return aggregate(ctx, out, &merged, nil)
}

// checkShardSet checks that the folders are shards 0 … n−1 of n, once
// each.
func checkShardSet(dirs []string, ms []*Manifest) error {
	n := ms[0].Shard.Count
	owner := make([]string, n)
	for i, m := range ms {
		k := m.Shard.Index
		if owner[k] != "" {
			return inputErrorf("merge: %s and %s are both shard %s", owner[k], dirs[i], m.Shard)
		}
		owner[k] = dirs[i]
	}
	var missing []string
	for k, d := range owner {
		if d == "" {
			missing = append(missing, Shard{Index: k, Count: n}.String())
		}
	}
	if len(missing) > 0 {
		what := "shard " + missing[0] + " is"
		if len(missing) > 1 {
			what = "shards " + strings.Join(missing, ", ") + " are"
		}
		return inputErrorf("merge: %s missing: give all %d shard folders of the batch", what, n)
	}
	return nil
}

// checkComplete checks that a shard folder holds a valid result for every
// (case, realization) it owns.
func checkComplete(ctx context.Context, dir string, m *Manifest) error {
	var missing, bad int
	var first string
	for r := m.Shard.Index; r < m.Realizations; r += m.Shard.Count {
		for c := range m.Cases {
			if err := ctx.Err(); err != nil {
				return fmt.Errorf("batch: merge interrupted: %w", err)
			}
			_, err := readResultFile(dir, c, r, &m.Cases[c], nil)
			switch {
			case err == nil:
				continue
			case errors.Is(err, fs.ErrNotExist):
				missing++
			default:
				bad++
			}
			if first == "" {
				first = fmt.Sprintf("case %d realization %d: %v", c, r, err)
			}
		}
	}
	if missing+bad > 0 {
		return inputErrorf("merge: shard %s in %s is incomplete: %s missing and %d unreadable (first: %s); finish it with --resume",
			m.Shard, dir, plural.S(missing, "result"), bad, first)
	}
	return nil
}

// sameFolder reports whether a and b name the same existing folder.
func sameFolder(a, b string) bool {
	ia, errA := os.Stat(a)
	ib, errB := os.Stat(b)
	return errA == nil && errB == nil && os.SameFile(ia, ib)
}
