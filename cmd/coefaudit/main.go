// Command coefaudit audits published comparisons of coefficients: from what
// a paper printed it runs the test the design requires and says whether
// the published verdict stands. Run "coefaudit help" for the commands.
package main

import "os"

func main() {
	setCollector(os.Getenv)
	os.Exit(int(run(os.Args[1:], os.Stdout, os.Stderr)))
}
