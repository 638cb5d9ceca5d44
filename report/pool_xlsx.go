package report

import (
	"fmt"
	"io"
	"strings"

	"coefaudit/audit"
	"coefaudit/extract"
	"coefaudit/pool"

	"github.com/xuri/excelize/v2"
)

// WritePoolXLSX writes the pooling report as a workbook: a "pooled" sheet
// with a row per pooled estimate of each topic (fixed effect, random
// effects with its Wald and HKSJ intervals, the prediction interval, and
// the sensitivity analysis's), a "heterogeneity" sheet with Q, I², τ² and
// its interval and the summary in sentences, then "claims",
// "leave-one-out", "left out", "notes" and "cautions". Numbers are numeric
// cells shown with the decimals of the rule of poolFormat (the cell keeps
// every digit), τ² to 4 decimals, p as journals print it (a text); texts
// are text cells, never evaluated.
func WritePoolXLSX(w io.Writer, doc PoolDocument) (err error) {
	f := excelize.NewFile()
	defer func() {
		if cerr := f.Close(); err == nil {
			err = cerr
		}
	}()
	st, err := newXLSXStyles(f)
	if err != nil {
		return fmt.Errorf("xlsx pooling report: %w", err)
	}
	numberStyle := func(format string) (int, error) {
		return f.NewStyle(&excelize.Style{CustomNumFmt: &format, Alignment: &excelize.Alignment{Vertical: "top"}})
	}
	dec := map[int]int{} // a style for each number of decimals an estimate is written with
	for d := audit.MinDecimals; d <= audit.MaxDecimals; d++ {
		if dec[d], err = numberStyle("0." + strings.Repeat("0", d)); err != nil {
			return fmt.Errorf("xlsx pooling report: %w", err)
		}
	}
	share, err := numberStyle("0.0%") // the weights' percentages
	if err != nil {
		return fmt.Errorf("xlsx pooling report: %w", err)
	}
	tau := dec[audit.MaxDecimals] // τ²
	pct := poolLevelText(doc.Level)
	sheets := []struct {
		name   string
		widths []float64
		header []string
		rows   func(add func(...any) error) error
	}{
		{"pooled", []float64{28, 40, 8, 12, 12, 12, 12, 12, 10, 10},
			[]string{"topic", "estimate of", "k", "estimate", "se", "ci_low " + pct, "ci_high " + pct, "statistic", "df", "p"},
			func(add func(...any) error) error { return poolXLSXPooled(doc, st, dec, add) }},
		{"heterogeneity", []float64{28, 10, 6, 10, 10, 10, 12, 12, 12, 100},
			[]string{"topic", "q", "df", "p", "i2", "tau2", "tau2_ci_low", "tau2_ci_high", "tau2_method", "summary"},
			func(add func(...any) error) error {
				for _, t := range doc.Topics {
					if h := t.Heterogeneity; h != nil {
						if err := add(st.textCell(t.Topic), st.number(h.Q, st.stat), h.DF, poolXLSXP(st, h.P), st.number(h.I2, st.share),
							st.number(h.Tau2, tau), st.number(h.Tau2CI[0], tau), st.number(h.Tau2CI[1], tau),
							st.textCell(t.Tau2Method), st.textCell(strings.Join(poolHeterogeneitySentences(t, pct), " "))); err != nil {
							return err
						}
					}
				}
				return nil
			}},
		{"claims", []float64{28, 8, 16, 10, 16, 16, 12, 12, 12, 12, 10, 10, 14},
			[]string{"topic", "row", "study", "claim", "first", "second", "difference", "se", "ci_low " + pct, "ci_high " + pct, "weight_fixed", "weight_random", "outcome"},
			func(add func(...any) error) error {
				for _, t := range doc.Topics {
					d := dec[max(audit.MinDecimals, min(audit.MaxDecimals, t.Decimals))]
					for _, s := range t.Studies {
						if err := add(st.textCell(t.Topic), s.Row, st.textCell(s.Study), st.textCell(s.Claim), st.textCell(s.First), st.textCell(s.Second),
							st.number(s.Estimate, d), st.number(s.SE, d), st.number(s.CI[0], d), st.number(s.CI[1], d),
							st.number(s.WeightFixed, share), st.number(s.WeightRandom, share), st.outcomeCell(s.Outcome)); err != nil {
							return err
						}
					}
				}
				return nil
			}},
		{"leave-one-out", []float64{28, 12, 16, 10, 12, 12, 12, 12, 10, 10},
			[]string{"topic", "without_row", "study", "claim", "estimate", "ci_low " + pct, "ci_high " + pct, "tau2", "q", "i2"},
			func(add func(...any) error) error {
				for _, t := range doc.Topics {
					d := dec[max(audit.MinDecimals, min(audit.MaxDecimals, t.Decimals))]
					for _, l := range t.LeaveOneOut {
						if err := add(st.textCell(t.Topic), l.Row, st.textCell(l.Study), st.textCell(l.Claim), st.number(l.Estimate, d),
							st.number(l.CI[0], d), st.number(l.CI[1], d), st.number(l.Tau2, tau), st.number(l.Q, st.stat), st.number(l.I2, st.share)); err != nil {
							return err
						}
					}
				}
				return nil
			}},
		{"left out", []float64{28, 8, 16, 10, 110}, []string{"topic", "row", "study", "claim", "reason"},
			func(add func(...any) error) error {
				for _, t := range doc.Topics {
					for _, l := range t.LeftOut {
						if err := add(st.textCell(t.Topic), l.Row, st.textCell(l.Study), st.textCell(l.Claim), st.textCell(l.Reason)); err != nil {
							return err
						}
					}
				}
				return nil
			}},
		{"notes", []float64{28, 130}, []string{"topic", "note"},
			func(add func(...any) error) error {
				for _, t := range doc.Topics {
					notes := append([]string{t.ScaleNote}, t.Notes...)
					if s := poolSensitivityText(t, pct); s != "" {
						notes = append(notes, s)
					}
					for _, n := range notes {
						if err := add(st.textCell(t.Topic), st.textCell(n)); err != nil {
							return err
						}
					}
				}
				for _, p := range doc.Plots {
					if err := add(nil, st.textCell("Forest plot written: "+p)); err != nil {
						return err
					}
				}
				if doc.PlotsNote != "" {
					return add(nil, st.textCell(doc.PlotsNote))
				}
				return nil
			}},
		{"cautions", []float64{130}, []string{"caution"},
			func(add func(...any) error) error {
				for _, c := range append([]string{poolSummary(doc.Report), doc.Orientation}, doc.Cautions...) {
					if err := add(st.textCell(c)); err != nil {
						return err
					}
				}
				return nil
			}},
	}
	for i, sh := range sheets {
		if i == 0 {
			err = f.SetSheetName("Sheet1", sh.name)
		} else {
			_, err = f.NewSheet(sh.name)
		}
		if err != nil {
			return fmt.Errorf("xlsx pooling report, sheet %q: %w", sh.name, err)
		}
		sw, err := f.NewStreamWriter(sh.name)
		if err != nil {
			return fmt.Errorf("xlsx pooling report, sheet %q: %w", sh.name, err)
		}
		s := &xlsxSheet{f: f, name: sh.name, sw: sw}
		if err := s.columns(sh.widths, true); err == nil {
			err = s.header(st, sh.header, -1)
		}
		if err == nil {
			err = sh.rows(s.add)
		}
		if err == nil {
			err = s.filter(len(sh.header))
		}
		if err == nil {
			err = sw.Flush()
		}
		if err != nil {
			return fmt.Errorf("xlsx pooling report, sheet %q: %w", sh.name, err)
		}
	}
	if err := f.SetDocProps(&excelize.DocProperties{Creator: "coefaudit", Title: "Pooled differences",
		Description: strings.Join(doc.Cautions, " ")}); err != nil {
		return fmt.Errorf("xlsx pooling report: %w", err)
	}
	return extract.WriteXLSX(f, w)
}

