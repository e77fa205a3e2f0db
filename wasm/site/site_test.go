package site

import (
	"bufio"
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/base64"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"net"
	"net/http"
	"net/http/httptest"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"
)

// fakeWasm is a tiny valid WebAssembly module (the magic "\0asm" and
// version 1, WebAssembly Core Specification, binary format, Modules)
// followed by a custom section (id 0) padding it to a few kilobytes so
// that gzip has something to do.
var fakeWasm = func() []byte {
	payload := bytes.Repeat([]byte("earshot test padding "), 200)
	name := "pad"
	body := append([]byte{byte(len(name))}, name...)
	body = append(body, payload...)
	b := append([]byte(nil), wasmMagic...)
	b = append(b, 0) // custom section id
	b = append(b, uleb128(len(body))...)
	return append(b, body...)
}()

func uleb128(n int) []byte {
	var out []byte
	for {
		c := byte(n & 0x7f)
		n >>= 7
		if n != 0 {
			out = append(out, c|0x80)
			continue
		}
		return append(out, c)
	}
}

func gz(t testing.TB, data []byte) []byte {
	t.Helper()
	var b bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&b, gzip.BestCompression)
	zw.Write(data)
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func gunzip(t testing.TB, data []byte) []byte {
	t.Helper()
	zr, err := gzip.NewReader(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("gunzip: %v", err)
	}
	out, err := io.ReadAll(zr)
	if err != nil {
		t.Fatalf("gunzip: %v", err)
	}
	return out
}

const fakeExec = "// stand-in for Go's wasm_exec.js\nglobalThis.Go = class { constructor() { this.importObject = {}; } };\n"

// committed returns the page files kept in git (not the build outputs), as
// read from the embedded directory, so the tests check the real page
// without depending on "make app".
func committed(t testing.TB) fstest.MapFS {
	t.Helper()
	m := fstest.MapFS{}
	for _, name := range []string{indexName, bootName, workerName, styleName, iconName} {
		data, err := fs.ReadFile(FS(), name)
		if err != nil {
			t.Fatalf("committed file: %v", err)
		}
		m[name] = &fstest.MapFile{Data: data, Mode: 0o644}
	}
	return m
}

// built is committed plus stand-ins for the two build outputs.
func built(t testing.TB) fstest.MapFS {
	m := committed(t)
	m[WasmGzName] = &fstest.MapFile{Data: gz(t, fakeWasm), Mode: 0o644}
	m[WasmExecName] = &fstest.MapFile{Data: []byte(fakeExec), Mode: 0o644}
	return m
}

func newHandler(t testing.TB, fsys fs.FS) http.Handler {
	t.Helper()
	h, err := Handler(fsys)
	if err != nil {
		t.Fatalf("Handler: %v", err)
	}
	return h
}

// do runs one request through h. header holds request header pairs.
func do(h http.Handler, method, target string, header ...string) *httptest.ResponseRecorder {
	req := httptest.NewRequest(method, target, nil)
	for i := 0; i+1 < len(header); i += 2 {
		req.Header.Set(header[i], header[i+1])
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, req)
	return rec
}

func TestWasmGzipEncoded(t *testing.T) {
	fsys := built(t)
	h := newHandler(t, fsys)
	rec := do(h, "GET", "/app.wasm", "Accept-Encoding", "gzip, deflate, br")
	res := rec.Result()
	body := rec.Body.Bytes()
	stored := fsys[WasmGzName].Data
	if res.StatusCode != 200 {
		t.Fatalf("GET /app.wasm: status %d, want 200", res.StatusCode)
	}
	// MDN / WebAssembly Web API: instantiateStreaming requires the MIME type application/wasm.
	if got := res.Header.Get("Content-Type"); got != "application/wasm" {
		t.Errorf("Content-Type = %q, want application/wasm", got)
	}
	// RFC 9110 §8.4: Content-Encoding names the coding applied to the content.
	if got := res.Header.Get("Content-Encoding"); got != "gzip" {
		t.Errorf("Content-Encoding = %q, want gzip", got)
	}
	// RFC 9110 §8.6: Content-Length is the length of the (encoded) content.
	if got := res.Header.Get("Content-Length"); got != strconv.Itoa(len(stored)) {
		t.Errorf("Content-Length = %q, want %d (the stored gzip)", got, len(stored))
	}
	if !bytes.Equal(body, stored) {
		t.Errorf("body is not the stored app.wasm.gz (%d bytes, want %d)", len(body), len(stored))
	}
	// RFC 1952: the body is a gzip member that decodes to the module.
	if got := gunzip(t, body); !bytes.Equal(got, fakeWasm) {
		t.Errorf("gunzip(body): %d bytes, not the module (%d bytes)", len(got), len(fakeWasm))
	}
	// RFC 9110 §12.5.5: a response chosen by Accept-Encoding lists it in Vary.
	if got := res.Header.Get("Vary"); !strings.Contains(got, "Accept-Encoding") {
		t.Errorf("Vary = %q, want Accept-Encoding", got)
	}
	if got := res.Header.Get(WasmBytesHeader); got != strconv.Itoa(len(fakeWasm)) {
		t.Errorf("%s = %q, want %d", WasmBytesHeader, got, len(fakeWasm))
	}
}

