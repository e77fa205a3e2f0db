package site

import (
	"bytes"
	"compress/gzip"
	"fmt"
	"io"
	"io/fs"
	"net/http"
	"path"
	"strconv"
	"strings"
)

// ContentSecurityPolicy is sent with every response of [Handler]. Scripts
// come only from the server's own files, never inline; 'wasm-unsafe-eval'
// lets them compile WebAssembly and nothing else that eval would allow.
// Styles likewise: ebiten sets its canvas's style through the CSS object
// model, which a policy does not restrict. img-src allows data: and blob:
// URLs because the app may build pictures in memory.
const ContentSecurityPolicy = "default-src 'self'; script-src 'self' 'wasm-unsafe-eval'; " +
	"style-src 'self'; img-src 'self' data: blob:; connect-src 'self'; worker-src 'self'; " +
	"object-src 'none'; base-uri 'none'; frame-ancestors 'none'; form-action 'none'"

// WasmBytesHeader is a response header on /app.wasm giving its decoded size
// in bytes. When the body travels gzip-encoded, Content-Length counts the
// compressed bytes while the page's loader counts decoded ones; this lets
// it show true progress.
const WasmBytesHeader = "Earshot-Wasm-Bytes"

// allowedMethods is the Allow header of a 405 response.
const allowedMethods = "GET, HEAD"

// contentTypes maps the file name extensions the page uses to their media
// types. A fixed table rather than the operating system's: the answers must
// not depend on the machine (/etc/mime.types once mapped .js to
// application/x-javascript on some systems).
var contentTypes = map[string]string{
	".html":        "text/html; charset=utf-8",
	".js":          "text/javascript; charset=utf-8",
	".mjs":         "text/javascript; charset=utf-8",
	".css":         "text/css; charset=utf-8",
	".txt":         "text/plain; charset=utf-8",
	".json":        "application/json",
	".webmanifest": "application/manifest+json",
	".svg":         "image/svg+xml",
	".png":         "image/png",
	".wasm":        "application/wasm",
}

// compressible reports whether a body of the media type usually shrinks
// under gzip.
func compressible(contentType string) bool {
	mt, _, _ := strings.Cut(contentType, ";")
	switch mt {
	case "image/svg+xml", "application/json", "application/manifest+json", "application/wasm":
		return true
	}
	return strings.HasPrefix(mt, "text/")
}

func contentTypeOf(name string) string {
	if ct, ok := contentTypes[strings.ToLower(path.Ext(name))]; ok {
		return ct
	}
	return "application/octet-stream"
}

// resource is one response body, prepared once.
type resource struct {
	contentType string
	body        []byte // the identity body; nil for the app, which is decoded per request
	gz          []byte // the gzip-encoded body, nil when gzip does not make it smaller
	size        int64  // length of the identity body
	etag        string // strong entity tag of the identity body
	gzTag       string // strong entity tag of the gzip body
	wasm        bool   // the app: identity body decoded from gz per request
}

type handler struct {
	byPath map[string]*resource
}

