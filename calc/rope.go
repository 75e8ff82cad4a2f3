package calc

import (
	"math"
	"regexp"
	"strconv"
	"strings"
)

// RopeDesignFactor checks the running rope's design factor (check rope-design-factor).
//
// Formulas:
//
//	η_R = (1 − η_s^n_e) / (n_e (1 − η_s))  (1 for n_e = 1 or η_s = 1)   reeving efficiency
//	η_D = η_s^k,  η_RD = η_R η_D
//	F   = W / (n η_RD)          hoisting tension per rope end at the drum [N]
//	F_Z = F                      ISO 4308-1 basis (staticBasis false)
//	F_Z = W / n                  static basis of 29 CFR 1910.179(h)(2) / ASME B30.2 (staticBasis true)
//	demand Z (required), capacity MBF / F_Z (the actual design factor), unit "1"
//	utilisation Z F_Z / MBF
//
// Symbols: W = (m_L + m_H) g [N]; n parts of line (≥ 1); e rope ends on the drum (1 or
// 2); n_e = n/e; η_s sheave efficiency (0, 1]; k deflection sheaves (≥ 0); MBF the
// rope's minimum breaking force [N] (> 0); Z the required design factor from the rules
// (> 0). The drum radius does not enter. F is always reported as figure rope_tension_n;
// the others are static_tension_n (W/n), design_tension_n (F_Z), reeving_efficiency
// (η_R alone), deflection_efficiency (η_D), design_factor (MBF/F_Z) and
// required_design_factor (Z).
//
// Special cases: with no load on the rope (m = 0) the design factor is +Inf and the
// utilisation 0. The utilisation is linear in m, hence affine in the rated load.
//
// Reeving model: the part tensions of a reeving fall by η_s over each sheave from the
// hauling part, so the mean part tension over the drum tension is the geometric mean
// η_R (standards.md "Reeving", memory high). It reproduces the Wire Rope Users Manual
// lead-line factor K^S (K − 1)/(K^N − 1) with η_s = 1/K, n_e = N and k = S − N + 1
// (standards.md, computed; see the tests).
//
// Sources: ISO 4308-1 minimum practical design factor Zp (standards.md: seen);
// 29 CFR 1910.179(h)(2) rated load plus block / parts of line ≤ 20 % of breaking strength
// (standards.md: law); ASME B30.7-2016 7-1.2.5 for winches (seen).
func RopeDesignFactor(h Hoist, zRequired float64, staticBasis bool) (Outcome, error) {
	if err := stCheckLoad(h); err != nil {
		return Outcome{}, err
	}
	if err := h.CheckReeving(); err != nil {
		return Outcome{}, err
	}
	if err := stPositive("rope_mbf", "rope minimum breaking force", "N", h.RopeMBFN); err != nil {
		return Outcome{}, err
	}
	if err := stRule("required design factor", zRequired); err != nil {
		return Outcome{}, err
	}
	rec := !h.SkipRecord && !h.SkipDetail
	f, etaR, etaD, steps := stTension(h)
	w := h.WeightN()
	n := float64(h.Parts)
	static := w / n
	fz := f
	if staticBasis {
		fz = static
	}
	mbf := h.RopeMBFN
	z := math.Inf(1)
	if fz > 0 {
		z = mbf / fz
	}
	u := zRequired * fz / mbf
	if rec {
		steps = append(steps, stStep("F_0", "W / n", "%s / %s", static, "N", w, n))
		if staticBasis {
			steps = append(steps, stStep("F_Z", "F_0 (static basis, no efficiency)", "%s", fz, "N", static))
		} else {
			steps = append(steps, stStep("F_Z", "F (hoisting tension, ISO 4308-1 basis)", "%s", fz, "N", f))
		}
		steps = append(steps,
			stStep("Z_act", "MBF / F_Z", "%s / %s", z, "1", mbf, fz),
			stStep("u", "Z F_Z / MBF", "%s × %s / %s", u, "1", zRequired, fz, mbf),
		)
	}
	if h.SkipDetail {
		return Outcome{Demand: zRequired, Capacity: z, Unit: "1", Utilisation: u, Verdict: ByUtilisation}, nil
	}
	o := Outcome{
		Demand:      zRequired,
		Capacity:    z,
		Unit:        "1",
		Utilisation: u,
		Verdict:     ByUtilisation,
		Figures: h.Figs.take([]Figure{
			{Name: "rope_tension_n", Value: f, Unit: "N"},
			{Name: "static_tension_n", Value: static, Unit: "N"},
			{Name: "design_tension_n", Value: fz, Unit: "N"},
			{Name: "reeving_efficiency", Value: etaR, Unit: "1"},
			{Name: "deflection_efficiency", Value: etaD, Unit: "1"},
			{Name: "design_factor", Value: z, Unit: "1"},
			{Name: "required_design_factor", Value: zRequired, Unit: "1"},
		}),
		Steps: steps,
	}
	if staticBasis {
		o.Note = "static basis: W / n without reeving efficiency"
	}
	if fz == 0 {
		o.Note = "no load on the rope: rated load and hook block mass are 0"
	}
	return o, nil
}

