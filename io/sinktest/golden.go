package sinktest

import (
	"bufio"
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/hex"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing"
)

// Golden outputs. A writer's golden output for a test case is the bytes it must write,
// kept in the testing package's testdata/golden: the whole output, gzipped, in a file
// named after the case when that file is at most GoldenWholeMax bytes; otherwise only its
// length and SHA-256, one line of testdata/golden/SHA256SUMS ("digest length case"), so
// that a large output costs the repository 80 bytes. A case is the test's name, and a
// part name when one test compares several outputs.
//
// The golden outputs were first written by the writers' previous implementations (their
// verbatim copies were the oracles of the differential tests); the commit that made the
// goldens names the commit where those copies can still be read. When an output changes
// on purpose (a new check changes the results of the demo registers, say), rewrite the
// goldens with
//
//	go test ./io/csvout ./io/jsonout ./io/xlsxout -update-golden
//
// and read the diff of testdata/golden before committing it.

// GoldenWholeMax is the largest gzipped golden output kept whole: the outputs of the
// hand-made cases are kept whole, those of random results and of registers by digest.
const GoldenWholeMax = 8 << 10

var updateGolden = flag.Bool("update-golden", false, "rewrite the writers' golden outputs in testdata/golden from the current writers")

const goldenDir = "testdata/golden"

var (
	goldenMu   sync.Mutex
	goldenSums map[string]goldenSum // case → length and digest, read once from SHA256SUMS
)

type goldenSum struct {
	n      int
	digest string
}

// Golden fails the test unless got is the golden output of the running test, part name
// ("" for the test's only output).
func Golden(t testing.TB, name string, got []byte) {
	t.Helper()
	key := t.Name()
	if name != "" {
		key += "/" + strings.ReplaceAll(name, " ", "_") // as t.Run does: SHA256SUMS splits at spaces
	}
	whole := filepath.Join(goldenDir, goldenFile(key))
	if *updateGolden {
		updateGoldenOutput(t, key, whole, got)
		return
	}
	if b, err := os.ReadFile(whole); err == nil {
		want, err := gunzip(b)
		if err != nil {
			t.Fatalf("%s: %v", whole, err)
		}
		SameBytes(t, got, want)
		return
	}
	sum, ok := goldenSumOf(t, key)
	if !ok {
		t.Fatalf("no golden output for %s (neither %s nor a line of %s); write it with -update-golden", key, whole, filepath.Join(goldenDir, "SHA256SUMS"))
	}
	if d := digest(got); d != sum.digest || len(got) != sum.n {
		path := keepOutput(key, got)
		t.Fatalf("%s: the output (%d bytes, sha256 %s) is not the golden output (%d bytes, sha256 %s); it is in %s",
			key, len(got), d, sum.n, sum.digest, path)
	}
}

// goldenFile is the file of a case's whole output: the case's name with / as a directory
// separator and every byte but letters, digits and . , = - _ written %XX.
func goldenFile(key string) string {
	var b strings.Builder
	for i := 0; i < len(key); i++ {
		c := key[i]
		switch {
		case c == '/':
			b.WriteByte(filepath.Separator)
		case 'a' <= c && c <= 'z', 'A' <= c && c <= 'Z', '0' <= c && c <= '9', c == '.', c == ',', c == '=', c == '-', c == '_':
			b.WriteByte(c)
		default:
			fmt.Fprintf(&b, "%%%02X", c)
		}
	}
	return b.String() + ".gz"
}

func digest(b []byte) string {
	d := sha256.Sum256(b)
	return hex.EncodeToString(d[:])
}

func gunzip(b []byte) ([]byte, error) {
	zr, err := gzip.NewReader(bytes.NewReader(b))
	if err != nil {
		return nil, err
	}
	return io.ReadAll(zr)
}

func gzipped(b []byte) []byte {
	var buf bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&buf, gzip.BestCompression)
	_, _ = zw.Write(b)
	_ = zw.Close()
	return buf.Bytes()
}

