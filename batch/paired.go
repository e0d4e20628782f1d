package batch

import (
	"math"
	"strconv"

	"slipfront/internal/csvw"
)

// Pairing is a case and its reference case for one sweep: the case with
// that sweep's value replaced by the sweep's reference value, every other
// sweep value equal. Realization r of the two has the same network
// (common random numbers), so the per-realization difference and ratio
// of a result isolate the effect of the swept value from the scatter
// between networks.
type Pairing struct {
	// Sweep is the index of the sweep in Manifest.Sweeps.
	Sweep int
	// Case and Reference are case indices; they differ.
	Case, Reference int
}

// Pairings lists the batch's pairings: for every sweep in order, every
// case in case order whose value of that sweep is not the sweep's
// reference value.
func (m *Manifest) Pairings() []Pairing {
	var out []Pairing
	for k, sw := range m.Sweeps {
		// Cases are numbered like nested loops (see Case): the value of
		// sweep k advances every stride cases.
		stride := 1
		for _, later := range m.Sweeps[k+1:] {
			stride *= len(later.Values)
		}
		ref := sw.reference()
		for c := range m.Cases {
			if v := c / stride % len(sw.Values); v != ref {
				out = append(out, Pairing{Sweep: k, Case: c, Reference: c + (ref-v)*stride})
			}
		}
	}
	return out
}

// compared is what a headline result compares between paired cases: the
// ratio case / reference, or for magnitudes (logarithmic) the difference.
func (h headline) compared() string {
	if h.ratio != "" {
		return h.ratio
	}
	return h.col.Title + "_difference"
}

// pairedValues returns a headline result of a realization of a case and
// of its reference case, their difference (case − reference) and their
// ratio (case / reference; NaN when the reference is 0 or either value
// is undefined, or when the headline has no ratio).
func pairedValues(h headline, res, ref *Result) (v, vRef, diff, ratio float64) {
	v, vRef = h.value(res), h.value(ref)
	diff, ratio = v-vRef, math.NaN()
	if h.ratio != "" && vRef != 0 {
		ratio = v / vRef
	}
	return v, vRef, diff, ratio
}

// PairedStats sums up one compared result of a pairing.
type PairedStats struct {
	// Name of the compared column: the ratio (e.g.
	// "stimulated_area_ratio") or, for the largest magnitude, the
	// difference ("max_magnitude_Mw_difference").
	Name string
	// Count of realizations where it is defined: a ratio needs a
	// reference that is not 0, a magnitude difference events in both.
	Count int
	// Stats over those realizations (Summarize); zero when Count is 0.
	Stats
}

// PairedSummary sums up one pairing over the realizations.
type PairedSummary struct {
	Pairing
	// SameNetworks counts the realizations whose two runs had the same
	// network: all of them, unless the seed itself is swept.
	SameNetworks int
	// Stats holds one entry per headline result, in column order.
	Stats []PairedStats
}

// Paired sums up every pairing of the batch (Manifest.Pairings) from its
// aggregates.
func Paired(m *Manifest, aggs []CaseAggregate) []PairedSummary {
	var out []PairedSummary
	for _, p := range m.Pairings() {
		a, ref := &aggs[p.Case], &aggs[p.Reference]
		ps := PairedSummary{Pairing: p}
		for r, res := range a.Results {
			if res.NetworkDigest == ref.Results[r].NetworkDigest {
				ps.SameNetworks++
			}
		}
		for _, h := range headlines {
			st := PairedStats{Name: h.compared()}
			var values []float64
			for r, res := range a.Results {
				_, _, diff, ratio := pairedValues(h, res, ref.Results[r])
				x := ratio
				if h.ratio == "" {
					x = diff
				}
				if !math.IsNaN(x) {
					values = append(values, x)
				}
			}
			if st.Count = len(values); st.Count > 0 {
				st.Stats = Summarize(values)
			}
			ps.Stats = append(ps.Stats, st)
		}
		out = append(out, ps)
	}
	return out
}

