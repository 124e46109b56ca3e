package subset

import (
	"encoding/json"
	"testing"
)

// TestStatusNames checks the lower-case names of the product
// specification and their round trip through ParseStatus and JSON (common
// practice, no source).
func TestStatusNames(t *testing.T) {
	want := map[Status]string{
		Converged: "converged", Diverged: "diverged", OutOfImage: "out-of-image",
		LowTexture: "low-texture", Masked: "masked", Lost: "lost",
	}
	for s, name := range want {
		if s.String() != name {
			t.Errorf("Status(%d).String() = %q, want %q", uint8(s), s.String(), name)
		}
		got, err := ParseStatus(name)
		if err != nil || got != s {
			t.Errorf("ParseStatus(%q) = %v, %v; want %v", name, got, err, s)
		}
		b, err := json.Marshal(s)
		if err != nil || string(b) != `"`+name+`"` {
			t.Errorf("json.Marshal(%v) = %s, %v", s, b, err)
		}
		var back Status
		if err := json.Unmarshal(b, &back); err != nil || back != s {
			t.Errorf("json.Unmarshal(%s) = %v, %v", b, back, err)
		}
	}
	if _, err := ParseStatus("Converged"); err == nil {
		t.Error("ParseStatus(\"Converged\") succeeded, want an error (names are lower-case)")
	}
	if got := Status(200).String(); got != "Status(200)" {
		t.Errorf("Status(200).String() = %q", got)
	}
}
