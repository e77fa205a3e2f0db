package e2e

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"image"
	"image/png"
	"io"
	"math"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"earshot/assets"
	"earshot/wasm/screen"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/input"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"
)

// The viewport every page is shown in, CSS pixels (device scale 1).
const viewW, viewH = 1280, 800

// Time limits beyond which a step fails. They are generous on purpose:
// these machines are shared and their speed varies several-fold, so the
// test logs how long each step took and fails only when something is
// stuck. A performance target belongs in a benchmark, not here.
const (
	readyLimit   = 30 * time.Second // navigation to the first prediction drawn
	stepLimit    = 20 * time.Second // one UI change to a fresh prediction
	overlayLimit = 60 * time.Second // the coverage overlay, refined to the end
	// inputLimit is for one input event, dispatched and seen by the app.
	// The browser answers Input.dispatchMouseEvent only once the page
	// has handled the event, which waits for a long frame to end.
	inputLimit = 20 * time.Second
	pollEvery  = 40 * time.Millisecond
)

// Tolerances of the comparison with the command line. The app rounds
// field strengths and margins to 0.01 dB and the chance to 0.001 in its
// state (wasm/session/state.go); the CLI prints 4 decimals. Both come from
// one planner, so the only difference allowed is that rounding plus
// float noise.
const (
	dbTol     = 0.02  // dB
	kmTol     = 0.01  // km
	chanceTol = 0.002 // probability
)

// storageKey is where the app keeps the listener's choices in the
// browser's local storage (wasm/app/browser.go).
const storageKey = "earshot.app.state"

// ---- the state the app publishes (wasm/app/main.go appState) ----

type rigState struct {
	Kind      string  `json:"kind"`
	WireM     float64 `json:"wire_m"`
	HeightM   float64 `json:"height_m"`
	DownleadM float64 `json:"downlead_m"`
}

type stationState struct {
	ID       string   `json:"id"`
	Name     string   `json:"name"`
	KHz      float64  `json:"khz"`
	Km       float64  `json:"km"`
	EDB      float64  `json:"e_dbuvm"`
	MarginDB float64  `json:"margin_db"`
	Chance   float64  `json:"chance"`
	Audible  bool     `json:"audible"`
	MaskedBy *string  `json:"masked_by"`
	Verdict  string   `json:"verdict"`
	SkyDB    *float64 `json:"sky_dbuvm"`
}

type rect struct{ X, Y, W, H float64 }

func (r rect) contains(x, y float64) bool { return x >= r.X && x < r.X+r.W && y >= r.Y && y < r.Y+r.H }

type appState struct {
	Source    string          `json:"source"`
	Spot      string          `json:"spot"`
	Lat       float64         `json:"lat"`
	Lon       float64         `json:"lon"`
	Time      string          `json:"time"`
	FollowNow bool            `json:"follow_now"`
	Rig       rigState        `json:"rig"`
	RigError  string          `json:"rig_error"`
	Selected  string          `json:"selected"`
	Fresh     bool            `json:"fresh"`
	Busy      bool            `json:"busy"`
	Audible   int             `json:"audible"`
	Results   []stationState  `json:"results"`
	CLIArgs   []string        `json:"cli_args"`
	Ready     bool            `json:"ready"`
	Draws     int             `json:"draws"`
	FPS       float64         `json:"fps"`
	MouseDown bool            `json:"mouse_down"`
	Editing   string          `json:"editing"`
	Notice    string          `json:"notice"`
	Work      string          `json:"work"`
	Overlay   overlayState    `json:"overlay"`
	Widgets   map[string]rect `json:"widgets"`
	Screen    [2]int          `json:"screen"`
	Error     string          `json:"error"` // set only when the app failed to encode its state
}

type overlayState struct {
	On       bool    `json:"on"`
	Progress float64 `json:"progress"` // of the grid being computed, 0–1
	Done     bool    `json:"done"`     // the full grid is shown
}

// brief is a one-line summary of a state for failure messages.
func (s appState) brief() string {
	return fmt.Sprintf("ready=%v fresh=%v busy=%v work=%q lat=%.5f lon=%.5f wire_m=%g selected=%q editing=%q mouse_down=%v notice=%q rig_error=%q results=%d draws=%d overlay=%+v",
		s.Ready, s.Fresh, s.Busy, s.Work, s.Lat, s.Lon, s.Rig.WireM, s.Selected, s.Editing, s.MouseDown, s.Notice, s.RigError, len(s.Results), s.Draws, s.Overlay)
}

// ---- shared fixture: one build, one server, one browser per test binary ----

type fixture struct {
	root    string // repository root
	tmp     string
	bin     string // the earshot binary, built after "make app"
	url     string // where "earshot serve" serves the app
	srvErr  *lockedBuffer
	stopSrv func() // stops "earshot serve" (once; later calls do nothing)
	browser context.Context
	stop    []func()
}

var (
	fixOnce sync.Once
	fix     *fixture
	fixErr  error
	fixSkip string
)

func TestMain(m *testing.M) {
	code := m.Run()
	if fix != nil {
		for i := len(fix.stop) - 1; i >= 0; i-- {
			fix.stop[i]()
		}
	}
	os.Exit(code)
}