// pairColumns are the first columns of the paired tables.
func pairColumns(m *Manifest) []csvw.Column {
	cols := []csvw.Column{col("sweep", csvw.String, "", "the swept key in which the case differs from its reference case")}
	cols = append(cols, caseColumns(m)...)
	return append(cols, col("reference_case", csvw.Integer, "",
		"index of the reference case: this case with the sweep's value set to its reference value (batch --reference; default the sweep's first value)"))
}

// pairFields are the values of pairColumns.
func pairFields(m *Manifest, p Pairing) []string {
	return append(append([]string{m.Sweeps[p.Sweep].Key}, caseFields(&m.Cases[p.Case])...), strconv.Itoa(p.Reference))
}

func pairedTable(m *Manifest) csvw.Table {
	cols := append(pairColumns(m),
		col("realization", csvw.Integer, "", "index of the network realization"),
		col("same_network", csvw.Boolean, "", "whether the two runs had the same network (common random numbers; false only when the seed is swept)"))
	for _, h := range headlines {
		c := h.col
		cols = append(cols, c,
			col(c.Title+"_reference", c.Datatype, c.Unit, c.Description+", reference case"),
			col(c.Title+"_difference", c.Datatype, c.Unit, c.Description+": case minus reference case"))
		if h.ratio != "" {
			cols = append(cols, col(h.ratio, csvw.Double, "", c.Description+": case divided by reference case; empty when the reference is 0"))
		}
	}
	return csvw.Table{URL: PairedName, Title: "paired comparison",
		Description: "Per sweep, case and realization: each headline result of the case and of its reference case on the same network, " +
			"their difference and ratio. The reference case is the case itself for the sweep's reference value, which has no rows.",
		Columns: cols}
}

func pairedPercentilesTable(m *Manifest) csvw.Table {
	cols := append(pairColumns(m),
		col("realizations", csvw.Integer, "", "realizations compared"),
		col("same_networks", csvw.Integer, "", "realizations whose two runs had the same network"))
	for _, h := range headlines {
		name, what := h.compared(), "the ratio case / reference of "+h.col.Description
		if h.ratio == "" {
			what = "the difference case - reference of the " + h.col.Description
		}
		cols = append(cols, quantiles(name, csvw.Double, "", what+" over the realizations where it is defined")...)
		cols = append(cols, col(name+"_count", csvw.Integer, "", "realizations where "+name+" is defined"))
	}
	return csvw.Table{URL: PairedPercentilesName, Title: "paired comparison percentiles",
		Description: "Per sweep and case: the percentiles over the realizations of the paired ratios (and of the largest-magnitude " +
			"difference) of paired.csv. " + PercentileConvention, Columns: cols}
}

func writePaired(w *csvw.Writer, m *Manifest, aggs []CaseAggregate) {
	for _, p := range m.Pairings() {
		a, ref := &aggs[p.Case], &aggs[p.Reference]
		for r, res := range a.Results {
			rr := ref.Results[r]
			rec := append(pairFields(m, p), strconv.Itoa(r), strconv.FormatBool(res.NetworkDigest == rr.NetworkDigest))
			for _, h := range headlines {
				v, vRef, diff, ratio := pairedValues(h, res, rr)
				rec = append(rec, formatOptional(v), formatOptional(vRef), formatOptional(diff))
				if h.ratio != "" {
					rec = append(rec, formatOptional(ratio))
				}
			}
			w.Write(rec)
		}
	}
}

func writePairedPercentiles(w *csvw.Writer, m *Manifest, paired []PairedSummary) {
	for _, ps := range paired {
		rec := append(pairFields(m, ps.Pairing), strconv.Itoa(m.Realizations), strconv.Itoa(ps.SameNetworks))
		for _, st := range ps.Stats {
			if st.Count == 0 {
				rec = append(rec, "", "", "", "0")
				continue
			}
			rec = append(rec, formatFloat(st.P10), formatFloat(st.P50), formatFloat(st.P90), strconv.Itoa(st.Count))
		}
		w.Write(rec)
	}
}
