package fleet

import (
	"math"
	"sort"
	"strconv"
	"strings"
)

// RatingTolerance is the relative change of a hoist's maximum rated load or mechanism
// capacity below which a comparison with a baseline does not report it (1 %: issue 19;
// a rounding in the earlier workbook's cells stays well inside it).
const RatingTolerance = 0.01

// Baseline is an earlier run of hoistfleet read back (io/baseline): one entry per hoist,
// matched with this run's by asset id, and by site where an id repeats across sites.
// It is read only once built, so the workers compare with it concurrently.
type Baseline struct {
	Meta   BaselineMeta
	Hoists []BaselineHoist
	byID   map[string][]int // asset id → indices in Hoists
}

// BaselineMeta says what the earlier run was: from its workbook's Audit sheet, or only
// the file itself for JSON lines, which carry no run header.
type BaselineMeta struct {
	File       string // the baseline file as named on the command line
	Format     string // "xlsx" or "jsonl"
	FileSHA256 string // of the baseline file itself
	// From the workbook's Audit ("" when the baseline does not say).
	Version, AsOf, Profile, RulesFile, Input, InputSHA256 string
	// Columns are the register's columns (as the workbook's Register shows their
	// headers), nil for a baseline that carries no register values (JSON lines).
	Columns []string
	// Notes say what could not be compared and why (a JSONL baseline's missing run
	// header and register values, rows without an asset id).
	Notes []string
}

// BaselineHoist is one hoist of the baseline.
type BaselineHoist struct {
	AssetID, Site, Crane, Exposure string
	Row                            int
	Status                         Status
	MaxRatedLoadKg                 float64 // NaN when none
	MechanismCapacityKg            float64 // NaN when none or not recorded
	Checks                         map[string]Status
	// Inputs are the register's cells by column (Meta.Columns' headers), as canonical
	// text (InputText); nil when the baseline carries none.
	Inputs map[string]string
}

// NewBaseline indexes hoists for matching.
func NewBaseline(meta BaselineMeta, hoists []BaselineHoist) *Baseline {
	b := &Baseline{Meta: meta, Hoists: hoists, byID: map[string][]int{}}
	for i, h := range hoists {
		b.byID[h.AssetID] = append(b.byID[h.AssetID], i)
	}
	return b
}

// Change kinds.
const (
	ChangeAdded     = "added"
	ChangeRemoved   = "removed"
	ChangeChanged   = "changed"
	ChangeUnchanged = "unchanged"
)

// Change is what changed for one hoist since the baseline (JSONL "change", the
// workbook's Changes sheet, the terminal's section).
type Change struct {
	Kind          string // added, removed, changed, unchanged
	AssetID, Site string
	Row, PrevRow  int // 0 when absent (removed: Row; added: PrevRow)
	Status        Status
	PrevStatus    Status
	// StatusChange is "worse", "better" or "" (same status, or added or removed).
	StatusChange                        string
	MaxRatedLoadKg, PrevMaxRatedLoadKg  float64
	RatingChanged                       bool // by more than RatingTolerance, or given ↔ none
	MechanismCapacityKg, PrevCapacityKg float64
	CapacityChanged                     bool
	NewlyFailing, Cleared               []string // check ids (inspection-due apart: NewlyOverdue)
	NewlyOverdue                        bool
	OverdueCleared                      bool // the inspection was overdue in the baseline and is not now
	Inputs                              []InputChange
	// InputsCompared is true when the register's values were compared (the baseline
	// carries them: a results workbook).
	InputsCompared bool
	prev           int // index in Baseline.Hoists, −1 for added
}

// InputChange is one register value that changed: the column as the workbook heads it,
// and the cell's text before and after ("" for a blank cell).
type InputChange struct {
	Column, Old, New string
}

// Significant reports whether the change is worth listing: anything but unchanged.
func (c *Change) Significant() bool { return c != nil && c.Kind != ChangeUnchanged }

// Words is the change in a few words: "fail → pass; rating 4 t → 5 t; inputs: Rope MBF".
func (c *Change) Words() string {
	switch c.Kind {
	case ChangeAdded:
		return "added since the baseline"
	case ChangeRemoved:
		return "removed: in the baseline (row " + strconv.Itoa(c.PrevRow) + ", " + c.PrevStatus.String() + "), not in this register"
	case ChangeUnchanged:
		return "unchanged"
	}
	var parts []string
	if c.StatusChange != "" {
		parts = append(parts, "status "+c.PrevStatus.String()+" → "+c.Status.String())
	}
	if c.RatingChanged {
		parts = append(parts, "max rated load "+kgWords(c.PrevMaxRatedLoadKg)+" → "+kgWords(c.MaxRatedLoadKg))
	}
	if c.CapacityChanged {
		parts = append(parts, "mechanism capacity "+kgWords(c.PrevCapacityKg)+" → "+kgWords(c.MechanismCapacityKg))
	}
	if len(c.NewlyFailing) > 0 {
		parts = append(parts, "newly failing: "+strings.Join(c.NewlyFailing, ", "))
	}
	if len(c.Cleared) > 0 {
		parts = append(parts, "cleared: "+strings.Join(c.Cleared, ", "))
	}
	if c.NewlyOverdue {
		parts = append(parts, "inspection newly overdue")
	}
	if c.OverdueCleared {
		parts = append(parts, "inspection no longer overdue")
	}
	for _, in := range c.Inputs {
		parts = append(parts, in.Column+" "+orBlank(in.Old)+" → "+orBlank(in.New))
	}
	return strings.Join(parts, "; ")
}

