package gis

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"
)

// The syntax shared by WKT1 (OGC 01-009, 2001, §7) and WKT2 (ISO 19162:2019
// = OGC 18-010r7, §6): an element is KEYWORD[value, …] or KEYWORD(value, …);
// a value is an element, a quoted text ("" inside stands for one quote), a
// number, or a bare enumeration word such as EAST or Cartesian. Spaces,
// tabs and line breaks may separate tokens.

// Limits on a WKT text, so a hostile file cannot exhaust memory or the
// stack. Real CRS definitions are a few kilobytes deep to 8 levels
// (PROJCRS › BASEGEOGCRS › ENSEMBLE › ELLIPSOID › LENGTHUNIT › ID);
// common practice, no source.
const (
	MaxWKTBytes = 1 << 20 // the longest text ParseWKT reads
	maxWKTDepth = 32
	maxWKTNodes = 100000
)

// WKTError is a syntax or content error in a WKT text, with the 1-based
// line and column (in characters) where it was found.
type WKTError struct {
	Line, Column int
	Msg          string
}

func (e *WKTError) Error() string {
	return fmt.Sprintf("gis: WKT line %d, column %d: %s", e.Line, e.Column, e.Msg)
}

// wktNode is one element: KEYWORD[args].
type wktNode struct {
	keyword string // upper case
	args    []wktArg
	off     int // byte offset of the keyword
}

// wktArg is one value of an element: exactly one of node, text (quoted),
// word (bare) or number is set, as kind says.
type wktArg struct {
	kind wktKind
	node *wktNode
	text string
	num  float64
	off  int
}

type wktKind int

const (
	argElement wktKind = iota + 1
	argText
	argWord
	argNumber
)

// wktParser is a recursive-descent parser over the text.
type wktParser struct {
	src   string
	pos   int
	nodes int
}

// wktErrorAt returns a WKTError at byte offset off of src.
func wktErrorAt(src string, off int, format string, args ...any) *WKTError {
	off = min(max(off, 0), len(src))
	before := src[:off]
	line := 1 + strings.Count(before, "\n")
	col := 1 + utf8.RuneCountInString(before[strings.LastIndexByte(before, '\n')+1:])
	return &WKTError{Line: line, Column: col, Msg: fmt.Sprintf(format, args...)}
}

// parseWKTTree parses one element filling the whole text (surrounding
// space allowed).
func parseWKTTree(src string) (*wktNode, error) {
	if len(src) > MaxWKTBytes {
		return nil, wktErrorAt(src, 0, "the text is %d bytes long; at most %d allowed", len(src), MaxWKTBytes)
	}
	p := &wktParser{src: src}
	p.space()
	n, err := p.element(0)
	if err != nil {
		return nil, err
	}
	p.space()
	if p.pos < len(src) {
		return nil, wktErrorAt(src, p.pos, "unexpected %q after the end of the CRS definition", p.peekRune())
	}
	return n, nil
}

func (p *wktParser) fail(format string, args ...any) error {
	return wktErrorAt(p.src, p.pos, format, args...)
}

func (p *wktParser) space() {
	for p.pos < len(p.src) {
		switch p.src[p.pos] {
		case ' ', '\t', '\n', '\r', '\f', '\v':
			p.pos++
		default:
			return
		}
	}
}

func (p *wktParser) peekRune() string {
	if p.pos >= len(p.src) {
		return "end of text"
	}
	r, _ := utf8.DecodeRuneInString(p.src[p.pos:])
	return string(r)
}

func isWordByte(c byte) bool {
	return c == '_' || c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= '0' && c <= '9'
}

// word reads [A-Za-z0-9_]+.
func (p *wktParser) word() string {
	start := p.pos
	for p.pos < len(p.src) && isWordByte(p.src[p.pos]) {
		p.pos++
	}
	return p.src[start:p.pos]
}

// element parses KEYWORD[args] at p.pos.
func (p *wktParser) element(depth int) (*wktNode, error) {
	if depth >= maxWKTDepth {
		return nil, p.fail("elements nested deeper than %d levels", maxWKTDepth)
	}
	if p.nodes++; p.nodes > maxWKTNodes {
		return nil, p.fail("more than %d elements", maxWKTNodes)
	}
	n := &wktNode{off: p.pos}
	kw := p.word()
	if kw == "" || kw[0] >= '0' && kw[0] <= '9' {
		return nil, p.fail("want a keyword such as PROJCS or PROJCRS, found %q", p.peekRune())
	}
	n.keyword = strings.ToUpper(kw)
	p.space()
	var closer byte
	switch {
	case p.pos < len(p.src) && p.src[p.pos] == '[':
		closer = ']'
	case p.pos < len(p.src) && p.src[p.pos] == '(':
		closer = ')'
	default:
		return nil, p.fail("want '[' or '(' after %s, found %q", kw, p.peekRune())
	}
	p.pos++
	for {
		p.space()
		a, err := p.arg(depth)
		if err != nil {
			return nil, err
		}
		n.args = append(n.args, a)
		p.space()
		if p.pos >= len(p.src) {
			return nil, p.fail("%s is not closed: want ',' or '%c'", n.keyword, closer)
		}
		switch c := p.src[p.pos]; {
		case c == ',':
			p.pos++
		case c == closer:
			p.pos++
			return n, nil
		default:
			return nil, p.fail("in %s: want ',' or '%c', found %q", n.keyword, closer, p.peekRune())
		}
	}
}