// chromiumPath finds the browser: /usr/bin/chromium, else chromium on PATH.
func chromiumPath() string {
	if st, err := os.Stat("/usr/bin/chromium"); err == nil && !st.IsDir() {
		return "/usr/bin/chromium"
	}
	if p, err := exec.LookPath("chromium"); err == nil {
		return p
	}
	return ""
}

// setup returns the shared fixture, building and starting it on first use.
func setup(t *testing.T) *fixture {
	t.Helper()
	if testing.Short() {
		t.Skip("e2e: skipped under -short (it builds the app and drives Chromium)")
	}
	fixOnce.Do(func() {
		chromium := chromiumPath()
		if chromium == "" {
			fixSkip = "e2e: no Chromium (looked for /usr/bin/chromium and chromium on PATH); install it (apt-get install chromium) to run the browser test"
			return
		}
		fix = &fixture{}
		fixErr = fix.start(t, chromium)
	})
	if fixSkip != "" {
		t.Skip(fixSkip)
	}
	if fixErr != nil {
		t.Fatal(fixErr)
	}
	return fix
}

func (f *fixture) start(t *testing.T, chromium string) error {
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		return err
	}
	if _, err := os.Stat(filepath.Join(root, "go.mod")); err != nil {
		return fmt.Errorf("e2e: repository root not found at %s: %v", root, err)
	}
	f.root = root
	if f.tmp, err = os.MkdirTemp("", "earshot-e2e-"); err != nil {
		return err
	}
	f.stop = append(f.stop, func() { os.RemoveAll(f.tmp) })

	// The same build as the Makefile's: the app into wasm/site/static,
	// then earshot, which embeds it.
	gocmd, err := exec.LookPath("go")
	if err != nil {
		return fmt.Errorf("e2e: go not on PATH: %v", err)
	}
	start := time.Now()
	if out, err := f.run("make", "GO="+gocmd, "app"); err != nil {
		return fmt.Errorf("e2e: make app: %v\n%s", err, out)
	}
	t.Logf("make app: %v", time.Since(start).Round(10*time.Millisecond))
	if st, err := os.Stat(filepath.Join(root, "wasm", "site", "static", "app.wasm.gz")); err == nil {
		t.Logf("app.wasm.gz: %.2f MB", float64(st.Size())/(1<<20))
	}
	start = time.Now()
	f.bin = filepath.Join(f.tmp, "earshot")
	if out, err := f.run(gocmd, "build", "-o", f.bin, "./cmd/earshot"); err != nil {
		return fmt.Errorf("e2e: go build ./cmd/earshot: %v\n%s", err, out)
	}
	t.Logf("go build ./cmd/earshot: %v", time.Since(start).Round(10*time.Millisecond))

	if err := f.serve(); err != nil {
		return err
	}
	return f.launch(t, chromium)
}

// run runs a command in the repository root and returns its combined output.
func (f *fixture) run(name string, args ...string) ([]byte, error) {
	cmd := exec.Command(name, args...)
	cmd.Dir = f.root
	return cmd.CombinedOutput()
}

// serve starts "earshot serve --addr 127.0.0.1:0" (port 0: the system
// picks a free port) and reads the page's URL, its first line of output.
func (f *fixture) serve() error {
	cmd := exec.Command(f.bin, "serve", "--addr", "127.0.0.1:0")
	cmd.Dir = f.tmp
	f.srvErr = &lockedBuffer{}
	cmd.Stderr = f.srvErr
	stdout, err := cmd.StdoutPipe()
	if err != nil {
		return err
	}
	if err := cmd.Start(); err != nil {
		return fmt.Errorf("e2e: earshot serve: %v", err)
	}
	var once sync.Once
	f.stopSrv = func() {
		once.Do(func() {
			cmd.Process.Signal(os.Interrupt)
			done := make(chan struct{})
			go func() { cmd.Wait(); close(done) }()
			select {
			case <-done:
			case <-time.After(10 * time.Second):
				cmd.Process.Kill()
				<-done
			}
		})
	}
	f.stop = append(f.stop, f.stopSrv)
	line := make(chan string, 1)
	go func() {
		sc := bufio.NewScanner(stdout)
		if sc.Scan() {
			line <- sc.Text()
		}
		close(line)
		io.Copy(io.Discard, stdout)
	}()
	select {
	case u, ok := <-line:
		if !ok || !strings.HasPrefix(u, "http://") {
			return fmt.Errorf("e2e: earshot serve printed %q, want its URL; stderr: %s", u, f.srvErr)
		}
		f.url = u
	case <-time.After(15 * time.Second):
		return fmt.Errorf("e2e: earshot serve printed no URL within 15 s; stderr: %s", f.srvErr)
	}
	// A cheap check before the browser: the app itself is served, as
	// WebAssembly (instantiateStreaming needs that content type).
	client := &http.Client{Timeout: 15 * time.Second}
	resp, err := client.Get(f.url + "app.wasm")
	if err != nil {
		return fmt.Errorf("e2e: GET %sapp.wasm: %v", f.url, err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK || resp.Header.Get("Content-Type") != "application/wasm" {
		return fmt.Errorf("e2e: GET %sapp.wasm: %s, Content-Type %q; want 200 and application/wasm; stderr: %s",
			f.url, resp.Status, resp.Header.Get("Content-Type"), f.srvErr)
	}
	return nil
}

// launch starts the one headless Chromium of this test binary, with the
// flags measured to work on these machines (/work/shared/browser-testing.md).
func (f *fixture) launch(t *testing.T, chromium string) error {
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(chromium),
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("hide-scrollbars", true),
		chromedp.Flag("mute-audio", true),
		chromedp.Flag("enable-unsafe-swiftshader", true), // WebGL through SwiftShader
		chromedp.UserDataDir(filepath.Join(f.tmp, "chromium")),
	)
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	bctx, cancelBrowser := chromedp.NewContext(actx)
	f.stop = append(f.stop, cancelAlloc, cancelBrowser)
	start := time.Now()
	if err := chromedp.Do(bctx); err != nil { // starts the browser
		return fmt.Errorf("e2e: start %s: %v", chromium, err)
	}
	f.browser = bctx
	t.Logf("Chromium %s started in %v", chromium, since(start))
	return nil
}

// lockedBuffer collects a subprocess's output for error messages.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return strings.TrimSpace(l.b.String())
}

