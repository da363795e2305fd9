package table

import (
	"fmt"
	"strings"
	"testing"
)

// paste100k is an invented 100,000-row, 6-column paste: a name column and
// five numeric columns in the forms people type.
func paste100k() string {
	var b strings.Builder
	b.WriteString("Branch\tStaff\tFloor space\tBudget\tLoans\tShare\r\n")
	for i := range 100000 {
		fmt.Fprintf(&b, "Branch %d\t%d\t%d.%d\t%d,%03d.%02d\t%d\t%d%%\r\n",
			i+1, 5+i%40, 100+i%900, i%10, 1+i%900, i%1000, i%100, 1000+i%5000, i%100)
	}
	return b.String()
}

// BenchmarkParse100k shows that reading a large paste is linear in its size.
func BenchmarkParse100k(b *testing.B) {
	text := paste100k()
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		tab, err := Parse(text)
		if err != nil || len(tab.Rows) != 100000 {
			b.Fatalf("rows %d, %v", len(tab.Rows), err)
		}
	}
}

// BenchmarkParse10k is the same paste cut to a tenth, to compare with
// BenchmarkParse100k for linearity.
func BenchmarkParse10k(b *testing.B) {
	text := paste100k()
	text = text[:strings.Index(text, "Branch 10001\t")]
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Parse(text); err != nil {
			b.Fatal(err)
		}
	}
}
