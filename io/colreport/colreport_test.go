package colreport

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/io/register"
)

// read reads a register of testdata/ to its end and builds its report.
func read(t *testing.T, name string) Report {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	r, err := register.NewCSV(bytes.NewReader(b), name)
	if err != nil {
		t.Fatal(err)
	}
	for {
		if _, err := r.Next(context.Background()); errors.Is(err, io.EOF) {
			break
		} else if err != nil {
			t.Fatal(err)
		}
	}
	return Build(r.Header())
}

func TestColumnsAsRead(t *testing.T) {
	rep := read(t, "messy-title-block.csv")
	if rep.HeaderRow != 4 || len(rep.Columns) != 8 {
		t.Fatalf("header row %d, %d columns", rep.HeaderRow, len(rep.Columns))
	}
	for i, want := range []Column{
		{Column: "A", Title: "Plant No", Status: "read", Key: "asset_id", Header: "Asset ID"},
		{Column: "C", Title: "SWL", Status: "read", Key: "rated_load", Header: "Rated load", Unit: "kg", UnitFrom: "units row"},
		{Column: "H", Title: "Notes", Status: "passed through", Reason: "not a column of ours: written to the results as given"},
	} {
		got := rep.Columns[[]int{0, 2, 7}[i]]
		if got != want {
			t.Errorf("column %s:\ngot  %+v\nwant %+v", want.Column, got, want)
		}
	}
	if !strings.Contains(strings.Join(rep.Notes, "\n"), `2 rows (13 ("TOTAL"), 14 ("Summe")) are totals rows`) {
		t.Errorf("notes %q", rep.Notes)
	}

	rep = read(t, "messy-units.csv")
	g := rep.Columns[6]
	if g.Status != "refused" || g.UnitFrom != "none" || !strings.Contains(g.Reason, `"SWL" gives no unit`) {
		t.Errorf("SWL without a unit: %+v", g)
	}
	if c := rep.Columns[6+26]; c.Key != "motor_power" || c.Unit != "kW" || c.UnitFrom != "header" {
		t.Errorf("motor power: %+v", c)
	}

	rep = read(t, "messy-trade-headers.csv")
	m := rep.Columns[12]
	if m.Status != "refused" || !strings.Contains(m.Reason, "a second Rope diameter column") {
		t.Errorf("Rope Ø, a second rope diameter column: %+v", m)
	}
	if l := rep.Columns[11]; l.Key != "last_inspection" || !strings.Contains(l.Reason, "dates read with the day first") {
		t.Errorf("Last TE: %+v", l)
	}
}

// TestMissingUnlocks: a missing column's checks are those whose Needs name it
// (fleet.Definitions), and it unlocks exactly those whose other needs the register has.
func TestMissingUnlocks(t *testing.T) {
	rep := read(t, "messy-title-block.csv")
	present := map[string]bool{}
	for _, c := range rep.Columns {
		if c.Key != "" {
			present[c.Key] = true
		}
	}
	needs := map[string][]string{}
	for _, d := range fleet.Definitions() {
		needs[d.ID] = d.Needs
	}
	byKey := map[string]Missing{}
	for _, m := range rep.Missing {
		if present[m.Key] {
			t.Errorf("%s is in the register and listed missing", m.Key)
		}
		byKey[m.Key] = m
		for _, id := range m.NeededBy {
			found := false
			for _, k := range needs[id] {
				found = found || k == m.Key
			}
			if !found {
				t.Errorf("%s: %s does not need it", m.Key, id)
			}
		}
		for _, id := range m.Unlocks {
			for _, k := range needs[id] {
				if k != m.Key && !present[k] {
					t.Errorf("%s unlocks %s, which also needs the missing %s", m.Key, id, k)
				}
			}
		}
	}
	// The register has the rope diameter and the rated load: the drum diameter alone
	// stands between it and drum-ratio (its Needs: drum_diameter, rope_diameter).
	if d := byKey["drum_diameter"]; strings.Join(d.Unlocks, ",") != "drum-ratio" {
		t.Errorf("drum diameter unlocks %v", d.Unlocks)
	}
	if rep.Missing[0].Key != "drum_diameter" && len(rep.Missing[0].Unlocks) < len(byKey["drum_diameter"].Unlocks) {
		t.Errorf("not ordered by checks unlocked: %v first", rep.Missing[0].Key)
	}
}

func TestJSONAndText(t *testing.T) {
	rep := read(t, "messy-units.csv")
	var b bytes.Buffer
	if err := WriteJSON(&b, rep); err != nil {
		t.Fatal(err)
	}
	var back Report
	if err := json.Unmarshal(b.Bytes(), &back); err != nil {
		t.Fatal(err)
	}
	if back.File != "messy-units.csv" || len(back.Columns) != len(rep.Columns) || back.Columns[6].UnitFrom != "none" {
		t.Errorf("JSON round trip: %+v", back.Columns[6])
	}
	b.Reset()
	if err := WriteText(&b, rep); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), `Rated load — REFUSED: "SWL" gives no unit`) {
		t.Errorf("text report:\n%s", b.String())
	}
	b.Reset()
	if err := WriteText(&b, read(t, "messy-title-block.csv")); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"header in row 4", "Rated load [kg] (unit from the units row)", "Missing columns the checks need", "Drum diameter", "How the register was read"} {
		if !strings.Contains(b.String(), want) {
			t.Errorf("text report lacks %q:\n%s", want, b.String())
		}
	}
}
