package register

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"context"
	"hash/crc32"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// deflateSegment compresses b with a fresh compressor and a sync flush: a run of
// non-final deflate blocks that refers to nothing before it, so that segments can be
// concatenated (RFC 1951 §3.2.3: a block's back-references reach only the bytes the
// decompressor has output, and a segment made alone uses only its own).
func deflateSegment(t testing.TB, b []byte, final bool) []byte {
	t.Helper()
	var out bytes.Buffer
	w, err := flate.NewWriter(&out, flate.BestCompression)
	if err != nil {
		t.Fatal(err)
	}
	_, _ = w.Write(b)
	if final {
		err = w.Close()
	} else {
		err = w.Flush()
	}
	if err != nil {
		t.Fatal(err)
	}
	return out.Bytes()
}

// bombPart is a zip entry that unzips to prefix, then chunk repeated n times, then
// suffix, built without ever holding the uncompressed text: the chunk is compressed once
// and its segment repeated.
type bombPart struct {
	name           string
	prefix, suffix string
	chunk          []byte
	n              int
}

// bombBook writes a workbook of the crafted workbook and relationships, the bomb part
// and the other parts (deflated as usual) to a file in dir.
func bombBook(t testing.TB, dir, file string, bomb bombPart, others ...part) string {
	t.Helper()
	path := filepath.Join(dir, file)
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	zw := zip.NewWriter(f)
	for _, p := range append(craftedPackage(), others...) {
		w, err := zw.Create(p.name)
		if err != nil {
			t.Fatal(err)
		}
		_, _ = io.WriteString(w, p.body)
	}
	crc := crc32.ChecksumIEEE([]byte(bomb.prefix))
	seg := deflateSegment(t, bomb.chunk, false)
	for range bomb.n {
		crc = crc32.Update(crc, crc32.IEEETable, bomb.chunk)
	}
	crc = crc32.Update(crc, crc32.IEEETable, []byte(bomb.suffix))
	head, tail := deflateSegment(t, []byte(bomb.prefix), false), deflateSegment(t, []byte(bomb.suffix), true)
	size := uint64(len(bomb.prefix)) + uint64(len(bomb.chunk))*uint64(bomb.n) + uint64(len(bomb.suffix))
	w, err := zw.CreateRaw(&zip.FileHeader{Name: bomb.name, Method: zip.Deflate, CRC32: crc,
		CompressedSize64: uint64(len(head)+len(tail)) + uint64(len(seg))*uint64(bomb.n), UncompressedSize64: size})
	if err != nil {
		t.Fatal(err)
	}
	_, _ = w.Write(head)
	for range bomb.n {
		_, _ = w.Write(seg)
	}
	_, _ = w.Write(tail)
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

// bombCases are issue 16's tiny files that exhausted memory, at the sizes.
func bombCases() []struct {
	file   string
	bomb   bombPart
	others []part
	errHas []string
} {
	mib := func(c byte) []byte { return bytes.Repeat([]byte{c}, 1<<20) }
	var si bytes.Buffer
	for si.Len() < 1<<20-17 {
		si.WriteString("<si><t>a</t></si>")
	}
	siChunk := si.Bytes()
	perChunk := len(siChunk) / len("<si><t>a</t></si>")
	return []struct {
		file   string
		bomb   bombPart
		others []part
		errHas []string
	}{
		{"inline-string-1.2GB.xlsx", bombPart{name: "xl/worksheets/sheet1.xml",
			prefix: craftedSheetHead + craftedHeader + `<row r="2"><c r="A2" t="inlineStr"><is><t>`,
			chunk:  mib('x'), n: 1200, suffix: `</t></is></c></row>` + craftedSheetTail}, nil,
			[]string{"inline-string-1.2GB.xlsx", `sheet "Register"`, "row 2", "1 MiB", "refused"}},
		{"whitespace-1.5GB.xlsx", bombPart{name: "xl/worksheets/sheet1.xml",
			prefix: craftedSheetHead + craftedHeader + `<row r="2"><c r="A2" t="inlineStr"><is><t>H-2</t></is></c>`,
			chunk:  mib(' '), n: 1500, suffix: `</row>` + craftedSheetTail}, nil,
			[]string{"whitespace-1.5GB.xlsx", `sheet "Register"`, "row 2", "1 MiB", "refused"}},
		{"shared-strings-5M.xlsx", bombPart{name: "xl/sharedStrings.xml",
			prefix: `<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">`,
			chunk:  siChunk, n: 5_000_000/perChunk + 1, suffix: `</sst>`},
			[]part{sheetPart(craftedHeader + hoistRows(2, 3))},
			[]string{"shared-strings-5M.xlsx", "xl/sharedStrings.xml", "shared strings, more than the limit of 4194304"}},
	}
}

// TestBombsRefused: each bomb of issue 16 is refused with a located message, having
// allocated less than 300 MB in all (an upper bound on the heap it could have used; the
// issue saw 3.7 GB and 788 MB). Files are built in the test (about 1 MB each).
func TestBombsRefused(t *testing.T) {
	if testing.Short() {
		t.Skip("builds three bombs (seconds)")
	}
	dir := t.TempDir()
	for _, tc := range bombCases() {
		t.Run(tc.file, func(t *testing.T) {
			path := bombBook(t, dir, tc.file, tc.bomb, tc.others...)
			if fi, err := os.Stat(path); err != nil || fi.Size() > 2<<20 {
				t.Fatalf("the bomb is %v bytes (%v)", fi.Size(), err)
			}
			var before, after runtime.MemStats
			runtime.ReadMemStats(&before)
			r, _, err := readCrafted(path)
			runtime.ReadMemStats(&after)
			if r != nil {
				r.Close()
			}
			if err == nil {
				t.Fatal("read")
			}
			for _, w := range tc.errHas {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q\nlacks %q", err, w)
				}
			}
			if got := after.TotalAlloc - before.TotalAlloc; got > 300<<20 {
				t.Errorf("allocated %d MB reading the bomb", got>>20)
			}
		})
	}
}

