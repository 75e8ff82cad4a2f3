package register

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"hoistfleet/fleet"
)

// Limits bound what an XLSX workbook may unzip to and what one cell, one row and the
// shared-strings table may hold, so that a zip bomb or a crafted part is refused with a
// message within seconds instead of exhausting memory or disk. Zero fields take
// DefaultLimits' values.
type Limits struct {
	MaxUnzipped      int64 // all parts of the workbook, uncompressed
	MaxSharedStrings int64 // the shared-strings table, uncompressed
	MaxSharedCount   int   // strings in the shared-strings table
	MaxCellText      int64 // one cell's text, or any other run of XML without a tag, in bytes
	MaxRowBytes      int64 // one row's XML, in bytes
	// MaxStreamed bounds a workbook read from a stream (standard input, a named pipe),
	// which is held in memory whole: a million-row register is about 200 MB zipped.
	MaxStreamed int64
}

// DefaultLimits allow registers of a million rows and more (hoistgen's million rows of
// every schema column unzip to 2.1 GiB: the sheet is streamed, so the total bounds the
// time a read may take, not its memory): a cell holds at most 32 767 characters in every
// spreadsheet program (up to 4 bytes each in UTF-8, more with XML escapes), a row at most
// 16 384 cells.
var DefaultLimits = Limits{MaxUnzipped: 4 << 30, MaxSharedStrings: 256 << 20, MaxSharedCount: 4 << 20,
	MaxCellText: 1 << 20, MaxRowBytes: 64 << 20, MaxStreamed: 1 << 30}

func (l Limits) cellText() int64 {
	if l.MaxCellText > 0 {
		return l.MaxCellText
	}
	return DefaultLimits.MaxCellText
}

func (l Limits) rowBytes() int64 {
	if l.MaxRowBytes > 0 {
		return l.MaxRowBytes
	}
	return DefaultLimits.MaxRowBytes
}

func (l Limits) sharedCount() int {
	if l.MaxSharedCount > 0 {
		return l.MaxSharedCount
	}
	return DefaultLimits.MaxSharedCount
}

// oleMagic starts an OLE2 compound file: an encrypted (password-protected) OOXML
// workbook, or a legacy binary .xls.
var oleMagic = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}

// NewXLSX reads the register on a sheet of an XLSX workbook; sheet "" is the first
// sheet. name is the file name for messages. It uses DefaultLimits.
//
// The workbook is read by this package (archive/zip, encoding/xml; sheetxml.go), not by
// a spreadsheet library: every zip entry read is checked against its CRC-32 and declared
// size, two entries of one name are refused, and an XML error anywhere in the sheet
// refuses the register with the sheet and row where it broke, instead of ending the
// register there. Rows and cells are placed by their references; a duplicate or
// impossible reference is refused naming the cell.
//
// Cells are read as stored: a number shown as "12.3" but stored as 12.3456 is read as
// 12.3456; a formula gives the value last calculated by the spreadsheet program; a date
// column's date cells arrive as date serials and are converted with the workbook's date
// system (1900 or 1904); a boolean cell is TRUE or FALSE (never a number). Text columns
// (asset id, site, …) are read as the spreadsheet shows them: a number formatted 00000
// is "00125" (numfmt.go). A value in merged cells below the header applies to every row
// of the merge (a site merged down over its hoists' rows), said in the notes. Hidden rows
// and columns are read like the others. Empty rows after the last non-empty row are
// dropped; empty rows between data rows are returned, Blank. Merged cells in the header
// row are an error.
//
// Close must be called.
func NewXLSX(r io.Reader, name, sheet string) (*Reader, error) {
	return NewXLSXLimits(r, name, sheet, DefaultLimits)
}

// NewXLSXLimits is NewXLSX with explicit limits.
func NewXLSXLimits(r io.Reader, name, sheet string, lim Limits) (*Reader, error) {
	return newXLSX(r, name, sheet, lim, Options{})
}

// NewXLSXOptions is NewXLSX with Options.
func NewXLSXOptions(r io.Reader, name, sheet string, opt Options) (*Reader, error) {
	return newXLSX(r, name, sheet, DefaultLimits, opt)
}

