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

// The +/- a plan states for a step covers about two thirds of the
// scatter of that step over repeated rounds of the same engine (one
// standard deviation of a normal scatter: 68 %), checked over engines of
// every gear, with readings and marks as a setter takes them.
func TestStepUncertaintyCoversTheScatter(t *testing.T) {
	engines, trials := 12, 20
	if testing.Short() {
		engines, trials = 6, 12
	}
	var within, ratio []float64
	for i := 0; i < engines; i++ {
		c, err := StepCoverage(1, i, trials)
		if err != nil {
			t.Fatal(err)
		}
		if c.Trials < trials/2 || c.SD == 0 {
			continue
		}
		within = append(within, c.Within)
		ratio = append(ratio, c.Stated/c.SD)
		t.Logf("engine %d: %d plans, scatter %.4f, stated %.4f, within %.0f %%", i, c.Trials, c.SD, c.Stated, 100*c.Within)
	}
	if len(within) < engines/2 {
		t.Fatalf("only %d engines gave a step to check", len(within))
	}
	mw, mr := quantile(within, 0.5), quantile(ratio, 0.5)
	t.Logf("median share within the stated +/-: %.0f %%; median stated over scatter: %.2f", 100*mw, mr)
	if mw < 0.5 || mw > 0.9 {
		t.Errorf("the stated +/- covers a median %.0f %% of the scatter; about two thirds wanted", 100*mw)
	}
	if mr < 0.6 || mr > 1.8 {
		t.Errorf("the stated +/- is a median %.2f times the scatter", mr)
	}
}
