// Package browsertest drives the Peerlens page in a real browser (Chromium,
// through chromedp) and checks what a person would see and do: paste a
// table, choose roles, leave units out, run, read scores, charts and
// exports, and cancel a long run.
//
// TestMain builds the engine bridge to WebAssembly into a temporary copy of
// site/ and serves it on 127.0.0.1 in the test process. The tests skip with
// a message when Chromium is not installed; CI installs it. Set
// PEERLENS_CHROMIUM to use another browser binary, and PEERLENS_SHOTS to a
// folder to keep the layout screenshots.
package browsertest
