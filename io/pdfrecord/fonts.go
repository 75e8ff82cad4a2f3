package pdfrecord

import (
	"fmt"

	"codeberg.org/go-fonts/dejavu/dejavusans"
	"codeberg.org/go-fonts/dejavu/dejavusansbold"
	"codeberg.org/go-fonts/dejavu/dejavusansmono"
	"golang.org/x/image/font/sfnt"
)

// The record's fonts are DejaVu Sans, Sans Bold and Sans Mono, from the Go module
// codeberg.org/go-fonts/dejavu (Bitstream Vera licence, DejaVu's changes in the public
// domain: redistribution permitted). PDF's core fonts are Latin-1 only and the record is
// not (η, ², ≤, ×, →, −, √, ⌊ ⌋): the fonts are embedded in the PDF, subset to the
// characters used.
var (
	sansTTF     = dejavusans.TTF
	sansBoldTTF = dejavusansbold.TTF
	monoTTF     = dejavusansmono.TTF
)

// face is one embedded font: its fpdf family and style, and its character map, to tell
// whether a character can be printed at all.
type face struct {
	family, style string
	font          *sfnt.Font
	buf           sfnt.Buffer
	known         map[rune]bool
}

func newFace(family, style string, ttf []byte) (*face, error) {
	f, err := sfnt.Parse(ttf)
	if err != nil {
		return nil, fmt.Errorf("pdfrecord: font %s %s: %w", family, style, err)
	}
	return &face{family: family, style: style, font: f, known: map[rune]bool{}}, nil
}

// missing returns the first character of s that the font has no glyph for, and false
// when it has them all. Control characters other than a tab or a line break count as
// missing: they print as nothing.
func (f *face) missing(s string) (rune, bool) {
	for _, r := range s {
		if r == '\n' || r == '\t' {
			continue
		}
		ok, seen := f.known[r]
		if !seen {
			gi, err := f.font.GlyphIndex(&f.buf, r)
			ok = err == nil && gi != 0 && r >= ' '
			f.known[r] = ok
		}
		if !ok {
			return r, true
		}
	}
	return 0, false
}