// TestXLSXLimitsEach: every limit of Limits refuses with a message that names it, at a
// small setting (the bombs above test the defaults).
func TestXLSXLimitsEach(t *testing.T) {
	cell := func(n int) string {
		return `<c t="inlineStr"><is><t>` + strings.Repeat("x", n) + `</t></is></c>`
	}
	sst := func(items ...string) part {
		var b strings.Builder
		b.WriteString(`<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main">`)
		for _, s := range items {
			b.WriteString("<si><t>" + s + "</t></si>")
		}
		b.WriteString("</sst>")
		return part{name: "xl/sharedStrings.xml", body: b.String()}
	}
	rows := sheetPart(craftedHeader + hoistRows(2, 3))
	for _, tc := range []struct {
		name   string
		lim    Limits
		book   []byte
		errHas []string
	}{
		{"row bytes", Limits{MaxRowBytes: 64 << 10},
			craftedBook(t, sheetPart(craftedHeader+`<row r="2">`+strings.Repeat(cell(10<<10), 8)+`</row>`)),
			[]string{"x.xlsx", `sheet "Register" row 2`, "longer than 0.0625 MiB, the limit for one row"}},
		{"cell text", Limits{MaxCellText: 16 << 10},
			craftedBook(t, sheetPart(craftedHeader+`<row r="2">`+cell(20<<10)+`</row>`)),
			[]string{"x.xlsx", `sheet "Register"`, "row 2", "the limit is 0.0156 MiB"}},
		{"shared string text", Limits{MaxCellText: 16 << 10},
			craftedBook(t, rows, sst("a", strings.Repeat("y", 20<<10))),
			[]string{"x.xlsx", "xl/sharedStrings.xml", "string 2", "the limit is 0.0156 MiB"}},
		{"shared string count", Limits{MaxSharedCount: 2},
			craftedBook(t, rows, sst("a", "b", "c")),
			[]string{"x.xlsx", "xl/sharedStrings.xml", "3 shared strings, more than the limit of 2"}},
		{"shared strings size", Limits{MaxSharedStrings: 1 << 10},
			craftedBook(t, rows, sst(strings.Repeat("z", 600), strings.Repeat("w", 600))),
			[]string{"x.xlsx", "shared-strings table", "more than the 0.000977 MiB limit"}},
		// A workbook from a stream is held in memory: its size is bounded.
		{"streamed size", Limits{MaxStreamed: 512},
			craftedBook(t, rows),
			[]string{"x.xlsx", "a workbook read from a stream is held in memory", "give the file's path instead"}},
	} {
		lim := DefaultLimits
		if tc.lim.MaxRowBytes > 0 {
			lim.MaxRowBytes = tc.lim.MaxRowBytes
		}
		if tc.lim.MaxCellText > 0 {
			lim.MaxCellText = tc.lim.MaxCellText
		}
		if tc.lim.MaxSharedCount > 0 {
			lim.MaxSharedCount = tc.lim.MaxSharedCount
		}
		if tc.lim.MaxSharedStrings > 0 {
			lim.MaxSharedStrings = tc.lim.MaxSharedStrings
		}
		if tc.lim.MaxStreamed > 0 {
			lim.MaxStreamed = tc.lim.MaxStreamed
		}
		r, err := NewXLSXLimits(bytes.NewReader(tc.book), "x.xlsx", "", lim)
		if err == nil {
			_, err = readAllErr(r)
			r.Close()
		}
		if err == nil {
			t.Errorf("%s: read", tc.name)
			continue
		}
		for _, w := range tc.errHas {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q\nlacks %q", tc.name, err, w)
			}
		}
	}
}

// readAllErr reads a register to its end, returning the number of hoists and the first
// error.
func readAllErr(r *Reader) (int, error) {
	n := 0
	for {
		_, err := r.Next(context.Background())
		if err == io.EOF {
			return n, nil
		}
		if err != nil {
			return n, err
		}
		n++
	}
}