// MBFFromGrade is the minimum breaking force of a stranded rope from its nominal
// diameter, rope grade and minimum breaking force factor, in newtons:
//
//	F_min = d² R_r K / 1000  [kN]  with d in mm, R_r in N/mm²
//	      = d_mm² R_r K      [N]
//
// diameterM is the nominal diameter in metres (> 0), gradeNPerMM2 the rope grade R_r
// (1770, 1960, 2160, …) (> 0), k the factor K of the construction (> 0; see RopeK).
// Special case: NaN when any input is not a positive finite number (the caller
// validates and reports).
//
// Source: EN 12385-4 (standards.md "Wire rope": seen). Example: 20 mm 6×36 IWRC 1960
// gives 279.1 kN (computed; tables list 279 kN).
func MBFFromGrade(diameterM, gradeNPerMM2, k float64) float64 {
	if !(stFinite(diameterM) && diameterM > 0 && stFinite(gradeNPerMM2) && gradeNPerMM2 > 0 && stFinite(k) && k > 0) {
		return math.NaN()
	}
	dmm := diameterM * 1000
	return dmm * dmm * gradeNPerMM2 * k
}

// ropeSpec is a rope construction as read from free text.
type ropeSpec struct {
	strands    int    // outer strands (6 in 6×36), or the strand count of a multi-strand rope (35 in 35×7)
	wires      int    // wires per strand (36 in 6×36); 0 when no construction was found
	suffix     string // strand designation after the wire count: "ws", "s", "f", "m", …
	compacted  bool   // "K" before the wire count (6×K36): compacted strands
	core       string // "fibre", "iwrc", "wsc" or ""
	rotation   bool   // words saying rotation resistant
	unknown    bool   // a word the parser does not understand
	ambiguous  bool   // more than one construction or core
	hasStrands bool
}

var (
	ropeXRe    = regexp.MustCompile(`(\d|\))\s*[x×✕*]\s*(k?\d)`)
	ropeConsRe = regexp.MustCompile(`^(\d+)(\([a-z]+\)|[a-z]*)x(k?)(\d+)([a-z]*)$`)
	ropeNumRe  = regexp.MustCompile(`^\d+([.,]\d+)?(mm|in|n|kn|nmm2|nmm|mpa)?$`)
	ropeSepRe  = regexp.MustCompile(`[\s,;/_+\-]+`)
)

// ropePhrases are rewritten to one token before splitting (longest first).
var ropePhrases = []struct{ from, to string }{
	{"independent wire rope core", " iwrc "},
	{"independent wire strand core", " wsc "},
	{"wire strand core", " wsc "},
	{"steel wire core", " iwrc "},
	{"steel core", " iwrc "},
	{"wire core", " iwrc "},
	{"natural fibre core", " fc "},
	{"synthetic fibre core", " fc "},
	{"fibre core", " fc "},
	{"rotation resistant", " rotres "},
	{"rotation resisting", " rotres "},
	{"non rotating", " rotres "},
	{"nonrotating", " rotres "},
	{"non spinning", " rotres "},
	{"non spin", " rotres "},
	{"spin resistant", " rotres "},
	{"low rotation", " rotres "},
	{"multi strand", " rotres "},
	{"multistrand", " rotres "},
}

