package oracle

import (
	"context"
	"errors"
	"sync"
)

// Each runs f(ctx, i) for i in [0, n) on a small pool of workers (each worker
// runs its share of glpsol processes one after another) and returns every
// error joined. workers <= 0 means 2.
func Each(ctx context.Context, n, workers int, f func(ctx context.Context, i int) error) error {
	if workers <= 0 {
		workers = 2
	}
	jobs := make(chan int)
	var (
		mu   sync.Mutex
		errs []error
		wg   sync.WaitGroup
	)
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				if err := f(ctx, i); err != nil {
					mu.Lock()
					errs = append(errs, err)
					mu.Unlock()
				}
			}
		}()
	}
	for i := 0; i < n; i++ {
		if ctx.Err() != nil {
			break
		}
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	if ctx.Err() != nil {
		errs = append(errs, ctx.Err())
	}
	return errors.Join(errs...)
}
