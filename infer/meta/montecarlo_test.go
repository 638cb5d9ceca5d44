package meta_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"coefaudit/infer/meta"
)

// coverageBand99 returns the 99% normal-approximation band for the number
// of intervals covering the truth out of n when the true coverage is p:
// n p ± z_0.995 √(n p (1 − p)), z_0.995 = 2.5758293 (standard normal table).
func coverageBand99(n int, p float64) (lo, hi float64) {
	half := 2.5758293035489 * math.Sqrt(float64(n)*p*(1-p))
	return float64(n)*p - half, float64(n)*p + half
}

// coverageCounts simulates reps meta-analyses of k studies with the given
// within-study variances, true mean mu and between-study variance tau2, and
// counts how often each interval covers mu (and the DL prediction interval
// a new study's true effect).
type coverageCounts struct {
	hkDL, hkREML, hkDLTruncated, waldDL, waldREML, predDL int
}

func simulateCoverage(t *testing.T, rng *rand.Rand, reps int, variances []float64, mu, tau2 float64) coverageCounts {
	t.Helper()
	var c coverageCounts
	studies := make([]meta.Study, len(variances))
	covers := func(p meta.Pooled) bool { return p.Low <= mu && mu <= p.High }
	for range reps {
		for i, v := range variances {
			theta := mu + math.Sqrt(tau2)*rng.NormFloat64()
			studies[i] = meta.Study{Effect: theta + math.Sqrt(v)*rng.NormFloat64(), Variance: v}
		}
		dl, err := meta.FitRandomEffects(studies, meta.DerSimonianLaird, meta.Options{})
		if err != nil {
			t.Fatalf("FitRandomEffects(DL) error: %v", err)
		}
		reml, err := meta.FitRandomEffects(studies, meta.RestrictedMaximumLikelihood, meta.Options{})
		if err != nil {
			t.Fatalf("FitRandomEffects(REML) error: %v", err)
		}
		truncated, _, err := meta.HartungKnapp(studies, dl.Tau2, 0.95, true)
		if err != nil {
			t.Fatalf("HartungKnapp(truncated) error: %v", err)
		}
		for _, x := range []struct {
			ok bool
			n  *int
		}{
			{covers(dl.HartungKnapp), &c.hkDL}, {covers(reml.HartungKnapp), &c.hkREML},
			{covers(truncated), &c.hkDLTruncated}, {covers(dl.Wald), &c.waldDL}, {covers(reml.Wald), &c.waldREML},
		} {
			if x.ok {
				*x.n++
			}
		}
		if newTheta := mu + math.Sqrt(tau2)*rng.NormFloat64(); dl.Prediction.Low <= newTheta && newTheta <= dl.Prediction.High {
			c.predDL++
		}
	}
	return c
}

func logCoverage(t *testing.T, reps int, c coverageCounts) {
	t.Helper()
	r := float64(reps)
	t.Logf("  HKSJ, DL tau2:           %.3f", float64(c.hkDL)/r)
	t.Logf("  HKSJ, REML tau2:         %.3f", float64(c.hkREML)/r)
	t.Logf("  HKSJ max(1,q), DL tau2:  %.3f", float64(c.hkDLTruncated)/r)
	t.Logf("  Wald, DL tau2:           %.3f", float64(c.waldDL)/r)
	t.Logf("  Wald, REML tau2:         %.3f", float64(c.waldREML)/r)
	t.Logf("  DL prediction interval:  %.3f (of a new study's true effect)", float64(c.predDL)/r)
}

// Simulation whose truth is set here: k = 10 studies with known
// within-study variances evenly spaced from 0.02 to 0.06, true mean μ = 0.2
// and τ² = 0.05 (I² about 0.6 at the true τ²). IntHout, Ioannidis & Borm
// (2014, BMC Med Res Methodol 14:25) report HKSJ close to nominal coverage
// where the DerSimonian–Laird Wald interval falls below it. The test asserts
// HKSJ (with DL and with REML τ²) within a 99% binomial band around 0.95
// and reports the others. With 40000 replications of this design (seed
// PCG(1, 2), run once while writing this test) HKSJ/DL covered 0.9465 and
// Wald/DL 0.919; at the true τ² both are exact (0.949).
func TestCoverageMonteCarlo(t *testing.T) {
	const reps = 1000
	variances := make([]float64, 10)
	for i := range variances {
		variances[i] = 0.02 + 0.04*float64(i)/9
	}
	rng := rand.New(rand.NewPCG(20140225, 14))
	c := simulateCoverage(t, rng, reps, variances, 0.2, 0.05)
	lo, hi := coverageBand99(reps, 0.95)
	t.Logf("coverage of mu in %d replications, v from 0.02 to 0.06 (99%% band for 0.95: %.0f to %.0f):", reps, lo, hi)
	logCoverage(t, reps, c)
	if n := float64(c.hkDL); n < lo || n > hi {
		t.Errorf("HKSJ (DL tau2) covered mu %d times in %d, want within [%.0f, %.0f]", c.hkDL, reps, lo, hi)
	}
	if n := float64(c.hkREML); n < lo || n > hi {
		t.Errorf("HKSJ (REML tau2) covered mu %d times in %d, want within [%.0f, %.0f]", c.hkREML, reps, lo, hi)
	}
	if c.waldDL >= c.hkDL {
		t.Errorf("Wald (DL) covered mu %d times, HKSJ (DL) %d; want Wald below HKSJ in this design", c.waldDL, c.hkDL)
	}
}

// A known limitation, reported and not asserted: with within-study
// variances spread tenfold (0.01 to 0.10) HKSJ with an estimated τ² falls
// below nominal (0.935 in 40000 replications while writing this test),
// though still well above the DL Wald interval (0.909).
func TestCoverageMonteCarloUnequalVariances(t *testing.T) {
	const reps = 1000
	variances := make([]float64, 10)
	for i := range variances {
		variances[i] = 0.01 * float64(i+1)
	}
	rng := rand.New(rand.NewPCG(20140225, 15))
	c := simulateCoverage(t, rng, reps, variances, 0.2, 0.05)
	t.Logf("coverage of mu in %d replications, v from 0.01 to 0.10 (report only):", reps)
	logCoverage(t, reps, c)
}