// Handler returns an http.Handler serving the files of fsys (normally
// [FS]). It prepares every response once, so it reads fsys only here.
//
// Routes: "/" is index.html; "/app.wasm" is app.wasm.gz; every other
// regular file is served under its own name, except hidden ones (a path
// element starting with "." or "_") and a stray raw app.wasm. Without
// app.wasm.gz, "/" and "/index.html" give a short page saying the app is
// not built and how to build it.
//
// Responses:
//   - Only GET and HEAD; any other method gets 405 with Allow: GET, HEAD.
//     Unknown paths, directories and paths containing ".." get 404.
//   - /app.wasm is application/wasm. It is sent as stored, with
//     Content-Encoding: gzip, when the request's Accept-Encoding admits
//     gzip, and decoded on the fly otherwise (no Accept-Encoding means
//     identity). Other text files are gzip-compressed when that is
//     accepted and makes them smaller. Vary: Accept-Encoding goes with
//     every response that has both forms. Content-Length is always set.
//   - sw.js has [VersionPlaceholder] replaced by [Version](fsys).
//   - ETag is the build version (with "-gzip" for the compressed form);
//     Cache-Control: no-cache makes browsers revalidate, and a matching
//     If-None-Match gets 304 with no body and no Content-Encoding.
//   - Every response, errors included, carries [ContentSecurityPolicy],
//     X-Content-Type-Options: nosniff, Referrer-Policy: no-referrer and
//     Cross-Origin-Opener-Policy: same-origin.
//
// Handler fails if app.wasm.gz is present but is not gzip holding a
// WebAssembly module, or if index.html or wasm_exec.js is missing beside it.
func Handler(fsys fs.FS) (http.Handler, error) {
	names, err := servedNames(fsys)
	if err != nil {
		return nil, fmt.Errorf("site: %w", err)
	}
	version := Version(fsys)
	tag := func(suffix string) string { return `"` + version + suffix + `"` }
	h := &handler{byPath: map[string]*resource{}}
	for _, name := range names {
		data, err := fs.ReadFile(fsys, name)
		if err != nil {
			return nil, fmt.Errorf("site: %w", err)
		}
		if name == WasmGzName {
			size, err := checkWasmGz(data)
			if err != nil {
				return nil, err
			}
			h.byPath["/"+rawWasmName] = &resource{
				contentType: contentTypes[".wasm"],
				gz:          data,
				size:        size,
				etag:        tag(""),
				gzTag:       tag("-gzip"),
				wasm:        true,
			}
			continue
		}
		if name == workerName {
			data = bytes.ReplaceAll(data, []byte(VersionPlaceholder), []byte(version))
		}
		h.byPath["/"+name] = newResource(data, contentTypeOf(name), tag)
	}
	if Built(fsys) {
		for _, need := range []string{indexName, WasmExecName} {
			if h.byPath["/"+need] == nil {
				return nil, fmt.Errorf("site: %s is missing beside %s: run make app", need, WasmGzName)
			}
		}
		h.byPath["/"] = h.byPath["/"+indexName]
	} else {
		page := newResource([]byte(notBuiltPage), contentTypes[".html"], tag)
		h.byPath["/"] = page
		h.byPath["/"+indexName] = page
	}
	return h, nil
}

