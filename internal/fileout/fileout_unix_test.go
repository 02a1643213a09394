//go:build unix

package fileout

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// specialFiles makes a named pipe and, when the process may (root), a
// character device in dir, and returns them with the word a refusal uses.
func specialFiles(t *testing.T, dir string) map[string]string {
	t.Helper()
	fifo := filepath.Join(dir, "pipe.pdf")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	files := map[string]string{fifo: "named pipe"}
	dev := filepath.Join(dir, "null.pdf")
	// 1,3 is /dev/null on Linux (from memory); only its kind matters here.
	if err := syscall.Mknod(dev, syscall.S_IFCHR|0o666, 1<<8|3); err == nil {
		files[dev] = "device"
	} else {
		t.Logf("no device node (%v); named pipe only", err)
	}
	return files
}

func TestWriteHonoursTheUmask(t *testing.T) {
	// A new file gets 0666 less the umask, as from any program that creates
	// files (open(2) with mode 0666; POSIX); with force, the replacement too.
	for _, c := range []struct {
		umask int
		want  os.FileMode
	}{
		{0o022, 0o644}, // 0666 &^ 0022
		{0o027, 0o640}, // 0666 &^ 0027
		{0o002, 0o664}, // 0666 &^ 0002
		{0o077, 0o600}, // 0666 &^ 0077
	} {
		dir := t.TempDir()
		p := filepath.Join(dir, "out.pdf")
		old := syscall.Umask(c.umask)
		errNew := Write(p, []byte("a"), false)
		errForce := Write(p, []byte("b"), true)
		syscall.Umask(old)
		if errNew != nil || errForce != nil {
			t.Fatal(errNew, errForce)
		}
		st, err := os.Stat(p)
		if err != nil {
			t.Fatal(err)
		}
		if got := st.Mode().Perm(); got != c.want {
			t.Errorf("umask %04o: mode %04o, want %04o", c.umask, got, c.want)
		}
	}
}

// The helper process for TestSignalRemovesTemporary: it writes into the
// folder named by FILEOUT_SIGNAL_DIR and stops after the bytes are in the
// temporary, until the parent sends a signal.
const signalDirEnv = "FILEOUT_SIGNAL_DIR"

func TestSignalHelper(t *testing.T) {
	dir := os.Getenv(signalDirEnv)
	if dir == "" {
		t.Skip("helper process for TestSignalRemovesTemporary")
	}
	testHookWritten = func(tmp string) {
		fmt.Printf("TEMPORARY %s\n", tmp)
		time.Sleep(time.Hour) // the signal ends the process first
	}
	err := Write(filepath.Join(dir, "record.pdf"), []byte("half a record"), false)
	fmt.Printf("WRITE RETURNED %v\n", err)
	os.Exit(3)
}

func TestSignalRemovesTemporary(t *testing.T) {
	// SIGINT, SIGTERM or SIGHUP during a write removes the temporary and
	// ends the process by that signal (shells report 130, 143, 129), leaving
	// the folder as it was.
	for _, sig := range []syscall.Signal{syscall.SIGINT, syscall.SIGTERM, syscall.SIGHUP} {
		t.Run(sig.String(), func(t *testing.T) {
			dir := t.TempDir()
			// The timeout only stops a helper that hangs; it is not asserted.
			ctx, cancel := context.WithTimeout(context.Background(), 60*time.Second)
			defer cancel()
			cmd := exec.CommandContext(ctx, os.Args[0], "-test.run=^TestSignalHelper$")
			cmd.Env = append(os.Environ(), signalDirEnv+"="+dir)
			stdout, err := cmd.StdoutPipe()
			if err != nil {
				t.Fatal(err)
			}
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			tmp := ""
			sc := bufio.NewScanner(stdout)
			for sc.Scan() {
				if name, ok := strings.CutPrefix(sc.Text(), "TEMPORARY "); ok {
					tmp = name
					break
				}
			}
			if tmp == "" {
				cmd.Process.Kill()
				cmd.Wait()
				t.Fatal("the helper never reached the write")
			}
			if _, err := os.Stat(tmp); err != nil {
				t.Fatalf("temporary %s missing during the write: %v", tmp, err)
			}
			if err := cmd.Process.Signal(sig); err != nil {
				t.Fatal(err)
			}
			for sc.Scan() { // drain, so the helper never blocks on its output
			}
			err = cmd.Wait()
			var ee *exec.ExitError
			if !errors.As(err, &ee) {
				t.Fatalf("helper ended with %v", err)
			}
			ws, ok := ee.Sys().(syscall.WaitStatus)
			if !ok || !ws.Signaled() || ws.Signal() != sig {
				t.Errorf("helper ended with %v; want death by %v", err, sig)
			}
			entries, err := os.ReadDir(dir)
			if err != nil {
				t.Fatal(err)
			}
			for _, e := range entries {
				t.Errorf("left in the folder: %s", e.Name())
			}
		})
	}
}