// ---- one tab ----

type tab struct {
	t   *testing.T
	ctx context.Context

	mu      sync.Mutex
	console []string // console errors and warnings, uncaught exceptions
}

// newTab opens a tab with the pinned viewport and focus emulation (a
// headless page has no focus otherwise, and keys go to the focused
// canvas). Console errors and uncaught exceptions are logged when the
// test ends.
func newTab(t *testing.T, f *fixture) *tab {
	t.Helper()
	ctx, cancel := chromedp.NewContext(f.browser)
	tb := &tab{t: t, ctx: ctx}
	t.Cleanup(func() {
		tb.mu.Lock()
		for _, line := range tb.console {
			t.Logf("page console: %s", line)
		}
		tb.mu.Unlock()
		cancel()
	})
	err := chromedp.Do(ctx,
		chromedp.EmulateViewport(viewW, viewH),
		chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, emulation.SetFocusEmulationEnabled, emulation.SetFocusEmulationEnabledParams{Enabled: true})
			return err
		}),
	)
	if err != nil {
		t.Fatalf("e2e: open a tab: %v", err)
	}
	if err := chromedp.Listen(ctx, tb.onEvent); err != nil {
		t.Fatalf("e2e: listen to the tab: %v", err)
	}
	return tb
}

func (tb *tab) onEvent(ev any) {
	var line string
	switch e := ev.(type) {
	case *runtime.EventConsoleAPICalled:
		if e.Type != runtime.ConsoleAPICalledTypeError && e.Type != runtime.ConsoleAPICalledTypeWarning {
			return
		}
		parts := make([]string, 0, len(e.Args))
		for _, a := range e.Args {
			if len(a.Value) > 0 {
				parts = append(parts, string(a.Value))
			} else {
				parts = append(parts, a.Description)
			}
		}
		line = string(e.Type) + ": " + strings.Join(parts, " ")
	case *runtime.EventExceptionThrown:
		d := e.ExceptionDetails
		line = "exception: " + d.Text
		if d.Exception != nil {
			line += " " + d.Exception.Description
		}
	default:
		return
	}
	tb.mu.Lock()
	tb.console = append(tb.console, line)
	tb.mu.Unlock()
}

// do runs actions with a time limit.
func (tb *tab) do(limit time.Duration, actions ...chromedp.Action[chromedp.Void]) error {
	ctx, cancel := context.WithTimeout(tb.ctx, limit)
	defer cancel()
	return chromedp.Do(ctx, actions...)
}

// eval evaluates a JavaScript expression into v.
func eval[T any](tb *tab, expr string) (T, error) {
	ctx, cancel := context.WithTimeout(tb.ctx, 10*time.Second)
	defer cancel()
	return chromedp.Run(ctx, chromedp.Evaluate[T](expr))
}

// state reads earshot_state().
func (tb *tab) state() (appState, error) {
	var s appState
	raw, err := eval[string](tb, `typeof earshot_state === "function" ? earshot_state() : ""`)
	if err != nil {
		return s, err
	}
	if raw == "" {
		return s, errors.New("earshot_state is not defined yet")
	}
	if err := json.Unmarshal([]byte(raw), &s); err != nil {
		return s, fmt.Errorf("earshot_state(): %v", err)
	}
	if s.Error != "" {
		return s, fmt.Errorf("earshot_state(): the app reports %q", s.Error)
	}
	return s, nil
}

// waitState polls the app's state until cond holds, and returns that
// state; after limit it fails the test with the last state seen.
func (tb *tab) waitState(what string, limit time.Duration, cond func(appState) bool) appState {
	tb.t.Helper()
	deadline := time.Now().Add(limit)
	var last appState
	var lastErr error
	for {
		s, err := tb.state()
		if err == nil && cond(s) {
			return s
		}
		if err == nil {
			last = s
		}
		lastErr = err
		if time.Now().After(deadline) {
			tb.t.Fatalf("e2e: %s: not within %v; last state: %s; last error: %v", what, limit, last.brief(), lastErr)
		}
		time.Sleep(pollEvery)
	}
}

// open navigates to url and waits until the app reports its first
// prediction drawn (window.earshot_ready === true); reload does the same
// for the page shown. Both return the time from the start of navigation
// to ready. A failure message from the page's loader (boot.js shows it in
// #earshot-status.failed) ends the wait early.
func (tb *tab) open(url string) time.Duration {
	tb.t.Helper()
	return tb.loadWith("navigate to "+url, chromedp.Navigate(url))
}

