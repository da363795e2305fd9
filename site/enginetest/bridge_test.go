package enginetest

import (
	"strings"
	"testing"
)

// demoRun is JavaScript that loads the demo and runs it with progress.
const demoRun = `
const eng = T.eng;
const study = await eng.demo();
const seen = [];
const h = eng.run(study, { onProgress: (d, n) => seen.push([d, n]) });
const result = await h.promise;
`

// The demo runs in the runner worker with progress, and the result,
// report and exports come back in the documented shapes.
func TestDemoRunExplainExport(t *testing.T) {
	ctx := browser(t)
	type out struct {
		Units, ResultUnits, Efficient int
		Progress                      [][2]int
		Summary                       string
		Sections                      int
		CSVHead                       string
		CSVRows                       int
		XLSXType                      string
		XLSXSize                      int
		Sheets                        []string
		Sheet                         string
		ReadUnits                     []string
		Issues                        int
		Version                       string
	}
	o := eval[out](t, ctx, demoRun+`
const rep = await eng.explain(study, result, 1);
const csv = await eng.exportCSV(study, result);
const blob = await eng.exportXLSX(study, result);
const back = await eng.parseFile(new File([blob], 'results.xlsx'));
const issues = await eng.validate(study);
return {
  Units: study.units.length, ResultUnits: result.units.length,
  Efficient: result.units.filter((u) => u.status === 'efficient').length,
  Progress: seen, Summary: rep.summary, Sections: rep.sections.length,
  CSVHead: csv.split('\n')[0], CSVRows: csv.trim().split('\n').length,
  XLSXType: blob.type, XLSXSize: blob.size, Sheets: back.sheets, Sheet: back.sheet,
  ReadUnits: back.study.units, Issues: issues.length, Version: eng.version,
};`)
	if o.Units == 0 || o.ResultUnits != o.Units || o.Efficient == 0 {
		t.Errorf("demo: %d units, %d results, %d efficient", o.Units, o.ResultUnits, o.Efficient)
	}
	if len(o.Progress) == 0 || o.Progress[len(o.Progress)-1] != [2]int{o.Units, o.Units} {
		t.Errorf("progress %v, want it to end at %d of %d", o.Progress, o.Units, o.Units)
	}
	for i := 1; i < len(o.Progress); i++ {
		if o.Progress[i][0] < o.Progress[i-1][0] {
			t.Errorf("progress went back: %v", o.Progress)
		}
	}
	if o.Summary == "" || o.Sections == 0 {
		t.Errorf("explain: %q with %d sections", o.Summary, o.Sections)
	}
	if !strings.HasPrefix(o.CSVHead, "unit,score,status,") || o.CSVRows != o.Units+1 {
		t.Errorf("CSV header %q, %d rows", o.CSVHead, o.CSVRows)
	}
	if o.XLSXType != "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" || o.XLSXSize < 1000 {
		t.Errorf("xlsx blob %q of %d bytes", o.XLSXType, o.XLSXSize)
	}
	if o.Sheet != "Results" || strings.Join(o.Sheets, ",") != "Results,Targets,Weights,Settings,Data" || len(o.ReadUnits) != o.Units {
		t.Errorf("workbook read back: sheets %v, read %q, %d units", o.Sheets, o.Sheet, len(o.ReadUnits))
	}
	if o.Version == "" {
		t.Error("no engine version")
	}
}

