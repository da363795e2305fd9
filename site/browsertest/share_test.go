package browsertest

import (
	"encoding/json"
	"fmt"
	"os"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"peerlens/site/sitecopy"
)

const demoReady = `window.peerlens && window.peerlens.loads >= 1`

// editDemo changes the demo study in ways a study file must keep: a unit
// left out and other model settings. It returns the study as the page has it.
func (tb *tab) editDemo() string {
	tb.t.Helper()
	tb.click("#inc-2")
	tb.click("#rts-variable")
	tb.click("#or-output")
	tb.click("#opt-second")
	tb.waitFor(`window.peerlens.study.leftOut.length === 1 && window.peerlens.study.settings.orientation !== undefined`, 5*time.Second, "the edits to reach the study")
	return eval[string](tb, `JSON.stringify(window.peerlens.study)`)
}

// sameStudy fails unless two study JSON texts hold the same values.
func sameStudy(t *testing.T, what, got, want string) {
	t.Helper()
	var g, w any
	if err := json.Unmarshal([]byte(got), &g); err != nil {
		t.Fatalf("%s: reading %q: %v", what, short(got), err)
	}
	if err := json.Unmarshal([]byte(want), &w); err != nil {
		t.Fatalf("%s: reading the expected study: %v", what, err)
	}
	if !reflect.DeepEqual(g, w) {
		t.Errorf("%s: the study differs\n got %s\nwant %s", what, got, want)
	}
}

// pageStudy is the study the page shows now, as JSON.
func (tb *tab) pageStudy() string {
	return eval[string](tb, `JSON.stringify(window.peerlens.study)`)
}

// waitRestored waits until a study was opened and its results computed.
func (tb *tab) waitRestored(runsBefore int) {
	tb.t.Helper()
	tb.waitFor(fmt.Sprintf(`window.peerlens.runs > %d && !document.getElementById('results-body').hidden`, runsBefore), 60*time.Second, "the opened study's results")
}

func TestStudyFileRoundTrip(t *testing.T) {
	dir := sitecopy.TempDir(t)
	tb, _ := browse(t, baseURL, dir, demoReady)
	want := tb.editDemo()
	tb.click("#save-study")
	files := waitFiles(t, dir, 1)
	saved, err := os.ReadFile(files[0])
	if err != nil {
		t.Fatal(err)
	}
	sameStudy(t, "saved file", string(saved), want)

	tb.click("#load-demo")
	tb.waitFor(`window.peerlens.study.leftOut.length === 0`, 10*time.Second, "the demo study again")
	runs := eval[int](tb, `window.peerlens.runs`)
	if err := chromedp.Do(tb.ctx, chromedp.SetUploadFiles(chromedp.CSS("#open-study"), files)); err != nil {
		t.Fatalf("choosing the study file: %v", err)
	}
	tb.waitRestored(runs)
	sameStudy(t, "reopened file", tb.pageStudy(), want)
	// The results were computed from the reopened study: the left-out unit
	// is not among them.
	n := eval[int](tb, `window.peerlens.result.units.length`)
	if units := eval[int](tb, `window.peerlens.study.units.length`); n != units-1 {
		t.Errorf("results for %d units, want %d (all but the one left out)", n, units-1)
	}
	if got := eval[string](tb, `document.getElementById('share-status').textContent`); !strings.Contains(got, "Opened") {
		t.Errorf("status after opening says %q", got)
	}
}

func TestStudyFileNotJSON(t *testing.T) {
	dir := sitecopy.TempDir(t)
	tb, _ := browse(t, baseURL, "", demoReady)
	bad := dir + "/notes.json"
	if err := os.WriteFile(bad, []byte("Unit,Staff\nNorth,3\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(tb.ctx, chromedp.SetUploadFiles(chromedp.CSS("#open-study"), []string{bad})); err != nil {
		t.Fatal(err)
	}
	tb.waitFor(`document.getElementById('share-status').textContent.includes('not a study file')`, 10*time.Second, "the not-a-study message")
}

// makeLink makes a share link in the page, with an optional passphrase.
func (tb *tab) makeLink(pass string) string {
	tb.t.Helper()
	tb.do(`document.getElementById('share-link').value = ''; document.getElementById('link-pass').value = ` + jsString(pass))
	tb.click("#make-link")
	tb.waitFor(`document.getElementById('share-link').value !== ''`, 30*time.Second, "the share link")
	return eval[string](tb, `document.getElementById('share-link').value`)
}

func TestShareLinkRoundTrip(t *testing.T) {
	tb, _ := browse(t, baseURL, "", demoReady)
	want := tb.editDemo()
	plain := tb.makeLink("")
	locked := tb.makeLink("correct horse battery")
	if !strings.Contains(plain, "#s=") || !strings.Contains(locked, "#e=") {
		t.Fatalf("links %q and %q lack their markers", short(plain), short(locked))
	}
	frag := plain[strings.Index(plain, "#s=")+3:]
	if strings.Contains(locked, frag[:min(40, len(frag))]) || len(locked) < len(plain) {
		t.Errorf("the locked link looks unencrypted: %q", short(locked))
	}

	t.Run("plain", func(t *testing.T) {
		other, reqs := browse(t, plain, "", `window.peerlens && window.peerlens.runs >= 1`)
		sameStudy(t, "study from the link", other.pageStudy(), want)
		checkOwnFiles(t, reqs.final(t), baseURL)
	})

	t.Run("locked", func(t *testing.T) {
		other, _ := browse(t, locked, "", demoReady)
		other.waitFor(`!document.getElementById('unlock').hidden`, 10*time.Second, "the passphrase box")
		demo := other.pageStudy()
		other.do(`document.getElementById('unlock-pass').value = 'wrong guess'`)
		other.click("#unlock button[type=submit]")
		other.waitFor(`document.getElementById('share-status').textContent.includes('does not open')`, 30*time.Second, "the wrong-passphrase message")
		if got := other.pageStudy(); got != demo {
			t.Errorf("a wrong passphrase changed the study shown to %s", short(got))
		}
		runs := eval[int](other, `window.peerlens.runs`)
		other.do(`document.getElementById('unlock-pass').value = 'correct horse battery'`)
		other.click("#unlock button[type=submit]")
		other.waitRestored(runs)
		sameStudy(t, "study from the locked link", other.pageStudy(), want)
		if !eval[bool](other, `document.getElementById('unlock').hidden`) {
			t.Error("the passphrase box is still shown after opening")
		}
	})
}

func TestDamagedLinks(t *testing.T) {
	tb, _ := browse(t, baseURL, "", demoReady)
	tb.editDemo()
	plain := tb.makeLink("")
	cases := []struct{ name, link, says string }{
		{"cut in half", plain[:strings.Index(plain, "#s=")+3+(len(plain)-strings.Index(plain, "#s=")-3)/2], "damaged or incomplete"},
		{"foreign characters", plain + "%%!!", "do not belong"},
		{"locked and cut", strings.Replace(plain, "#s=", "#e=", 1)[:len(plain)/3+40], ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			other, _ := browse(t, c.link, "", demoReady)
			if strings.Contains(c.link, "#e=") {
				other.waitFor(`!document.getElementById('unlock').hidden`, 10*time.Second, "the passphrase box")
				other.do(`document.getElementById('unlock-pass').value = 'anything'`)
				other.click("#unlock button[type=submit]")
			}
			other.waitFor(`document.getElementById('share-status').classList.contains('bad')`, 30*time.Second, "a message about the link")
			msg := eval[string](other, `document.getElementById('share-status').textContent`)
			if c.says != "" && !strings.Contains(msg, c.says) {
				t.Errorf("message %q does not say %q", msg, c.says)
			}
			// The page still works with the demo study.
			if got := eval[int](other, `window.peerlens.study.leftOut.length`); got != 0 {
				t.Errorf("the damaged link changed the study (left out %d)", got)
			}
			other.runStudy()
		})
	}
}