func (tb *tab) reload() time.Duration {
	tb.t.Helper()
	return tb.loadWith("reload", chromedp.Reload())
}

func (tb *tab) loadWith(what string, act chromedp.Action[chromedp.Void]) time.Duration {
	tb.t.Helper()
	start := time.Now()
	if err := tb.do(readyLimit, act); err != nil {
		tb.t.Fatalf("e2e: %s: %v", what, err)
	}
	tb.waitReady(start)
	return time.Since(start)
}

func (tb *tab) waitReady(start time.Time) {
	tb.t.Helper()
	for {
		ready, err := eval[bool](tb, `window.earshot_ready === true`)
		if err == nil && ready {
			return
		}
		failed, _ := eval[string](tb, `(document.querySelector("#earshot-status.failed") || {}).textContent || ""`)
		if failed != "" {
			tb.t.Fatalf("e2e: the page reports: %s", failed)
		}
		if time.Since(start) > readyLimit {
			status, _ := eval[string](tb, `(document.getElementById("earshot-status") || {}).textContent || "(no status line)"`)
			st, serr := tb.state()
			tb.t.Fatalf("e2e: earshot_ready not true within %v (last error %v); the page's status line: %s; the app's state: %s (%v)", readyLimit, err, status, st.brief(), serr)
		}
		time.Sleep(pollEvery)
	}
}

// click is a left click at (x, y): move there, press, wait until the app
// reports the button held (ebiten samples the mouse once per frame, so a
// press and release sent back to back can be lost), release, and wait
// until the app has seen the release.
func (tb *tab) click(what string, x, y float64) {
	tb.t.Helper()
	err := tb.do(inputLimit,
		chromedp.MouseEvent(chromedp.MouseMoved, x, y, chromedp.ButtonNone),
		chromedp.MouseEvent(chromedp.MousePressed, x, y, chromedp.ButtonLeft, chromedp.ClickCount(1)))
	if err != nil {
		tb.t.Fatalf("e2e: press on %s at (%.0f, %.0f): %v", what, x, y, err)
	}
	tb.waitState("the app sees the button held on "+what, inputLimit, func(s appState) bool { return s.MouseDown })
	if err := tb.do(inputLimit, chromedp.MouseEvent(chromedp.MouseReleased, x, y, chromedp.ButtonLeft, chromedp.ClickCount(1))); err != nil {
		tb.t.Fatalf("e2e: release on %s: %v", what, err)
	}
	tb.waitState("the app sees the button released on "+what, inputLimit, func(s appState) bool { return !s.MouseDown })
}

// clickWidget clicks the centre of a widget the app reports.
func (tb *tab) clickWidget(name string) {
	tb.t.Helper()
	s, err := tb.state()
	if err != nil {
		tb.t.Fatalf("e2e: state: %v", err)
	}
	r, ok := s.Widgets[name]
	if !ok {
		tb.t.Fatalf("e2e: the app reports no widget %q", name)
	}
	tb.click(name, r.X+r.W/2, r.Y+r.H/2)
}

// typeText types printable characters (keyDown, char, keyUp each; the app
// takes characters from the keydown events' key, which ebiten queues, so
// they are not lost between frames).
func (tb *tab) typeText(text string) {
	tb.t.Helper()
	if err := tb.do(inputLimit, chromedp.KeyEvent(text)); err != nil {
		tb.t.Fatalf("e2e: type %q: %v", text, err)
	}
}

// pressEnter holds Enter down until cond holds in the app's state, then
// lets it go: ebiten reads keys by code once per frame, so a keyUp in the
// same frame as its keyDown would be lost.
func (tb *tab) pressEnter(what string, cond func(appState) bool) {
	tb.t.Helper()
	evs := kb.Encode('\r')
	var down, up []chromedp.Action[chromedp.Void]
	for _, e := range evs {
		e := *e
		a := chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, input.DispatchKeyEvent, e)
			return err
		})
		if e.Type == kb.KeyUp {
			up = append(up, a)
		} else {
			down = append(down, a)
		}
	}
	if err := tb.do(inputLimit, down...); err != nil {
		tb.t.Fatalf("e2e: Enter down: %v", err)
	}
	tb.waitState(what, inputLimit, cond)
	if err := tb.do(inputLimit, up...); err != nil {
		tb.t.Fatalf("e2e: Enter up: %v", err)
	}
}

// project asks the app where a place is on its map, CSS pixels.
func (tb *tab) project(lat, lon float64) (x, y float64) {
	tb.t.Helper()
	p, err := eval[[]float64](tb, fmt.Sprintf("earshot_project(%g, %g)", lat, lon))
	if err != nil || len(p) != 2 {
		tb.t.Fatalf("e2e: earshot_project(%g, %g) = %v, %v; want [x, y]", lat, lon, p, err)
	}
	return p[0], p[1]
}

// ---- the tests ----

