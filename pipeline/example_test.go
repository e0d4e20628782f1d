package pipeline_test

import (
	"fmt"
	"strings"

	"slipfront/pipeline"
	"slipfront/scenarios"
)

// The resolved scenario as the report page lists it: dotted keys, values
// in the trade's units, defaults filled in.
func ExampleInputsTable() {
	s, err := scenarios.LoadExample("zipper-pad")
	if err != nil {
		panic(err)
	}
	for _, row := range pipeline.InputsTable(s).Rows {
		if strings.HasPrefix(row[0], "stress.") {
			fmt.Printf("%s = %s\n", row[0], row[1])
		}
	}
	// Output:
	// stress.sv_gradient = 25 kPa/m
	// stress.shmax_gradient = 28 kPa/m
	// stress.shmin_gradient = 18.5 kPa/m
	// stress.pore_pressure_gradient = 12 kPa/m
	// stress.shmax_azimuth = 75 ° from north
}
