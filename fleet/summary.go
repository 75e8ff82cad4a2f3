package fleet

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Summary is the fleet-level picture, accumulated one result at a time so that a
// register of any size is summarised in bounded memory (the lists keep the TopN worst).
type Summary struct {
	TopN     int
	Total    int
	Hidden   int    // hoists on rows hidden or filtered out in the register (checked all the same)
	ByStatus [5]int // indexed by Status (pass … fail)
	Sites    []SiteCount
	Checks   []CheckCount
	// Governing counts hoists by governing check (or cap) of their maximum rated load.
	Governing map[string]int
	// MarginBins counts hoists by smallest margin (see MarginBinEdges); the last bin
	// holds the hoists with no margin at all (nothing could be checked against a limit).
	MarginBins [len(MarginBinEdges) + 2]int
	// Worst are the TopN hoists with the smallest margin (fail first), worst first.
	Worst []Brief
	// Overdue are the TopN most overdue inspections; OverdueCount counts them all.
	Overdue      []Brief
	OverdueCount int
	// Flags lists hoists needing attention for a reason other than a design margin:
	// rope at discard, design life used, load test needed; FlagCounts counts them all.
	Flags      []Brief
	FlagCounts map[string]int
	// Rerated counts hoists evaluated at a proposed rated load; Changed lists (TopN) and
	// counts those whose verdict changes.
	Rerated      int
	Changed      []Brief
	ChangedCount int
	// Problems are the first TopN located input messages (bad cells, duplicated ids,
	// short rows), "asset: message"; ProblemCount counts them all.
	Problems     []string
	ProblemCount int
	// Notes are the first TopN notes of how the register was read (the header found
	// under a title block, a units row, blank markers, a date order inferred: header
	// notes of kind Other); NoteCount counts them all.
	Notes     []string
	NoteCount int
	// Coverage is what the verdict rests on: checks run of checks possible, and the
	// columns that would let more run.
	Coverage FleetCoverage
	// Weighted is true when the register has an Exposure column: the attention order
	// (Worst) is then by priority (AttentionWeights.Priority) before status and margin.
	// Without the column every hoist weighs the same and the order is status, then margin.
	Weighted bool
	Weights  AttentionWeights
	// ExposureCounts counts hoists by exposure (index in Exposures; the last row is
	// ExposureUnstated) and status: the summary's status × exposure matrix.
	ExposureCounts [][5]int
	// Cranes are the register's cranes (the Crane column), in order of first appearance;
	// a crane's status is its worst hoist's.
	Cranes []CraneCount
	// Changes are the hoists that changed since the baseline (Result.Change, not
	// unchanged), in register order, then Removed ones (set at the end of Run);
	// ChangeCounts counts them. Baseline is nil without --baseline.
	Baseline     *BaselineMeta
	Changes      []*Change
	Removed      []*Change
	ChangeCounts ChangeCounts

	siteIndex  map[string]int
	checkIndex map[string]int
	craneIndex map[string]int
	matched    []bool // baseline hoists matched so far
}

// ChangeCounts counts the changes since a baseline.
type ChangeCounts struct {
	Compared, Unchanged, Added, Removed int
	Worse, Better                       int // status changes
	Rating, Capacity                    int // beyond RatingTolerance
	NewlyFailing, Cleared, NewlyOverdue int // hoists with such a check
	OverdueCleared                      int // hoists whose inspection is no longer overdue
	Inputs                              int // hoists with a changed register value
}

// CraneCount is one crane: its hoists and its status (its worst hoist's). Sites lists
// every site its hoists are at: more than one is an input error (the crane is then at
// least error).
type CraneCount struct {
	Crane    string
	Sites    []string
	Hoists   []string // asset ids, in register order
	Status   Status
	Exposure string // the most exposed of its hoists' (ExposureUnstated when none says)
}

// CranesByStatus counts cranes by status.
func (s *Summary) CranesByStatus() (by [5]int) {
	for _, c := range s.Cranes {
		if int(c.Status) < len(by) {
			by[c.Status]++
		}
	}
	return by
}

