package batch

import (
	"bytes"
	"errors"
	"io/fs"
	"os"
	"path/filepath"

	"slipfront/scenarios"
)

// ScenarioName is the file of a batch folder that holds the base scenario
// (the scenario with the batch's --set overrides and no sweep value),
// resolved and with its digest as scenarios.WriteResolved writes it, under
// the name a run folder gives its own: the maps draw its wells and the
// report lists its inputs. Its digest is the manifest's.
const ScenarioName = "scenario.json"

// resolvedBytes is base as WriteResolved writes it.
func resolvedBytes(base *scenarios.Scenario) ([]byte, error) {
	var b bytes.Buffer
	if err := scenarios.WriteResolved(&b, base); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// ReadScenario reads the base scenario of the batch folder dir, whose
// manifest is m, or returns nil when the folder keeps none (one written
// before batches kept it). A changed file, or another scenario's, is
// refused with a bad-input error naming the folder.
func ReadScenario(dir string, m *Manifest) (*scenarios.Scenario, error) {
	s, _, err := readScenarioFile(dir, m)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	return s, err
}

// readScenarioFile reads the ScenarioName of the batch folder dir as
// ReadScenario does, with the file's bytes; a folder without one gives an
// error matching fs.ErrNotExist.
func readScenarioFile(dir string, m *Manifest) (*scenarios.Scenario, []byte, error) {
	path := filepath.Join(dir, ScenarioName)
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, nil, err
	}
	s, err := scenarios.ReadResolved(bytes.NewReader(b), path)
	if err != nil {
		return nil, nil, inputError("base scenario", err)
	}
	if s.Digest != m.Scenario.Digest {
		return nil, nil, inputErrorf("%s is scenario %.12s…, but the batch in %s ran %.12s…: the folder mixes two scenarios",
			path, s.Digest, dir, m.Scenario.Digest)
	}
	return s, b, nil
}

// writeScenario writes base into the batch folder dir, whose manifest is
// m. When resuming, an existing file must be the manifest's scenario (a
// folder written before batches kept one gets it now).
func writeScenario(dir string, m *Manifest, base *scenarios.Scenario, resume bool) error {
	if resume {
		if _, err := ReadScenario(dir, m); err != nil {
			return err
		}
	}
	b, err := resolvedBytes(base)
	if err != nil {
		return err
	}
	return writeBytesAtomic(dir, ScenarioName, b)
}

// shardScenario returns the base scenario kept by the shard folders of one
// batch (manifest m), refusing a shard whose scenario is not m's; nil when
// no shard keeps one (shards written before batches kept it).
func shardScenario(dirs []string, m *Manifest) ([]byte, error) {
	var kept []byte
	for _, d := range dirs {
		_, b, err := readScenarioFile(d, m)
		switch {
		case errors.Is(err, fs.ErrNotExist):
			continue
		case err != nil:
			return nil, err
		}
		if kept == nil {
			kept = b
		}
	}
	return kept, nil
}
