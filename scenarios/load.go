package scenarios

import (
	"crypto/sha256"
	"embed"
	"encoding/hex"
	"encoding/json"
	"errors"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"reflect"
	"slices"
	"sort"
	"strings"

	"slipfront/internal/badinput"
	"slipfront/internal/outdir"

	"github.com/BurntSushi/toml"

	"slipfront/gis"
)

//go:embed examples/*.toml examples/*.csv
var examples embed.FS

// Examples lists the embedded example scenarios by name (without .toml).
func Examples() []string {
	entries, _ := fs.Glob(examples, "examples/*.toml")
	names := make([]string, len(entries))
	for i, e := range entries {
		names[i] = strings.TrimSuffix(path.Base(e), ".toml")
	}
	sort.Strings(names)
	return names
}

// ExampleSource returns the TOML text of an embedded example.
func ExampleSource(name string) ([]byte, error) {
	src, err := examples.ReadFile("examples/" + strings.TrimSuffix(name, ".toml") + ".toml")
	if err != nil {
		return nil, badinput.Errorf("no example scenario %q; examples: %s", name, strings.Join(Examples(), ", "))
	}
	return src, nil
}

// ExampleFile is one file of an embedded example.
type ExampleFile struct {
	Name string
	Data []byte
}

// ExampleFiles returns the files of an embedded example: its TOML first,
// then every file it names (the known-fracture table, a CRS WKT file), so
// that the files written side by side load as the example does.
func ExampleFiles(name string) ([]ExampleFile, error) {
	s, err := LoadExample(name)
	if err != nil {
		return nil, err
	}
	src, err := ExampleSource(name)
	if err != nil {
		return nil, err
	}
	files := []ExampleFile{{Name: strings.TrimSuffix(name, ".toml") + ".toml", Data: src}}
	for _, f := range []string{s.KnownFractures.File, s.Domain.CRSWKT} {
		if f == "" {
			continue
		}
		data, err := examples.ReadFile(path.Join("examples", f))
		if err != nil {
			panic("scenarios: example " + name + " names a file it lacks: " + err.Error())
		}
		files = append(files, ExampleFile{Name: f, Data: data})
	}
	return files, nil
}

// WriteExample writes the files of an embedded example (ExampleFiles)
// into the folder dir and returns their paths. The folder is written as a
// whole, through dir + ".partial" (internal/outdir): an existing dir is
// replaced only with force, and only when it holds nothing but files of
// that example.
func WriteExample(name, dir string, force bool) ([]string, error) {
	files, err := ExampleFiles(name)
	if err != nil {
		return nil, err
	}
	ours := func(n string) bool {
		return slices.ContainsFunc(files, func(f ExampleFile) bool { return f.Name == n })
	}
	st, err := outdir.Begin(dir, force, ours)
	if err != nil {
		return nil, err
	}
	var paths []string
	for _, f := range files {
		if err := outdir.WriteFile(st.Dir, f.Name, func(w io.Writer) error { _, err := w.Write(f.Data); return err }); err != nil {
			st.Abandon()
			return nil, err
		}
		paths = append(paths, filepath.Join(dir, f.Name))
	}
	return paths, st.Commit()
}

// LoadExample reads an embedded example scenario with overrides applied.
func LoadExample(name string, overrides ...Override) (*Scenario, error) {
	src, err := ExampleSource(name)
	if err != nil {
		return nil, err
	}
	sub, _ := fs.Sub(examples, "examples")
	return Parse(strings.TrimSuffix(name, ".toml")+".toml", src, sub, overrides...)
}

// Load reads the scenario file at path with overrides applied. A known
// fracture file and a CRS WKT file are resolved relative to the
// scenario's folder. When no
// file exists at path but path names an embedded example ("demo"), the
// example is loaded.
func Load(p string, overrides ...Override) (*Scenario, error) {
	src, err := readInputFile(p)
	if errors.Is(err, fs.ErrNotExist) && !strings.ContainsRune(p, filepath.Separator) {
		if _, exErr := ExampleSource(p); exErr == nil {
			return LoadExample(p, overrides...)
		}
	}
	if err != nil {
		return nil, badinput.Errorf("reading scenario: %w", err)
	}
	return Parse(p, src, os.DirFS(filepath.Dir(p)), overrides...)
}

