package csvw_test

import (
	"os"

	"slipfront/internal/csvw"
)

func ExampleGroup_Write() {
	g := csvw.Group{Title: "example", Tables: []csvw.Table{{
		URL: "events.csv",
		Columns: []csvw.Column{
			{Title: "time_s", Datatype: csvw.Double, Unit: "s", Description: "time since the start of pumping"},
			{Title: "sets[1].size.min", Datatype: csvw.String, Description: "a swept scenario value"},
		},
	}}}
	g.Write(os.Stdout)
	// Output:
	// {
	//   "@context": [
	//     "http://www.w3.org/ns/csvw",
	//     {
	//       "@language": "en"
	//     }
	//   ],
	//   "dc:title": "example",
	//   "tables": [
	//     {
	//       "url": "events.csv",
	//       "tableSchema": {
	//         "columns": [
	//           {
	//             "name": "time_s",
	//             "titles": "time_s",
	//             "datatype": "double",
	//             "dc:description": "time since the start of pumping",
	//             "schema:unitText": "s"
	//           },
	//           {
	//             "name": "sets%5B1%5D.size.min",
	//             "titles": "sets[1].size.min",
	//             "datatype": "string",
	//             "dc:description": "a swept scenario value"
	//           }
	//         ]
	//       }
	//     }
	//   ]
	// }
}
