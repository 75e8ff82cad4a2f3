package register

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"golang.org/x/text/encoding/charmap"
	"golang.org/x/text/encoding/unicode"
	"golang.org/x/text/transform"

	"hoistfleet/fleet"
)

// peekSize is how much of a CSV file is looked at to find its encoding and separator.
const peekSize = 64 << 10

// NewCSV reads a CSV register from r; name is the file name for messages ("-" or ""
// for standard input) and, by its base name, the sheet name in cell references
// ("hoists.csv!F14").
//
// Dialects: comma or semicolon separator, whichever is more frequent in the header line
// outside quotes; with semicolons, a decimal comma ("12,5"); UTF-8 with or without a
// byte-order mark, UTF-16 LE or BE with a byte-order mark, and Windows-1252 (a field
// that is not valid UTF-8 is decoded as Windows-1252). Quoting follows RFC 4180
// (encoding/csv, LazyQuotes off): a record that breaks it is still returned, with the
// fields read before the fault and the rest Bad.
//
// Row numbers are spreadsheet rows, as a spreadsheet program opening the file shows them:
// the header is row 1, each record is one row (a quoted field may span several lines),
// and blank lines between records count as empty rows.
func NewCSV(r io.Reader, name string) (*Reader, error) {
	return NewCSVOptions(r, name, Options{})
}

// NewCSVOptions is NewCSV with Options.
func NewCSVOptions(r io.Reader, name string, opt Options) (*Reader, error) {
	file := displayName(name)
	text, sep, notes, err := csvStream(r)
	if err != nil {
		return nil, fileError(file, err)
	}
	cr := newRecords(text, byte(sep))
	rd := &Reader{sheet: file, d: dialect{decimalComma: sep == ';'}, src: &csvSource{r: cr}}
	if err := rd.findHeader(file, opt); err != nil {
		return nil, fileError(file, err)
	}
	for _, n := range notes {
		rd.header.Problems = append(rd.header.Problems, &fleet.Error{Kind: fleet.Other, Cell: fleet.CellRef{Sheet: file}, Err: errors.New(n)})
	}
	return rd, nil
}

// displayName is the base name used for messages and cell references.
func displayName(name string) string {
	if name == "" || name == "-" {
		return "stdin"
	}
	return filepath.Base(name)
}

// fileError is an error about the whole file, naming it.
func fileError(file string, err error) error {
	return &fleet.Error{Kind: fleet.IO, Err: fmt.Errorf("%s: %w", file, err)}
}

// csvStream finds the encoding and the separator and returns the text as UTF-8 (except
// Windows-1252 fields, which decodeFields converts), and what it noted about the file.
//
// Line ends: LF, CRLF, or CR alone (the classic Mac OS line end, which some programs
// still write): a file whose first line ends in a lone CR has every lone CR read as a
// line break, and the notes say so. An Excel separator hint on the first line ("sep=;"
// or "sep=,") sets the separator and is not a row (as Excel shows the file). A NUL
// byte anywhere in the text refuses the file, naming its line.
func csvStream(r io.Reader) (*bufio.Reader, rune, []string, error) {
	br := bufio.NewReaderSize(r, peekSize)
	head, err := br.Peek(4)
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		return nil, 0, nil, err
	}
	var dec io.Reader
	switch {
	case bytes.HasPrefix(head, []byte{0xEF, 0xBB, 0xBF}):
		_, _ = br.Discard(3)
		dec = br
	case bytes.HasPrefix(head, []byte{0xFF, 0xFE}):
		dec = transform.NewReader(br, unicode.UTF16(unicode.LittleEndian, unicode.ExpectBOM).NewDecoder())
	case bytes.HasPrefix(head, []byte{0xFE, 0xFF}):
		dec = transform.NewReader(br, unicode.UTF16(unicode.BigEndian, unicode.ExpectBOM).NewDecoder())
	case bytes.HasPrefix(head, []byte("PK\x03\x04")):
		return nil, 0, nil, errors.New("this is a zip file (an XLSX workbook?), not a CSV file: read it as XLSX")
	case bytes.HasPrefix(head, oleMagic[:4]):
		return nil, 0, nil, errors.New("this is a binary Office file (.xls?), not a CSV file: save it as CSV UTF-8 or XLSX")
	default:
		dec = br
	}
	pk := bufio.NewReaderSize(dec, peekSize)
	peek, err := pk.Peek(peekSize)
	if err != nil && err != io.EOF && err != bufio.ErrBufferFull {
		return nil, 0, nil, err
	}
	if bytes.IndexByte(peek, 0) >= 0 {
		return nil, 0, nil, errors.New("the file holds NUL bytes: it is not a text CSV file (UTF-16 without a byte-order mark?): save it as CSV UTF-8")
	}
	var notes []string
	f := &textFilter{r: pk, line: 1}
	if i := bytes.IndexAny(peek, "\r\n"); i >= 0 && peek[i] == '\r' && (i+1 == len(peek) || peek[i+1] != '\n') {
		f.cr = true
		notes = append(notes, "the file's lines end in a carriage return alone (CR, the classic Mac OS line end): each is read as a line break")
	}
	sep, hinted, hintLen, err := sepHint(peek)
	if err != nil {
		return nil, 0, nil, err
	}
	if hinted {
		_, _ = pk.Discard(hintLen)
		f.line = 2
		notes = append(notes, fmt.Sprintf("the first line %q is Excel's separator hint: the separator is %q; the line is not a row", strings.TrimRight(string(peek[:hintLen]), "\r\n"), string(sep)))
	} else {
		sep = detectSeparator(peek)
	}
	return bufio.NewReaderSize(f, peekSize), sep, notes, nil
}

