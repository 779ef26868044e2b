package em

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// sumRows computes n row terms on all cores and adds them in row order, so
// the sum does not depend on scheduling. newWorker is called once per
// goroutine and returns the function that computes row i (a worker may
// keep scratch space in its closure). When tol.Est is set, row i gets its
// own estimate slot est (nil otherwise) to pass on as its Tol.Est, and
// the rows' estimates are added to tol.Est in row order; a shared slot
// would be written by several goroutines at once. Interrupts are polled before every
// row; progress is reported under a lock with the count read there, so
// reports never go backwards and the last one is n. The first row error
// in row order is returned.
func sumRows(n int, tol Tol, newWorker func() func(i int, est *float64) (float64, error)) (float64, error) {
	terms := make([]float64, n)
	var ests []float64
	if tol.Est != nil {
		ests = make([]float64, n)
	}
	errs := make([]error, n)
	var next, done atomic.Int64
	var stopErr atomic.Pointer[error]
	var mu sync.Mutex
	var wg sync.WaitGroup
	for w := 0; w < min(runtime.GOMAXPROCS(0), n); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			row := newWorker()
			for {
				if err := tol.stopped(); err != nil {
					stopErr.CompareAndSwap(nil, &err)
					return
				}
				i := int(next.Add(1)) - 1
				if i >= n {
					return
				}
				var est *float64
				if ests != nil {
					est = &ests[i]
				}
				terms[i], errs[i] = row(i, est)
				done.Add(1)
				if tol.Progress != nil {
					mu.Lock()
					tol.Progress(int(done.Load()), n)
					mu.Unlock()
				}
			}
		}()
	}
	wg.Wait()
	if e := stopErr.Load(); e != nil {
		return 0, *e
	}
	var sum float64
	for i := range terms {
		if errs[i] != nil {
			return 0, errs[i]
		}
		sum += terms[i]
	}
	for _, e := range ests {
		*tol.Est += e
	}
	return sum, nil
}
