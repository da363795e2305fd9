package browsertest

import (
	"context"
	"io"
	"net/http"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"

	"peerlens/site/server/static"
	"peerlens/site/sitecopy"
)

// watchScript runs in the page before any of its own scripts and records
// every Content Security Policy violation the browser reports.
const watchScript = `window.__csp = [];
document.addEventListener('securitypolicyviolation', (e) => {
	window.__csp.push(e.violatedDirective + ' blocked ' + (e.blockedURI || '(inline)') + ' at ' + e.sourceFile + ':' + e.lineNumber);
});`

// requests records the address of every request the page makes, as the
// page's target reports them, and the browser's own network log (NetLog),
// which also holds the requests of workers and of the browser itself.
type requests struct {
	mu     sync.Mutex
	urls   []string
	ctx    context.Context
	netlog string
}

// netlogRequest finds the requests in a NetLog that something made on
// behalf of an origin (the page, its workers), with that origin and the
// address. The browser's own background services (updates, time, accounts)
// make theirs for "not an origin"; they are not the page's doing.
var netlogRequest = regexp.MustCompile(`"initiator":"([^"]*)"[^\n]*?"url":"([^"]+)"`)

// final closes the browser (so the network log is complete) and returns
// every address the page and its workers requested: those the page's target
// reported, then those in the network log. The tab cannot be used afterwards.
func (r *requests) final(t *testing.T) []string {
	t.Helper()
	if err := chromedp.Cancel(r.ctx); err != nil {
		t.Logf("closing the browser: %v", err)
	}
	all := r.list()
	b, err := os.ReadFile(r.netlog)
	if err != nil {
		t.Fatalf("reading the browser's network log: %v", err)
	}
	seen := 0
	for _, m := range netlogRequest.FindAllSubmatch(b, -1) {
		if string(m[1]) == "not an origin" {
			continue
		}
		all = append(all, string(m[2]))
		seen++
	}
	if seen == 0 {
		t.Log("the network log holds no request made for the page")
	}
	return all
}

func (r *requests) add(u string) {
	r.mu.Lock()
	r.urls = append(r.urls, u)
	r.mu.Unlock()
}

func (r *requests) list() []string {
	r.mu.Lock()
	defer r.mu.Unlock()
	return append([]string(nil), r.urls...)
}

// browse starts a fresh headless browser like open does, but opens the page
// at addr (a full address) only after recording of requests and policy
// violations has started, and with downloads going to dir. ready is the
// JavaScript condition to wait for after loading.
func browse(t *testing.T, addr, dir, ready string) (*tab, *requests) {
	t.Helper()
	return browseWith(t, addr, dir, ready, false)
}

