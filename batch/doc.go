// Package batch runs Monte Carlo batches — many fracture-network
// realizations of one or more sweep cases — on all cores or across the
// shards of a cluster job array, keeps every finished realization in its
// own file so a batch survives interruption, and aggregates the results
// into percentile curves, case comparisons and stimulation-probability
// grids.
//
// The package knows no physics: a RunFunc computes one realization of one
// case and returns an Outcome.
//
// # Units
//
// SI inside and in the result files (m, m², s, Pa, m³). Column names of the
// CSV files carry their unit and are the names of the run's outputs:
// stimulated_area_m2, time_s, peak_bhp_MPa (pressures are reported in
// MPa), injected_volume_m3, max_magnitude_Mw; the folder's
// csv-metadata.json (W3C CSV on the Web) describes every column.
//
// # Conventions
//
// Cases. Sweeps ("key=v1,v2,…", any scalar scenario key, values written as
// for --set) form their full product. Cases are numbered like nested loops
// over the sweeps in the order given, the first sweep outermost; without
// sweeps there is one case, the base scenario. Every sweep value is loaded
// and validated on its own, and every case is loaded, before any work
// starts. A sweep must change the run: one whose every value gives the
// base scenario's run (scenarios.Scenario.UsedDigest: the scenario without
// what no run reads, such as a fluid no stage pumps) is refused, and so
// are two values that give the same scenario; the scenario loader refuses
// a value of a key that no run reads and a key that adds a fluid nothing
// names (a mistyped name).
//
// Common random numbers. Realization r of every case is run with the
// case's scenario (same seed unless the seed itself is swept) and r; the
// runner derives every random draw from (seed, r, purpose), so every case
// sees the same fracture networks and a difference between cases is not
// confounded with a difference between networks.
//
// Order independence. Work is handed out realization by realization (all
// cases of realization 0, then 1, …) to Workers goroutines, but nothing
// depends on that order: each result is its own file, and the aggregates
// are computed afterwards from the files, in (case, realization) order,
// with numbers written in their shortest exact decimal form. The same batch
// therefore gives byte-identical aggregates for any worker count, any
// sharding and any interruption and resumption.
//
// Shards. Shard i of n owns the realizations r with r mod n = i, for every
// case. A shard folder holds only its results and writes no aggregates;
// Merge checks that all n shards are present and complete and aggregates
// them. A batch of one shard aggregates itself when complete.
//
// Percentiles. The columns ending in _q10, _q50 and _q90 are the 10th,
// 50th and 90th percentiles in ascending order (q10 ≤ q50 ≤ q90, so q90 is
// the high case, exceeded by about a tenth of the realizations), computed
// by gonum's stat.Quantile with stat.Empirical (Hyndman and Fan 1996,
// definition 1: the value of rank ⌈n·p⌉ among the n sorted realizations,
// so a percentile is always a value some realization produced; see
// QuantileKind and PercentileConvention). The Go API calls them P10, P50
// and P90 (Stats). Standard deviations are sample standard deviations
// (n − 1 denominator), left empty for a single realization.
//
// Paired comparison. For every sweep, each case is compared with its
// reference case (Pairing): the same case with the sweep's reference value
// (Sweep.Reference: --reference, by default the sweep's first value).
// Because both see the same networks, the per-realization difference and
// ratio of a headline result measure the swept value's effect without the
// scatter between networks. paired.csv holds them per realization;
// paired-percentiles.csv their percentiles per case: a ratio for every
// headline result but the largest magnitude, whose difference is compared
// (a ratio of magnitudes means nothing). A ratio is undefined (empty) where
// the reference is 0, and its percentiles are over the realizations where
// it is defined (the _count column).
//
// Warnings. A realization's warnings (Outcome.Warnings) are stored in its
// result, counted per realization in realizations.csv, per case and kind
// in warnings.csv, per case in comparison.csv and per kind, with an
// example message, in summary.json.
//
// Map grid. The stimulated cells of an Outcome index the scenario's Grid
// (GridFor): cols = ⌈(x_max − x_min)/cell_size⌉, rows likewise, index =
// row·cols + col, row 0 at the south edge.
//
// Time grid. Area curves are stored on t_k = k·output_interval, k = 0 … K,
// K = ⌈nominal schedule length (stages and shut-ins) / output_interval⌉,
// by linear interpolation, holding the first value before the curve starts
// and the last after it ends.
//
// # Batch folder
//
//	manifest.json             what was run (see Manifest); compared on resume and merge
//	results/cCCCC-rRRRRRR.sfr one result file per finished realization (ResultName)
//	realizations.csv          one row per case and realization: headline results, warnings
//	percentiles.csv           per case and time: stimulated area q10, q50, q90, mean, std
//	comparison.csv            per case: final and fracture area percentiles, events, magnitude, pressure, warnings
//	warnings.csv              per case and kind of warning: warnings and realizations with one
//	paired.csv                per sweep, case and realization: results against the reference case
//	paired-percentiles.csv    per sweep and case: percentiles of the paired ratios
//	summary.json              warnings by kind with an example, per case, and the paired percentiles
//	csv-metadata.json         W3C CSV on the Web description of the CSV files above
//	probability/case-CCCC.csv per case: share of realizations that stimulated each map cell
//	probability/csv-metadata.json  description of the probability grids, with each grid's geometry
//
// Every CSV file is plain RFC 4180 CSV: one header row, no comment lines,
// an empty field for a missing value. The paired tables are written only
// when there are sweeps. Every file is written under a temporary name
// (".NAME.tmp-…"), synced and renamed; temporary files are never read and
// are removed on resume.
//
// # Result file format (version 2)
//
// All integers little endian:
//
//	offset  size  content
//	0       8     magic "SFBATRES"
//	8       2     format version, 2
//	10      2     flags, 0
//	12      8     n, payload length in bytes (at most 256 MiB)
//	20      4     CRC-32C (Castagnoli) of the payload
//	24      n     one zstd frame (RFC 8878) of a UTF-8 JSON object
//
// The JSON object's keys: case, realization, case_digest, network_digest,
// final_area_m2, fracture_area_m2, events, max_magnitude_mw (null without
// events), peak_bhp_pa, injected_volume_m3, interval_s, area_m2 (the
// curve on the time grid), cells (ascending cell indices), warnings (an
// array of {kind, message}). ReadResult rejects a cut file
// (io.ErrUnexpectedEOF) and any other damage (ErrFormat); a file of
// version 1, which did not record warnings, is refused with a FormatError
// that says so (a resumed batch runs it again), a newer version with an
// UnsupportedError.
//
// # Probability grid format
//
// See WriteProbabilityGrid: the CSV header
// col,row,x_center_m,y_center_m,stimulated_realizations,stimulation_probability,
// then one row per cell stimulated at least once. The grid's geometry and
// the realization count are the case's in manifest.json
// (ReadProbabilityGrid takes them from there) and are repeated in
// probability/csv-metadata.json.
//
// # References
//
// Hyndman, R. J. and Fan, Y., 1996. Sample quantiles in statistical
// packages. The American Statistician 50(4), 361–365.
// doi:10.1080/00031305.1996.10473566.
//
// Collet, Y. and Kucherawy, M., 2021. Zstandard Compression and the
// 'application/zstd' Media Type. RFC 8878. doi:10.17487/RFC8878.
//
// Castagnoli, G., Bräuer, S. and Herrmann, M., 1993. Optimization of cyclic
// redundancy-check codes with 24 and 32 parity bits. IEEE Transactions on
// Communications 41(6), 883–892. doi:10.1109/26.231911.
package batch
