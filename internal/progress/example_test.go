package progress_test

import (
	"fmt"
	"time"

	"slipfront/internal/progress"
)

func ExampleStatus() {
	s := progress.Status{Done: 30, Total: 120, Elapsed: 90 * time.Second}
	fmt.Printf("%d%% done, %s\n", s.Percent(), s.LeftText())
	// Output:
	// 25% done, about 4m30s left
}
