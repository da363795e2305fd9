package browsertest

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"peerlens/site/sitecopy"
)

// buildDist builds the engine, the spreadsheet module and the single-file
// page as ./build.sh dist does, into a temporary folder, and returns the page's path.
func buildDist(t *testing.T) string {
	t.Helper()
	if skipReason != "" {
		t.Skip(skipReason)
	}
	root, err := moduleRoot()
	if err != nil {
		t.Fatal(err)
	}
	dir := sitecopy.TempDir(t)
	wasm := filepath.Join(dir, "peerlens.wasm")
	build := exec.Command("go", "build", "-trimpath", "-ldflags=-s -w", "-o", wasm, "./wasm")
	build.Dir = root
	build.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("building the engine: %v\n%s", err, out)
	}
	sheets := filepath.Join(dir, "peerlens-sheets.wasm")
	build = exec.Command("go", "build", "-trimpath", "-ldflags=-s -w", "-o", sheets, "./wasm/sheets")
	build.Dir = root
	build.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("building the spreadsheet module: %v\n%s", err, out)
	}
	goroot, err := exec.Command("go", "env", "GOROOT").Output()
	if err != nil {
		t.Fatal(err)
	}
	page := filepath.Join(dir, "out", "peerlens.html")
	dist := exec.Command("go", "run", "./site/dist", "-site", "site", "-wasm", wasm, "-sheets", sheets,
		"-wasm-exec", filepath.Join(strings.TrimSpace(string(goroot)), "lib", "wasm", "wasm_exec.js"), "-out", page)
	dist.Dir = root
	if out, err := dist.CombinedOutput(); err != nil {
		t.Fatalf("building the single file: %v\n%s", err, out)
	}
	return page
}

// TestDistOfflineFromFile opens the single-file page from a file:// address
// with the network cut off, runs the demo study and checks that results
// appear, that nothing but the file itself (and data: and blob: addresses)
// was requested, and that the file's policy forbids connections.
func TestDistOfflineFromFile(t *testing.T) {
	page := buildDist(t)
	html, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	for _, ref := range regexp.MustCompile(`(?:src|href)="([^"#]+)"`).FindAllStringSubmatch(string(html), -1) {
		if !strings.HasPrefix(ref[1], "data:") {
			t.Errorf("the single file still refers to %q", ref[1])
		}
	}
	addr := fileURL(page)
	tb, reqs := browseWith(t, addr, "", demoReady, true)
	tb.runStudy()
	if n := eval[int](tb, `window.peerlens.result.units.length`); n < 2 {
		t.Errorf("results for %d units", n)
	}
	if eval[bool](tb, `document.getElementById('results-body').hidden`) {
		t.Error("the results are not shown")
	}
	if got := eval[int](tb, `document.querySelectorAll('#results-table tbody tr[data-unit]').length`); got == 0 {
		t.Error("the results table is empty")
	}
	// The workbook export works offline too: the spreadsheet module comes
	// from inside the file.
	dir := tb.allowDownloads()
	book, err := excelize.OpenReader(bytes.NewReader(tb.download("#export-xlsx", dir)))
	if err != nil {
		t.Fatalf("the offline .xlsx export does not open: %v", err)
	}
	if rows, err := book.GetRows("Results"); err != nil || len(rows) < 3 {
		t.Errorf("offline .xlsx Results sheet: %d rows, %v", len(rows), err)
	}
	tb.checkPolicy()
	csp := eval[string](tb, `document.querySelector('meta[http-equiv="Content-Security-Policy"]').content`)
	for _, want := range []string{"connect-src 'none'", "default-src 'none'", "'wasm-unsafe-eval'", "'sha256-"} {
		if !strings.Contains(csp, want) {
			t.Errorf("the single file's policy %q lacks %q", csp, want)
		}
	}
	if strings.Contains(csp, "unsafe-inline") {
		t.Errorf("the single file's policy allows inline code: %q", csp)
	}
	// A share link made from the file opens in the file again.
	want := tb.editDemo()
	link := tb.makeLink("")
	other, _ := browseWith(t, link, "", `window.peerlens && window.peerlens.runs >= 1`, true)
	sameStudy(t, "study from a link to the single file", other.pageStudy(), want)
	checkOwnFiles(t, reqs.final(t), addr)
}
