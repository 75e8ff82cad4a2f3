package main

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"io"

	"github.com/xuri/excelize/v2"
)

// rowWriter receives the header and then the rows in order; Close flushes and returns
// the first error met.
type rowWriter interface {
	Header(titles []string) error
	Row(cells []cell) error
	Close() error
}

// csvWriter writes a UTF-8 CSV register, comma-separated, CRLF line ends (what
// spreadsheet programs write).
type csvWriter struct {
	bw  *bufio.Writer
	w   *csv.Writer
	rec []string
}

func newCSVWriter(w io.Writer) *csvWriter {
	bw := bufio.NewWriterSize(w, 1<<16)
	cw := csv.NewWriter(bw)
	cw.UseCRLF = true
	return &csvWriter{bw: bw, w: cw}
}

func (c *csvWriter) Header(titles []string) error {
	if err := c.w.Write(titles); err != nil {
		return fmt.Errorf("csv header: %w", err)
	}
	return nil
}

func (c *csvWriter) Row(cells []cell) error {
	c.rec = c.rec[:0]
	for _, x := range cells {
		if x.isNum {
			c.rec = append(c.rec, formatNum(x.num))
		} else {
			c.rec = append(c.rec, x.text)
		}
	}
	if err := c.w.Write(c.rec); err != nil {
		return fmt.Errorf("csv row: %w", err)
	}
	return nil
}

func (c *csvWriter) Close() error {
	c.w.Flush()
	if err := c.w.Error(); err != nil {
		return fmt.Errorf("csv: %w", err)
	}
	if err := c.bw.Flush(); err != nil {
		return fmt.Errorf("csv: %w", err)
	}
	return nil
}

// xlsxWriter streams the register into one sheet with excelize's StreamWriter: rows in
// ascending order, Flush once at the end (shared/excelize-notes.md). The workbook is
// written to w on Close.
type xlsxWriter struct {
	out   io.Writer
	f     *excelize.File
	sw    *excelize.StreamWriter
	row   int
	vals  []any
	sheet string
}

func newXLSXWriter(w io.Writer, sheet string) (*xlsxWriter, error) {
	f := excelize.NewFile()
	if err := f.SetSheetName("Sheet1", sheet); err != nil {
		_ = f.Close()
		return nil, fmt.Errorf("xlsx: %w", err)
	}
	// the stream writer leaves <dimension ref="A1"/> otherwise (excelize-notes.md)
	if err := f.SetSheetDimension(sheet, ""); err != nil {
		_ = f.Close()
		return nil, fmt.Errorf("xlsx: %w", err)
	}
	sw, err := f.NewStreamWriter(sheet)
	if err != nil {
		_ = f.Close()
		return nil, fmt.Errorf("xlsx: %w", err)
	}
	return &xlsxWriter{out: w, f: f, sw: sw, sheet: sheet}, nil
}

func (x *xlsxWriter) Header(titles []string) error {
	if err := x.sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft"}); err != nil {
		return fmt.Errorf("xlsx panes: %w", err)
	}
	vals := make([]any, len(titles))
	for i, t := range titles {
		vals[i] = t
	}
	return x.set(vals)
}

func (x *xlsxWriter) Row(cells []cell) error {
	x.vals = x.vals[:0]
	for _, c := range cells {
		switch {
		case c.isNum:
			x.vals = append(x.vals, c.num)
		case c.text == "":
			x.vals = append(x.vals, nil)
		default:
			x.vals = append(x.vals, c.text)
		}
	}
	return x.set(x.vals)
}

func (x *xlsxWriter) set(vals []any) error {
	x.row++
	ref, err := excelize.CoordinatesToCellName(1, x.row)
	if err != nil {
		return fmt.Errorf("xlsx row %d: %w", x.row, err)
	}
	if err := x.sw.SetRow(ref, vals); err != nil {
		return fmt.Errorf("xlsx row %d: %w", x.row, err)
	}
	return nil
}

func (x *xlsxWriter) Close() error {
	defer x.f.Close()
	if err := x.sw.Flush(); err != nil {
		return fmt.Errorf("xlsx flush: %w", err)
	}
	if _, err := x.f.WriteTo(x.out); err != nil {
		return fmt.Errorf("xlsx write: %w", err)
	}
	return nil
}
