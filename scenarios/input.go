package scenarios

import (
	"fmt"
	"io"
	"io/fs"
	"os"
	"strconv"
	"unicode/utf8"
)

// MaxInputBytes bounds every input file a scenario reads (the scenario
// itself and the files it names), so that a device, a runaway file or a
// wrong path cannot exhaust memory (common practice, no source: far above
// any real scenario or fracture table).
const MaxInputBytes = 64 << 20

// openInput opens name in fsys after checking that it is a regular file
// (not a folder, FIFO or device: a FIFO would block the open) of at most
// MaxInputBytes. Symbolic links are followed to what they name.
func openInput(fsys fs.FS, name string) (fs.File, error) {
	info, err := fs.Stat(fsys, name)
	if err != nil {
		return nil, err
	}
	if err := checkInput(name, info); err != nil {
		return nil, err
	}
	return fsys.Open(name)
}

// checkInput refuses what is not a regular file of at most MaxInputBytes.
func checkInput(name string, info fs.FileInfo) error {
	if !info.Mode().IsRegular() {
		return fmt.Errorf("%s is not a regular file (%s)", name, describeMode(info.Mode()))
	}
	if info.Size() > MaxInputBytes {
		return fmt.Errorf("%s holds %d bytes; input files may hold at most %d MB", name, info.Size(), MaxInputBytes>>20)
	}
	return nil
}

// readInputFile reads the whole input file at path, checked as by
// openInput; it also stops at MaxInputBytes if the file grows while being
// read.
func readInputFile(path string) ([]byte, error) {
	info, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if err := checkInput(path, info); err != nil {
		return nil, err
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, MaxInputBytes+1))
	if err != nil {
		return nil, err
	}
	if len(b) > MaxInputBytes {
		return nil, fmt.Errorf("%s grew beyond %d MB while being read", path, MaxInputBytes>>20)
	}
	return b, nil
}

func describeMode(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeDevice != 0, m&fs.ModeCharDevice != 0:
		return "a device"
	case m&fs.ModeSocket != 0:
		return "a socket"
	}
	return "mode " + m.String()
}

// maxEchoed is the longest value an error message repeats from the input,
// in characters, so that a huge or binary value cannot flood the terminal.
const maxEchoed = 60

// echo returns s quoted, shortened to maxEchoed characters with "…" when
// longer.
func echo(s string) string {
	if utf8.RuneCountInString(s) <= maxEchoed {
		return strconv.Quote(s)
	}
	r := []rune(s)
	return strconv.Quote(string(r[:maxEchoed])) + "…"
}
