package site_test

import (
	"fmt"
	"net/http/httptest"
	"testing/fstest"

	"earshot/wasm/site"
)

func ExampleVersion() {
	fsys := fstest.MapFS{
		"index.html": {Data: []byte("<!doctype html><title>t</title>")},
		"sw.js":      {Data: []byte(`const VERSION = "__EARSHOT_VERSION__";`)},
	}
	// The same digest from a shell (coreutils sha256sum):
	//
	//	{ printf 'index.html\0%s\0%s' 31 '<!doctype html><title>t</title>'
	//	  printf 'sw.js\0%s\0%s' 38 'const VERSION = "__EARSHOT_VERSION__";'; } | sha256sum | cut -c1-12
	fmt.Println(site.Version(fsys))
	// Output:
	// 6eda700bd103
}

func ExampleHandler() {
	// Without app.wasm.gz the handler still serves: "/" explains how to
	// build the app.
	fsys := fstest.MapFS{"app.css": {Data: []byte("body { margin: 0 }")}}
	h, err := site.Handler(fsys)
	if err != nil {
		fmt.Println(err)
		return
	}
	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", "/", nil))
	fmt.Println(rec.Code, rec.Header().Get("Content-Type"))
	fmt.Println(rec.Header().Get("X-Content-Type-Options"))
	// Output:
	// 200 text/html; charset=utf-8
	// nosniff
}
