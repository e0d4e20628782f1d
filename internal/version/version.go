// Package version holds slipfront's version, recorded in every output that
// can be compared later (batch manifests, snapshot headers, summaries).
package version

// Version of the program. Batches refuse to resume or merge across
// versions that differ.
const Version = "0.1.0"
