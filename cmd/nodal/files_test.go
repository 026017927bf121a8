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

// A file admitted by its size and weighed again by the parts it expands
// to lets go of its hold before it waits for the larger one: files that
// grow at once take turns instead of waiting on each other, and what they
// hold together stays within the budget. Checked by counts, not timing.
func TestAdmissionRegrows(t *testing.T) {
	const budget = 100
	a := newAdmission(budget)
	var mu sync.Mutex
	var held, peak int64
	hold := func(n int64) {
		mu.Lock()
		held += n
		peak = max(peak, held)
		mu.Unlock()
	}
	var wg sync.WaitGroup
	for i := 0; i < 40; i++ {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			small, big := int64(5+i%7), int64(40+i%50)
			tk := a.admit(small)
			hold(small)
			hold(-small)
			tk.grow(big)
			if tk.n != big {
				t.Errorf("grown to %d, want %d", tk.n, big)
			}
			hold(big)
			hold(-big)
			tk.grow(3) // never shrinks
			tk.done()
		}(i)
	}
	wg.Wait()
	if peak > budget {
		t.Errorf("%d bytes held at once, over the budget of %d", peak, budget)
	}
	if a.used != 0 {
		t.Errorf("%d bytes still held after every file is done", a.used)
	}
	huge := a.admit(1)
	huge.grow(1 << 62)
	if huge.n != budget || a.used != budget {
		t.Errorf("a design over the budget holds %d (admission %d), want the whole budget %d", huge.n, a.used, budget)
	}
	huge.done()
}
