// Command pasval validates continuous (HTST) pasteurizers from a plant file:
// heat-exchange sections, regeneration ratio and the checks a process
// authority signs off. Run "pasval --help" for the commands.
package main

import "os"

func main() { os.Exit(run(os.Args[1:], os.Stdout, os.Stderr)) }
