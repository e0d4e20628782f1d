package batch

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
	"unicode"

	"slipfront/scenarios"
)

// Sweep varies one scalar scenario key over a list of values, written as
// for --set ("fluids.slickwater.viscosity" with "1 cP", "5 cP", "20 cP").
type Sweep struct {
	Key    string   `json:"key"`
	Values []string `json:"values"`
	// Reference is the value the other values are compared with in the
	// paired comparison (see Pairing); "" means the first value.
	Reference string `json:"reference"`
}

// reference returns the index of the sweep's reference value; -1 when
// the reference is not one of the values.
func (s Sweep) reference() int {
	if s.Reference == "" {
		return 0
	}
	return slices.Index(s.Values, s.Reference)
}

// SetReference makes value the reference of the sweep that has it: ref is
// "VALUE", which must be a value of exactly one sweep, or "KEY=VALUE".
func SetReference(sweeps []Sweep, ref string) error {
	key, value, named := strings.Cut(ref, "=")
	if !named {
		key, value = "", ref
	}
	key, value = strings.TrimSpace(key), strings.TrimSpace(value)
	var found []int
	for i, s := range sweeps {
		if (!named || s.Key == key) && slices.Contains(s.Values, value) {
			found = append(found, i)
		}
	}
	switch {
	case len(sweeps) == 0:
		return inputErrorf("--reference %q: there is no --sweep to compare against", ref)
	case len(found) == 0 && named && !slices.ContainsFunc(sweeps, func(s Sweep) bool { return s.Key == key }):
		return inputErrorf("--reference %q: no --sweep of %s", ref, key)
	case len(found) == 0:
		var lists []string
		for _, s := range sweeps {
			if !named || s.Key == key {
				lists = append(lists, s.String())
			}
		}
		return inputErrorf("--reference %q: not a swept value; the sweeps are %s", ref, strings.Join(lists, " "))
	case len(found) > 1:
		return inputErrorf("--reference %q: a value of several sweeps; name the sweep as KEY=VALUE", ref)
	}
	sweeps[found[0]].Reference = value
	return nil
}

// String returns "key=v1,v2,…", the form ParseSweep reads.
func (s Sweep) String() string { return s.Key + "=" + strings.Join(s.Values, ",") }

// ParseSweep reads "key=v1,v2,…": a dotted scenario key as for --set and a
// comma-separated list of distinct values (spaces around each value are
// dropped). Whether the key exists and each value is allowed is checked
// when the batch loads the scenario with it.
func ParseSweep(text string) (Sweep, error) {
	key, list, ok := strings.Cut(text, "=")
	key = strings.TrimSpace(key)
	if !ok || key == "" || strings.TrimSpace(list) == "" {
		return Sweep{}, inputErrorf("--sweep %q: want key=v1,v2,..., e.g. fluids.slickwater.viscosity=1cP,5cP,20cP", text)
	}
	sw := Sweep{Key: key}
	seen := map[string]int{}
	for i, v := range strings.Split(list, ",") {
		v = strings.TrimSpace(v)
		if v == "" {
			return Sweep{}, inputErrorf("--sweep %q: value %d is empty", text, i+1)
		}
		if j := strings.IndexFunc(v, unicode.IsControl); j >= 0 {
			return Sweep{}, inputErrorf("--sweep %q: value %q holds a control character", text, v)
		}
		if first, dup := seen[v]; dup {
			return Sweep{}, inputErrorf("--sweep %q: value %q is listed twice (values %d and %d)", text, v, first+1, i+1)
		}
		seen[v] = i
		if _, err := scenarios.ParseOverride(key + "=" + v); err != nil {
			return Sweep{}, inputError(fmt.Sprintf("--sweep %q", text), err)
		}
		sw.Values = append(sw.Values, v)
	}
	sw.Reference = sw.Values[0]
	return sw, nil
}

// Case is one combination of sweep values: one value of every sweep.
//
// Cases are numbered like nested loops over the sweeps in the order given,
// the first sweep outermost (slowest) and the last innermost (fastest):
// with sweeps A = a0,a1 and B = b0,b1,b2 the cases are 0: a0 b0, 1: a0 b1,
// 2: a0 b2, 3: a1 b0, 4: a1 b1, 5: a1 b2. Without sweeps there is one case,
// the base scenario.
type Case struct {
	// Index of the case in the batch.
	Index int
	// Values holds one value per sweep, in sweep order.
	Values []string
	// Overrides applies the values to the scenario.
	Overrides []scenarios.Override
}

