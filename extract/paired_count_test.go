package extract

import (
	"bytes"
	"errors"
	"fmt"
	"hash/maphash"
	"maps"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// TestCountPartsAgreesWithOnePiece counts generated paired CSVs in parts cut
// at every line end, and at random pairs of line ends, and checks that
// whatever the parts count is what one piece counts, or that the cut is
// refused (errPartEnd) because it falls inside a quoted field.
func TestCountPartsAgreesWithOnePiece(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := range 40 {
		text := generatedPairedCSV(rng, 4+rng.IntN(20))
		f := strings.NewReader(text)
		size := int64(len(text))
		keys := &repeatedKeys{seed: maphash.MakeSeed()}
		_, whole, err := countParts(f, "p.csv", []int64{0, size}, keys)
		if err != nil {
			t.Fatalf("trial %d: one piece: %v\n%s", trial, err, text)
		}
		var ends []int64
		for i := range text {
			if text[i] == '\n' && int64(i+1) < size {
				ends = append(ends, int64(i+1))
			}
		}
		cuts := [][]int64{}
		for _, e := range ends {
			cuts = append(cuts, []int64{0, e, size})
		}
		for range 20 {
			a, b := ends[rng.IntN(len(ends))], ends[rng.IntN(len(ends))]
			if a < b {
				cuts = append(cuts, []int64{0, a, b, size})
			}
		}
		refused := 0
		for _, bounds := range cuts {
			_, parts, err := countParts(f, "p.csv", bounds, keys)
			if errors.Is(err, errPartEnd) {
				refused++
				continue
			}
			if err != nil {
				// The header is cut: the first part cannot hold it.
				if bounds[1] <= int64(strings.Index(text, "\n")) {
					continue
				}
				t.Fatalf("trial %d, parts %v: %v", trial, bounds, err)
			}
			if !maps.Equal(countsOf(parts.rows), countsOf(whole.rows)) || parts.interleaved != whole.interleaved ||
				!slices.Equal(slices.Concat(parts.hashes...), slices.Concat(whole.hashes...)) {
				t.Fatalf("trial %d, parts %v: counts %v interleaved %v, one piece %v %v\n%s",
					trial, bounds, countsOf(parts.rows), parts.interleaved, countsOf(whole.rows), whole.interleaved, text)
			}
		}
		if strings.Contains(text, "\"multi\nline\"") && refused == 0 {
			t.Errorf("trial %d: a cut inside a quoted field was never refused\n%s", trial, text)
		}
	}
}

// generatedPairedCSV writes a paired CSV of rows claims rows with studies
// that sometimes interleave, blank rows, a quoted field across a line end,
// and a row whose stray quote the CSV parser rejects.
func generatedPairedCSV(rng *rand.Rand, rows int) string {
	var b strings.Builder
	b.WriteString("study,claim,published,first_estimate,second_estimate,topic\n")
	study := 0
	for i := range rows {
		if rng.IntN(3) == 0 {
			study = rng.IntN(4)
		}
		topic := "t"
		switch rng.IntN(8) {
		case 0:
			topic = "\"multi\nline\""
		case 1:
			b.WriteString(",,,,,\n")
		case 2:
			topic = "a \"stray\" quote"
		}
		fmt.Fprintf(&b, "S%d,c%d,no-difference,0.%d,0.%d,%s\n", study, i%5, i, i+1, topic)
	}
	return b.String()
}

// TestPartBounds checks that parts start after line ends and cover the
// file.
func TestPartBounds(t *testing.T) {
	text := "h\nab\ncdef\n\nghijklmnop\nq"
	for n := 1; n <= 6; n++ {
		bounds := partBounds(strings.NewReader(text), int64(len(text)), n)
		if bounds[0] != 0 || bounds[len(bounds)-1] != int64(len(text)) || len(bounds) > n+1 {
			t.Fatalf("n=%d: bounds %v", n, bounds)
		}
		for _, at := range bounds[1 : len(bounds)-1] {
			if text[at-1] != '\n' {
				t.Errorf("n=%d: part at %d does not start after a line end (bounds %v)", n, at, bounds)
			}
		}
	}
	if got := partBounds(bytes.NewReader([]byte("no line end at all")), 18, 4); len(got) != 2 {
		t.Errorf("a file without line ends is cut: %v", got)
	}
}

// countsOf reads the counts of a first pass.
func countsOf(c rowCounts) map[string]int {
	out := map[string]int{}
	for k, n := range c {
		out[k] = *n
	}
	return out
}