func orBlank(s string) string {
	if s == "" {
		return "(blank)"
	}
	return s
}

func kgWords(kg float64) string {
	if math.IsNaN(kg) {
		return "none"
	}
	return strconv.FormatFloat(kg, 'f', 0, 64) + " kg"
}

// changeRank orders changes for listing: worse status first, then better (a status that
// changed, either way, matters before anything else), added, removed, the changes of
// rating, capacity, checks or inspections, then changes of register values alone (a site
// renamed), unchanged last.
func (c *Change) rank() int {
	switch {
	case c.StatusChange == "worse":
		return 0
	case c.StatusChange == "better":
		return 1
	case c.Kind == ChangeAdded:
		return 2
	case c.Kind == ChangeRemoved:
		return 3
	case c.Kind == ChangeUnchanged:
		return 6
	case c.resultsChanged():
		return 4
	}
	return 5
}

// resultsChanged reports whether the hoist's results changed apart from its status: its
// rating or capacity, a check newly failing or cleared, an inspection newly overdue or
// no longer.
func (c *Change) resultsChanged() bool {
	return c.RatingChanged || c.CapacityChanged || len(c.NewlyFailing) > 0 || len(c.Cleared) > 0 || c.NewlyOverdue || c.OverdueCleared
}

// SortChanges orders changes for listing (worse, better, added, removed, changes of the
// results, changes of register values alone); equal ranks keep register order (removed:
// the baseline's order).
func SortChanges(cs []*Change) {
	sort.SliceStable(cs, func(i, j int) bool { return cs[i].rank() < cs[j].rank() })
}

// match returns the baseline hoist that is r's: by asset id, and by site where the
// baseline has the id at several sites; −1 when none.
func (b *Baseline) match(id, site string) int {
	if id == "" {
		return -1
	}
	cands := b.byID[id]
	switch len(cands) {
	case 0:
		return -1
	case 1:
		return cands[0]
	}
	for _, i := range cands {
		if strings.EqualFold(strings.TrimSpace(b.Hoists[i].Site), strings.TrimSpace(site)) {
			return i
		}
	}
	return -1
}

// Compare says what changed for r since the baseline. titles are the register's column
// headers as the workbook shows them (Column.DisplayTitle), aligned with r.Asset.Cells.
// It keeps nothing of r but strings.
func (b *Baseline) Compare(r *Result, titles []string) *Change {
	a := r.Asset
	site := ""
	if v := a.Get("site"); v.State == OK {
		site = v.Text
	}
	c := &Change{AssetID: a.ID, Site: site, Row: a.Row, Status: r.Status,
		MaxRatedLoadKg: r.MaxRatedLoadKg, MechanismCapacityKg: r.MechanismCapacityKg,
		PrevMaxRatedLoadKg: math.NaN(), PrevCapacityKg: math.NaN()}
	i := b.match(a.ID, site)
	c.prev = i
	if i < 0 {
		c.Kind = ChangeAdded
		return c
	}
	p := &b.Hoists[i]
	c.PrevRow, c.PrevStatus = p.Row, p.Status
	c.PrevMaxRatedLoadKg, c.PrevCapacityKg = p.MaxRatedLoadKg, p.MechanismCapacityKg
	switch {
	case r.Status.Worse(p.Status):
		c.StatusChange = "worse"
	case p.Status.Worse(r.Status):
		c.StatusChange = "better"
	}
	c.RatingChanged = differs(p.MaxRatedLoadKg, r.MaxRatedLoadKg)
	// A baseline that did not record the mechanism capacity (NaN on both sides counts as
	// the same) is not compared on it.
	c.CapacityChanged = !math.IsNaN(p.MechanismCapacityKg) && differs(p.MechanismCapacityKg, r.MechanismCapacityKg)
	for k := range r.Checks {
		ck := &r.Checks[k]
		prev, had := p.Checks[ck.ID]
		def := definitionAt(k, ck.ID)
		switch {
		case ck.Status == StatusFail && (!had || prev != StatusFail):
			if def.OverdueList {
				c.NewlyOverdue = true
			} else {
				c.NewlyFailing = append(c.NewlyFailing, ck.ID)
			}
		case had && prev == StatusFail && ck.Status != StatusFail:
			if def.OverdueList {
				c.OverdueCleared = true
			} else {
				c.Cleared = append(c.Cleared, ck.ID)
			}
		}
	}
	if p.Inputs != nil {
		c.InputsCompared = true
		for j, t := range titles {
			old, ok := p.Inputs[t]
			if !ok {
				continue // a column the baseline did not have: said once, in Meta
			}
			cur := ""
			if j < len(a.Cells) {
				cur = CellText(a.Cells[j])
			}
			if !SameInput(old, cur) {
				c.Inputs = append(c.Inputs, InputChange{Column: t, Old: old, New: cur})
			}
		}
	}
	c.Kind = ChangeUnchanged
	if c.StatusChange != "" || c.resultsChanged() || len(c.Inputs) > 0 {
		c.Kind = ChangeChanged
	}
	return c
}

