package browsertest

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/chromedp"
	"github.com/xuri/excelize/v2"

	"peerlens/engine/dea"
	"peerlens/engine/study"
	"peerlens/site/sitecopy"
)

// demoTSV writes the demo study as the tab-separated text a spreadsheet
// puts on the clipboard.
func demoTSV(s *study.Study) string {
	var b strings.Builder
	b.WriteString("Pharmacy")
	for _, m := range s.Measures {
		b.WriteString("\t" + m.Name)
	}
	b.WriteString("\n")
	for i, name := range s.Units {
		b.WriteString(name)
		for _, v := range s.Values[i] {
			b.WriteString("\t" + strconv.FormatFloat(v, 'f', -1, 64))
		}
		b.WriteString("\n")
	}
	return b.String()
}

// pageStudy reads the study the page holds, through the engine's own
// study file reader.
func pageStudy(tb *tab) *study.Study {
	tb.t.Helper()
	js := eval[string](tb, `JSON.stringify(window.peerlens.study)`)
	s, err := study.Read(strings.NewReader(js))
	if err != nil {
		tb.t.Fatalf("the page's study does not read back: %v\n%s", err, short(js))
	}
	return s
}

// nativeRun runs a study with the engine compiled for this machine.
func nativeRun(t *testing.T, s *study.Study) *dea.Result {
	t.Helper()
	d, _, err := s.Data()
	if err != nil {
		t.Fatalf("native study data: %v", err)
	}
	r, err := dea.Run(context.Background(), &d, s.Settings, nil)
	if err != nil {
		t.Fatalf("native run: %v", err)
	}
	return r
}

// TestPastedDemoScoresMatchNativeEngine pastes the demo table, sets the
// demo's roles, runs it in the page, and compares every unit's score shown
// with the engine's native result for the same study. Source: the engine
// itself (engine/study and engine/dea), run natively in this test.
func TestPastedDemoScoresMatchNativeEngine(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	demo := study.Demo()
	tb.paste(demoTSV(demo))
	for _, m := range demo.Measures {
		tb.setRole(m.Name, string(m.Role))
	}
	got := pageStudy(tb)
	if strings.Join(got.Units, "|") != strings.Join(demo.Units, "|") {
		t.Fatalf("units read from the paste differ from the demo:\n got %q\nwant %q", got.Units, demo.Units)
	}
	for j, m := range demo.Measures {
		if j >= len(got.Measures) || got.Measures[j].Name != m.Name || got.Measures[j].Role != m.Role {
			t.Fatalf("measure %d: got %+v, want %s as %s", j, got.Measures, m.Name, m.Role)
		}
	}
	for i := range demo.Values {
		for j, v := range demo.Values[i] {
			if got.Values[i][j] != v {
				t.Fatalf("value of %s, %s: page read %v, demo has %v", demo.Units[i], demo.Measures[j].Name, got.Values[i][j], v)
			}
		}
	}
	tb.runStudy()
	want := nativeRun(t, got)
	shown := tb.shownScores()
	if len(shown) != len(want.Units) {
		t.Fatalf("the page shows %d result rows, the engine has %d units", len(shown), len(want.Units))
	}
	for _, u := range want.Units {
		row, ok := shown[u.Name]
		if !ok {
			t.Errorf("%s: no row in the results table", u.Name)
			continue
		}
		score, err := strconv.ParseFloat(row.Score, 64)
		if err != nil {
			t.Errorf("%s: data-score %q is not a number", u.Name, row.Score)
			continue
		}
		if math.Abs(score-u.Score) > 1e-9 {
			t.Errorf("%s: page shows score %.12g, native engine %.12g", u.Name, score, u.Score)
		}
		if row.Status != string(u.Status) {
			t.Errorf("%s: page shows status %q, native engine %q", u.Name, row.Status, u.Status)
		}
	}
	// The shown text agrees with the exact value to the digits shown.
	mismatch := eval[string](tb, `(() => {
		for (const tr of document.querySelectorAll('#results-table tbody tr[data-unit]')) {
			const s = Number(tr.dataset.score), text = tr.querySelector('.col-score').textContent;
			if (Math.abs(Number(text) - s) > 0.00005 + 1e-12) return tr.dataset.unit + ': ' + text + ' vs ' + s;
		}
		return '';
	})()`)
	if mismatch != "" {
		t.Errorf("a score cell does not show its value: %s", mismatch)
	}
}