func TestAcceptEncoding(t *testing.T) {
	h := newHandler(t, built(t))
	// RFC 9110 §12.5.3 (Accept-Encoding), §12.4.2 (weights: q=0 means "not
	// acceptable"), §8.4.1.3 (x-gzip is gzip). Without the field a server
	// may pick any coding; identity is always safe (common practice).
	for _, c := range []struct {
		name, accept string
		gzip         bool
	}{
		{"no field", "", false},
		{"identity only", "identity", false},
		{"other codings", "br, deflate", false},
		{"gzip", "gzip", true},
		{"upper case and weight", "GZIP;q=0.5", true},
		{"x-gzip alias", "x-gzip", true},
		{"wildcard", "*", true},
		{"gzip refused", "gzip;q=0", false},
		{"gzip refused, spaces", "br, gzip ; q=0.000", false},
		{"gzip refused beats wildcard", "gzip;q=0, *", false},
		{"wildcard refused", "*;q=0", false},
		{"malformed weight", "gzip;q=high", false},
	} {
		t.Run(c.name, func(t *testing.T) {
			var rec *httptest.ResponseRecorder
			if c.accept == "" {
				rec = do(h, "GET", "/app.wasm")
			} else {
				rec = do(h, "GET", "/app.wasm", "Accept-Encoding", c.accept)
			}
			enc := rec.Header().Get("Content-Encoding")
			if got := enc == "gzip"; got != c.gzip {
				t.Fatalf("Accept-Encoding %q: Content-Encoding %q, want gzip=%v", c.accept, enc, c.gzip)
			}
			want := fakeWasm
			if c.gzip {
				if got := gunzip(t, rec.Body.Bytes()); !bytes.Equal(got, want) {
					t.Fatalf("Accept-Encoding %q: decoded body differs from the module", c.accept)
				}
				return
			}
			if !bytes.Equal(rec.Body.Bytes(), want) {
				t.Fatalf("Accept-Encoding %q: body (%d bytes) is not the decoded module (%d bytes)", c.accept, rec.Body.Len(), len(want))
			}
			// RFC 9110 §8.6: Content-Length of the decoded body.
			if got := rec.Header().Get("Content-Length"); got != strconv.Itoa(len(want)) {
				t.Fatalf("Accept-Encoding %q: Content-Length %q, want %d", c.accept, got, len(want))
			}
		})
	}
}

func TestTextFilesCompressed(t *testing.T) {
	fsys := built(t)
	h := newHandler(t, fsys)
	for _, name := range []string{"/", "/boot.js", "/app.css", "/sw.js"} {
		plain := do(h, "GET", name)
		zipped := do(h, "GET", name, "Accept-Encoding", "gzip")
		if plain.Header().Get("Content-Encoding") != "" {
			t.Errorf("GET %s without Accept-Encoding: Content-Encoding %q, want none", name, plain.Header().Get("Content-Encoding"))
		}
		if zipped.Header().Get("Content-Encoding") != "gzip" {
			t.Errorf("GET %s with gzip accepted: Content-Encoding %q, want gzip", name, zipped.Header().Get("Content-Encoding"))
			continue
		}
		if got := gunzip(t, zipped.Body.Bytes()); !bytes.Equal(got, plain.Body.Bytes()) {
			t.Errorf("GET %s: gzip body does not decode to the plain body", name)
		}
		// RFC 9110 §8.6 and §12.5.5.
		if got := zipped.Header().Get("Content-Length"); got != strconv.Itoa(zipped.Body.Len()) {
			t.Errorf("GET %s: Content-Length %q, body %d bytes", name, got, zipped.Body.Len())
		}
		if got := zipped.Header().Get("Vary"); got != "Accept-Encoding" {
			t.Errorf("GET %s: Vary %q, want Accept-Encoding", name, got)
		}
	}
}

