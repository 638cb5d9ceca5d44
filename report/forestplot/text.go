package forestplot

import (
	"math"
	"strconv"
	"strings"
	"unicode"

	"coefaudit/audit"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
)

// boundText prints a bound or estimate for the figures column, with
// symbols for what is not a finite number.
func boundText(x float64, decimals int) string {
	switch {
	case math.IsNaN(x):
		return "?"
	case math.IsInf(x, 1):
		return "∞"
	case math.IsInf(x, -1):
		return "−∞"
	case math.Abs(x) >= 1e6:
		return strings.Replace(strconv.FormatFloat(x, 'g', 4, 64), "-", "−", 1)
	}
	return formatNumber(x, decimals)
}

// formatNumber prints x as the reports do (audit.FormatFixed: no "-0"),
// with a typographic minus.
func formatNumber(x float64, decimals int) string {
	return strings.Replace(audit.FormatFixed(x, decimals), "-", "−", 1)
}

// cleanText makes a label safe to draw and to put into XML: valid UTF-8,
// no control characters, single spaces.
func cleanText(s string) string {
	s = strings.ToValidUTF8(s, "\uFFFD")
	s = strings.Map(func(r rune) rune {
		if unicode.IsControl(r) || !unicode.IsPrint(r) && !unicode.IsSpace(r) {
			return ' '
		}
		return r
	}, s)
	return strings.Join(strings.Fields(s), " ")
}

// fitText shortens s with an ellipsis until it fits in width.
func fitText(s string, f font.Face, width vg.Length) string {
	if f.Width(s) <= width {
		return s
	}
	r := []rune(s)
	lo, hi := 0, len(r) // the longest prefix that fits, by bisection
	for lo < hi {
		mid := (lo + hi + 1) / 2
		if f.Width(strings.TrimRight(string(r[:mid]), " ")+"…") <= width {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	return strings.TrimRight(string(r[:lo]), " ") + "…"
}

// wrapText breaks s into lines no wider than width, shortening any single
// word that is wider on its own.
func wrapText(s string, f font.Face, width vg.Length) []string {
	var lines []string
	line := ""
	for _, w := range strings.Fields(s) {
		switch {
		case line == "":
			line = fitText(w, f, width)
		case f.Width(line+" "+w) <= width:
			line += " " + w
		default:
			lines = append(lines, line)
			line = fitText(w, f, width)
		}
	}
	if line != "" {
		lines = append(lines, line)
	}
	return lines
}
