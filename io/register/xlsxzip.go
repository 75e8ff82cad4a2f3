package register

import (
	"archive/zip"
	"errors"
	"fmt"
	"hash"
	"hash/crc32"
	"io"
	"strings"
)

// zipParts indexes a workbook's zip entries by name, compared without case (OPC part
// names are case-insensitive), refusing two entries of the same name: which one a
// program reads is then anyone's guess (one reader took the first, another the last).
func zipParts(zr *zip.Reader) (map[string]*zip.File, error) {
	parts := make(map[string]*zip.File, len(zr.File))
	for _, zf := range zr.File {
		key := strings.ToLower(strings.TrimPrefix(zf.Name, "/"))
		if prev, ok := parts[key]; ok {
			return nil, fmt.Errorf("the zip archive holds two entries named %q (and %q): a damaged or tampered workbook; open it in the spreadsheet program and save a new copy", zf.Name, prev.Name)
		}
		parts[key] = zf
	}
	return parts, nil
}

// checkedPart reads a zip entry and checks, at its end, that it gave exactly the size
// its directory entry declares and the CRC-32 it declares. archive/zip checks both only
// when an entry is read to its end, and skips the CRC when the declared one is 0; this
// reader computes it itself and Close reads what the caller left unread, so that no
// entry we read is used unchecked.
type checkedPart struct {
	zf   *zip.File
	rc   io.ReadCloser
	crc  hash.Hash32
	n    uint64
	done bool
	err  error
}

// errPartCorrupt is wrapped by the errors of checkedPart.
var errPartCorrupt = errors.New("corrupt zip entry")

func openChecked(zf *zip.File) (*checkedPart, error) {
	rc, err := zf.Open()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", zf.Name, err)
	}
	return &checkedPart{zf: zf, rc: rc, crc: crc32.NewIEEE()}, nil
}

func (p *checkedPart) Read(b []byte) (int, error) {
	if p.err != nil {
		return 0, p.err
	}
	n, err := p.rc.Read(b)
	p.n += uint64(n)
	_, _ = p.crc.Write(b[:n])
	if p.n > p.zf.UncompressedSize64 {
		p.err = fmt.Errorf("%s: %w: it unzips to more than the %d bytes its directory entry declares", p.zf.Name, errPartCorrupt, p.zf.UncompressedSize64)
		return n, p.err
	}
	if err == io.EOF {
		p.done = true
		if e := p.verify(); e != nil {
			p.err = e
			return n, e
		}
		return n, io.EOF
	}
	if err != nil {
		p.err = p.describe(err)
		return n, p.err
	}
	return n, nil
}

// describe says what archive/zip's error means for the user.
func (p *checkedPart) describe(err error) error {
	switch {
	case errors.Is(err, zip.ErrChecksum):
		return fmt.Errorf("%s: %w: its content does not match its CRC-32 checksum", p.zf.Name, errPartCorrupt)
	case errors.Is(err, io.ErrUnexpectedEOF):
		return fmt.Errorf("%s: %w: it unzips to fewer bytes than the %d its directory entry declares", p.zf.Name, errPartCorrupt, p.zf.UncompressedSize64)
	case errors.Is(err, zip.ErrFormat):
		return fmt.Errorf("%s: %w: it unzips to more than the %d bytes its directory entry declares, or its compressed data is damaged", p.zf.Name, errPartCorrupt, p.zf.UncompressedSize64)
	}
	return fmt.Errorf("%s: %w", p.zf.Name, err)
}

func (p *checkedPart) verify() error {
	if p.n != p.zf.UncompressedSize64 {
		return fmt.Errorf("%s: %w: it unzips to %d bytes, not the %d its directory entry declares", p.zf.Name, errPartCorrupt, p.n, p.zf.UncompressedSize64)
	}
	if got := p.crc.Sum32(); got != p.zf.CRC32 {
		return fmt.Errorf("%s: %w: its content does not match its CRC-32 checksum (%08x, declared %08x)", p.zf.Name, errPartCorrupt, got, p.zf.CRC32)
	}
	return nil
}

// finish reads what is left of the entry (after the end of the XML, nothing but
// whitespace is expected) and returns the integrity error, if any.
func (p *checkedPart) finish() error {
	if p.err != nil {
		return p.err
	}
	if !p.done {
		if _, err := io.Copy(io.Discard, p); err != nil {
			return err
		}
	}
	return p.err
}

// Close closes the entry without checking it; call finish first.
func (p *checkedPart) Close() error { return p.rc.Close() }

// readChecked reads a whole (small) part, checked, refusing more than limit bytes.
func readChecked(zf *zip.File, limit int64) ([]byte, error) {
	if zf.UncompressedSize64 > uint64(limit) {
		return nil, fmt.Errorf("%s unzips to %s, more than the %s limit", zf.Name, size(int64(min(zf.UncompressedSize64, 1<<62))), size(limit))
	}
	p, err := openChecked(zf)
	if err != nil {
		return nil, err
	}
	defer p.Close()
	b, err := io.ReadAll(p)
	if err != nil {
		return nil, err
	}
	return b, p.finish()
}
