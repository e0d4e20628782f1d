package plural

import "strconv"

// Count returns n followed by singular when n is 1 and by plural
// otherwise: Count(1, "case", "cases") is "1 case".
func Count(n int, singular, plural string) string {
	if n == 1 {
		return "1 " + singular
	}
	return strconv.Itoa(n) + " " + plural
}

// S returns n followed by noun, with an "s" added unless n is 1:
// S(2, "realization") is "2 realizations".
func S(n int, noun string) string { return Count(n, noun, noun+"s") }
