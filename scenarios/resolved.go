package scenarios

import (
	"encoding/json"
	"fmt"
	"io"
)

// WriteResolved writes the scenario as JSON in SI units, with its digest:
// the exact input of a run, kept in its output folder so that later
// commands (export, inspect) work from the folder alone.
func WriteResolved(w io.Writer, s *Scenario) error {
	type resolved struct {
		Digest   string    `json:"digest"`
		Scenario *Scenario `json:"scenario"`
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", " ")
	return enc.Encode(resolved{Digest: s.Digest, Scenario: s})
}

// ReadResolved reads what WriteResolved wrote and checks the digest, so a
// changed file is refused rather than silently used.
func ReadResolved(r io.Reader, name string) (*Scenario, error) {
	var in struct {
		Digest   string    `json:"digest"`
		Scenario *Scenario `json:"scenario"`
	}
	dec := json.NewDecoder(r)
	dec.DisallowUnknownFields()
	if err := dec.Decode(&in); err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	if in.Scenario == nil {
		return nil, fmt.Errorf("%s: no scenario", name)
	}
	s := in.Scenario
	s.Source = name
	if d := digest(s); d != in.Digest {
		return nil, fmt.Errorf("%s: the scenario does not match its digest (%s…, computed %s…): the file was changed", name, short(in.Digest), short(d))
	}
	s.Digest = in.Digest
	return s, nil
}

func short(d string) string {
	if len(d) > 12 {
		return d[:12]
	}
	return d
}