// TestFrontierChartMarksAndTargetPath checks the two-measure chart: one
// mark per unit, the frontier line, and the chosen unit's path to its
// target.
func TestFrontierChartMarksAndTargetPath(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	tb.runStudy()
	units := eval[int](tb, `window.peerlens.result.units.length`)
	marks := eval[int](tb, `document.querySelectorAll('#frontier-chart .unit-mark').length`)
	if marks != units {
		t.Errorf("frontier chart has %d unit marks, want one per unit (%d)", marks, units)
	}
	d := eval[string](tb, `(document.querySelector('#frontier-chart path.frontier-line') || {getAttribute: () => ''}).getAttribute('d')`)
	if strings.Count(d, "L") < 2 {
		t.Errorf("frontier line path %q has fewer than three points", d)
	}
	eff := eval[int](tb, `document.querySelectorAll('#frontier-chart .unit-mark.efficient').length`)
	wantEff := eval[int](tb, `window.peerlens.result.units.filter(u => u.status === 'efficient' || u.status === 'weakly efficient').length`)
	if eff != wantEff || eff == 0 {
		t.Errorf("%d marks drawn as efficient, the result has %d efficient units", eff, wantEff)
	}
	note := eval[string](tb, `document.getElementById('frontier-note').textContent`)
	if !strings.Contains(note, "these two measures alone") {
		t.Errorf("with five measures the chart must say its line is the frontier of two measures alone; note is %q", note)
	}
	if n := eval[int](tb, `document.querySelectorAll('#frontier-chart .target-path').length`); n != 0 {
		t.Errorf("a target path is drawn before any unit is chosen")
	}
	// Choose the lowest-scoring unit in the results table.
	k := eval[int](tb, `(() => { const us = window.peerlens.result.units; let k = 0; us.forEach((u, i) => { if (u.score < us[k].score) k = i; }); return k; })()`)
	tb.do(`document.getElementById('results-table').querySelector('button.sort[data-sort="score"]').click()`)
	sorted := eval[[]float64](tb, `[...document.querySelectorAll('#results-table tbody tr[data-unit]')].map(tr => Number(tr.dataset.score))`)
	for i := 1; i < len(sorted); i++ {
		if sorted[i] > sorted[i-1] {
			t.Fatalf("after sorting by score the rows are not in descending order: %v", sorted)
		}
	}
	if s := eval[string](tb, `document.querySelector('#results-table th.col-score').getAttribute('aria-sort')`); s != "descending" {
		t.Errorf("score header aria-sort = %q, want descending", s)
	}
	tb.chooseUnit(k)
	tb.waitFor(`document.querySelector('#frontier-chart .target-path line')`, 10*time.Second, "the target path of the chosen unit")
	tb.waitFor(fmt.Sprintf(`document.querySelector('#frontier-chart .unit-mark.selected[data-unit="%d"]')`, k), 5*time.Second, "the chosen unit's mark")
	name := eval[string](tb, fmt.Sprintf(`window.peerlens.result.units[%d].name`, k))
	tb.waitFor(`document.querySelector('#unit-body .unit-name')`, 10*time.Second, "the unit report")
	if got := eval[string](tb, `document.querySelector('#unit-body .unit-name').textContent`); got != name {
		t.Errorf("unit report is for %q, want %q", got, name)
	}
	// Clicking a mark in the chart chooses that unit.
	other := eval[int](tb, fmt.Sprintf(`window.peerlens.result.units.findIndex((u, i) => i !== %d && u.status === 'inefficient')`, k))
	// (a click event on the mark itself: marks may overlap on screen)
	tb.do(fmt.Sprintf(`document.querySelector('#frontier-chart .unit-mark[data-unit="%d"]').dispatchEvent(new MouseEvent('click', {bubbles: true}))`, other))
	tb.waitFor(fmt.Sprintf(`window.peerlens.selected === %d && document.querySelector('#frontier-chart .unit-mark.selected[data-unit="%d"]')`, other, other), 5*time.Second, "the clicked unit to be chosen")
	// Charts save as SVG text with the same marks.
	svgText := eval[string](tb, `new XMLSerializer().serializeToString(document.querySelector('#histogram-chart svg'))`)
	if !strings.Contains(svgText, "<rect") || !strings.Contains(svgText, "http://www.w3.org/2000/svg") {
		t.Errorf("histogram SVG looks wrong: %s", short(svgText))
	}
}

