package main

import (
	"sync"
	"testing"
)

// Files are admitted to the workers by size: the bytes in flight never
// pass the budget, except for a file larger than the budget, which runs
// alone. Checked by the largest total seen, not by timing.
func TestAdmissionBySize(t *testing.T) {
	const budget = 100
	sizes := []int64{60, 60, 30, 30, 30, 90, 10, 250, 40, 40, 5, 5, 5}
	a := newAdmission(budget)
	var mu sync.Mutex
	var used, peak int64
	aloneOK := true
	var wg sync.WaitGroup
	for round := 0; round < 20; round++ {
		for _, n := range sizes {
			wg.Add(1)
			go func(n int64) {
				defer wg.Done()
				a.acquire(n)
				mu.Lock()
				used += n
				if n > budget && used != n {
					aloneOK = false
				}
				if n <= budget {
					peak = max(peak, used)
				}
				mu.Unlock()
				mu.Lock()
				used -= n
				mu.Unlock()
				a.release(n)
			}(n)
		}
	}
	wg.Wait()
	if peak > budget {
		t.Errorf("%d bytes admitted at once, over the budget of %d", peak, budget)
	}
	if !aloneOK {
		t.Errorf("a file larger than the budget ran beside others")
	}
	if a.used != 0 {
		t.Errorf("%d bytes still held after every release", a.used)
	}
}
