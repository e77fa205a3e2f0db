package site

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"strconv"
	"strings"
)

// ErrNotBuilt is returned (wrapped) by [SingleFile] when fsys lacks the
// compiled app.
var ErrNotBuilt = errors.New("site: the browser app is not built: run make app")

// PayloadID is the id of the script element of a single file that holds
// the app as base64 of its gzip form.
const PayloadID = "earshot-wasm-gz"

// SingleFile writes the app as one self-contained HTML file that works when
// opened from disk (file://), with no server and no service worker:
//
//   - the <body> of index.html (the loading line and the <noscript> note),
//   - app.css in a <style> element and icon.svg as a data: URL,
//   - the app's gzip bytes, base64-encoded, in
//     <script type="application/octet-stream" id="earshot-wasm-gz" data-bytes="N">,
//     where N is the decoded size; a script of a type browsers do not
//     know is never run, only kept as text,
//   - wasm_exec.js and boot.js inline; boot.js finds the payload element,
//     inflates it with DecompressionStream("gzip") and runs it with
//     WebAssembly.instantiate(bytes, go.importObject).
//
// The file carries its own Content-Security-Policy in a <meta> element.
// Inline code is admitted by the SHA-256 of each inline script and style
// (hash sources), so nothing else inline can run; frame-ancestors is left
// out because a <meta> policy cannot carry it.
//
// It fails with an error wrapping [ErrNotBuilt] when app.wasm.gz or
// wasm_exec.js is missing, and with a plain error when a file is damaged.
func SingleFile(fsys fs.FS, w io.Writer) error {
	size, gz, err := wasmSize(fsys)
	if err != nil {
		return err
	}
	read := func(name string) (string, error) {
		b, err := fs.ReadFile(fsys, name)
		if errors.Is(err, fs.ErrNotExist) && name == WasmExecName {
			return "", fmt.Errorf("%w (%s is missing)", ErrNotBuilt, name)
		}
		if err != nil {
			return "", fmt.Errorf("site: %w", err)
		}
		return string(b), nil
	}
	var exec, boot, css, icon, index string
	for _, f := range []struct {
		name string
		to   *string
	}{{WasmExecName, &exec}, {bootName, &boot}, {styleName, &css}, {iconName, &icon}, {indexName, &index}} {
		if *f.to, err = read(f.name); err != nil {
			return err
		}
	}
	// HTML §4.12.1.3 (restrictions for contents of script elements): an
	// inline script must not contain "<!--" or "</script"; a <style> must
	// not contain "</style".
	for _, c := range []struct{ name, text, end string }{
		{WasmExecName, exec, "</script"}, {bootName, boot, "</script"}, {styleName, css, "</style"},
	} {
		low := strings.ToLower(c.text)
		if strings.Contains(low, c.end) || strings.Contains(low, "<!--") {
			return fmt.Errorf("site: %s contains %q or \"<!--\" and cannot be inlined", c.name, c.end)
		}
	}
	body, err := bodyOf(index)
	if err != nil {
		return err
	}
	csp := "default-src 'none'; script-src " + hashSource(exec) + " " + hashSource(boot) +
		" 'wasm-unsafe-eval'; style-src " + hashSource(css) +
		"; img-src data: blob:; object-src 'none'; base-uri 'none'; form-action 'none'"

	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="%s">
<meta name="referrer" content="no-referrer">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="color-scheme" content="dark">
<meta name="earshot-version" content="%s">
<title>earshot</title>
<link rel="icon" type="image/svg+xml" href="data:image/svg+xml;base64,%s">
<style>%s</style>
</head>
<body>
%s
<script type="application/octet-stream" id="%s" data-bytes="%s">`,
		csp, Version(fsys), base64.StdEncoding.EncodeToString([]byte(icon)), css,
		body, PayloadID, strconv.FormatInt(size, 10))
	enc := base64.NewEncoder(base64.StdEncoding, bw)
	enc.Write(gz)
	enc.Close()
	fmt.Fprintf(bw, "</script>\n<script>%s</script>\n<script>%s</script>\n</body>\n</html>\n", exec, boot)
	return bw.Flush()
}

// hashSource returns the CSP hash source admitting an inline element whose
// text is s (W3C CSP Level 3, hash-source: 'sha256-' and the base64 of the
// SHA-256 of the UTF-8 text).
func hashSource(s string) string {
	sum := sha256.Sum256([]byte(s))
	return "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
}

// bodyOf returns what lies between <body> and </body> in index.html,
// trimmed.
func bodyOf(index string) (string, error) {
	_, rest, ok := strings.Cut(index, "<body>")
	inner, _, ok2 := strings.Cut(rest, "</body>")
	if !ok || !ok2 {
		return "", fmt.Errorf("site: %s has no <body>…</body>", indexName)
	}
	if bytes.Contains(bytes.ToLower([]byte(inner)), []byte("<script")) {
		return "", fmt.Errorf("site: the <body> of %s must not hold scripts", indexName)
	}
	return strings.TrimSpace(inner), nil
}

// wasmSize returns the decoded size of app.wasm.gz in fsys.
func wasmSize(fsys fs.FS) (int64, []byte, error) {
	gz, err := fs.ReadFile(fsys, WasmGzName)
	if errors.Is(err, fs.ErrNotExist) {
		return 0, nil, ErrNotBuilt
	}
	if err != nil {
		return 0, nil, fmt.Errorf("site: %w", err)
	}
	n, err := checkWasmGz(gz)
	return n, gz, err
}