// notBuiltPage answers "/" when the program was compiled without the app.
const notBuiltPage = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>earshot: the app is not built</title>
<link rel="icon" href="icon.svg" type="image/svg+xml">
<link rel="stylesheet" href="app.css">
</head>
<body class="page">
<main>
<h1>earshot</h1>
<p>The browser app is not built into this copy of earshot.</p>
<p>In the source tree, run <code>make run</code>: it builds the app and starts the server again with it.
(Or run <code>make app</code>, then rebuild and restart <code>earshot serve</code>.)</p>
</main>
</body>
</html>
`

func newResource(data []byte, contentType string, tag func(string) string) *resource {
	r := &resource{contentType: contentType, body: data, size: int64(len(data)), etag: tag(""), gzTag: tag("-gzip")}
	if compressible(contentType) {
		if gz := gzipBytes(data); len(gz) < len(data) {
			r.gz = gz
		}
	}
	return r
}

func gzipBytes(data []byte) []byte {
	var b bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&b, gzip.BestCompression) // a valid level cannot fail
	zw.Write(data)                                         // writes to a bytes.Buffer cannot fail
	zw.Close()
	return b.Bytes()
}

// wasmMagic opens every WebAssembly module in the binary format: "\0asm"
// and version 1 (WebAssembly Core Specification, binary format, Modules).
var wasmMagic = []byte("\x00asm\x01\x00\x00\x00")

// checkWasmGz checks that gz is gzip holding a WebAssembly module and
// returns the module's size.
func checkWasmGz(gz []byte) (int64, error) {
	fail := func(why string) (int64, error) {
		return 0, fmt.Errorf("site: %s %s: rebuild it with make app", WasmGzName, why)
	}
	zr, err := gzip.NewReader(bytes.NewReader(gz))
	if err != nil {
		return fail("is not gzip data")
	}
	head := make([]byte, len(wasmMagic))
	if _, err := io.ReadFull(zr, head); err != nil || !bytes.Equal(head, wasmMagic) {
		return fail("does not hold a WebAssembly module")
	}
	n, err := io.Copy(io.Discard, zr)
	if err != nil {
		return fail("is damaged (" + err.Error() + ")")
	}
	return int64(len(head)) + n, nil
}

func (h *handler) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	hd := w.Header()
	hd.Set("Content-Security-Policy", ContentSecurityPolicy)
	hd.Set("X-Content-Type-Options", "nosniff")
	hd.Set("Referrer-Policy", "no-referrer")
	hd.Set("Cross-Origin-Opener-Policy", "same-origin")
	hd.Set("Cache-Control", "no-cache")
	if r.Method != http.MethodGet && r.Method != http.MethodHead {
		hd.Set("Allow", allowedMethods)
		http.Error(w, "405 method not allowed", http.StatusMethodNotAllowed)
		return
	}
	res := h.lookup(r.URL.Path)
	if res == nil {
		http.NotFound(w, r)
		return
	}
	useGzip := res.gz != nil && acceptsGzip(r.Header.Values("Accept-Encoding"))
	etag := res.etag
	if useGzip {
		etag = res.gzTag
	}
	if res.gz != nil {
		hd.Set("Vary", "Accept-Encoding")
	}
	hd.Set("ETag", etag)
	if res.wasm {
		hd.Set(WasmBytesHeader, strconv.FormatInt(res.size, 10))
	}
	if matchesNone(r.Header.Values("If-None-Match"), etag) {
		w.WriteHeader(http.StatusNotModified)
		return
	}
	hd.Set("Content-Type", res.contentType)
	length := res.size
	if useGzip {
		hd.Set("Content-Encoding", "gzip")
		length = int64(len(res.gz))
	}
	hd.Set("Content-Length", strconv.FormatInt(length, 10))
	w.WriteHeader(http.StatusOK)
	if r.Method == http.MethodHead {
		return
	}
	switch {
	case useGzip:
		w.Write(res.gz)
	case res.wasm:
		// Checked by Handler, so decoding cannot fail short of the
		// connection failing.
		zr, err := gzip.NewReader(bytes.NewReader(res.gz))
		if err == nil {
			io.Copy(w, zr)
		}
	default:
		w.Write(res.body)
	}
}

// lookup returns the resource for a request path, or nil.
func (h *handler) lookup(p string) *resource {
	for _, elem := range strings.Split(p, "/") {
		if elem == ".." {
			return nil
		}
	}
	return h.byPath[p]
}

// acceptsGzip reports whether Accept-Encoding field values admit gzip
// (RFC 9110 §12.5.3): "gzip" or its alias "x-gzip" (§8.4.1.3) with a
// non-zero weight, or "*" with a non-zero weight when gzip is not named.
// With no field at all it answers false: identity is always acceptable
// and the safe choice.
func acceptsGzip(values []string) bool {
	gz, star := -1.0, -1.0 // -1: not named
	for _, v := range values {
		for _, item := range strings.Split(v, ",") {
			coding, params, _ := strings.Cut(item, ";")
			q := 1.0
			for _, p := range strings.Split(params, ";") {
				k, val, _ := strings.Cut(p, "=")
				if strings.EqualFold(strings.TrimSpace(k), "q") {
					f, err := strconv.ParseFloat(strings.TrimSpace(val), 64)
					if err != nil || f < 0 || f > 1 {
						f = 0 // a malformed weight is taken as "not acceptable"
					}
					q = f
				}
			}
			switch strings.ToLower(strings.TrimSpace(coding)) {
			case "gzip", "x-gzip":
				gz = max(gz, q)
			case "*":
				star = max(star, q)
			}
		}
	}
	if gz >= 0 {
		return gz > 0
	}
	return star > 0
}

// matchesNone reports whether If-None-Match field values match etag, using
// the weak comparison (RFC 9110 §13.1.2, §8.8.3.2): "*" matches, and a
// W/ prefix is ignored on either side.
func matchesNone(values []string, etag string) bool {
	want := strings.TrimPrefix(etag, "W/")
	for _, v := range values {
		for s := v; ; {
			s = strings.TrimLeft(s, " \t,")
			if s == "" {
				break
			}
			if s[0] == '*' {
				return true
			}
			s = strings.TrimPrefix(s, "W/")
			if s == "" || s[0] != '"' {
				break // malformed: ignore the rest of this field value
			}
			end := strings.IndexByte(s[1:], '"')
			if end < 0 {
				break
			}
			if s[:end+2] == want {
				return true
			}
			s = s[end+2:]
		}
	}
	return false
}
