package outbuf

import (
	"testing"

	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// TestTextField: a TextField reads what fleet.Asset.Get reads, the text of an OK field
// and "" otherwise, from Values (full, short, nil) and from the older Fields.
func TestTextField(t *testing.T) {
	i, ok := schema.ColumnIndex("site")
	if !ok {
		t.Fatal("site is not a schema key")
	}
	withValues := func(n int, v fleet.Value) *fleet.Asset {
		a := &fleet.Asset{Values: fleet.NewValues()[:n]}
		if i < n {
			a.Values[i] = v
		}
		return a
	}
	ok1 := fleet.Value{State: fleet.OK, Text: "Millbrook Coil Centre"}
	bad := fleet.Value{State: fleet.Bad, Text: "not written"}
	assets := map[string]*fleet.Asset{
		"values ok":    withValues(schema.ColumnCount(), ok1),
		"values bad":   withValues(schema.ColumnCount(), bad),
		"values empty": withValues(schema.ColumnCount(), fleet.Value{}),
		"values short": withValues(i, ok1),
		"fields ok":    {Fields: map[string]fleet.Value{"site": ok1}},
		"fields bad":   {Fields: map[string]fleet.Value{"site": bad}},
		"fields other": {Fields: map[string]fleet.Value{"asset_id": ok1}},
		"nothing":      {},
	}
	wants := map[string]string{"values ok": ok1.Text, "fields ok": ok1.Text}
	for _, key := range []string{"site", "no such key"} {
		f := NewTextField(key)
		for name, a := range assets {
			want := ""
			if key == "site" {
				want = wants[name]
			}
			if got := f.Text(a); got != want {
				t.Errorf("%s, %s: got %q, want %q", key, name, got, want)
			}
			if v := a.Get(key); v.State == fleet.OK && v.Text != f.Text(a) {
				t.Errorf("%s, %s: Get reads %q, TextField %q", key, name, v.Text, f.Text(a))
			}
		}
	}
}
