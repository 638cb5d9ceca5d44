package extract

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"sync/atomic"

	"coefaudit/infer"
)

// ErrNoStandardError is returned when nothing printed gives a standard error.
var ErrNoStandardError = errors.New("no standard error can be reconstructed")

// Scales on which a coefficient is analysed.
const (
	ScaleAsPrinted = "as printed"
	ScaleLog       = "log"
	ScaleFisherZ   = "Fisher z"
)

// Reconstructed is a coefficient on the scale it is analysed on (the log for
// ratio measures, Fisher's z for correlations), with the standard error
// rebuilt from what was printed and the ranges both can take within the
// rounding of the printed numbers.
type Reconstructed struct {
	Label, Measure string
	Scale          string
	Estimate       float64
	EstimateRange  infer.Range
	SE             float64
	SERange        infer.Range
	// SEFrom names the printed numbers the SE came from, e.g. "ci_low, ci_high (t, df 24)".
	SEFrom string
	// SEExactRange is false when SERange shares inputs with EstimateRange (an
	// SE from the estimate and its p or statistic), so that a p range built
	// from both is a safe outer bound rather than exact.
	SEExactRange bool
	// PrintedP is the two-sided p the SE was taken from, when it came from
	// the printed p (the bound, when only "< x" was printed, and then
	// PBelow is set), and NaN otherwise: the estimate's own p is then the
	// printed one, with no tail to compute.
	PrintedP float64
	PBelow   bool
	// text, when set, holds the text of the notes.
	text *TextChunks
	// DF is the df used for the t quantile, NaN when the normal was used.
	DF float64
	// N is the printed n, NaN when blank.
	N float64
	// Level is the printed interval's confidence level as a proportion.
	Level float64
	// CI is the printed interval on the analysis scale (NaN when not printed).
	CI [2]float64
	// Notes say how the SE was taken and what was assumed.
	Notes []string
}

// Reconstruct rebuilds a coefficient's SE from what was printed, trying in
// turn the printed SE, the interval, the t or z statistic and the p-value.
// modelSize is the number of coefficients of the same fitted model listed
// in the input; it is used to derive df = n − modelSize − 1 for regression
// coefficients when df was not printed.
//
// The t quantile is used when df is printed, or can be derived: n − 2 for a
// mean difference (two groups; Cochrane Handbook 5.1 §7.7.3.3), n − k − 1 for
// a regression coefficient of a model with k listed coefficients (an upper
// bound on the true df when covariates went unlisted). Ratio measures and
// correlations use the normal, as their intervals are large-sample Wald or
// Fisher-z intervals.
func Reconstruct(c *Coefficient, modelSize int) (Reconstructed, error) {
	var rc Reconstructed
	err := ReconstructInto(&rc, c, modelSize, nil)
	return rc, err
}

// ReconstructInto is Reconstruct writing into rc, whose Notes storage it
// reuses, with the text of the notes in text when it is not nil: a
// streamed audit rebuilds two coefficients a claim, and the Reconstructed
// (some 200 bytes) is then neither built nor copied out.
func ReconstructInto(rc *Reconstructed, c *Coefficient, modelSize int, text *TextChunks) error {
	*rc = Reconstructed{Label: c.Label, Measure: c.Measure, Scale: ScaleAsPrinted,
		DF: math.NaN(), N: math.NaN(), CI: [2]float64{math.NaN(), math.NaN()},
		PrintedP: math.NaN(), Notes: rc.Notes[:0], text: text}
	level := c.CILevel
	if level == 0 {
		level = DefaultCILevel
	}
	rc.Level = level / 100
	if !c.Estimate.IsExact() {
		return errNoEstimate
	}
	if c.N.IsExact() {
		rc.N = c.N.Value
	}
	switch {
	case IsRatioMeasure(c.Measure):
		rc.Scale = ScaleLog
	case c.Measure == MeasureR:
		rc.Scale = ScaleFisherZ
	}
	var err error
	rc.Estimate, rc.EstimateRange, err = rc.onScale(c.Measure, c.Estimate)
	if err != nil {
		return err
	}
	rc.DF = chooseDF(c, modelSize, rc)

	// The limits' rounding intervals on the scale, kept for fromInterval.
	var loR, hiR infer.Range
	if c.CI.Present() {
		lo, lr, err1 := rc.onScale(c.Measure, c.CI.Low)
		hi, hr, err2 := rc.onScale(c.Measure, c.CI.High)
		if err := errors.Join(err1, err2); err != nil {
			return err
		}
		rc.CI, loR, hiR = [2]float64{lo, hi}, lr, hr
	}

	switch {
	case c.Measure == MeasureR && rc.N > 3:
		// The sampling SD of Fisher's z is 1/√(n − 3) whatever else was
		// printed (Fisher 1921); it needs no rounding allowance.
		rc.SE = 1 / math.Sqrt(rc.N-3)
		rc.SERange = infer.Point(rc.SE)
		rc.SEFrom = "n (Fisher z)"
		rc.SEExactRange = true
	case c.SE.IsExact() && c.SE.Value > 0:
		rc.SE = c.SE.Value
		lo, hi := c.SE.RoundingInterval()
		rc.SERange = infer.Range{Lo: math.Max(lo, c.SE.Value*1e-3), Hi: hi}
		if lo <= 0 {
			rc.SERange.Lo = hi * 1e-3
		}
		rc.SEFrom = "se"
		rc.SEExactRange = true
		if rc.Scale != ScaleAsPrinted {
			rc.noteOnScale(c.Label, ": the printed SE is taken to be on the ")
		}
	case c.CI.Present():
		if err := rc.fromInterval(c, loR, hiR); err != nil {
			return err
		}
	case c.Stat.IsExact() && c.Stat.Value != 0:
		if rc.Estimate == 0 {
			where := "printed as " + c.Estimate.Text
			if rc.Scale != ScaleAsPrinted {
				where = c.Estimate.Text + ", 0 on the " + rc.Scale + " scale"
			}
			return fmt.Errorf("%w: the estimate is %s, so estimate/statistic gives an SE of 0", ErrNoStandardError, where)
		}
		rc.fromStatistic(c)
	case c.P.IsExact() || c.P.Bound == Below:
		if err := rc.fromP(c); err != nil {
			return err
		}
	default:
		if c.P.Bound == NotSignificant || c.P.Bound == Above {
			return fmt.Errorf("%w: only %q printed for p, which bounds nothing useful", ErrNoStandardError, c.P.Text)
		}
		return errNothingPrinted
	}
	return nil
}

