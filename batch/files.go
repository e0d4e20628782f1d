package batch

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"slipfront/internal/csvw"
	"slipfront/internal/outdir"
)

// Names of the files in a batch folder.
const (
	ManifestName          = "manifest.json"
	ResultsDir            = "results"
	RealizationsName      = "realizations.csv"
	PercentilesName       = "percentiles.csv"
	ComparisonName        = "comparison.csv"
	WarningsName          = "warnings.csv"
	PairedName            = "paired.csv"
	PairedPercentilesName = "paired-percentiles.csv"
	SummaryName           = "summary.json"
	CSVMetadataName       = csvw.FileName
	ProbabilityDir        = "probability"
)

// ResultName is the path of the result file of case c, realization r,
// relative to the batch folder: results/c0001-r000042.sfr.
func ResultName(c, r int) string {
	return filepath.Join(ResultsDir, fmt.Sprintf("c%04d-r%06d.sfr", c, r))
}

// ProbabilityGridName is the path of case c's probability grid relative to
// the batch folder: probability/case-0001.csv.
func ProbabilityGridName(c int) string {
	return filepath.Join(ProbabilityDir, probabilityGridFile(c))
}

// probabilityGridFile is the name of case c's probability grid in the
// probability folder.
func probabilityGridFile(c int) string { return fmt.Sprintf("case-%04d.csv", c) }

// isTempName reports whether a file name is a temporary file of
// outdir.WriteFile (".NAME.tmp-RANDOM"), which is never read.
func isTempName(name string) bool {
	return strings.HasPrefix(name, ".") && strings.Contains(name, ".tmp-")
}

// writeFileAtomic writes dir/rel through a temporary file that is synced
// and renamed when complete, then syncs the folder so the rename survives
// a crash.
func writeFileAtomic(dir, rel string, write func(w io.Writer) error) error {
	full := filepath.Join(dir, rel)
	sub := filepath.Dir(full)
	if err := os.MkdirAll(sub, 0o755); err != nil {
		return err
	}
	if err := outdir.WriteFile(sub, filepath.Base(full), write); err != nil {
		return err
	}
	return syncDir(sub)
}

func writeBytesAtomic(dir, rel string, b []byte) error {
	return writeFileAtomic(dir, rel, func(w io.Writer) error {
		_, err := w.Write(b)
		return err
	})
}

func syncDir(dir string) error {
	f, err := os.Open(dir)
	if err != nil {
		return err
	}
	defer f.Close()
	if err := f.Sync(); err != nil && !errors.Is(err, os.ErrInvalid) {
		return fmt.Errorf("syncing %s: %w", dir, err)
	}
	return nil
}

// removeStaleTemps deletes temporary files left in dir by an interrupted
// writer. It returns how many it removed.
func removeStaleTemps(dir string) (int, error) {
	entries, err := os.ReadDir(dir)
	if errors.Is(err, fs.ErrNotExist) {
		return 0, nil
	}
	if err != nil {
		return 0, err
	}
	n := 0
	for _, e := range entries {
		if e.Type().IsRegular() && isTempName(e.Name()) {
			if err := os.Remove(filepath.Join(dir, e.Name())); err != nil {
				return n, err
			}
			n++
		}
	}
	return n, nil
}

// readResultFile reads and checks the result file of case c, realization
// r in folder dir. A missing file returns an error matching
// fs.ErrNotExist.
func readResultFile(dir string, c, r int, mc *ManifestCase, hooks *Hooks) (*Result, error) {
	path := filepath.Join(dir, ResultName(c, r))
	if hooks != nil && hooks.ReadResult != nil {
		hooks.ReadResult(path)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	res, err := ReadResult(bytes.NewReader(b))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if err := res.matches(c, r, mc); err != nil {
		return nil, fmt.Errorf("%s: %w", path, &FormatError{What: "result file", Offset: -1, Msg: err.Error()})
	}
	return res, nil
}

// readManifestFile reads dir/manifest.json; a missing file returns an
// error matching fs.ErrNotExist.
func readManifestFile(dir string) (*Manifest, error) {
	f, err := os.Open(filepath.Join(dir, ManifestName))
	if err != nil {
		return nil, err
	}
	defer f.Close()
	m, err := ReadManifest(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", filepath.Join(dir, ManifestName), err)
	}
	return m, nil
}

// copyOrLink puts src at dst: a hard link when the file system allows,
// otherwise an atomic copy.
func copyOrLink(src, dstDir, rel string) error {
	dst := filepath.Join(dstDir, rel)
	if err := os.Link(src, dst); err == nil {
		return nil
	}
	return writeFileAtomic(dstDir, rel, func(w io.Writer) error {
		f, err := os.Open(src)
		if err != nil {
			return err
		}
		defer f.Close()
		_, err = io.Copy(w, f)
		return err
	})
}