func TestContentTypes(t *testing.T) {
	h := newHandler(t, built(t))
	for _, c := range []struct{ path, want, source string }{
		{"/", "text/html; charset=utf-8", "WHATWG HTML, text/html"},
		{"/index.html", "text/html; charset=utf-8", "WHATWG HTML, text/html"},
		{"/boot.js", "text/javascript; charset=utf-8", "RFC 9239: text/javascript"},
		{"/sw.js", "text/javascript; charset=utf-8", "RFC 9239; W3C Service Workers: a JavaScript MIME type is required"},
		{"/wasm_exec.js", "text/javascript; charset=utf-8", "RFC 9239"},
		{"/app.css", "text/css; charset=utf-8", "RFC 2318: text/css"},
		{"/icon.svg", "image/svg+xml", "W3C SVG 1.1 Appendix P: image/svg+xml"},
		{"/app.wasm", "application/wasm", "WebAssembly Web API: application/wasm"},
	} {
		if got := do(h, "GET", c.path).Header().Get("Content-Type"); got != c.want {
			t.Errorf("GET %s: Content-Type %q, want %q (%s)", c.path, got, c.want, c.source)
		}
	}
}

// TestSecurityHeaders checks that every response, errors and 304 included,
// carries the security headers.
func TestSecurityHeaders(t *testing.T) {
	h := newHandler(t, built(t))
	etag := do(h, "GET", "/").Header().Get("ETag")
	for _, c := range []struct {
		name, method, path string
		header             []string
		status             int
	}{
		{"page", "GET", "/", nil, 200},
		{"page HEAD", "HEAD", "/", nil, 200},
		{"script", "GET", "/boot.js", nil, 200},
		{"worker", "GET", "/sw.js", nil, 200},
		{"app gzip", "GET", "/app.wasm", []string{"Accept-Encoding", "gzip"}, 200},
		{"app plain", "GET", "/app.wasm", nil, 200},
		{"not modified", "GET", "/", []string{"If-None-Match", etag}, 304},
		{"not found", "GET", "/nothing-here", nil, 404},
		{"bad method", "POST", "/", nil, 405},
	} {
		rec := do(h, c.method, c.path, c.header...)
		hd := rec.Header()
		if rec.Code != c.status {
			t.Errorf("%s: %s %s: status %d, want %d", c.name, c.method, c.path, rec.Code, c.status)
		}
		for _, want := range []struct{ key, value, source string }{
			{"Content-Security-Policy", ContentSecurityPolicy, "W3C CSP Level 3"},
			{"X-Content-Type-Options", "nosniff", "WHATWG Fetch, X-Content-Type-Options"},
			{"Referrer-Policy", "no-referrer", "W3C Referrer Policy"},
			{"Cross-Origin-Opener-Policy", "same-origin", "WHATWG HTML, cross-origin opener policies"},
		} {
			if got := hd.Get(want.key); got != want.value {
				t.Errorf("%s: %s %s: %s = %q, want %q (%s)", c.name, c.method, c.path, want.key, got, want.value, want.source)
			}
		}
	}
}

