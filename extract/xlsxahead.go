package extract

// Rows of a sheet are parsed ahead, on a goroutine of their own, while the
// caller makes records of the rows before: encoding/xml takes most of the
// time of reading a workbook, and the records most of the rest
// (BenchmarkReadWorkbook100k).
const (
	aheadRows    = 256 // rows in a batch
	aheadBatches = 4   // batches parsed or in use at once
)

// rowBatch is a batch of rows parsed ahead and, when the sheet ended
// after them, the error that ended it (io.EOF at its end).
type rowBatch struct {
	rows []sheetRow
	err  error
}

// readAhead hands the batches from the parsing goroutine to Next and back.
type readAhead struct {
	ready, free chan *rowBatch
	stop, done  chan struct{}
	cur         *rowBatch
	i           int
}

// Next reads the next row of the sheet; next says what a row holds, and
// what ends a sheet. The rows are parsed ahead, so that the cell formats,
// the shared-strings budget and the part belong to the parsing goroutine
// once the first row is asked for: a workbook reads one sheet at a time.
func (s *xlsxSource) Next(row *sheetRow) error {
	if s.ahead == nil {
		s.startAhead()
	}
	a := s.ahead
	for a.cur == nil || a.i == len(a.cur.rows) {
		if a.cur != nil {
			if a.cur.err != nil {
				return a.cur.err
			}
			a.free <- a.cur
		}
		a.cur, a.i = <-a.ready, 0
	}
	r := &a.cur.rows[a.i]
	a.i++
	row.Row, row.Fields, row.Problem, row.AfterBlank = r.Row, r.Fields, r.Problem, r.AfterBlank
	row.Cells = append(row.Cells[:0], r.Cells...)
	return nil
}

func (s *xlsxSource) startAhead() {
	a := &readAhead{ready: make(chan *rowBatch, aheadBatches), free: make(chan *rowBatch, aheadBatches),
		stop: make(chan struct{}), done: make(chan struct{})}
	for range aheadBatches {
		a.free <- &rowBatch{rows: make([]sheetRow, 0, aheadRows)}
	}
	s.ahead = a
	go s.parseAhead(a)
}

// parseAhead fills batches until the sheet ends or Close stops it.
func (s *xlsxSource) parseAhead(a *readAhead) {
	defer close(a.done)
	for {
		var b *rowBatch
		select {
		case b = <-a.free:
		case <-a.stop:
			return
		}
		b.rows, b.err = b.rows[:0], nil
		for len(b.rows) < aheadRows {
			// Each row of a batch keeps its cells' storage from the last
			// time round.
			b.rows = b.rows[:len(b.rows)+1]
			if err := s.next(&b.rows[len(b.rows)-1]); err != nil {
				b.rows, b.err = b.rows[:len(b.rows)-1], err
				break
			}
		}
		select {
		case a.ready <- b:
		case <-a.stop:
			return
		}
		if b.err != nil {
			return
		}
	}
}

// Close stops the parsing and closes the sheet's part. The displayed
// texts remembered for the sheet are let go: the next sheet holds other
// columns, and Open reads the claims while the memo would still be held
// (BenchmarkOpenWorkbook100k).
func (s *xlsxSource) Close() error {
	if a := s.ahead; a != nil {
		close(a.stop)
		<-a.done
	}
	s.wb.display.forget()
	return s.x.Close()
}
