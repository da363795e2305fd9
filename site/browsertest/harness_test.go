package browsertest

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"peerlens/site/server/static"
	"peerlens/site/sitecopy"
)

var (
	baseURL    string // the served copy of site/, with a trailing slash
	chromePath string
	skipReason string
)

func TestMain(m *testing.M) {
	os.Exit(run(m))
}

func run(m *testing.M) int {
	chromePath = os.Getenv("PEERLENS_CHROMIUM")
	if chromePath == "" {
		for _, name := range []string{"/usr/bin/chromium", "chromium", "chromium-browser", "google-chrome"} {
			if p, err := exec.LookPath(name); err == nil {
				chromePath = p
				break
			}
		}
	}
	if chromePath == "" {
		skipReason = "Chromium is not installed (apt-get install chromium, or set PEERLENS_CHROMIUM); the browser tests need it"
		return m.Run()
	}
	root, err := moduleRoot()
	if err != nil {
		fmt.Fprintln(os.Stderr, "browsertest:", err)
		return 1
	}
	tmp, err := os.MkdirTemp("", "peerlens-site-")
	if err != nil {
		fmt.Fprintln(os.Stderr, "browsertest:", err)
		return 1
	}
	defer os.RemoveAll(tmp)
	site := filepath.Join(tmp, "site")
	if err := sitecopy.Prepare(root, site); err != nil {
		fmt.Fprintln(os.Stderr, "browsertest:", err)
		return 1
	}
	srv, err := static.Start(site, "127.0.0.1:0")
	if err != nil {
		fmt.Fprintln(os.Stderr, "browsertest:", err)
		return 1
	}
	defer srv.Close()
	baseURL = srv.URL
	return m.Run()
}

// moduleRoot finds the folder holding go.mod, upwards from here.
func moduleRoot() (string, error) { return sitecopy.ModuleRoot() }

// tab is one browser with the page open, and what it logged.
type tab struct {
	t       *testing.T
	ctx     context.Context
	mu      sync.Mutex
	errors  []string // console errors and uncaught exceptions
	dialogs []string // messages of dialogs the page opened
}

// startBrowser starts a fresh headless Chromium with the project's options
// (sitecopy.ChromiumOptions, a new profile) and extra, and returns a tab
// whose context ends after timeout. Console errors and uncaught exceptions
// are collected; at the end of the test each one fails it.
func startBrowser(t *testing.T, timeout time.Duration, extra ...chromedp.ExecAllocatorOption) *tab {
	t.Helper()
	opts := append(sitecopy.ChromiumOptions(chromePath, sitecopy.TempDir(t)), extra...)
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(actx)
	ctx, cancelTime := context.WithTimeout(ctx, timeout)
	tb := &tab{t: t, ctx: ctx}
	t.Cleanup(func() {
		cancelTime()
		cancelCtx()
		cancelAlloc()
	})
	console := chromedp.Console(ctx)
	go func() {
		for msg, err := range console {
			if err != nil {
				return
			}
			if msg.Type == chromedp.ConsoleError || msg.Type == chromedp.ConsoleException || msg.Type == "assert" {
				tb.mu.Lock()
				tb.errors = append(tb.errors, fmt.Sprintf("%s (%s:%d)", msg.Text, msg.URL, msg.Line+1))
				tb.mu.Unlock()
			}
		}
	}()
	t.Cleanup(func() {
		time.Sleep(100 * time.Millisecond) // let the last console messages arrive
		tb.mu.Lock()
		defer tb.mu.Unlock()
		for _, e := range tb.errors {
			t.Errorf("browser console error: %s", e)
		}
	})
	return tb
}

