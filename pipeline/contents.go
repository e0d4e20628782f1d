package pipeline

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"

	"slipfront/internal/badinput"
	"slipfront/internal/outdir"
	"slipfront/scenarios"
	"slipfront/snapshot"
)

// RunContents is what ContentsFile records of a complete run folder: the
// run it belongs to and every other file with its size and SHA-256
// (FIPS 180-4). A folder without it is a stopped run's partial folder; a
// file that differs from its entry was changed or mixed in from another
// run, and readers refuse it.
type RunContents struct {
	Format         int         `json:"format"`
	ScenarioDigest string      `json:"scenario_digest"`
	Realization    int         `json:"realization"`
	Files          []FileEntry `json:"files"`
}

// FileEntry is one file of a run folder.
type FileEntry struct {
	Name   string `json:"name"`
	Bytes  int64  `json:"bytes"`
	SHA256 string `json:"sha256"`
}

// contentsFormat is the version of ContentsFile.
const contentsFormat = 1

// writeContents lists every file in dir (but temporary files) into
// ContentsFile.
func writeContents(dir string, s *scenarios.Scenario, realization int) error {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	c := RunContents{Format: contentsFormat, ScenarioDigest: s.Digest, Realization: realization, Files: []FileEntry{}}
	for _, e := range entries {
		if !e.Type().IsRegular() || e.Name() == ContentsFile || tempFile.MatchString(e.Name()) {
			continue
		}
		f, err := hashFile(filepath.Join(dir, e.Name()))
		if err != nil {
			return err
		}
		c.Files = append(c.Files, f)
	}
	return writeFiles(dir, namedWriter{ContentsFile, func(w io.Writer) error {
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(c)
	}})
}

func hashFile(path string) (FileEntry, error) {
	f, err := os.Open(path)
	if err != nil {
		return FileEntry{}, err
	}
	defer f.Close()
	h := sha256.New()
	n, err := io.Copy(h, f)
	if err != nil {
		return FileEntry{}, err
	}
	return FileEntry{Name: filepath.Base(path), Bytes: n, SHA256: hex.EncodeToString(h.Sum(nil))}, nil
}

// readContents reads dir's ContentsFile; a folder without one gives an
// error matching fs.ErrNotExist.
func readContents(dir string) (*RunContents, error) {
	b, err := os.ReadFile(filepath.Join(dir, ContentsFile))
	if err != nil {
		return nil, err
	}
	var c RunContents
	if err := json.Unmarshal(b, &c); err != nil || c.Format != contentsFormat {
		return nil, badinput.Errorf("%s: not a contents list of this program's version (format %d): %v",
			filepath.Join(dir, ContentsFile), c.Format, err)
	}
	return &c, nil
}

// verify checks that each named file of dir is the one listed.
func (c *RunContents) verify(dir string, names ...string) error {
	for _, name := range names {
		i := slices.IndexFunc(c.Files, func(f FileEntry) bool { return f.Name == name })
		if i < 0 {
			return badinput.Errorf("%s is not listed in %s: the folder was changed after the run", name, ContentsFile)
		}
		got, err := hashFile(filepath.Join(dir, name))
		if err != nil {
			return err
		}
		if got != c.Files[i] {
			return badinput.Errorf("%s differs from the file the run wrote (%d bytes, SHA-256 %.12s…; listed %d bytes, %.12s…): the folder mixes two runs or was changed",
				name, got.Bytes, got.SHA256, c.Files[i].Bytes, c.Files[i].SHA256)
		}
	}
	return nil
}

// openRunFolder reads the contents list of the run folder dir and checks
// the named files against it. A folder without a list is accepted as a
// stopped run's partial folder: the list is nil and the returned note
// says so ("" for a complete folder).
func openRunFolder(dir string, s *scenarios.Scenario, names ...string) (c *RunContents, note string, err error) {
	c, err = readContents(dir)
	if errors.Is(err, fs.ErrNotExist) {
		why := "the run did not finish"
		if outdir.IsPartial(dir) {
			why = "this is a stopped run's partial folder"
		}
		return nil, fmt.Sprintf("%s has no %s: %s; its snapshot frames are used as recovered", dir, ContentsFile, why), nil
	}
	if err != nil {
		return nil, "", err
	}
	if c.ScenarioDigest != s.Digest {
		return nil, "", badinput.Errorf("%s belongs to scenario %.12s…, but %s is scenario %.12s…: the folder mixes two runs",
			ContentsFile, c.ScenarioDigest, ScenarioFile, s.Digest)
	}
	return c, "", c.verify(dir, names...)
}

// verifySnapshot checks the snapshot of a complete run folder against
// its contents list. A snapshot that differs from the listed file is
// still the run's own when its header names the listed scenario and
// realization and the differences are damage the format detects (frames
// failing their checksums, or a cut or broken index it recovered from):
// the note says so and the intact frames serve. Anything else is a
// swapped file.
func (c *RunContents) verifySnapshot(dir string, rd *snapshot.ReadCloser) (note string, err error) {
	err = c.verify(dir, SnapshotFile)
	if err == nil {
		return "", nil
	}
	h := rd.Header()
	if h.Digest != c.ScenarioDigest || h.Realization != c.Realization {
		return "", err
	}
	damaged := 0
	for i := range rd.Frames() {
		if errors.Is(rd.CheckFrame(i), snapshot.ErrFormat) {
			damaged++
		}
	}
	if damaged == 0 && !rd.Recovered() {
		return "", err
	}
	return fmt.Sprintf("%s was damaged after the run (it differs from the file the run wrote; %d of its %d frames fail their checksums): the intact frames are used",
		SnapshotFile, damaged, len(rd.Frames())), nil
}
