package outbuf

import (
	"hoistfleet/fleet"
	"hoistfleet/fleet/schema"
)

// TextField reads one schema field of each Asset (the site, say) by its column index,
// found once, instead of by key as fleet.Asset.Get does for every hoist.
type TextField struct {
	key string
	i   int // the schema column index of key; -1 when key is not in the schema
}

// NewTextField returns a TextField reading the schema field key.
func NewTextField(key string) TextField {
	i, ok := schema.ColumnIndex(key)
	if !ok {
		i = -1
	}
	return TextField{key: key, i: i}
}

// Text returns the field's text when the field is OK, as a.Get(key).Text then is, and ""
// otherwise.
func (t TextField) Text(a *fleet.Asset) string {
	if a.Values == nil {
		if v := a.Get(t.key); v.State == fleet.OK {
			return v.Text
		}
		return ""
	}
	if t.i >= 0 && t.i < len(a.Values) && a.Values[t.i].State == fleet.OK {
		return a.Values[t.i].Text
	}
	return ""
}
