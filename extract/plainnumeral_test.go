package extract

import (
	"math"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

// The fast path for plain numerals (plainNumeral, used by parsePrinted,
// cellNumber and rowReading.numberInto) must give exactly what the general
// path gives: the same Printed, value bits included, and the same error.
// The general path is the reference; for the numerals the fast path takes,
// the value is also checked against strconv.ParseFloat of the Go standard
// library, which rounds correctly (IEEE 754 round to nearest even).

// numeralPieces are the parts generated cells are made of: signs, spaces,
// digits with separators, exponents, stars and junk, as printed tables
// carry them.
var numeralPieces = struct {
	lead, sign, sep, exp, trail []string
}{
	lead:  []string{"", "", "", " ", "\u00a0", "\t", "\u2009"},
	sign:  []string{"", "", "", "-", "-", "+", "\u2212", "\u2013", "--", "+-", "- ", "\ufe63"},
	sep:   []string{"", "", ".", ".", ".", ",", "..", ", ", " "},
	exp:   []string{"", "", "", "", "e5", "e-5", "E+05", "e", "e12345", "\u00d710^-3", " x 10^2", "\u00d710\u207b\u2075", "*10^4", "e\u22122"},
	trail: []string{"", "", "", "", "*", "**", " ***", "\u2020", " ", "%", "abc", "\u2009", "\u2217", "."},
}

// generatedNumeral builds one cell text from the pieces and random digits.
func generatedNumeral(rng *rand.Rand) string {
	pick := func(list []string) string { return list[rng.IntN(len(list))] }
	digits := func(max int) string {
		n := rng.IntN(max + 1)
		var b strings.Builder
		for range n {
			b.WriteByte(byte('0' + rng.IntN(10)))
		}
		return b.String()
	}
	var b strings.Builder
	b.WriteString(pick(numeralPieces.lead))
	b.WriteString(pick(numeralPieces.sign))
	switch rng.IntN(6) {
	case 0: // thousands grouped by commas, dots or spaces
		g := []string{",", ".", " ", "\u202f"}[rng.IntN(4)]
		b.WriteString(strconv.Itoa(1 + rng.IntN(999)))
		for range 1 + rng.IntN(3) {
			b.WriteString(g)
			b.WriteString(digits(4))
		}
	case 1: // long runs of digits, around the 15 the fast path takes
		b.WriteString(digits(20))
	default:
		b.WriteString(digits(4))
	}
	b.WriteString(pick(numeralPieces.sep))
	b.WriteString(digits(6))
	b.WriteString(pick(numeralPieces.exp))
	b.WriteString(pick(numeralPieces.trail))
	if rng.IntN(20) == 0 {
		// Junk anywhere: any byte, invalid UTF-8 included.
		s := []byte(b.String())
		i := rng.IntN(len(s) + 1)
		s = append(s[:i], append([]byte{byte(rng.IntN(256))}, s[i:]...)...)
		return string(s)
	}
	return b.String()
}

// numeralCases are fixed cells at the edges of the fast path.
var numeralCases = []string{
	"", " ", "0", "-0", "+0", "0.0", "-0.00", "0.43", "-0.22", "570", ".43", "-.5", "+.5",
	"43.", "-", "+", ".", "-.", "1.2.3", "007", "00.5", "1e5", "0.43*", "−0.43", "0,43",
	"1,234", "1.234", "999999999999999", "9999999999999999", "0.000000000000001",
	"0.0000000000000001", "123456789012345", "1234567890123456", "-999999999999999",
	"99999999999999.9", "9007199254740993", "0.1", "0.3", "2.675", "1.005", "1", "1.0",
	" 0.43", "0.43 ", "\u00a00.43", "0.43\u00a0", "p = .03", "<.001", "ns", "1.5", "0.5",
	"1", "1.01", "-1", "2", "0x10", "1_000", "Inf", "NaN", "+-1", "-+1", "--1",
}

func TestPlainNumeralMatchesGeneralPath(t *testing.T) {
	rng := rand.New(rand.NewPCG(2024, 11))
	texts := append([]string(nil), numeralCases...)
	for range 30000 {
		texts = append(texts, generatedNumeral(rng))
	}
	for range 20000 {
		// Plain numerals only, so that the fast path's values are
		// compared with strconv over many digits and decimals.
		texts = append(texts, plainOnly(rng))
	}
	modes := []numberMode{numberGeneral, numberCount, numberLimit}
	kinds := []error{ErrMalformedNumber, ErrMalformedInterval, ErrMalformedP}
	cellKinds := []numberKind{kindNumber, kindLimit, kindCount, kindP}
	fast := 0
	for _, s := range texts {
		if v, dec, ok := plainNumeral(trimSpace(s)); ok {
			fast++
			checkPlainAgainstStrconv(t, trimSpace(s), v, dec)
		}
		for _, mode := range modes {
			for _, kind := range kinds {
				got, gotErr := parsePrinted(s, mode, kind)
				want, wantErr := parsePrintedGeneral(s, mode, kind)
				if !samePrinted(got, want) || !reflect.DeepEqual(gotErr, wantErr) {
					t.Fatalf("parsePrinted(%q, %d, %v) = %+v, %v, want the general path's %+v, %v", s, mode, kind, got, gotErr, want, wantErr)
				}
			}
		}
		for _, kind := range cellKinds {
			cell := sheetCell{Text: s}
			got, gotErr := cellNumber(cell, kind)
			want, wantErr := cellNumberGeneral(cell, kind)
			if !samePrinted(got, want) || !reflect.DeepEqual(gotErr, wantErr) {
				t.Fatalf("cellNumber(%q, %d) = %+v, %v, want the general path's %+v, %v", s, kind, got, gotErr, want, wantErr)
			}
			// rowReading.number has the fast path inline: on failure it
			// records the general path's error and leaves Absent.
			rr := rowReading{cols: &columns{names: []string{"x"}}, cells: []sheetCell{cell}}
			gotRow := rr.number(0, kind)
			wantRow := want
			if wantErr != nil {
				wantRow = Printed{Bound: Absent}
			}
			if !samePrinted(gotRow, wantRow) {
				t.Fatalf("rowReading.number(%q, %d) = %+v, want %+v", s, kind, gotRow, wantRow)
			}
			if wantErr == nil && len(rr.problems) != 0 || wantErr != nil && (len(rr.problems) != 1 || !reflect.DeepEqual(rr.problems[0].Err, wantErr)) {
				t.Fatalf("rowReading.number(%q, %d) problems%s, want the general path's error %v", s, kind, problemTexts(rr.problems), wantErr)
			}
		}
	}
	// Both paths must have been exercised, or the comparison says nothing.
	if fast < len(texts)/5 || fast > len(texts)*4/5 {
		t.Errorf("the fast path read %d of %d cells, want between a fifth and four fifths", fast, len(texts))
	}
}

// plainOnly generates a numeral the fast path takes: a sign, up to 15
// digits and perhaps a decimal point among them.
func plainOnly(rng *rand.Rand) string {
	var b strings.Builder
	b.WriteString([]string{"", "-", "+"}[rng.IntN(3)])
	n := 1 + rng.IntN(plainDigits)
	dot := rng.IntN(n + 1) // == n: no point
	for i := range n {
		if i == dot {
			b.WriteByte('.')
		}
		b.WriteByte(byte('0' + rng.IntN(10)))
	}
	return b.String()
}

// checkPlainAgainstStrconv checks a fast-path reading of s against
// strconv.ParseFloat and the count of digits after the point.
func checkPlainAgainstStrconv(t *testing.T, s string, v float64, dec int) {
	t.Helper()
	want, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("plainNumeral(%q) took a text strconv.ParseFloat refuses: %v", s, err)
	}
	wantDec := 0
	if i := strings.IndexByte(s, '.'); i >= 0 {
		wantDec = len(s) - i - 1
	}
	if math.Float64bits(v) != math.Float64bits(want) || dec != wantDec {
		t.Fatalf("plainNumeral(%q) = %v (bits %x), %d decimals, want strconv's %v (bits %x), %d", s, v, math.Float64bits(v), dec, want, math.Float64bits(want), wantDec)
	}
}

