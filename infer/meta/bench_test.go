package meta_test

import (
	"testing"

	"coefaudit/infer/meta"
)

func BenchmarkAnalyzeBCG(b *testing.B) {
	studies := bcgLogRiskRatios()
	for b.Loop() {
		if _, err := meta.Analyze(studies, meta.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkTau2REML(b *testing.B) {
	studies := bcgLogRiskRatios()
	for b.Loop() {
		if _, err := meta.Tau2REML(studies, meta.REMLOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkLeaveOneOut is the leave-one-out analysis of a topic of 10,000
// invented studies with τ² = 0.02, by REML and by DerSimonian–Laird.
func BenchmarkLeaveOneOut(b *testing.B) {
	studies := randomStudies(10000, 0.02, 5)
	for _, method := range []meta.Tau2Method{meta.RestrictedMaximumLikelihood, meta.DerSimonianLaird} {
		b.Run(method.String(), func(b *testing.B) {
			for b.Loop() {
				if _, err := meta.LeaveOneOut(studies, meta.Options{Method: method}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
