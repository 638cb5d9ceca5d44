package pool

import (
	"fmt"
	"strings"

	"coefaudit/audit"
	"coefaudit/infer/meta"
)

// Why claims are left out of a pooling, and the notes on what was pooled.

// topicDecimals is how many decimals reports meant for people give a
// topic's numbers: the most that audit's precision rule gives any of its
// claims (ClaimResult.EstimateDecimals), so that a pooled value is shown
// as precisely as the claims it pools.
func topicDecimals(claims []audit.ClaimResult) int {
	d := audit.MinDecimals
	for i := range claims {
		d = max(d, claims[i].EstimateDecimals())
	}
	return d
}

// randomEffectsNotes says in our words what a random-effects fit warns
// of, naming only the intervals the report gives.
func randomEffectsNotes(re meta.RandomEffects) []string {
	var notes []string
	for _, w := range re.Warnings {
		if strings.HasPrefix(w, "REML: Fisher scoring") {
			notes = append(notes, "REML: Fisher scoring did not converge; τ² was found by bracketing the root of the REML score instead.")
		}
	}
	switch q := re.HartungKnappScale; {
	case q == 0:
		notes = append(notes, "Every difference equals the pooled estimate, so the HKSJ interval has zero width.")
	case q < 1 && re.HartungKnapp.High-re.HartungKnapp.Low < re.Wald.High-re.Wald.Low:
		notes = append(notes, fmt.Sprintf("The HKSJ interval is narrower than the Wald interval here (its scale q = %.2f is below 1), "+
			"as happens when few claims agree closely; the wider Wald interval is the safer reading (Röver, Knapp & Friede 2015).", q))
	}
	return notes
}

// otherKeyReason says why a claim of another measure or scale than the
// topic's majority is left out.
func otherKeyReason(k, major key) string {
	return fmt.Sprintf("it compares %s %s, but most usable claims of this topic compare %s %s; "+
		"differences of different measures or on different scales cannot be pooled",
		measureNoun(k.measure), scalePhrase(k.scale), measureNoun(major.measure), scalePhrase(major.scale))
}

// unusableReason says why a claim cannot be pooled whatever the topic's
// other claims, or returns "".
func unusableReason(c audit.ClaimResult) string {
	incomplete := func(r string) string {
		if c.Outcome != audit.Incomplete {
			return r
		}
		r = "its outcome is incomplete: " + r
		if len(c.Notes) > 0 {
			r += " (" + strings.TrimSuffix(c.Notes[0], ".") + ")"
		}
		return r
	}
	switch {
	case !c.PoolEstimate.Known():
		return incomplete("its difference could not be computed on a scale that can be pooled")
	case !c.PoolSE.Known():
		return incomplete("its difference has no standard error, so it cannot be weighted")
	case c.PoolSE <= 0:
		return "its difference has a standard error of 0, which would give it unlimited weight"
	case c.PoolScale == "":
		return "the scale of its difference is not known"
	}
	return ""
}

// independenceNotes warns about claims of one study pooled together: their
// differences share a sample or a paper's data, so they are not the
// independent estimates the model assumes and the pooled SE is too small.
func independenceNotes(usable []audit.ClaimResult) []string {
	rows := map[string][]string{}
	var order []string
	for _, c := range usable {
		if _, ok := rows[c.Study]; !ok {
			order = append(order, c.Study)
		}
		rows[c.Study] = append(rows[c.Study], fmt.Sprint(c.Row))
	}
	var notes []string
	for _, s := range order {
		if len(rows[s]) > 1 {
			notes = append(notes, fmt.Sprintf("Rows %s all come from study %s: the pooling treats their differences as independent, which they are not, so the pooled SE is too small.",
				strings.Join(rows[s], ", "), s))
		}
	}
	return notes
}