// TestServedApp is the listener's path through the app served by
// "earshot serve": load it, put the spot on the map with the mouse,
// lengthen the wire with the buttons and the keyboard, compare the answer
// with the command line's, reload and find the choices kept, let the
// coverage overlay refine, and look at a screenshot.
func TestServedApp(t *testing.T) {
	f := setup(t)
	tb := newTab(t, f)

	// 1. Load.
	readyIn := tb.open(f.url)
	t.Logf("served app: navigation to earshot_ready in %v (limit %v)", readyIn.Round(time.Millisecond), readyLimit)
	logWasmTiming(t, tb)
	s := tb.waitState("first state fresh", stepLimit, func(s appState) bool { return s.Ready && s.Fresh })
	if s.Screen != [2]int{viewW, viewH} {
		t.Errorf("e2e: the app's screen is %v CSS px, want [%d %d] (chromedp.EmulateViewport)", s.Screen, viewW, viewH)
	}
	if len(s.Results) == 0 {
		t.Fatalf("e2e: no results after ready: %s", s.brief())
	}
	if s.Source != "demo" {
		t.Fatalf("e2e: a fresh browser should start on the embedded demo scenario, got source %q", s.Source)
	}
	t.Logf("start: spot %q (%.4f, %.4f), wire %g m, %d stations, %d audible", s.Spot, s.Lat, s.Lon, s.Rig.WireM, len(s.Results), s.Audible)
	start := s

	// 2. Put the spot on the map with a click, and wait for its answer.
	lap := time.Now()
	placeSpot(t, tb, s)
	tb.waitState("result for the new spot", stepLimit, func(s appState) bool { return s.Fresh })
	t.Logf("click on the map → fresh result in %v", since(lap))

	// 3. Lengthen the wire: the + button twice (5 m a step,
	// wasm/app/input.go rigRows), then type a length.
	s, _ = tb.state()
	wire0 := s.Rig.WireM
	for i := 1; i <= 2; i++ {
		lap = time.Now()
		tb.clickWidget("rig.wire.plus")
		want := wire0 + 5*float64(i)
		tb.waitState(fmt.Sprintf("wire %g m after + click %d", want, i), stepLimit, func(s appState) bool { return s.Rig.WireM == want })
		t.Logf("click on rig.wire.plus → wire %g m in %v", want, since(lap))
	}
	lap = time.Now()
	typed := 55.0
	if wire0+10 == typed {
		typed = 45
	}
	tb.clickWidget("rig.wire.value")
	tb.waitState("editing the wire length", inputLimit, func(s appState) bool { return s.Editing == "wire" })
	tb.typeText(fmt.Sprint(typed))
	tb.pressEnter("Enter applies the typed length", func(s appState) bool { return s.Editing == "" })
	s = tb.waitState(fmt.Sprintf("wire %g m typed, result fresh", typed), stepLimit, func(s appState) bool {
		return s.Rig.WireM == typed && s.Fresh
	})
	if s.RigError != "" {
		t.Errorf("e2e: rig error after typing %g m: %s", typed, s.RigError)
	}
	t.Logf("typed wire %g m → fresh result in %v", typed, since(lap))

	// 4. The command line is the reference: one planning model answers
	// both, so `earshot` with the state's cli_args must print the same
	// stations in the same order with the same figures.
	compareWithCLI(t, f, s)

	// 5. Reload: the spot and the rig come back from local storage.
	want := s
	waitSaved(t, tb, want)
	readyIn = tb.reload()
	t.Logf("reload: earshot_ready in %v", readyIn.Round(time.Millisecond))
	s = tb.waitState("fresh after reload", stepLimit, func(s appState) bool { return s.Fresh })
	if math.Abs(s.Lat-want.Lat) > 1e-9 || math.Abs(s.Lon-want.Lon) > 1e-9 {
		t.Errorf("e2e: after reload the spot is (%.6f, %.6f), want (%.6f, %.6f) kept in localStorage", s.Lat, s.Lon, want.Lat, want.Lon)
	}
	if s.Rig.WireM != want.Rig.WireM {
		t.Errorf("e2e: after reload wire_m = %g, want %g kept in localStorage", s.Rig.WireM, want.Rig.WireM)
	}
	if len(s.Results) != len(want.Results) {
		t.Errorf("e2e: after reload %d results, want %d", len(s.Results), len(want.Results))
	}

	// 6. The overlay refines; the frame rate while it does is reported.
	watchOverlay(t, tb)

	// 7. A screenshot through the Chrome DevTools Protocol
	// (Page.captureScreenshot): the canvas must show a drawn app.
	checkScreenshot(t, tb, "earshot-served-1280x800.png")

	// 8. Corrupted storage: the app starts afresh on the demo's default
	// spot with a notice, instead of breaking (the requirement).
	if _, err := eval[any](tb, `localStorage.setItem("earshot.app.state", "{not json"); true`); err != nil {
		t.Fatalf("e2e: corrupting localStorage: %v", err)
	}
	tb.reload()
	s = tb.waitState("fresh after corrupted storage", stepLimit, func(s appState) bool { return s.Fresh })
	if !strings.Contains(s.Notice, "could not be read") {
		t.Errorf("e2e: after corrupted storage the notice is %q, want one saying the saved settings could not be read", s.Notice)
	}
	if s.Spot != start.Spot || len(s.Results) == 0 {
		t.Errorf("e2e: after corrupted storage spot %q with %d results, want the demo's %q", s.Spot, len(s.Results), start.Spot)
	}

	// 9. Offline: with the page under its service worker, stop the server
	// and reload; the app must come back from the worker's cache (the
	// issue: "a service worker lets the page reopen with no server
	// running"). Last, since it ends the server.
	if _, err := tb.waitEval("the service worker controls the page", stepLimit,
		`!!(navigator.serviceWorker && navigator.serviceWorker.controller)`); err != nil {
		t.Fatalf("e2e: %v", err)
	}
	f.stopSrv()
	if resp, err := (&http.Client{Timeout: 3 * time.Second}).Get(f.url); err == nil {
		resp.Body.Close()
		t.Fatalf("e2e: %s still answers after the server was stopped", f.url)
	}
	readyIn = tb.reload()
	s = tb.waitState("fresh with the server stopped", stepLimit, func(s appState) bool { return s.Fresh })
	t.Logf("offline reload (service worker): earshot_ready in %v, %d stations", readyIn.Round(time.Millisecond), len(s.Results))
	if len(s.Results) == 0 {
		t.Errorf("e2e: offline reload shows no results")
	}
}

