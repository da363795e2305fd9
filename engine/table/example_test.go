package table_test

import (
	"fmt"

	"peerlens/engine/table"
)

func ExampleParse() {
	// An invented paste: four depots, with the slips people make.
	text := "Depot\tStaff\tFloor space\tDeliveries\r\n" +
		"Harbour\t12\t1,250.5\t3400\r\n" +
		"\"Hill\r\nAnnex\"\t9\t980\tn/a\r\n" +
		"Riverside\tabout 7\t1,100\t2900\r\n"
	t, err := table.Parse(text)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("names:", t.Header)
	fmt.Println("unit names in column:", t.NameColumn+1)
	fmt.Println("floor space:", t.Columns[2].Values, "-", t.Columns[2].Note)
	fmt.Println("staff:", t.Columns[1].Values)
	for _, p := range t.Problems {
		fmt.Printf("%s: %v\n", p.Severity, p)
	}
	// Output:
	// names: [Depot Staff Floor space Deliveries]
	// unit names in column: 1
	// floor space: [1250.5 980 1100] - read with a decimal point (as in 1,234.5)
	// staff: [12 9 NaN]
	// warning: row 3, column 4 ("n/a"): missing value: marked as not available
	// error: row 4, column 2 ("about 7"): not a number
}

func ExampleParse_decimalComma() {
	// Semicolon-separated, as spreadsheets save CSV where the comma is the
	// decimal mark.
	t, _ := table.Parse("Unit;Cost;Share\nA;1.234,5;12%\nB;980;7,5%\n")
	for _, c := range t.Columns[1:] {
		fmt.Println(c.Name, c.Values, c.DecimalComma, c.Percent)
	}
	// Output:
	// Cost [1234.5 980] true false
	// Share [12 7.5] true true
}

func ExampleParseNumber() {
	for _, s := range []string{"1 234,5", "(1,200)", "€12.50", "n/a"} {
		v, err := table.ParseNumber(s, s == "1 234,5")
		fmt.Println(v, err)
	}
	// Output:
	// 1234.5 <nil>
	// -1200 <nil>
	// 12.5 <nil>
	// NaN missing value: marked as not available
}
