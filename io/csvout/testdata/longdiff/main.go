// Command longdiff compares two long-form CSV files written by hoistfleet before and
// after issue 17 (item 4) field by field, and fails unless the only differences are
// the ones made on purpose: numbers rounded to six significant digits (each new number
// within half a unit of the sixth digit of the old one, also inside the figures field)
// and the source field shortened (the new one is cite.Short of the old). Every other
// field, the header and the number of records must be the same.
//
//	go run ./io/csvout/testdata/longdiff [-comma ';'] OLD.csv[.gz] NEW.csv[.gz]
package main

import (
	"compress/gzip"
	"encoding/csv"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"hoistfleet/io/cite"
)

func main() {
	comma := flag.String("comma", ",", "the field separator")
	flag.Parse()
	if flag.NArg() != 2 {
		fmt.Fprintln(os.Stderr, "usage: longdiff [-comma C] OLD NEW")
		os.Exit(2)
	}
	old, err := read(flag.Arg(0), *comma)
	if err == nil {
		var nu [][]string
		if nu, err = read(flag.Arg(1), *comma); err == nil {
			err = compare(old, nu)
		}
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "longdiff:", err)
		os.Exit(1)
	}
}

func read(name, comma string) ([][]string, error) {
	f, err := os.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var r io.Reader = f
	if strings.HasSuffix(name, ".gz") {
		if r, err = gzip.NewReader(f); err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
	}
	cr := csv.NewReader(r)
	cr.Comma = []rune(comma)[0]
	cr.FieldsPerRecord = -1
	recs, err := cr.ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	return recs, nil
}

func compare(old, nu [][]string) error {
	if len(old) != len(nu) {
		return fmt.Errorf("%d records before, %d after", len(old), len(nu))
	}
	if len(old) == 0 {
		return nil
	}
	h := old[0]
	if strings.Join(h, "\x00") != strings.Join(nu[0], "\x00") {
		return fmt.Errorf("header differs:\n%q\n%q", h, nu[0])
	}
	numbers, sources, same := 0, 0, 0
	for i := 1; i < len(old); i++ {
		if len(old[i]) != len(nu[i]) {
			return fmt.Errorf("record %d: %d fields before, %d after", i+1, len(old[i]), len(nu[i]))
		}
		for j, a := range old[i] {
			b := nu[i][j]
			col := h[j]
			switch {
			case a == b:
				same++
			case col == "source" && strings.TrimPrefix(b, "'") == cite.Short(strings.TrimPrefix(a, "'")):
				sources++
			case col == "figures":
				n, err := sameFigures(a, b)
				if err != nil {
					return fmt.Errorf("record %d %s: %w", i+1, col, err)
				}
				numbers += n
			default:
				if err := sameNumber(a, b); err != nil {
					return fmt.Errorf("record %d %s: %q → %q: %w", i+1, col, a, b, err)
				}
				numbers++
			}
		}
	}
	fmt.Printf("%d records: %d fields the same, %d numbers rounded within half a unit of the sixth digit, %d sources shortened\n",
		len(old)-1, same, numbers, sources)
	return nil
}

// sameNumber: b is a to six significant digits.
func sameNumber(a, b string) error {
	x, err1 := strconv.ParseFloat(a, 64)
	y, err2 := strconv.ParseFloat(b, 64)
	if err1 != nil || err2 != nil {
		return fmt.Errorf("not numbers")
	}
	if x == y {
		return nil
	}
	half := 0.5 * math.Pow(10, math.Floor(math.Log10(math.Abs(x)))-5)
	// (1 + 1e-9): the subtraction itself is off by up to an ulp of x, about 1e-10 of half
	if d := math.Abs(x - y); d > half*(1+1e-9) {
		return fmt.Errorf("differs by %g, more than half a unit in the sixth digit (%g)", d, half)
	}
	return nil
}

// sameFigures: the same names in the same order, texts the same, numbers rounded.
func sameFigures(a, b string) (int, error) {
	fa, fb := strings.Split(a, "; "), strings.Split(b, "; ")
	if len(fa) != len(fb) {
		return 0, fmt.Errorf("%d figures before, %d after", len(fa), len(fb))
	}
	n := 0
	for k := range fa {
		na, va, _ := strings.Cut(fa[k], "=")
		nb, vb, _ := strings.Cut(fb[k], "=")
		if na != nb {
			return 0, fmt.Errorf("figure %d: %q before, %q after", k+1, na, nb)
		}
		if va == vb {
			continue
		}
		if err := sameNumber(va, vb); err != nil {
			return 0, fmt.Errorf("figure %s: %q → %q: %w", na, va, vb, err)
		}
		n++
	}
	return n, nil
}