// browseWith is browse, with the network cut off when offline is true:
// every http and https request goes to a proxy address where nothing
// listens (the loopback interface included), so none can succeed.
func browseWith(t *testing.T, addr, dir, ready string, offline bool) (*tab, *requests) {
	t.Helper()
	if skipReason != "" {
		t.Skip(skipReason)
	}
	var cut []chromedp.ExecAllocatorOption
	if offline {
		cut = append(cut, chromedp.ProxyServer("http://127.0.0.1:9"), chromedp.Flag("proxy-bypass-list", "<-loopback>"))
	}
	netlog := filepath.Join(sitecopy.TempDir(t), "netlog.json")
	cut = append(cut, chromedp.Flag("log-net-log", netlog), chromedp.Flag("allow-file-access-from-files", false), chromedp.WindowSize(1280, 900))
	tb := startBrowser(t, 170*time.Second, cut...)
	ctx := tb.ctx
	reqs := &requests{ctx: ctx, netlog: netlog}
	if err := chromedp.Listen(ctx, func(ev any) {
		switch e := ev.(type) {
		case *network.EventRequestWillBeSent:
			reqs.add(e.Request.URL)
		case *page.EventJavascriptDialogOpening:
			tb.mu.Lock()
			tb.dialogs = append(tb.dialogs, string(e.Type))
			tb.mu.Unlock()
			go func() {
				_, _ = chromedp.Call(ctx, page.HandleJavaScriptDialog, page.HandleJavaScriptDialogParams{Accept: true})
			}()
		}
	}); err != nil {
		t.Fatalf("starting the browser: %v", err)
	}
	if _, err := chromedp.Call(ctx, network.Enable, network.EnableParams{}); err != nil {
		t.Fatalf("recording requests: %v", err)
	}
	if _, err := chromedp.Call(ctx, page.AddScriptToEvaluateOnNewDocument, page.AddScriptToEvaluateOnNewDocumentParams{Source: watchScript}); err != nil {
		t.Fatalf("watching for policy violations: %v", err)
	}
	if dir != "" {
		if _, err := chromedp.CallBrowser(ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{Behavior: browser.SetDownloadBehaviorBehaviorAllow, DownloadPath: dir}); err != nil {
			t.Fatalf("sending downloads to %s: %v", dir, err)
		}
	}
	if err := chromedp.Do(ctx, chromedp.Navigate(addr)); err != nil {
		t.Fatalf("opening %s: %v", addr, err)
	}
	tb.waitFor(ready, 60*time.Second, "the page to be ready")
	return tb, reqs
}

// checkOwnFiles fails for every request that is not for one of the page's
// own files (under base) or a data: or blob: address made in the page.
func checkOwnFiles(t *testing.T, reqs []string, base string) {
	t.Helper()
	if len(reqs) == 0 {
		t.Fatal("no requests were recorded at all: the recording does not work")
	}
	for _, r := range reqs {
		if strings.HasPrefix(r, "data:") || strings.HasPrefix(r, "blob:") {
			continue
		}
		if base != "" && strings.HasPrefix(r, base) {
			continue
		}
		t.Errorf("the page requested %s, which is not one of its own files", r)
	}
}

// checkPolicy fails for every Content Security Policy violation the page saw.
func (tb *tab) checkPolicy() {
	tb.t.Helper()
	for _, v := range eval[[]string](tb, `window.__csp || []`) {
		tb.t.Errorf("content security policy violation: %s", v)
	}
}

// TestOnlyOwnFiles loads the page, runs the demo study, opens a unit report
// and exports CSV and .xlsx, and checks that every request went to the
// page's own files and that the security policy was never broken.
func TestOnlyOwnFiles(t *testing.T) {
	dir := sitecopy.TempDir(t)
	tb, reqs := browse(t, baseURL, dir, `window.peerlens && window.peerlens.loads >= 1`)
	tb.runStudy()
	tb.click(`#results-table .unit-link`)
	tb.waitFor(`document.querySelector('#unit-body').textContent.length > 0`, 20*time.Second, "the unit report")
	tb.click("#export-csv")
	tb.click("#export-xlsx")
	waitFiles(t, dir, 2)
	tb.click("#save-study")
	waitFiles(t, dir, 3)
	tb.do(`document.getElementById('link-pass').value = ''`)
	tb.click("#make-link")
	tb.waitFor(`document.getElementById('share-link').value.includes('#s=')`, 20*time.Second, "the share link")
	tb.checkPolicy()
	// The policy the page declares forbids connections to anywhere else.
	csp := eval[string](tb, `document.querySelector('meta[http-equiv="Content-Security-Policy"]').content`)
	for _, want := range []string{"default-src 'self'", "connect-src 'self'", "object-src 'none'", "base-uri 'none'", "form-action 'none'"} {
		if !strings.Contains(csp, want) {
			t.Errorf("the page's policy %q lacks %q", csp, want)
		}
	}
	// And the browser enforces it: a request elsewhere is refused.
	refused := eval[bool](tb, `fetch('http://192.0.2.1/x').then(() => false, () => true)`)
	if !refused {
		t.Error("a request to another address was not refused")
	}
	// The refusal is logged as errors on purpose: let them arrive, then
	// drop them (and only them).
	tb.waitFor(`window.__csp.some((v) => v.includes('192.0.2.1'))`, 5*time.Second, "the refusal to be reported")
	time.Sleep(500 * time.Millisecond)
	tb.mu.Lock()
	kept := tb.errors[:0]
	for _, e := range tb.errors {
		if !strings.Contains(e, "192.0.2.1") {
			kept = append(kept, e)
		}
	}
	tb.errors = kept
	tb.mu.Unlock()
	checkOwnFiles(t, reqs.final(t), baseURL)
}