// ropeBenign are words that do not change the construction's K factor: lay, finish,
// "class", "rope", grade words.
var ropeBenign = map[string]bool{
	"sz": true, "zs": true, "zz": true, "ss": true, "rhol": true, "rhrl": true, "lhol": true, "lhrl": true,
	"rrl": true, "lrl": true, "rhll": true, "lhll": true, "rhl": true, "lhl": true, "rh": true, "lh": true,
	"lay": true, "regular": true, "ordinary": true, "lang": true, "langs": true, "right": true, "left": true, "hand": true,
	"bright": true, "u": true, "b": true, "a": true, "galv": true, "galvanised": true, "galvanized": true,
	"ungalvanised": true, "ungalvanized": true, "ungalv": true,
	"class": true, "rope": true, "wire": true, "steel": true, "strand": true, "stranded": true, "preformed": true, "pf": true,
	"lubricated": true, "mm": true, "in": true, "n": true, "mm2": true, "grade": true, "mpa": true,
	"ips": true, "eip": true, "eips": true, "eeip": true, "eeips": true, "xip": true, "xxip": true,
}

// parseRope reads a construction such as "6x36WS-IWRC", "6×19 FC", "8x36 fibre core",
// "35(W)xK7", "19x7 rotation resistant".
func parseRope(s string) ropeSpec {
	var r ropeSpec
	t := strings.ToLower(strings.TrimSpace(s))
	t = strings.ReplaceAll(t, "fiber", "fibre")
	t = strings.ReplaceAll(t, "-", " ")
	t = ropeXRe.ReplaceAllString(t, "${1}x${2}")
	t = " " + strings.Join(strings.Fields(t), " ") + " "
	for _, p := range ropePhrases {
		t = strings.ReplaceAll(t, p.from, p.to)
	}
	setCore := func(c string) {
		if r.core != "" && r.core != c {
			r.ambiguous = true
		}
		r.core = c
	}
	lastCons := false
	for _, tok := range ropeSepRe.Split(t, -1) {
		if tok == "" {
			continue
		}
		// A strand designation written apart from the numbers: "6 x 36 WS".
		if lastCons && r.suffix == "" && tok != "" && (ropeSuffix[tok] || tok == "m") {
			r.suffix = tok
			lastCons = false
			continue
		}
		lastCons = false
		if m := ropeConsRe.FindStringSubmatch(tok); m != nil {
			lastCons = true
			if r.hasStrands {
				r.ambiguous = true
			}
			r.hasStrands = true
			r.strands, _ = strconv.Atoi(m[1])
			r.compacted = m[3] == "k"
			r.wires, _ = strconv.Atoi(m[4])
			suf := m[5]
			// A core written straight after the strand designation: "6x36wsiwrc".
			switch {
			case strings.HasSuffix(suf, "iwrc"):
				suf = strings.TrimSuffix(suf, "iwrc")
				setCore("iwrc")
			case strings.HasSuffix(suf, "wsc"):
				suf = strings.TrimSuffix(suf, "wsc")
				setCore("wsc")
			case strings.HasSuffix(suf, "fc"):
				suf = strings.TrimSuffix(suf, "fc")
				setCore("fibre")
			}
			r.suffix = suf
			if m[2] != "" && m[2] != "(w)" && m[2] != "w" {
				r.unknown = true
			}
			continue
		}
		switch tok {
		case "iwrc", "iwr":
			setCore("iwrc")
		case "wsc":
			setCore("wsc")
		case "fc", "nfc", "sfc", "fibre":
			setCore("fibre")
		case "rotres", "rr":
			r.rotation = true
		default:
			if !ropeBenign[tok] && !ropeNumRe.MatchString(tok) {
				r.unknown = true
			}
		}
	}
	return r
}

// Wire counts per strand of the EN 12385-4 rope classes whose K factors standards.md
// gives (class membership: memory, medium): 6×19 class 6×19S, 6×19W, 6×21F, 6×25F,
// 6×26WS; 6×36 class 6×29F, 6×31WS, 6×36WS, 6×41WS, 6×46WS, 6×49SWS.
var (
	rope19Class = map[int]bool{19: true, 21: true, 25: true, 26: true}
	rope36Class = map[int]bool{29: true, 31: true, 36: true, 41: true, 46: true, 49: true}
	ropeSuffix  = map[string]bool{"": true, "s": true, "w": true, "f": true, "ws": true, "sw": true, "sws": true, "sf": true,
		"seale": true, "filler": true, "warrington": true}
)