// waitEval polls a JavaScript expression until it is true.
func (tb *tab) waitEval(what string, limit time.Duration, expr string) (bool, error) {
	end := time.Now().Add(limit)
	for time.Now().Before(end) {
		if ok, err := eval[bool](tb, expr); err == nil && ok {
			return true, nil
		}
		time.Sleep(100 * time.Millisecond)
	}
	return false, fmt.Errorf("%s: not within %v", what, limit)
}

// TestSingleFile opens the single offline page that "earshot dist"
// writes (the command "make dist" runs) straight from disk, with no
// server, and waits for its first prediction.
func TestSingleFile(t *testing.T) {
	f := setup(t)
	page := filepath.Join(f.tmp, "earshot.html")
	cmd := exec.Command(f.bin, "dist", "--out", page)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("e2e: earshot dist --out %s: %v\n%s", page, err, out)
	} else {
		t.Logf("earshot dist: %s", strings.TrimSpace(string(out)))
	}
	tb := newTab(t, f)
	readyIn := tb.open("file://" + page)
	t.Logf("single file: navigation to earshot_ready in %v (limit %v)", readyIn.Round(time.Millisecond), readyLimit)
	s := tb.waitState("single file: fresh results", stepLimit, func(s appState) bool { return s.Fresh })
	if len(s.Results) == 0 {
		t.Fatalf("e2e: single file: no results: %s", s.brief())
	}
	if s.Screen != [2]int{viewW, viewH} {
		t.Errorf("e2e: single file: screen %v, want [%d %d]", s.Screen, viewW, viewH)
	}
	t.Logf("single file: %d stations, %d audible at %q", len(s.Results), s.Audible, s.Spot)
}

// ---- steps ----

func since(t time.Time) time.Duration { return time.Since(t).Round(time.Millisecond) }

// logWasmTiming logs how the app's download went, from the browser's
// Resource Timing entry for app.wasm.
func logWasmTiming(t *testing.T, tb *tab) {
	type entry struct {
		Ms      float64 `json:"ms"`
		Encoded float64 `json:"encoded"`
		Decoded float64 `json:"decoded"`
	}
	es, err := eval[[]entry](tb, `performance.getEntriesByType("resource").filter(e => e.name.endsWith("/app.wasm")).map(e => ({ms: e.responseEnd - e.startTime, encoded: e.encodedBodySize, decoded: e.decodedBodySize}))`)
	if err != nil || len(es) == 0 {
		t.Logf("app.wasm: no Resource Timing entry (%v)", err)
		return
	}
	e := es[0]
	t.Logf("app.wasm: fetched in %.0f ms (%.2f MB over the wire, %.2f MB WebAssembly)", e.Ms, e.Encoded/(1<<20), e.Decoded/(1<<20))
}

// placeSpot clicks an empty point of the map a little north-west of the
// spot and checks that the spot moved there. The point must be inside the
// map (the app's layout maths, wasm/screen), off every widget, off the
// spot itself and at least 15 px from every station of the demo scenario
// (assets.Demo), whose dots select a station instead.
func placeSpot(t *testing.T, tb *tab, s appState) {
	t.Helper()
	sc, err := assets.Demo()
	if err != nil {
		t.Fatal(err)
	}
	lay := screen.NewLayout(float64(s.Screen[0]), float64(s.Screen[1]))
	sx, sy := tb.project(s.Lat, s.Lon)
	free := func(x, y float64) string {
		m := lay.Map
		if x < m.X+20 || x > m.X+m.W-20 || y < m.Y+20 || y > m.Y+m.H-20 {
			return "outside the map"
		}
		for name, r := range s.Widgets {
			if r.contains(x, y) {
				return "on widget " + name
			}
		}
		if math.Hypot(x-sx, y-sy) < 30 {
			return "on the spot"
		}
		for _, st := range sc.Stations() {
			px, py := tb.project(st.Place.LatDeg(), st.Place.LonDeg())
			if math.Hypot(x-px, y-py) < 15 {
				return "within 15 px of station " + st.ID
			}
		}
		return ""
	}
	var lat, lon, x, y float64
	var why []string
	for _, d := range [][2]float64{{0.15, -0.2}, {-0.15, -0.2}, {0.15, 0.2}, {-0.15, 0.2}, {0.3, -0.4}, {-0.3, 0.4}} {
		lat, lon = s.Lat+d[0], s.Lon+d[1]
		x, y = tb.project(lat, lon)
		r := free(x, y)
		if r == "" {
			why = nil
			break
		}
		why = append(why, fmt.Sprintf("(%+.2f°, %+.2f°) → (%.0f, %.0f) px %s", d[0], d[1], x, y, r))
	}
	if why != nil {
		t.Fatalf("e2e: no free point near the spot to click: %s", strings.Join(why, "; "))
	}
	tb.click("the map", x, y)
	got := tb.waitState("spot moved by the click", stepLimit, func(n appState) bool { return n.Lat != s.Lat || n.Lon != s.Lon || n.Selected != "" })
	if got.Selected != "" {
		t.Fatalf("e2e: the click at (%.0f, %.0f) selected station %q instead of moving the spot", x, y, got.Selected)
	}
	// One pixel is 1/PxPerDeg degrees; at this zoom well under 0.02°.
	if math.Abs(got.Lat-lat) > 0.02 || math.Abs(got.Lon-lon) > 0.02 {
		t.Errorf("e2e: clicked (%.0f, %.0f) px = earshot_project(%.4f, %.4f); the spot went to (%.4f, %.4f), want within 0.02°", x, y, lat, lon, got.Lat, got.Lon)
	}
	t.Logf("spot placed by a click at (%.0f, %.0f) px: (%.4f, %.4f), wanted (%.4f, %.4f)", x, y, got.Lat, got.Lon, lat, lon)
}

