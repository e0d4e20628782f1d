// Package docs holds the repository's bibliography (references.md), the
// reference solver timings (bench.md) and the scripts that reproduce their
// numbers. Its only Go file is this test, which keeps the citations of the
// whole repository honest: it lives beside the file it checks, and go test
// ./... runs it with everything else.
package docs

import (
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// sep matches the space between two words of a citation, which may be a
// line break into the next line of a Go (//) or shell/Markdown (#) comment.
const sep = `(?:[ \t]*\n[ \t]*(?://+|#+)?[ \t]*|[ \t]+)`

// section is a section number of docs/references.md, e.g. "7" or "7.4".
const section = `\d+(?:\.\d+)*`

var (
	// headingRE finds the numbered headings of docs/references.md:
	// "## 7. Stress on a plane" and "### 7.4 Worked example".
	headingRE = regexp.MustCompile(`(?m)^#{2,4} (` + section + `)\.? `)

	// citationRE finds a citation of the bibliography and its list of
	// sections: "references.md §7.4", "§1.2–1.3", "§9–§10", "§6.2, §7 and
	// §8". After a comma or "and" the next number must carry its own §, so
	// that "§2.2, 6 decimals" cites §2.2 only.
	citationRE = regexp.MustCompile(`references\.md,?` + sep + `(§` + section +
		`(?:` + sep + `?[–-]` + sep + `?§?` + section + `|` + sep + `?(?:,|and|or)` + sep + `§` + section + `)*)`)

	// sectionRE picks the numbers out of a citation's list.
	sectionRE = regexp.MustCompile(section)

	// mentionRE finds every mention of the bibliography, to check its path.
	mentionRE = regexp.MustCompile(`[\w./-]*references\.md`)

	// outside lists references to things outside the repository, which a
	// reader of the repository cannot follow: the project's old
	// bibliography, its notes and shared folder, and issue numbers.
	outside = []struct {
		what string
		re   *regexp.Regexp
	}{
		{"the project's old bibliography (cite docs/references.md)", regexp.MustCompile(`REFERENCES\.md`)},
		{"the project's notes (state the fact or cite a publication)", regexp.MustCompile(`ecosystem\.md`)},
		{"the shared folder (copy what is needed into the repository)", regexp.MustCompile(`\.\./shared|/work/shared`)},
		{"an issue number (state the reason instead)", regexp.MustCompile(`(?i)\bissues?` + sep + `#?\d`)},
	}
)

// finding is one problem at a line of a file.
type finding struct {
	line int
	msg  string
}

// citedSections returns the sections that text cites, each with its line.
func citedSections(text string) (lines []int, sections []string) {
	for _, m := range citationRE.FindAllStringSubmatchIndex(text, -1) {
		line := 1 + strings.Count(text[:m[0]], "\n")
		for _, s := range sectionRE.FindAllString(text[m[2]:m[3]], -1) {
			lines = append(lines, line)
			sections = append(sections, s)
		}
	}
	return lines, sections
}

// outsideReferences returns the references of text to things outside the
// repository.
func outsideReferences(text string) []finding {
	var out []finding
	for _, o := range outside {
		for _, m := range o.re.FindAllStringIndex(text, -1) {
			out = append(out, finding{1 + strings.Count(text[:m[0]], "\n"), "refers to " + o.what + ": " + strings.Join(strings.Fields(text[m[0]:m[1]]), " ")})
		}
	}
	return out
}

// checkFile returns the problems of one file at path rel (slash-separated,
// relative to the repository root) whose content is text.
func checkFile(rel, text string, known map[string]bool) (problems []finding, citations int) {
	lines, secs := citedSections(text)
	for i, s := range secs {
		if !known[s] {
			problems = append(problems, finding{lines[i], "cites §" + s + ", which docs/references.md does not have"})
		}
	}
	// Outside docs/ the bibliography is named by its path in the repository.
	if !strings.HasPrefix(rel, "docs/") {
		for _, m := range mentionRE.FindAllStringIndex(text, -1) {
			if name := text[m[0]:m[1]]; !strings.HasSuffix(name, "docs/references.md") {
				problems = append(problems, finding{1 + strings.Count(text[:m[0]], "\n"), "names " + name + ": write docs/references.md"})
			}
		}
	}
	return append(problems, outsideReferences(text)...), len(secs)
}

// knownSections returns the numbered sections of the bibliography.
func knownSections(text string) map[string]bool {
	known := map[string]bool{}
	for _, m := range headingRE.FindAllStringSubmatch(text, -1) {
		known[m[1]] = true
	}
	return known
}

// TestCitations reads every .go and .md file of the repository: each
// citation "docs/references.md §N" must name a section the bibliography
// has, and no file may point outside the repository.
func TestCitations(t *testing.T) {
	bib, err := os.ReadFile("references.md")
	if err != nil {
		t.Fatal(err)
	}
	known := knownSections(string(bib))
	// The bibliography has sections 1–20 (less 11) and their subsections;
	// finding fewer than 20 means the heading pattern no longer fits.
	if len(known) < 20 || !known["7.4"] || !known["15"] {
		t.Fatalf("found only %d numbered sections in references.md: %v", len(known), known)
	}
	root := ".."
	if _, err := os.Stat(filepath.Join(root, "go.mod")); err != nil {
		t.Fatalf("repository root not found: %v", err)
	}
	var files, citations int
	err = filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			if path != root && strings.HasPrefix(d.Name(), ".") {
				return filepath.SkipDir // .git and tool folders
			}
			return nil
		}
		if ext := filepath.Ext(path); ext != ".go" && ext != ".md" {
			return nil
		}
		rel, err := filepath.Rel(root, path)
		if err != nil {
			return err
		}
		rel = filepath.ToSlash(rel)
		if rel == "docs/docs_test.go" {
			return nil // This file quotes the patterns it looks for.
		}
		b, err := os.ReadFile(path)
		if err != nil {
			return err
		}
		files++
		problems, n := checkFile(rel, string(b), known)
		citations += n
		for _, p := range problems {
			t.Errorf("%s:%d: %s", rel, p.line, p.msg)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	// The repository has some 220 Go and Markdown files that cite the
	// bibliography about a hundred times; far fewer means the walk or the
	// citation pattern missed them and the test would pass vacuously.
	const minFiles, minCitations = 100, 50
	t.Logf("%d files, %d cited sections", files, citations)
	if files < minFiles || citations < minCitations {
		t.Errorf("read %d files with %d citations, want at least %d and %d", files, citations, minFiles, minCitations)
	}
}

// TestCitationPatterns pins what the patterns find, one row per form of
// citation in the repository, so that TestCitations cannot pass because a
// pattern stopped matching.
func TestCitationPatterns(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		want       []string
	}{
		{"one section", "// (docs/references.md §7.4).", []string{"7.4"}},
		{"top-level section", "// stress path (docs/references.md §13, Zoback)", []string{"13"}},
		{"range without a second §", "// (docs/references.md §1.2–1.3, from F)", []string{"1.2", "1.3"}},
		{"range with §", "// (a boundary-element solution, docs/references.md §9–§10) can", []string{"9", "10"}},
		{"list", "// docs/references.md §6.2, §7 and §8, which cite", []string{"6.2", "7", "8"}},
		{"number after a comma is not a section", "// (docs/references.md §2.2, 6 decimals: tolerance", []string{"2.2"}},
		{"broken across Go comment lines", "// (Sneddon 1946; docs/references.md\n// §8.3: a = 10 m)", []string{"8.3"}},
		{"broken inside a list", "// docs/references.md §6.2,\n\t// §7", []string{"6.2", "7"}},
		{"Markdown link", "[references.md §4.1](references.md#4-intersections)", []string{"4.1"}},
		{"a publication's own section is no citation", "// (Carslaw & Jaeger 1959 §2.4)", nil},
		{"mention without a section", "// see docs/references.md for the sources", nil},
	} {
		_, got := citedSections(tc.text)
		if !slices.Equal(got, tc.want) {
			t.Errorf("%s: %q cites %q, want %q", tc.name, tc.text, got, tc.want)
		}
	}
	known := map[string]bool{"7": true, "7.4": true}
	for _, tc := range []struct {
		name, rel, text string
		problems        int
	}{
		{"known section", "mechanics/a.go", "// docs/references.md §7.4", 0},
		{"unknown section", "mechanics/a.go", "// docs/references.md §7.5", 1},
		{"unknown end of a range", "mechanics/a.go", "// docs/references.md §7–§8", 1},
		{"bibliography without its path", "mechanics/a.go", "// see references.md §7", 1},
		{"relative path inside docs", "docs/bench.md", "[references.md §7](references.md)", 0},
		{"old bibliography", "a.go", "// REFERENCES.md §7.4", 1},
		{"notes", "a.go", "// (ecosystem.md §2)", 1},
		{"shared folder", "DEVELOPERS.md", "`python3 ../shared/bench/gen.py`", 1},
		{"issue number", "a.go", "// (issue 5)", 1},
		{"issue number across lines", "a.go", "// written (issue\n// 6; the batch)", 1},
		{"issue without a number", "a.go", "// the same issue as above", 0},
	} {
		problems, _ := checkFile(tc.rel, tc.text, known)
		if len(problems) != tc.problems {
			t.Errorf("%s: %q: %d problems %v, want %d", tc.name, tc.text, len(problems), problems, tc.problems)
		}
	}
}