// The two commonest reasons for no SE, made once: a file of a million rows
// may give one of them on every other row.
var (
	errNoEstimate     = fmt.Errorf("%w: no estimate printed", ErrNoStandardError)
	errNothingPrinted = fmt.Errorf("%w: no SE, interval, statistic or p-value printed", ErrNoStandardError)
)

// onScale puts a printed number and its rounding interval on the
// analysis scale (the identity, the log or Fisher's z).
func (rc *Reconstructed) onScale(measure string, p Printed) (float64, infer.Range, error) {
	lo, hi := p.RoundingInterval()
	v, a, b := rc.transform(p.Value), rc.transform(lo), rc.transform(hi)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, infer.Range{}, fmt.Errorf("%s %s cannot be put on the %s scale", measure, p.Text, rc.Scale)
	}
	// Rounding may push a limit past the scale's edge (a ratio printed as 0.00, r = 1.00).
	if math.IsNaN(a) || math.IsInf(a, 0) {
		a = v
	}
	if math.IsNaN(b) || math.IsInf(b, 0) {
		b = v
	}
	return v, infer.Range{Lo: a, Hi: b}, nil
}

// transform maps x to the analysis scale.
func (rc *Reconstructed) transform(x float64) float64 {
	switch rc.Scale {
	case ScaleLog:
		return math.Log(x)
	case ScaleFisherZ:
		return math.Atanh(x)
	}
	return x
}

// namedQuantile is what+" (normal)" or what+" (t, df 568)": the printed
// numbers an SE came from and the quantile it was scaled by. It builds the
// string that fmt.Sprintf("%s (t, df %g)", what, df) would, in one
// allocation; strconv's shortest 'g' format is what %g prints for a
// float64 (a test checks that they agree).
func namedQuantile(what string, df float64) string {
	if math.IsNaN(df) {
		for i, n := range quantileNames {
			if what == n {
				return normalQuantileNames[i] // the common ones, without allocating
			}
		}
		return what + " (normal)"
	}
	slot := quantileNameSlot(what, df)
	if slot != nil {
		if s := slot.Load(); s != nil {
			return *s
		}
	}
	s := textWithNumber(what, " (t, df ", df, ")")
	if slot != nil {
		slot.Store(&s)
	}
	return s
}

// quantileNames are the sources of an SE namedQuantile is most often asked
// to name; with a whole df up to maxNamedDF the name is made once and kept
// in a slot read without a lock, as the SE of nearly every row is named.
var quantileNames = [...]string{"ci_low, ci_high", "ci", "estimate, p", "estimate, p bound"}

// normalQuantileNames are the quantileNames with the normal quantile.
var normalQuantileNames = func() (names [len(quantileNames)]string) {
	for i, n := range quantileNames {
		names[i] = n + " (normal)"
	}
	return names
}()

const maxNamedDF = 4096

