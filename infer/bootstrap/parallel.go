package bootstrap

import (
	"math/rand/v2"
	"sync"
	"sync/atomic"
)

// chunkSize is the number of resamples a worker takes at a time: large
// enough that taking work costs nothing, small enough to balance the load
// and to report progress at 1% steps for B = 10,000.
const chunkSize = 50

// runResamples fills theta[b] with the statistic of resample b for b in
// [0, len(theta)), over workers goroutines. Resample b draws from its own
// stream, rand.NewPCG(seed, b), and its result goes to theta[b], so the
// output is bit-identical for any number of workers. progress, if not nil,
// is called from the calling goroutine only, at most about 100 times.
func runResamples(theta []float64, proto *kernel, seed uint64, workers int, progress func(done, total int)) {
	total := len(theta)
	var next atomic.Int64
	finished := make(chan int, workers*4)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			kn := newKernel(proto.cols, proto.mean, proto.a, proto.b, proto.standardized)
			pcg := rand.NewPCG(seed, 0)
			rng := rand.New(pcg)
			count := float64(kn.n)
			for {
				start := int(next.Add(chunkSize)) - chunkSize
				if start >= total {
					return
				}
				end := min(start+chunkSize, total)
				for b := start; b < end; b++ {
					pcg.Seed(seed, uint64(b))
					kn.resample(rng)
					theta[b] = kn.statistic(kn.cross, kn.sum, count)
				}
				finished <- end - start
			}
		}()
	}
	go func() {
		wg.Wait()
		close(finished)
	}()
	done, reported := 0, 0
	for c := range finished {
		done += c
		// Report each whole percent once (and the end).
		if progress != nil && (done*100/total > reported*100/total || done == total) {
			reported = done
			progress(done, total)
		}
	}
}

// parallelFor runs body(start, end) over [0, n) in chunks on workers
// goroutines and waits; body writes results by index only.
func parallelFor(n, workers int, body func(start, end int)) {
	const chunk = 1024
	var next atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				start := int(next.Add(chunk)) - chunk
				if start >= n {
					return
				}
				body(start, min(start+chunk, n))
			}
		}()
	}
	wg.Wait()
}
