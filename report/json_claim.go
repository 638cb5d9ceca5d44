package report

import "coefaudit/audit"

// jsonClaim is one claim as the JSON contract (DESIGN.md) shows it. Its
// numbers are pointers, nil for a number that is not known (null), into the
// writer's jsonClaimBuffer: encoding/json writes a *float64 itself, but an
// audit.Number through its MarshalJSON and a second scan of what that
// returned, which kept BenchmarkCheckMillionJSON off its aim.
type jsonClaim struct {
	Study        string          `json:"study"`
	Claim        string          `json:"claim"`
	Row          int             `json:"row"`
	First        jsonSide        `json:"first"`
	Second       jsonSide        `json:"second"`
	Relation     string          `json:"relation"`
	Method       string          `json:"method"`
	Difference   *float64        `json:"difference"`
	DifferenceSE *float64        `json:"difference_se"`
	DifferenceCI [2]*float64     `json:"difference_ci"`
	Statistic    *float64        `json:"statistic"`
	DF           *float64        `json:"df"`
	P            *float64        `json:"p"`
	PRange       [2]*float64     `json:"p_range"`
	Published    string          `json:"published"`
	Recomputed   string          `json:"recomputed"`
	Outcome      string          `json:"outcome"`
	Notes        []string        `json:"notes"`
	Overlap      *jsonOverlap    `json:"overlap"`
	TippingCorr  []*float64      `json:"tipping_corr,omitempty"`
	Alternatives []jsonAlternate `json:"alternatives,omitempty"`
	AdjustedP    *jsonAdjusted   `json:"p_adjusted,omitempty"`
}

type jsonSide struct {
	Label    string   `json:"label"`
	Estimate *float64 `json:"estimate"`
	SE       *float64 `json:"se"`
	SEFrom   string   `json:"se_from"`
}

type jsonOverlap struct {
	Proportion *float64 `json:"proportion"`
	ImpliedP   *float64 `json:"implied_p"`
}

type jsonAlternate struct {
	Method    string   `json:"method"`
	Statistic *float64 `json:"statistic"`
	P         *float64 `json:"p"`
}

type jsonAdjusted struct {
	BH   *float64 `json:"bh"`
	Holm *float64 `json:"holm"`
}

// jsonClaimBuffer holds the claim being encoded and its numbers, so that
// its jsonClaim points into memory the writer keeps rather than into new
// allocations made for each claim.
type jsonClaimBuffer struct {
	claim    jsonClaim
	overlap  jsonOverlap
	adjusted jsonAdjusted
	held     []float64
}

// of returns a pointer to x held, or nil when x is not known.
func (h *jsonClaimBuffer) of(x audit.Number) *float64 {
	if !x.Known() {
		return nil
	}
	// When append moves the slice, the pointers handed out before still
	// point at their values in the old array, which they keep alive.
	h.held = append(h.held, float64(x))
	return &h.held[len(h.held)-1]
}

// side is one coefficient of the claim.
func (h *jsonClaimBuffer) side(s audit.Side) jsonSide {
	return jsonSide{Label: s.Label, Estimate: h.of(s.Estimate), SE: h.of(s.SE), SEFrom: s.SEFrom}
}

// set makes the buffer's claim r, reusing its slices, and returns it.
func (h *jsonClaimBuffer) set(r *audit.ClaimResult) *jsonClaim {
	h.held = h.held[:0]
	c := &h.claim
	*c = jsonClaim{
		Study: r.Study, Claim: r.Claim, Row: r.Row,
		First: h.side(r.First), Second: h.side(r.Second),
		Relation: r.Relation, Method: r.Method,
		Difference: h.of(r.Difference), DifferenceSE: h.of(r.DifferenceSE),
		DifferenceCI: [2]*float64{h.of(r.DifferenceCI[0]), h.of(r.DifferenceCI[1])},
		Statistic:    h.of(r.Statistic), DF: h.of(r.DF), P: h.of(r.P),
		PRange:    [2]*float64{h.of(r.PRange[0]), h.of(r.PRange[1])},
		Published: r.Published, Recomputed: r.Recomputed, Outcome: r.Outcome,
		Notes:        r.Notes,
		TippingCorr:  c.TippingCorr[:0],
		Alternatives: c.Alternatives[:0],
	}
	if r.Overlap != nil {
		h.overlap = jsonOverlap{Proportion: h.of(r.Overlap.Proportion), ImpliedP: h.of(r.Overlap.ImpliedP)}
		c.Overlap = &h.overlap
	}
	for _, t := range r.TippingCorr {
		c.TippingCorr = append(c.TippingCorr, h.of(t))
	}
	for _, a := range r.Alternatives {
		c.Alternatives = append(c.Alternatives, jsonAlternate{Method: a.Method, Statistic: h.of(a.Statistic), P: h.of(a.P)})
	}
	if r.AdjustedP != nil {
		h.adjusted = jsonAdjusted{BH: h.of(r.AdjustedP.BH), Holm: h.of(r.AdjustedP.Holm)}
		c.AdjustedP = &h.adjusted
	}
	return c
}