// allowDownloads sends the browser's downloads to a fresh folder, with
// progress events (each file is saved under its download's GUID), and
// returns the folder.
func (tb *tab) allowDownloads() string {
	tb.t.Helper()
	dir := sitecopy.TempDir(tb.t)
	if _, err := chromedp.CallBrowser(tb.ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior:      browser.SetDownloadBehaviorBehaviorAllowAndName,
		DownloadPath:  dir,
		EventsEnabled: ptr(true),
	}); err != nil {
		tb.t.Fatalf("allowing downloads: %v", err)
	}
	return dir
}

// download clicks a button and returns the file the browser saved.
func (tb *tab) download(sel, dir string) []byte {
	tb.t.Helper()
	ctx, cancel := context.WithTimeout(tb.ctx, 20*time.Second)
	defer cancel()
	progress := chromedp.BrowserEvents(ctx, browser.DownloadProgress)
	tb.click(sel)
	for ev, err := range progress {
		if err != nil {
			status, _ := chromedp.Run(tb.ctx, chromedp.Evaluate[string](`document.getElementById('run-status').textContent`))
			tb.t.Fatalf("waiting for the download from %s: %v (page says: %s)", sel, err, status)
		}
		if ev.State == browser.DownloadProgressStateCanceled {
			tb.t.Fatalf("the download from %s was cancelled", sel)
		}
		if ev.State != browser.DownloadProgressStateCompleted {
			continue
		}
		b, err := os.ReadFile(filepath.Join(dir, ev.GUID))
		if err != nil {
			tb.t.Fatalf("reading the download: %v", err)
		}
		return b
	}
	tb.t.Fatalf("no download from %s", sel)
	return nil
}

// TestExportsHoldWhatTheTableShows downloads the CSV and .xlsx files and
// compares each unit's score and status with the results table.
func TestExportsHoldWhatTheTableShows(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	tb.runStudy()
	shown := tb.shownScores()
	dir := tb.allowDownloads()
	check := func(kind string, rows [][]string) {
		t.Helper()
		if len(rows) < 2 {
			t.Fatalf("%s export has %d rows", kind, len(rows))
		}
		col := map[string]int{}
		for i, h := range rows[0] {
			col[h] = i
		}
		for _, need := range []string{"unit", "score", "status"} {
			if _, ok := col[need]; !ok {
				t.Fatalf("%s export has no %q column; header %q", kind, need, rows[0])
			}
		}
		seen := 0
		for _, r := range rows[1:] {
			name := r[col["unit"]]
			want, ok := shown[name]
			if !ok {
				t.Errorf("%s export has unit %q that the table does not show", kind, name)
				continue
			}
			seen++
			got, err := strconv.ParseFloat(r[col["score"]], 64)
			exact, _ := strconv.ParseFloat(want.Score, 64)
			if err != nil || math.Abs(got-exact) > 1e-9 {
				t.Errorf("%s export: %s score %q, table %s", kind, name, r[col["score"]], want.Score)
			}
			if r[col["status"]] != want.Status {
				t.Errorf("%s export: %s status %q, table %q", kind, name, r[col["status"]], want.Status)
			}
		}
		if seen != len(shown) {
			t.Errorf("%s export has %d of the %d units in the table", kind, seen, len(shown))
		}
	}

	csvBytes := tb.download("#export-csv", dir)
	rows, err := csv.NewReader(bytes.NewReader(csvBytes)).ReadAll()
	if err != nil {
		t.Fatalf("the CSV export does not parse: %v", err)
	}
	check("CSV", rows)

	xlsxBytes := tb.download("#export-xlsx", dir)
	f, err := excelize.OpenReader(bytes.NewReader(xlsxBytes))
	if err != nil {
		t.Fatalf("the .xlsx export does not open: %v", err)
	}
	defer f.Close()
	var sheetRows [][]string
	for _, name := range f.GetSheetList() {
		r, err := f.GetRows(name, excelize.Options{RawCellValue: true})
		if err == nil && len(r) > 0 && len(r[0]) > 1 && r[0][0] == "unit" && r[0][1] == "score" {
			sheetRows = r
			break
		}
	}
	if sheetRows == nil {
		t.Fatalf("no sheet of the .xlsx export starts with unit, score; sheets %q", f.GetSheetList())
	}
	check("xlsx", sheetRows)
}