// Cancelling a run rejects its promise with Cancelled, leaves the study
// as it was, and the next run works (on a fresh runner).
func TestCancel(t *testing.T) {
	ctx := browser(t)
	type out struct {
		Name, Message             string
		Same                      bool
		SawProgress               bool
		AfterUnits, ExpectedUnits int
		MainStillAnswers          bool
	}
	// A large invented study (3,000 units, 3 inputs, 2 outputs) so that the
	// run is still going when it is cancelled.
	o := eval[out](t, ctx, `
const eng = T.eng;
const n = 3000;
let seed = 7;
const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
const study = { format: 1, title: 'big', units: [], measures: [
  { name: 'a', role: 'input' }, { name: 'b', role: 'input' }, { name: 'c', role: 'input' },
  { name: 'p', role: 'output' }, { name: 'q', role: 'output' }], values: [],
  settings: { returns: 'variable', orientation: 'input', secondStage: true, scaleDetail: true, super: false } };
for (let i = 0; i < n; i++) {
  study.units.push('U' + i);
  study.values.push([1 + 9 * rnd(), 1 + 9 * rnd(), 1 + 9 * rnd(), 1 + 9 * rnd(), 1 + 9 * rnd()]);
}
const before = JSON.stringify(study);
let sawProgress = false;
let h;
const progressed = new Promise((resolve) => {
  h = eng.run(study, { onProgress: () => { sawProgress = true; resolve(); } });
});
await Promise.race([progressed, new Promise((r) => setTimeout(r, 20000))]);
h.cancel();
let name = '', message = '';
try { await h.promise; } catch (err) { name = err.name; message = err.message; }
const main = await eng.demo();
const small = await eng.demo();
const again = await eng.run(small, {}).promise;
return { Name: name, Message: message, Same: JSON.stringify(study) === before, SawProgress: sawProgress,
  AfterUnits: again.units.length, ExpectedUnits: small.units.length, MainStillAnswers: main.units.length > 0 };`)
	if o.Name != "Cancelled" || !(o.Message != "") {
		t.Errorf("cancelled run rejected with %q: %q, want Cancelled", o.Name, o.Message)
	}
	if !o.Same {
		t.Error("the study changed during the cancelled run")
	}
	if !o.SawProgress {
		t.Error("no progress before cancelling (the run finished or never started?)")
	}
	if o.AfterUnits != o.ExpectedUnits || !o.MainStillAnswers {
		t.Errorf("after cancel: run gave %d units, want %d; main worker answers: %v", o.AfterUnits, o.ExpectedUnits, o.MainStillAnswers)
	}
}

// Failures reach the page as rejected promises with the engine's message;
// the engine keeps answering afterwards.
func TestErrorsAndText(t *testing.T) {
	ctx := browser(t)
	type out struct {
		ValidateErr, RunErr, FormatErr string
		ParsedUnits                    []string
		ProblemRow, ProblemCol         int
		Latin1Unit                     string
		StillWorks                     bool
	}
	o := eval[out](t, ctx, `
const eng = T.eng;
const msg = async (p) => { try { await p; return ''; } catch (err) { return err.name + ': ' + err.message; } };
const validateErr = await msg(eng.validate({ format: 1, units: 'nonsense' }));
const runErr = await msg(eng.run({ format: 1, units: [], measures: [], values: [] }).promise);
const formatErr = await msg(eng.parseFile(new File(['x'], 'old.xls')));
const parsed = await eng.parseFile(new File(['depot;staff;parcels\nNorth;4;120\nSouth;five;90\n'], 'depots.csv'));
const p = parsed.problems.find((x) => x.text === 'five') || {};
// Windows-1252 bytes: "Zürich" with ü as 0xFC.
const latin = new Uint8Array([0x75,0x6e,0x69,0x74,0x2c,0x78,0x2c,0x79,0x0a,0x5a,0xfc,0x72,0x69,0x63,0x68,0x2c,0x31,0x2c,0x32,0x0a]);
const l = await eng.parseFile(new File([latin], 'latin.csv'));
const still = (await eng.demo()).units.length > 0;
return { ValidateErr: validateErr, RunErr: runErr, FormatErr: formatErr, ParsedUnits: parsed.study.units,
  ProblemRow: p.row || 0, ProblemCol: p.column || 0, Latin1Unit: l.study.units[0], StillWorks: still };`)
	for name, e := range map[string]string{"validate": o.ValidateErr, "run": o.RunErr, "old format": o.FormatErr} {
		if !strings.HasPrefix(e, "EngineError: ") || len(e) < len("EngineError: ")+10 {
			t.Errorf("%s: %q, want an EngineError with a message", name, e)
		}
	}
	if !strings.Contains(o.FormatErr, ".xlsx or CSV") {
		t.Errorf("old format message %q", o.FormatErr)
	}
	if strings.Join(o.ParsedUnits, ",") != "North,South" || o.ProblemRow != 3 || o.ProblemCol != 2 {
		t.Errorf("parsed units %v, problem at row %d column %d (want row 3, column 2)", o.ParsedUnits, o.ProblemRow, o.ProblemCol)
	}
	if o.Latin1Unit != "Zürich" {
		t.Errorf("Windows-1252 file read unit %q, want Zürich", o.Latin1Unit)
	}
	if !o.StillWorks {
		t.Error("the engine stopped answering after errors")
	}
}