// TestPolicy checks the policy's directives one by one (W3C CSP Level 3;
// 'wasm-unsafe-eval' from the same specification allows WebAssembly
// compilation without allowing eval).
func TestPolicy(t *testing.T) {
	got := map[string]string{}
	for _, d := range strings.Split(ContentSecurityPolicy, ";") {
		f := strings.Fields(d)
		if len(f) == 0 {
			continue
		}
		if _, dup := got[f[0]]; dup {
			t.Errorf("directive %s appears twice; CSP Level 3 ignores the second", f[0])
		}
		got[f[0]] = strings.Join(f[1:], " ")
	}
	want := map[string]string{
		"default-src":     "'self'",
		"script-src":      "'self' 'wasm-unsafe-eval'",
		"style-src":       "'self'",
		"img-src":         "'self' data: blob:",
		"connect-src":     "'self'",
		"worker-src":      "'self'",
		"object-src":      "'none'",
		"base-uri":        "'none'",
		"frame-ancestors": "'none'",
		"form-action":     "'none'",
	}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("CSP %s = %q, want %q", k, got[k], v)
		}
	}
	for k := range got {
		if _, ok := want[k]; !ok {
			t.Errorf("CSP has unexpected directive %s %s", k, got[k])
		}
	}
	if strings.Contains(ContentSecurityPolicy, "'unsafe-inline'") || strings.Contains(ContentSecurityPolicy, "'unsafe-eval'") {
		t.Errorf("CSP allows inline code or eval: %s", ContentSecurityPolicy)
	}
}

func TestOnlyEmbeddedFiles(t *testing.T) {
	fsys := built(t)
	fsys["fonts/face.txt"] = &fstest.MapFile{Data: []byte("a font stand-in"), Mode: 0o644}
	fsys[".draft.html"] = &fstest.MapFile{Data: []byte("<p>draft"), Mode: 0o644}
	fsys["_notes.txt"] = &fstest.MapFile{Data: []byte("notes"), Mode: 0o644}
	h := newHandler(t, fsys)
	// CWE-548 (no directory listings), CWE-22 (no path traversal): only
	// the files themselves are served.
	for _, p := range []string{
		"/nothing-here",
		"/fonts", "/fonts/", // a directory
		"/static/", "/static/index.html", // the embedding directory's own name
		"/index.html/",
		"/app.wasm.gz", // served only as /app.wasm
		"/.draft.html", "/_notes.txt",
		"/../sw.js", "/fonts/../sw.js", "/%2e%2e/sw.js",
		"//sw.js",
	} {
		if rec := do(h, "GET", p); rec.Code != 404 {
			t.Errorf("GET %s: status %d, want 404", p, rec.Code)
		}
	}
	if rec := do(h, "GET", "/fonts/face.txt"); rec.Code != 200 || rec.Body.String() != "a font stand-in" {
		t.Errorf("GET /fonts/face.txt: status %d body %q, want 200 and the file", rec.Code, rec.Body.String())
	}
}

func TestMethods(t *testing.T) {
	h := newHandler(t, built(t))
	// RFC 9110 §15.5.6: a 405 response must carry Allow.
	for _, m := range []string{"POST", "PUT", "DELETE", "PATCH", "OPTIONS", "TRACE"} {
		rec := do(h, m, "/")
		if rec.Code != 405 || rec.Header().Get("Allow") != "GET, HEAD" {
			t.Errorf("%s /: status %d Allow %q, want 405 and \"GET, HEAD\"", m, rec.Code, rec.Header().Get("Allow"))
		}
	}
	// RFC 9110 §9.3.2: HEAD gets the same header fields as GET and no content.
	for _, p := range []string{"/", "/app.wasm"} {
		get := do(h, "GET", p, "Accept-Encoding", "gzip")
		head := do(h, "HEAD", p, "Accept-Encoding", "gzip")
		if head.Code != 200 || head.Body.Len() != 0 {
			t.Errorf("HEAD %s: status %d, %d body bytes; want 200 and none", p, head.Code, head.Body.Len())
		}
		for _, k := range []string{"Content-Type", "Content-Length", "Content-Encoding", "ETag", "Vary"} {
			if head.Header().Get(k) != get.Header().Get(k) {
				t.Errorf("HEAD %s: %s = %q, GET gives %q", p, k, head.Header().Get(k), get.Header().Get(k))
			}
		}
	}
}

