package scenarios

import (
	"strconv"
	"strings"
)

// keyLines maps dotted key paths ("sets[1].orientation.kappa") to the line
// where they are written. BurntSushi/toml reports no key positions, so the
// source is scanned here: table headers, array-of-table headers and
// "key = value" lines. It only locates keys for messages; the TOML parser
// decides what the file means.
type keyLines map[string]int

func scanKeyLines(src string) keyLines {
	lines := keyLines{}
	arrayIndex := map[string]int{} // indexed path of an array of tables → current index
	prefix := ""
	depth := 0 // open brackets of a multi-line value
	for n, raw := range strings.Split(src, "\n") {
		line := stripComment(raw)
		trimmed := strings.TrimSpace(line)
		if depth > 0 {
			depth += bracketBalance(trimmed)
			continue
		}
		switch {
		case trimmed == "":
		case strings.HasPrefix(trimmed, "[["):
			segs := splitKey(strings.TrimSuffix(strings.TrimPrefix(trimmed, "[["), "]]"))
			if len(segs) == 0 {
				continue
			}
			parent := resolveTable(segs[:len(segs)-1], arrayIndex)
			arr := joinKey(parent, segs[len(segs)-1])
			if i, ok := arrayIndex[arr]; ok {
				arrayIndex[arr] = i + 1
			} else {
				arrayIndex[arr] = 0
			}
			prefix = arr + "[" + strconv.Itoa(arrayIndex[arr]) + "]"
			setFirst(lines, arr, n+1)
			lines[prefix] = n + 1
		case strings.HasPrefix(trimmed, "["):
			segs := splitKey(strings.TrimSuffix(strings.TrimPrefix(trimmed, "["), "]"))
			prefix = resolveTable(segs, arrayIndex)
			lines[prefix] = n + 1
		default:
			eq := strings.Index(trimmed, "=")
			if eq <= 0 {
				continue
			}
			key := joinKey(prefix, strings.Join(splitKey(trimmed[:eq]), "."))
			lines[key] = n + 1
			depth = bracketBalance(trimmed[eq+1:])
		}
	}
	return lines
}

// lineOf returns the line of path, or of its closest written ancestor.
func (l keyLines) lineOf(path string) int {
	for path != "" {
		if n, ok := l[path]; ok {
			return n
		}
		path = parentKey(path)
	}
	return 0
}

func setFirst(m keyLines, k string, v int) {
	if _, ok := m[k]; !ok {
		m[k] = v
	}
}

// resolveTable turns header segments into an indexed path, adding the
// current index of every array of tables it passes through.
func resolveTable(segs []string, arrayIndex map[string]int) string {
	cur := ""
	for _, s := range segs {
		cur = joinKey(cur, s)
		if i, ok := arrayIndex[cur]; ok {
			cur += "[" + strconv.Itoa(i) + "]"
		}
	}
	return cur
}

// parentKey strips the last ".key" or "[i]" of a path.
func parentKey(path string) string {
	if strings.HasSuffix(path, "]") {
		if i := strings.LastIndex(path, "["); i >= 0 {
			return path[:i]
		}
	}
	if i := strings.LastIndex(path, "."); i >= 0 {
		return path[:i]
	}
	return ""
}

func joinKey(prefix, key string) string {
	if prefix == "" {
		return key
	}
	return prefix + "." + key
}

// splitKey splits a dotted TOML key, removing quotes and blanks.
func splitKey(k string) []string {
	var segs []string
	var cur strings.Builder
	quote := rune(0)
	for _, r := range k {
		switch {
		case quote != 0 && r == quote:
			quote = 0
		case quote != 0:
			cur.WriteRune(r)
		case r == '"' || r == '\'':
			quote = r
		case r == '.':
			segs = append(segs, strings.TrimSpace(cur.String()))
			cur.Reset()
		default:
			cur.WriteRune(r)
		}
	}
	return append(segs, strings.TrimSpace(cur.String()))
}

// stripComment removes a trailing # comment that is outside quotes.
func stripComment(s string) string {
	quote := rune(0)
	for i, r := range s {
		switch {
		case quote != 0 && r == quote:
			quote = 0
		case quote == 0 && (r == '"' || r == '\''):
			quote = r
		case quote == 0 && r == '#':
			return s[:i]
		}
	}
	return s
}

// bracketBalance counts '[' and '{' minus ']' and '}' outside quotes.
func bracketBalance(s string) int {
	n := 0
	quote := rune(0)
	for _, r := range s {
		switch {
		case quote != 0 && r == quote:
			quote = 0
		case quote == 0 && (r == '"' || r == '\''):
			quote = r
		case quote == 0 && (r == '[' || r == '{'):
			n++
		case quote == 0 && (r == ']' || r == '}'):
			n--
		}
	}
	return n
}
