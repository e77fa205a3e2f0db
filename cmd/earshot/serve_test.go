package main

import (
	"bytes"
	"compress/gzip"
	"context"
	"io"
	"net"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"strings"
	"sync"
	"testing"
	"testing/fstest"
	"time"

	"earshot/wasm/site"
)

// TestServeUsage runs the serve and dist commands with bad command lines:
// usage errors exit 2 with one line on stderr naming the flag (the flag
// package's convention: exit status 2 for usage errors).
func TestServeUsage(t *testing.T) {
	for _, c := range []cliCase{
		{"serve help", []string{"serve", "--help"}, 0, `(?s)--addr.*127\.0\.0\.1:8417.*--public`, ""},
		{"listed in help", []string{"--help"}, 0, `(?s)dist\s+write the browser app as one offline HTML file.*serve\s+serve the browser app on this machine`, ""},
		{"any interface", []string{"serve", "--addr", "0.0.0.0:8417"}, 2, "", `^earshot serve: --addr host must be loopback \(127\.0\.0\.0/8, ::1 or localhost\) unless --public is given, got "0\.0\.0\.0:8417"\n$`},
		{"LAN address", []string{"serve", "--addr", "192.168.1.2:8417"}, 2, "", `^earshot serve: --addr host must be loopback .*got "192\.168\.1\.2:8417"\n$`},
		{"empty host", []string{"serve", "--addr", ":8417"}, 2, "", `^earshot serve: --addr host must be loopback`},
		{"IPv6 any", []string{"serve", "--addr", "[::]:8417"}, 2, "", `^earshot serve: --addr host must be loopback`},
		{"host name", []string{"serve", "--addr", "example.org:8417"}, 2, "", `^earshot serve: --addr host must be loopback`},
		{"no port", []string{"serve", "--addr", "127.0.0.1"}, 2, "", `^earshot serve: --addr must be HOST:PORT such as 127\.0\.0\.1:8417, got "127\.0\.0\.1"\n$`},
		{"named port", []string{"serve", "--addr", "127.0.0.1:http"}, 2, "", `^earshot serve: --addr port must be a number from 0 to 65535, got "http"\n$`},
		{"port too big", []string{"serve", "--addr", "127.0.0.1:65536"}, 2, "", `--addr port must be a number from 0 to 65535, got "65536"\n$`},
		{"negative port", []string{"serve", "--addr", "localhost:-1"}, 2, "", `--addr port must be a number from 0 to 65535`},
		{"stray argument", []string{"serve", "now"}, 2, "", `^earshot serve: unexpected argument "now"\n$`},
		{"dist help", []string{"dist", "--help"}, 0, `(?s)file://.*--out`, ""},
		{"dist without --out", []string{"dist"}, 2, "", `^earshot dist: --out FILE.html is required\n$`},
	} {
		t.Run(c.name, func(t *testing.T) {
			var stdout, stderr bytes.Buffer
			status := run(c.args, &stdout, &stderr)
			if status != c.status {
				t.Errorf("run(%q) = %d, want %d (stderr %q)", c.args, status, c.status, stderr.String())
			}
			match(t, "stdout", c.args, stdout.String(), c.stdout)
			match(t, "stderr", c.args, stderr.String(), c.stderr)
			if n := strings.Count(stderr.String(), "\n"); n > 1 {
				t.Errorf("run(%q): stderr has %d lines, want one", c.args, n)
			}
		})
	}
}

func match(t *testing.T, what string, args []string, got, pattern string) {
	t.Helper()
	if pattern == "" {
		if got != "" {
			t.Errorf("run(%q): %s = %q, want empty", args, what, got)
		}
		return
	}
	if !regexp.MustCompile(pattern).MatchString(got) {
		t.Errorf("run(%q): %s = %q, want match for %s", args, what, got, pattern)
	}
}