func TestLongLinkWarns(t *testing.T) {
	tb, _ := browse(t, baseURL, "", demoReady)
	var b strings.Builder
	b.WriteString("Unit\tStaff\tBudget\tVisits\tReferrals\n")
	x := uint32(12345)
	next := func() uint32 { x = x*1664525 + 1013904223; return x >> 8 }
	for i := range 600 {
		fmt.Fprintf(&b, "Unit %d\t%d\t%d\t%d\t%d\n", i, 1+next()%900, 1+next()%90000, 1+next()%99999, 1+next()%9999)
	}
	tb.paste(b.String())
	link := tb.makeLink("")
	if len(link) <= 8000 {
		t.Fatalf("the test table gave a link of only %d characters", len(link))
	}
	if eval[bool](tb, `document.getElementById('link-too-long').hidden`) {
		t.Error("no warning for a link longer than 8,000 characters")
	}
}

func TestKeepInBrowserAndLeaving(t *testing.T) {
	tb, _ := browse(t, baseURL, "", demoReady)
	// Leaving the untouched demo does not ask (the click gives the page the
	// user activation browsers require before they ask at all).
	tb.click("#data-h")
	if err := chromedp.Do(tb.ctx, chromedp.Navigate(baseURL+"?first")); err != nil {
		t.Fatal(err)
	}
	tb.waitFor(demoReady, 30*time.Second, "the page again")
	tb.mu.Lock()
	if len(tb.dialogs) != 0 {
		t.Errorf("leaving the untouched demo asked first: %v", tb.dialogs)
	}
	tb.dialogs = nil
	tb.mu.Unlock()
	want := tb.editDemo()
	// Leaving with unsaved changes asks first.
	if err := chromedp.Do(tb.ctx, chromedp.Navigate(baseURL+"?again")); err != nil {
		t.Fatal(err)
	}
	tb.mu.Lock()
	asked := strings.Join(tb.dialogs, ",")
	tb.dialogs = nil
	tb.mu.Unlock()
	if !strings.Contains(asked, "beforeunload") {
		t.Errorf("leaving with unsaved changes did not ask (dialogs: %q)", asked)
	}
	tb.waitFor(demoReady, 30*time.Second, "the page again")
	if eval[bool](tb, `document.getElementById('keep-here').checked`) {
		t.Fatal("keeping in the browser is on before anyone asked for it")
	}
	if n := eval[int](tb, `localStorage.length`); n != 0 {
		t.Fatalf("the page stored %d items without being asked", n)
	}
	want = tb.editDemo()
	tb.click("#keep-here")
	tb.waitFor(`localStorage.length === 1`, 5*time.Second, "the study to be kept")
	if err := chromedp.Do(tb.ctx, chromedp.Reload()); err != nil {
		t.Fatal(err)
	}
	tb.waitFor(`window.peerlens && window.peerlens.runs >= 1`, 60*time.Second, "the kept study to open")
	sameStudy(t, "kept study", tb.pageStudy(), want)
	tb.mu.Lock()
	if len(tb.dialogs) != 0 {
		t.Errorf("leaving asked although the study is kept: %v", tb.dialogs)
	}
	tb.mu.Unlock()
	if !eval[bool](tb, `document.getElementById('keep-here').checked`) {
		t.Error("the keep box does not show that the study is kept")
	}
	tb.click("#forget-here")
	if n := eval[int](tb, `localStorage.length`); n != 0 {
		t.Errorf("after forgetting, %d items are still stored", n)
	}
}
