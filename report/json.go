package report

import (
	"bufio"
	"bytes"
	"encoding/json"
	"io"

	"coefaudit/audit"
)

// jsonWriter writes the JSON document of the output contract (DESIGN.md)
// as the claims arrive:
//
//	{"alpha":0.05,"claims":[
//	{…one claim…},
//	{…}
//	],"summary":{"claims":N,"consistent":…},"problems":[…]}
//
// Each claim is one line, encoded by encoding/json from jsonClaim (numbers
// that are not known are null); the summary and the problems,
// known only at the end, follow the claims. HTML characters are not
// escaped: the document is data, not a page.
type jsonWriter struct {
	bw       *bufio.Writer
	buf      bytes.Buffer // one encoded claim
	enc      *json.Encoder
	claim    jsonClaimBuffer
	claims   int
	problems heldProblems
}

func newJSONWriter(w io.Writer) *jsonWriter {
	j := &jsonWriter{bw: bufio.NewWriterSize(w, 1<<16)}
	j.enc = json.NewEncoder(&j.buf)
	j.enc.SetEscapeHTML(false)
	return j
}

// Begin implements Writer.
func (j *jsonWriter) Begin(h Header) error {
	j.bw.WriteString(`{"alpha":`)
	if err := j.encode(h.Alpha); err != nil {
		return err
	}
	_, err := j.bw.WriteString(`,"claims":[`)
	return err
}

// encode writes v as encoding/json does, without the encoder's newline.
func (j *jsonWriter) encode(v any) error {
	j.buf.Reset()
	if err := j.enc.Encode(v); err != nil {
		return err
	}
	_, err := j.bw.Write(bytes.TrimSuffix(j.buf.Bytes(), []byte("\n")))
	return err
}

// Study implements Writer.
func (j *jsonWriter) Study(res audit.StudyResult) error {
	j.problems.add(res.Problems)
	for i := range res.Claims {
		sep := ",\n"
		if j.claims == 0 {
			sep = "\n"
		}
		j.claims++
		j.bw.WriteString(sep)
		if err := j.encode(j.claim.set(&res.Claims[i])); err != nil {
			return err
		}
	}
	return nil
}

// End implements Writer.
func (j *jsonWriter) End(f Footer) error {
	if j.claims > 0 {
		j.bw.WriteString("\n")
	}
	j.bw.WriteString(`],"summary":`)
	if err := j.encode(summaryObject(f.Summary)); err != nil {
		return err
	}
	j.bw.WriteString(`,"problems":`)
	problems := j.problems.all(f)
	if problems == nil {
		problems = []audit.Problem{}
	}
	if err := j.encode(problems); err != nil {
		return err
	}
	j.bw.WriteString("}\n")
	return j.bw.Flush()
}

// summaryObject is the contract's summary: "claims" and the count of each
// outcome that occurred.
func summaryObject(s audit.Summary) map[string]int {
	m := map[string]int{"claims": s.Claims}
	for o, n := range s.Counts {
		if n > 0 {
			m[o] = n
		}
	}
	return m
}
