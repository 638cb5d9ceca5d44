package audit

import (
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	stdreflect "reflect"
	"slices"
	"strings"
	"testing"

	"coefaudit/extract"
)

// TestStudiesOfInterleavedAgreesWithHeld: a paired CSV whose studies
// interleave is audited in pieces, twice (StudiesOf), and must give every
// claim exactly the result of auditing each study held whole (Run over
// Studies, which holds results until their turn): the same outcome, p,
// adjusted p and notes, in input order, and the same problems. The inputs
// are random (invented numbers) with Holm and with BH, and one holds a
// study of 2,300 claims interleaved with another, so that its blocks of
// extract.MaxFamily claims are families of their own (and say so) in both.
func TestStudiesOfInterleavedAgreesWithHeld(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 12))
	dir := t.TempDir()
	var files []string
	for k := range 20 {
		files = append(files, writeInterleaved(t, dir, fmt.Sprintf("random-%d.csv", k), rng, 3+rng.IntN(4), 5+rng.IntN(40), true))
	}
	// Held whole, a long study's keys are checked block by block; in
	// pieces, across the study: the long file has no key used twice.
	files = append(files, writeInterleaved(t, dir, "long.csv", rng, 2, 2*extract.MaxFamily+300, false))
	for _, path := range files {
		for _, adjust := range []string{AdjustHolm, AdjustBH} {
			opts := Options{Adjust: adjust}
			held := auditPath(t, path, opts, false)
			pieces := auditPath(t, path, opts, true)
			if len(held.Claims) == 0 || len(held.Claims) != len(pieces.Claims) {
				t.Fatalf("%s: %d claims held whole, %d in pieces", path, len(held.Claims), len(pieces.Claims))
			}
			for i := range held.Claims {
				h, p := held.Claims[i], pieces.Claims[i]
				hj, err1 := json.Marshal(h)
				pj, err2 := json.Marshal(p)
				if err1 != nil || err2 != nil {
					t.Fatal(err1, err2)
				}
				if string(hj) != string(pj) || h.family != p.family {
					t.Fatalf("%s, %s, claim %d: held whole (family %d) %s\nin pieces (family %d) %s", path, adjust, i, h.family, hj, p.family, pj)
				}
			}
			// Held whole, a study's problems come with its first claims;
			// in pieces, with their rows: the same problems, in another order.
			byRow := func(a, b Problem) int { return a.Row - b.Row }
			slices.SortStableFunc(held.Problems, byRow)
			slices.SortStableFunc(pieces.Problems, byRow)
			if !stdreflect.DeepEqual(held.Problems, pieces.Problems) {
				t.Errorf("%s: problems held whole %v\nin pieces %v", path, held.Problems, pieces.Problems)
			}
			if !slices.ContainsFunc(held.Claims, func(c ClaimResult) bool { return c.family > 1 }) {
				t.Errorf("%s: no claim shares a family: the input does not test the adjustment", path)
			}
		}
	}
	long := auditPath(t, files[len(files)-1], Options{Adjust: AdjustHolm}, true)
	blocks := 0
	for _, p := range long.Problems {
		if strings.Contains(p.Message, "as a family of their own") {
			blocks++
		}
	}
	if blocks != 2 {
		t.Errorf("the study of 2,300 claims has %d problems about its blocks, want 2 (blocks 2 and 3): %v", blocks, long.Problems)
	}
}

// auditPath audits path through Run over the held studies, or through
// StudiesOf (in pieces, which the input must need), into claims and
// problems in emitted order.
func auditPath(t *testing.T, path string, opts Options, pieces bool) StudyResult {
	t.Helper()
	src, err := extract.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	if !src.Interleaved() {
		t.Fatalf("%s: the studies interleave, but the source does not say so", path)
	}
	studies := src.Studies()
	if pieces {
		if studies, opts, err = StudiesOf(src, opts); err != nil {
			t.Fatal(err)
		}
		if opts.families == nil {
			t.Fatalf("%s: StudiesOf does not read the interleaved studies in pieces", path)
		}
	}
	var all StudyResult
	next := 0
	if _, err := Run(studies, opts, func(r StudyResult) error {
		for _, c := range r.Claims {
			if c.Index != next {
				return fmt.Errorf("claim %d emitted where %d was due", c.Index, next)
			}
			next++
		}
		all.Claims = append(all.Claims, r.Claims...)
		all.Problems = append(all.Problems, r.Problems...)
		return nil
	}); err != nil {
		t.Fatal(err)
	}
	return all
}

// writeInterleaved writes a paired CSV of rows claims spread at random over
// studies studies (the first study is always also the last row's, so that
// the studies interleave), with a claim key used twice now and then when
// dups, and estimates near each other, so that adjusting changes outcomes.
func writeInterleaved(t *testing.T, dir, name string, rng *rand.Rand, studies, rows int, dups bool) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("study,claim,published,first_group,first_estimate,first_se,second_group,second_estimate,second_se\n")
	for i := range rows {
		s := rng.IntN(studies)
		if i == 0 || i == rows-1 {
			s = 0
		} else if i == 1 {
			s = 1
		}
		claim := fmt.Sprintf("c%d", i)
		if dups && rng.IntN(10) == 0 {
			claim = "c1" // a key used twice
		}
		fmt.Fprintf(&b, "S%d,%s,%s,girls,%.3f,0.100,boys,0.200,0.100\n", s, claim,
			[]string{"differ", "no-difference"}[rng.IntN(2)], 0.2+0.5*rng.Float64())
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, []byte(b.String()), 0o600); err != nil {
		t.Fatal(err)
	}
	return path
}
