package report

import (
	"encoding/csv"
	"io"
	"math"
	"strconv"

	"coefaudit/audit"
	"coefaudit/pool"
)

// PoolFormats lists the formats of the pooling report.
func PoolFormats() []string { return []string{"table", "json", "csv", "md", "html", "xlsx"} }

// poolCSVColumns is the header of the pooling CSV.
var poolCSVColumns = []string{"topic", "part", "row", "study", "claim", "first", "second", "estimate", "se", "ci_low", "ci_high",
	"statistic", "df", "p", "weight_fixed", "weight_random", "tau2", "tau2_ci_low", "tau2_ci_high", "q", "i2", "method", "text"}

// poolCSVRow is one record of the pooling CSV; unset fields are blank.
type poolCSVRow struct {
	topic, part                 string
	row                         int
	study, claim, first, second string
	est, se                     audit.Number
	ci                          [2]audit.Number
	stat, df, p, wf, wr         audit.Number
	tau2                        audit.Number
	tau2CI                      [2]audit.Number
	q, i2                       audit.Number
	method, text                string
}

func (r poolCSVRow) record() []string {
	row := ""
	if r.row > 0 {
		row = strconv.Itoa(r.row)
	}
	n := poolCSVNumber
	return []string{safeText(r.topic), r.part, row, safeText(r.study), safeText(r.claim), safeText(r.first), safeText(r.second),
		n(r.est), n(r.se), n(r.ci[0]), n(r.ci[1]), n(r.stat), n(r.df), n(r.p), n(r.wf), n(r.wr),
		n(r.tau2), n(r.tau2CI[0]), n(r.tau2CI[1]), n(r.q), n(r.i2), r.method, safeText(r.text)}
}

// poolCSVNumber writes a number in full precision, the shortest form that
// reads back to the same float64; nothing when it is not known.
func poolCSVNumber(n audit.Number) string {
	if !n.Known() {
		return ""
	}
	return strconv.FormatFloat(float64(n), 'g', -1, 64)
}

// WritePoolCSV writes the pooling report as one CSV table in long form,
// every number in full precision: per topic, a "claim" row per pooled
// claim, the pooled rows "fixed", "random-wald" and "random-hksj", a
// "prediction" row, a "heterogeneity" row (Q with df and p, I², τ² with
// its interval), a "leave-one-out" row per claim, a "left-out" row per
// claim not pooled with the reason, the sensitivity analysis's
// "sensitivity-claim" rows and pooled rows, and a "note" row per note;
// then "plot" and "caution" rows. Proportions (weights, I², p) are not
// percentages. Text cells that a spreadsheet would evaluate are quoted
// with an apostrophe.
func WritePoolCSV(w io.Writer, doc PoolDocument) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(poolCSVColumns); err != nil {
		return err
	}
	put := func(r poolCSVRow) { _ = cw.Write(r.record()) }
	for _, t := range doc.Topics {
		claim := func(part string, s pool.Study) {
			r := blankPoolCSVRow(t.Topic, part)
			r.row, r.study, r.claim, r.first, r.second, r.text = s.Row, s.Study, s.Claim, s.First, s.Second, s.Outcome
			r.est, r.se, r.ci, r.wf, r.wr = s.Estimate, s.SE, s.CI, s.WeightFixed, s.WeightRandom
			put(r)
		}
		lines := func(prefix string, l pool.Estimates, method string) {
			for _, x := range []struct {
				part, method string
				p            *pool.Estimate
			}{{"fixed", "inverse variance", l.Fixed}, {"random-wald", method, l.Random}, {"random-hksj", method, l.HKSJ}} {
				if x.p != nil {
					r := blankPoolCSVRow(t.Topic, prefix+x.part)
					r.est, r.se, r.ci, r.stat, r.df, r.p, r.method = x.p.Estimate, x.p.SE, x.p.CI, x.p.Statistic, x.p.DF, x.p.P, x.method
					put(r)
				}
			}
		}
		for _, s := range t.Studies {
			claim("claim", s)
		}
		lines("", t.Estimates, t.Tau2Method)
		if t.Prediction != nil {
			r := blankPoolCSVRow(t.Topic, "prediction")
			r.ci, r.df, r.method = t.Prediction.CI, t.Prediction.DF, t.Tau2Method
			put(r)
		}
		if h := t.Heterogeneity; h != nil {
			r := blankPoolCSVRow(t.Topic, "heterogeneity")
			r.df, r.p, r.tau2, r.tau2CI, r.q, r.i2, r.method = audit.Number(h.DF), h.P, h.Tau2, h.Tau2CI, h.Q, h.I2, t.Tau2Method
			put(r)
		}
		for _, l := range t.LeaveOneOut {
			r := blankPoolCSVRow(t.Topic, "leave-one-out")
			r.row, r.study, r.claim, r.est, r.se, r.ci = l.Row, l.Study, l.Claim, l.Estimate, l.SE, l.CI
			r.tau2, r.q, r.i2, r.method = l.Tau2, l.Q, l.I2, t.Tau2Method
			put(r)
		}
		for _, l := range t.LeftOut {
			r := blankPoolCSVRow(t.Topic, "left-out")
			r.row, r.study, r.claim, r.text = l.Row, l.Study, l.Claim, l.Reason
			put(r)
		}
		if s := t.Sensitivity; s != nil {
			for _, a := range s.Added {
				claim("sensitivity-claim", a)
			}
			lines("sensitivity-", s.Estimates, s.Tau2Method)
			r := blankPoolCSVRow(t.Topic, "sensitivity-heterogeneity")
			r.tau2, r.i2, r.method, r.text = s.Tau2, s.I2, s.Tau2Method, s.Assumption
			put(r)
		}
		for _, n := range t.Notes {
			r := blankPoolCSVRow(t.Topic, "note")
			r.text = n
			put(r)
		}
	}
	for _, p := range doc.Plots {
		r := blankPoolCSVRow("", "plot")
		r.text = p
		put(r)
	}
	for _, c := range doc.Cautions {
		r := blankPoolCSVRow("", "caution")
		r.text = c
		put(r)
	}
	cw.Flush()
	return cw.Error()
}

// blankPoolCSVRow is a record of the part with every number unknown.
func blankPoolCSVRow(topic, part string) poolCSVRow {
	u := audit.Number(math.NaN())
	return poolCSVRow{topic: topic, part: part, est: u, se: u, ci: [2]audit.Number{u, u}, stat: u, df: u, p: u, wf: u, wr: u,
		tau2: u, tau2CI: [2]audit.Number{u, u}, q: u, i2: u}
}
