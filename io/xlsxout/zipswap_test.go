package xlsxout

import (
	"math/rand/v2"
	"testing"
)

// TestSortedContentTypes: the content-types part comes out the same whatever the order
// excelize listed its elements in (it lists image extensions from a map: issue 16).
func TestSortedContentTypes(t *testing.T) {
	elems := []string{
		`<Default Extension="jpeg" ContentType="image/jpeg"></Default>`,
		`<Default Extension="png" ContentType="image/png"></Default>`,
		`<Default Extension="xml" ContentType="application/xml"/>`,
		`<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"></Override>`,
		`<Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"></Override>`,
	}
	head, tail := `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>`+"\n"+`<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">`, `</Types>`
	want := ""
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 20 {
		rng.Shuffle(len(elems), func(a, b int) { elems[a], elems[b] = elems[b], elems[a] })
		b := head
		for _, e := range elems {
			b += e
		}
		got := string(sortedContentTypes([]byte(b + tail)))
		if i == 0 {
			want = got
		}
		if got != want || len(got) != len(b+tail) {
			t.Fatalf("order %d:\n%s\nwant\n%s", i, got, want)
		}
	}
	// Something unexpected between the elements: left as it is.
	odd := head + elems[1] + "<!-- x -->" + elems[0] + tail
	if got := string(sortedContentTypes([]byte(odd))); got != odd {
		t.Errorf("changed %s", got)
	}
}
