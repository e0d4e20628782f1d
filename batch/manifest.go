package batch

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// ManifestFormat names the manifest layout; it changes when the layout
// does. Layout 2 added the sweeps' reference values; a manifest of layout
// 1 is refused (its results lack the warnings too).
const ManifestFormat = "slipfront-batch-manifest/2"

// manifestVersion is the number at the end of ManifestFormat.
const manifestVersion = 2

// Manifest describes a batch folder: what was run, so that resuming and
// merging can refuse folders that do not belong together. It is written
// as indented JSON to manifest.json, with no timestamps or paths, so two
// folders of the same batch have the same bytes (apart from the shard).
type Manifest struct {
	// Format is ManifestFormat.
	Format string `json:"format"`
	// ProgramVersion is slipfront's version (internal/version).
	ProgramVersion string `json:"program_version"`
	// Scenario identifies the base scenario (with --set overrides applied,
	// before any sweep value).
	Scenario ManifestScenario `json:"scenario"`
	// Sweeps in the order given; Cases is their product in case order.
	Sweeps []Sweep        `json:"sweeps"`
	Cases  []ManifestCase `json:"cases"`
	// Realizations per case, numbered 0 … Realizations−1.
	Realizations int `json:"realizations"`
	// Shard of the realizations this folder holds.
	Shard Shard `json:"shard"`
}

// ManifestScenario identifies a scenario.
type ManifestScenario struct {
	Name   string `json:"name"`
	Digest string `json:"digest"`
	Seed   uint64 `json:"seed"`
	// Start of pumping, UTC (RFC 3339), stamped on the batch's maps.
	Start string `json:"schedule_start,omitempty"`
}

// ManifestCase is one case of a batch.
type ManifestCase struct {
	Index int `json:"index"`
	// Label is Case.Label(); Values holds one value per sweep.
	Label  string   `json:"label"`
	Values []string `json:"values"`
	// Digest of the case's scenario.
	Digest string `json:"digest"`
	// Grid of the stimulated-area map and TimeGrid of the area curves.
	Grid     Grid     `json:"grid"`
	TimeGrid TimeGrid `json:"time_grid"`
}