func TestConditional(t *testing.T) {
	fsys := built(t)
	h := newHandler(t, fsys)
	first := do(h, "GET", "/app.wasm", "Accept-Encoding", "gzip")
	tag := first.Header().Get("ETag")
	plainTag := do(h, "GET", "/app.wasm").Header().Get("ETag")
	// RFC 9110 §8.8.3: an entity tag is a quoted string.
	if !regexp.MustCompile(`^"[\x21\x23-\x7e]+"$`).MatchString(tag) {
		t.Fatalf("ETag %q is not a strong entity tag", tag)
	}
	// RFC 9110 §8.8.3: a gzip-coded representation differs from the
	// identity one, so its entity tag differs.
	if tag == plainTag {
		t.Errorf("gzip and identity representations share ETag %s", tag)
	}
	if !strings.Contains(tag, Version(fsys)) {
		t.Errorf("ETag %s does not carry the build version %s", tag, Version(fsys))
	}
	// RFC 9111 §5.2.2.4: no-cache makes caches revalidate before reuse.
	if got := first.Header().Get("Cache-Control"); got != "no-cache" {
		t.Errorf("Cache-Control = %q, want no-cache", got)
	}
	// RFC 9110 §13.1.2: If-None-Match uses the weak comparison; "*"
	// matches any current representation.
	for _, c := range []struct {
		name, inm string
		want      int
	}{
		{"same tag", tag, 304},
		{"weak form", "W/" + tag, 304},
		{"in a list", `"other", ` + tag, 304},
		{"star", "*", 304},
		{"other tag", `"other"`, 200},
		{"identity tag for gzip", plainTag, 200},
	} {
		rec := do(h, "GET", "/app.wasm", "Accept-Encoding", "gzip", "If-None-Match", c.inm)
		if rec.Code != c.want {
			t.Errorf("%s: If-None-Match %s: status %d, want %d", c.name, c.inm, rec.Code, c.want)
			continue
		}
		if c.want != 304 {
			continue
		}
		// RFC 9110 §15.4.5: a 304 has no content and carries the ETag
		// and Vary the 200 would; content coding metadata is not sent.
		if rec.Body.Len() != 0 {
			t.Errorf("%s: 304 with %d body bytes", c.name, rec.Body.Len())
		}
		for _, k := range []string{"Content-Encoding", "Content-Length", "Content-Type"} {
			if v := rec.Header().Get(k); v != "" {
				t.Errorf("%s: 304 carries %s: %s", c.name, k, v)
			}
		}
		if rec.Header().Get("ETag") != tag || rec.Header().Get("Vary") != "Accept-Encoding" {
			t.Errorf("%s: 304 ETag %q Vary %q, want %q and Accept-Encoding", c.name, rec.Header().Get("ETag"), rec.Header().Get("Vary"), tag)
		}
	}
}

func TestWorkerVersion(t *testing.T) {
	fsys := built(t)
	raw := string(fsys[workerName].Data)
	if !strings.Contains(raw, VersionPlaceholder) {
		t.Fatalf("sw.js does not contain %s", VersionPlaceholder)
	}
	v := Version(fsys)
	body := do(newHandler(t, fsys), "GET", "/sw.js").Body.String()
	if strings.Contains(body, VersionPlaceholder) || !strings.Contains(body, `"`+v+`"`) {
		t.Errorf("served sw.js: want version %q in place of %s", v, VersionPlaceholder)
	}
	if !regexp.MustCompile(`^[0-9a-f]{12}$`).MatchString(v) {
		t.Errorf("Version = %q, want 12 hex digits", v)
	}
	if Version(built(t)) != v {
		t.Error("Version differs for identical files")
	}
	// Any change to a cached file must rename the cache (W3C Service
	// Workers: the worker is replaced only when its script's bytes change).
	for _, name := range []string{WasmGzName, bootName, indexName, WasmExecName} {
		changed := built(t)
		changed[name] = &fstest.MapFile{Data: append(append([]byte(nil), changed[name].Data...), ' '), Mode: 0o644}
		if Version(changed) == v {
			t.Errorf("Version unchanged after %s changed", name)
		}
	}
}

// TestWorkerFiles checks that every file the service worker stores is
// served: Cache.addAll rejects, and the worker fails to install, if any
// response is not ok (W3C Service Workers, Cache addAll).
func TestWorkerFiles(t *testing.T) {
	fsys := built(t)
	h := newHandler(t, fsys)
	src := string(fsys[workerName].Data)
	m := regexp.MustCompile(`const FILES = \[([^\]]*)\]`).FindStringSubmatch(src)
	if m == nil {
		t.Fatal("sw.js: no FILES list")
	}
	listed := map[string]bool{}
	for _, q := range regexp.MustCompile(`"([^"]+)"`).FindAllStringSubmatch(m[1], -1) {
		listed[q[1]] = true
		p := "/" + strings.TrimPrefix(q[1], "./")
		if rec := do(h, "GET", p); rec.Code != 200 {
			t.Errorf("sw.js caches %q but GET %s gives %d", q[1], p, rec.Code)
		}
	}
	for _, need := range []string{"./", "index.html", "boot.js", "wasm_exec.js", "app.wasm"} {
		if !listed[need] {
			t.Errorf("sw.js does not cache %q", need)
		}
	}
}

