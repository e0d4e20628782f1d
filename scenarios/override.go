package scenarios

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"slipfront/internal/badinput"
	"slipfront/internal/plural"

	"github.com/BurntSushi/toml"
)

// Override is one command-line "--set key=value": a dotted scenario key
// such as "fluids.slickwater.viscosity" or "sets[0].orientation.kappa" and
// its value written as in the file, without quotes ("20 cP", "15").
type Override struct {
	Key   string
	Value string
}

func (o Override) String() string { return o.Key + "=" + o.Value }

// ParseOverride splits "key=value".
func ParseOverride(s string) (Override, error) {
	k, v, ok := strings.Cut(s, "=")
	k, v = strings.TrimSpace(k), strings.TrimSpace(v)
	if !ok || k == "" || v == "" {
		return Override{}, badinput.Errorf("--set %s: want key=value, e.g. fluids.slickwater.viscosity=20cP", s)
	}
	if _, err := parseKeyPath(k); err != nil {
		return Override{}, badinput.Errorf("--set %s: %w", s, err)
	}
	return Override{Key: k, Value: v}, nil
}

// ParseOverrides parses every "key=value" in order.
func ParseOverrides(list []string) ([]Override, error) {
	out := make([]Override, 0, len(list))
	for _, s := range list {
		o, err := ParseOverride(s)
		if err != nil {
			return nil, err
		}
		out = append(out, o)
	}
	return out, nil
}

type keySegment struct {
	name  string
	index int // -1 when the segment has no [i]
}

var segmentPattern = regexp.MustCompile(`^([A-Za-z0-9_\- ]+)(?:\[(\d+)\])?$`)

// parseKeyPath splits "sets[0].orientation.kappa" into segments.
func parseKeyPath(k string) ([]keySegment, error) {
	var segs []keySegment
	for _, part := range splitKey(k) {
		m := segmentPattern.FindStringSubmatch(part)
		if m == nil {
			return nil, fmt.Errorf("bad key %q: want dotted names with optional [index], e.g. sets[0].orientation.kappa", k)
		}
		s := keySegment{name: m[1], index: -1}
		if m[2] != "" {
			s.index, _ = strconv.Atoi(m[2])
		}
		segs = append(segs, s)
	}
	return segs, nil
}

// value is the override's value for the tree: a string, as a file's
// quoted value, or a list written as in TOML (["90 m", "120 m"]).
func (o Override) value() (any, error) {
	if !strings.HasPrefix(o.Value, "[") {
		return o.Value, nil
	}
	var t map[string]any
	if _, err := toml.Decode("v = "+o.Value, &t); err != nil {
		return nil, fmt.Errorf("a list must be written as in TOML, e.g. [\"90 m\", \"120 m\"]: %w", err)
	}
	return t["v"], nil
}

// apply writes the override into the generic TOML tree and returns the
// normalised key path it set.
func (o Override) apply(tree map[string]any) (string, error) {
	segs, err := parseKeyPath(o.Key)
	if err != nil {
		return "", err
	}
	fail := func(format string, args ...any) (string, error) {
		return "", &FieldError{File: overrideSource, Key: o.Key, Value: o.Value, Msg: fmt.Sprintf(format, args...)}
	}
	node, path := tree, ""
	for i, s := range segs {
		last := i == len(segs)-1
		path = joinKey(path, s.name)
		if s.index >= 0 {
			list, ok := node[s.name].([]map[string]any)
			if !ok {
				return fail("%s is not a list of tables in this scenario", path)
			}
			if s.index >= len(list) {
				return fail("index %d out of range: the scenario has %s in %s", s.index, plural.Count(len(list), "entry", "entries"), path)
			}
			path += "[" + strconv.Itoa(s.index) + "]"
			if last {
				return fail("%s is a table; set one of its keys", path)
			}
			node = list[s.index]
			continue
		}
		if last {
			switch node[s.name].(type) {
			case map[string]any:
				return fail("%s is a table; set one of its keys", path)
			case []map[string]any:
				return fail("%s is a list of tables; give an index and a key, e.g. %s[0].name", path, path)
			}
			v, err := o.value()
			if err != nil {
				return fail("%v", err)
			}
			node[s.name] = v
			return path, nil
		}
		switch next := node[s.name].(type) {
		case map[string]any:
			node = next
		case nil:
			m := map[string]any{}
			node[s.name] = m
			node = m
		case []map[string]any:
			return fail("%s is a list of tables; give an index, e.g. %s[0]", path, path)
		default:
			return fail("%s is a value, not a table", path)
		}
	}
	return path, nil
}
