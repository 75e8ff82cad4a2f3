package fleet

import (
	"math"
	"strings"
	"testing"
	"time"
)

// The checks of issue 18 followed through their definitions: review limits that judge a
// part of a check, sparse registers, and the record of the design life after an
// overhaul. asOf is 2026-06-01 (helpers_test.go).

// TestLimiterSettingIsAReviewLimit: the ISO profile's largest trip setting, 110 %
// (EN 14492-2 / EN 15011, memory, low), is a review limit: a limiter set at 120 % makes
// overload-limiter marginal with the review message, never fail, and its test still
// judges the verdict; a rule file that confirms the row (provenance seen) makes it fail.
func TestLimiterSettingIsAReviewLimit(t *testing.T) {
	for _, c := range []struct {
		name    string
		setting float64
		rules   []string
		status  Status
		review  float64
	}{
		{"at 110 %: within", 1.10, nil, StatusPass, 1},
		{"at 120 %: review exceeded, marginal", 1.20, nil, StatusMarginal, 1.2 / 1.1},
		{"at 120 %, the row confirmed: fail", 1.20, []string{`limiter.max_setting,all,,110,%,"EN 15011 (read)",seen,`}, StatusFail, math.NaN()},
	} {
		ch := isoChecker(t, c.rules...)
		// Tested 2026-03-01, 92 of 365 days into a 12-month interval (u 0.25).
		r := ch.Check(winchA(t).num("limiter_setting", c.setting).asset())
		cr := mustCheck(t, r, "overload-limiter")
		if cr.Status != c.status || !approxEqual(cr.ReviewUtilisation, c.review, 0, 1e-12) {
			t.Errorf("%s: %s review %g (%s), want %s %g", c.name, cr.Status, cr.ReviewUtilisation, cr.Message, c.status, c.review)
		}
		if c.status == StatusMarginal {
			if !strings.Contains(cr.Message, "exceeds limiter.max_setting = 110 %") || !strings.Contains(r.Evaluation.Action, "trip setting checked: 120 %") {
				t.Errorf("%s: message %q action %q", c.name, cr.Message, r.Evaluation.Action)
			}
			if cr.Unit != "d" { // the verdict is the test's
				t.Errorf("%s: unit %q, want the test's d", c.name, cr.Unit)
			}
		}
	}
}

// TestLimitDevicesThroughTheChecker: a missing upper limit device fails (ASME B30.2 /
// EN 14492-2, memory medium); an overdue test fails as a records check; without the
// column the check is unchecked and does not count (Optional).
func TestLimitDevicesThroughTheChecker(t *testing.T) {
	ch := isoChecker(t)
	d := func(y int, m time.Month, day int) time.Time { return time.Date(y, m, day, 0, 0, 0, 0, time.UTC) }
	for _, c := range []struct {
		name   string
		a      *Asset
		status Status
		action string
	}{
		{"no upper limit device", winchA(t).text("upper_limit_fitted", "no").asset(), StatusFail, "Fit an upper limit device before further use"},
		{"test 2025-04-01: overdue by 61 days", winchA(t).text("upper_limit_fitted", "yes").date("limit_last_test", d(2025, 4, 1)).asset(), StatusFail, "test the limit devices: 61 days overdue"},
		{"tested 2026-03-01", winchA(t).text("upper_limit_fitted", "yes").date("limit_last_test", d(2026, 3, 1)).asset(), StatusPass, ""},
		{"fitted, no test date", winchA(t).text("upper_limit_fitted", "yes").asset(), StatusUnchecked, ""},
		{"not in the register", winchA(t).asset(), StatusUnchecked, ""},
	} {
		r := ch.Check(c.a)
		cr := mustCheck(t, r, "limit-devices")
		if cr.Status != c.status {
			t.Errorf("%s: %s (%s), want %s", c.name, cr.Status, cr.Message, c.status)
		}
		if c.action != "" && !strings.Contains(strings.ToLower(r.Evaluation.Action), strings.ToLower(c.action)) {
			t.Errorf("%s: action %q lacks %q", c.name, r.Evaluation.Action, c.action)
		}
		if c.status == StatusUnchecked && r.Status == StatusUnchecked {
			t.Errorf("%s: an unchecked optional check set the hoist's status", c.name)
		}
	}
}

