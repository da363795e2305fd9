package sheet

import (
	"bytes"
	"testing"

	"github.com/xuri/excelize/v2"
)

// BenchmarkReadXLSX20k reads an invented 20,000-row, 6-column sheet (a name
// and five numbers, one column formatted as currency).
func BenchmarkReadXLSX20k(b *testing.B) {
	f := excelize.NewFile()
	sw, err := f.NewStreamWriter("Sheet1")
	if err != nil {
		b.Fatal(err)
	}
	custom := "#,##0.00 \"EUR\""
	money, err := f.NewStyle(&excelize.Style{CustomNumFmt: &custom})
	if err != nil {
		b.Fatal(err)
	}
	for i := range 20000 {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		row := []any{"Branch", i % 40, excelize.Cell{StyleID: money, Value: float64(i) * 1.5}, i, i * 2, 0.25}
		if err := sw.SetRow(cell, row); err != nil {
			b.Fatal(err)
		}
	}
	if err := sw.Flush(); err != nil {
		b.Fatal(err)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(buf.Len()))
	for b.Loop() {
		rows, _, err := ReadXLSX(bytes.NewReader(buf.Bytes()))
		if err != nil || len(rows) != 20000 {
			b.Fatalf("rows %d, %v", len(rows), err)
		}
	}
}
