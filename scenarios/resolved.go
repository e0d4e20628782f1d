package scenarios

import (
	"encoding/json"
	"fmt"
	"io"
)

// WriteResolved writes the scenario as JSON in SI units, with its digest:
// the exact input of a run, kept in its output folder so that later
// commands (export, inspect) work from the folder alone. The path the
// scenario was read from is left out (ReadResolved names the file it
// reads instead), so that the same scenario gives the same bytes however
// it was named on the command line: the shards of a batch, run from
// different folders, keep the same file.
func WriteResolved(w io.Writer, s *Scenario) error {
	type resolved struct {
		Digest   string    `json:"digest"`
		Scenario *Scenario `json:"scenario"`
	}
	c := *s
	c.Source = ""
	enc := json.NewEncoder(w)
	enc.SetIndent("", " ")
	return enc.Encode(resolved{Digest: s.Digest, Scenario: &c})
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
		return nil, fmt.Errorf("%s: the scenario does not match its digest (%s…, computed %s…): the file was changed, or written by another version of slipfront (run the command that wrote the folder again)", name, short(in.Digest), short(d))
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
