// Package caution holds the caution that every output which could inform
// field work carries, in one wording.
package caution

// Text is the full caution, for summaries, pages and the command line.
const Text = "slipfront is a screening and comparison tool, not a design code: pump pressures, well integrity and induced-seismicity limits follow local regulation and licensed engineering practice."

// Short is the one-line form printed on pictures.
const Short = "Screening and comparison tool — not for design; see README cautions"
