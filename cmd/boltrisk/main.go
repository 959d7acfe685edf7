// Command boltrisk estimates how likely a preloaded bolted joint is to fail,
// and what torque, tolerance and lubrication make it safe.
package main

import "os"

func main() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) }
