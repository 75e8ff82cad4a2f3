package register_test

import (
	"context"
	"fmt"
	"io"
	"log"
	"strings"

	"hoistfleet/io/register"
)

func ExampleNewCSV() {
	const reg = `Asset ID,Rated load [lb],Rope diameter (in),Maintenance contractor
H-7,4000,0.5,Crane Care Ltd
H-8,twelve,0.5,
`
	r, err := register.NewCSV(strings.NewReader(reg), "hoists.csv")
	if err != nil {
		log.Fatal(err)
	}
	for _, c := range r.Header().Columns {
		fmt.Printf("%-24q key %-14q factor %g\n", c.Title, c.Key, c.Factor)
	}
	for {
		a, err := r.Next(context.Background())
		if err == io.EOF {
			break
		}
		if err != nil {
			log.Fatal(err)
		}
		load := a.Get("rated_load")
		if load.Err != nil {
			fmt.Println(load.Err)
			continue
		}
		fmt.Printf("%s row %d: %.4f kg, rope %.4f m, contractor %q\n", a.ID, a.Row, load.Num, a.Get("rope_diameter").Num, a.Cells[3].Text)
	}
	// Output:
	// "Asset ID"               key "asset_id"     factor 1
	// "Rated load [lb]"        key "rated_load"   factor 0.45359237
	// "Rope diameter (in)"     key "rope_diameter" factor 0.0254
	// "Maintenance contractor" key ""             factor 1
	// H-7 row 2: 1814.3695 kg, rope 0.0127 m, contractor "Crane Care Ltd"
	// hoists.csv!B3: asset H-8: "twelve" is not a number in [lb]
}
