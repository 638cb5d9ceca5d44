package extract

import (
	"errors"
	"fmt"
	"math"
	"strconv"

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
// bound on the true df when covariates went unlisted). Where that derived
// df is not positive (n ≤ 2 for a mean difference, n ≤ k + 1 for a
// regression coefficient) no t quantile exists: an interval or p-value is
// not read, with an ErrNoStandardError naming n and k, while a printed SE
// or statistic, which needs no quantile, is used with a note. An n of 2 or
// fewer is noted whatever the measure. Ratio measures and correlations use
// the normal, as their intervals are large-sample Wald or Fisher-z
// intervals. The SE itself, and the SEs at the ends of its rounding
// range, are infer's: StandardErrorFromCI, StandardErrorsFromHalfWidths,
// StandardErrorFromStatistic and StandardErrorFromP.
func Reconstruct(c *Coefficient, modelSize int) (Reconstructed, error) {
	rc := Reconstructed{Label: c.Label, Measure: c.Measure, Scale: ScaleAsPrinted,
		DF: math.NaN(), N: math.NaN(), CI: [2]float64{math.NaN(), math.NaN()},
		PrintedP: math.NaN()}
	level := c.CILevel
	if level == 0 {
		level = DefaultCILevel
	}
	rc.Level = level / 100
	if !c.Estimate.IsExact() {
		return rc, errNoEstimate
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
		return rc, err
	}
	var noT error
	rc.DF, noT = rc.chooseDF(c, modelSize)

	// The limits' rounding intervals on the scale, kept for fromInterval.
	var loR, hiR infer.Range
	if c.CI.Present() {
		lo, lr, err1 := rc.onScale(c.Measure, c.CI.Low)
		hi, hr, err2 := rc.onScale(c.Measure, c.CI.High)
		if err := errors.Join(err1, err2); err != nil {
			return rc, err
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
			rc.Notes = append(rc.Notes, fmt.Sprintf("%s: the printed SE is taken to be on the %s scale", c.Label, rc.Scale))
		}
	case c.CI.Present() && noT != nil:
		err = fmt.Errorf("%w: %w, so its interval cannot be read on a t basis", ErrNoStandardError, noT)
	case c.CI.Present():
		err = rc.fromInterval(c, loR, hiR)
	case c.Stat.IsExact() && c.Stat.Value != 0:
		err = rc.fromStatistic(c)
	case (c.P.IsExact() || c.P.Bound == Below) && noT != nil:
		err = fmt.Errorf("%w: %w, so its p-value cannot be read on a t basis", ErrNoStandardError, noT)
	case c.P.IsExact() || c.P.Bound == Below:
		err = rc.fromP(c)
	case c.P.Bound == NotSignificant || c.P.Bound == Above:
		err = fmt.Errorf("%w: only %q printed for p, which bounds nothing useful", ErrNoStandardError, c.P.Text)
	default:
		err = errNothingPrinted
	}
	if err != nil {
		return rc, err
	}
	if noT != nil {
		// A printed SE or statistic needs no quantile.
		rc.Notes = append(rc.Notes, fmt.Sprintf("%s: %v: no t test is possible, so its own p uses the normal", c.Label, noT))
	}
	if c.N.IsExact() && c.N.Value <= 2 {
		rc.Notes = append(rc.Notes, fmt.Sprintf("%s: n = %g: a sample of 2 or fewer leaves no df for an SE on a t basis; check the printed n", c.Label, c.N.Value))
	}
	return rc, nil
}

// The two commonest reasons for no SE.
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
// numbers an SE came from and the quantile it was scaled by.
func namedQuantile(what string, df float64) string {
	if math.IsNaN(df) {
		return what + " (normal)"
	}
	return what + " (t, df " + strconv.FormatFloat(df, 'g', -1, 64) + ")" // df as %g prints it
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

// chooseDF returns the df of c's t quantile, NaN for the normal, noting a
// small df it derived. Where the df derived from n is not positive (a t
// quantile needs at least one), it returns NaN and, as noT, why no t
// quantile can be had, naming n and k.
func (rc *Reconstructed) chooseDF(c *Coefficient, modelSize int) (df float64, noT error) {
	if dfPrinted(c) {
		return c.DF.Value, nil
	}
	n := c.N.Value
	switch {
	case c.Measure == MeasureMD && c.N.IsExact():
		if n-2 <= 0 {
			return math.NaN(), fmt.Errorf("n = %g leaves n − 2 = %g df for a mean difference", n, n-2)
		}
		if n-2 < smallDF {
			rc.Notes = append(rc.Notes, fmt.Sprintf("%s: df taken as n − 2 = %g (two groups)", c.Label, n-2))
		}
		return n - 2, nil
	case DerivesDFFromModelSize(c):
		k := float64(max(modelSize, 1))
		if n-k-1 <= 0 {
			return math.NaN(), fmt.Errorf("n = %g with the k = %g coefficients listed for its model leaves n − k − 1 = %g df", n, k, n-k-1)
		}
		if n-k-1 < smallDF {
			rc.Notes = append(rc.Notes, fmt.Sprintf("%s: df taken as n − k − 1 = %g with the k = %g coefficients listed for its model; unlisted covariates would lower it",
				c.Label, n-k-1, k))
		}
		return n - k - 1, nil
	}
	return math.NaN(), nil
}

// fromInterval takes the SE from the interval rc.CI, whose limits' rounding
// intervals on the analysis scale are loR and hiR. The SE range runs from
// the SE of the narrowest interval the printed limits allow to that of the
// widest, and always covers the SE read from either half.
func (rc *Reconstructed) fromInterval(c *Coefficient, loR, hiR infer.Range) error {
	lo, hi := rc.CI[0], rc.CI[1]
	se, err := infer.StandardErrorFromCI(lo, hi, rc.Level, rc.DF)
	if errors.Is(err, infer.ErrInterval) {
		return fmt.Errorf("%w: interval limits %s and %s are reversed or equal", ErrNoStandardError, c.CI.Low.Text, c.CI.High.Text)
	}
	if err != nil {
		return fmt.Errorf("%w: %w", ErrNoStandardError, err)
	}
	// Limits printed so coarsely that they may meet (the narrowest interval
	// is empty) still bound the SE away from 0: at least a thousandth of it.
	floor := 1e-3 * se
	narrow, err := infer.StandardErrorFromCI(loR.Hi, hiR.Lo, rc.Level, rc.DF)
	if err != nil {
		narrow = floor
	}
	wide, _ := infer.StandardErrorFromCI(loR.Lo, hiR.Hi, rc.Level, rc.DF)
	rc.SE = se
	rc.SERange = infer.Range{Lo: math.Max(narrow, floor), Hi: wide}
	rc.SEExactRange = true
	from := "ci_low, ci_high"
	if c.CI.OneCell {
		from = "ci"
	}
	// An asymmetric interval is no error (bootstrap and profile intervals are
	// asymmetric): the range always covers the SE read from either half, and
	// an asymmetry beyond what rounding explains is noted.
	seLo, seHi, _ := infer.StandardErrorsFromHalfWidths(rc.Estimate, lo, hi, rc.Level, rc.DF)
	if !(seLo > 0 && seHi > 0) {
		rc.SEFrom = namedQuantile(from, rc.DF)
		return nil
	}
	rc.SERange.Lo = math.Min(rc.SERange.Lo, math.Min(seLo, seHi))
	rc.SERange.Hi = math.Max(rc.SERange.Hi, math.Max(seLo, seHi))
	// The two halves differ by |2 estimate − low − high|, which the
	// rounding of the estimate and the limits can move by at most the sum
	// of their rounding widths.
	slack := rc.EstimateRange.Hi - rc.EstimateRange.Lo + loR.Hi - loR.Lo + hiR.Hi - hiR.Lo
	if math.Abs((rc.Estimate-lo)-(hi-rc.Estimate)) <= slack {
		rc.SEFrom = namedQuantile(from, rc.DF)
		return nil
	}
	scale := ""
	if rc.Scale != ScaleAsPrinted {
		scale = " on the " + rc.Scale + " scale"
	}
	rc.SEFrom = namedQuantile(from+", mean of the two half-widths", rc.DF)
	rc.Notes = append(rc.Notes, fmt.Sprintf("%s: asymmetric interval%s (SE %.4g from the lower half, %.4g from the upper); the SE is their mean and the p range covers both",
		c.Label, scale, seLo, seHi))
	return nil
}

// fromStatistic takes the SE as estimate/statistic, the statistic's sign
// ignored (papers often drop it). Its range runs over the rounding of both.
func (rc *Reconstructed) fromStatistic(c *Coefficient) error {
	if rc.Estimate == 0 {
		where := "printed as " + c.Estimate.Text
		if rc.Scale != ScaleAsPrinted {
			where = c.Estimate.Text + ", 0 on the " + rc.Scale + " scale"
		}
		return fmt.Errorf("%w: the estimate is %s, so estimate/statistic gives an SE of 0", ErrNoStandardError, where)
	}
	se, err := infer.StandardErrorFromStatistic(rc.Estimate, c.Stat.Value, true)
	if err != nil {
		return fmt.Errorf("%w: statistic %s: %w", ErrNoStandardError, c.Stat.Text, err)
	}
	slo, shi := c.Stat.RoundingInterval()
	aLo, aHi := absRange(rc.EstimateRange)
	tLo, tHi := math.Min(math.Abs(slo), math.Abs(shi)), math.Max(math.Abs(slo), math.Abs(shi))
	if tLo <= 0 {
		tLo = tHi * 1e-3
	}
	// The smallest |estimate| over the largest |statistic|, and the other
	// way round; an estimate that may round to 0 counts as a thousandth of
	// the printed one. Both are positive, so neither call fails.
	lo, _ := infer.StandardErrorFromStatistic(math.Max(aLo, 1e-3*math.Abs(rc.Estimate)), tHi, true)
	hi, _ := infer.StandardErrorFromStatistic(aHi, tLo, true)
	rc.SE, rc.SERange = se, infer.Range{Lo: lo, Hi: hi}
	rc.SEFrom = "estimate, stat"
	if rc.Scale != ScaleAsPrinted {
		rc.Notes = append(rc.Notes, fmt.Sprintf("%s: the statistic is taken to be estimate/SE on the %s scale", c.Label, rc.Scale))
	}
	return nil
}

// fromP takes the SE from the estimate and its two-sided p, or from the
// bound of "p < x", which gives the largest SE the bound allows.
func (rc *Reconstructed) fromP(c *Coefficient) error {
	if rc.Estimate == 0 {
		return fmt.Errorf("%w: the estimate is 0, so its p-value fixes no scale", ErrNoStandardError)
	}
	aLo, aHi := absRange(rc.EstimateRange)
	if c.P.Bound == Below {
		se, err := infer.StandardErrorFromP(rc.Estimate, c.P.Value, rc.DF)
		if err != nil {
			return fmt.Errorf("%w: p %s: %w", ErrNoStandardError, c.P.Text, err)
		}
		// At the same p the SE is proportional to |estimate|: the largest
		// estimate the rounding allows gives the largest SE.
		hi := se * aHi / math.Abs(rc.Estimate)
		rc.SE, rc.SERange = se, infer.Range{Lo: se * 1e-6, Hi: hi}
		rc.SEFrom = namedQuantile("estimate, p bound", rc.DF)
		rc.PrintedP, rc.PBelow = c.P.Value, true
		rc.Notes = append(rc.Notes, fmt.Sprintf("%s: only %q was printed, so the SE %.4g taken from it is the largest the bound allows", c.Label, c.P.Text, se))
		return nil
	}
	se, err := infer.StandardErrorFromP(rc.Estimate, c.P.Value, rc.DF)
	if err != nil || math.IsInf(se, 1) {
		return fmt.Errorf("%w: p %s gives no statistic", ErrNoStandardError, c.P.Text)
	}
	// The smallest |estimate| with the smallest p, and the largest with the
	// largest p (up to 1, where the SE is unbounded).
	plo, phi := c.P.RoundingInterval()
	plo = math.Max(plo, c.P.Value*1e-3)
	phi = math.Min(phi, 1)
	lo, err1 := infer.StandardErrorFromP(math.Max(aLo, 1e-3*math.Abs(rc.Estimate)), plo, rc.DF)
	hi, err2 := infer.StandardErrorFromP(aHi, phi, rc.DF)
	if err := errors.Join(err1, err2); err != nil {
		return fmt.Errorf("%w: p %s: %w", ErrNoStandardError, c.P.Text, err)
	}
	rc.SE, rc.SERange = se, infer.Range{Lo: lo, Hi: hi}
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