// MarginBinEdges are the upper edges of the smallest-margin histogram bins: margin < 0
// (fail), 0–0.1, 0.1–0.2, 0.2–0.3, 0.3–0.5, ≥ 0.5, then a bin for hoists with no margin.
var MarginBinEdges = [...]float64{0, 0.1, 0.2, 0.3, 0.5}

// MarginBinLabels names the bins of MarginBins.
var MarginBinLabels = [...]string{"< 0 (over limit)", "0 – 10 %", "10 – 20 %", "20 – 30 %", "30 – 50 %", "≥ 50 %", "no margin (not checked)"}

// SiteCount counts hoists by status at one site.
type SiteCount struct {
	Site     string
	ByStatus [5]int
}

// CheckCount counts one check's statuses over the fleet (info included).
type CheckCount struct {
	ID       string
	ByStatus [6]int
}

// Brief is one hoist in a summary list.
type Brief struct {
	Row            int
	Sheet          string // the row's sheet when several are read as one register (--sheet all)
	AssetID        string
	Site           string
	Status         Status
	WorstCheck     string
	MinMargin      float64
	GoverningCheck string
	MaxRatedLoadKg float64
	RatedLoadKg    float64 // the load the hoist was checked at (its register rating)
	Action         string  // what to do (Result.Action)
	Reason         string  // for Flags and Overdue: what is wrong, in words
	Days           float64 // for Overdue: days overdue
	NewStatus      Status  // for Changed: status at the proposed load
	Exposure       string  // the register's Exposure ("" when not stated)
	Crane          string  // the register's Crane ("" when none)
	// Priority is the hoist's place in the attention order (AttentionWeights.Priority),
	// 0 when the register has no Exposure column.
	Priority float64
	// Mechanical is true when the hoist's status comes from an engineering check (rope,
	// drum, motor, brake, gearbox, life, wear) rather than only from records or data
	// consistency (inspection-due, load-test, hoist-speed); the worst list puts these first.
	Mechanical bool
}

// NewSummary returns an empty summary keeping topN hoists in each list.
func NewSummary(topN int) *Summary {
	return &Summary{TopN: topN, Governing: map[string]int{}, FlagCounts: map[string]int{},
		siteIndex: map[string]int{}, checkIndex: map[string]int{}, craneIndex: map[string]int{},
		ExposureCounts: make([][5]int, len(Exposures)+1)}
}

// Weigh orders the attention list by consequence (the register has an Exposure column)
// with the weights w. Call it before the first Add.
func (s *Summary) Weigh(w AttentionWeights) {
	s.Weighted, s.Weights = true, w
}

// Compare makes the summary collect the changes since baseline b. Call it before the
// first Add, and Finish after the last.
func (s *Summary) Compare(b *Baseline) {
	s.Baseline = &b.Meta
	s.matched = make([]bool, len(b.Hoists))
}

// Finish lists the baseline's hoists no result matched as removed.
func (s *Summary) Finish(b *Baseline) {
	if b == nil {
		return
	}
	s.Removed = b.Removed(s.matched)
	s.ChangeCounts.Removed = len(s.Removed)
}

func (s *Summary) addChange(c *Change) {
	if c.prev >= 0 && c.prev < len(s.matched) {
		s.matched[c.prev] = true
	}
	n := &s.ChangeCounts
	switch c.Kind {
	case ChangeAdded:
		n.Added++
	case ChangeUnchanged:
		n.Compared++
		n.Unchanged++
		return
	default:
		n.Compared++
	}
	switch c.StatusChange {
	case "worse":
		n.Worse++
	case "better":
		n.Better++
	}
	if c.RatingChanged {
		n.Rating++
	}
	if c.CapacityChanged {
		n.Capacity++
	}
	if len(c.NewlyFailing) > 0 {
		n.NewlyFailing++
	}
	if len(c.Cleared) > 0 {
		n.Cleared++
	}
	if c.NewlyOverdue {
		n.NewlyOverdue++
	}
	if c.OverdueCleared {
		n.OverdueCleared++
	}
	if len(c.Inputs) > 0 {
		n.Inputs++
	}
	s.Changes = append(s.Changes, c)
}

