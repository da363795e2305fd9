package export

import (
	"bytes"
	"encoding/csv"
	"errors"
	"strconv"
	"strings"
	"testing"
	"time"

	"peerlens/engine/export/internal/fixture"
)

// readBack parses CSV text and checks it holds exactly the table's cells.
func checkCSV(t *testing.T, text string, tab *Table) {
	t.Helper()
	recs, err := csv.NewReader(strings.NewReader(text)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != len(tab.Rows)+1 {
		t.Fatalf("%d records, want %d", len(recs), len(tab.Rows)+1)
	}
	for j, h := range tab.Header {
		if unguard(recs[0][j]) != h {
			t.Errorf("header %d = %q, want %q", j, recs[0][j], h)
		}
	}
	for i, row := range tab.Rows {
		for j, c := range row {
			got := recs[i+1][j]
			switch c.Kind {
			case Empty:
				if got != "" {
					t.Errorf("row %d col %d = %q, want empty", i+1, j+1, got)
				}
			case Number:
				v, err := strconv.ParseFloat(got, 64)
				if err != nil || v != c.Num {
					t.Errorf("row %d col %d = %q, want the number %v", i+1, j+1, got, c.Num)
				}
			case Text:
				if unguard(got) != c.Text {
					t.Errorf("row %d col %d = %q, want the text %q", i+1, j+1, got, c.Text)
				}
				if got != c.Text && !strings.HasPrefix(got, "'") {
					t.Errorf("row %d col %d = %q changed without a guard", i+1, j+1, got)
				}
			}
		}
	}
}

func unguard(s string) string {
	if strings.HasPrefix(s, "'") && len(s) > 1 && strings.ContainsRune("=+-@\t\r", rune(s[1])) {
		return s[1:]
	}
	return s
}

func TestCSVReadsBack(t *testing.T) {
	s, r := fixture.Study()
	var b bytes.Buffer
	if err := CSV(&b, s, r); err != nil {
		t.Fatal(err)
	}
	tab, err := Results(s, r, true)
	if err != nil {
		t.Fatal(err)
	}
	checkCSV(t, b.String(), tab)
	recs, _ := csv.NewReader(strings.NewReader(b.String())).ReadAll()
	wantHeader := "unit,score,status,returns to scale,scale efficiency,super-efficiency,peers,named as peer by,verified," +
		"target Staff,slack Staff,target Budget,slack Budget,target +Visits,slack +Visits,weight Staff,weight Budget,weight +Visits"
	if got := strings.Join(unguardAll(recs[0]), ","); got != wantHeader {
		t.Errorf("header\n got %s\nwant %s", got, wantHeader)
	}
	if recs[0][13] != "'target +Visits" && recs[0][13] != "target +Visits" {
		t.Errorf("header cell %q", recs[0][13])
	}
	// Row by row: the values of the hand-made result.
	want := [][]string{
		{"Ashby", "1", "efficient", "constant", "1", "1.25", "Ashby (0.42); -North (0.58)", "2", "yes", "10.25", "0.25", "218.75", "0", "910", "10", "0.03333333333333333", "0.0024", "0.000972"},
		{"'=HYPERLINK(\"x\")", "0.875", "inefficient", "decreasing", "0.9", "", "Ashby (0.42); -North (0.58)", "0", "yes"},
		{"'-North", "", "not solved", "", "", "", "", "0", "no", "", "", "", "", "", "", "", "", ""},
		{"'@Left", "", "left out", "", "", "", "", "", "", "", "", "", "", "", "", "", "", ""},
	}
	for i, w := range want {
		for j, cell := range w {
			if recs[i+1][j] != cell {
				t.Errorf("row %d col %d (%s) = %q, want %q", i+1, j+1, recs[0][j], recs[i+1][j], cell)
			}
		}
	}
}

func unguardAll(rec []string) []string {
	out := make([]string, len(rec))
	for i, s := range rec {
		out[i] = unguard(s)
	}
	return out
}

// CSV (formula) injection: OWASP's guidance, common practice.
func TestGuard(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"=1+1", "'=1+1"}, {"+1", "'+1"}, {"-North", "'-North"}, {"@SUM(A1)", "'@SUM(A1)"},
		{"\tx", "'\tx"}, {"\rx", "'\rx"}, {"North", "North"}, {"", ""}, {"a=b", "a=b"}, {"'quoted", "'quoted"},
	} {
		if got := Guard(tc.in); got != tc.want {
			t.Errorf("Guard(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
	var b bytes.Buffer
	WriteCSV(&b, &Table{Header: []string{"n"}, Rows: [][]Cell{{N(-3)}, {N(-0.5)}, {T("-3")}}})
	if got := b.String(); got != "n\n-3\n-0.5\n'-3\n" {
		t.Errorf("numbers guarded or text not: %q", got)
	}
}

func TestTargetsWeightsSettingsData(t *testing.T) {
	s, r := fixture.Study()
	tg, err := Targets(s, r)
	if err != nil {
		t.Fatal(err)
	}
	// Two solved units, three measures each.
	if len(tg.Rows) != 6 {
		t.Fatalf("Targets has %d rows, want 6", len(tg.Rows))
	}
	if row := tg.Rows[3]; row[0].Text != "=HYPERLINK(\"x\")" || row[1].Text != "Staff" || row[2].Text != "input" ||
		row[3].Num != 12 || row[4].Num != 1.5 || row[5].Num != 0.25 || row[6].Num != 10.25 || row[7].Num != -14.583333333333334 {
		t.Errorf("Targets row 4 = %+v", row)
	}
	w, err := Weights(s, r)
	if err != nil {
		t.Fatal(err)
	}
	if len(w.Rows) != 6 || w.Rows[2][2].Text != "output" || w.Rows[2][3].Num != 0.000972 || w.Rows[2][4].Num != 1 {
		t.Errorf("Weights = %+v", w.Rows)
	}
	set := Settings(s, r, Meta{Date: time.Date(2026, 3, 4, 5, 6, 0, 0, time.UTC), Version: "0.1.0"})
	text := settingsText(set)
	for _, want := range []string{"date=2026-03-04 05:06 UTC", "Peerlens version=0.1.0", "returns to scale=variable", "orientation=input",
		"role of Notes score=unused", "units in the run=3", "units left out=1", "human review", "Banker, Charnes & Cooper (1984)"} {
		if !strings.Contains(text, want) {
			t.Errorf("Settings lacks %q:\n%s", want, text)
		}
	}
	d := Data(s)
	if strings.Join(d.Header, "|") != "unit|in the run|Staff|Budget|+Visits|Notes score|Region" {
		t.Errorf("Data header = %q", d.Header)
	}
	if d.Rows[3][1].Text != StatusLeftOut || d.Rows[0][1].Text != "yes" || d.Rows[1][5].Kind != Empty || d.Rows[1][6].Text != "\tSouth" {
		t.Errorf("Data rows = %+v", d.Rows)
	}
}

func settingsText(t *Table) string {
	var b strings.Builder
	for _, row := range t.Rows {
		b.WriteString(row[0].Text + "=")
		if row[1].Kind == Number {
			b.WriteString(strconv.FormatFloat(row[1].Num, 'g', -1, 64))
		} else {
			b.WriteString(row[1].Text)
		}
		b.WriteString("\n")
	}
	return b.String()
}

func TestMismatch(t *testing.T) {
	s, r := fixture.Study()
	r.Units = r.Units[:2]
	if err := CSV(&bytes.Buffer{}, s, r); !errors.Is(err, ErrMismatch) {
		t.Errorf("fewer results: %v, want ErrMismatch", err)
	}
	s, r = fixture.Study()
	r.Units[1].Name = "Someone else"
	if _, err := Targets(s, r); !errors.Is(err, ErrMismatch) {
		t.Errorf("renamed unit: %v, want ErrMismatch", err)
	}
}