// samePrinted compares every field, the value by its bits (so that −0 and
// 0 differ).
func samePrinted(a, b Printed) bool {
	if math.Float64bits(a.Value) != math.Float64bits(b.Value) {
		return false
	}
	a.Value, b.Value = 0, 0
	return a == b
}

// FuzzPlainNumeral checks that the fast path and the general path read
// every cell the same way.
func FuzzPlainNumeral(f *testing.F) {
	for _, s := range numeralCases {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, mode := range []numberMode{numberGeneral, numberCount, numberLimit} {
			got, gotErr := parsePrinted(s, mode, ErrMalformedNumber)
			want, wantErr := parsePrintedGeneral(s, mode, ErrMalformedNumber)
			if !samePrinted(got, want) || !reflect.DeepEqual(gotErr, wantErr) {
				t.Fatalf("parsePrinted(%q, %d) = %+v, %v, want the general path's %+v, %v", s, mode, got, gotErr, want, wantErr)
			}
		}
		for _, kind := range []numberKind{kindNumber, kindLimit, kindCount, kindP} {
			got, gotErr := cellNumber(sheetCell{Text: s}, kind)
			want, wantErr := cellNumberGeneral(sheetCell{Text: s}, kind)
			if !samePrinted(got, want) || !reflect.DeepEqual(gotErr, wantErr) {
				t.Fatalf("cellNumber(%q, %d) = %+v, %v, want the general path's %+v, %v", s, kind, got, gotErr, want, wantErr)
			}
		}
		if v, dec, ok := plainNumeral(s); ok {
			checkPlainAgainstStrconv(t, s, v, dec)
		}
	})
}