func ptr[T any](v T) *T { return &v }

// TestUnitNameIsShownAsText pastes a unit whose name is HTML and checks
// that it shows as that text everywhere and runs nothing.
func TestUnitNameIsShownAsText(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	const evil = `<img src=x onerror=alert(1)>`
	tb.paste("Name\tStaff\tBudget\tVisits\n" + evil + "\t3\t40\t10\nBrook\t4\t35\t12\nCedar\t5\t60\t11\nDale\t6\t50\t16\n")
	tb.runStudy()
	k := eval[int](tb, `window.peerlens.result.units.findIndex(u => u.name === `+jsString(evil)+`)`)
	if k < 0 {
		t.Fatalf("the unit named %q is not in the result", evil)
	}
	tb.chooseUnit(k)
	tb.waitFor(`document.querySelector('#unit-body .unit-name')`, 10*time.Second, "the unit report")
	// Leave it out and bring it back, so it also shows in the left-out list.
	tb.click(`#preview tr[data-unit="0"] input[type=checkbox]`)
	tb.waitFor(`document.querySelector('#left-out li[data-unit="0"]')`, 5*time.Second, "the left-out list")
	texts := eval[map[string]string](tb, `({
		preview: document.querySelector('#preview tr[data-unit="0"] td[data-col="0"]').firstChild.textContent,
		results: document.querySelector('#results-table button.unit-link[data-unit="`+strconv.Itoa(k)+`"]').textContent,
		report: document.querySelector('#unit-body .unit-name').textContent,
		leftOut: document.querySelector('#left-out li[data-unit="0"] .unit-name').textContent,
		chart: document.querySelector('#frontier-chart .unit-mark[data-unit="`+strconv.Itoa(k)+`"] title').textContent,
	})`)
	for where, text := range texts {
		if where == "chart" {
			if !strings.HasPrefix(text, evil+":") {
				t.Errorf("chart label %q does not start with the name as text", text)
			}
			continue
		}
		if text != evil {
			t.Errorf("%s shows %q, want the name as text %q", where, text, evil)
		}
	}
	if n := eval[int](tb, `document.querySelectorAll('img').length`); n != 0 {
		t.Errorf("the page holds %d img elements; the name must stay text", n)
	}
	time.Sleep(300 * time.Millisecond)
	tb.mu.Lock()
	defer tb.mu.Unlock()
	if len(tb.dialogs) > 0 {
		t.Errorf("the page opened dialogs: %q", tb.dialogs)
	}
}

