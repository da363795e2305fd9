//go:build js && wasm

// Command wasm is the Peerlens engine compiled to WebAssembly: a thin bridge
// that registers one global object, peerlensEngine, whose functions take and
// return plain JavaScript values and call package api (and through it the
// engine packages) for all the work:
//
//	parse(text)                  -> {table, study, problems}
//	parseBytes(uint8Array)       -> {table, study, problems}   (a text file's bytes, any common encoding)
//	parseRecords(records)        -> {table, study, problems}   (cells from a spreadsheet)
//	demo()                       -> study
//	validate(study)              -> [issue, ...]
//	run(study, onProgress, units, frontier, part, parts) -> result (all but study optional)
//	runJSON(same arguments)      -> Uint8Array          (the result's JSON text)
//	frontier(study)              -> {frontier, units}
//	frontierParts(study)         -> {parts, sizes, units}
//	frontierPart(study, p)       -> {candidates}
//	frontierCheck(study, pool, lo, hi) -> {kept}
//	explain(model, unitResult)   -> {unit, summary, sections}
//	describe(model)              -> {sentences, sources, cautions}
//	exportCSV(study, result)     -> string
//	version()                    -> string
//
// A failure comes back as {error: message}; a panic is recovered at the
// boundary and reported the same way, so the module never crashes. Built by
// ./build.sh serve into site/peerlens.wasm and loaded by site/worker.js.
package main

func main() {
	if err := register(); err != nil {
		panic(err)
	}
	select {} // keep the functions alive
}