func TestNotBuilt(t *testing.T) {
	fsys := committed(t)
	if Built(fsys) {
		t.Fatal("Built reports true without app.wasm.gz")
	}
	h := newHandler(t, fsys)
	for _, p := range []string{"/", "/index.html"} {
		rec := do(h, "GET", p)
		body := rec.Body.String()
		if rec.Code != 200 || !strings.Contains(body, "not built") || !strings.Contains(body, "make app") {
			t.Errorf("GET %s without the app: status %d, body lacks the not-built notice: %q", p, rec.Code, body)
		}
		if strings.Contains(body, "<script") {
			t.Errorf("GET %s without the app: the notice loads scripts", p)
		}
	}
	if rec := do(h, "GET", "/app.wasm"); rec.Code != 404 {
		t.Errorf("GET /app.wasm without the app: status %d, want 404", rec.Code)
	}
	if got, want := do(newHandler(t, built(t)), "GET", "/").Body.String(), string(fsys[indexName].Data); got != want {
		t.Error("GET / with the app built is not index.html")
	}
}

func TestHandlerRejectsBadBuild(t *testing.T) {
	for _, c := range []struct {
		name   string
		change func(fstest.MapFS)
		want   string
	}{
		{"not gzip", func(m fstest.MapFS) { m[WasmGzName].Data = fakeWasm }, "not gzip"},
		{"not wasm", func(m fstest.MapFS) { m[WasmGzName].Data = gz(t, []byte("<html>oops</html>")) }, "WebAssembly"},
		{"cut short", func(m fstest.MapFS) { d := m[WasmGzName].Data; m[WasmGzName].Data = d[:len(d)-10] }, "damaged"},
		{"no wasm_exec.js", func(m fstest.MapFS) { delete(m, WasmExecName) }, "wasm_exec.js is missing"},
		{"no index.html", func(m fstest.MapFS) { delete(m, indexName) }, "index.html is missing"},
	} {
		fsys := built(t)
		c.change(fsys)
		_, err := Handler(fsys)
		if err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "make app") {
			t.Errorf("%s: Handler error %v, want one mentioning %q and make app", c.name, err, c.want)
		}
	}
}

// TestPage checks the committed page against the contract with the app
// and the policy: no inline script (CSP Level 3 blocks inline scripts
// unless 'unsafe-inline'), wasm_exec.js before boot.js (boot.js uses its
// Go class; deferred scripts run in document order, WHATWG HTML §4.12.1).
func TestPage(t *testing.T) {
	fsys := committed(t)
	index := string(fsys[indexName].Data)
	scripts := regexp.MustCompile(`<script([^>]*)>`).FindAllStringSubmatch(index, -1)
	var srcs []string
	for _, s := range scripts {
		m := regexp.MustCompile(`\bsrc="([^"]+)"`).FindStringSubmatch(s[1])
		if m == nil {
			t.Errorf("index.html has an inline script: <script%s>", s[1])
			continue
		}
		srcs = append(srcs, m[1])
	}
	if strings.Join(srcs, " ") != "wasm_exec.js boot.js" {
		t.Errorf("index.html scripts %v, want [wasm_exec.js boot.js]", srcs)
	}
	if regexp.MustCompile(`\sstyle=`).MatchString(index) || strings.Contains(index, "<style") {
		t.Error("index.html has inline style; the policy's style-src 'self' blocks it")
	}
	for _, want := range []string{"<noscript>", `id="earshot-status"`, `<html lang="en">`, `<meta charset="utf-8">`} {
		if !strings.Contains(index, want) {
			t.Errorf("index.html lacks %s", want)
		}
	}
	boot := string(fsys[bootName].Data)
	for _, want := range []string{
		`WebAssembly.instantiateStreaming(`, `fetch("app.wasm")`, `"application/wasm"`,
		`DecompressionStream("gzip")`, `WebAssembly.instantiate(bytes, go.importObject)`,
		`globalThis.earshot_ready === true`, `register("sw.js")`, `location.protocol !== "http:"`,
		`"` + PayloadID + `"`, WasmBytesHeader,
		// no service worker in the single file, nor on file://
		`if (packed || !("serviceWorker" in navigator)) return;`,
	} {
		if !strings.Contains(boot, want) {
			t.Errorf("boot.js lacks %s", want)
		}
	}
	css := string(fsys[styleName].Data)
	for _, want := range []string{"margin: 0", "overflow: hidden", "background: #000"} {
		if !strings.Contains(css, want) {
			t.Errorf("app.css lacks %q", want)
		}
	}
}

