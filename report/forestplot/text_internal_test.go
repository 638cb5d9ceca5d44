package forestplot

import "testing"

// TestIssue20TextSize: every type size is at least MinTextPoints (8 pt) at
// the plot's printed size, and the printed width fits a page. 8 pt is the
// smallest type journals' figure guidelines commonly accept (common
// practice, no source).
func TestIssue20TextSize(t *testing.T) {
	faces := map[string]float64{"title": titleFace.Font.Size.Points(), "head": headFace.Font.Size.Points(),
		"body": bodyFace.Font.Size.Points(), "pooled": pooledFace.Font.Size.Points(),
		"tick": tickFace.Font.Size.Points(), "note": noteFace.Font.Size.Points()}
	for name, pt := range faces {
		if pt < MinTextPoints {
			t.Errorf("%s face is %v pt, want at least %v pt at print size", name, pt, MinTextPoints)
		}
	}
	if w := Width.Points() / 72; w > 7.5 {
		t.Errorf("Width = %v in, want at most 7.5 in, the text width of a page", w)
	}
}
