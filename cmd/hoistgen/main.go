// Command hoistgen writes a synthetic register of powered drum hoists, of any size and
// reproducible from a seed, for testing and benchmarking hoistfleet:
//
//	hoistgen -n 100000 -seed 1 -o big.xlsx
//	hoistgen -n 500 -seed 7 --units us -o us.csv
//
// Each hoist is designed to be self-consistent (rope to ISO 4308-1 Zp, drum to h1, motor,
// gear ratio and brake sized from the load and speed); about 30 % carry one seeded defect,
// named in the "Generator note" column, so a run shows a realistic mix of pass, marginal
// and fail.
package main

import (
	"errors"
	"fmt"
	"os"

	"github.com/spf13/pflag"
)

func main() {
	err := run(os.Args[1:], os.Stdout, os.Stderr)
	var ue *usageError
	switch {
	case err == nil, errors.Is(err, pflag.ErrHelp):
		return
	case errors.As(err, &ue):
		fmt.Fprintln(os.Stderr, "hoistgen:", err)
		os.Exit(2)
	default:
		fmt.Fprintln(os.Stderr, "hoistgen:", err)
		os.Exit(1)
	}
}
