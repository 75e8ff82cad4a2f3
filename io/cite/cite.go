// Package cite shortens the "source" text of a check for the outputs that repeat it on
// every row (the CSV long form, the workbook's Checks sheet): the full text of every rule
// in force is given once, in the workbook's Audit sheet and by `hoistfleet rules`.
//
// A check that used rule rows has a source made of their citations, each "source text
// [provenance]", joined by "; " (fleet's rule texts). Short keeps of each citation the
// document's designation and the provenance label:
//
//	ISO 4308-1 (edition not recorded), coefficient h1, drums [memory, medium]
//	  → ISO 4308-1 [memory, medium]
//	Machinery Directive 2006/42/EC, Annex I 4.1.2.3 (static test coefficient) [memory, high]
//	  → Machinery Directive 2006/42/EC, Annex I 4.1.2.3 [memory, high]
//
// A source without a provenance label (a check that reads no rule row names its method,
// "Newton's second law (emergency stop while lowering)") is not a rule's citation and is
// kept whole.
package cite

import "strings"

// Short returns the short form of a check's source text (see the package comment).
//
// The designation is the text before the first " (" or ": ", or the first ", " followed
// by a lower-case letter (a description: ", coefficient h1"); a ", " followed by a capital
// or a digit continues the designation (", Annex I 4.1.2.3", ", 3 January 1989").
func Short(source string) string {
	if !strings.HasSuffix(source, "]") {
		return source
	}
	var b strings.Builder
	rest := source
	for rest != "" {
		// one citation: up to and including "]", then "; " before the next
		end := strings.Index(rest, "]; ")
		cit := rest
		if end >= 0 {
			cit, rest = rest[:end+1], rest[end+3:]
		} else {
			rest = ""
		}
		open := strings.LastIndex(cit, " [")
		if open < 0 || !strings.HasSuffix(cit, "]") {
			// not a labelled citation: keep it whole
			if b.Len() > 0 {
				b.WriteString("; ")
			}
			b.WriteString(cit)
			continue
		}
		if b.Len() > 0 {
			b.WriteString("; ")
		}
		b.WriteString(designation(cit[:open]))
		b.WriteString(cit[open:])
	}
	return b.String()
}

// designation cuts a citation's text to the document it names.
func designation(s string) string {
	cut := len(s)
	if i := strings.Index(s, " ("); i > 0 {
		cut = i
	}
	if i := strings.Index(s, ": "); i > 0 && i < cut {
		cut = i
	}
	for i := 0; i < cut; {
		j := strings.Index(s[i:cut], ", ")
		if j < 0 {
			break
		}
		k := i + j + 2
		if k < len(s) && s[k] >= 'a' && s[k] <= 'z' {
			cut = i + j
			break
		}
		i = k
	}
	if cut == 0 {
		return s
	}
	return s[:cut]
}
