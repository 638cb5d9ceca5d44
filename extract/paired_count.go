package extract

import (
	"bytes"
	"encoding/csv"
	"errors"
	"hash/maphash"
	"io"
	"os"
	"runtime"
	"slices"
	"strings"
	"sync"
)

// countPaired is the first pass over a paired CSV: the claims rows of each
// study, the claims' unknown columns and the header's problems. It reads
// the study and claim cells of each row and parses nothing else.
//
// It also finds whether studies interleave, and, when they do, which claim
// keys may be used twice (repeatedKeys), so that the pieces (Source.
// Pieces) need hold only those keys to find duplicates across a study.
//
// Nothing else can start before this pass ends, so a large file is counted
// in parts at once, one per CPU, each from a line end on (countParts):
// BenchmarkCheckMillionCSV in package report misses its target with the
// pass read in one piece.
func countPaired(path string) (counts rowCounts, interleaved bool, repeated *repeatedKeys, extra []string, problems []*CellError, err error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, false, nil, nil, nil, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, false, nil, nil, nil, err
	}
	keys := &repeatedKeys{seed: maphash.MakeSeed()}
	size := info.Size()
	bounds := partBounds(f, size, min(runtime.GOMAXPROCS(0), int(size/minCountPart)))
	pr, total, err := countParts(f, path, bounds, keys)
	if err != nil && len(bounds) > 2 {
		// A part ended inside a record (a quoted field across the line end
		// it starts at) or failed: count the file in one piece, which also
		// gives the right line in an error message.
		pr, total, err = countParts(f, path, []int64{0, size}, keys)
	}
	if err != nil {
		return nil, false, nil, nil, nil, err
	}
	if total.interleaved {
		keys.find(slices.Concat(total.hashes...))
		repeated = keys
	}
	return total.rows, total.interleaved, repeated, slices.Clone(pr.cols.extraNames), pr.Problems(), nil
}

// minCountPart is the fewest bytes a part of the first pass has: twice the
// longest record, so that the header, which the first part reads, is
// always within it.
const minCountPart = 2 * MaxRecordBytes

// errPartEnd says that a part of the first pass ended inside a record.
var errPartEnd = errors.New("the part ends inside a record")

// partBounds cuts a file of size bytes into at most n parts, each starting
// after a line end: the offsets of the parts' starts and, last, size.
func partBounds(f io.ReaderAt, size int64, n int) []int64 {
	bounds := []int64{0}
	buf := make([]byte, csvBufferSize)
	for k := 1; k < n; k++ {
		at := max(size*int64(k)/int64(n), bounds[len(bounds)-1]+1)
		for {
			m, err := f.ReadAt(buf, at)
			if i := bytes.IndexByte(buf[:m], '\n'); i >= 0 {
				at += int64(i) + 1
				break
			}
			if err != nil { // no line end after at: the last part runs on
				return append(bounds, size)
			}
			at += int64(m)
		}
		if at >= size {
			break
		}
		bounds = append(bounds, at)
	}
	return append(bounds, size)
}

// countParts counts the claims rows of f in the parts between bounds at
// once and adds up the counts (keyCount.then). The first part reads the
// header, whose reader it returns. It fails with errPartEnd when a part
// but the last ends inside a record.
func countParts(f io.ReaderAt, path string, bounds []int64, keys *repeatedKeys) (*PairedReader, keyCount, error) {
	first, err := NewPairedReader(io.NewSectionReader(f, 0, bounds[1]), path)
	if err != nil {
		return nil, keyCount{}, err
	}
	readers := []*PairedReader{first}
	for k := 1; k+1 < len(bounds); k++ {
		part := io.NewSectionReader(f, bounds[k], bounds[k+1]-bounds[k])
		readers = append(readers, &PairedReader{src: csvPart(part, path, first.src.r.Comma), name: path, cols: first.cols, claim: first.claim})
	}
	parts := make([]keyCount, len(readers))
	var wg sync.WaitGroup
	for k, pr := range readers {
		// A row of a paired CSV seldom takes fewer than 100 bytes (those
		// of fixtures/gen_paired.go take about 140), so the hashes of a part seldom
		// outgrow this; a part of shorter rows grows its slice as usual.
		rows := int((bounds[k+1] - bounds[k]) / 100)
		wg.Go(func() { parts[k] = countKeys(pr, keys, rows) })
	}
	wg.Wait()
	total := parts[0]
	for k := range parts {
		switch {
		case parts[k].err != nil:
			return nil, keyCount{}, parts[k].err
		case parts[k].endRejected && k+1 < len(parts):
			return nil, keyCount{}, errPartEnd
		case k > 0:
			total.then(parts[k])
		}
	}
	return first, total, nil
}

