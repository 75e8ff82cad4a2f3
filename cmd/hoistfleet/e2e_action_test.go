package main

import (
	"os"
	"path/filepath"
	"testing"
)

// TestDemoActions: every demo hoist that is not `pass` has an action in the JSONL, every
// passing one has none (null), under both profiles.
func TestDemoActions(t *testing.T) {
	dir := t.TempDir()
	for _, d := range []struct{ file, rules string }{{"demo-si.csv", "iso"}, {"demo-us.csv", "us"}} {
		reg := writeDemo(t, dir, d.file)
		out := filepath.Join(dir, d.file+".jsonl")
		runCmd(t, "", "check", reg, "--rules", d.rules, "--as-of", "2026-12-01", "--format", "jsonl", "-o", out, "--quiet").mustExit(t, exitFindings, "demo")
		b, err := os.ReadFile(out)
		if err != nil {
			t.Fatal(err)
		}
		hs := parseJSONL(t, string(b))
		withAction := 0
		for _, h := range hs {
			action, isString := h["action"].(string)
			switch {
			case h.str("status") == "pass" && h["action"] != nil:
				t.Errorf("%s %s: passes but has the action %v", d.file, h.str("asset_id"), h["action"])
			case h.str("status") != "pass" && (!isString || action == ""):
				t.Errorf("%s %s: %s without an action", d.file, h.str("asset_id"), h.str("status"))
			case isString:
				withAction++
			}
		}
		if withAction == 0 {
			t.Errorf("%s: no hoist has an action", d.file)
		}
	}
}
