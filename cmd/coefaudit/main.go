// Command coefaudit audits published comparisons of coefficients: from what
// a paper printed it runs the test the design requires and says whether
// the published verdict stands. Run "coefaudit help" for the commands.
package main

import (
	"os"
	"runtime/debug"
)

// softMemoryLimit is the heap size at which the collector works harder
// rather than let the heap double. The largest workbook the readers accept
// (some 140,000 claims with 280,000 coefficients, held whole while its
// claims stream) peaked at 544 MB with the collector's default and stays
// under 500 MB with this limit; a smaller input never reaches it (README,
// "Speed and memory"). GOMEMLIMIT in the environment wins.
const softMemoryLimit = 400 << 20

func main() {
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(softMemoryLimit)
	}
	os.Exit(int(run(os.Args[1:], os.Stdout, os.Stderr)))
}
