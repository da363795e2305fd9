package sitecopy

import "github.com/chromedp/chromedp"

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
