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
// CSV files carry their unit: area_m2, time_s, peak_bhp_MPa (pressures are
// reported in MPa), injected_volume_m3, max_magnitude_Mw.
//
// # Conventions
//
// Cases. Sweeps ("key=v1,v2,…", any scalar scenario key, values written as
// for --set) form their full product. Cases are numbered like nested loops
// over the sweeps in the order given, the first sweep outermost; without
// sweeps there is one case, the base scenario. Every sweep value is loaded
// and validated on its own, and every case is loaded, before any work
// starts.
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
// Percentiles. P10, P50 and P90 are the 10th, 50th and 90th percentiles in
// ascending order (P10 ≤ P50 ≤ P90, so P90 is the larger value), computed
// by gonum's stat.Quantile with stat.Empirical (Hyndman and Fan 1996,
// definition 1: the value of rank ⌈n·p⌉ among the n sorted realizations,
// so a percentile is always a value some realization produced; see
// QuantileKind). Standard deviations are sample standard
// deviations (n − 1 denominator), left empty for a single realization.
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
//	manifest.json            what was run (see Manifest); compared on resume and merge
//	results/cCCCC-rRRRRRR.sfr one result file per finished realization (ResultName)
//	realizations.csv         one row per case and realization
//	percentiles.csv          per case and time: P10, P50, P90, mean, std of the stimulated area
//	comparison.csv           per case: final and fracture area percentiles, events, magnitude, pressure
//	probability/case-CCCC.csv per case: share of realizations that stimulated each map cell
//
// Every file is written under a temporary name (".NAME.tmp-…"), synced and
// renamed; temporary files are never read and are removed on resume.
//
// # Result file format (version 1)
//
// All integers little endian:
//
//	offset  size  content
//	0       8     magic "SFBATRES"
//	8       2     format version, 1
//	10      2     flags, 0
//	12      8     n, payload length in bytes (at most 256 MiB)
//	20      4     CRC-32C (Castagnoli) of the payload
//	24      n     one zstd frame (RFC 8878) of a UTF-8 JSON object
//
// The JSON object's keys: case, realization, case_digest, network_digest,
// final_area_m2, fracture_area_m2, events, max_magnitude_mw (null without
// events), peak_bhp_pa, injected_volume_m3, interval_s, area_m2 (the
// curve on the time grid), cells (ascending cell indices). ReadResult
// rejects a cut file (io.ErrUnexpectedEOF) and any other damage (ErrFormat).
//
// # Probability grid format
//
// See WriteProbabilityGrid: "# key: value" header lines giving the case,
// the realization count and the grid (CRS, origin, corner, cell size,
// columns, rows), then CSV rows col,row,x_center_m,y_center_m,count,
// probability for every cell stimulated at least once.
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
