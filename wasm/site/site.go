// Package site holds the web page around the earshot browser app and serves
// it: the page, its loader script, a service worker that keeps the app
// usable offline, and the app itself as pre-compressed WebAssembly.
//
// The files live in static/ and are embedded into any program that imports
// this package. Two of them are build outputs written by "make app" and not
// kept in git:
//
//	static/app.wasm.gz   the app, GOOS=js GOARCH=wasm, gzip -9
//	static/wasm_exec.js  Go's JavaScript support file, from $(go env GOROOT)/lib/wasm
//
// Without them (a clean clone) everything still compiles: [Handler] then
// answers "/" with a short page saying the app is not built, and
// [SingleFile] fails with an error naming "make app".
//
// The API:
//
//	FS()                  the embedded static directory
//	Built(fsys)           whether fsys holds the compiled app
//	Version(fsys)         short hash naming one build of the files
//	Handler(fsys)         the HTTP handler that "earshot serve" runs
//	SingleFile(fsys, w)   one self-contained HTML file that works from file://
//
// Tests pass an fstest.MapFS instead of FS() so they do not depend on the
// build. The page's side of the contract with the app: boot.js waits for
// the app to set globalThis.earshot_ready = true before it removes its
// loading line (#earshot-status); the app sets the title and appends its
// own canvas.
//
// This package imports neither syscall/js nor ebiten; it builds and is
// tested on every platform.
package site

import (
	"crypto/sha256"
	"embed"
	"encoding/hex"
	"io"
	"io/fs"
	"sort"
	"strconv"
	"strings"
)

//go:embed all:static
var embedded embed.FS

// Names of the files the page is made of, inside the static directory.
const (
	// WasmGzName is the gzip-compressed app. It is served as /app.wasm.
	WasmGzName = "app.wasm.gz"
	// WasmExecName is Go's JavaScript support file for js/wasm programs.
	WasmExecName = "wasm_exec.js"
	indexName    = "index.html"
	bootName     = "boot.js"
	workerName   = "sw.js"
	styleName    = "app.css"
	iconName     = "icon.svg"
	// rawWasmName is never served or embedded on purpose: /app.wasm always
	// comes from WasmGzName.
	rawWasmName = "app.wasm"
)

// VersionPlaceholder is replaced by [Version] in sw.js when it is served, so
// that the service worker's cache name changes with every build.
const VersionPlaceholder = "__EARSHOT_VERSION__"

// FS returns the embedded static directory: index.html, boot.js, sw.js,
// app.css, icon.svg and, once "make app" has run before the program was
// compiled, app.wasm.gz and wasm_exec.js.
func FS() fs.FS {
	sub, err := fs.Sub(embedded, "static")
	if err != nil {
		panic("site: " + err.Error()) // "static" is a valid constant path
	}
	return sub
}

// Built reports whether fsys holds the compiled app (app.wasm.gz).
func Built(fsys fs.FS) bool {
	st, err := fs.Stat(fsys, WasmGzName)
	return err == nil && st.Mode().IsRegular()
}

// Version names one build of the files in fsys: the first 12 hexadecimal
// digits of the SHA-256 of every served file's name and contents, taken in
// lexical order of the names:
//
//	sha256( for each file: name NUL len(contents) NUL contents )
//
// Every file counts, not only app.wasm.gz: a changed boot.js or index.html
// must also rename the service worker's cache, or browsers would keep
// serving the old copy from it. Files that are never served (hidden names,
// see [Handler]) do not count. An unreadable fsys gives "unknown".
func Version(fsys fs.FS) string {
	names, err := servedNames(fsys)
	if err != nil {
		return "unknown"
	}
	h := sha256.New()
	for _, name := range names {
		f, err := fsys.Open(name)
		if err != nil {
			return "unknown"
		}
		st, err := f.Stat()
		if err != nil {
			f.Close()
			return "unknown"
		}
		io.WriteString(h, name)
		h.Write([]byte{0})
		io.WriteString(h, strconv.FormatInt(st.Size(), 10))
		h.Write([]byte{0})
		_, err = io.Copy(h, f)
		f.Close()
		if err != nil {
			return "unknown"
		}
	}
	return hex.EncodeToString(h.Sum(nil))[:12]
}

// servedNames lists the regular files of fsys that may be served, sorted.
// Hidden files (a path element starting with "." or "_", such as an
// editor's backup or a half-copied build output) and the raw app.wasm are
// left out.
func servedNames(fsys fs.FS) ([]string, error) {
	var names []string
	err := fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if p != "." && hidden(d.Name()) {
			if d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if d.Type().IsRegular() && p != rawWasmName {
			names = append(names, p)
		}
		return nil
	})
	sort.Strings(names)
	return names, err
}

func hidden(name string) bool {
	return strings.HasPrefix(name, ".") || strings.HasPrefix(name, "_")
}
