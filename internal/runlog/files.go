package runlog

import (
	"runtime"
	"sync"
)

// Each reads several files as one review: every path is opened and handed to
// fn on its own goroutine, at most workers at a time (0: one per core), and
// the results and errors come back in path order. fn reads the samples (and
// typically feeds an analysis of that file); Each closes the Reader after it.
// errs[i] is the error opening path i, or fn's, or else the Reader's own.
func Each[T any](paths []string, opt Options, workers int, fn func(*Reader) (T, error)) (results []T, errs []error) {
	results, errs = make([]T, len(paths)), make([]error, len(paths))
	if err := opt.check(); err != nil {
		for i := range errs {
			errs[i] = err
		}
		return results, errs
	}
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	sem := make(chan struct{}, workers)
	var wg sync.WaitGroup
	for i, path := range paths {
		wg.Add(1)
		sem <- struct{}{}
		go func() {
			defer func() { <-sem; wg.Done() }()
			r, err := Open(path, opt)
			if err != nil {
				errs[i] = err
				return
			}
			defer func() {
				if cerr := r.Close(); errs[i] == nil && cerr != nil {
					errs[i] = cerr
				}
			}()
			res, err := fn(r)
			if err == nil {
				err = r.Err()
			}
			results[i], errs[i] = res, err
		}()
	}
	wg.Wait()
	return results, errs
}
