package xlsxout

import "hoistfleet/fleet"

var _ fleet.Forgetter = (*Writer)(nil)

// ForgetsResults reports that Write keeps nothing of a result once it returns (it
// encodes the result's values, or copies an encoding made by Prepare), so fleet.Run may
// reuse the result's memory and let the register reader reuse its Asset
// (fleet.Forgetter).
func (w *Writer) ForgetsResults() bool { return true }
