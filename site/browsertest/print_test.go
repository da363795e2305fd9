package browsertest

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"peerlens/site/sitecopy"
)

// TestPrintedReport runs the demo study, prints the page to PDF and checks,
// with pdftotext (Debian's poppler-utils), that the paper holds every
// compared unit's name, the cautions, the settings and the method, and none
// of the data-entry controls.
func TestPrintedReport(t *testing.T) {
	pdftotext, err := exec.LookPath("pdftotext")
	if err != nil {
		t.Skip("pdftotext is not installed (apt-get install poppler-utils); the print test needs it")
	}
	tb := open(t, 1280, 900)
	tb.runStudy()
	tb.waitFor(`document.getElementById('print-settings').children.length > 0`, 10*time.Second, "the report's settings")
	units := eval[[]string](tb, `window.peerlens.result.units.map((u) => u.name)`)
	pdf, err := chromedp.Run(tb.ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4)))
	if err != nil {
		t.Fatalf("printing to PDF: %v", err)
	}
	dir := sitecopy.TempDir(t)
	in := filepath.Join(dir, "report.pdf")
	if err := os.WriteFile(in, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(pdftotext, "-layout", in, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	// Layout may break long words across lines; compare with spaces squeezed.
	text := strings.Join(strings.Fields(string(out)), " ")
	if len(units) == 0 {
		t.Fatal("the run gave no units")
	}
	for _, name := range units {
		if !strings.Contains(text, name) {
			t.Errorf("the printed report lacks the unit %q", name)
		}
	}
	for _, want := range []string{
		"Read these scores with care",
		"Scores are relative to this sample",
		"deserve human review",
		"About this report",
		"Units compared",
		"How the scores were found",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("the printed report lacks %q", want)
		}
	}
	for _, control := range []string{"Read the pasted table", "Compare the units", "Make a share link", "Download CSV"} {
		if strings.Contains(text, control) {
			t.Errorf("the printed report shows the control %q", control)
		}
	}
	if t.Failed() {
		t.Logf("printed text:\n%s", out)
	}
}