// AllChanges returns the changes and the removed hoists, ordered for listing
// (SortChanges: worse first).
func (s *Summary) AllChanges() []*Change {
	out := make([]*Change, 0, len(s.Changes)+len(s.Removed))
	out = append(out, s.Changes...)
	out = append(out, s.Removed...)
	SortChanges(out)
	return out
}

// CraneKey is what makes two Crane cells one crane: the id as written, ignoring case and
// surrounding or repeated spaces ("C8" and "c8 " are one crane, as a reader of the
// register would take them).
func CraneKey(id string) string { return strings.ToLower(strings.Join(strings.Fields(id), " ")) }

func (s *Summary) addCrane(b *Brief, st Status) {
	if b.Crane == "" {
		return
	}
	key := CraneKey(b.Crane)
	i, ok := s.craneIndex[key]
	if !ok {
		i = len(s.Cranes)
		s.craneIndex[key] = i
		s.Cranes = append(s.Cranes, CraneCount{Crane: b.Crane, Status: StatusPass, Exposure: ExposureUnstated})
	}
	c := &s.Cranes[i]
	c.Hoists = append(c.Hoists, b.AssetID)
	if st.Worse(c.Status) {
		c.Status = st
	}
	if !slicesContains(c.Sites, b.Site) {
		c.Sites = append(c.Sites, b.Site)
		if len(c.Sites) > 1 && StatusError.Worse(c.Status) {
			c.Status = StatusError
		}
	}
	if e := ExposureIndex(b.Exposure); e < ExposureIndex(c.Exposure) {
		c.Exposure = b.Exposure
	}
}

func slicesContains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func brief(r *Result) Brief {
	b := Brief{Row: r.Asset.Row, Sheet: r.Asset.Sheet, AssetID: r.Asset.ID, Status: r.Status, WorstCheck: r.WorstCheck,
		MinMargin: r.MinMargin, GoverningCheck: r.GoverningCheck, MaxRatedLoadKg: r.MaxRatedLoadKg, RatedLoadKg: r.RatedLoadKg, Action: r.Action}
	if v := r.Asset.Get("site"); v.State == OK {
		b.Site = v.Text
	}
	if v := r.Asset.Get("exposure"); v.State == OK {
		b.Exposure = v.Text
	}
	if v := r.Asset.Get("crane"); v.State == OK {
		b.Crane = v.Text
	}
	return b
}

