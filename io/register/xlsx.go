package register

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/xuri/excelize/v2"

	"hoistfleet/fleet"
)

// Limits bound what an XLSX workbook may unzip to, so that a zip bomb or an outsized
// shared-strings table is refused with a message instead of exhausting memory or disk.
type Limits struct {
	MaxUnzipped      int64 // all parts of the workbook, uncompressed
	MaxSharedStrings int64 // the shared-strings table, uncompressed
	MaxXMLInMemory   int64 // a larger worksheet or shared-strings part is unzipped to a temporary file
}

// DefaultLimits allow registers of a few million rows.
var DefaultLimits = Limits{MaxUnzipped: 2 << 30, MaxSharedStrings: 256 << 20, MaxXMLInMemory: 16 << 20}

// oleMagic starts an OLE2 compound file: an encrypted (password-protected) OOXML
// workbook, or a legacy binary .xls.
var oleMagic = []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}

// NewXLSX reads the register on a sheet of an XLSX workbook; sheet "" is the first
// sheet. name is the file name for messages. It uses DefaultLimits.
//
// Cells are read raw (excelize's RawCellValue), as stored and not as displayed: a
// number shown as "12.3" but stored as 12.3456 is read as 12.3456; a formula gives the
// value last calculated by the spreadsheet program; a date column's date cells arrive as
// date serials and are converted with the workbook's date system (1900 or 1904). Hidden
// rows and columns are read like the others. Empty rows after the last non-empty row are
// dropped; empty rows between data rows are returned, Blank. Merged cells in the header
// row are an error; merged cells below it are reported in the rows they hide.
//
// Close must be called: excelize may keep large sheets in temporary files.
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
	b, err := io.ReadAll(io.LimitReader(r, lim.MaxUnzipped+1))
	if err != nil {
		return nil, fileError(file, err)
	}
	if err := sniffXLSX(b, lim); err != nil {
		return nil, fileError(file, err)
	}
	return openWorkbook(bytes.NewReader(b), int64(len(b)), file, sheet, lim, opt,
		func(o excelize.Options) (*excelize.File, error) { return excelize.OpenReader(bytes.NewReader(b), o) })
}

// openWorkbook checks the zip's parts against the limits, opens the workbook with open
// and the register sheet in it. ra and size give the zip for the checks and the scan of
// the sheet's merged and formula cells.
func openWorkbook(ra io.ReaderAt, size int64, file, sheet string, lim Limits, opt Options,
	open func(excelize.Options) (*excelize.File, error)) (*Reader, error) {
	zr, err := zip.NewReader(ra, size)
	if err != nil {
		return nil, fileError(file, fmt.Errorf("not a readable XLSX workbook (truncated, or another kind of file): %w", err))
	}
	if err := checkParts(zr, lim); err != nil {
		return nil, fileError(file, err)
	}
	f, err := open(excelize.Options{
		RawCellValue: true, UnzipSizeLimit: lim.MaxUnzipped, UnzipXMLSizeLimit: min(lim.MaxXMLInMemory, lim.MaxUnzipped)})
	if err != nil {
		if f != nil {
			_ = f.Close()
		}
		return nil, fileError(file, fmt.Errorf("not a readable XLSX workbook: %w", err))
	}
	rd, err := openSheet(f, zr, file, sheet, opt)
	if err != nil {
		_ = f.Close()
		return nil, fileError(file, err)
	}
	return rd, nil
}

