package trial

import (
	"math/rand/v2"
	"testing"

	"evenbeat/setting"
)

func TestDrawDesigns(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for _, kind := range []string{setting.KindSingleEccentric, setting.KindStephenson, setting.KindWalschaerts} {
		ok, bad := 0, map[string]int{}
		for i := 0; i < 200; i++ {
			d, err := drawDesign(r, kind, i%2 == 0)
			if err == nil {
				err = checkWorks(d.spec)
			}
			if err != nil {
				bad[err.Error()[:min(40, len(err.Error()))]]++
				continue
			}
			ok++
		}
		t.Logf("%s: %d/200 ok; %v", kind, ok, bad)
	}
}
