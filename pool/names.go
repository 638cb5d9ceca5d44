package pool

import (
	"fmt"
	"strings"

	"coefaudit/extract"
)

// The names pooling gives its scales, measures and topics.

func measureNoun(m string) string {
	switch m {
	case extract.MeasureB:
		return "regression coefficients (b)"
	case extract.MeasureBeta:
		return "standardized coefficients (beta)"
	case extract.MeasureR:
		return "correlations (r)"
	case extract.MeasureOR:
		return "odds ratios (or)"
	case extract.MeasureRR:
		return "risk ratios (rr)"
	case extract.MeasureHR:
		return "hazard ratios (hr)"
	case extract.MeasureMD:
		return "mean differences (md)"
	case "":
		return "coefficients of unknown measure"
	}
	return fmt.Sprintf("coefficients of measure %q", m)
}

func scalePhrase(scale string) string {
	switch scale {
	case extract.ScaleLog:
		return "on the log scale"
	case extract.ScaleFisherZ:
		return "on Fisher's z scale"
	case extract.ScaleAsPrinted:
		return "in their own units"
	}
	return fmt.Sprintf("on the %q scale", scale)
}

// scaleNote explains the pooling scale of a topic.
func scaleNote(k key) string {
	switch k.scale {
	case extract.ScaleLog:
		return "Ratio measures are pooled on the log scale: each difference is log(first ratio) − log(second ratio), " +
			"the log of the ratio of the two ratios; exp of a pooled value is a pooled ratio of ratios."
	case extract.ScaleFisherZ:
		return "Correlations are pooled on Fisher's z scale, z = atanh(r): each difference is z1 − z2, which is near normal " +
			"with a variance that does not depend on ρ (Fisher 1921), which is why it is pooled there. " +
			"The pooled value is a difference of z values, not of correlations r."
	case extract.ScaleAsPrinted:
		return fmt.Sprintf("The differences of %s are pooled in the coefficients' own units, so they are comparable only "+
			"if every study measured its variables in the same units.", measureNoun(k.measure))
	case "":
		return "No claim of this topic could be pooled, so it has no pooling scale."
	}
	return fmt.Sprintf("The differences are pooled on the %q scale.", k.scale)
}

// maxSlug bounds the length of a slug, to keep file names short.
const maxSlug = 60

// Slug returns the file-name form of a topic: lower case, every run of
// characters other than a–z and 0–9 replaced by one hyphen, no hyphen at
// either end, at most 60 characters; "topic" when nothing is left.
func Slug(topic string) string {
	var b strings.Builder
	hyphen := false
	for _, r := range strings.ToLower(topic) {
		if r >= 'a' && r <= 'z' || r >= '0' && r <= '9' {
			if hyphen && b.Len() > 0 {
				b.WriteByte('-')
			}
			hyphen = false
			b.WriteRune(r)
			continue
		}
		hyphen = true
	}
	s := b.String()
	if len(s) > maxSlug {
		s = strings.TrimRight(s[:maxSlug], "-")
	}
	if s == "" {
		return "topic"
	}
	return s
}

// uniqueSlug appends -2, -3, ... to a slug already taken.
func uniqueSlug(s string, taken map[string]bool) string {
	out := s
	for n := 2; taken[out]; n++ {
		out = fmt.Sprintf("%s-%d", s, n)
	}
	taken[out] = true
	return out
}
