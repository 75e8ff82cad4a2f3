package main

import (
	"errors"
	"testing"
)

func TestResolvePaper(t *testing.T) {
	for _, tc := range []struct {
		flag string
		env  map[string]string
		want string
	}{
		{"a4", map[string]string{"LANG": "en_US.UTF-8"}, "a4"}, // the flag wins
		{"LETTER", nil, "letter"},
		{"", nil, "a4"},
		{"", map[string]string{"LANG": "en_US.UTF-8"}, "letter"},
		{"", map[string]string{"LANG": "fr_CA.UTF-8"}, "letter"},
		{"", map[string]string{"LANG": "en_GB.UTF-8"}, "a4"},
		{"", map[string]string{"LANG": "de_DE@euro"}, "a4"},
		{"", map[string]string{"LANG": "C.UTF-8"}, "a4"},
		{"", map[string]string{"LANG": "en_US.UTF-8", "LC_PAPER": "de_DE.UTF-8"}, "a4"},       // LC_PAPER before LANG
		{"", map[string]string{"LC_PAPER": "de_DE.UTF-8", "LC_ALL": "en_CA.UTF-8"}, "letter"}, // LC_ALL first
	} {
		got, err := resolvePaper(tc.flag, func(k string) string { return tc.env[k] })
		if err != nil || got != tc.want {
			t.Errorf("resolvePaper(%q, %v) = %q, %v; want %q", tc.flag, tc.env, got, err, tc.want)
		}
	}
	var ue *usageError
	if _, err := resolvePaper("a3", func(string) string { return "" }); !errors.As(err, &ue) {
		t.Errorf("--paper a3: %v, want a usage error", err)
	}
}
