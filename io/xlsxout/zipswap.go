package xlsxout

import (
	"archive/zip"
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path"
	"regexp"
	"sort"
	"strings"

	"github.com/xuri/excelize/v2"
)

// swapZip is the zip writer handed to excelize (File.SetZipWriter): every part goes to
// zw as excelize writes it, except the placeholder parts of the streamed sheets, for
// which the spooled entries, compressed already, are copied in instead (CreateRaw) and
// excelize's placeholder bytes are dropped.
//
// Which part is which sheet is read, at the first Create, from the workbook and its
// relationships exactly as they go into the file: excelize serialises every part into
// File.Pkg before it writes the first one.
//
// What it beats: File.Write, which assembles the whole zip in a bytes.Buffer before
// writing it (a million-hoist workbook is gigabytes). With the part writer (sheetxml.go)
// the whole workbook of BenchmarkXLSXWrite (10 000 hoists) allocates 33 MB, against
// 312 MB for BenchmarkFloorStreamWrite's StreamWriter sheets written with File.Write
// (2026-12-05), and the streamed sheets are never held in memory whole.
type swapZip struct {
	zw     *zip.Writer
	read   func(name string) ([]byte, bool) // a part as excelize will write it
	sheets map[string]*spool                // the streamed sheets, by sheet name
	parts  map[string]*spool                // the same by part name, once resolved
}

var _ excelize.ZipWriter = (*swapZip)(nil)

// Create starts the part name, or writes a streamed sheet's entry in its place.
func (z *swapZip) Create(name string) (io.Writer, error) {
	if z.parts == nil {
		if err := z.resolve(); err != nil {
			return nil, err
		}
	}
	if sp, ok := z.parts[name]; ok {
		delete(z.parts, name)
		if err := sp.copyTo(z.zw, name); err != nil {
			return nil, err
		}
		return io.Discard, nil
	}
	if name == contentTypesPart {
		if b, ok := z.read(name); ok {
			w, err := z.zw.Create(name)
			if err != nil {
				return nil, err
			}
			if _, err := w.Write(sortedContentTypes(b)); err != nil {
				return nil, err
			}
			return io.Discard, nil
		}
	}
	return z.zw.Create(name)
}

const contentTypesPart = "[Content_Types].xml"

var contentTypeElem = regexp.MustCompile(`<(Default|Override)\b[^>]*?(/>|>\s*</(Default|Override)>)`)

// sortedContentTypes is the content-types part (OPC, ECMA-376 Part 2 §10.1.2) with its
// Default and Override elements in a fixed order (Defaults first, each kind sorted):
// excelize lists the image extensions' Defaults from a Go map, in a different order on
// each run (issue 16: two identical runs gave different workbooks). The order of the
// elements carries no meaning. A part that is not as expected is returned as it is.
func sortedContentTypes(b []byte) []byte {
	locs := contentTypeElem.FindAllIndex(b, -1)
	if len(locs) == 0 {
		return b
	}
	var defaults, overrides []string
	for i, l := range locs {
		if i > 0 && strings.TrimSpace(string(b[locs[i-1][1]:l[0]])) != "" {
			return b // something else between the elements
		}
		e := string(b[l[0]:l[1]])
		if strings.HasPrefix(e, "<Default") {
			defaults = append(defaults, e)
		} else {
			overrides = append(overrides, e)
		}
	}
	sort.Strings(defaults)
	sort.Strings(overrides)
	var out bytes.Buffer
	out.Write(b[:locs[0][0]])
	for _, e := range append(defaults, overrides...) {
		out.WriteString(e)
	}
	out.Write(b[locs[len(locs)-1][1]:])
	return out.Bytes()
}

func (z *swapZip) resolve() error {
	m, err := sheetParts(z.read)
	if err != nil {
		return err
	}
	z.parts = map[string]*spool{}
	for sheet, sp := range z.sheets {
		p, ok := m[sheet]
		if !ok {
			return fmt.Errorf("sheet %q has no part in the workbook", sheet)
		}
		z.parts[p] = sp
	}
	return nil
}

// AddFS adds the files of fsys.
func (z *swapZip) AddFS(fsys fs.FS) error { return z.zw.AddFS(fsys) }

// Close finishes the zip; it fails if a streamed sheet's part was never written.
func (z *swapZip) Close() error {
	var missing []string
	for p := range z.parts {
		missing = append(missing, p)
	}
	sort.Strings(missing)
	var err error
	if len(missing) > 0 {
		err = fmt.Errorf("streamed parts never written: %s", strings.Join(missing, ", "))
	}
	return errors.Join(err, z.zw.Close())
}

// opcRels is a relationships part (OPC, ECMA-376 Part 2 §9.3).
type opcRels struct {
	Rels []struct {
		ID     string `xml:"Id,attr"`
		Type   string `xml:"Type,attr"`
		Target string `xml:"Target,attr"`
	} `xml:"Relationship"`
}

// workbookSheets is the sheet list of a workbook part.
type workbookSheets struct {
	Sheets []struct {
		Name  string     `xml:"name,attr"`
		Attrs []xml.Attr `xml:",any,attr"` // r:id among them
	} `xml:"sheets>sheet"`
}

// sheetParts maps every sheet's name to its worksheet part, the way a reader finds it:
// the package relationships (_rels/.rels) name the workbook part, the workbook lists
// its sheets with relationship ids, and the workbook's relationships give their targets.
func sheetParts(read func(name string) ([]byte, bool)) (map[string]string, error) {
	var root opcRels
	if err := readXML(read, "_rels/.rels", &root); err != nil {
		return nil, err
	}
	wbPath := ""
	for _, r := range root.Rels {
		if strings.HasSuffix(r.Type, "/officeDocument") {
			wbPath = strings.TrimPrefix(r.Target, "/")
		}
	}
	if wbPath == "" {
		return nil, errors.New("_rels/.rels: no workbook")
	}
	var wb workbookSheets
	if err := readXML(read, wbPath, &wb); err != nil {
		return nil, err
	}
	var rels opcRels
	if err := readXML(read, path.Join(path.Dir(wbPath), "_rels", path.Base(wbPath)+".rels"), &rels); err != nil {
		return nil, err
	}
	targets := map[string]string{}
	for _, r := range rels.Rels {
		t := path.Join(path.Dir(wbPath), r.Target)
		if strings.HasPrefix(r.Target, "/") {
			t = strings.TrimPrefix(r.Target, "/")
		}
		targets[r.ID] = t
	}
	out := map[string]string{}
	for _, s := range wb.Sheets {
		for _, a := range s.Attrs {
			if a.Name.Local == "id" && a.Name.Space != "" {
				if t, ok := targets[a.Value]; ok {
					out[s.Name] = t
				}
			}
		}
	}
	return out, nil
}

func readXML(read func(string) ([]byte, bool), name string, v any) error {
	b, ok := read(name)
	if !ok {
		return fmt.Errorf("no part %s", name)
	}
	if err := xml.NewDecoder(bytes.NewReader(b)).Decode(v); err != nil {
		return fmt.Errorf("%s: %w", name, err)
	}
	return nil
}