func newXLSX(r io.Reader, name, sheet string, lim Limits, opt Options) (*Reader, error) {
	file := displayName(name)
	// A workbook from a stream (standard input, a pipe) is held in memory whole: its
	// compressed size is bounded apart from what it unzips to.
	maxStreamed := lim.MaxStreamed
	if maxStreamed <= 0 {
		maxStreamed = DefaultLimits.MaxStreamed
	}
	b, err := io.ReadAll(io.LimitReader(r, maxStreamed+1))
	if err != nil {
		return nil, fileError(file, err)
	}
	if int64(len(b)) > maxStreamed {
		return nil, fileError(file, fmt.Errorf("a workbook read from a stream is held in memory, and this one is larger than %s: give the file's path instead", size(maxStreamed)))
	}
	if err := sniffXLSX(b, lim); err != nil {
		return nil, fileError(file, err)
	}
	return openWorkbook(bytes.NewReader(b), int64(len(b)), file, sheet, lim, opt, nil)
}

// openWorkbook checks the zip's parts against the limits, reads the workbook's sheets,
// shared strings and styles, and opens the register sheet. ra and size give the zip;
// closer, when not nil, is closed with the Reader.
func openWorkbook(ra io.ReaderAt, size int64, file, sheet string, lim Limits, opt Options, closer io.Closer) (*Reader, error) {
	zr, err := zip.NewReader(ra, size)
	if err != nil {
		return nil, fileError(file, fmt.Errorf("not a readable XLSX workbook (truncated, or another kind of file): %w", err))
	}
	parts, err := zipParts(zr)
	if err != nil {
		return nil, fileError(file, err)
	}
	if err := checkParts(zr, lim); err != nil {
		return nil, fileError(file, err)
	}
	wi, err := readWorkbook(parts)
	if err != nil {
		return nil, fileError(file, fmt.Errorf("not a readable XLSX workbook: %w", err))
	}
	rd, err := openSheet(parts, wi, file, sheet, lim, opt)
	if err != nil {
		return nil, fileError(file, err)
	}
	rd.src.(*xlsxSource).closer = closer
	return rd, nil
}

// NewXLSXFile is NewXLSX for a workbook on disk, read through the file (random access)
// instead of from a copy of the whole file in memory, which for a register of a million
// rows saves hundreds of megabytes. The file is opened read-only and closed by Close; a
// FIFO or another file that cannot seek is read into memory; what is not a zip archive
// gets NewXLSX's diagnosis.
func NewXLSXFile(path, sheet string) (*Reader, error) {
	return NewXLSXFileOptions(path, sheet, Options{})
}

// NewXLSXFileOptions is NewXLSXFile with Options.
func NewXLSXFileOptions(path, sheet string, opt Options) (*Reader, error) {
	lim := DefaultLimits
	file := displayName(path)
	fh, err := os.Open(path)
	if err != nil {
		return nil, fileError(file, err)
	}
	fi, err := fh.Stat()
	if err != nil {
		fh.Close()
		return nil, fileError(file, err)
	}
	head := make([]byte, 4)
	n, _ := io.ReadFull(fh, head)
	if !fi.Mode().IsRegular() || !bytes.HasPrefix(head[:n], []byte("PK")) || fi.Size() > lim.MaxUnzipped {
		defer fh.Close()
		if fi.Mode().IsRegular() {
			if _, err := fh.Seek(0, io.SeekStart); err != nil {
				return nil, fileError(file, err)
			}
			return newXLSX(fh, path, sheet, lim, opt)
		}
		return newXLSX(io.MultiReader(bytes.NewReader(head[:n]), fh), path, sheet, lim, opt)
	}
	rd, err := openWorkbook(fh, fi.Size(), file, sheet, lim, opt, fh)
	if err != nil {
		fh.Close()
	}
	return rd, err
}

// sniffXLSX refuses what is not a zip file, with the reason when it is recognisable.
func sniffXLSX(b []byte, lim Limits) error {
	switch {
	case int64(len(b)) > lim.MaxUnzipped:
		return fmt.Errorf("the file is larger than %s: it is not a register this tool can read", size(lim.MaxUnzipped))
	case len(b) == 0:
		return errors.New("the file is empty")
	case bytes.HasPrefix(b, oleMagic):
		if bytes.Contains(b, utf16le("EncryptionInfo")) || bytes.Contains(b, utf16le("EncryptedPackage")) {
			return errors.New("the workbook is password-protected: save an unprotected copy")
		}
		return errors.New("this is a binary Office file (a legacy .xls workbook?), not XLSX: save it as .xlsx")
	case !bytes.HasPrefix(b, []byte("PK")):
		return errors.New("not an XLSX workbook (an XLSX file is a zip archive; is this a CSV or text file?)")
	}
	return nil
}

