// Package baseline reads an earlier hoistfleet run back (check --baseline PREVIOUS) into
// a fleet.Baseline: from its results workbook (the Register sheet's hoists, statuses,
// ratings and register values; the Audit sheet's run) or from its JSON lines (statuses,
// ratings and capacities; JSON lines carry no run header and no register values, which
// the baseline's notes say).
package baseline

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
	"hoistfleet/io/register"
	"hoistfleet/io/units"
)

// The result columns of the workbook's Register sheet that the baseline reads
// (io/xlsxout's registerResultHeaders), found as a run: Status, Action, Governing check.
const (
	colStatus = "Status"
	colAction = "Action"
	colGov    = "Governing check"
)

// Read reads the baseline at path: a workbook when the file is a zip, JSON lines
// otherwise. Errors name the file (and the sheet and cell, or the line) and say what was
// expected.
func Read(path string) (*fleet.Baseline, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("--baseline: %w", err)
	}
	sum := sha256.Sum256(data)
	meta := fleet.BaselineMeta{File: path, FileSHA256: hex.EncodeToString(sum[:])}
	if bytes.HasPrefix(data, []byte("PK\x03\x04")) {
		meta.Format = "xlsx"
		return readWorkbook(path, meta)
	}
	meta.Format = "jsonl"
	return readJSONL(path, bytes.NewReader(data), meta)
}

// readWorkbook reads a results workbook: Audit for the run, Register for the hoists.
func readWorkbook(path string, meta fleet.BaselineMeta) (*fleet.Baseline, error) {
	f, err := excelize.OpenFile(path)
	if err != nil {
		return nil, fmt.Errorf("--baseline %s: %w", path, err)
	}
	audit, err := f.GetRows("Audit")
	f.Close()
	if err != nil {
		return nil, fmt.Errorf("--baseline %s: not a hoistfleet results workbook: no Audit sheet (%v)", path, err)
	}
	for _, row := range audit {
		if len(row) < 2 {
			continue
		}
		v := strings.TrimSpace(row[1])
		switch strings.TrimSpace(row[0]) {
		case "Version":
			meta.Version = v
		case "Input":
			meta.Input = v
		case "Input SHA-256":
			meta.InputSHA256 = v
		case "As of":
			meta.AsOf = v
		case "Rule profile":
			meta.Profile = v
		case "User rules file":
			meta.RulesFile = v
		}
	}
	rd, err := register.NewXLSXFileOptions(path, "Register", register.Options{HeaderRow: 1})
	if err != nil {
		return nil, fmt.Errorf("--baseline %s: not a hoistfleet results workbook: %w", path, err)
	}
	defer rd.Close()
	h := rd.Header()
	k := -1
	for i := 0; i+2 < len(h.Columns); i++ {
		if h.Columns[i].Title == colStatus && h.Columns[i+1].Title == colAction && h.Columns[i+2].Title == colGov {
			k = i
		}
	}
	if k < 0 {
		return nil, fmt.Errorf("--baseline %s: sheet Register: not a hoistfleet results sheet: no columns %s, %s, %s side by side in row %d", path, colStatus, colAction, colGov, h.Row)
	}
	maxCol, perUnit := k+3, 0.0
	if maxCol < len(h.Columns) {
		title, unit, err := units.SplitHeader(h.Columns[maxCol].Title)
		if err == nil && strings.HasPrefix(title, "Max rated load") {
			perUnit, _ = units.Factor("mass", unit)
		}
	}
	if !(perUnit > 0) {
		return nil, fmt.Errorf("--baseline %s: sheet Register: column %s: expected 'Max rated load [unit]' after %s", path, fleet.ColumnName(maxCol+1), colGov)
	}
	checkCols := map[int]string{}
	for i := maxCol + 1; i < len(h.Columns); i++ {
		if id, ok := strings.CutSuffix(h.Columns[i].Title, " status"); ok && id != "Proposed" {
			checkCols[i] = id
		}
	}
	for i := 0; i < k; i++ {
		meta.Columns = append(meta.Columns, h.Columns[i].DisplayTitle())
	}
	var hoists []fleet.BaselineHoist
	noID := 0
	for {
		a, err := rd.Next(context.Background())
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("--baseline %s: %w", path, err)
		}
		if a.Blank {
			continue
		}
		if a.ID == "" {
			noID++
			continue
		}
		cell := func(i int) string {
			if i < len(a.Cells) {
				return strings.TrimSpace(a.Cells[i].Text)
			}
			return ""
		}
		st, ok := fleet.ParseStatus(cell(k))
		if !ok {
			return nil, fmt.Errorf("--baseline %s: Register!%s: asset %s: %q is not a status word (pass, marginal, unchecked, error, fail)", path, cellName(k, a.Row), a.ID, cell(k))
		}
		bh := fleet.BaselineHoist{AssetID: a.ID, Row: a.Row, Status: st, MaxRatedLoadKg: math.NaN(),
			MechanismCapacityKg: math.NaN(), Checks: map[string]fleet.Status{}, Inputs: map[string]string{}}
		if t := cell(maxCol); t != "" {
			v, err := strconv.ParseFloat(t, 64)
			if err != nil {
				return nil, fmt.Errorf("--baseline %s: Register!%s: asset %s: max rated load %q is not a number", path, cellName(maxCol, a.Row), a.ID, t)
			}
			bh.MaxRatedLoadKg = v * perUnit
		}
		for i, id := range checkCols {
			if s, ok := fleet.ParseStatus(cell(i)); ok {
				bh.Checks[id] = s
			}
		}
		for i := 0; i < k && i < len(a.Cells); i++ {
			bh.Inputs[meta.Columns[i]] = fleet.CellText(a.Cells[i])
		}
		bh.Site, bh.Crane, bh.Exposure = text(a, "site"), text(a, "crane"), text(a, "exposure")
		hoists = append(hoists, bh)
	}
	if noID > 0 {
		meta.Notes = append(meta.Notes, fmt.Sprintf("%d rows of the baseline have no asset id and are not compared", noID))
	}
	meta.Notes = append(meta.Notes, "mechanism capacity not compared: the results workbook does not record it (a JSON lines baseline does)")
	return fleet.NewBaseline(meta, hoists), nil
}

