package study_test

import (
	"bytes"
	"fmt"
	"strings"

	"peerlens/engine/study"
	"peerlens/engine/table"
)

func Example() {
	tab, err := table.Parse("Clinic\tStaff\tBudget\tVisits\n" +
		"North\t12\t800\t3400\n" +
		"South\t9\t650\t\n" +
		"East\t7\t700\t2100\n")
	if err != nil {
		fmt.Println(err)
		return
	}
	s := study.FromTable(tab)
	for _, m := range s.Measures {
		fmt.Printf("%s: %s (guessed: %v)\n", m.Name, m.Role, m.RoleGuessed)
	}
	for _, is := range study.Validate(s) {
		fmt.Printf("%s: %s\n", is.Severity, is.Message)
	}

	s.LeftOut = []string{"South"}
	_, issues, err := s.Data()
	fmt.Println(len(issues), err)
	// Output:
	// Staff: input (guessed: true)
	// Budget: input (guessed: true)
	// Visits: output (guessed: true)
	// error: "South" has no value for "Visits": fill it in or leave the unit out.
	// warning: 3 units for 2 inputs and 1 output is few: a common rule of thumb (Cooper, Seiford & Tone 2007) asks for at least max(2 × 1, 3 × (2 + 1)) = 9 units. With few units many of them look efficient; use fewer measures or more units.
	// 2 <nil>
}

func ExampleRead() {
	var file bytes.Buffer
	if err := study.Demo().Write(&file); err != nil {
		fmt.Println(err)
		return
	}
	s, err := study.Read(&file)
	fmt.Println(len(s.Units), len(s.Measures), err)

	_, err = study.Read(strings.NewReader(`{"format": 3}`))
	fmt.Println(err)
	// Output:
	// 30 5 <nil>
	// this study file was written by a newer version of Peerlens (format 3); this page reads format 1
}
