// Package sitecopy makes a runnable copy of the page for the browser tests
// and the browser benchmark: the files of site/ (not the Go programs and
// tests beside them) with the engine and the spreadsheet module freshly
// built to WebAssembly and the Go release's wasm_exec.js, as build.sh does;
// and the options of the headless Chromium that opens it.
//
//	root, err := sitecopy.ModuleRoot()
//	err = sitecopy.Prepare(root, filepath.Join(tmp, "site"))
package sitecopy