// WriteManifest writes m as indented JSON.
func WriteManifest(w io.Writer, m *Manifest) error {
	b, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		return fmt.Errorf("batch: writing manifest: %w", err)
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// ReadManifest reads and checks a manifest.json.
func ReadManifest(r io.Reader) (*Manifest, error) {
	const what = "manifest.json"
	b, err := io.ReadAll(io.LimitReader(r, 64<<20))
	if err != nil {
		return nil, fmt.Errorf("batch: reading %s: %w", what, err)
	}
	var probe struct {
		Format string `json:"format"`
	}
	if err := json.Unmarshal(b, &probe); err != nil {
		return nil, &FormatError{What: what, Offset: -1, Msg: err.Error()}
	}
	if probe.Format != ManifestFormat {
		v, err := strconv.Atoi(strings.TrimPrefix(probe.Format, "slipfront-batch-manifest/"))
		switch {
		case !strings.HasPrefix(probe.Format, "slipfront-batch-manifest/") || err != nil || v < 1:
			return nil, &FormatError{What: what, Offset: -1, Msg: fmt.Sprintf("format %q: not a slipfront batch manifest", probe.Format)}
		case v > manifestVersion:
			return nil, &UnsupportedError{What: what, Version: v, Max: manifestVersion}
		}
		return nil, &FormatError{What: what, Offset: -1, Msg: fmt.Sprintf("format %q was written by an earlier slipfront and is no longer read: run the batch again with --force", probe.Format)}
	}
	d := json.NewDecoder(bytes.NewReader(b))
	d.DisallowUnknownFields()
	var m Manifest
	if err := d.Decode(&m); err != nil {
		return nil, &FormatError{What: what, Offset: -1, Msg: err.Error()}
	}
	if err := m.check(); err != nil {
		return nil, &FormatError{What: what, Offset: -1, Msg: err.Error()}
	}
	return &m, nil
}

// check reports the first inconsistency of a manifest read from a file.
func (m *Manifest) check() error {
	if m.Realizations < 1 || m.Realizations > MaxRealizations {
		return fmt.Errorf("realizations = %d: must be 1 to %d", m.Realizations, MaxRealizations)
	}
	if err := m.Shard.check(); err != nil {
		return err
	}
	if err := checkSweeps(m.Sweeps); err != nil {
		return err
	}
	for _, sw := range m.Sweeps {
		if sw.Reference == "" {
			return fmt.Errorf("sweep %s has no reference value", sw.Key)
		}
	}
	cases := Cases(m.Sweeps)
	if n := len(cases) * m.Realizations; n > MaxResults {
		return fmt.Errorf("%d cases × %d realizations = %d results: at most %d", len(cases), m.Realizations, n, MaxResults)
	}
	if len(m.Cases) != len(cases) {
		return fmt.Errorf("%d cases for sweeps that form %d", len(m.Cases), len(cases))
	}
	for i, mc := range m.Cases {
		if mc.Index != i || mc.Label != cases[i].Label() || strings.Join(mc.Values, "\x00") != strings.Join(cases[i].Values, "\x00") {
			return fmt.Errorf("cases[%d] is %q, expected %q", i, mc.Label, cases[i].Label())
		}
		if mc.Digest == "" {
			return fmt.Errorf("cases[%d] has no digest", i)
		}
		if err := mc.Grid.valid(); err != nil {
			return fmt.Errorf("cases[%d]: %w", i, err)
		}
		if err := mc.TimeGrid.valid(); err != nil {
			return fmt.Errorf("cases[%d]: %w", i, err)
		}
	}
	return nil
}

// difference names the first field in which got differs from m, with both
// values; ok is false when they agree. The shard is compared only when
// withShard is set.
func (m *Manifest) difference(got *Manifest, withShard bool) (field, want, have string, ok bool) {
	type pair struct {
		field      string
		want, have any
	}
	pairs := []pair{
		{"format", m.Format, got.Format},
		{"program version", m.ProgramVersion, got.ProgramVersion},
		{"scenario digest", m.Scenario.Digest, got.Scenario.Digest},
		{"scenario seed", m.Scenario.Seed, got.Scenario.Seed},
		{"scenario name", m.Scenario.Name, got.Scenario.Name},
		{"sweeps", sweepsText(m.Sweeps), sweepsText(got.Sweeps)},
		{"realizations", m.Realizations, got.Realizations},
		{"number of cases", len(m.Cases), len(got.Cases)},
	}
	if withShard {
		pairs = append(pairs, pair{"shard", m.Shard.String(), got.Shard.String()})
	} else {
		// Shards merged together must agree on the references too; a
		// resumed batch may change them (they only steer the aggregates).
		pairs = append(pairs, pair{"shard count", m.Shard.normal().Count, got.Shard.normal().Count},
			pair{"reference values", referencesText(m.Sweeps), referencesText(got.Sweeps)})
	}
	for _, p := range pairs {
		if w, h := fmt.Sprint(p.want), fmt.Sprint(p.have); w != h {
			return p.field, w, h, true
		}
	}
	for i := range m.Cases {
		a, b := m.Cases[i], got.Cases[i]
		for _, p := range []pair{
			{"label", a.Label, b.Label},
			{"digest", a.Digest, b.Digest},
			{"grid", a.Grid, b.Grid},
			{"time grid", a.TimeGrid, b.TimeGrid},
		} {
			if w, h := fmt.Sprintf("%+v", p.want), fmt.Sprintf("%+v", p.have); w != h {
				return fmt.Sprintf("cases[%d].%s", i, p.field), w, h, true
			}
		}
	}
	return "", "", "", false
}

func referencesText(sweeps []Sweep) string {
	parts := make([]string, len(sweeps))
	for i, s := range sweeps {
		parts[i] = s.Key + "=" + s.Reference
	}
	return strings.Join(parts, " ")
}

func sweepsText(sweeps []Sweep) string {
	if len(sweeps) == 0 {
		return "(none)"
	}
	parts := make([]string, len(sweeps))
	for i, s := range sweeps {
		parts[i] = s.String()
	}
	return strings.Join(parts, " ")
}