// Label returns "key=value, key=value" for the case's sweep values, or
// "base" when there are no sweeps.
func (c Case) Label() string {
	if len(c.Overrides) == 0 {
		return "base"
	}
	parts := make([]string, len(c.Overrides))
	for i, o := range c.Overrides {
		parts[i] = o.String()
	}
	return strings.Join(parts, ", ")
}

// Cases returns the full product of the sweeps' values in the documented
// order (see Case).
func Cases(sweeps []Sweep) []Case {
	n := 1
	for _, s := range sweeps {
		n *= len(s.Values)
	}
	cases := make([]Case, n)
	for c := range cases {
		k := c
		vals := make([]string, len(sweeps))
		ovs := make([]scenarios.Override, len(sweeps))
		for i := len(sweeps) - 1; i >= 0; i-- {
			m := len(sweeps[i].Values)
			vals[i] = sweeps[i].Values[k%m]
			ovs[i] = scenarios.Override{Key: sweeps[i].Key, Value: vals[i]}
			k /= m
		}
		cases[c] = Case{Index: c, Values: vals, Overrides: ovs}
	}
	return cases
}

// MaxRealizations caps the realizations of a batch, and MaxResults the
// result files (cases × realizations), so that a typing error or a
// damaged manifest cannot start a run of years or a folder of billions of
// files (common practice, no source).
const (
	MaxRealizations = 1_000_000
	MaxResults      = 10_000_000
)

// maxCases caps the product of the sweeps.
const maxCases = 100000

// checkSweeps checks that keys are distinct, every sweep has values and a
// reference among them, and the product is not absurdly large.
func checkSweeps(sweeps []Sweep) error {
	keys := map[string]bool{}
	total := 1
	for _, s := range sweeps {
		if len(s.Values) == 0 {
			return inputErrorf("--sweep %s has no values", s.Key)
		}
		if s.reference() < 0 {
			return inputErrorf("--sweep %s: reference %q is not one of its values", s, s.Reference)
		}
		if keys[s.Key] {
			return inputErrorf("--sweep %s is given twice; list all its values in one --sweep", s.Key)
		}
		keys[s.Key] = true
		total *= len(s.Values)
		if total > maxCases {
			return inputErrorf("the sweeps form more than %d cases", maxCases)
		}
	}
	return nil
}

// Shard is one share of a batch's realizations: shard Index of Count runs
// the realizations r with r mod Count = Index (round robin, so every shard
// gets early and late realizations and the shares differ by at most one).
// The zero Shard is the whole batch.
type Shard struct {
	Index int `json:"index"`
	Count int `json:"count"`
}

// ParseShard reads "i/n" with 0 ≤ i < n, e.g. "0/4" … "3/4" (Slurm:
// "$SLURM_ARRAY_TASK_ID/$SLURM_ARRAY_TASK_COUNT" for an array 0-(n−1)).
func ParseShard(text string) (Shard, error) {
	is, ns, ok := strings.Cut(text, "/")
	i, errI := strconv.Atoi(strings.TrimSpace(is))
	n, errN := strconv.Atoi(strings.TrimSpace(ns))
	if !ok || errI != nil || errN != nil {
		return Shard{}, inputErrorf("--shard %q: want i/n with whole numbers, e.g. 0/4 for the first of four shards", text)
	}
	s := Shard{Index: i, Count: n}
	if err := s.check(); err != nil {
		return Shard{}, err
	}
	return s, nil
}

// String returns "i/n".
func (s Shard) String() string {
	s = s.normal()
	return strconv.Itoa(s.Index) + "/" + strconv.Itoa(s.Count)
}

// Owns reports whether realization r belongs to the shard.
func (s Shard) Owns(r int) bool {
	s = s.normal()
	return r%s.Count == s.Index
}

// normal turns the zero Shard into 0/1.
func (s Shard) normal() Shard {
	if s == (Shard{}) {
		return Shard{Index: 0, Count: 1}
	}
	return s
}

func (s Shard) check() error {
	switch {
	case s.Count < 1:
		return inputErrorf("--shard %d/%d: the shard count must be ≥ 1", s.Index, s.Count)
	case s.Index < 0 || s.Index >= s.Count:
		return inputErrorf("--shard %d/%d: the shard index must be 0 to %d (shards are numbered from 0)", s.Index, s.Count, s.Count-1)
	}
	return nil
}
