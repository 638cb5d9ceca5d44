package extract

import "testing"

// TestIssue17PublishedWords: first-stronger and second-stronger were read
// as first-larger and second-larger, so a claim about magnitude was tested
// as a signed one. They are verdicts of their own now.
func TestIssue17PublishedWords(t *testing.T) {
	tests := []struct{ in, want string }{
		{"first-stronger", PublishedFirstStronger},
		{"Second stronger", PublishedSecondStronger},
		{"first_larger_magnitude", PublishedFirstStronger},
		{"first-greater", PublishedFirstLarger},
		{"second-larger", PublishedSecondLarger},
	}
	for _, tt := range tests {
		got, err := allowedValue("published", tt.in)
		if err != nil || got != tt.want {
			t.Errorf("allowedValue(published, %q) = %q, %v; want %q", tt.in, got, err, tt.want)
		}
	}
	if !IsMagnitudeVerdict(PublishedFirstStronger) || IsMagnitudeVerdict(PublishedFirstLarger) {
		t.Error("IsMagnitudeVerdict mixes signed and magnitude verdicts")
	}
}
