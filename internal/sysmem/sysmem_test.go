package sysmem

import "testing"

func TestParseMemTotal(t *testing.T) {
	in := []byte("MemTotal:       24631028 kB\nMemFree:         1234 kB\n")
	if got, want := parseMemTotal(in), uint64(24631028)<<10; got != want {
		t.Errorf("MemTotal %d, want %d", got, want)
	}
	if got := parseMemTotal([]byte("garbage\n")); got != 0 {
		t.Errorf("garbage gives %d, want 0", got)
	}
}

// On a Linux machine the memory is known and plausible (more than 64 MB).
func TestAvailable(t *testing.T) {
	if v := Available(); v != 0 && v < 64<<20 {
		t.Errorf("Available() = %d bytes", v)
	}
}