// sepHint reads Excel's separator hint, a first line "sep=X" (also quoted), and returns
// the separator and the length of the line with its line end. A separator this reader
// does not read is an error.
func sepHint(peek []byte) (sep rune, ok bool, n int, err error) {
	end := bytes.IndexAny(peek, "\r\n")
	if end < 0 {
		end = len(peek)
	}
	line := strings.Trim(strings.TrimSpace(string(peek[:end])), `"`)
	if len(line) < 4 || !strings.EqualFold(line[:4], "sep=") {
		return 0, false, 0, nil
	}
	n = end
	if n < len(peek) && peek[n] == '\r' {
		n++
	}
	if n < len(peek) && peek[n] == '\n' {
		n++
	}
	switch v := line[4:]; v {
	case ",", ";":
		return rune(v[0]), true, n, nil
	default:
		return 0, false, 0, fmt.Errorf("line 1: %q asks for the separator %q; this reader reads comma- or semicolon-separated files: save the file as CSV with commas or semicolons", line, v)
	}
}

// textFilter passes the decoded text through: it refuses a NUL byte, naming its line,
// and with cr makes each lone CR a line break (a CR LF stays as it is).
type textFilter struct {
	r      io.Reader
	cr     bool
	line   int  // the line being read, for the message
	lastCR bool // cr: the previous byte was a CR turned into LF
	err    error
}

func (f *textFilter) Read(b []byte) (int, error) {
	if f.err != nil {
		return 0, f.err
	}
	n, err := f.r.Read(b)
	p := b[:n]
	if i := bytes.IndexByte(p, 0); i >= 0 {
		line := f.line + bytes.Count(p[:i], []byte{'\n'})
		if f.cr {
			line += bytes.Count(p[:i], []byte{'\r'})
		}
		f.err = fmt.Errorf("line %d: a NUL byte: not a text CSV file (part binary, or damaged): refused", line)
		return 0, f.err
	}
	if f.cr {
		out := p[:0]
		for _, c := range p {
			switch {
			case c == '\r':
				out = append(out, '\n')
				f.lastCR = true
				f.line++
				continue
			case c == '\n' && f.lastCR:
				f.lastCR = false
				continue
			}
			f.lastCR = false
			out = append(out, c)
		}
		return len(out), err
	}
	f.line += bytes.Count(p, []byte{'\n'})
	return n, err
}

// detectSeparator counts commas and semicolons outside double quotes on the first line
// (the header); semicolons win only when they are more frequent.
func detectSeparator(b []byte) rune {
	commas, semis, quoted := 0, 0, false
	for _, c := range b {
		switch {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == '\n':
			if commas+semis > 0 {
				return pick(commas, semis)
			}
		case c == ',':
			commas++
		case c == ';':
			semis++
		}
	}
	return pick(commas, semis)
}

func pick(commas, semis int) rune {
	if semis > commas {
		return ';'
	}
	return ','
}

// decodeFields decodes, in place, every field that is not valid UTF-8 as Windows-1252.
func decodeFields(rec []string) []string {
	for i, f := range rec {
		if !utf8.ValidString(f) {
			if s, err := charmap.Windows1252.NewDecoder().String(f); err == nil {
				rec[i] = s
			}
		}
	}
	return rec
}

// csvSyntaxError is a record encoding/csv cannot read.
type csvSyntaxError struct{ pe *csv.ParseError }

func (e *csvSyntaxError) message() string {
	hint := ""
	switch {
	case errors.Is(e.pe.Err, csv.ErrBareQuote):
		hint = `: a field holding a double quote must itself be quoted, with the quote doubled ("24"" drum")`
	case errors.Is(e.pe.Err, csv.ErrQuote):
		hint = ": a quoted field must end with a double quote followed by the separator or the end of the line"
	}
	return fmt.Sprintf("CSV syntax error at line %d, column %d: %v%s", e.pe.Line, e.pe.Column, e.pe.Err, hint)
}

// csvSource yields the records after the header.
type csvSource struct {
	r        *records
	n        int // fields in the header
	row      int // spreadsheet row of the last record returned
	lastLine int // file line on which the last record ended
}

// recordEndLine is the file line on which the record just read ends: the line its last
// field starts on, plus the line breaks inside that (quoted) field.
func recordEndLine(r *records, rec []string) int {
	if len(rec) == 0 {
		return 0
	}
	return r.fieldLine(len(rec)-1) + strings.Count(rec[len(rec)-1], "\n")
}

func (s *csvSource) next() (rawRow, error) {
	rec, err := s.r.read()
	if err == io.EOF {
		return rawRow{}, io.EOF
	}
	var pe *csv.ParseError
	if err != nil && !errors.As(err, &pe) {
		return rawRow{}, err
	}
	// The record's fields are substrings of one string per record, so the cells the
	// Asset keeps cost no copy; the slice itself is the source's, reused.
	if !s.r.valid {
		decodeFields(rec)
	}
	rr := rawRow{cells: rec, short: true}
	var start, end int
	if pe != nil {
		rr.syntax = &csvSyntaxError{pe}
		start, end = pe.StartLine, pe.Line
	} else {
		start = s.r.fieldLine(0)
		end = recordEndLine(s.r, rec)
	}
	// Blank lines between records (encoding/csv skips them) are empty spreadsheet rows.
	blanks := max(start-s.lastLine-1, 0)
	s.row += 1 + blanks
	s.lastLine = end
	rr.row = s.row
	return rr, nil
}

func (s *csvSource) close() error { return nil }