// TestBadCellLeaveOutAndBringBack checks that a cell that is not a number
// gets its message at that cell, that leaving its unit out lets the study
// run without it, and that bringing it back works.
func TestBadCellLeaveOutAndBringBack(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	tb.paste("Branch\tStaff\tLoans\nAsh\t3\t10\nBirch\tabc\t12\nCedar\t5\t11\nDale\t6\t16\nElm\t4\t9\n")
	// Birch is the second data row (row 3 of the text), Staff the second column.
	cell := eval[map[string]string](tb, `(() => {
		const tr = document.querySelector('#preview tr[data-unit="1"]');
		const col = [...document.querySelectorAll('#preview thead th[data-col]')].find(th => th.querySelector('.col-title').textContent === 'Staff').dataset.col;
		const td = tr.querySelector('td[data-col="' + col + '"]');
		return {text: td.firstChild ? td.firstChild.textContent : '', cls: td.className, msg: td.dataset.msg || '', ids: td.dataset.msgIds || '', row: tr.querySelector('th').firstChild.textContent};
	})()`)
	if cell["text"] != "abc" {
		t.Errorf("the bad cell shows %q, want the text as typed, abc", cell["text"])
	}
	if !strings.Contains(cell["cls"], "marked") || !strings.Contains(cell["cls"], "sev-error") {
		t.Errorf("the bad cell is not highlighted as an error: class %q", cell["cls"])
	}
	if cell["msg"] == "" {
		t.Errorf("the bad cell carries no message")
	}
	if cell["row"] != "3" {
		t.Errorf("Birch is shown as row %q, want row 3 of the pasted text", cell["row"])
	}
	// The message list links to the cell.
	firstID := strings.Fields(cell["ids"] + " none")[0]
	tb.click(fmt.Sprintf(`#issues li[data-msg-id="%s"] button`, firstID))
	if focused := eval[string](tb, `document.activeElement.firstChild ? document.activeElement.firstChild.textContent : ''`); focused != "abc" {
		t.Errorf("the message's link focuses %q, want the bad cell", focused)
	}
	// The run is refused while the error stands.
	tb.click("#run")
	tb.waitFor(`document.getElementById('run-status').textContent.includes('cannot be compared yet')`, 5*time.Second, "the run to be refused")
	// Leave Birch out: the study runs with the other four.
	tb.click(`#preview tr[data-unit="1"] input[type=checkbox]`)
	tb.waitFor(`document.querySelector('#left-out li[data-unit="1"]')`, 5*time.Second, "Birch in the left-out list")
	if out := eval[[]string](tb, `window.peerlens.study.leftOut`); len(out) != 1 || out[0] != "Birch" {
		t.Errorf("study leaves out %q, want [Birch]", out)
	}
	tb.waitFor(`!document.querySelector('#study-issues li.error')`, 5*time.Second, "the study check to accept the table once Birch is left out")
	tb.runStudy()
	names := eval[[]string](tb, `window.peerlens.result.units.map(u => u.name)`)
	if strings.Join(names, ",") != "Ash,Cedar,Dale,Elm" {
		t.Errorf("result units %q, want Ash, Cedar, Dale, Elm", names)
	}
	// Bring Birch back from the list.
	tb.click(`#left-out li[data-unit="1"] button`)
	tb.waitFor(`document.querySelector('#preview tr[data-unit="1"] input[type=checkbox]').checked`, 5*time.Second, "Birch's box to be ticked again")
	if out := eval[[]string](tb, `window.peerlens.study.leftOut`); len(out) != 0 {
		t.Errorf("after bringing Birch back the study still leaves out %q", out)
	}
	if got := eval[string](tb, `document.getElementById('left-out').textContent`); !strings.Contains(got, "Nobody") {
		t.Errorf("left-out list says %q after bringing Birch back", got)
	}
	tb.waitFor(`document.querySelector('#study-issues li.error')`, 5*time.Second, "the study check to refuse the missing value again")
	if !eval[bool](tb, `!!document.querySelector('#preview tr[data-unit="1"] td.marked.sev-error')`) {
		t.Errorf("Birch's unreadable cell lost its mark")
	}
	if !eval[bool](tb, `document.getElementById('results').classList.contains('stale')`) {
		t.Errorf("the results are not marked out of date after the table changed")
	}
}

// bigTSV makes a generated study large enough that a run takes seconds:
// n units with three inputs and two outputs, from a fixed seed.
func bigTSV(n int) string {
	rng := rand.New(rand.NewPCG(7, 11))
	var b strings.Builder
	b.WriteString("Unit\tStaff\tBudget\tSpace\tCases\tVisits\n")
	for i := 0; i < n; i++ {
		x1, x2, x3 := 5+rng.Float64()*50, 100+rng.Float64()*900, 50+rng.Float64()*400
		eff := 0.5 + 0.5*rng.Float64()
		y1 := eff * (x1*2 + x2*0.1 + rng.Float64()*20)
		y2 := eff * (x3*0.5 + x1*3 + rng.Float64()*30)
		fmt.Fprintf(&b, "U%05d\t%.2f\t%.1f\t%.1f\t%.2f\t%.2f\n", i+1, x1, x2, x3, y1, y2)
	}
	return b.String()
}

