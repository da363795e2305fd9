// Package enginetest checks site/engine.js and site/worker.js in a real
// browser (headless Chromium through chromedp): the engine starts in its
// workers, reads text and workbooks, runs with progress, cancels a run
// without touching the page's data, explains and exports. The page itself
// is tested in site/browsertest; this package tests only the bridge between
// the page and the WebAssembly modules, on a bare test page.
package enginetest
