package plural_test

import (
	"fmt"

	"slipfront/internal/plural"
)

func ExampleCount() {
	for _, n := range []int{0, 1, 2} {
		fmt.Println(plural.Count(n, "entry", "entries"), "and", plural.S(n, "fault"))
	}
	// Output:
	// 0 entries and 0 faults
	// 1 entry and 1 fault
	// 2 entries and 2 faults
}
