package filter_test

import (
	"errors"
	"slices"
	"strings"
	"testing"

	"github.com/opsift/opsift/filter"
)

// TestRegistry: every stage kind is registered once, in alphabetical
// order, and a plan whose kind has no template is an error from Circuit
// rather than some other kind's circuit.
func TestRegistry(t *testing.T) {
	kinds := filter.KnownKinds()
	if len(kinds) == 0 {
		t.Fatal("no stage kinds registered")
	}
	if !slices.IsSorted(kinds) {
		t.Errorf("KnownKinds %v not in alphabetical order", kinds)
	}
	for _, k := range kinds {
		tpl, ok := filter.TemplateFor(k)
		if !ok || tpl.Kind() != k {
			t.Errorf("TemplateFor(%q) = %v, %v", k, tpl, ok)
		}
	}
	wave := filter.WaveformKinds()
	for _, k := range []string{"direct", "rail_splitter"} {
		if slices.Contains(wave, k) {
			t.Errorf("%s has a waveform preview, want none", k)
		}
	}
	for _, k := range []string{"comparator", "follower", "inverting", "noninverting", "relaxation", "sallen_key_lowpass", "transimpedance"} {
		if !slices.Contains(wave, k) {
			t.Errorf("%s has no waveform preview, want one", k)
		}
	}

	sp := filter.StagePlan{Name: "x", Kind: "integrator"}
	_, err := sp.Circuit(nil, nil)
	if err == nil || errors.Is(err, filter.ErrNoWaveform) || !strings.Contains(err.Error(), `unknown kind "integrator"`) {
		t.Errorf("unknown kind: err = %v, want an unknown-kind error", err)
	}
	sp.Kind = "direct"
	if _, err := sp.Circuit(nil, nil); !errors.Is(err, filter.ErrNoWaveform) {
		t.Errorf("direct: err = %v, want ErrNoWaveform", err)
	}
}