// singleFile runs SingleFile on fsys and returns the document.
func singleFile(t *testing.T, fsys fs.FS) string {
	t.Helper()
	var b bytes.Buffer
	if err := SingleFile(fsys, &b); err != nil {
		t.Fatalf("SingleFile: %v", err)
	}
	return b.String()
}

func TestSingleFile(t *testing.T) {
	fsys := built(t)
	doc := singleFile(t, fsys)
	// Works from file://: nothing is loaded from elsewhere.
	if m := regexp.MustCompile(`<script[^>]*\ssrc=`).FindString(doc); m != "" {
		t.Errorf("single file loads an external script: %s", m)
	}
	if m := regexp.MustCompile(`<link[^>]*rel="stylesheet"`).FindString(doc); m != "" {
		t.Errorf("single file loads an external style sheet: %s", m)
	}
	// The payload: base64 (RFC 4648 §4) of the gzip form (RFC 1952).
	m := regexp.MustCompile(`<script type="application/octet-stream" id="` + PayloadID + `" data-bytes="(\d+)">([^<]*)</script>`).FindStringSubmatch(doc)
	if m == nil {
		t.Fatal("single file has no payload element")
	}
	if m[1] != strconv.Itoa(len(fakeWasm)) {
		t.Errorf("data-bytes = %s, want %d", m[1], len(fakeWasm))
	}
	packed, err := base64.StdEncoding.DecodeString(m[2])
	if err != nil {
		t.Fatalf("payload is not base64: %v", err)
	}
	if got := gunzip(t, packed); !bytes.Equal(got, fakeWasm) {
		t.Errorf("payload decodes to %d bytes, not the module (%d bytes)", len(got), len(fakeWasm))
	}
	// Compression Streams (WHATWG): DecompressionStream("gzip") inflates it.
	if !strings.Contains(doc, `new DecompressionStream("gzip")`) {
		t.Error("single file does not inflate with DecompressionStream")
	}
	if !strings.Contains(doc, fakeExec) {
		t.Error("single file does not inline wasm_exec.js")
	}
	if !strings.Contains(doc, `id="earshot-status"`) || !strings.Contains(doc, "<noscript>") {
		t.Error("single file lacks the loading line or the noscript note")
	}
}

// TestSingleFilePolicy checks the single file's own policy: every inline
// script and style is admitted by its hash (W3C CSP Level 3, hash-source:
// base64 of the SHA-256 of the element's text), and the policy omits
// frame-ancestors, which a <meta> policy may not carry (CSP Level 3,
// frame-ancestors).
func TestSingleFilePolicy(t *testing.T) {
	doc := singleFile(t, built(t))
	m := regexp.MustCompile(`<meta http-equiv="Content-Security-Policy" content="([^"]+)">`).FindStringSubmatch(doc)
	if m == nil {
		t.Fatal("single file has no policy <meta>")
	}
	policy := m[1]
	if strings.Index(doc, m[0]) > strings.Index(doc, "<script") || strings.Index(doc, m[0]) > strings.Index(doc, "<style") {
		t.Error("the policy <meta> comes after code it should govern")
	}
	if strings.Contains(policy, "frame-ancestors") || strings.Contains(policy, "'unsafe-inline'") || strings.Contains(policy, "'unsafe-eval'") {
		t.Errorf("policy %q: no frame-ancestors, 'unsafe-inline' or 'unsafe-eval' expected", policy)
	}
	if !strings.Contains(policy, "'wasm-unsafe-eval'") {
		t.Errorf("policy %q lacks 'wasm-unsafe-eval'", policy)
	}
	check := func(kind, directive string, re *regexp.Regexp) {
		found := re.FindAllStringSubmatch(doc, -1)
		if len(found) == 0 {
			t.Errorf("no inline %s found", kind)
		}
		for _, f := range found {
			sum := sha256.Sum256([]byte(f[1]))
			src := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
			if !regexp.MustCompile(directive + ` [^;]*` + regexp.QuoteMeta(src)).MatchString(policy) {
				t.Errorf("inline %s (%d bytes) not admitted by %s in %q", kind, len(f[1]), directive, policy)
			}
		}
	}
	check("script", "script-src", regexp.MustCompile(`(?s)<script>(.*?)</script>`))
	check("style", "style-src", regexp.MustCompile(`(?s)<style>(.*?)</style>`))
}