var quantileNameSlots [len(quantileNames)][maxNamedDF]atomic.Pointer[string]

func quantileNameSlot(what string, df float64) *atomic.Pointer[string] {
	d := int(df)
	if float64(d) != df || d < 1 || d > maxNamedDF {
		return nil
	}
	for i, n := range quantileNames {
		if what == n {
			return &quantileNameSlots[i][d-1]
		}
	}
	return nil
}

// smallDF is the df below which a derived df is worth a note: above it the
// t and normal quantiles differ by less than 2% (t(0.975, 100) = 1.984).
const smallDF = 100

// DerivesDFFromModelSize reports whether Reconstruct derives c's df from
// the number of coefficients listed for its model, as n − k − 1: a
// regression coefficient with n printed and no df. Only then does
// Reconstruct's modelSize matter, so a caller may skip counting otherwise.
func DerivesDFFromModelSize(c *Coefficient) bool {
	return !dfPrinted(c) && c.N.IsExact() && IsRegressionMeasure(c.Measure)
}

func dfPrinted(c *Coefficient) bool { return c.DF.IsExact() && c.DF.Value > 0 }

func chooseDF(c *Coefficient, modelSize int, rc *Reconstructed) float64 {
	if dfPrinted(c) {
		return c.DF.Value
	}
	n := c.N.Value
	switch {
	case c.Measure == MeasureMD && c.N.IsExact() && n > 2:
		if n-2 < smallDF {
			var buf [128]byte
			rc.note(appendTextWithNumber(buf[:0], c.Label, ": df taken as n − 2 = ", n-2, " (two groups)"))
		}
		return n - 2
	case DerivesDFFromModelSize(c):
		k := float64(max(modelSize, 1))
		if n-k-1 > 0 {
			if n-k-1 < smallDF {
				var buf [192]byte
				b := appendTextWithNumber(buf[:0], c.Label, ": df taken as n − k − 1 = ", n-k-1, " with the k = ")
				b = strconv.AppendFloat(b, k, 'g', -1, 64)
				rc.note(append(b, " coefficients listed for its model; unlisted covariates would lower it"...))
			}
			return n - k - 1
		}
	}
	return math.NaN()
}

// textWithNumber is head+mid+x+tail, with x as %g prints it, in one
// allocation: the names of SE sources are written for most rows.
func textWithNumber(head, mid string, x float64, tail string) string {
	var buf [128]byte
	return string(appendTextWithNumber(buf[:0], head, mid, x, tail))
}

// appendTextWithNumber appends head+mid+x+tail to b, with x as %g prints it.
func appendTextWithNumber(b []byte, head, mid string, x float64, tail string) []byte {
	b = append(append(b, head...), mid...)
	return append(strconv.AppendFloat(b, x, 'g', -1, 64), tail...)
}

// note appends b as a note, its text kept in rc.text when that is set.
func (rc *Reconstructed) note(b []byte) {
	rc.Notes = append(rc.Notes, rc.text.String(b))
}

// noteOnScale notes label+what+rc.Scale+" scale".
func (rc *Reconstructed) noteOnScale(label, what string) {
	var buf [128]byte
	b := append(append(append(buf[:0], label...), what...), rc.Scale...)
	rc.note(append(b, " scale"...))
}

// fromInterval takes the SE from the interval rc.CI, whose limits' rounding
// intervals on the analysis scale are loR and hiR.
func (rc *Reconstructed) fromInterval(c *Coefficient, loR, hiR infer.Range) error {
	lo, hi := rc.CI[0], rc.CI[1]
	if !(lo < hi) {
		return fmt.Errorf("%w: interval limits %s and %s are reversed or equal", ErrNoStandardError, c.CI.Low.Text, c.CI.High.Text)
	}
	crit, err := infer.CriticalValue(rc.Level, rc.DF)
	if err != nil {
		return fmt.Errorf("%w: %v", ErrNoStandardError, err)
	}
	rc.SE = (hi - lo) / (2 * crit)
	rc.SERange = infer.Range{Lo: math.Max(hiR.Lo-loR.Hi, 1e-3*(hi-lo)) / (2 * crit), Hi: (hiR.Hi - loR.Lo) / (2 * crit)}
	from := "ci_low, ci_high"
	if c.CI.OneCell {
		from = "ci"
	}
	rc.SEExactRange = true
	// An asymmetric interval is no error (bootstrap and profile intervals are
	// asymmetric): the range always covers the SE read from either half, and
	// an asymmetry beyond what rounding explains is noted.
	seLo, seHi := (rc.Estimate-lo)/crit, (hi-rc.Estimate)/crit
	if seLo > 0 && seHi > 0 {
		rc.SERange.Lo = math.Min(rc.SERange.Lo, math.Min(seLo, seHi))
		rc.SERange.Hi = math.Max(rc.SERange.Hi, math.Max(seLo, seHi))
	}
	slack := (rc.EstimateRange.Hi - rc.EstimateRange.Lo + loR.Hi - loR.Lo + hiR.Hi - hiR.Lo) / crit
	if math.Abs(seLo-seHi) > slack && seLo > 0 && seHi > 0 {
		scale := ""
		if rc.Scale != ScaleAsPrinted {
			scale = " on the " + rc.Scale + " scale"
		}
		rc.SEFrom = namedQuantile(from+", mean of the two half-widths", rc.DF)
		var buf [256]byte
		b := append(append(append(buf[:0], c.Label...), ": asymmetric interval"...), scale...)
		b = strconv.AppendFloat(append(b, " (SE "...), seLo, 'g', 4, 64)
		b = strconv.AppendFloat(append(b, " from the lower half, "...), seHi, 'g', 4, 64)
		rc.note(append(b, " from the upper); the SE is their mean and the p range covers both"...))
		return nil
	}
	rc.SEFrom = namedQuantile(from, rc.DF)
	return nil
}

