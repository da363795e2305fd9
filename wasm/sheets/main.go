//go:build js && wasm

// Command sheets is Peerlens's spreadsheet module, compiled to WebAssembly
// apart from the main engine so that the first page load stays small; the
// worker loads it only when a workbook is opened or exported. It registers
// one global object, peerlensSheets:
//
//	read(uint8Array, sheetName?)   -> {sheets, sheet, records}   (records as JSON text)
//	write(study, result, dateISO)  -> Uint8Array                  (the .xlsx file)
//
// Failures come back as {error: message}, as in the main module.
package main

import (
	"time"

	"github.com/hack-pad/safejs"

	js "peerlens/wasm/internal/jsbridge"
	"peerlens/wasm/sheets/book"
)

// GlobalName is the name of the object registered on globalThis.
const GlobalName = "peerlensSheets"

func main() {
	if err := register(); err != nil {
		panic(err)
	}
	select {}
}

type readReply struct {
	Sheets  []string `js:"sheets"`
	Sheet   string   `js:"sheet"`
	Records string   `js:"records"`
}

func register() error {
	return js.Register(GlobalName, map[string]js.Handler{"read": read, "write": write})
}

func read(args []safejs.Value) (any, error) {
	b, err := js.BytesArg(args, 0)
	if err != nil {
		return nil, err
	}
	name := ""
	if js.Given(args, 1) {
		if name, err = js.StringArg(args, 1); err != nil {
			return nil, err
		}
	}
	s, err := book.Read(b, name)
	if err != nil {
		return nil, err
	}
	recs, err := s.RecordsJSON()
	if err != nil {
		return nil, err
	}
	return js.ToJS(readReply{Sheets: s.Sheets, Sheet: s.Sheet, Records: recs}), nil
}

func write(args []safejs.Value) (any, error) {
	a, err := js.JSONArgs(args, 2)
	if err != nil {
		return nil, err
	}
	date := time.Now()
	if js.Given(args, 2) {
		text, err := js.StringArg(args, 2)
		if err != nil {
			return nil, err
		}
		if date, err = time.Parse(time.RFC3339, text); err != nil {
			return nil, err
		}
	}
	b, err := book.Write(a[0], a[1], date)
	if err != nil {
		return nil, err
	}
	return js.Bytes(b)
}
