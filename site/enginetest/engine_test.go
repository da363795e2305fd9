package enginetest

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"peerlens/site/server/static"
	"peerlens/site/sitecopy"
)

var (
	baseURL    string
	chromePath string
	skipReason string
)

func TestMain(m *testing.M) { os.Exit(run(m)) }

func run(m *testing.M) int {
	for _, name := range []string{os.Getenv("PEERLENS_CHROMIUM"), "/usr/bin/chromium", "chromium", "chromium-browser", "google-chrome"} {
		if name == "" {
			continue
		}
		if p, err := exec.LookPath(name); err == nil {
			chromePath = p
			break
		}
	}
	if chromePath == "" {
		skipReason = "Chromium is not installed (apt-get install chromium, or set PEERLENS_CHROMIUM)"
		return m.Run()
	}
	dir, err := os.MkdirTemp("", "peerlens-engine-")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	defer os.RemoveAll(dir)
	if err := prepare(dir); err != nil {
		fmt.Fprintln(os.Stderr, "enginetest:", err)
		return 1
	}
	srv, err := static.Start(dir, "127.0.0.1:0")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	defer srv.Close()
	baseURL = srv.URL
	return m.Run()
}

// testPage loads engine.js and nothing else. The script is a file of its
// own: the development server's Content Security Policy forbids inline
// scripts, as the page's does.
const testPage = `<!doctype html><html lang="en"><meta charset="utf-8"><title>engine test</title>
<script type="module" src="enginetest.js"></script></html>`

const testScript = `import { Engine, Cancelled, EngineError } from './engine.js';
window.T = { Engine, Cancelled, EngineError };
try {
  window.T.eng = await Engine.start();
} catch (err) {
  window.T.failed = String((err && err.stack) || err);
}
`

// prepare copies engine.js and worker.js and builds both WebAssembly
// modules beside them, as build.sh does.
func prepare(dir string) error {
	root, err := filepath.Abs("../..")
	if err != nil {
		return err
	}
	for _, f := range []string{"engine.js", "worker.js"} {
		b, err := os.ReadFile(filepath.Join(root, "site", f))
		if err != nil {
			return err
		}
		if err := os.WriteFile(filepath.Join(dir, f), b, 0o644); err != nil {
			return err
		}
	}
	if err := os.WriteFile(filepath.Join(dir, "index.html"), []byte(testPage), 0o644); err != nil {
		return err
	}
	if err := os.WriteFile(filepath.Join(dir, "enginetest.js"), []byte(testScript), 0o644); err != nil {
		return err
	}
	for out, pkg := range map[string]string{"peerlens.wasm": "./wasm", "peerlens-sheets.wasm": "./wasm/sheets"} {
		cmd := exec.Command("go", "build", "-trimpath", "-o", filepath.Join(dir, out), pkg)
		cmd.Dir = root
		cmd.Env = append(os.Environ(), "GOOS=js", "GOARCH=wasm")
		if b, err := cmd.CombinedOutput(); err != nil {
			return fmt.Errorf("building %s: %v\n%s", pkg, err, b)
		}
	}
	goroot, err := exec.Command("go", "env", "GOROOT").Output()
	if err != nil {
		return err
	}
	b, err := os.ReadFile(filepath.Join(strings.TrimSpace(string(goroot)), "lib", "wasm", "wasm_exec.js"))
	if err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(dir, "wasm_exec.js"), b, 0o644)
}

// browser opens the test page in a fresh headless Chromium and waits for
// the engine to start.
func browser(t *testing.T) context.Context {
	t.Helper()
	if skipReason != "" {
		t.Skip(skipReason)
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromePath), chromedp.NoFirstRun, chromedp.NoDefaultBrowserCheck, chromedp.Headless,
		chromedp.NoSandbox, chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true), chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true), chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(sitecopy.TempDir(t)),
	}
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(actx)
	ctx, cancelTime := context.WithTimeout(ctx, 180*time.Second)
	t.Cleanup(func() { cancelTime(); cancelCtx(); cancelAlloc() })
	if err := chromedp.Do(ctx, chromedp.Navigate(baseURL)); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(60 * time.Second)
	for {
		if ok, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`!!(window.T && window.T.eng)`)); err == nil && ok {
			return ctx
		}
		if failed, err := chromedp.Run(ctx, chromedp.Evaluate[string](`(window.T && window.T.failed) || ''`)); err == nil && failed != "" {
			t.Fatalf("the engine did not start: %s", failed)
		}
		if time.Now().After(deadline) {
			state, err := chromedp.Run(ctx, chromedp.Evaluate[string](`JSON.stringify({T: typeof window.T, keys: window.T ? Object.keys(window.T) : [], url: location.href, ready: document.readyState})`))
			t.Logf("page state: %s (%v)", state, err)
			t.Fatal("the engine did not start within a minute")
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// eval runs an async JavaScript function body in the page and decodes what
// it returns.
func eval[T any](t *testing.T, ctx context.Context, body string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T]("(async () => {"+body+"})()", chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatalf("%v\n%s", err, body)
	}
	return v
}