// Add counts one result. Results must be added in register order for stable lists.
func (s *Summary) Add(r *Result) {
	s.Total++
	if r.Asset != nil && r.Asset.Hidden {
		s.Hidden++
	}
	b := brief(r)
	if s.Weighted {
		b.Priority = s.Weights.Priority(r.Status, b.Exposure)
	}
	if int(r.Status) < len(s.ByStatus) {
		s.ByStatus[r.Status]++
		s.ExposureCounts[ExposureIndex(b.Exposure)][r.Status]++
	}
	s.addCrane(&b, r.Status)
	if r.Change != nil {
		s.addChange(r.Change)
	}
	i, ok := s.siteIndex[b.Site]
	if !ok {
		i = len(s.Sites)
		s.siteIndex[b.Site] = i
		s.Sites = append(s.Sites, SiteCount{Site: b.Site})
	}
	if int(r.Status) < 5 {
		s.Sites[i].ByStatus[r.Status]++
	}
	for k, c := range r.Checks {
		// Every hoist lists its checks in the same order: the k-th is usually the k-th
		// counted, which spares a map lookup per check.
		j := k
		if j >= len(s.Checks) || s.Checks[j].ID != c.ID {
			var ok bool
			if j, ok = s.checkIndex[c.ID]; !ok {
				j = len(s.Checks)
				s.checkIndex[c.ID] = j
				s.Checks = append(s.Checks, CheckCount{ID: c.ID})
			}
		}
		s.Checks[j].ByStatus[c.Status]++
		def := definitionAt(k, c.ID)
		switch {
		case def.OverdueList && c.Status == StatusFail:
			s.OverdueCount++
			o := b
			o.Days = c.Demand - c.Capacity
			o.Reason = c.Message
			s.Overdue = insertTop(s.Overdue, o, s.TopN, func(x, y Brief) bool { return x.Days > y.Days })
		case def.FlagList && (c.Status == StatusFail || c.Status == StatusMarginal):
			s.FlagCounts[c.ID]++
			f := b
			f.Reason = c.ID + " " + c.Status.String()
			if c.Message != "" {
				f.Reason += ": " + c.Message
			}
			if len(s.Flags) < s.TopN*3 {
				s.Flags = append(s.Flags, f)
			}
		}
	}
	s.Coverage.add(r)
	if r.GoverningCheck != "" {
		s.Governing[r.GoverningCheck]++
	}
	for _, m := range r.Messages {
		s.ProblemCount++
		if len(s.Problems) < s.TopN {
			switch {
			case r.Asset.ID == "" && !strings.Contains(m, "!"):
				m = fmt.Sprintf("row %d: %s", r.Asset.Row, m)
			case r.Asset.ID != "" && !strings.Contains(m, "asset "+r.Asset.ID):
				m = fmt.Sprintf("row %d, asset %s: %s", r.Asset.Row, r.Asset.ID, m)
			}
			s.Problems = append(s.Problems, m)
		}
	}
	bin := len(MarginBinEdges) + 1
	if !math.IsNaN(r.MinMargin) {
		bin = len(MarginBinEdges)
		for k, e := range MarginBinEdges {
			if r.MinMargin < e {
				bin = k
				break
			}
		}
	}
	s.MarginBins[bin]++
	if r.Status != StatusPass {
		for k, c := range r.Checks {
			if c.Status == r.Status && definitionAt(k, c.ID).Kind != Records {
				b.Mechanical = true
				break
			}
		}
		s.Worst = insertTop(s.Worst, b, s.TopN, worse)
	}
	if r.Proposed != nil {
		s.Rerated++
		if r.Proposed.Status != r.Status {
			s.ChangedCount++
			c := b
			c.NewStatus = r.Proposed.Status
			if len(s.Changed) < s.TopN {
				s.Changed = append(s.Changed, c)
			}
		}
	}
}

// worse orders hoists for the worst list (the attention order): higher priority first
// (consequence and severity together: Summary.Weighted), then higher status, then those
// whose status comes from the mechanism before those whose status comes only from
// records, then smaller margin.
func worse(x, y Brief) bool {
	if x.Priority != y.Priority {
		return x.Priority > y.Priority
	}
	if x.Status != y.Status {
		return x.Status.Worse(y.Status)
	}
	if x.Mechanical != y.Mechanical {
		return x.Mechanical
	}
	mx, my := x.MinMargin, y.MinMargin
	if math.IsNaN(mx) {
		mx = math.Inf(1)
	}
	if math.IsNaN(my) {
		my = math.Inf(1)
	}
	return mx < my
}

// insertTop keeps list sorted by less (first = most), at most n long. Equal elements keep
// arrival order.
func insertTop(list []Brief, b Brief, n int, less func(x, y Brief) bool) []Brief {
	i := sort.Search(len(list), func(i int) bool { return less(b, list[i]) })
	if i >= n {
		return list
	}
	list = append(list, Brief{})
	copy(list[i+1:], list[i:])
	list[i] = b
	if len(list) > n {
		list = list[:n]
	}
	return list
}

// GoverningSorted returns the governing counts, largest first, ties by name.
func (s *Summary) GoverningSorted() []NameCount {
	out := make([]NameCount, 0, len(s.Governing))
	for k, v := range s.Governing {
		out = append(out, NameCount{k, v})
	}
	sort.Slice(out, func(i, j int) bool {
		if out[i].Count != out[j].Count {
			return out[i].Count > out[j].Count
		}
		return out[i].Name < out[j].Name
	})
	return out
}

// NameCount is a label and a count.
type NameCount struct {
	Name  string
	Count int
}
