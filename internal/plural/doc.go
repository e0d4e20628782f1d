// Package plural writes counts with their noun in the right number for
// messages: "1 fracture", "2 fractures", "0 fractures".
//
// # Conventions
//
// English: the singular for exactly one, the plural otherwise (zero
// included). Nouns with an irregular plural are given both forms.
//
// # References
//
// None: common practice, no source.
package plural