// RopeK returns the EN 12385-4 minimum breaking force factor K of a rope construction
// written as free text, with the canonical name of the construction it recognised:
//
//	6×19 and 6×36 class      FC 0.330   IWRC 0.356
//	6×7                      FC 0.332   IWRC 0.359
//	6×19M                    FC 0.307   IWRC 0.332
//	6×37M                    FC 0.295   IWRC 0.319
//	8×36 class               FC 0.293   IWRC 0.356
//
// (standards.md "Wire rope": seen). Accepted: "x", "×" or "*" between the numbers, a
// strand designation (S, W, F, WS, SWS, SF; M for cross lay), the core as FC, NFC, SFC,
// "fibre core", "fiber core", IWRC, "steel core", written apart or joined by a hyphen,
// and words that do not change K (lay direction, finish, grade, "class"). Class members
// are recognised by wires per strand: 6×19 class 19, 21, 25, 26; 6×36 and 8×36 class 29,
// 31, 36, 41, 46, 49 (memory, medium).
//
// ok is false (k 0) for anything else, so that the caller asks for the MBF instead of
// guessing: no core given, a wire-strand core (WSC), compacted strands (6×K36),
// rotation-resistant and other constructions with no K in standards.md, a bare "6×37"
// (in US usage the 6×37 class, i.e. EN's 6×36 class; in EN usage 6×37M: ambiguous), or
// any word the parser does not know.
func RopeK(construction string) (k float64, canonical string, ok bool) {
	r := parseRope(construction)
	if !r.hasStrands || r.unknown || r.ambiguous || r.compacted || r.rotation {
		return 0, "", false
	}
	var fc, iwrc float64
	var name string
	switch {
	case r.strands == 6 && r.wires == 7 && r.suffix == "":
		fc, iwrc, name = 0.332, 0.359, "6×7"
	case r.strands == 6 && r.wires == 19 && r.suffix == "m":
		fc, iwrc, name = 0.307, 0.332, "6×19M"
	case r.strands == 6 && r.wires == 37 && r.suffix == "m":
		fc, iwrc, name = 0.295, 0.319, "6×37M"
	case r.strands == 6 && rope19Class[r.wires] && ropeSuffix[r.suffix]:
		fc, iwrc, name = 0.330, 0.356, "6×19 class"
	case r.strands == 6 && rope36Class[r.wires] && ropeSuffix[r.suffix]:
		fc, iwrc, name = 0.330, 0.356, "6×36 class"
	case r.strands == 8 && rope36Class[r.wires] && ropeSuffix[r.suffix]:
		fc, iwrc, name = 0.293, 0.356, "8×36 class"
	default:
		return 0, "", false
	}
	switch r.core {
	case "fibre":
		return fc, name + " FC", true
	case "iwrc":
		return iwrc, name + " IWRC", true
	}
	return 0, "", false
}

// RopeCategory sorts a rope construction into the categories of the ISO 4309 discard
// criteria: "rotation resistant" (multi-strand ropes of 10 or more strands such as
// 18×7, 19×7, 34×7, 35(W)×7, or any construction described as rotation resistant,
// non-rotating, low-rotation or multi-strand), "steel core" (IWRC, WSC, "steel core"),
// "fibre core" (FC, NFC, SFC, "fibre/fiber core"), or "" when it cannot tell. Rotation
// resistance wins over the core. Unknown words are ignored here (only the category is
// wanted).
//
// Source: ISO 4309:2010 discard by uniform diameter decrease, separate limits for
// fibre-core, steel-core and rotation-resistant ropes (standards.md: memory, medium).
func RopeCategory(construction string) string {
	r := parseRope(construction)
	if r.rotation || (r.hasStrands && r.strands >= 10) {
		return "rotation resistant"
	}
	switch r.core {
	case "iwrc", "wsc":
		if !r.ambiguous {
			return "steel core"
		}
	case "fibre":
		if !r.ambiguous {
			return "fibre core"
		}
	}
	return ""
}
