// Package e2e holds the end-to-end test of the browser app: it builds the
// app and the command line from this repository, serves the app with
// "earshot serve", drives it in headless Chromium through the Chrome
// DevTools Protocol, and checks what the listener would see against the
// command line's own answer. The package has no code of its own, only
// e2e_test.go.
//
// Run it with
//
//	make e2e
//	go test -count=1 -v ./wasm/e2e/
//
// Always pass -count=1: the test builds the app and earshot in
// subprocesses, which go test's result cache cannot see, so a cached "ok"
// may describe an older app. The test skips when Chromium is missing
// (it looks for /usr/bin/chromium, then chromium on PATH) and under
// -short.
//
// What it needs and what it writes:
//
//   - make, to run "make app", which writes wasm/site/static/app.wasm.gz
//     and wasm_exec.js (build outputs, not kept in git);
//   - a temporary directory for the earshot binary, the single-file
//     page and, unless $EARSHOT_SCREENSHOT_DIR names a directory to keep
//     it in, the screenshot.
//
// How it drives the app: the app publishes its state for tests (see
// wasm/app/browser.go: earshot_ready, earshot_state(), earshot_project),
// and the test waits on that state rather than on timers. Ebiten reads
// the mouse once per frame, so a click is a press, a wait until the app
// reports the button held, and a release.
package e2e
