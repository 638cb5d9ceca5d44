package extract

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// A plain numeral (an ASCII sign, digits, at most one decimal point with
// digits after it) is read as the Go standard library's strconv.ParseFloat
// reads it, which rounds correctly (IEEE 754 round to nearest even), with
// its decimals counted as written; other cells are generated around it so
// that every reader of numbers sees the pieces papers print.

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
	case 1: // long runs of digits, around the 15 a float64 holds exactly
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

// numeralCases are fixed cells at the edges of a plain numeral.
var numeralCases = []string{
	"", " ", "0", "-0", "+0", "0.0", "-0.00", "0.43", "-0.22", "570", ".43", "-.5", "+.5",
	"43.", "-", "+", ".", "-.", "1.2.3", "007", "00.5", "1e5", "0.43*", "−0.43", "0,43",
	"1,234", "1.234", "999999999999999", "9999999999999999", "0.000000000000001",
	"0.0000000000000001", "123456789012345", "1234567890123456", "-999999999999999",
	"99999999999999.9", "9007199254740993", "0.1", "0.3", "2.675", "1.005", "1", "1.0",
	" 0.43", "0.43 ", "\u00a00.43", "0.43\u00a0", "p = .03", "<.001", "ns", "1.5", "0.5",
	"1", "1.01", "-1", "2", "0x10", "1_000", "Inf", "NaN", "+-1", "-+1", "--1",
}

// TestPlainNumeralsAsStrconv checks every reader of a number (ParseNumber,
// ParseCount, ParseP, the interval limits, a cell of each kind) on plain
// numerals against strconv.ParseFloat, the value bit for bit and the
// decimals as written, and that each reads the other generated cells
// without panicking.
func TestPlainNumeralsAsStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(2024, 11))
	texts := append([]string(nil), numeralCases...)
	for range 30000 {
		texts = append(texts, generatedNumeral(rng))
	}
	for range 20000 {
		texts = append(texts, plainOnly(rng))
	}
	plain := 0
	for _, s := range texts {
		readers := numberReaders(s)
		want, wantDec, ok := strconvPlain(trimSpace(s))
		if !ok {
			continue
		}
		plain++
		for name, read := range readers {
			if name == "p" && !(want >= 0 && want <= 1) {
				continue // not a p-value: refused, as TestParseP checks
			}
			checkAgainstStrconv(t, name, s, read, want, wantDec)
		}
	}
	// Both kinds of cell must have been generated, or the check says little.
	if plain < len(texts)/5 || plain > len(texts)*4/5 {
		t.Errorf("%d of %d cells are plain numerals, want between a fifth and four fifths", plain, len(texts))
	}
}

// numberReaders reads s with every reader of a number, by name.
func numberReaders(s string) map[string]func() (Printed, error) {
	return map[string]func() (Printed, error){
		"number":     func() (Printed, error) { return ParseNumber(s) },
		"count":      func() (Printed, error) { return ParseCount(s) },
		"p":          func() (Printed, error) { return ParseP(s) },
		"limit":      func() (Printed, error) { return parsePrinted(s, numberLimit, ErrMalformedInterval) },
		"cell":       func() (Printed, error) { return cellNumber(sheetCell{Text: s}, kindNumber) },
		"cell limit": func() (Printed, error) { return cellNumber(sheetCell{Text: s}, kindLimit) },
		"cell count": func() (Printed, error) { return cellNumber(sheetCell{Text: s}, kindCount) },
	}
}

// strconvPlain reads s with strconv.ParseFloat when it is a plain numeral,
// counting the digits after the point.
func strconvPlain(s string) (v float64, decimals int, ok bool) {
	body := strings.TrimLeft(s, "+-")
	if len(s)-len(body) > 1 || body == "" || strings.Count(body, ".") > 1 || strings.HasSuffix(body, ".") {
		return 0, 0, false
	}
	if strings.Trim(body, "0123456789.") != "" || strings.Trim(body, ".") == "" {
		return 0, 0, false
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, 0, false
	}
	if i := strings.IndexByte(body, '.'); i >= 0 {
		decimals = len(body) - i - 1
	}
	return v, decimals, true
}

// plainOnly generates a plain numeral: a sign, up to 20 digits (past the
// 15 whose integer a float64 holds exactly) and perhaps a decimal point
// among them.
func plainOnly(rng *rand.Rand) string {
	var b strings.Builder
	b.WriteString([]string{"", "-", "+"}[rng.IntN(3)])
	n := 1 + rng.IntN(20)
	dot := rng.IntN(n + 1) // == n: no point
	for i := range n {
		if i == dot {
			b.WriteByte('.')
		}
		b.WriteByte(byte('0' + rng.IntN(10)))
	}
	return b.String()
}

// checkAgainstStrconv checks a reader's reading of the plain numeral s
// against strconv's value want and its decimals.
func checkAgainstStrconv(t *testing.T, name, s string, read func() (Printed, error), want float64, wantDec int) {
	t.Helper()
	got, err := read()
	if err != nil {
		t.Fatalf("%s reader of %q: %v, want strconv's %v", name, s, err, want)
	}
	if math.Float64bits(got.Value) != math.Float64bits(want) || int(got.Decimals) != wantDec || got.Bound != Exact {
		t.Fatalf("%s reader of %q = %v (bits %x), %d decimals, bound %v; want strconv's %v (bits %x), %d decimals",
			name, s, got.Value, math.Float64bits(got.Value), got.Decimals, got.Bound, want, math.Float64bits(want), wantDec)
	}
}

// FuzzPlainNumeral checks every reader of a number against
// strconv.ParseFloat on whatever plain numeral the fuzzer makes.
func FuzzPlainNumeral(f *testing.F) {
	for _, s := range numeralCases {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		readers := numberReaders(s)
		want, wantDec, ok := strconvPlain(trimSpace(s))
		if !ok {
			for _, read := range readers {
				read() // must not panic
			}
			return
		}
		for name, read := range readers {
			if name == "p" && !(want >= 0 && want <= 1) {
				continue
			}
			checkAgainstStrconv(t, name, s, read, want, wantDec)
		}
	})
}