// TestCheckServeAddr: loopback is 127.0.0.0/8 (RFC 1122 §3.2.1.3), ::1
// (RFC 4291 §2.5.3) and the name localhost (RFC 6761 §6.3); --public
// admits anything well formed; ports are 0–65535 (RFC 6335 §6).
func TestCheckServeAddr(t *testing.T) {
	for _, c := range []struct {
		addr   string
		public bool
		ok     bool
	}{
		{"127.0.0.1:8417", false, true},
		{"127.8.9.10:1", false, true},
		{"[::1]:8417", false, true},
		{"localhost:0", false, true},
		{"LocalHost:65535", false, true},
		{"128.0.0.1:8417", false, false},
		{"0.0.0.0:8417", false, false},
		{"192.168.1.2:8417", false, false},
		{"[fe80::1]:8417", false, false},
		{"localhost.example:8417", false, false},
		{"0.0.0.0:8417", true, true},
		{"192.168.1.2:8417", true, true},
		{":8417", true, true},
		{"[::]:8417", true, true},
		{"0.0.0.0", true, false},
		{"0.0.0.0:99999", true, false},
	} {
		err := checkServeAddr(c.addr, c.public)
		if (err == nil) != c.ok {
			t.Errorf("checkServeAddr(%q, public=%v) = %v, want ok=%v", c.addr, c.public, err, c.ok)
		}
		if err != nil && !strings.Contains(err.Error(), "--addr") {
			t.Errorf("checkServeAddr(%q): error %q does not name --addr", c.addr, err)
		}
	}
}

func TestPageURL(t *testing.T) {
	for _, c := range []struct{ addr, want string }{
		{"127.0.0.1:8417", "http://127.0.0.1:8417/"},
		{"0.0.0.0:8417", "http://127.0.0.1:8417/"},
		{"[::]:80", "http://127.0.0.1:80/"},
		{"[::1]:8417", "http://[::1]:8417/"}, // RFC 3986 §3.2.2: IPv6 literals in brackets
		{"192.168.1.2:8417", "http://192.168.1.2:8417/"},
	} {
		a, _ := net.ResolveTCPAddr("tcp", c.addr)
		if got := pageURL(a); got != c.want {
			t.Errorf("pageURL(%s) = %q, want %q", c.addr, got, c.want)
		}
	}
}

func TestServePortInUse(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	addr := ln.Addr().String()
	var stdout, stderr bytes.Buffer
	status := run([]string{"serve", "--addr", addr}, &stdout, &stderr)
	if status != 1 {
		t.Errorf("serve on a port in use: status %d, want 1", status)
	}
	want := `^earshot serve: --addr ` + regexp.QuoteMeta(addr) + ` is already in use .*\n$`
	if runtime.GOOS == "windows" {
		want = `^earshot serve: cannot listen on --addr ` + regexp.QuoteMeta(addr) + `: .*\n$`
	}
	match(t, "stderr", []string{"serve", "--addr", addr}, stderr.String(), want)
	if stdout.Len() != 0 {
		t.Errorf("serve on a port in use printed %q", stdout.String())
	}
}

// fakeWasm is the smallest WebAssembly module: the magic "\0asm" and
// version 1 (WebAssembly Core Specification, binary format, Modules).
var fakeWasm = []byte("\x00asm\x01\x00\x00\x00")

func builtFS(t *testing.T) fstest.MapFS {
	t.Helper()
	var gz bytes.Buffer
	zw := gzip.NewWriter(&gz)
	zw.Write(fakeWasm)
	zw.Close()
	return fstest.MapFS{
		"index.html":   {Data: []byte("<!doctype html>\n<html lang=\"en\"><head><title>t</title></head>\n<body>\n<p id=\"earshot-status\">loading</p>\n</body></html>\n")},
		"boot.js":      {Data: []byte("// loader stand-in\n")},
		"sw.js":        {Data: []byte(`const VERSION = "__EARSHOT_VERSION__";` + "\n")},
		"app.css":      {Data: []byte("body { margin: 0 }\n")},
		"icon.svg":     {Data: []byte(`<svg xmlns="http://www.w3.org/2000/svg"/>`)},
		"wasm_exec.js": {Data: []byte("// wasm_exec stand-in\n")},
		"app.wasm.gz":  {Data: gz.Bytes()},
	}
}

