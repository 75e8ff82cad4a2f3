package fleet

// CheckIDs lists every check in the order results show them. The ids are a contract
// (design.md): extend, never rename.
var CheckIDs = []string{
	"rope-design-factor",
	"drum-ratio",
	"sheave-ratio",
	"drum-capacity",
	"fleet-angle",
	"motor-torque",
	"motor-power",
	"hoist-speed",
	"motor-accel-torque",
	"gearbox-torque",
	"brake-holding",
	"brake-stop",
	"runaway",
	"shaft-load",
	"design-life",
	"inspection-due",
	"load-test",
	"rope-wear",
}
