package report

import (
	"bufio"
	"encoding/csv"
	"io"
	"strconv"
	"strings"
	"testing"

	"coefaudit/audit"

	"github.com/gocarina/gocsv"
)

// The CSV report's rows could be mapped from one tagged struct by
// gocarina/gocsv instead of being laid out for encoding/csv by hand
// (csvWriter.claimRecord). These two benchmarks write the same 1,000,000
// claims (tenThousandClaims a hundred times) both ways, to io.Discard; the
// gocsv row leaves out the pass-through columns, which a struct's tags
// cannot name, so it does less work than the report.

// BenchmarkCSVRowsEncodingCSV writes the claims with the CSV report's
// writer.
func BenchmarkCSVRowsEncodingCSV(b *testing.B) {
	rep := tenThousandClaims()
	b.ReportAllocs()
	for b.Loop() {
		wr := newCSVWriter(io.Discard)
		if err := wr.Begin(Header{ClaimColumns: []string{"reviewer"}}); err != nil {
			b.Fatal(err)
		}
		for range 100 {
			if err := wr.Study(audit.StudyResult{Claims: rep.Claims}); err != nil {
				b.Fatal(err)
			}
		}
		if err := wr.End(Footer{}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)*1e9/1e6, "ns/claim")
}

// gocsvClaim is the CSV report's row as gocsv maps it: one field per
// column, named by its tag, every cell already formatted and guarded.
type gocsvClaim struct {
	Row              int    `csv:"row"`
	Study            string `csv:"study"`
	Claim            string `csv:"claim"`
	First            string `csv:"first"`
	FirstEstimate    string `csv:"first_estimate"`
	FirstSE          string `csv:"first_se"`
	FirstSEFrom      string `csv:"first_se_from"`
	Second           string `csv:"second"`
	SecondEstimate   string `csv:"second_estimate"`
	SecondSE         string `csv:"second_se"`
	SecondSEFrom     string `csv:"second_se_from"`
	Relation         string `csv:"relation"`
	Method           string `csv:"method"`
	Scale            string `csv:"scale"`
	Difference       string `csv:"difference"`
	DifferenceSE     string `csv:"difference_se"`
	DifferenceCILow  string `csv:"difference_ci_low"`
	DifferenceCIHigh string `csv:"difference_ci_high"`
	Statistic        string `csv:"statistic"`
	DF               string `csv:"df"`
	P                string `csv:"p"`
	PLow             string `csv:"p_low"`
	PHigh            string `csv:"p_high"`
	Alpha            string `csv:"alpha"`
	Basis            string `csv:"basis"`
	Published        string `csv:"published"`
	Recomputed       string `csv:"recomputed"`
	Outcome          string `csv:"outcome"`
	OverlapP         string `csv:"overlap_proportion"`
	OverlapImpliedP  string `csv:"overlap_implied_p"`
	Notes            string `csv:"notes"`
}

func newGocsvClaim(r *audit.ClaimResult) gocsvClaim {
	row := gocsvClaim{Row: r.Row, Study: safeText(r.Study), Claim: safeText(r.Claim),
		First: safeText(r.First.Label), FirstEstimate: csvNumber(r.First.Estimate), FirstSE: csvNumber(r.First.SE), FirstSEFrom: safeText(r.First.SEFrom),
		Second: safeText(r.Second.Label), SecondEstimate: csvNumber(r.Second.Estimate), SecondSE: csvNumber(r.Second.SE), SecondSEFrom: safeText(r.Second.SEFrom),
		Relation: r.Relation, Method: r.Method, Scale: r.Scale,
		Difference: csvNumber(r.Difference), DifferenceSE: csvNumber(r.DifferenceSE),
		DifferenceCILow: csvNumber(r.DifferenceCI[0]), DifferenceCIHigh: csvNumber(r.DifferenceCI[1]),
		Statistic: csvNumber(r.Statistic), DF: csvNumber(r.DF), P: csvNumber(r.P), PLow: csvNumber(r.PRange[0]), PHigh: csvNumber(r.PRange[1]),
		Alpha: strconv.FormatFloat(r.Alpha, 'g', -1, 64), Basis: r.Basis, Published: r.Published, Recomputed: r.Recomputed,
		Outcome: r.Outcome, Notes: safeText(strings.Join(r.Notes, " | "))}
	if r.Overlap != nil {
		row.OverlapP, row.OverlapImpliedP = csvNumber(r.Overlap.Proportion), csvNumber(r.Overlap.ImpliedP)
	}
	return row
}

// BenchmarkCSVRowsGocsv writes the same claims through gocsv, a study's
// rows at a time.
func BenchmarkCSVRowsGocsv(b *testing.B) {
	rep := tenThousandClaims()
	b.ReportAllocs()
	for b.Loop() {
		bw := bufio.NewWriter(io.Discard)
		w := gocsv.NewSafeCSVWriter(csv.NewWriter(bw))
		rows := make([]gocsvClaim, len(rep.Claims))
		for k := range 100 {
			for i := range rep.Claims {
				rows[i] = newGocsvClaim(&rep.Claims[i])
			}
			marshal := gocsv.MarshalCSVWithoutHeaders
			if k == 0 {
				marshal = gocsv.MarshalCSV
			}
			if err := marshal(rows, w); err != nil {
				b.Fatal(err)
			}
		}
		if err := bw.Flush(); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)*1e9/1e6, "ns/claim")
}

// TestGocsvRowMatchesReport checks that the benchmarks write the same
// cells: the gocsv row is the report's row without the pass-through
// columns.
func TestGocsvRowMatchesReport(t *testing.T) {
	rep := audit.Audit(reportInput(), audit.DefaultOptions)
	var ours, theirs strings.Builder
	wr := newCSVWriter(&ours)
	if err := wr.Begin(Header{}); err != nil {
		t.Fatal(err)
	}
	if err := wr.Study(audit.StudyResult{Claims: rep.Claims}); err != nil {
		t.Fatal(err)
	}
	if err := wr.End(Footer{}); err != nil {
		t.Fatal(err)
	}
	rows := make([]gocsvClaim, len(rep.Claims))
	for i := range rep.Claims {
		rows[i] = newGocsvClaim(&rep.Claims[i])
	}
	w := gocsv.NewSafeCSVWriter(csv.NewWriter(&theirs))
	if err := gocsv.MarshalCSV(rows, w); err != nil {
		t.Fatal(err)
	}
	if ours.String() != theirs.String() {
		t.Errorf("gocsv writes\n%s\nthe report writes\n%s", theirs.String(), ours.String())
	}
}