// startServe runs serveOn on 127.0.0.1:0 and returns the base URL and a
// function that stops it (as an interrupt would) and returns its result.
func startServe(t *testing.T, fsys fstest.MapFS) (base string, stop func() (error, string, string)) {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	var stdout, stderr bytes.Buffer
	done := make(chan error, 1)
	go func() { done <- serveOn(ctx, ln, fsys, &stdout, &stderr) }()
	return "http://" + ln.Addr().String(), func() (error, string, string) {
		cancel()
		select {
		case err := <-done:
			return err, stdout.String(), stderr.String()
		case <-time.After(10 * time.Second):
			t.Fatal("serveOn did not return within 10 s of cancel")
			return nil, "", ""
		}
	}
}

func TestServeOn(t *testing.T) {
	fsys := builtFS(t)
	base, stop := startServe(t, fsys)
	// A raw client: it keeps Content-Encoding as sent.
	client := &http.Client{Transport: &http.Transport{DisableCompression: true}}
	get := func(method, path string, header ...string) (*http.Response, []byte) {
		t.Helper()
		req, _ := http.NewRequest(method, base+path, nil)
		for i := 0; i+1 < len(header); i += 2 {
			req.Header.Set(header[i], header[i+1])
		}
		res, err := client.Do(req)
		if err != nil {
			t.Fatalf("%s %s: %v", method, path, err)
		}
		defer res.Body.Close()
		body, _ := io.ReadAll(res.Body)
		return res, body
	}

	res, body := get("GET", "/app.wasm", "Accept-Encoding", "gzip")
	// MDN / WebAssembly Web API: instantiateStreaming requires application/wasm.
	// RFC 9110 §8.4 (Content-Encoding), §8.6 (Content-Length of the encoded content).
	if res.StatusCode != 200 || res.Header.Get("Content-Type") != "application/wasm" || res.Header.Get("Content-Encoding") != "gzip" {
		t.Errorf("GET /app.wasm (gzip): %d %q %q, want 200 application/wasm gzip", res.StatusCode, res.Header.Get("Content-Type"), res.Header.Get("Content-Encoding"))
	}
	if res.ContentLength != int64(len(fsys["app.wasm.gz"].Data)) || !bytes.Equal(body, fsys["app.wasm.gz"].Data) {
		t.Errorf("GET /app.wasm (gzip): Content-Length %d, %d bytes; want the stored %d", res.ContentLength, len(body), len(fsys["app.wasm.gz"].Data))
	}
	if zr, err := gzip.NewReader(bytes.NewReader(body)); err != nil {
		t.Errorf("GET /app.wasm (gzip): %v", err)
	} else if got, _ := io.ReadAll(zr); !bytes.Equal(got, fakeWasm) {
		t.Errorf("GET /app.wasm (gzip): decodes to %q, want the module", got)
	}

	res, body = get("GET", "/app.wasm")
	if res.Header.Get("Content-Encoding") != "" || !bytes.Equal(body, fakeWasm) || res.ContentLength != int64(len(fakeWasm)) {
		t.Errorf("GET /app.wasm (no Accept-Encoding): encoding %q, %d bytes, Content-Length %d; want the decoded module", res.Header.Get("Content-Encoding"), len(body), res.ContentLength)
	}

	for _, c := range []struct {
		method, path string
		status       int
	}{
		{"GET", "/", 200},
		{"HEAD", "/", 200},
		{"GET", "/sw.js", 200},
		{"GET", "/nothing", 404},
		{"POST", "/", 405},
	} {
		res, _ := get(c.method, c.path)
		if res.StatusCode != c.status {
			t.Errorf("%s %s: %d, want %d", c.method, c.path, res.StatusCode, c.status)
		}
		// W3C CSP Level 3; WHATWG Fetch (nosniff).
		if res.Header.Get("Content-Security-Policy") != site.ContentSecurityPolicy || res.Header.Get("X-Content-Type-Options") != "nosniff" {
			t.Errorf("%s %s: security headers missing", c.method, c.path)
		}
	}
	_, body = get("GET", "/sw.js")
	if strings.Contains(string(body), site.VersionPlaceholder) || !strings.Contains(string(body), site.Version(fsys)) {
		t.Errorf("GET /sw.js = %q, want the version %s in place of the placeholder", body, site.Version(fsys))
	}

	err, stdout, stderr := stop()
	if err != nil {
		t.Errorf("serveOn after cancel: %v, want nil (graceful stop)", err)
	}
	if want := base + "/\n"; stdout != want {
		t.Errorf("stdout = %q, want %q", stdout, want)
	}
	if stderr != "" {
		t.Errorf("stderr = %q, want empty", stderr)
	}
	if _, err := client.Get(base + "/"); err == nil {
		t.Error("server still answers after stop")
	}
}