// keepOutput writes an output that differs from its golden digest to a temporary file,
// for the developer to look at, and returns its path.
func keepOutput(key string, got []byte) string {
	f, err := os.CreateTemp("", "golden-*-"+strings.ReplaceAll(filepath.Base(goldenFile(key)), ".gz", ""))
	if err != nil {
		return "(not kept: " + err.Error() + ")"
	}
	defer f.Close()
	if _, err := f.Write(got); err != nil {
		return "(not kept: " + err.Error() + ")"
	}
	return f.Name()
}

func goldenSumOf(t testing.TB, key string) (goldenSum, bool) {
	t.Helper()
	goldenMu.Lock()
	defer goldenMu.Unlock()
	if goldenSums == nil {
		sums, err := readSums()
		if err != nil {
			t.Fatal(err)
		}
		goldenSums = sums
	}
	s, ok := goldenSums[key]
	return s, ok
}

func readSums() (map[string]goldenSum, error) {
	sums := map[string]goldenSum{}
	b, err := os.ReadFile(filepath.Join(goldenDir, "SHA256SUMS"))
	if os.IsNotExist(err) {
		return sums, nil
	}
	if err != nil {
		return nil, err
	}
	sc := bufio.NewScanner(bytes.NewReader(b))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) != 3 {
			return nil, fmt.Errorf("SHA256SUMS: %q is not \"digest length case\"", sc.Text())
		}
		n, err := strconv.Atoi(f[1])
		if err != nil {
			return nil, fmt.Errorf("SHA256SUMS: %q: %v", sc.Text(), err)
		}
		sums[f[2]] = goldenSum{n, f[0]}
	}
	return sums, sc.Err()
}

// updateGoldenOutput writes got as the case's golden output: whole when it is small
// enough, else as a line of SHA256SUMS (and the case's other form is removed).
func updateGoldenOutput(t testing.TB, key, whole string, got []byte) {
	t.Helper()
	goldenMu.Lock()
	defer goldenMu.Unlock()
	sums, err := readSums()
	if err != nil {
		t.Fatal(err)
	}
	if gz := gzipped(got); len(gz) <= GoldenWholeMax {
		if err := os.MkdirAll(filepath.Dir(whole), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(whole, gz, 0o644); err != nil {
			t.Fatal(err)
		}
		delete(sums, key)
	} else {
		if err := os.Remove(whole); err != nil && !os.IsNotExist(err) {
			t.Fatal(err)
		}
		sums[key] = goldenSum{len(got), digest(got)}
	}
	keys := make([]string, 0, len(sums))
	for k := range sums {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	var b strings.Builder
	for _, k := range keys {
		fmt.Fprintf(&b, "%s %d %s\n", sums[k].digest, sums[k].n, k)
	}
	if err := os.MkdirAll(goldenDir, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(goldenDir, "SHA256SUMS"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	goldenSums = sums
}

// SameBytes fails the test at the first line where got and want differ, showing the
// bytes around the first difference.
func SameBytes(t testing.TB, got, want []byte) {
	t.Helper()
	if bytes.Equal(got, want) {
		return
	}
	gl, wl := bytes.SplitAfter(got, []byte("\n")), bytes.SplitAfter(want, []byte("\n"))
	for i := range min(len(gl), len(wl)) {
		if !bytes.Equal(gl[i], wl[i]) {
			j := 0
			for j < min(len(gl[i]), len(wl[i])) && gl[i][j] == wl[i][j] {
				j++
			}
			t.Fatalf("line %d differs at byte %d:\ngot  …%q\nwant …%q", i+1, j, gl[i][max(j-40, 0):min(j+80, len(gl[i]))], wl[i][max(j-40, 0):min(j+80, len(wl[i]))])
		}
	}
	t.Fatalf("got %d lines, want %d", len(gl), len(wl))
}
