// Command earshot predicts which medium-wave transmitters a listener with a
// simple diode-detector receiver will hear. Run "earshot --help".
package main

import "os"

func main() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) }
