package book

import (
	"bytes"
	"context"
	"slices"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"peerlens/engine/study"
	"peerlens/wasm/api"
)

// The workbook written for the demo run reads back through Read: its
// Results sheet lists every demo unit, and its Data sheet holds the demo's
// numbers.
func TestWriteThenRead(t *testing.T) {
	sj, err := api.Demo()
	if err != nil {
		t.Fatal(err)
	}
	rj, err := api.Run(context.Background(), sj, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	wb, err := Write(sj, rj, time.Date(2026, 5, 6, 7, 8, 0, 0, time.UTC))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := excelize.OpenReader(bytes.NewReader(wb)); err != nil {
		t.Fatalf("not a workbook: %v", err)
	}
	demo := study.Demo()
	got, err := Read(wb, "")
	if err != nil {
		t.Fatal(err)
	}
	if got.Sheet != "Results" || !slices.Equal(got.Sheets, []string{"Results", "Targets", "Weights", "Settings", "Data"}) {
		t.Errorf("sheets %q, read %q", got.Sheets, got.Sheet)
	}
	if len(got.Records) != len(demo.Units)+1 || got.Records[0][0] != "unit" {
		t.Fatalf("Results has %d rows, want %d", len(got.Records), len(demo.Units)+1)
	}
	for i, name := range demo.Units {
		if got.Records[i+1][0] != name {
			t.Errorf("Results row %d names %q, want %q", i+2, got.Records[i+1][0], name)
		}
	}
	data, err := Read(wb, "Data")
	if err != nil {
		t.Fatal(err)
	}
	// The Data sheet read as a table gives back the demo's values.
	pj, err := api.ParseRecords(data.Records)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(pj, []byte(demo.Units[0])) {
		t.Error("the Data sheet does not read back as a table with the demo's units")
	}
	if js, err := data.RecordsJSON(); err != nil || js[0] != '[' {
		t.Errorf("RecordsJSON = %.40s, %v", js, err)
	}
	if _, err := Read(wb, "Nope"); err == nil {
		t.Error("reading a missing sheet succeeded")
	}
	if _, err := Read([]byte("not a workbook"), ""); err == nil {
		t.Error("reading junk succeeded")
	}
	if _, err := Write(sj, []byte(`{"units":[]}`), time.Now()); err == nil {
		t.Error("writing a result of another study succeeded")
	}
}
