package audit

// Cautions are printed with every report a person reads (DESIGN.md,
// "Cautions the tool prints").
var Cautions = []string{
	"A flag is a reason to look again, not proof of error or misconduct.",
	"Printed numbers are rounded; designs are sometimes misreported in a table but right in the analysis; an unreported covariance can make any verdict indeterminate.",
	"Contact the authors before concluding anything, and follow the journal's and the review's own procedures.",
}