// open starts a fresh browser at the given window size, opens the page and
// waits until the engine has loaded the demo study. At the end of the test
// it fails the test for every error the page logged.
func open(t *testing.T, width, height int) *tab {
	t.Helper()
	if skipReason != "" {
		t.Skip(skipReason)
	}
	tb := startBrowser(t, 150*time.Second, chromedp.WindowSize(width, height))
	ctx := tb.ctx
	dialogs := chromedp.Events(ctx, page.JavascriptDialogOpening)
	go func() {
		for ev, err := range dialogs {
			if err != nil {
				return
			}
			tb.mu.Lock()
			tb.dialogs = append(tb.dialogs, ev.Message)
			tb.mu.Unlock()
			_, _ = chromedp.Call(ctx, page.HandleJavaScriptDialog, page.HandleJavaScriptDialogParams{Accept: false})
		}
	}()
	start := time.Now()
	if err := chromedp.Do(ctx, chromedp.Navigate(baseURL)); err != nil {
		t.Fatalf("opening the page: %v", err)
	}
	opened := time.Since(start)
	tb.waitFor(`window.peerlens && window.peerlens.loads >= 1`, 60*time.Second, "the engine to start and load the demo study")
	t.Logf("browser and page opened in %v, engine ready and demo loaded after %v", opened.Round(time.Millisecond), time.Since(start).Round(time.Millisecond))
	return tb
}

// eval runs JavaScript in the page (awaiting a promise) and decodes the result.
func eval[T any](tb *tab, js string) T {
	tb.t.Helper()
	v, err := chromedp.Run(tb.ctx, chromedp.Evaluate[T](js, chromedp.EvalAwaitPromise))
	if err != nil {
		tb.t.Fatalf("evaluating %s: %v", short(js), err)
	}
	return v
}

func (tb *tab) do(js string) {
	tb.t.Helper()
	if err := chromedp.Do(tb.ctx, chromedp.Evaluate[chromedp.Void](js, chromedp.EvalAwaitPromise)); err != nil {
		tb.t.Fatalf("running %s: %v", short(js), err)
	}
}

func short(js string) string {
	js = strings.Join(strings.Fields(js), " ")
	if len(js) > 120 {
		return js[:120] + "…"
	}
	return js
}

// waitFor polls a JavaScript condition until it is true.
func (tb *tab) waitFor(cond string, limit time.Duration, what string) {
	tb.t.Helper()
	deadline := time.Now().Add(limit)
	for {
		ok, err := chromedp.Run(tb.ctx, chromedp.Evaluate[bool]("!!("+cond+")"))
		if err == nil && ok {
			return
		}
		if time.Now().After(deadline) {
			status := ""
			if s, err2 := chromedp.Run(tb.ctx, chromedp.Evaluate[string](`[...document.querySelectorAll('[role=status]')].map(n => n.id + ': ' + n.textContent).join(' | ')`)); err2 == nil {
				status = s
			}
			tb.t.Fatalf("waited %v for %s (%s); last error %v; page says: %s", limit, what, cond, err, status)
		}
		time.Sleep(50 * time.Millisecond)
	}
}