func utf16le(s string) []byte {
	out := make([]byte, 0, 2*len(s))
	for i := 0; i < len(s); i++ {
		out = append(out, s[i], 0)
	}
	return out
}

func size(n int64) string {
	if n >= 1<<30 {
		return fmt.Sprintf("%.3g GiB", float64(n)/(1<<30))
	}
	return fmt.Sprintf("%.3g MiB", float64(n)/(1<<20))
}

// checkParts refuses a workbook whose parts unzip to more than the limits, from the sizes
// the zip directory declares (a part that inflates to another size than it declares is
// refused when it is read: checkedPart).
func checkParts(zr *zip.Reader, lim Limits) error {
	var total uint64
	hasWorkbook := false
	for _, zf := range zr.File {
		total += zf.UncompressedSize64
		name := strings.ToLower(zf.Name)
		if name == "xl/workbook.xml" {
			hasWorkbook = true
		}
		if name == "xl/sharedstrings.xml" && zf.UncompressedSize64 > uint64(lim.MaxSharedStrings) {
			return fmt.Errorf("the shared-strings table unzips to %s, more than the %s limit", size(int64(min(zf.UncompressedSize64, 1<<62))), size(lim.MaxSharedStrings))
		}
	}
	if total > uint64(lim.MaxUnzipped) {
		return fmt.Errorf("the workbook unzips to %s, more than the %s limit (a zip bomb, or not a register)", size(int64(min(total, 1<<62))), size(lim.MaxUnzipped))
	}
	if !hasWorkbook {
		return errors.New("a zip file, but not an XLSX workbook (no xl/workbook.xml)")
	}
	return nil
}

// openSheet selects the sheet, reads the header row and returns the Reader.
func openSheet(parts map[string]*zip.File, wi workbookInfo, file, sheet string, lim Limits, opt Options) (*Reader, error) {
	if len(wi.sheets) == 0 {
		return nil, errors.New("the workbook has no sheets")
	}
	var se sheetEntry
	if sheet == "" {
		se = wi.sheets[0]
	} else {
		for _, s := range wi.sheets {
			if strings.EqualFold(s.name, sheet) {
				se = s
				break
			}
		}
		if se.name == "" {
			q := make([]string, len(wi.sheets))
			for i, s := range wi.sheets {
				q[i] = fmt.Sprintf("%q", s.name)
			}
			return nil, fmt.Errorf("there is no sheet %q: the workbook has %s", sheet, strings.Join(q, ", "))
		}
	}
	name := se.name
	zf := parts[strings.ToLower(se.part)]
	if zf == nil {
		return nil, fmt.Errorf("sheet %q: the workbook names its part %q, which the zip archive does not hold: the workbook is damaged", name, se.part)
	}
	var sst *sharedStrings
	if wi.sst != "" {
		if sf := parts[strings.ToLower(wi.sst)]; sf != nil {
			var err error
			if sst, err = readSharedStrings(sf, lim); err != nil {
				return nil, err
			}
		}
	}
	styles, err := readStyles(parts, wi.styles)
	if err != nil {
		return nil, err
	}
	merges, formulas, err := scanPart(zf, lim)
	if err != nil {
		return nil, fmt.Errorf("sheet %q: %w", name, err)
	}
	sr, err := newSheetReader(zf, file, name, sst, styles, lim, !formulas.disordered)
	if err != nil {
		return nil, err
	}
	src := &xlsxSource{sr: sr, sheet: name}
	src.setMerges(merges)
	rd := &Reader{sheet: name, src: src, sumRows: formulas.sumRows, hiddenCols: formulas.hiddenCols,
		d: dialect{xlsx: true, date1904: wi.date1904}}
	if err := rd.findHeader(file, opt); err != nil {
		_ = src.close()
		return nil, fmt.Errorf("sheet %q: %w", name, err)
	}
	for _, m := range merges {
		if m.r1 <= rd.headerRow && m.r2 >= rd.headerRow && (m.c2 > m.c1 || m.r2 > m.r1) {
			_ = src.close()
			return nil, fmt.Errorf("sheet %q: the header row %d has merged cells (%s): unmerge them and give every column its own title in row %d", name, rd.headerRow, m.ref, rd.headerRow)
		}
	}
	rd.header.File = file
	if note := mergeNote(merges, rd.headerRow); note != "" {
		rd.header.Problems = append(rd.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: name}, Err: errors.New(note)})
	}
	if formulas.n > 0 {
		more := ""
		if formulas.n > len(formulas.first) {
			more = ", …"
		}
		rd.header.Problems = append(rd.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: name},
			Err: fmt.Errorf("%d cells hold formulas (%s%s): the values the spreadsheet last calculated and saved were used; a formula it never calculated reads as empty",
				formulas.n, strings.Join(formulas.first, ", "), more)})
	}
	if formulas.disordered {
		rd.header.Problems = append(rd.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: name},
			Err: errors.New("the sheet's rows are not stored in order in its XML: each row and cell was placed by its reference (as a spreadsheet program shows them)")})
	}
	return rd, nil
}

