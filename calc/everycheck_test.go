package calc_test

import (
	"strings"
	"testing"

	"hoistfleet/fleet"
)

// coversEveryCheck fails when a test's list of checks (names "check-id" or
// "check-id variant") leaves out a check of fleet's definitions table, so that a new
// check cannot be added without its calc tests.
func coversEveryCheck(t *testing.T, list string, names []string) {
	t.Helper()
	have := map[string]bool{}
	for _, n := range names {
		id, _, _ := strings.Cut(n, " ")
		have[id] = true
	}
	for _, id := range fleet.CheckIDs {
		if !have[id] {
			t.Errorf("%s: no case for check %s (fleet.CheckIDs)", list, id)
		}
	}
}