// TestCancelLongRunKeepsPageUsable starts a long run, cancels it, and
// checks that the page answers, shows no partial results and keeps the
// study as it was.
func TestCancelLongRunKeepsPageUsable(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	tb.paste(bigTSV(6000))
	if n := eval[int](tb, `document.querySelectorAll('#preview tbody tr[data-unit]').length`); n == 0 || n > 200 {
		t.Errorf("the preview of 6000 rows puts %d rows in the page; it should draw only those in view", n)
	}
	tb.do(`document.getElementById('opt-super').click()`)
	before := eval[string](tb, `JSON.stringify(window.peerlens.study)`)
	tb.click("#run")
	tb.waitFor(`window.peerlens.running && !document.getElementById('cancel').hidden`, 10*time.Second, "the run to start")
	tb.cancelRunning(before)
	// The page still answers: leave a unit out and bring it back, then run
	// the demo study to the end.
	tb.click(`#preview tr[data-unit="0"] input[type=checkbox]`)
	tb.waitFor(`window.peerlens.study.leftOut.length === 1`, 5*time.Second, "a unit to be left out")
	tb.click(`#left-out li[data-unit="0"] button`)
	tb.waitFor(`window.peerlens.study.leftOut.length === 0`, 5*time.Second, "the unit to come back")
	before2 := eval[int](tb, `window.peerlens.loads`)
	tb.click("#load-demo")
	tb.waitFor(fmt.Sprintf(`window.peerlens.loads > %d`, before2), 20*time.Second, "the demo study to load")
	tb.runStudy()
	if n := eval[int](tb, `window.peerlens.result.units.length`); n != len(study.Demo().Units) {
		t.Errorf("after the cancel, the demo run gave %d units", n)
	}
}

// TestLayoutAtLaptopAndTabletWidths takes screenshots at 1280 and 800
// pixels wide (kept in PEERLENS_SHOTS when set) and checks that nothing
// makes the page scroll sideways.
func TestLayoutAtLaptopAndTabletWidths(t *testing.T) {
	t.Parallel()
	for _, w := range []int{1280, 800} {
		t.Run(strconv.Itoa(w), func(t *testing.T) {
			tb := open(t, w, 900)
			tb.runStudy()
			k := eval[int](tb, `window.peerlens.result.units.findIndex(u => u.status === 'inefficient')`)
			tb.chooseUnit(k)
			tb.waitFor(`document.querySelector('#unit-body .unit-name')`, 10*time.Second, "the unit report")
			over := eval[int](tb, `document.documentElement.scrollWidth - document.documentElement.clientWidth`)
			if over > 0 {
				t.Errorf("at %d px the page is %d px wider than the window", w, over)
			}
			t.Logf("screenshot: %s", tb.screenshot(fmt.Sprintf("peerlens-%d.png", w)))
		})
	}
}

// TestFrontierOutlineGeometry checks the outline the two-measure chart draws
// (site/js/geometry.js) on small point sets whose frontiers are known by
// hand. Source: common practice — with one input and one output the
// variable-returns frontier is the upper concave hull starting at the
// smallest input (Banker, Charnes & Cooper 1984, their figure of the BCC
// frontier; from memory), and the constant-returns frontier is the ray from
// the origin through the unit with the highest output/input ratio.
func TestFrontierOutlineGeometry(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	got := eval[map[string][][]float64](tb, `(async () => {
		const g = await import('./js/geometry.js');
		const pts = [[2, 1], [3, 3], [5, 4], [6, 4.5], [4, 2]];
		return {
			vrs: g.ioFrontier(pts, 'variable', 0, 0, 10),
			crs: g.ioFrontier(pts, 'constant', 0, 0, 10).slice(0, 2),
			nirs: g.ioFrontier(pts, 'non-increasing', 0, 0, 10),
			iso: g.lowerLeftFrontier([[1, 4], [2, 2], [4, 1], [3, 3], [2.5, 1.8]], 5, 5),
			ppf: g.upperRightFrontier([[1, 4], [2, 3.5], [4, 1], [2, 2], [3.5, 2.5]]),
		};
	})()`)
	want := map[string][][]float64{
		"vrs":  {{2, 0}, {2, 1}, {3, 3}, {6, 4.5}, {100, 4.5}},
		"crs":  {{0, 0}, {0, 0}},
		"nirs": {{0, 0}, {0, 0}, {3, 3}, {6, 4.5}, {100, 4.5}},
		"iso":  {{1, 50}, {1, 4}, {2, 2}, {4, 1}, {50, 1}}, // (2.5, 1.8) lies above the segment (2,2)-(4,1)
		"ppf":  {{4, 0}, {4, 1}, {3.5, 2.5}, {2, 3.5}, {1, 4}, {0, 4}},
	}
	for name, w := range want {
		g := got[name]
		if name == "crs" {
			// The ray leaves the origin with slope 1 (unit (3,3) has the best ratio).
			line := eval[[][]float64](tb, `(async () => (await import('./js/geometry.js')).ioFrontier([[2, 1], [3, 3], [5, 4], [6, 4.5], [4, 2]], 'constant', 0, 0, 10))()`)
			if len(line) < 3 || line[1][0] != 0 || line[1][1] != 0 || math.Abs(line[2][1]/line[2][0]-1) > 1e-12 || line[2][0] < 10 {
				t.Errorf("constant-returns outline %v: want the origin, then a ray of slope 1 past the chart edge", line)
			}
			continue
		}
		if len(g) != len(w) {
			t.Errorf("%s outline %v, want %v", name, g, w)
			continue
		}
		for i := range w {
			if math.Abs(g[i][0]-w[i][0]) > 1e-12 || math.Abs(g[i][1]-w[i][1]) > 1e-12 {
				t.Errorf("%s outline %v, want %v", name, g, w)
				break
			}
		}
	}
}

