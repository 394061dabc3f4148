package trial

import (
	"os"
	"strconv"
	"strings"
	"sync"
	"testing"
)

// runCases runs engines 0..n-1 of the bench on every core.
func runCases(t *testing.T, seed uint64, n int, opt Options) []Case {
	t.Helper()
	cs := make([]Case, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	sem := make(chan struct{}, 2)
	for i := 0; i < n; i++ {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			cs[i], errs[i] = RunOne(seed, i, opt)
		}(i)
	}
	wg.Wait()
	for i, err := range errs {
		if err != nil {
			t.Fatalf("engine %d: %v", i, err)
		}
	}
	return cs
}

// TestTrials runs the bench: EVENBEAT_TRIALS engines (default 30, a short
// form for CI; the closing figures use 600), seeded by EVENBEAT_TRIAL_SEED.
func TestTrials(t *testing.T) {
	n, seed := 30, uint64(1)
	if v, err := strconv.Atoi(os.Getenv("EVENBEAT_TRIALS")); err == nil && v > 0 {
		n = v
	}
	if v, err := strconv.ParseUint(os.Getenv("EVENBEAT_TRIAL_SEED"), 10, 64); err == nil {
		seed = v
	}
	opt := Options{OnlyModelled: os.Getenv("EVENBEAT_TRIAL_MODELLED") != "", Exact: os.Getenv("EVENBEAT_TRIAL_EXACT") != ""}
	cs := runCases(t, seed, n, opt)
	var b strings.Builder
	Summarise(cs).Write(&b)
	t.Log("\n" + b.String())
	// EVENBEAT_TRIAL_FAILS=leads (or cut-offs, balanced) lists the
	// engines that priority's plan failed on.
	if prio := os.Getenv("EVENBEAT_TRIAL_FAILS"); prio != "" {
		for _, c := range cs {
			for _, r := range c.Results {
				if string(r.Prio) == prio && (!r.Pass || r.Worse || r.Refused) {
					var b strings.Builder
					c.Describe(&b, r.Prio)
					t.Log(b.String())
				}
			}
		}
	}
}
