package batch

import (
	"encoding/json"
	"io"

	"slipfront/internal/caution"
	"slipfront/internal/version"
)

// summaryJSON is the layout of a batch folder's summary.json: what the
// batch found at a glance, beside the tables that hold the detail.
type summaryJSON struct {
	Program      string             `json:"program"`
	Caution      string             `json:"caution"`
	Scenario     string             `json:"scenario"`
	Digest       string             `json:"scenario_digest"`
	Seed         uint64             `json:"seed"`
	Realizations int                `json:"realizations"`
	Percentiles  string             `json:"percentiles"`
	Warnings     []warningCountJSON `json:"warnings"`
	Cases        []caseJSON         `json:"cases"`
	Paired       []pairedJSON       `json:"paired"`
}

type warningCountJSON struct {
	Kind         string `json:"kind"`
	Warnings     int    `json:"warnings"`
	Realizations int    `json:"realizations"`
	Example      string `json:"example"`
}

type caseJSON struct {
	Case     int                `json:"case"`
	Label    string             `json:"label"`
	Values   []string           `json:"values"`
	Warnings []warningCountJSON `json:"warnings"`
}

type pairedJSON struct {
	Sweep         string            `json:"sweep"`
	Reference     string            `json:"reference_value"`
	Case          int               `json:"case"`
	ReferenceCase int               `json:"reference_case"`
	SameNetworks  int               `json:"same_networks"`
	Stats         []pairedStatsJSON `json:"stats"`
}

type pairedStatsJSON struct {
	Name  string   `json:"name"`
	Count int      `json:"count"`
	Q10   *float64 `json:"q10"`
	Q50   *float64 `json:"q50"`
	Q90   *float64 `json:"q90"`
}

func warningCounts(counts []WarningCount) []warningCountJSON {
	out := make([]warningCountJSON, len(counts))
	for i, c := range counts {
		out[i] = warningCountJSON{Kind: c.Kind, Warnings: c.Warnings, Realizations: c.Realizations, Example: c.Example}
	}
	return out
}

// writeSummary writes summary.json: the warnings of the whole batch by
// kind with an example message, each case's warnings, and the paired
// comparison's percentiles.
func writeSummary(w io.Writer, m *Manifest, aggs []CaseAggregate, paired []PairedSummary) error {
	sj := summaryJSON{
		Program: "slipfront " + version.Version, Caution: caution.Text,
		Scenario: m.Scenario.Name, Digest: m.Scenario.Digest, Seed: m.Scenario.Seed, Realizations: m.Realizations,
		Percentiles: PercentileConvention, Warnings: warningCounts(TotalWarnings(aggs)),
		Cases: []caseJSON{}, Paired: []pairedJSON{},
	}
	for i := range aggs {
		a := &aggs[i]
		sj.Cases = append(sj.Cases, caseJSON{Case: a.Case.Index, Label: a.Case.Label, Values: a.Case.Values,
			Warnings: warningCounts(a.Warnings)})
	}
	for _, ps := range paired {
		sw := m.Sweeps[ps.Sweep]
		pj := pairedJSON{Sweep: sw.Key, Reference: sw.Reference, Case: ps.Case, ReferenceCase: ps.Reference, SameNetworks: ps.SameNetworks}
		for _, st := range ps.Stats {
			sj := pairedStatsJSON{Name: st.Name, Count: st.Count}
			if st.Count > 0 {
				sj.Q10, sj.Q50, sj.Q90 = &st.P10, &st.P50, &st.P90
			}
			pj.Stats = append(pj.Stats, sj)
		}
		sj.Paired = append(sj.Paired, pj)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(sj)
}