// differs reports whether two ratings differ by more than RatingTolerance of the earlier
// one, or one is given and the other is not.
func differs(old, cur float64) bool {
	if math.IsNaN(old) || math.IsNaN(cur) {
		return math.IsNaN(old) != math.IsNaN(cur)
	}
	if old == 0 {
		return cur != 0
	}
	return math.Abs(cur-old) > RatingTolerance*math.Abs(old)
}

// Removed returns the baseline's hoists that no result matched, as changes of kind
// removed, in the baseline's order. matched is indexed like Hoists.
func (b *Baseline) Removed(matched []bool) []*Change {
	var out []*Change
	for i := range b.Hoists {
		if i < len(matched) && matched[i] {
			continue
		}
		p := &b.Hoists[i]
		out = append(out, &Change{Kind: ChangeRemoved, AssetID: p.AssetID, Site: p.Site, PrevRow: p.Row,
			PrevStatus: p.Status, PrevMaxRatedLoadKg: p.MaxRatedLoadKg, PrevCapacityKg: p.MechanismCapacityKg,
			MaxRatedLoadKg: math.NaN(), MechanismCapacityKg: math.NaN(), prev: i})
	}
	return out
}

// CellText is a register cell as compared with a baseline: a date as YYYY-MM-DD, a
// number or text as given, trimmed.
func CellText(c Cell) string {
	if c.IsDate && !c.Date.IsZero() {
		return c.Date.Format("2006-01-02")
	}
	return strings.TrimSpace(c.Text)
}

// SameInput reports whether two cells' texts are the same value: equal numbers (to 1 in
// 10⁹, the workbook's cells hold a double's decimal form) or equal text, trimmed.
func SameInput(a, b string) bool {
	a, b = strings.TrimSpace(a), strings.TrimSpace(b)
	if a == b {
		return true
	}
	x, err1 := strconv.ParseFloat(a, 64)
	y, err2 := strconv.ParseFloat(b, 64)
	if err1 != nil || err2 != nil {
		return false
	}
	return math.Abs(x-y) <= 1e-9*math.Max(math.Abs(x), math.Abs(y))
}

// Differences says how the baseline's run differs from this one in what decides a
// verdict (tool version, rule profile, rule file, marginal band not recorded), and adds
// the baseline's notes: a comparison across them is allowed and said so.
func (m *BaselineMeta) Differences(info *RunInfo) []string {
	var out []string
	if info != nil {
		if m.Version != "" && info.Version != "" && m.Version != info.Version {
			out = append(out, "the baseline was made by hoistfleet "+m.Version+", this run by "+info.Version+": a check may have changed between them")
		}
		if m.Profile != "" && info.Profile != "" && m.Profile != info.Profile {
			out = append(out, "the baseline used the "+m.Profile+" rules, this run the "+info.Profile+" rules: verdicts differ by rule as well as by hoist")
		}
		cur := info.RulesFile
		if cur == "" {
			cur = "none"
		}
		if m.RulesFile != "" && m.RulesFile != cur {
			out = append(out, "the baseline's user rule file was "+m.RulesFile+", this run's is "+cur)
		}
	}
	return append(out, m.Notes...)
}

// Words says the change counts in one line.
func (n ChangeCounts) Words() string {
	parts := []string{
		strconv.Itoa(n.Added) + " added", strconv.Itoa(n.Removed) + " removed",
		strconv.Itoa(n.Worse) + " worse", strconv.Itoa(n.Better) + " better",
		strconv.Itoa(n.Rating) + " rating changed", strconv.Itoa(n.NewlyFailing) + " with checks newly failing",
		strconv.Itoa(n.Cleared) + " with failures cleared", strconv.Itoa(n.NewlyOverdue) + " newly overdue", strconv.Itoa(n.OverdueCleared) + " no longer overdue",
		strconv.Itoa(n.Inputs) + " with register values changed", strconv.Itoa(n.Unchanged) + " unchanged",
	}
	if n.Capacity > 0 {
		parts = append(parts, strconv.Itoa(n.Capacity)+" mechanism capacity changed")
	}
	s := strings.Join(parts, ", ")
	if n.Added > 0 && n.Removed > 0 && n.Compared == 0 {
		s += ". No hoist of this register is in the baseline: is the baseline this register's earlier results?"
	}
	return s
}