// keyCount is what the first pass finds in a part of a paired CSV.
type keyCount struct {
	rows        rowCounts
	hashes      [][]uint64 // of each row's claim key, a slice a part
	first, last string     // the studies of the part's first and last rows
	any         bool       // the part has rows
	interleaved bool       // a study comes back after another within the part
	endRejected bool       // the CSV parser rejected the part's last record
	err         error
}

// countKeys counts the rows that pr reads, about rows of them.
func countKeys(pr *PairedReader, keys *repeatedKeys, rows int) keyCount {
	k := keyCount{rows: rowCounts{}, hashes: [][]uint64{make([]uint64, 0, rows)}}
	var lastRows *int // k.last's count
	for {
		study, claim, rejected, err := pr.nextKey()
		if errors.Is(err, io.EOF) {
			k.endRejected = k.endRejected || rejected
			return k
		}
		if err != nil {
			k.err = err
			return k
		}
		k.endRejected = rejected
		k.hashes[0] = append(k.hashes[0], keys.hash(study, claim))
		if k.any && study == k.last {
			*lastRows++ // one map lookup a study: its rows stand together nearly always
		} else {
			if k.rows.add(study) > 1 {
				k.interleaved = true
			}
			lastRows = k.rows[study]
		}
		if !k.any {
			k.first, k.any = strings.Clone(study), true
		}
		k.last = study
	}
}

// then adds the count of the part after k's to k. A study of both
// interleaves unless it is the one that ends k's part and starts the next,
// in one run.
func (k *keyCount) then(next keyCount) {
	if !next.any {
		return
	}
	for s, n := range next.rows {
		prev, seen := k.rows[s]
		if !seen {
			k.rows[s] = n
			continue
		}
		if s != k.last || s != next.first {
			k.interleaved = true
		}
		*prev += *n
	}
	k.interleaved = k.interleaved || next.interleaved
	k.hashes = append(k.hashes, next.hashes...)
	if !k.any {
		k.first = next.first
	}
	k.last, k.any = next.last, true
}

// repeatedKeys knows which claim keys (study, claim) of a file more than
// one row may have: those whose hash more than one row has. Holding every
// key of a shuffled file of a million rows, to find the few used twice,
// would take more memory than the rest of its reading; the hashes of the
// first pass, sorted, take 8 bytes a row for that pass alone.
type repeatedKeys struct {
	seed  maphash.Seed
	twice map[uint64]bool
}

// hash is the hash of a claim key.
func (k *repeatedKeys) hash(study, claim string) uint64 {
	var h maphash.Hash
	h.SetSeed(k.seed)
	h.WriteString(study)
	h.WriteByte(0)
	h.WriteString(claim)
	return h.Sum64()
}

// find keeps the hashes that occur more than once in hashes, which it sorts.
func (k *repeatedKeys) find(hashes []uint64) {
	slices.Sort(hashes)
	k.twice = map[uint64]bool{}
	for i := 1; i < len(hashes); i++ {
		if hashes[i] == hashes[i-1] {
			k.twice[hashes[i]] = true
		}
	}
}

// may reports whether the claim key may be used by more than one row.
func (k *repeatedKeys) may(study, claim string) bool { return k.twice[k.hash(study, claim)] }

// nextKey returns the study and claim cells of the next row that has
// either, as Next would read them, without copying or checking the row's
// cells, and whether the CSV parser rejected the row (with io.EOF: the
// blank row skipped last, if any). A rejected row counts
// under what could be read of it; if the second pass reads it otherwise,
// that study is yielded at the end (studyAssembler.unfinished).
func (p *PairedReader) nextKey() (study, claim string, rejected bool, err error) {
	cell := func(rec []string, i int) string {
		if i >= 0 && i < len(rec) {
			return trimSpace(rec[i])
		}
		return ""
	}
	skipped := false // whether the last blank row skipped was rejected
	for {
		rec, restBlank, err := p.src.r.ReadHead(max(p.claim.study, p.claim.claim) + 1)
		p.src.lim.recordStart = p.src.r.InputOffset() // as fill does
		var pe *csv.ParseError
		switch {
		case err == io.EOF:
			return "", "", skipped, io.EOF
		case err != nil && !errors.As(err, &pe):
			return "", "", false, p.src.readError(err, nil, &p.row)
		}
		study, claim = cell(rec, p.claim.study), cell(rec, p.claim.claim)
		if study != "" || claim != "" || !restBlank || !recordIsBlank(rec) {
			return study, claim, pe != nil, nil
		}
		skipped = pe != nil
	}
}

// recordIsBlank reports whether every field of a record is blank, as a blank
// row is.
func recordIsBlank(rec []string) bool {
	for _, f := range rec {
		if trimSpace(f) != "" {
			return false
		}
	}
	return true
}