// NewXLSXFile is NewXLSX for a workbook on disk. excelize then reads the zip through the
// file (random access) instead of from a copy of the whole file in memory, which for a
// register of a million rows saves hundreds of megabytes. The file is opened read-only and
// closed before NewXLSXFile returns; what is not a zip archive gets NewXLSX's diagnosis.
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
	defer fh.Close()
	fi, err := fh.Stat()
	if err != nil {
		return nil, fileError(file, err)
	}
	head := make([]byte, 4)
	n, _ := io.ReadFull(fh, head)
	if !bytes.HasPrefix(head[:n], []byte("PK")) || fi.Size() > lim.MaxUnzipped {
		if _, err := fh.Seek(0, io.SeekStart); err != nil {
			return nil, fileError(file, err)
		}
		return newXLSX(fh, path, sheet, lim, opt)
	}
	return openWorkbook(fh, fi.Size(), file, sheet, lim, opt,
		func(o excelize.Options) (*excelize.File, error) { return excelize.OpenFile(path, o) })
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
// the zip directory declares (archive/zip refuses a part that inflates beyond its
// declared size).
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
func openSheet(f *excelize.File, zr *zip.Reader, file, sheet string, opt Options) (*Reader, error) {
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return nil, errors.New("the workbook has no sheets")
	}
	name := ""
	if sheet == "" {
		name = sheets[0]
	} else {
		for _, s := range sheets {
			if strings.EqualFold(s, sheet) {
				name = s
				break
			}
		}
		if name == "" {
			q := make([]string, len(sheets))
			for i, s := range sheets {
				q[i] = fmt.Sprintf("%q", s)
			}
			return nil, fmt.Errorf("there is no sheet %q: the workbook has %s", sheet, strings.Join(q, ", "))
		}
	}
	props, err := f.GetWorkbookProps()
	if err != nil {
		return nil, fmt.Errorf("workbook properties: %w", err)
	}
	merges, formulas, err := scanSheet(zr, name, func(part string) []byte {
		// excelize holds the parts it unzipped in memory under their zip names (with
		// "/" separators); a sheet larger than its unzip limit is in a temporary file.
		v, _ := f.Pkg.Load(strings.ReplaceAll(part, `\`, "/"))
		b, _ := v.([]byte)
		return b
	})
	if err != nil {
		return nil, fmt.Errorf("sheet %q: %w", name, err)
	}
	rows, err := f.Rows(name)
	if err != nil {
		return nil, fmt.Errorf("sheet %q: %w", name, err)
	}
	src := &xlsxSource{f: f, rows: rows, sheet: name, merges: merges}
	rd := &Reader{sheet: name, src: src, sumRows: formulas.sumRows, hiddenCols: formulas.hiddenCols,
		d: dialect{xlsx: true, date1904: props.Date1904 != nil && *props.Date1904}}
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
	if formulas.n > 0 {
		more := ""
		if formulas.n > len(formulas.first) {
			more = ", …"
		}
		rd.header.Problems = append(rd.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: name},
			Err: fmt.Errorf("%d cells hold formulas (%s%s): the values the spreadsheet last calculated and saved were used; a formula it never calculated reads as empty",
				formulas.n, strings.Join(formulas.first, ", "), more)})
	}
	return rd, nil
}

// xlsxSource yields the rows of a sheet through excelize's streaming row iterator.
type xlsxSource struct {
	f      *excelize.File
	rows   *excelize.Rows
	sheet  string
	row    int // rows seen: Rows.Next yields every row number, including absent rows
	merges []mergeRange
}

func (s *xlsxSource) read() ([]string, int, error) {
	if !s.rows.Next() {
		if err := s.rows.Error(); err != nil {
			return nil, 0, fmt.Errorf("sheet %q after row %d: %w", s.sheet, s.row, err)
		}
		return nil, 0, io.EOF
	}
	s.row++
	cells, err := s.rows.Columns()
	if err != nil {
		return nil, 0, fmt.Errorf("sheet %q row %d: %w", s.sheet, s.row, err)
	}
	return cells, s.row, nil
}

func (s *xlsxSource) next() (rawRow, error) {
	cells, row, err := s.read()
	if err != nil {
		return rawRow{}, err
	}
	rr := rawRow{cells: cells, row: row, hidden: s.rows.GetRowOpts().Hidden}
	for _, m := range s.merges {
		if row > m.r1 && row <= m.r2 {
			rr.merged = append(rr.merged, &fleet.Error{Kind: fleet.Shape,
				Cell: fleet.CellRef{Sheet: s.sheet, Row: row, Col: m.c1},
				Err:  fmt.Errorf("the cells are merged (%s): only row %d holds the value; unmerge them and fill every row", m.ref, m.r1)})
		}
	}
	return rr, nil
}

func (s *xlsxSource) close() error {
	err := s.rows.Close()
	if cerr := s.f.Close(); err == nil {
		err = cerr
	}
	return err
}