func TestSingleFileErrors(t *testing.T) {
	var sink bytes.Buffer
	if err := SingleFile(committed(t), &sink); !errors.Is(err, ErrNotBuilt) || !strings.Contains(err.Error(), "make app") {
		t.Errorf("SingleFile without the app: %v, want ErrNotBuilt naming make app", err)
	}
	noExec := built(t)
	delete(noExec, WasmExecName)
	if err := SingleFile(noExec, &sink); !errors.Is(err, ErrNotBuilt) {
		t.Errorf("SingleFile without wasm_exec.js: %v, want ErrNotBuilt", err)
	}
	// WHATWG HTML §4.12.1.3: "</script" inside an inline script ends it.
	closing := built(t)
	closing[bootName] = &fstest.MapFile{Data: []byte(`console.log("</script>")`), Mode: 0o644}
	if err := SingleFile(closing, &sink); err == nil || !strings.Contains(err.Error(), "boot.js") {
		t.Errorf("SingleFile with </script in boot.js: %v, want an error naming boot.js", err)
	}
}

// TestOverTheWire serves the files on a real listener (127.0.0.1:0) and
// reads raw responses, as a browser would get them.
func TestOverTheWire(t *testing.T) {
	srv := httptest.NewServer(newHandler(t, built(t)))
	defer srv.Close()
	// Go's client asks for gzip and decodes it itself (net/http Transport,
	// DisableCompression false): the bytes arrive intact.
	res, err := http.Get(srv.URL + "/app.wasm")
	if err != nil {
		t.Fatal(err)
	}
	body, _ := io.ReadAll(res.Body)
	res.Body.Close()
	if !res.Uncompressed || !bytes.Equal(body, fakeWasm) {
		t.Errorf("GET /app.wasm through a gzip-capable client: uncompressed=%v, %d bytes, want gzip decoded to %d bytes", res.Uncompressed, len(body), len(fakeWasm))
	}
	// A raw request keeps ".." as sent (curl --path-as-is does the same).
	raw := func(requestLine string) string {
		conn, err := net.Dial("tcp", srv.Listener.Addr().String())
		if err != nil {
			t.Fatal(err)
		}
		defer conn.Close()
		fmt.Fprintf(conn, "%s\r\nHost: x\r\nConnection: close\r\n\r\n", requestLine)
		line, _ := bufio.NewReader(conn).ReadString('\n')
		return strings.TrimSpace(line)
	}
	for _, c := range []struct{ line, want string }{
		{"GET /../sw.js HTTP/1.1", "HTTP/1.1 404 Not Found"},
		{"GET /./sw.js HTTP/1.1", "HTTP/1.1 404 Not Found"},
		{"GET /sw.js HTTP/1.1", "HTTP/1.1 200 OK"},
	} {
		if got := raw(c.line); got != c.want {
			t.Errorf("%s: %q, want %q", c.line, got, c.want)
		}
	}
}

func TestEmbedded(t *testing.T) {
	// The committed files are embedded, and the handler accepts them
	// whether or not this checkout has run make app.
	if _, err := Handler(FS()); err != nil {
		t.Fatalf("Handler(FS()): %v", err)
	}
	for _, name := range []string{indexName, bootName, workerName, styleName, iconName} {
		if _, err := fs.Stat(FS(), name); err != nil {
			t.Errorf("embedded %s: %v", name, err)
		}
	}
	if _, err := fs.Stat(FS(), rawWasmName); err == nil {
		t.Errorf("static/%s exists: it would be embedded in every binary; make app should write only %s", rawWasmName, WasmGzName)
	}
}
