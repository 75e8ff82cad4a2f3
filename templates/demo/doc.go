// Package demo holds the invented demo registers (demo-si.csv, demo-us.csv) that
// `hoistfleet demo` writes and checks; README.md lists each hoist's intended verdict.
// The package has no code: its tests check that the registers are engineering-consistent
// (speeds, rope strengths, units) so that the verdicts they show come from the defects
// seeded on purpose, not from typing errors.
package demo
