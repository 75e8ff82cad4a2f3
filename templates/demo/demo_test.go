package demo

import (
	"encoding/csv"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
)

// approxEqual reports |got − want| ≤ max(absTol, relTol·max(|got|, |want|)).
func approxEqual(got, want, absTol, relTol float64) bool {
	d := math.Abs(got - want)
	return d <= absTol || d <= relTol*math.Max(math.Abs(got), math.Abs(want))
}

// unitSI is the SI value of one unit as written in the headers (NIST SP 811 appendix B,
// exact; standards.md "Units"), in kg, m, N, W, N m, kg m², m/s.
var unitSI = map[string]float64{
	"t": 1000, "kg": 1, "lb": 0.45359237,
	"mm": 0.001, "m": 1, "in": 0.0254, "ft": 0.3048,
	"kN": 1000, "lbf": 4.4482216152605,
	"kW": 1000, "hp": 745.69987158227022,
	"N m": 1, "lbf ft": 1.3558179483314004,
	"kg m2": 1, "lb ft2": 0.0421401100938048,
	"m/min": 1.0 / 60, "ft/min": 0.3048 / 60,
	"m/s2": 1, "ft/s2": 0.3048,
}

var headerRE = regexp.MustCompile(`^(.*?)\s*\[(.*)\]$`)

// register is a CSV register with its values in SI, keyed by the header name without unit.
type register struct {
	rows []map[string]string
	si   []map[string]float64
}

func load(t *testing.T, name string) register {
	t.Helper()
	f, err := os.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	var reg register
	for _, rec := range recs[1:] {
		row, si := map[string]string{}, map[string]float64{}
		for j, h := range recs[0] {
			key, factor := h, 1.0
			if m := headerRE.FindStringSubmatch(h); m != nil {
				key = m[1]
				if f, ok := unitSI[m[2]]; ok {
					factor = f
				}
			}
			row[key] = rec[j]
			if x, err := strconv.ParseFloat(rec[j], 64); err == nil {
				si[key] = x * factor
			}
		}
		reg.rows = append(reg.rows, row)
		reg.si = append(reg.si, si)
	}
	return reg
}

// pick returns the first of the names present (canonical header or the synonym used).
func pick(m map[string]float64, names ...string) float64 {
	for _, n := range names {
		if v, ok := m[n]; ok {
			return v
		}
	}
	return math.NaN()
}

// EN 12385-4 K factors (standards.md: seen).
var ropeK = map[string]float64{"6x36 IWRC": 0.356, "6x19 FC": 0.330}