func TestServeOnNotBuilt(t *testing.T) {
	fsys := builtFS(t)
	delete(fsys, "app.wasm.gz")
	delete(fsys, "wasm_exec.js")
	base, stop := startServe(t, fsys)
	res, err := http.Get(base + "/")
	if err != nil {
		t.Fatal(err)
	}
	body, _ := io.ReadAll(res.Body)
	res.Body.Close()
	if res.StatusCode != 200 || !strings.Contains(string(body), "make app") {
		t.Errorf("GET / without the app: %d %q, want 200 and a page naming make app", res.StatusCode, body)
	}
	err, _, stderr := stop()
	if err != nil {
		t.Errorf("serveOn: %v", err)
	}
	if !regexp.MustCompile(`^earshot serve: warning: the browser app is not built.*make run.*\n$`).MatchString(stderr) {
		t.Errorf("stderr = %q, want one warning line naming make run", stderr)
	}
}

func TestServeOnBadBuild(t *testing.T) {
	fsys := builtFS(t)
	fsys["app.wasm.gz"] = &fstest.MapFile{Data: []byte("not gzip")}
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	var stdout, stderr bytes.Buffer
	err = serveOn(context.Background(), ln, fsys, &stdout, &stderr)
	if err == nil || !strings.Contains(err.Error(), "make app") || strings.HasPrefix(err.Error(), "site:") {
		t.Errorf("serveOn with a damaged app: %v, want an error naming make app", err)
	}
	if _, err := net.Dial("tcp", ln.Addr().String()); err == nil {
		t.Error("the listener is still open after the failure")
	}
}

// lineWriter is a concurrency-safe buffer that signals its first line.
type lineWriter struct {
	mu    sync.Mutex
	b     bytes.Buffer
	first chan string
}

func (w *lineWriter) Write(p []byte) (int, error) {
	w.mu.Lock()
	defer w.mu.Unlock()
	had := bytes.IndexByte(w.b.Bytes(), '\n') >= 0
	w.b.Write(p)
	if i := bytes.IndexByte(w.b.Bytes(), '\n'); !had && i >= 0 {
		w.first <- w.b.String()[:i]
	}
	return len(p), nil
}

func (w *lineWriter) String() string {
	w.mu.Lock()
	defer w.mu.Unlock()
	return w.b.String()
}

