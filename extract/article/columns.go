package article

import (
	"regexp"
	"strings"

	"coefaudit/extract"
)

// Column roles of a regression table.
const (
	roleEstimate = "estimate"
	roleSE       = "se"
	roleStat     = "stat"
	roleP        = "p"
	roleCI       = "ci"
	roleCILow    = "ci_low"
	roleCIHigh   = "ci_high"
	roleWald     = "wald"
	roleMean     = "mean"
	roleSD       = "sd"
	roleMeanSD   = "mean_sd"
	roleN        = "n"
)

// column is what a header says of one column.
type column struct {
	role    string
	measure string // of an estimate column
	// paren is what a parenthesis after the estimate holds by the header
	// ("b (SE)": "se"; "OR (95% CI)": "ci"), "" when the header says none.
	paren string
	// group is the text of the header rows above the lowest, or the
	// model heading itself ("(2)", "Model 2").
	group string
	// head is the column's whole header text, for places.
	head  string
	level string // the CI level the header prints ("95")
}

// estimateWords maps a header, folded (fold), to the measure its
// estimates are. The names are the statistics trade's usual column heads.
var estimateWords = map[string]string{
	"b": extract.MeasureB, "coef": extract.MeasureB, "coefficient": extract.MeasureB, "estimate": extract.MeasureB,
	"est": extract.MeasureB, "unstandardized b": extract.MeasureB, "unstandardised b": extract.MeasureB, "b coefficient": extract.MeasureB,
	"β": extract.MeasureBeta, "beta": extract.MeasureBeta, "std β": extract.MeasureBeta, "standardized β": extract.MeasureBeta,
	"standardised β": extract.MeasureBeta, "standardized beta": extract.MeasureBeta, "std beta": extract.MeasureBeta, "std coef": extract.MeasureBeta,
	"or": extract.MeasureOR, "aor": extract.MeasureOR, "odds ratio": extract.MeasureOR, "adjusted or": extract.MeasureOR, "exp(b)": extract.MeasureOR,
	"hr": extract.MeasureHR, "ahr": extract.MeasureHR, "hazard ratio": extract.MeasureHR, "adjusted hr": extract.MeasureHR,
	"rr": extract.MeasureRR, "irr": extract.MeasureRR, "risk ratio": extract.MeasureRR, "relative risk": extract.MeasureRR,
}

// otherWords maps a folded header to a role other than the estimate.
var otherWords = map[string]string{
	"se": roleSE, "s e": roleSE, "std error": roleSE, "standard error": roleSE, "se b": roleSE, "se(b)": roleSE, "se β": roleSE,
	"t": roleStat, "t value": roleStat, "z": roleStat, "z value": roleStat, "t statistic": roleStat,
	"wald": roleWald, "wald χ2": roleWald, "wald χ²": roleWald, "χ2": roleWald, "χ²": roleWald,
	"p": roleP, "p value": roleP, "p-value": roleP, "sig": roleP, "pr(>|t|)": roleP, "p>|t|": roleP, "p>|z|": roleP,
	"ci": roleCI, "95% ci": roleCI, "[95% ci]": roleCI, "(95% ci)": roleCI, "95% confidence interval": roleCI, "ci 95%": roleCI,
	"95% ci for b": roleCI, "99% ci": roleCI, "90% ci": roleCI,
	"ll": roleCILow, "lower": roleCILow, "lower bound": roleCILow, "lower limit": roleCILow, "lci": roleCILow, "lower 95% ci": roleCILow,
	"ul": roleCIHigh, "upper": roleCIHigh, "upper bound": roleCIHigh, "upper limit": roleCIHigh, "uci": roleCIHigh, "upper 95% ci": roleCIHigh,
	"m": roleMean, "mean": roleMean, "sd": roleSD, "s d": roleSD, "m (sd)": roleMeanSD, "mean (sd)": roleMeanSD,
	"n": roleN,
}

var (
	// estimateWithParen matches "b (SE)", "β (SE)", "OR (95% CI)", "B [95% CI]".
	estimateWithParen = regexp.MustCompile(`^(.+?)\s*[(\[]\s*(se|s e|95% ci|ci|99% ci|90% ci)\s*[)\]]$`)
	// modelHeading matches a model's own heading: "(1)", "Model 2", "Step 1", "M3".
	modelHeading = regexp.MustCompile(`(?i)^(?:\(\d{1,2}\)|(?:model|step)\s*\d{1,2}[a-z]?\b|m\d{1,2}\b)`)
	levelOf      = regexp.MustCompile(`(\d{2}(?:\.\d+)?)\s*%`)
)

// fold lowers a header, drops periods and stars and makes runs of space one.
func fold(s string) string {
	s = strings.ToLower(squeeze(s))
	s = strings.NewReplacer(".", "", "*", "", "–", "-", "\u00a0", " ").Replace(s)
	return strings.TrimSpace(squeeze(s))
}

// roleOf reads a column's lowest header text.
func roleOf(lowest string) column {
	h := fold(lowest)
	c := column{head: lowest}
	if m := levelOf.FindStringSubmatch(h); m != nil {
		c.level = m[1]
	}
	if m, ok := estimateWords[h]; ok {
		c.role, c.measure = roleEstimate, m
		return c
	}
	if m := estimateWithParen.FindStringSubmatch(h); m != nil {
		if meas, ok := estimateWords[m[1]]; ok {
			c.role, c.measure, c.paren = roleEstimate, meas, roleSE
			if strings.Contains(m[2], "ci") {
				c.paren = roleCI
			}
			return c
		}
	}
	if r, ok := otherWords[h]; ok {
		c.role = r
		return c
	}
	if modelHeading.MatchString(strings.TrimSpace(lowest)) {
		c.role, c.group = roleEstimate, strings.TrimSpace(lowest)
	}
	return c
}
