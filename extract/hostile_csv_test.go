package extract

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// writeFolder writes a folder of CSV files, name → content.
func writeFolder(t *testing.T, files map[string][]byte) string {
	t.Helper()
	dir := t.TempDir()
	for name, data := range files {
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

const hostileCoefficients = "study,label,estimate,se\ns,a,0.50,0.10\ns,b,0.20,0.10\n"

// TestHostileEncodings reads claims.csv in the encodings and line ends that
// spreadsheets and editors write. Every claim must come back on its own
// line, or the file must be refused naming its encoding.
func TestHostileEncodings(t *testing.T) {
	const text = "study,claim,first,second,published\ns,c1,a,b,differ\ns,c2,b,a,differ\n"
	tests := []struct {
		name   string
		claims []byte
		rows   []int  // the claims' rows, when read
		refuse string // the refusal, when refused
		column string // a problem expected on the second claim's cell
	}{
		{name: "UTF-8 byte order mark", claims: append([]byte("\xEF\xBB\xBF"), text...), rows: []int{2, 3}},
		{name: "CRLF", claims: []byte(strings.ReplaceAll(text, "\n", "\r\n")), rows: []int{2, 3}},
		{name: "lone CR (old Mac)", claims: []byte(strings.ReplaceAll(text, "\n", "\r")), rows: []int{2, 3}},
		{name: "mixed line ends", claims: []byte("study,claim,first,second,published\r\ns,c1,a,b,differ\rs,c2,b,a,differ\ns,c3,a,b,differ\r\n\r\rs,c4,a,b,differ"),
			rows: []int{2, 3, 4, 7}},
		{name: "CR inside a quoted field", claims: []byte("study,claim,first,second,published,topic\rs,c1,a,b,differ,\"two\rlines\"\rs,c2,b,a,differ,\r"),
			rows: []int{2, 4}},
		{name: "semicolons after a blank line", claims: []byte("\n;;\nstudy;claim;first;second;published\ns;c1;a;b;differ\ns;c2;b;a;differ\n"),
			rows: []int{4, 5}},
		{name: "NUL byte in a cell", claims: []byte("study,claim,first,second,published\ns,c1,a,b,differ\ns,c\x002,b,a,differ\n"),
			rows: []int{2, 3}, column: "claim"},
		{name: "UTF-16LE with byte order mark", claims: utf16Bytes(text, binary.LittleEndian, true), refuse: "is UTF-16 text"},
		{name: "UTF-16BE with byte order mark", claims: utf16Bytes(text, binary.BigEndian, true), refuse: "is UTF-16 text"},
		{name: "UTF-16LE without byte order mark", claims: utf16Bytes(text, binary.LittleEndian, false), refuse: "is UTF-16 text without a byte order mark"},
		{name: "UTF-16BE without byte order mark", claims: utf16Bytes(text, binary.BigEndian, false), refuse: "is UTF-16 text without a byte order mark"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := writeFolder(t, map[string][]byte{"coefficients.csv": []byte(hostileCoefficients), "claims.csv": tt.claims})
			claims := filepath.Join(dir, "claims.csv")
			in, err := Read(dir)
			if tt.refuse != "" {
				if !errors.Is(err, ErrUnsupportedInput) || !strings.HasPrefix(err.Error(), claims+" "+tt.refuse) {
					t.Errorf("Read(%s) error = %v, want ErrUnsupportedInput starting %q", tt.name, err, claims+" "+tt.refuse)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			var rows []int
			for _, c := range in.Claims {
				rows = append(rows, c.Row)
			}
			if fmt.Sprint(rows) != fmt.Sprint(tt.rows) {
				t.Fatalf("Read(%s) claims on rows %v, want %v", tt.name, rows, tt.rows)
			}
			if len(in.Problems) != 0 {
				t.Errorf("Read(%s) sheet problems:%s, want none", tt.name, problemTexts(in.Problems))
			}
			for i, c := range in.Claims {
				if c.Study != "s" || (c.Claim == "" && tt.column == "") {
					t.Errorf("Read(%s) claim %d = study %q claim %q, want study s and its key", tt.name, i, c.Study, c.Claim)
				}
				if i == 1 && tt.column != "" {
					want := fmt.Sprintf("%s, row %d, column %q: ", claims, c.Row, tt.column)
					if !hasProblem(c.Problems, ErrUnsupportedInput, want) {
						t.Errorf("Read(%s) row %d problems:%s, want one starting %q", tt.name, c.Row, problemTexts(c.Problems), want)
					}
					continue
				}
				if len(c.Problems) != 0 {
					t.Errorf("Read(%s) row %d problems:%s, want none", tt.name, c.Row, problemTexts(c.Problems))
				}
			}
			if tt.name == "CR inside a quoted field" && in.Claims[0].Topic != "two\nlines" {
				t.Errorf("Read(%s) topic = %q, want the field's line end read as \\n", tt.name, in.Claims[0].Topic)
			}
		})
	}
}

// TestHostileLongLinePaired feeds a paired CSV whose second record is a
// 100 MB line: refused naming the row, having read a few MiB of it.
func TestHostileLongLinePaired(t *testing.T) {
	r := &endlessLine{head: "study,claim,published,first_estimate,second_estimate\ns,c1,differ,0.5,0.2\n", limit: 100 << 20}
	pr, err := NewPairedReader(r, "long.csv")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := pr.Next(); err != nil {
		t.Fatalf("Next() = %v, want the first claim", err)
	}
	_, err = pr.Next()
	if !errors.Is(err, ErrInputTooLarge) || !strings.HasPrefix(err.Error(), "long.csv, row 3: line 3 is longer than 4 MiB") {
		t.Errorf("Next() on a 100 MB line error = %v, want ErrInputTooLarge at row 3", err)
	}
	if r.taken > 2*MaxLineBytes {
		t.Errorf("read %d bytes of the 100 MB line, want at most %d", r.taken, 2*MaxLineBytes)
	}
}

// TestHostileWideHeader reads a claims.csv whose header has 100,000 unknown
// columns above 2000 short rows. The columns beyond MaxColumns are dropped
// with a problem of the header, so that each row's unknown columns cost
// at most MaxColumns strings (before, 100,000 strings a row: 3 GiB).
func TestHostileWideHeader(t *testing.T) {
	var b bytes.Buffer
	b.WriteString("study,claim,first,second,published")
	for i := 0; i < 100_000; i++ {
		fmt.Fprintf(&b, ",x%d", i)
	}
	b.WriteString("\n")
	for i := 0; i < 2000; i++ {
		fmt.Fprintf(&b, "s,c%d,a,b,differ\n", i)
	}
	dir := writeFolder(t, map[string][]byte{"coefficients.csv": []byte(hostileCoefficients), "claims.csv": b.Bytes()})
	var in *Input
	var err error
	alloc := allocated(func() { in, err = Read(dir) })
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Claims) != 2000 {
		t.Fatalf("Read(100,000-column header) = %d claims, want 2000", len(in.Claims))
	}
	want := filepath.Join(dir, "claims.csv") + ", row 1: the header row: the row has 100005 fields; only the first 1024 are read"
	if !hasProblem(in.Problems, ErrInputTooLarge, want) {
		t.Errorf("sheet problems:%s, want one starting %q", problemTexts(in.Problems), want)
	}
	if n := len(in.Claims[0].Extra.Names); n != MaxColumns-5 {
		t.Errorf("claim row 2 keeps %d unknown columns, want %d", n, MaxColumns-5)
	}
	if alloc > 128<<20 {
		t.Errorf("Read(100,000-column header, 2000 rows) allocated %d MiB, want at most 128", alloc>>20)
	}
	t.Logf("allocated %d MiB", alloc>>20)
}

// TestWideRowsBeyondMaxColumns reads coefficient rows wider than
// MaxColumns. Blank fields beyond it (trailing separators) are dropped
// with no size problem (the row is still ragged against its header), and
// a row of nothing but separators is a blank row, read as none; a value
// beyond it is a size problem of the row, which keeps its first
// MaxColumns cells.
func TestWideRowsBeyondMaxColumns(t *testing.T) {
	const tooWide = "only the first 1024 are read"
	text := "study,label,estimate,se\n" +
		"s,a,0.50,0.10" + strings.Repeat(",", MaxColumns+10) + "\n" + // row 2: 1038 fields, trailing separators
		strings.Repeat(",", MaxColumns+10) + "\n" + // row 3: separators only
		"s,b,0.20,0.10" + strings.Repeat(",", MaxColumns+5) + "7\n" // row 4: 1033 fields, a value in the last
	dir := writeFolder(t, map[string][]byte{"coefficients.csv": []byte(text),
		"claims.csv": []byte("study,claim,first,second,published\ns,c1,a,b,differ\n")})
	in, err := Read(dir)
	if err != nil {
		t.Fatal(err)
	}
	var rows []int
	for _, c := range in.Coefficients {
		rows = append(rows, c.Row)
		switch c.Row {
		case 2:
			if hasProblem(c.Problems, ErrInputTooLarge, tooWide) {
				t.Errorf("row 2 (blank fields beyond column %d): problems%s, want no size problem", MaxColumns, problemTexts(c.Problems))
			}
		case 4:
			if !hasProblem(c.Problems, ErrInputTooLarge, "the row has 1033 fields; "+tooWide) {
				t.Errorf("row 4 (a value beyond column %d): problems%s, want %q", MaxColumns, problemTexts(c.Problems), tooWide)
			}
			if c.Estimate.Value != 0.20 {
				t.Errorf("row 4 estimate = %v, want 0.20 (its first cells are read)", c.Estimate.Value)
			}
		}
	}
	if fmt.Sprint(rows) != "[2 4]" {
		t.Errorf("coefficients on rows %v, want [2 4] (row 3 holds only separators)", rows)
	}
}

// TestBrokenCoefficients reads coefficient rows whose content is wrong in
// ways a reader can see on the row alone. Each must keep its row and carry
// a problem naming the cell; what only the statistics can see (an estimate
// outside its own interval) is left to the audit and is no problem here.
func TestBrokenCoefficients(t *testing.T) {
	const header = "study,label,measure,estimate,ci_low,ci_high,ci_level,se,n\n"
	tests := []struct {
		name   string
		row    string
		target error  // nil: no problem
		column string // the cell to blame
		text   string
	}{
		{"ci_level 0", "s,a,b,0.5,0.1,0.9,0,,", ErrOutOfRange, "ci_level", "a confidence level is a percent between 0 and 100"},
		{"ci_level 100", "s,a,b,0.5,0.1,0.9,100,,", ErrOutOfRange, "ci_level", "not 100"},
		{"ci_level 100%", "s,a,b,0.5,0.1,0.9,100%,,", ErrOutOfRange, "ci_level", "not 100"},
		{"ci_level 1", "s,a,b,0.5,0.1,0.9,1,,", ErrOutOfRange, "ci_level", "not 1"},
		{"negative SE", "s,a,b,0.5,,,,-0.10,", ErrOutOfRange, "se", "a standard error cannot be negative (-0.10)"},
		{"negative SE, Unicode minus", "s,a,b,0.5,,,,−0.10,", ErrOutOfRange, "se", "cannot be negative"},
		{"correlation with n 3", "s,a,r,0.5,,,,,3", ErrOutOfRange, "n", "a correlation needs n of at least 4"},
		{"correlation with n 0", "s,a,r,0.5,,,,,0", ErrOutOfRange, "n", "positive whole number"},
		{"correlation with n 4", "s,a,r,0.5,,,,,4", nil, "", ""},
		{"coefficient with n 3", "s,a,b,0.5,,,,0.1,3", nil, "", ""},
		{"correlation above 1", "s,a,r,1.2,,,,,50", ErrOutOfRange, "estimate", "between −1 and 1"},
		{"ratio of 0", "s,a,or,0,,,,,", ErrOutOfRange, "estimate", "must be positive"},
		{"estimate outside its interval", "s,a,b,0.9,0.1,0.5,,,", nil, "", ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := writeFolder(t, map[string][]byte{
				"coefficients.csv": []byte(header + tt.row + "\n"),
				"claims.csv":       []byte("study,claim,first,second,published\ns,c1,a,b,differ\n")})
			in, err := Read(dir)
			if err != nil {
				t.Fatal(err)
			}
			if len(in.Coefficients) != 1 {
				t.Fatalf("Read(%s) = %d coefficients, want the row kept", tt.name, len(in.Coefficients))
			}
			c := in.Coefficients[0]
			if tt.target == nil {
				if len(c.Problems) != 0 {
					t.Errorf("Read(%s) problems:%s, want none", tt.name, problemTexts(c.Problems))
				}
				return
			}
			want := fmt.Sprintf("%s, row 2, column %q: ", filepath.Join(dir, "coefficients.csv"), tt.column)
			found := false
			for _, p := range c.Problems {
				found = found || (errors.Is(p, tt.target) && strings.HasPrefix(p.Error(), want) && strings.Contains(p.Error(), tt.text))
			}
			if !found {
				t.Errorf("Read(%s) problems:%s, want %v starting %q and saying %q", tt.name, problemTexts(c.Problems), tt.target, want, tt.text)
			}
		})
	}
}

// TestBrokenDuplicateLabels keeps both rows of a label used twice, the
// second flagged with the row of the first.
func TestBrokenDuplicateLabels(t *testing.T) {
	dir := writeFolder(t, map[string][]byte{
		"coefficients.csv": []byte("study,label,estimate,se\ns,a,0.5,0.1\nt,a,0.4,0.1\ns,a,0.3,0.1\n"),
		"claims.csv":       []byte("study,claim,first,second,published\ns,c1,a,b,differ\n")})
	in, err := Read(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(in.Coefficients) != 3 || len(in.Coefficients[0].Problems)+len(in.Coefficients[1].Problems) != 0 {
		t.Fatalf("Read = %d coefficients, want 3 with the first two (different studies) clean", len(in.Coefficients))
	}
	want := filepath.Join(dir, "coefficients.csv") + `, row 4, column "label": label "a" is used twice in study "s" (first on row 2)`
	if !hasProblem(in.Coefficients[2].Problems, ErrDuplicate, want) {
		t.Errorf("row 4 problems:%s, want %q", problemTexts(in.Coefficients[2].Problems), want)
	}
}

// TestBrokenCounts puts an n or df that is not a finite positive number in
// each place one is read: the coefficients sheet's df and n, a paired row's
// first_df and second_n, the correlations sheet's n, and a correlation
// table's n column and key row. Each must be a problem naming its row and
// column (a key row's column is its key, "n"), and the value must not be
// kept.
func TestBrokenCounts(t *testing.T) {
	const claims = "study,claim,first,second,published\ns,c1,a,b,differ\n"
	// A correlation table with a key row "n" when keyN is given.
	tableWith := func(keyN, nCell string) []byte {
		key := ""
		if keyN != "" {
			key = "n,\"" + keyN + "\"\n"
		}
		return []byte(key + "variable,n,1,2\n1. A,\"" + nCell + "\",—,\n2. B,50,.45,—\n")
	}
	type reading struct {
		file, column string
		row          int
		files        func(v string) map[string][]byte
		value        func(in *Input) Printed // the value read, which must be Absent
	}
	places := []reading{
		{"coefficients.csv", "df", 2, func(v string) map[string][]byte {
			return map[string][]byte{"claims.csv": []byte(claims), "coefficients.csv": []byte("study,label,measure,estimate,se,df,n\ns,a,b,0.5,0.1,\"" + v + "\",40\n")}
		}, func(in *Input) Printed { return in.Coefficients[0].DF }},
		{"coefficients.csv", "n", 2, func(v string) map[string][]byte {
			return map[string][]byte{"claims.csv": []byte(claims), "coefficients.csv": []byte("study,label,measure,estimate,se,df,n\ns,a,b,0.5,0.1,,\"" + v + "\"\n")}
		}, func(in *Input) Printed { return in.Coefficients[0].N }},
		{"correlations.csv", "n", 3, func(v string) map[string][]byte {
			return map[string][]byte{"claims.csv": []byte(claims), "coefficients.csv": []byte("study,label,estimate,se\ns,a,0.5,0.1\n"),
				"correlations.csv": []byte("study,group,var_a,var_b,r,n\ns,,x,y,.3,40\ns,,x,z,.2,\"" + v + "\"\n")}
		}, func(in *Input) Printed { return in.Correlations[1].N }},
		{"table 1.csv", "n", 2, func(v string) map[string][]byte {
			return map[string][]byte{"claims.csv": []byte(claims), "coefficients.csv": []byte("study,label,estimate,se\ns,a,0.5,0.1\n"),
				"table 1.csv": tableWith("", v)}
		}, func(in *Input) Printed { return in.Tables[0].N[0] }},
		{"table 1.csv", "n", 1, func(v string) map[string][]byte {
			return map[string][]byte{"claims.csv": []byte(claims), "coefficients.csv": []byte("study,label,estimate,se\ns,a,0.5,0.1\n"),
				"table 1.csv": tableWith(v, "")}
		}, func(in *Input) Printed { return in.Tables[0].N[0] }},
		{"paired.csv", "first_df", 2, func(v string) map[string][]byte {
			return map[string][]byte{"paired.csv": []byte("study,claim,published,first_label,first_estimate,first_se,first_df,second_label,second_estimate,second_se,second_n\n" +
				"s,c1,differ,a,0.5,0.1,\"" + v + "\",b,0.2,0.1,30\n")}
		}, func(in *Input) Printed { return in.Coefficients[0].DF }},
		{"paired.csv", "second_n", 2, func(v string) map[string][]byte {
			return map[string][]byte{"paired.csv": []byte("study,claim,published,first_label,first_estimate,first_se,first_df,second_label,second_estimate,second_se,second_n\n" +
				"s,c1,differ,a,0.5,0.1,,b,0.2,0.1,\"" + v + "\"\n")}
		}, func(in *Input) Printed { return in.Coefficients[1].N }},
	}
	for _, v := range []string{"0", "-3", "−0", "NaN", "Inf", "-Inf", "∞", "1e400", "1e-400"} {
		for _, pl := range places {
			t.Run(pl.file+" "+pl.column+" "+v, func(t *testing.T) {
				dir := writeFolder(t, pl.files(v))
				path := dir
				if pl.file == "paired.csv" {
					path = filepath.Join(dir, pl.file)
				}
				in, err := Read(path)
				if err != nil {
					t.Fatal(err)
				}
				var all []*CellError
				all = append(all, in.Problems...)
				for _, c := range in.Coefficients {
					all = append(all, c.Problems...)
				}
				for _, c := range in.Correlations {
					all = append(all, c.Problems...)
				}
				for _, tb := range in.Tables {
					all = append(all, tb.Problems...)
				}
				want := fmt.Sprintf("%s, row %d, column %q: ", filepath.Join(dir, pl.file), pl.row, pl.column)
				found := false
				for _, p := range all {
					found = found || strings.HasPrefix(p.Error(), want) && (errors.Is(p, ErrOutOfRange) || errors.Is(p, ErrMalformedNumber))
				}
				if !found {
					t.Errorf("Read with %s %q: problems:%s\nwant one starting %q", pl.column, v, problemTexts(all), want)
				}
				if got := pl.value(in); got.Present() {
					t.Errorf("Read with %s %q kept the value %+v, want it absent", pl.column, v, got)
				}
			})
		}
	}
}
