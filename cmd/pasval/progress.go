package main

import (
	"io"
	"os"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"

	"pasval/internal/runlog"
)

// The progress bar of the commands that read recorded runs.

// progressMinBytes is the input size from which a progress bar is shown.
const progressMinBytes = 50_000_000

// showProgress says whether to draw a progress bar: never with --quiet or
// when diag is not a terminal (a pipe, a file, a test's buffer), and only
// for inputs over 50 MB, where reading takes long enough to wonder.
func showProgress(quiet, terminal bool, total int64) bool {
	return !quiet && terminal && total > progressMinBytes
}

// progress draws the bytes read of every file against their total size.
type progress struct {
	bar     *progressbar.ProgressBar
	mu      sync.Mutex
	readers []*runlog.Reader
	stop    chan struct{}
	wg      sync.WaitGroup
}

func newProgress(paths []string, quiet bool, diag io.Writer) *progress {
	pr := &progress{}
	var total int64
	for _, p := range paths {
		if st, err := os.Stat(p); err == nil && st.Mode().IsRegular() {
			total += st.Size()
		}
	}
	f, ok := diag.(*os.File)
	if !showProgress(quiet, ok && term.IsTerminal(int(f.Fd())), total) {
		return pr
	}
	pr.bar = progressbar.NewOptions64(total, progressbar.OptionSetWriter(diag), progressbar.OptionSetDescription("reading"),
		progressbar.OptionShowBytes(true), progressbar.OptionSetWidth(30), progressbar.OptionThrottle(100*time.Millisecond),
		progressbar.OptionClearOnFinish(), progressbar.OptionSetPredictTime(true))
	pr.stop = make(chan struct{})
	pr.wg.Add(1)
	go func() {
		defer pr.wg.Done()
		tick := time.NewTicker(200 * time.Millisecond)
		defer tick.Stop()
		for {
			select {
			case <-pr.stop:
				return
			case <-tick.C:
				if pr.bar.Set64(pr.read()) != nil {
					return // the terminal is gone: no more bar, the review goes on
				}
			}
		}
	}()
	return pr
}

// add follows one more file's reader.
func (pr *progress) add(r *runlog.Reader) {
	if pr.bar == nil {
		return
	}
	pr.mu.Lock()
	pr.readers = append(pr.readers, r)
	pr.mu.Unlock()
}

func (pr *progress) read() int64 {
	pr.mu.Lock()
	defer pr.mu.Unlock()
	var n int64
	for _, r := range pr.readers {
		read, _ := r.Progress()
		n += read
	}
	return n
}

// done removes the bar.
func (pr *progress) done() {
	if pr.bar == nil {
		return
	}
	close(pr.stop)
	pr.wg.Wait()
	if pr.bar.Finish() != nil || pr.bar.Clear() != nil {
		return // the terminal is gone: no bar to clear, and no result lost (the review goes to standard output)
	}
}