func TestDemoRegisters(t *testing.T) {
	// Assets whose speed data is wrong on purpose (README: BQ-H11 hoist-speed fail).
	speedFault := map[string]bool{"BQ-H11": true}
	sites := map[string]bool{}
	n := 0
	for _, file := range []string{"demo-si.csv", "demo-us.csv"} {
		reg := load(t, file)
		for i, row := range reg.rows {
			id, v := row["Asset ID"], reg.si[i]
			n++
			sites[row["Site"]] = true
			parts := pick(v, "Parts of line", "Falls")
			ne := parts / pick(v, "Rope ends on drum")
			d := pick(v, "Rope diameter")
			D := pick(v, "Drum diameter")
			// design.md hoist-speed: v_calc = ω_m r_1 / (i n_e)
			wm := 2 * math.Pi * pick(v, "Motor speed") / 60
			vcalc := wm * D / 2 / (pick(v, "Gear ratio") * ne)
			vdecl := pick(v, "Hoist speed", "Hoisting speed")
			if !speedFault[id] && !approxEqual(vcalc, vdecl, 0, 0.01) {
				t.Errorf("%s %s: computed hoist speed %.4f m/s, declared %.4f m/s", file, id, vcalc, vdecl)
			}
			// EN 12385-4: F_min = d² R K / 1000 kN with d in mm (standards.md: seen)
			if mbf, ok := v["Rope MBF"]; ok {
				grade := 1960.0
				if g, ok := v["Rope grade"]; ok {
					grade = g
				}
				want := math.Pow(d*1000, 2) * grade * ropeK[row["Rope construction"]]
				// written to 0.1 kN (SI: ±50 N) or 100 lbf (US: ±50 lbf = ±222 N)
				tol := 50.0
				if strings.HasSuffix(file, "us.csv") {
					tol = 50 * 4.4482216152605
				}
				if !approxEqual(mbf, want, tol+1e-6, 0) {
					t.Errorf("%s %s: MBF %.0f N, EN 12385-4 gives %.0f N", file, id, mbf, want)
				}
			}
			if r := D / d; r < 14 || r > 41 {
				t.Errorf("%s %s: D/d %.1f outside 14–41", file, id, r)
			}
			// 1.5–110 kW; the US site's smallest motor is 2 hp = 1.49 kW
			if p := pick(v, "Motor power"); p < 1490 || p > 110000 {
				t.Errorf("%s %s: motor %.0f W outside 1.49–110 kW", file, id, p)
			}
			if rl := pick(v, "Rated load", "Rated capacity"); rl < 500-1e-6 || rl > 50000 {
				t.Errorf("%s %s: rated load %.0f kg outside 0.5–50 t", file, id, rl)
			}
			if dl := pick(v, "Brake delay"); dl < 0.15 || dl > 0.4 {
				t.Errorf("%s %s: brake delay %g s", file, id, dl)
			}
			for _, col := range []string{"Commissioned", "Last load test", "Rope fitted"} {
				if _, err := time.Parse("2006-01-02", row[col]); err != nil {
					t.Errorf("%s %s: %s %q is not an ISO date", file, id, col, row[col])
				}
			}
		}
	}
	if n < 50 || len(sites) < 4 {
		t.Errorf("%d hoists on %d sites; the demo needs at least 40 on 3 sites plus the US site", n, len(sites))
	}
}

// TestDemoBadCells: the SI register keeps exactly the three bad cells README lists.
func TestDemoBadCells(t *testing.T) {
	reg := load(t, "demo-si.csv")
	want := map[string]string{"BQ-H13": "Lift height=twelve", "CS-H13": "Last inspection=31/02/2025", "OF-H08": "Service=extreme"}
	for _, row := range reg.rows {
		id := row["Asset ID"]
		var bad []string
		if _, err := strconv.ParseFloat(row["Lift height"], 64); err != nil {
			bad = append(bad, "Lift height="+row["Lift height"])
		}
		if _, err := time.Parse("2006-01-02", row["Last inspection"]); err != nil {
			bad = append(bad, "Last inspection="+row["Last inspection"])
		}
		switch row["Service"] {
		case "normal", "heavy", "severe":
		default:
			bad = append(bad, "Service="+row["Service"])
		}
		if got := strings.Join(bad, ","); got != want[id] {
			t.Errorf("%s: bad cells %q, want %q", id, got, want[id])
		}
	}
}

// TestSmallUSMatchesSI: ../../testdata/small-us.csv is small-si.csv in US units; with the
// NIST SP 811 factors every number comes back to the SI value.
func TestSmallUSMatchesSI(t *testing.T) {
	si, us := load(t, "../../testdata/small-si.csv"), load(t, "../../testdata/small-us.csv")
	if len(si.rows) != len(us.rows) || len(si.rows) == 0 {
		t.Fatalf("%d SI rows, %d US rows", len(si.rows), len(us.rows))
	}
	compared := 0
	for i := range si.si {
		for k, x := range si.si[i] {
			y, ok := us.si[i][k]
			if !ok {
				t.Errorf("row %d: %q missing in the US register", i+2, k)
				continue
			}
			if !approxEqual(y, x, 1e-12, 1e-12) {
				t.Errorf("row %d %q: US gives %.17g, SI %.17g", i+2, k, y, x)
			}
			compared++
		}
	}
	if compared < 5*30 {
		t.Errorf("only %d numbers compared", compared)
	}
}