// arg parses one value.
func (p *wktParser) arg(depth int) (wktArg, error) {
	a := wktArg{off: p.pos}
	if p.pos >= len(p.src) {
		return a, p.fail("want a value, found the end of the text")
	}
	switch c := p.src[p.pos]; {
	case c == '"':
		s, err := p.quoted()
		a.kind, a.text = argText, s
		return a, err
	case c == '+' || c == '-' || c == '.' || c >= '0' && c <= '9':
		start := p.pos
		for p.pos < len(p.src) && strings.IndexByte("+-.0123456789eE", p.src[p.pos]) >= 0 {
			p.pos++
		}
		v, err := strconv.ParseFloat(p.src[start:p.pos], 64)
		if err != nil || math.IsInf(v, 0) {
			return a, wktErrorAt(p.src, start, "%q is not a finite number", p.src[start:p.pos])
		}
		a.kind, a.num = argNumber, v
		return a, nil
	case isWordByte(c):
		save := p.pos
		w := p.word()
		p.space()
		if p.pos < len(p.src) && (p.src[p.pos] == '[' || p.src[p.pos] == '(') {
			p.pos = save
			n, err := p.element(depth + 1)
			a.kind, a.node = argElement, n
			return a, err
		}
		a.kind, a.text = argWord, w
		return a, nil
	}
	return a, p.fail("want a value (element, quoted text, number or word), found %q", p.peekRune())
}

// quoted reads "…" with "" standing for one quote (ISO 19162 §6.3.4).
// Line breaks and tabs inside the text become spaces, as compactWKT
// prints them, so that a name reads the same from the file and from the
// CRS's own text.
func (p *wktParser) quoted() (string, error) {
	start := p.pos
	p.pos++ // opening quote
	var b strings.Builder
	for p.pos < len(p.src) {
		i := strings.IndexByte(p.src[p.pos:], '"')
		if i < 0 {
			break
		}
		b.WriteString(p.src[p.pos : p.pos+i])
		p.pos += i + 1
		if p.pos < len(p.src) && p.src[p.pos] == '"' {
			b.WriteByte('"')
			p.pos++
			continue
		}
		return strings.Map(textSpace, b.String()), nil
	}
	return "", wktErrorAt(p.src, start, "quoted text is not closed")
}

// compactWKT returns src on one line: spaces and line breaks outside
// quoted text are removed (no WKT token contains one) and line breaks or
// tabs inside quoted text become spaces. src must parse.
func compactWKT(src string) string {
	var b strings.Builder
	b.Grow(len(src))
	inText := false
	for i := 0; i < len(src); i++ {
		c := src[i]
		switch {
		case c == '"':
			inText = !inText // a doubled quote toggles twice
		case c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v':
			if !inText {
				continue
			}
			c = byte(textSpace(rune(c)))
		}
		b.WriteByte(c)
	}
	return strings.TrimSpace(b.String())
}

// textSpace maps the line breaks and tabs of quoted text to a space.
func textSpace(r rune) rune {
	switch r {
	case '\t', '\n', '\r', '\f', '\v':
		return ' '
	}
	return r
}

// looksLikeWKT reports whether s starts like a WKT element (a keyword
// then '[' or '('), as opposed to "EPSG:<code>".
func looksLikeWKT(s string) bool {
	s = strings.TrimSpace(s)
	i := 0
	for i < len(s) && isWordByte(s[i]) {
		i++
	}
	s = strings.TrimLeft(s[i:], " \t\r\n")
	return i > 0 && s != "" && (s[0] == '[' || s[0] == '(')
}

// child returns the first element argument of n with one of the keywords.
func (n *wktNode) child(keywords ...string) *wktNode {
	for _, a := range n.args {
		if a.kind == argElement && slices.Contains(keywords, a.node.keyword) {
			return a.node
		}
	}
	return nil
}

// children returns every element argument of n with the keyword.
func (n *wktNode) children(keyword string) []*wktNode {
	var out []*wktNode
	for _, a := range n.args {
		if a.kind == argElement && a.node.keyword == keyword {
			out = append(out, a.node)
		}
	}
	return out
}

// name returns the first argument when it is quoted text.
func (n *wktNode) name() string {
	if len(n.args) > 0 && n.args[0].kind == argText {
		return n.args[0].text
	}
	return ""
}

// number returns argument i when it is a number.
func (n *wktNode) number(i int) (float64, bool) {
	if i < len(n.args) && n.args[i].kind == argNumber {
		return n.args[i].num, true
	}
	return 0, false
}

// epsgCode returns the EPSG code of n's AUTHORITY["EPSG","code"] (WKT1)
// or ID["EPSG",code] (WKT2) child, 0 if none.
func (n *wktNode) epsgCode() int {
	id := n.child("ID", "AUTHORITY")
	if id == nil || len(id.args) < 2 || !strings.EqualFold(id.name(), "EPSG") {
		return 0
	}
	a := id.args[1]
	switch a.kind {
	case argNumber:
		if a.num == math.Trunc(a.num) && a.num > 0 && a.num <= maxEPSGCode {
			return int(a.num)
		}
	case argText:
		if c, err := strconv.Atoi(a.text); err == nil && c > 0 && c <= maxEPSGCode {
			return c
		}
	}
	return 0
}