// TestMotorDutyThroughTheChecker: winchA is M5 (FEM 2m: 40 % ED, 240 starts an hour,
// FEM 9.683, memory low, review limits). A 25 % ED motor is marginal with the review
// message (never fail); 150 cycles an hour on a 240-start motor is 300 starts, over the
// motor's own rating: fail; without the motor's rating, unchecked and not counted.
func TestMotorDutyThroughTheChecker(t *testing.T) {
	ch := isoChecker(t)
	for _, c := range []struct {
		name   string
		a      *Asset
		status Status
		review float64
		msg    string
	}{
		{"40 % ED, 240 starts: meets the group", winchA(t).num("motor_duty_factor", 0.40).num("motor_starts", 240).asset(), StatusInfo, 1, ""},
		{"25 % ED: review exceeded", winchA(t).num("motor_duty_factor", 0.25).num("motor_starts", 240).asset(), StatusMarginal, 1.6, "exceeds motor.min_duty_factor = 40 %"},
		{"300 starts run on a 240-start motor", winchA(t).num("motor_duty_factor", 0.40).num("motor_starts", 240).num("cycles_per_hour", 150).asset(), StatusFail, 1, "starts per hour run 300/h exceed the motor's 240/h"},
		{"no motor rating", winchA(t).num("cycles_per_hour", 150).asset(), StatusUnchecked, math.NaN(), "needs Motor duty factor, Motor starts per hour"},
	} {
		r := ch.Check(c.a)
		cr := mustCheck(t, r, "motor-duty")
		if cr.Status != c.status || !approxEqual(cr.ReviewUtilisation, c.review, 0, 1e-12) || !strings.Contains(cr.Message, c.msg) {
			t.Errorf("%s: %s review %g %q, want %s %g %q", c.name, cr.Status, cr.ReviewUtilisation, cr.Message, c.status, c.review, c.msg)
		}
	}
}

// TestBrakeEnergyThroughTheChecker: the energy is always a figure; against the brake's
// permitted friction work where the register gives it (the limit at and beside E).
func TestBrakeEnergyThroughTheChecker(t *testing.T) {
	ch := isoChecker(t)
	r := ch.Check(winchA(t).asset())
	cr := mustCheck(t, r, "brake-energy")
	e := figureOf(cr, "energy_j")
	if cr.Status != StatusInfo || !(e > 0) {
		t.Fatalf("no rating: %s, energy %g", cr.Status, e)
	}
	for _, c := range []struct {
		perm   float64
		status Status
	}{{e * 1.2, StatusPass}, {e * 1.05, StatusMarginal}, {e * 0.99, StatusFail}} {
		cr := mustCheck(t, ch.Check(winchA(t).num("brake_friction_work", c.perm).asset()), "brake-energy")
		if cr.Status != c.status {
			t.Errorf("W_perm = %.4g J for E = %.4g J: %s, want %s", c.perm, e, cr.Status, c.status)
		}
	}
}

// TestDesignLifeOverhaulThroughTheChecker: winchA's 2 000 h at L2 (km 0.25) with X 1.2 is
// S = 600 h of M5's 1 600 h (FEM 9.755, seen); an overhaul at 1 500 h leaves 500 h on the
// meter, S = 150 h, and the record says which period was counted.
func TestDesignLifeOverhaulThroughTheChecker(t *testing.T) {
	ch := isoChecker(t)
	r := ch.Check(winchA(t).date("last_overhaul", time.Date(2025, 6, 1, 0, 0, 0, 0, time.UTC)).num("overhaul_hours", 1500*hour).asset())
	cr := mustCheck(t, r, "design-life")
	if !approxEqual(cr.Demand, 150, 1e-9, 0) || !strings.Contains(cr.Message, "S counted from the general overhaul of 2025-06-01") {
		t.Errorf("S %g h, message %q", cr.Demand, cr.Message)
	}
}

// TestSparseRegisterRunsTheNewChecks: a register with only dates and yes/no fields (no
// engineering data at all) still runs the overload limiter and limit devices.
func TestSparseRegisterRunsTheNewChecks(t *testing.T) {
	ch := isoChecker(t)
	a := newAsset(t, 5, "SP-05").num("rated_load", 2*tonne).
		text("limiter_fitted", "yes").date("limiter_last_test", time.Date(2026, 1, 10, 0, 0, 0, 0, time.UTC)).
		text("upper_limit_fitted", "yes").date("limit_last_test", time.Date(2024, 1, 10, 0, 0, 0, 0, time.UTC)).asset()
	r := ch.Check(a)
	if cr := mustCheck(t, r, "overload-limiter"); cr.Status != StatusPass {
		t.Errorf("overload-limiter %s %s", cr.Status, cr.Message)
	}
	if cr := mustCheck(t, r, "limit-devices"); cr.Status != StatusFail || !strings.Contains(cr.Message, "overdue") {
		t.Errorf("limit-devices %s %s", cr.Status, cr.Message)
	}
	if r.Status != StatusFail {
		t.Errorf("hoist status %s, want fail (the limit device test is overdue)", r.Status)
	}
}

func figureOf(cr *CheckResult, name string) float64 {
	for _, f := range cr.Figures {
		if f.Name == name {
			return f.Value
		}
	}
	return math.NaN()
}