// TestServeInterrupt runs the whole command on a free port, interrupts it
// as Ctrl-C would (SIGINT) and expects a graceful stop with status 0.
func TestServeInterrupt(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("os.Process.Signal(os.Interrupt) is not implemented on Windows")
	}
	stdout := &lineWriter{first: make(chan string, 1)}
	stderr := &lineWriter{first: make(chan string, 1)}
	status := make(chan int, 1)
	go func() { status <- run([]string{"serve", "--addr", "127.0.0.1:0"}, stdout, stderr) }()
	var url string
	select {
	case url = <-stdout.first:
	case s := <-status:
		t.Fatalf("serve exited with %d before printing its URL: %s", s, stderr.String())
	case <-time.After(10 * time.Second):
		t.Fatal("serve printed no URL within 10 s")
	}
	if !regexp.MustCompile(`^http://127\.0\.0\.1:\d+/$`).MatchString(url) {
		t.Fatalf("serve printed %q, want http://127.0.0.1:PORT/", url)
	}
	res, err := http.Get(url)
	if err != nil {
		t.Fatal(err)
	}
	res.Body.Close()
	if res.StatusCode != 200 {
		t.Errorf("GET %s: %d, want 200 (the app or the not-built page)", url, res.StatusCode)
	}
	// The URL is printed after the signal handler is installed.
	self, _ := os.FindProcess(os.Getpid())
	if err := self.Signal(os.Interrupt); err != nil {
		t.Fatal(err)
	}
	select {
	case s := <-status:
		if s != 0 {
			t.Errorf("serve after SIGINT: status %d, want 0 (stderr %q)", s, stderr.String())
		}
	case <-time.After(10 * time.Second):
		t.Fatal("serve did not stop within 10 s of SIGINT")
	}
}

func TestWriteSingleFile(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "earshot.html")
	n, err := writeSingleFile(builtFS(t), out)
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(out)
	if err != nil || int64(len(data)) != n {
		t.Fatalf("wrote %d bytes, file has %d (%v)", n, len(data), err)
	}
	if !strings.Contains(string(data), "<!doctype html>") || !strings.Contains(string(data), `id="`+site.PayloadID+`"`) {
		t.Error("the written file is not the single-file page")
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("%d files in the output directory, want only earshot.html (no temporary left)", len(entries))
	}

	notBuilt := builtFS(t)
	delete(notBuilt, "app.wasm.gz")
	if _, err := writeSingleFile(notBuilt, filepath.Join(dir, "x.html")); err == nil || !strings.Contains(err.Error(), "make app") {
		t.Errorf("without the app: %v, want an error naming make app", err)
	}
	noExec := builtFS(t)
	delete(noExec, "wasm_exec.js")
	if _, err := writeSingleFile(noExec, filepath.Join(dir, "y.html")); err == nil || !strings.Contains(err.Error(), "make app") {
		t.Errorf("without wasm_exec.js: %v, want an error naming make app", err)
	}
	if _, err := writeSingleFile(builtFS(t), filepath.Join(dir, "missing", "z.html")); err == nil || !strings.Contains(err.Error(), "--out") {
		t.Errorf("into a missing directory: %v, want an error naming --out", err)
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("failures left %d files behind", len(entries)-1)
	}
}

// TestDistCommand runs "earshot dist" on the embedded files: it succeeds
// when this checkout has run make app and fails naming make app otherwise.
func TestDistCommand(t *testing.T) {
	out := filepath.Join(t.TempDir(), "earshot.html")
	var stdout, stderr bytes.Buffer
	status := run([]string{"dist", "--out", out}, &stdout, &stderr)
	if site.Built(site.FS()) {
		if status != 0 || !strings.HasPrefix(stdout.String(), "wrote "+out) {
			t.Errorf("dist with the app built: status %d stdout %q stderr %q", status, stdout.String(), stderr.String())
		}
		return
	}
	if status != 1 || !regexp.MustCompile(`^earshot dist: the browser app is not built .*make app.*\n$`).MatchString(stderr.String()) {
		t.Errorf("dist without the app: status %d stderr %q, want 1 and one line naming make app", status, stderr.String())
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("dist without the app wrote a file")
	}
}
