package article

// Found is everything read from one article: the rows of the input
// contract's sheets, each with its source, and what the reviewer must
// confirm.
type Found struct {
	File   string `json:"file"`
	Format string `json:"format"`
	Study  string `json:"study"`
	// Coefficients are the coefficients rows, in the order printed.
	Coefficients []CoefficientRow `json:"coefficients"`
	// Claims are the candidate claims whose two coefficients were matched.
	Claims []ClaimRow `json:"claims"`
	// Tables are the correlation tables, each laid out as a "table …"
	// sheet.
	Tables []CorrelationSheet `json:"correlation_tables"`
	// ToConfirm lists every guess, every number not read and every table
	// not read as a results table, with its place and the reason.
	ToConfirm []Confirm `json:"to_confirm"`
	// ConfirmCount is len(ToConfirm) where Open has dropped the lines.
	ConfirmCount int `json:"-"`

	labels map[string]int // the labels given, by uniqueLabel
}

// CoefficientRow is one row of the coefficients sheet as the article
// printed it: every number its text, blank where nothing was printed.
type CoefficientRow struct {
	Study     string `json:"study"`
	Label     string `json:"label"`
	Measure   string `json:"measure"`
	Outcome   string `json:"outcome,omitempty"`
	Predictor string `json:"predictor"`
	Group     string `json:"group,omitempty"`
	Model     string `json:"model,omitempty"`
	Estimate  string `json:"estimate"`
	CILow     string `json:"ci_low,omitempty"`
	CIHigh    string `json:"ci_high,omitempty"`
	CI        string `json:"ci,omitempty"`
	CILevel   string `json:"ci_level,omitempty"`
	SE        string `json:"se,omitempty"`
	Stat      string `json:"stat,omitempty"`
	P         string `json:"p,omitempty"`
	DF        string `json:"df,omitempty"`
	N         string `json:"n,omitempty"`
	// Source is where the estimate was printed ("Table 2, row 'Sleep',
	// column 'β', Model 2"); Places gives the place of each other number.
	Source string            `json:"source"`
	Places map[string]string `json:"places,omitempty"`
}

// ClaimRow is one candidate claim: a sentence comparing two effects whose
// coefficients were matched, with the verdict and basis it implies.
type ClaimRow struct {
	Study     string `json:"study"`
	Claim     string `json:"claim"`
	First     string `json:"first"`
	Second    string `json:"second"`
	Published string `json:"published"`
	Basis     string `json:"basis"`
	Sentence  string `json:"sentence"`
	Source    string `json:"source"`
}

// CorrelationSheet is one correlation table as a "table …" sheet: key rows
// (study, n), a header and the variables' rows, cells as printed.
type CorrelationSheet struct {
	Name   string     `json:"name"`
	Source string     `json:"source"`
	Rows   [][]string `json:"rows"`
}

// Confirm is one thing the reviewer must look at: where, why, and the text
// printed there.
type Confirm struct {
	File   string `json:"file"`
	Place  string `json:"place"`
	Reason string `json:"reason"`
	Text   string `json:"text,omitempty"`
}

// confirm adds a row to the to confirm list.
func (f *Found) confirm(place, reason, text string) {
	f.ToConfirm = append(f.ToConfirm, Confirm{File: f.File, Place: place, Reason: reason, Text: text})
}