// xlsxSource yields the rows of a sheet through sheetReader, with the values of merged
// cells filled down.
type xlsxSource struct {
	sr     *sheetReader
	sheet  string
	closer io.Closer

	merges []mergeRange // sorted by first row
	nextM  int          // merges[nextM:] start below the rows read
	active []activeMerge
	cells  []string // the row's cells, when a merge fills one in (reused)
}

// activeMerge is a merged range that covers rows still to come, with its value.
type activeMerge struct {
	m            mergeRange
	text, format string
}

func (s *xlsxSource) setMerges(ms []mergeRange) {
	for _, m := range ms {
		if m.r2 > m.r1 {
			s.merges = append(s.merges, m)
		}
	}
	slices.SortStableFunc(s.merges, func(a, b mergeRange) int { return a.r1 - b.r1 })
}

func (s *xlsxSource) next() (rawRow, error) {
	r, err := s.sr.read()
	if err != nil {
		return rawRow{}, err
	}
	rr := rawRow{cells: r.cells, formats: r.formats, row: r.row, hidden: r.hidden}
	if len(s.active) > 0 || s.nextM < len(s.merges) && s.merges[s.nextM].r1 <= r.row {
		s.fill(&rr)
	}
	return rr, nil
}

// fill writes the value of each merged range that covers the row below its first row
// into the row's cell in the range's first column (a spreadsheet shows it across the
// whole range; the file holds it only in the first cell).
func (s *xlsxSource) fill(rr *rawRow) {
	keep := s.active[:0]
	for _, a := range s.active {
		if a.m.r2 >= rr.row {
			keep = append(keep, a)
		}
	}
	s.active = keep
	for s.nextM < len(s.merges) && s.merges[s.nextM].r1 <= rr.row {
		m := s.merges[s.nextM]
		s.nextM++
		if m.r1 == rr.row {
			a := activeMerge{m: m}
			if m.c1 <= len(rr.cells) {
				a.text = rr.cells[m.c1-1]
				if rr.formats != nil {
					a.format = rr.formats[m.c1-1]
				}
			}
			s.active = append(s.active, a)
		}
	}
	copied := false
	for _, a := range s.active {
		if a.m.r1 == rr.row || a.text == "" {
			continue
		}
		if !copied {
			s.cells = append(s.cells[:0], rr.cells...)
			rr.cells = s.cells
			if rr.formats != nil {
				rr.formats = slices.Clone(rr.formats)
			}
			copied = true
		}
		for len(rr.cells) < a.m.c1 {
			rr.cells = append(rr.cells, "")
		}
		if rr.cells[a.m.c1-1] == "" {
			rr.cells[a.m.c1-1] = a.text
			if a.format != "" {
				if rr.formats == nil {
					rr.formats = make([]string, len(rr.cells))
				}
				for len(rr.formats) < len(rr.cells) {
					rr.formats = append(rr.formats, "")
				}
				rr.formats[a.m.c1-1] = a.format
			}
		}
		s.cells = rr.cells
	}
}

// mergeNote says which merged ranges below the header were filled down.
func mergeNote(ms []mergeRange, headerRow int) string {
	var refs []string
	n := 0
	for _, m := range ms {
		if m.r1 > headerRow && m.r2 > m.r1 {
			n++
			if len(refs) < maxListed {
				refs = append(refs, m.ref)
			}
		}
	}
	if n == 0 {
		return ""
	}
	more := ""
	if n > len(refs) {
		more = fmt.Sprintf(" and %d more", n-len(refs))
	}
	return fmt.Sprintf("%d merged cell ranges (%s%s): the value of each range's first cell was read in every row of the range, as the spreadsheet shows it", n, strings.Join(refs, ", "), more)
}

func (s *xlsxSource) close() error {
	err := s.sr.close()
	if s.closer != nil {
		if cerr := s.closer.Close(); err == nil {
			err = cerr
		}
		s.closer = nil
	}
	return err
}
