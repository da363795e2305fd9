package sitecopy

import (
	"os"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// ChromiumOptions are the options for a headless Chromium that runs the
// page as a person's browser would, without reaching out to the network:
// no sandbox and no GPU (as root in a container), no background
// networking, component updates or sync, no first-run screens, timers of
// hidden pages not slowed, and a fresh profile in userDataDir.
func ChromiumOptions(path, userDataDir string) []chromedp.ExecAllocatorOption {
	return []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(path),
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("disable-background-timer-throttling", true),
		chromedp.Flag("disable-renderer-backgrounding", true),
		chromedp.UserDataDir(userDataDir),
	}
}

// TempDir makes a fresh folder for a Chromium profile or its downloads and
// removes it when the test ends, after the browser has been stopped (the
// cleanup is registered before the browser's, so it runs after it). Removal
// is retried for a few seconds and a failure is not a test failure:
// Chromium's helper processes can still be writing to the profile just after
// the browser has gone, which made t.TempDir's own cleanup fail now and then.
func TempDir(tb testing.TB) string {
	tb.Helper()
	dir, err := os.MkdirTemp("", "peerlens-browser-")
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() {
		for try := 0; try < 20; try++ {
			if os.RemoveAll(dir) == nil {
				return
			}
			time.Sleep(250 * time.Millisecond)
		}
		tb.Logf("could not remove %s; left for the system to clear", dir)
	})
	return dir
}
