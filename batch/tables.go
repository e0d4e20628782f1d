package batch

import (
	"bytes"
	"strconv"
	"strings"

	"slipfront/internal/csvw"
	"slipfront/internal/version"
)

// PercentileConvention states how the q10, q50 and q90 columns of every
// table are computed and read.
const PercentileConvention = "q10, q50 and q90 are the 10th, 50th and 90th percentiles over the realizations in ascending order " +
	"(q10 <= q50 <= q90): q90 is the high case, exceeded by about a tenth of the realizations, and q10 the low case " +
	"(the reverse of the reserves-reporting habit of calling the high case P10). They are gonum stat.Quantile with " +
	"stat.Empirical (Hyndman and Fan 1996, definition 1: the value of rank ceil(n*p) among the n sorted values, " +
	"always a value some realization produced). std is the sample standard deviation (n - 1), empty for one realization."

// headline is one of the headline results of a realization, as a column
// of realizations.csv and of the paired comparison.
type headline struct {
	col csvw.Column
	// ratio names the column of the ratio to the reference case; "" when
	// a ratio means nothing (magnitudes are logarithmic: their
	// difference is compared instead).
	ratio string
	// value is the result in the column's unit; NaN when undefined.
	value func(*Result) float64
}

// headlines are the headline results, in column order.
var headlines = []headline{
	{csvw.Column{Title: "stimulated_area_m2", Datatype: csvw.Double, Unit: "m2", Description: "stimulated area at the end of the run"},
		"stimulated_area_ratio", func(r *Result) float64 { return r.FinalArea }},
	{csvw.Column{Title: "stimulated_fracture_area_m2", Datatype: csvw.Double, Unit: "m2", Description: "stimulated fracture surface at the end of the run"},
		"stimulated_fracture_area_ratio", func(r *Result) float64 { return r.FractureArea }},
	{csvw.Column{Title: "events", Datatype: csvw.Integer, Description: "number of synthetic microseismic events"},
		"events_ratio", func(r *Result) float64 { return float64(r.Events) }},
	{csvw.Column{Title: "max_magnitude_Mw", Datatype: csvw.Double, Description: "largest moment magnitude; empty without events"},
		"", func(r *Result) float64 { return r.MaxMagnitude }},
	{csvw.Column{Title: "peak_bhp_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "highest bottom-hole pressure of the run, absolute"},
		"peak_bhp_ratio", func(r *Result) float64 { return r.PeakPressure / 1e6 }},
	{csvw.Column{Title: "injected_volume_m3", Datatype: csvw.Double, Unit: "m3", Description: "volume injected"},
		"injected_volume_ratio", func(r *Result) float64 { return r.InjectedVolume }},
	{csvw.Column{Title: "seismic_moment_Nm", Datatype: csvw.Double, Unit: "N.m", Description: "summed moment of the events (unstable ruptures)"},
		"seismic_moment_ratio", func(r *Result) float64 { return r.SeismicMoment }},
	{csvw.Column{Title: "aseismic_moment_Nm", Datatype: csvw.Double, Unit: "N.m", Description: "moment of the stable (aseismic) slip; a lower bound where crossings pin slip (README, Limitations)"},
		"aseismic_moment_ratio", func(r *Result) float64 { return r.AseismicMoment }},
	{csvw.Column{Title: "retained_permeability_gain", Datatype: csvw.Double, Description: "permeability gain of the stimulated elements retained at the initial pore pressure; empty when nothing was stimulated"},
		"retained_permeability_gain_ratio", func(r *Result) float64 { return r.RetainedGain }},
}

// col is a column of a batch table.
func col(title, datatype, unit, description string) csvw.Column {
	return csvw.Column{Title: title, Datatype: datatype, Unit: unit, Description: description}
}

// caseColumns are the first columns of every per-case table: the case
// index and the case's value of each sweep.
func caseColumns(m *Manifest) []csvw.Column {
	cols := []csvw.Column{col("case", csvw.Integer, "", "index of the case (manifest.json cases)")}
	for _, s := range m.Sweeps {
		cols = append(cols, col(s.Key, csvw.String, "", "the case's value of the swept scenario key "+s.Key+", as given to --sweep (with its unit)"))
	}
	return cols
}

// caseFields are the values of caseColumns for case mc.
func caseFields(mc *ManifestCase) []string {
	return append([]string{strconv.Itoa(mc.Index)}, mc.Values...)
}

// quantiles are the q10, q50 and q90 columns of a quantity.
func quantiles(name, datatype, unit, what string) []csvw.Column {
	return []csvw.Column{
		col(name+"_q10", datatype, unit, "10th percentile (low case) of "+what),
		col(name+"_q50", datatype, unit, "median of "+what),
		col(name+"_q90", datatype, unit, "90th percentile (high case) of "+what),
	}
}

func realizationsTable(m *Manifest) csvw.Table {
	cols := append(caseColumns(m),
		col("realization", csvw.Integer, "", "index of the network realization: the same index has the same fractures in every case"),
		col("network_digest", csvw.String, "", "digest of the realization's fracture network"))
	for _, h := range headlines {
		cols = append(cols, h.col)
	}
	cols = append(cols,
		col("warnings", csvw.Integer, "", "number of warnings of the run (warnings.csv counts them by kind)"),
		col("warning_kinds", csvw.String, "", "the kinds of its warnings, ';'-separated, in the order they arose; empty when none"))
	return csvw.Table{URL: RealizationsName, Title: "realizations",
		Description: "One row per case and realization: the headline results of each run.", Columns: cols}
}

func percentilesTable(m *Manifest) csvw.Table {
	cols := append(caseColumns(m), col("time_s", csvw.Double, "s", "time since the start of pumping, on the case's time grid"))
	cols = append(cols, quantiles("stimulated_area_m2", csvw.Double, "m2", "the stimulated area at that time over the realizations")...)
	cols = append(cols,
		col("stimulated_area_m2_mean", csvw.Double, "m2", "mean stimulated area at that time"),
		col("stimulated_area_m2_std", csvw.Double, "m2", "sample standard deviation of the stimulated area at that time; empty for one realization"))
	return csvw.Table{URL: PercentilesName, Title: "stimulated area percentiles",
		Description: "Per case and time: the stimulated area over the realizations. " + PercentileConvention, Columns: cols}
}

func comparisonTable(m *Manifest) csvw.Table {
	cols := append(caseColumns(m), col("realizations", csvw.Integer, "", "realizations of the case"))
	cols = append(cols, quantiles("stimulated_area_m2", csvw.Double, "m2", "the final stimulated area")...)
	cols = append(cols, col("stimulated_area_m2_mean", csvw.Double, "m2", "mean final stimulated area"))
	cols = append(cols, quantiles("stimulated_fracture_area_m2", csvw.Double, "m2", "the final stimulated fracture surface")...)
	cols = append(cols,
		col("stimulated_fracture_area_m2_mean", csvw.Double, "m2", "mean final stimulated fracture surface"),
		col("events_mean", csvw.Double, "", "mean number of events"),
		col("max_magnitude_Mw", csvw.Double, "", "largest moment magnitude of any realization; empty when none had an event"),
		col("peak_bhp_MPa_q50", csvw.Double, "MPa", "median peak bottom-hole pressure"),
		col("peak_bhp_MPa_max", csvw.Double, "MPa", "highest peak bottom-hole pressure of any realization"),
		col("injected_volume_m3_mean", csvw.Double, "m3", "mean injected volume"),
		col("warnings", csvw.Integer, "", "warnings of all the case's realizations"),
		col("realizations_with_warnings", csvw.Integer, "", "realizations with at least one warning"))
	return csvw.Table{URL: ComparisonName, Title: "case comparison",
		Description: "One row per case: the final results over its realizations. " + PercentileConvention, Columns: cols}
}

func warningsTable(m *Manifest) csvw.Table {
	cols := append(caseColumns(m),
		col("kind", csvw.String, "", "kind of warning (summary.json gives an example message of each)"),
		col("warnings", csvw.Integer, "", "warnings of this kind over the case's realizations"),
		col("realizations_with_warning", csvw.Integer, "", "realizations with at least one warning of this kind"))
	return csvw.Table{URL: WarningsName, Title: "warnings",
		Description: "Per case and kind of warning that arose anywhere in the batch (zero where it did not arise in the case); " +
			"no rows when no run warned.", Columns: cols}
}

// row writes the case's fields followed by more.
func row(mc *ManifestCase, more ...string) []string { return append(caseFields(mc), more...) }

func writeRealizations(w *csvw.Writer, aggs []CaseAggregate) {
	for i := range aggs {
		a := &aggs[i]
		for r, res := range a.Results {
			rec := row(&a.Case, strconv.Itoa(r), res.NetworkDigest)
			for _, h := range headlines {
				rec = append(rec, formatOptional(h.value(res)))
			}
			kinds := make([]string, len(res.Warnings))
			for k, wn := range res.Warnings {
				kinds[k] = wn.Kind
			}
			w.Write(append(rec, strconv.Itoa(len(res.Warnings)), strings.Join(kinds, ";")))
		}
	}
}

func writePercentiles(w *csvw.Writer, aggs []CaseAggregate) {
	for i := range aggs {
		a := &aggs[i]
		for k, s := range a.Area {
			w.Write(row(&a.Case, formatFloat(a.Times[k]), formatFloat(s.P10), formatFloat(s.P50),
				formatFloat(s.P90), formatFloat(s.Mean), formatOptional(s.Std)))
		}
	}
}

func writeComparison(w *csvw.Writer, aggs []CaseAggregate) {
	for i := range aggs {
		a := &aggs[i]
		final, frac := a.Final, a.Fracture
		total, warned := a.WarningTotals()
		w.Write(row(&a.Case, strconv.Itoa(a.Realizations),
			formatFloat(final.P10), formatFloat(final.P50), formatFloat(final.P90), formatFloat(final.Mean),
			formatFloat(frac.P10), formatFloat(frac.P50), formatFloat(frac.P90), formatFloat(frac.Mean),
			formatFloat(a.Events.Mean), formatOptional(a.MaxMagnitude),
			formatFloat(a.PeakPressure.P50/1e6), formatFloat(a.PeakPressure.Max/1e6), formatFloat(a.InjectedVolume.Mean),
			strconv.Itoa(total), strconv.Itoa(warned)))
	}
}

func writeWarnings(w *csvw.Writer, aggs []CaseAggregate) {
	kinds := TotalWarnings(aggs)
	for i := range aggs {
		a := &aggs[i]
		for _, k := range kinds {
			var n, reals int
			for _, wc := range a.Warnings {
				if wc.Kind == k.Kind {
					n, reals = wc.Warnings, wc.Realizations
				}
			}
			w.Write(row(&a.Case, k.Kind, strconv.Itoa(n), strconv.Itoa(reals)))
		}
	}
}

// namedBytes is a file of the batch folder and its content.
type namedBytes struct {
	name string
	data []byte
}

// renderAggregates renders every aggregate file of the batch: the tables,
// the probability grids, the CSV metadata of the folder and of its
// probability folder, and the summary.
func renderAggregates(m *Manifest, aggs []CaseAggregate) ([]namedBytes, error) {
	paired := Paired(m, aggs)
	type tableWriter struct {
		t     csvw.Table
		write func(*csvw.Writer)
	}
	tables := []tableWriter{
		{realizationsTable(m), func(w *csvw.Writer) { writeRealizations(w, aggs) }},
		{percentilesTable(m), func(w *csvw.Writer) { writePercentiles(w, aggs) }},
		{comparisonTable(m), func(w *csvw.Writer) { writeComparison(w, aggs) }},
		{warningsTable(m), func(w *csvw.Writer) { writeWarnings(w, aggs) }},
	}
	if len(m.Sweeps) > 0 {
		tables = append(tables,
			tableWriter{pairedTable(m), func(w *csvw.Writer) { writePaired(w, m, aggs) }},
			tableWriter{pairedPercentilesTable(m), func(w *csvw.Writer) { writePairedPercentiles(w, m, paired) }})
	}
	var files []namedBytes
	group := csvw.Group{Title: "slipfront batch folder of " + m.Scenario.Name, Creator: "slipfront " + version.Version,
		Description: "Monte Carlo batch: " + strconv.Itoa(m.Realizations) + " realizations of each case. Pressures in MPa, areas in m2, " +
			"volumes in m3, times in s since schedule.start; an empty field is a missing value. " + PercentileConvention}
	for _, tw := range tables {
		var b bytes.Buffer
		w := csvw.NewWriter(&b, &tw.t)
		tw.write(w)
		if err := w.Flush(); err != nil {
			return nil, err
		}
		files = append(files, namedBytes{tw.t.URL, b.Bytes()})
		group.Tables = append(group.Tables, tw.t)
	}
	grids := csvw.Group{Title: "slipfront probability grids of " + m.Scenario.Name, Creator: "slipfront " + version.Version,
		Description: "Per case, the share of its realizations in which each map cell was stimulated; cells never stimulated are not listed (probability 0)."}
	for i := range aggs {
		var b bytes.Buffer
		if err := WriteProbabilityGrid(&b, aggs[i].Probability); err != nil {
			return nil, err
		}
		files = append(files, namedBytes{ProbabilityGridName(i), b.Bytes()})
		grids.Tables = append(grids.Tables, probabilityTable(aggs[i].Probability))
	}
	for _, g := range []struct {
		name  string
		group *csvw.Group
	}{{CSVMetadataName, &group}, {ProbabilityDir + "/" + CSVMetadataName, &grids}} {
		var b bytes.Buffer
		if err := g.group.Write(&b); err != nil {
			return nil, err
		}
		files = append(files, namedBytes{g.name, b.Bytes()})
	}
	var b bytes.Buffer
	if err := writeSummary(&b, m, aggs, paired); err != nil {
		return nil, err
	}
	return append(files, namedBytes{SummaryName, b.Bytes()}), nil
}