// cliPrediction is the part of `earshot predict --json` compared here.
type cliPrediction struct {
	Audible  int            `json:"audible"`
	Stations []stationState `json:"stations"` // the same names as the app's results
}

// compareWithCLI runs earshot with the state's cli_args and compares.
func compareWithCLI(t *testing.T, f *fixture, s appState) {
	t.Helper()
	if len(s.CLIArgs) < 2 || s.CLIArgs[0] != "predict" || !slices.Contains(s.CLIArgs, "--json") {
		t.Fatalf("e2e: cli_args = %q, want predict --json …", s.CLIArgs)
	}
	cmd := exec.Command(f.bin, s.CLIArgs...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("e2e: earshot %s: %v\n%s", strings.Join(s.CLIArgs, " "), err, stderr.String())
	}
	var cli cliPrediction
	if err := json.Unmarshal(out, &cli); err != nil {
		t.Fatalf("e2e: earshot %s: output is not the predict JSON: %v", strings.Join(s.CLIArgs, " "), err)
	}
	call := "earshot " + strings.Join(s.CLIArgs, " ")
	t.Logf("reference: %s", call)
	if cli.Audible != s.Audible {
		t.Errorf("e2e: audible count: app %d, CLI %d (%s)", s.Audible, cli.Audible, call)
	}
	appIDs := make([]string, len(s.Results))
	for i, r := range s.Results {
		appIDs[i] = r.ID
	}
	cliIDs := make([]string, len(cli.Stations))
	for i, r := range cli.Stations {
		cliIDs[i] = r.ID
	}
	if !slices.Equal(appIDs, cliIDs) {
		t.Fatalf("e2e: station order differs\napp: %v\nCLI: %v\n(%s)", appIDs, cliIDs, call)
	}
	str := func(p *string) string {
		if p == nil {
			return "null"
		}
		return *p
	}
	for i, a := range s.Results {
		c := cli.Stations[i]
		var bad []string
		if a.KHz != c.KHz {
			bad = append(bad, fmt.Sprintf("khz app %g CLI %g", a.KHz, c.KHz))
		}
		if d := math.Abs(a.Km - c.Km); d > kmTol {
			bad = append(bad, fmt.Sprintf("km app %g CLI %g (|Δ| %.4f > %g)", a.Km, c.Km, d, kmTol))
		}
		if d := math.Abs(a.EDB - c.EDB); d > dbTol {
			bad = append(bad, fmt.Sprintf("e_dbuvm app %g CLI %g (|Δ| %.4f > %g dB)", a.EDB, c.EDB, d, dbTol))
		}
		if d := math.Abs(a.MarginDB - c.MarginDB); d > dbTol {
			bad = append(bad, fmt.Sprintf("margin_db app %g CLI %g (|Δ| %.4f > %g dB)", a.MarginDB, c.MarginDB, d, dbTol))
		}
		if d := math.Abs(a.Chance - c.Chance); d > chanceTol {
			bad = append(bad, fmt.Sprintf("chance app %g CLI %g (|Δ| %.4f > %g)", a.Chance, c.Chance, d, chanceTol))
		}
		if a.Audible != c.Audible {
			bad = append(bad, fmt.Sprintf("audible app %v CLI %v", a.Audible, c.Audible))
		}
		if str(a.MaskedBy) != str(c.MaskedBy) {
			bad = append(bad, fmt.Sprintf("masked_by app %s CLI %s", str(a.MaskedBy), str(c.MaskedBy)))
		}
		if a.Verdict != c.Verdict {
			bad = append(bad, fmt.Sprintf("verdict app %q CLI %q", a.Verdict, c.Verdict))
		}
		if bad != nil {
			t.Errorf("e2e: station %d %s: %s", i, a.ID, strings.Join(bad, "; "))
		}
	}
	t.Logf("app and CLI agree on %d stations (%d audible)", len(s.Results), s.Audible)
}