func cellName(col0, row int) string {
	n, _ := fleet.CellName(col0+1, row)
	return n
}

func text(a *fleet.Asset, key string) string {
	if v := a.Get(key); v.State == fleet.OK {
		return v.Text
	}
	return ""
}

// line is what the baseline reads of a JSON line.
type line struct {
	AssetID             *string  `json:"asset_id"`
	Row                 *int     `json:"row"`
	Status              *string  `json:"status"`
	MaxRatedLoadKg      *float64 `json:"max_rated_load_kg"`
	MechanismCapacityKg *float64 `json:"mechanism_capacity_kg"`
	Site                *string  `json:"site"`
	Crane               *string  `json:"crane"`
	Exposure            *string  `json:"exposure"`
	Checks              []struct {
		ID     string `json:"id"`
		Status string `json:"status"`
	} `json:"checks"`
	Change *struct {
		Kind string `json:"kind"`
	} `json:"change"`
}

// maxLine is the longest JSON line read (a hoist's line is a few kilobytes).
const maxLine = 16 << 20

func readJSONL(path string, r io.Reader, meta fleet.BaselineMeta) (*fleet.Baseline, error) {
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 64<<10), maxLine)
	var hoists []fleet.BaselineHoist
	n, noID := 0, 0
	for sc.Scan() {
		n++
		b := bytes.TrimSpace(sc.Bytes())
		if len(b) == 0 {
			continue
		}
		var l line
		if err := json.Unmarshal(b, &l); err != nil {
			if n == 1 && bytes.HasPrefix(bytes.TrimPrefix(b, []byte("\ufeff")), []byte("row,asset_id,")) {
				return nil, fmt.Errorf("--baseline %s: this is hoistfleet's CSV long form, which a baseline cannot be (it keeps neither the register's values nor a hoist's line): give the results workbook (.xlsx) or the JSON lines (.jsonl) of the earlier check", path)
			}
			return nil, fmt.Errorf("--baseline %s: line %d: not a hoistfleet JSON line: %v (give the results workbook or the JSON lines of an earlier check)", path, n, err)
		}
		if l.Change != nil && l.Change.Kind == fleet.ChangeRemoved {
			continue // a hoist the earlier run itself listed as removed
		}
		if l.Status == nil || l.Row == nil {
			return nil, fmt.Errorf("--baseline %s: line %d: expected a hoist's line with \"row\" and \"status\"", path, n)
		}
		st, ok := fleet.ParseStatus(*l.Status)
		if !ok {
			return nil, fmt.Errorf("--baseline %s: line %d: status %q is not a status word", path, n, *l.Status)
		}
		if l.AssetID == nil || *l.AssetID == "" {
			noID++
			continue
		}
		bh := fleet.BaselineHoist{AssetID: *l.AssetID, Row: *l.Row, Status: st, MaxRatedLoadKg: num(l.MaxRatedLoadKg),
			MechanismCapacityKg: num(l.MechanismCapacityKg), Checks: map[string]fleet.Status{},
			Site: str(l.Site), Crane: str(l.Crane), Exposure: str(l.Exposure)}
		for _, c := range l.Checks {
			if s, ok := fleet.ParseStatus(c.Status); ok {
				bh.Checks[c.ID] = s
			}
		}
		hoists = append(hoists, bh)
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("--baseline %s: line %d: %w", path, n+1, err)
	}
	if len(hoists) == 0 && noID == 0 {
		return nil, fmt.Errorf("--baseline %s: no hoist's line: expected the results workbook (.xlsx) or JSON lines of an earlier hoistfleet check", path)
	}
	if noID > 0 {
		meta.Notes = append(meta.Notes, fmt.Sprintf("%d lines of the baseline have no asset id and are not compared", noID))
	}
	meta.Notes = append(meta.Notes,
		"the baseline is JSON lines, which carry no run header: its as-of date, rules and input SHA-256 are not known (its own SHA-256 is given)",
		"register values not compared: JSON lines do not carry them (give the earlier results workbook to compare them)")
	return fleet.NewBaseline(meta, hoists), nil
}

func num(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}

func str(p *string) string {
	if p == nil {
		return ""
	}
	return *p
}
