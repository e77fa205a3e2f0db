package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"earshot/wasm/site"
)

const distSynopsis = `--out FILE.html

Writes the browser app as one HTML file that works opened straight from
disk (file://), with no server: the page, its scripts and the app (gzip,
base64) all inside. The app must be built into earshot: "make dist" runs
"make app" and then this command.`

func runDist(args []string, stdout, stderr io.Writer) int {
	flags := newFlagSet("dist", distSynopsis, stdout)
	out := flags.String("out", "", "HTML file to write")
	if done, status := parseFlags(flags, args, stderr); done {
		return status
	}
	if *out == "" {
		return report("dist", usagef("--out FILE.html is required"), stderr)
	}
	n, err := writeSingleFile(site.FS(), *out)
	if err != nil {
		return report("dist", err, stderr)
	}
	fmt.Fprintf(stdout, "wrote %s (%.1f MB)\n", *out, float64(n)/(1<<20))
	return exitOK
}

// writeSingleFile writes site.SingleFile of fsys to path through a
// temporary file beside it, so a failure leaves no half-written file. It
// returns the size written.
func writeSingleFile(fsys fs.FS, path string) (int64, error) {
	if !site.Built(fsys) {
		return 0, errors.New("the browser app is not built into this earshot: run make app, then build earshot again (make dist does both)")
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), ".earshot-*.html")
	if err != nil {
		return 0, fmt.Errorf("--out %s: %v", path, errors.Unwrap(err))
	}
	fail := func(err error) (int64, error) {
		tmp.Close()
		os.Remove(tmp.Name())
		if errors.Is(err, site.ErrNotBuilt) {
			return 0, errors.New("the browser app is not fully built into this earshot: run make app, then build earshot again (make dist does both)")
		}
		return 0, errors.New(strings.TrimPrefix(err.Error(), "site: "))
	}
	if err := site.SingleFile(fsys, tmp); err != nil {
		return fail(err)
	}
	st, err := tmp.Stat()
	if err != nil {
		return fail(err)
	}
	if err := tmp.Chmod(0o644); err != nil {
		return fail(err)
	}
	if err := tmp.Close(); err != nil {
		return fail(err)
	}
	if err := os.Rename(tmp.Name(), path); err != nil {
		os.Remove(tmp.Name())
		return 0, fmt.Errorf("--out %s: %v", path, err)
	}
	return st.Size(), nil
}
