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