// TestOpenFilesAndNumberReading opens a CSV file and an .xlsx workbook
// through the "open a file" control, and pastes a table with decimal
// commas, checking that each is read and that the preview says how each
// column's numbers were read.
func TestOpenFilesAndNumberReading(t *testing.T) {
	t.Parallel()
	tb := open(t, 1280, 900)
	dir := sitecopy.TempDir(t)
	csvPath := filepath.Join(dir, "depots.csv")
	if err := os.WriteFile(csvPath, []byte("Depot,Drivers,Fuel,Parcels\nNorth,12,340,5200\nSouth,9,310,4100\nEast,15,420,6100\nWest,7,250,3900\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	xf := excelize.NewFile()
	rows := [][]any{{"Depot", "Drivers", "Fuel", "Parcels"}, {"Harbour", 11, 300.5, 5000}, {"Ridge", 8, 280.25, 4200}, {"Vale", 13, 390, 5600}}
	for i, r := range rows {
		cell, _ := excelize.CoordinatesToCellName(1, i+1)
		if err := xf.SetSheetRow("Sheet1", cell, &r); err != nil {
			t.Fatal(err)
		}
	}
	xlsxPath := filepath.Join(dir, "depots.xlsx")
	if err := xf.SaveAs(xlsxPath); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		path  string
		units []string
	}{{csvPath, []string{"North", "South", "East", "West"}}, {xlsxPath, []string{"Harbour", "Ridge", "Vale"}}} {
		before := eval[int](tb, `window.peerlens.loads`)
		if err := chromedp.Do(tb.ctx, chromedp.SetUploadFiles(chromedp.ID("file-input"), []string{c.path})); err != nil {
			t.Fatalf("choosing %s: %v", c.path, err)
		}
		tb.waitFor(fmt.Sprintf(`window.peerlens.loads > %d`, before), 30*time.Second, "the file "+filepath.Base(c.path)+" to be read")
		if got := eval[[]string](tb, `window.peerlens.study.units`); strings.Join(got, ",") != strings.Join(c.units, ",") {
			t.Errorf("%s: units %q, want %q", filepath.Base(c.path), got, c.units)
		}
	}
	tb.paste("Depot;Drivers;Fuel;Parcels\nNorth;12,5;340,25;5200\nSouth;9,75;310,5;4100\nEast;15,25;420,75;6100\n")
	if got := eval[[]float64](tb, `window.peerlens.study.values[0]`); len(got) != 3 || got[0] != 12.5 || got[1] != 340.25 {
		t.Errorf("decimal commas read as %v, want 12.5, 340.25, 5200", got)
	}
	note := eval[string](tb, `[...document.querySelectorAll('#preview thead th[data-col]')].find(th => th.querySelector('.col-title').textContent === 'Fuel').querySelector('.col-note').textContent`)
	if !strings.Contains(note, "decimal comma") {
		t.Errorf("the Fuel column's note is %q; it should say the numbers were read with a decimal comma", note)
	}
}
