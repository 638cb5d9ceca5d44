package correlation_test

import (
	"errors"
	"math"
	"strings"
	"testing"

	"coefaudit/infer"
	"coefaudit/infer/correlation"
)

func TestValidation(t *testing.T) {
	good := derivedNonOverlapping
	notPD4 := correlation.NonOverlapping{JK: 0.9, HM: 0.9, JH: 0.9, JM: -0.9, KH: 0.9, KM: 0.9}
	tests := []struct {
		name string
		call func() error
		want error
	}{
		{"FisherZ r=1", func() error { _, err := correlation.FisherZ(1); return err }, correlation.ErrCorrelationRange},
		{"FisherZ r=NaN", func() error { _, err := correlation.FisherZ(math.NaN()); return err }, correlation.ErrCorrelationRange},
		{"FisherCI n=3", func() error { _, err := correlation.FisherCI(0.3, 3, 0.95); return err }, correlation.ErrSampleSize},
		{"FisherCI level=1", func() error { _, err := correlation.FisherCI(0.3, 30, 1); return err }, infer.ErrProbability},
		{"FisherCI level=0", func() error { _, err := correlation.FisherCI(0.3, 30, 0); return err }, infer.ErrProbability},
		{"CompareIndependent r2=-1.2", func() error {
			_, err := correlation.CompareIndependent(0.3, 30, -1.2, 40, 0.95)
			return err
		}, correlation.ErrCorrelationRange},
		{"CompareIndependent n2=2", func() error {
			_, err := correlation.CompareIndependent(0.3, 30, 0.2, 2, 0.95)
			return err
		}, correlation.ErrSampleSize},
		{"CompareIndependent level=NaN", func() error {
			_, err := correlation.CompareIndependent(0.3, 30, 0.2, 40, math.NaN())
			return err
		}, infer.ErrProbability},
		{"CompareOverlapping r(k,h)=1", func() error {
			_, err := correlation.CompareOverlapping(0.3, 0.2, 1, 30, 0.95)
			return err
		}, correlation.ErrCorrelationRange},
		{"CompareOverlapping n=3", func() error {
			_, err := correlation.CompareOverlapping(0.3, 0.2, 0.1, 3, 0.95)
			return err
		}, correlation.ErrSampleSize},
		// |R| = 1 − .81 − .81 − .81 + 2(.9)(−.9)(.9) = −2.888 < 0.
		{"CompareOverlapping |R|<0", func() error {
			_, err := correlation.CompareOverlapping(0.9, -0.9, 0.9, 30, 0.95)
			return err
		}, correlation.ErrNotPositiveDefinite},
		{"WilliamsT level=1.5", func() error { _, err := correlation.WilliamsT(0.3, 0.2, 0.1, 30, 1.5); return err }, infer.ErrProbability},
		{"SteigerZ |R|<0", func() error { _, err := correlation.SteigerZ(0.9, -0.9, 0.9, 30, 0.95); return err }, correlation.ErrNotPositiveDefinite},
		{"MengRosenthalRubinZ r(j,k)=NaN", func() error {
			_, err := correlation.MengRosenthalRubinZ(math.NaN(), 0.2, 0.1, 30, 0.95)
			return err
		}, correlation.ErrCorrelationRange},
		{"ZouOverlappingCI n=0", func() error { _, err := correlation.ZouOverlappingCI(0.3, 0.2, 0.1, 0, 0.95); return err }, correlation.ErrSampleSize},
		{"CompareNonOverlapping r(k,m)=-1", func() error {
			s := good
			s.KM = -1
			_, err := correlation.CompareNonOverlapping(s, 30, 0.95)
			return err
		}, correlation.ErrCorrelationRange},
		{"CompareNonOverlapping not PD", func() error {
			_, err := correlation.CompareNonOverlapping(notPD4, 30, 0.95)
			return err
		}, correlation.ErrNotPositiveDefinite},
		{"ZPF not PD", func() error { _, err := correlation.ZPF(notPD4, 30, 0.95); return err }, correlation.ErrNotPositiveDefinite},
		{"PearsonFilonZ n=3", func() error { _, err := correlation.PearsonFilonZ(good, 3, 0.95); return err }, correlation.ErrSampleSize},
		{"SteigerNonOverlappingZ level=-0.1", func() error {
			_, err := correlation.SteigerNonOverlappingZ(good, 30, -0.1)
			return err
		}, infer.ErrProbability},
		{"ZouNonOverlappingCI r(j,h)=2", func() error {
			s := good
			s.JH = 2
			_, err := correlation.ZouNonOverlappingCI(s, 30, 0.95)
			return err
		}, correlation.ErrCorrelationRange},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			err := tt.call()
			if !errors.Is(err, tt.want) {
				t.Errorf("%s: error = %v, want %v", tt.name, err, tt.want)
			}
		})
	}
}

func TestNotPositiveDefiniteMessage(t *testing.T) {
	// The message names the smallest eigenvalue, so that a reader sees how
	// far the printed correlations are from a possible matrix.
	_, err := correlation.CompareNonOverlapping(correlation.NonOverlapping{JK: 0.9, HM: 0.9, JH: 0.9, JM: -0.9, KH: 0.9, KM: 0.9}, 30, 0.95)
	if err == nil || !strings.Contains(err.Error(), "smallest eigenvalue -") {
		t.Errorf("CompareNonOverlapping(not PD) error = %v, want one naming a negative smallest eigenvalue", err)
	}
	_, err = correlation.CompareOverlapping(0.9, -0.9, 0.9, 30, 0.95)
	if err == nil || !strings.Contains(err.Error(), "|R| = -2.888") {
		t.Errorf("CompareOverlapping(0.9, -0.9, 0.9) error = %v, want one giving |R| = -2.888", err)
	}
}