// waitSaved waits until the app has written the expected spot and wire
// length to local storage (it saves at most twice a second), so that the
// reload tests persistence rather than timing.
func waitSaved(t *testing.T, tb *tab, want appState) {
	t.Helper()
	type saved struct {
		Lat float64  `json:"lat"`
		Lon float64  `json:"lon"`
		Rig rigState `json:"rig"`
	}
	deadline := time.Now().Add(stepLimit)
	var last string
	for {
		raw, err := eval[string](tb, fmt.Sprintf(`localStorage.getItem(%q) || ""`, storageKey))
		last = raw
		var sv saved
		if err == nil && json.Unmarshal([]byte(raw), &sv) == nil &&
			sv.Lat == want.Lat && sv.Lon == want.Lon && sv.Rig.WireM == want.Rig.WireM {
			return
		}
		if time.Now().After(deadline) {
			t.Fatalf("e2e: localStorage[%q] does not hold spot (%g, %g) and wire %g m within %v; it holds %.300s", storageKey, want.Lat, want.Lon, want.Rig.WireM, stepLimit, last)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// watchOverlay waits until the coverage overlay is done (or overlayLimit)
// and logs the frame rate the app reports (ebiten.ActualFPS) meanwhile.
func watchOverlay(t *testing.T, tb *tab) {
	t.Helper()
	start := time.Now()
	var fps []float64
	var s appState
	var err error
	lastSample := time.Time{}
	for {
		s, err = tb.state()
		if err != nil {
			t.Fatalf("e2e: state: %v", err)
		}
		if !s.Overlay.On {
			t.Logf("overlay: switched off; nothing to watch")
			return
		}
		if s.Overlay.Done || time.Since(start) > overlayLimit {
			break
		}
		if time.Since(lastSample) >= 500*time.Millisecond {
			fps = append(fps, s.FPS)
			lastSample = time.Now()
		}
		time.Sleep(100 * time.Millisecond)
	}
	took := time.Since(start).Round(10 * time.Millisecond)
	if !s.Overlay.Done {
		t.Logf("overlay: not done after %v (progress %.0f %%); reported, not failed", overlayLimit, 100*s.Overlay.Progress)
	} else {
		t.Logf("overlay: done in %v after the reload's ready", took)
	}
	if len(fps) > 0 {
		sorted := slices.Clone(fps)
		slices.Sort(sorted)
		t.Logf("fps while refining (%d samples, every 0.5 s): min %.1f, median %.1f, max %.1f", len(fps), sorted[0], sorted[len(sorted)/2], sorted[len(sorted)-1])
	}
	time.Sleep(300 * time.Millisecond)
	if s, err = tb.state(); err == nil {
		t.Logf("fps after refining: %.1f", s.FPS)
	}
}

// checkScreenshot takes a Chrome DevTools Protocol screenshot
// (Page.captureScreenshot), saves it, and checks that it shows a drawn
// app: the right size, many colours, and a map area that is not one flat
// colour.
func checkScreenshot(t *testing.T, tb *tab, name string) {
	t.Helper()
	ctx, cancel := context.WithTimeout(tb.ctx, 20*time.Second)
	defer cancel()
	data, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatalf("e2e: Page.captureScreenshot: %v", err)
	}
	dir := os.Getenv("EARSHOT_SCREENSHOT_DIR")
	if dir == "" {
		dir = t.TempDir()
	} else if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatalf("e2e: EARSHOT_SCREENSHOT_DIR: %v", err)
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatalf("e2e: save screenshot: %v", err)
	}
	t.Logf("screenshot: %s (%d KB)", path, len(data)/1024)
	img, err := png.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("e2e: screenshot is not a PNG: %v", err)
	}
	if b := img.Bounds(); b.Dx() != viewW || b.Dy() != viewH {
		t.Errorf("e2e: screenshot is %dx%d, want %dx%d", b.Dx(), b.Dy(), viewW, viewH)
	}
	whole, _ := colours(img, img.Bounds())
	lay := screen.NewLayout(viewW, viewH)
	m := lay.Map
	mapRect := image.Rect(int(m.X), int(m.Y), int(m.X+m.W), int(m.Y+m.H)).Intersect(img.Bounds())
	inMap, top := colours(img, mapRect)
	t.Logf("screenshot: %d distinct colours; map area %d, its commonest colour covers %.0f %%", whole, inMap, 100*top)
	// A blank or black canvas has one or two colours; text, the coast,
	// station dots and the overlay give hundreds.
	const minColours, minMapColours, maxFlat = 64, 16, 0.95
	if whole < minColours {
		t.Errorf("e2e: screenshot has %d distinct colours, want ≥ %d (blank canvas?)", whole, minColours)
	}
	if inMap < minMapColours || top > maxFlat {
		t.Errorf("e2e: map area has %d colours with one covering %.0f %%; want ≥ %d and ≤ %.0f %% (empty map?)", inMap, 100*top, minMapColours, 100*maxFlat)
	}
}

// colours counts the distinct colours in r and the share of the commonest.
func colours(img image.Image, r image.Rectangle) (n int, topShare float64) {
	count := map[[4]uint32]int{}
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			cr, cg, cb, ca := img.At(x, y).RGBA()
			count[[4]uint32{cr, cg, cb, ca}]++
		}
	}
	top := 0
	for _, c := range count {
		top = max(top, c)
	}
	if px := r.Dx() * r.Dy(); px > 0 {
		topShare = float64(top) / float64(px)
	}
	return len(count), topShare
}
