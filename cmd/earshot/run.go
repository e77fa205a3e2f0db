package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"sort"
	"strings"
)

// Exit codes.
const (
	exitOK      = 0
	exitFailure = 1
	exitUsage   = 2
)

// command is one subcommand of earshot.
type command struct {
	name    string
	summary string
	run     func(args []string, stdout, stderr io.Writer) int
}

var commands []command

func init() {
	commands = []command{
		{"groundwave", "ground-wave field strength over homogeneous or mixed ground", runGroundwave},
		{"skywave", "night sky-wave field (ITU-R P.1147 structure) between two places", runSkywave},
		{"sun", "sunrise, sunset, solar noon and solar elevation", runSun},
		{"rig", "the receiving chain stage by stage, and the weakest audible field", runRig},
		{"coil", "single-layer coil: inductance, Q, or turns for an inductance", runCoil},
		{"trap", "wave trap against a strong station: parts, notch, cost, verdict", runTrap},
		{"predict", "what the rig hears at a spot: every station, best first", runPredict},
		{"map", "map picture: audible stations, one station's margin, or where traps are needed", runMap},
		{"sweep", "wire-length or hour-by-hour sweep at a spot", runSweep},
		{"compare", "stations × listening spots", runCompare},
		{"demo", "ground-wave table for the embedded demo scenario", runDemo},
		{"serve", "serve the browser app on this machine", runServe},
		{"dist", "write the browser app as one offline HTML file", runDist},
	}
}

const topUsage = `earshot: what will a simple diode-detector receiver hear here?

Usage:
  earshot <command> [flags]

Commands:
%s
Run "earshot <command> --help" for the flags of a command.
`

func usageText() string {
	var b strings.Builder
	cs := append([]command(nil), commands...)
	sort.Slice(cs, func(i, j int) bool { return cs[i].name < cs[j].name })
	for _, c := range cs {
		fmt.Fprintf(&b, "  %-12s %s\n", c.name, c.summary)
	}
	return fmt.Sprintf(topUsage, b.String())
}

// run is the whole program: it returns the exit status.
func run(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprintln(stderr, "earshot: no command given (try \"earshot --help\")")
		return exitUsage
	}
	switch args[0] {
	case "-h", "-help", "--help", "help":
		fmt.Fprint(stdout, usageText())
		return exitOK
	}
	for _, c := range commands {
		if c.name == args[0] {
			return c.run(args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "earshot: unknown command %q (try \"earshot --help\")\n", args[0])
	return exitUsage
}

// usageError is an error in the command line: exit status 2.
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, a ...any) error { return &usageError{fmt.Sprintf(format, a...)} }

// newFlagSet returns a flag set that reports errors to the caller instead
// of printing them, and prints its help to stdout.
func newFlagSet(name, synopsis string, stdout io.Writer) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {} // the flag package calls it on every error
	helpText[fs] = func() {
		fmt.Fprintf(stdout, "Usage: earshot %s %s\n\nFlags:\n", name, synopsis)
		fs.VisitAll(func(f *flag.Flag) {
			def := ""
			if f.DefValue != "" && f.DefValue != "false" && f.DefValue != "0" {
				def = fmt.Sprintf(" (default %s)", f.DefValue)
			}
			fmt.Fprintf(stdout, "  --%-12s %s%s\n", f.Name, f.Usage, def)
		})
	}
	return fs
}

// helpText holds the help printer of each flag set.
var helpText = map[*flag.FlagSet]func(){}

// parseFlags parses args; it returns done=true with a status when the
// command should stop (help shown, or a usage error reported).
func parseFlags(fs *flag.FlagSet, args []string, stderr io.Writer) (done bool, status int) {
	err := fs.Parse(args)
	if errors.Is(err, flag.ErrHelp) {
		helpText[fs]()
		return true, exitOK
	}
	if err != nil {
		// The flag package names flags with one dash; earshot documents two.
		msg := strings.NewReplacer("flag -", "flag --", "for -", "for --", "defined: -", "defined: --").Replace(err.Error())
		fmt.Fprintf(stderr, "earshot %s: %s\n", fs.Name(), oneLine(msg))
		return true, exitUsage
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "earshot %s: unexpected argument %q\n", fs.Name(), fs.Arg(0))
		return true, exitUsage
	}
	return false, exitOK
}

// report prints err as one line and returns the exit status for it.
func report(name string, err error, stderr io.Writer) int {
	fmt.Fprintf(stderr, "earshot %s: %s\n", name, oneLine(err.Error()))
	var ue *usageError
	if errors.As(err, &ue) {
		return exitUsage
	}
	return exitFailure
}

func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// trimPkg returns err's message without its package prefix.
func trimPkg(err error) string {
	s := err.Error()
	for _, p := range []string{"receiver: ", "propagation: "} {
		s = strings.TrimPrefix(s, p)
	}
	return s
}

// setFlags returns the names of the flags given on the command line.
func setFlags(fs *flag.FlagSet) map[string]bool {
	set := map[string]bool{}
	fs.Visit(func(f *flag.Flag) { set[f.Name] = true })
	return set
}

// emitJSON writes v as one line of JSON and returns the exit status.
func emitJSON(name string, v any, stdout, stderr io.Writer) int {
	if err := json.NewEncoder(stdout).Encode(v); err != nil {
		return report(name, err, stderr)
	}
	return exitOK
}