func (rc *Reconstructed) fromStatistic(c *Coefficient) {
	rc.SE = math.Abs(rc.Estimate / c.Stat.Value)
	slo, shi := c.Stat.RoundingInterval()
	aLo, aHi := absRange(rc.EstimateRange)
	tLo, tHi := math.Min(math.Abs(slo), math.Abs(shi)), math.Max(math.Abs(slo), math.Abs(shi))
	if tLo <= 0 {
		tLo = tHi * 1e-3
	}
	rc.SERange = infer.Range{Lo: math.Max(aLo, 1e-3*math.Abs(rc.Estimate)) / tHi, Hi: aHi / tLo}
	rc.SEFrom = "estimate, stat"
	if rc.Scale != ScaleAsPrinted {
		rc.noteOnScale(c.Label, ": the statistic is taken to be estimate/SE on the ")
	}
}

func (rc *Reconstructed) fromP(c *Coefficient) error {
	q := func(p float64) (float64, error) {
		if math.IsNaN(rc.DF) {
			return infer.NormalZFromTwoSidedP(p)
		}
		return infer.StudentTFromTwoSidedP(p, rc.DF)
	}
	if rc.Estimate == 0 {
		return fmt.Errorf("%w: the estimate is 0, so its p-value fixes no scale", ErrNoStandardError)
	}
	aLo, aHi := absRange(rc.EstimateRange)
	if c.P.Bound == Below {
		qb, err := q(c.P.Value)
		if err != nil {
			return fmt.Errorf("%w: p %s: %v", ErrNoStandardError, c.P.Text, err)
		}
		rc.SE = math.Abs(rc.Estimate) / qb
		rc.SERange = infer.Range{Lo: rc.SE * 1e-6, Hi: aHi / qb}
		rc.SEFrom = namedQuantile("estimate, p bound", rc.DF)
		rc.PrintedP, rc.PBelow = c.P.Value, true
		var buf [160]byte
		b := strconv.AppendQuote(append(append(buf[:0], c.Label...), ": only "...), c.P.Text)
		b = strconv.AppendFloat(append(b, " was printed, so the SE "...), rc.SE, 'g', 4, 64)
		rc.note(append(b, " taken from it is the largest the bound allows"...))
		return nil
	}
	pq, err := q(c.P.Value)
	if err != nil || pq == 0 {
		return fmt.Errorf("%w: p %s gives no statistic", ErrNoStandardError, c.P.Text)
	}
	rc.SE = math.Abs(rc.Estimate) / pq
	plo, phi := c.P.RoundingInterval()
	plo = math.Max(plo, c.P.Value*1e-3)
	phi = math.Min(phi, 1)
	qHi, err1 := q(plo)
	qLo, err2 := q(phi)
	if err := errors.Join(err1, err2); err != nil {
		return fmt.Errorf("%w: p %s: %v", ErrNoStandardError, c.P.Text, err)
	}
	hi := math.Inf(1)
	if qLo > 0 {
		hi = aHi / qLo
	}
	rc.SERange = infer.Range{Lo: math.Max(aLo, 1e-3*math.Abs(rc.Estimate)) / qHi, Hi: hi}
	rc.SEFrom = namedQuantile("estimate, p", rc.DF)
	rc.PrintedP = c.P.Value
	return nil
}

// absRange returns the range of |x| for x in r.
func absRange(r infer.Range) (lo, hi float64) {
	if r.Contains(0) {
		return 0, math.Max(-r.Lo, r.Hi)
	}
	a, b := math.Abs(r.Lo), math.Abs(r.Hi)
	return math.Min(a, b), math.Max(a, b)
}