// poolXLSXP is a p cell as journals print it, ".043" or "< .001", a text
// (the JSON and CSV keep the number).
func poolXLSXP(st *xlsxStyles, p audit.Number) any {
	if !p.Known() {
		return nil
	}
	s := strings.TrimPrefix(poolP(p), "p = ")
	return st.textCell(strings.TrimPrefix(s, "p "))
}

// poolXLSXPooled writes the rows of the pooled sheet.
func poolXLSXPooled(doc PoolDocument, st *xlsxStyles, dec map[int]int, add func(...any) error) error {
	for _, t := range doc.Topics {
		d := dec[max(audit.MinDecimals, min(audit.MaxDecimals, t.Decimals))]
		line := func(what string, k int, p *pool.Estimate) error {
			if p == nil {
				return nil
			}
			return add(st.textCell(t.Topic), st.textCell(what), k, st.number(p.Estimate, d), st.number(p.SE, d), st.number(p.CI[0], d),
				st.number(p.CI[1], d), st.number(p.Statistic, st.stat), st.number(p.DF, st.general), poolXLSXP(st, p.P))
		}
		for _, l := range poolLines(t) {
			if err := line(l.name, t.K, l.p); err != nil {
				return err
			}
		}
		if t.Prediction != nil {
			if err := add(st.textCell(t.Topic), st.textCell("Prediction interval"), t.K, nil, nil, st.number(t.Prediction.CI[0], d),
				st.number(t.Prediction.CI[1], d), nil, st.number(t.Prediction.DF, st.general)); err != nil {
				return err
			}
		}
		if s := t.Sensitivity; s != nil {
			for _, l := range []poolLine{{"Sensitivity: fixed effect", s.Fixed}, {"Sensitivity: random effects (" + s.Tau2Method + "), Wald interval", s.Random},
				{"Sensitivity: random effects (" + s.Tau2Method + "), HKSJ interval", s.HKSJ}} {
				if err := line(l.name, s.K, l.p); err != nil {
					return err
				}
			}
		}
	}
	return nil
}