// Parse decodes, converts and validates a scenario. name is used in
// messages; files resolves the known-fracture and CRS WKT files named in
// the scenario.
// Every problem found is reported at once, as Errors.
func Parse(name string, src []byte, files fs.FS, overrides ...Override) (*Scenario, error) {
	var tree map[string]any
	if _, err := toml.Decode(string(src), &tree); err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return nil, Errors{{File: name, Line: pe.Position.Line, Msg: "TOML syntax: " + pe.Message}}
		}
		return nil, Errors{{File: name, Msg: "TOML: " + err.Error()}}
	}
	d := &decoder{file: name, lines: scanKeyLines(string(src)), overrides: map[string]string{}, newEntries: map[string]Override{}, tree: tree}
	if err := d.applyOverrides(tree, overrides); err != nil {
		return nil, err
	}
	s := &Scenario{Source: name}
	d.decodeStruct("", tree, reflect.ValueOf(s).Elem())
	if len(d.errs) == 0 {
		d.readKnownFractures(s, files)
		d.readCRSWKT(s, files)
	}
	if len(d.errs) == 0 {
		d.validate(s)
	}
	if len(d.errs) == 0 {
		d.checkOverridesUsed(s)
	}
	if len(d.errs) > 0 {
		return nil, d.errs
	}
	s.Digest = digest(s)
	s.Warnings = d.unpumpedWarnings(s)
	return s, nil
}

func (d *decoder) readKnownFractures(s *Scenario, files fs.FS) {
	if s.KnownFractures.File == "" {
		return
	}
	f, err := openInput(files, filepath.ToSlash(s.KnownFractures.File))
	if err != nil {
		d.failKey("known_fractures.file", "cannot open: %v", err)
		return
	}
	defer f.Close()
	kf, err := ReadKnownFractures(f, s.KnownFractures.File)
	if err != nil {
		d.errs = append(d.errs, &FieldError{File: d.file, Line: d.lines.lineOf("known_fractures.file"), Key: "known_fractures.file", Msg: err.Error()})
		return
	}
	s.KnownFractures.Fractures = kf
}

// readCRSWKT reads the WKT file of domain.crs_wkt into
// Domain.CRSDefinition, refusing it beside domain.crs.
func (d *decoder) readCRSWKT(s *Scenario, files fs.FS) {
	dm := &s.Domain
	if dm.CRSWKT == "" {
		return
	}
	if dm.CRS != "" {
		d.failKey("domain.crs_wkt", "give the CRS once: domain.crs = %q is set too", dm.CRS)
		return
	}
	f, err := openInput(files, filepath.ToSlash(dm.CRSWKT))
	if err != nil {
		d.failKey("domain.crs_wkt", "cannot open: %v", err)
		return
	}
	defer f.Close()
	text, err := io.ReadAll(io.LimitReader(f, gis.MaxWKTBytes+1))
	if err != nil {
		d.failKey("domain.crs_wkt", "reading: %v", err)
		return
	}
	c, err := gis.ParseWKT(string(text))
	if err != nil {
		var we *gis.WKTError
		if errors.As(err, &we) {
			d.failKey("domain.crs_wkt", "%s:%d:%d: %s", dm.CRSWKT, we.Line, we.Column, we.Msg)
		} else {
			d.failKey("domain.crs_wkt", "%s: %v", dm.CRSWKT, err)
		}
		return
	}
	dm.CRSDefinition = c.String()
}

// digest is the SHA-256 of the scenario's canonical SI content (JSON of
// the struct, map keys sorted), so equal scenarios written differently
// (units, order, comments) share a digest.
func digest(s *Scenario) string {
	c := *s
	c.Source, c.Digest = "", ""
	b, err := json.Marshal(c)
	if err != nil {
		panic("scenarios: digest: " + err.Error())
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}