func (tb *tab) click(sel string) {
	tb.t.Helper()
	// The page redraws windowed tables as data change; a node found a moment
	// ago can be replaced before the click lands, so a vanished node is
	// looked up again (for a few seconds at most).
	deadline := time.Now().Add(5 * time.Second)
	for {
		err := chromedp.Do(tb.ctx, chromedp.Click(chromedp.CSS(sel), chromedp.NodeVisible))
		if err == nil {
			return
		}
		if !strings.Contains(err.Error(), "Could not find node") || time.Now().After(deadline) {
			tb.t.Fatalf("clicking %s: %v", sel, err)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// jsString quotes Go text as a JavaScript string literal.
func jsString(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}

// paste puts text in the paste box, reads it and waits for the new study.
func (tb *tab) paste(text string) {
	tb.t.Helper()
	before := eval[int](tb, `window.peerlens.loads`)
	tb.do(`document.getElementById('paste').value = ` + jsString(text))
	tb.click("#read-paste")
	tb.waitFor(fmt.Sprintf(`window.peerlens.loads > %d`, before), 30*time.Second, "the pasted table to be read")
}

// runStudy presses the run button and waits for the results.
func (tb *tab) runStudy() {
	tb.t.Helper()
	before := eval[int](tb, `window.peerlens.runs`)
	tb.click("#run")
	tb.waitFor(fmt.Sprintf(`window.peerlens.runs > %d`, before), 60*time.Second, "the run to finish")
}

// setRole picks a role in the menu above the column with this title.
func (tb *tab) setRole(title, role string) {
	tb.t.Helper()
	ok := eval[bool](tb, `(() => {
		const th = [...document.querySelectorAll('#preview thead th[data-col]')].find(th => th.querySelector('.col-title').textContent === `+jsString(title)+`);
		if (!th) return false;
		const sel = th.querySelector('select');
		sel.value = `+jsString(role)+`;
		sel.dispatchEvent(new Event('change', {bubbles: true}));
		return true;
	})()`)
	if !ok {
		tb.t.Fatalf("no column titled %q in the preview", title)
	}
}

// chooseUnit scrolls the windowed results table until unit k's row is
// drawn, then clicks its name.
func (tb *tab) chooseUnit(k int) {
	tb.t.Helper()
	found := eval[bool](tb, fmt.Sprintf(`(async () => {
		const box = document.getElementById('results-table');
		const frame = () => new Promise(r => requestAnimationFrame(() => requestAnimationFrame(r)));
		box.scrollTop = 0;
		await frame();
		for (let guard = 0; guard < 10000; guard++) {
			const b = box.querySelector('button.unit-link[data-unit="%d"]');
			if (b) { b.scrollIntoView({block: 'center'}); await frame(); return true; }
			if (box.scrollTop + box.clientHeight >= box.scrollHeight - 1) return false;
			box.scrollTop += Math.max(40, box.clientHeight - 60);
			await frame();
		}
		return false;
	})()`, k))
	if !found {
		tb.t.Fatalf("unit %d has no row in the results table", k)
	}
	tb.click(fmt.Sprintf(`#results-table button.unit-link[data-unit="%d"]`, k))
}

// shownScores reads every row of the windowed results table, scrolling
// through it, as unit name -> [data-score, status].
func (tb *tab) shownScores() map[string]shownRow {
	tb.t.Helper()
	raw := eval[[]shownRow](tb, `(async () => {
		const box = document.getElementById('results-table');
		const seen = new Map();
		const frame = () => new Promise(r => requestAnimationFrame(() => requestAnimationFrame(r)));
		box.scrollTop = 0;
		await frame();
		for (let guard = 0; guard < 10000; guard++) {
			for (const tr of box.querySelectorAll('tbody tr[data-unit]')) {
				seen.set(tr.dataset.unit, {name: tr.querySelector('.unit-link').textContent, score: tr.dataset.score, status: tr.dataset.status});
			}
			if (box.scrollTop + box.clientHeight >= box.scrollHeight - 1) break;
			box.scrollTop += Math.max(40, box.clientHeight - 60);
			await frame();
		}
		box.scrollTop = 0;
		return [...seen.values()];
	})()`)
	out := make(map[string]shownRow, len(raw))
	for _, r := range raw {
		out[r.Name] = r
	}
	return out
}

type shownRow struct {
	Name   string `json:"name"`
	Score  string `json:"score"`
	Status string `json:"status"`
}

// screenshot saves a full-page screenshot to PEERLENS_SHOTS (or the test's
// temporary folder) and returns the file name.
func (tb *tab) screenshot(name string) string {
	tb.t.Helper()
	buf, err := chromedp.Run(tb.ctx, chromedp.FullScreenshot(90))
	if err != nil {
		tb.t.Fatalf("screenshot: %v", err)
	}
	dir := os.Getenv("PEERLENS_SHOTS")
	if dir == "" {
		dir = sitecopy.TempDir(tb.t)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		tb.t.Fatal(err)
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, buf, 0o644); err != nil {
		tb.t.Fatal(err)
	}
	return path
}