// TestNoInlineScript checks the page's own files for inline scripts and
// inline event handlers, which the policy forbids.
func TestNoInlineScript(t *testing.T) {
	root, err := moduleRoot()
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(root, "site", "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	html := strings.ToLower(string(b))
	for i := 0; ; {
		k := strings.Index(html[i:], "<script")
		if k < 0 {
			break
		}
		i += k
		end := strings.Index(html[i:], ">")
		if !strings.Contains(html[i:i+end], " src=") {
			t.Errorf("index.html has an inline script at byte %d", i)
		}
		i += end
	}
	for _, attr := range []string{" onclick=", " onload=", " onerror=", " onchange=", " oninput=", " onsubmit=", "javascript:"} {
		if strings.Contains(html, attr) {
			t.Errorf("index.html has an inline handler %q", strings.TrimSpace(attr))
		}
	}
	js, _ := filepath.Glob(filepath.Join(root, "site", "js", "*.js"))
	for _, f := range js {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		if m := unsafeJS.FindString(string(b)); m != "" {
			t.Errorf("%s uses %s", filepath.Base(f), m)
		}
	}
}

// unsafeJS finds code that makes HTML or code from text, or sets inline
// handlers: all forbidden by the policy or by the house rules.
var unsafeJS = regexp.MustCompile(`\.(?:inner|outer)HTML\s*\+?=|insertAdjacentHTML\(|\beval\(|new Function\(|setAttribute\(\s*['"]on|\.on[a-z]+\s*=\s*['"]`)

// waitFiles waits until dir holds n finished downloads.
func waitFiles(t *testing.T, dir string, n int) []string {
	t.Helper()
	deadline := time.Now().Add(20 * time.Second)
	for {
		names, _ := filepath.Glob(filepath.Join(dir, "*"))
		var done []string
		for _, f := range names {
			if !strings.HasSuffix(f, ".crdownload") {
				done = append(done, f)
			}
		}
		if len(done) >= n && len(done) == len(names) {
			return done
		}
		if time.Now().After(deadline) {
			t.Fatalf("waited for %d downloads in %s, have %v", n, dir, names)
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// fileURL is the file:// address of a local file.
func fileURL(path string) string {
	return (&url.URL{Scheme: "file", Path: filepath.ToSlash(path)}).String()
}

// TestPolicyHeaderMatchesPage checks that the development server sends the
// same Content Security Policy as the page declares in its meta element.
func TestPolicyHeaderMatchesPage(t *testing.T) {
	if skipReason != "" {
		t.Skip(skipReason)
	}
	res, err := http.Get(baseURL)
	if err != nil {
		t.Fatal(err)
	}
	body, err := io.ReadAll(res.Body)
	res.Body.Close()
	if err != nil {
		t.Fatal(err)
	}
	m := regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]+)">`).FindSubmatch(body)
	if m == nil {
		t.Fatal("index.html has no Content Security Policy meta element")
	}
	if got := res.Header.Get("Content-Security-Policy"); got != string(m[1]) {
		t.Errorf("the server sends the policy\n%q\nbut the page declares\n%q", got, m[1])
	}
	if static.Policy != string(m[1]) {
		t.Errorf("static.Policy differs from the page's policy")
	}
}
