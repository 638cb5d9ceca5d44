package pool_test

import (
	"strings"
	"testing"

	"coefaudit/pool"
)

func TestSlug(t *testing.T) {
	tests := []struct{ in, want string }{
		{"Anxiety & sleep", "anxiety-sleep"},
		{"  --Sex differences: BMI (2020)--", "sex-differences-bmi-2020"},
		{"Élan vital", "lan-vital"},
		{"???", "topic"},
		{"../../etc/passwd", "etc-passwd"},
		{strings.Repeat("ab ", 40), strings.TrimRight(strings.Repeat("ab-", 20), "-")},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			if got := pool.Slug(tt.in); got != tt.want {
				t.Errorf("Slug(%q) = %q, want %q", tt.in, got, tt.want)
			}
		})
	}
}
