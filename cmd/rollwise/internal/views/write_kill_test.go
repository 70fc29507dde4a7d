//go:build unix

package views

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// The kill test: a child process (this test binary, run again) writes a
// set with `Write` and SIGKILLs itself at its n-th step that changes the
// disk, for every n until a run completes; a WriteFile step is killed
// half-way through its bytes. After each kill the folder must show the old
// set or the new one, complete, with the manifest that lists exactly its
// files; the next run must complete it and leave the store clean.

const (
	childDir  = "ROLLWISE_VIEWS_CHILD_DIR"
	childSet  = "ROLLWISE_VIEWS_CHILD_SET"
	childKill = "ROLLWISE_VIEWS_CHILD_KILL"
)

// killer is the disk of a child: the n-th step that changes something
// kills the process (n = 0: never).
type killer struct {
	osFS
	n, step int
}

func (k *killer) at() {
	k.step++
	if k.step == k.n {
		syscall.Kill(os.Getpid(), syscall.SIGKILL) //nolint:errcheck // the kill is the point
		time.Sleep(time.Minute)
	}
}

func (k *killer) MkdirAll(name string) error { k.at(); return k.osFS.MkdirAll(name) }
func (k *killer) MkdirTemp(dir, p string) (string, error) {
	k.at()
	return k.osFS.MkdirTemp(dir, p)
}
func (k *killer) Symlink(target, name string) error { k.at(); return k.osFS.Symlink(target, name) }
func (k *killer) Rename(from, to string) error      { k.at(); return k.osFS.Rename(from, to) }
func (k *killer) Remove(name string) error          { k.at(); return k.osFS.Remove(name) }
func (k *killer) RemoveAll(name string) error       { k.at(); return k.osFS.RemoveAll(name) }
func (k *killer) SyncDir(name string) error         { k.at(); return k.osFS.SyncDir(name) }

func (k *killer) WriteFile(name string, data []byte) error {
	k.step++
	if k.step == k.n {
		f, _ := os.Create(name)
		f.Write(data[:len(data)/2])                //nolint:errcheck // killed half-way
		syscall.Kill(os.Getpid(), syscall.SIGKILL) //nolint:errcheck // the kill is the point
		time.Sleep(time.Minute)
	}
	return k.osFS.WriteFile(name, data)
}

// TestWriteChild is the child's side; it does nothing in a normal run.
func TestWriteChild(t *testing.T) {
	dir := os.Getenv(childDir)
	if dir == "" {
		t.Skip("the child of the kill and concurrency tests")
	}
	v1, v2 := twoVersions(t)
	s := map[string]*Set{"v1": v1, "v2": v2}[os.Getenv(childSet)]
	n, _ := strconv.Atoi(os.Getenv(childKill))
	k := &killer{n: n}
	if _, err := write(k, dir, s); err != nil {
		t.Fatal(err)
	}
	fmt.Printf("steps %d\n", k.step)
}

// child runs the child process writing set (v1 or v2) to dir, killed at
// step n (0: not killed).
func child(dir, set string, n int) *exec.Cmd {
	cmd := exec.Command(os.Args[0], "-test.run=^TestWriteChild$", "-test.count=1")
	cmd.Env = append(os.Environ(), childDir+"="+dir, childSet+"="+set, childKill+"="+strconv.Itoa(n))
	return cmd
}

// oneOf reports which of the wanted trees the folder shows ("" for none).
func oneOf(t *testing.T, dir string, want map[string]map[string]string) string {
	t.Helper()
	snap := snapshot(t, dir)
	for name, tree := range want {
		if sameTree(snap, tree) {
			return name
		}
	}
	return ""
}

func TestKilledAnywhereLeavesOldOrNew(t *testing.T) {
	v1, v2 := twoVersions(t)
	old, next := complete(t, v1), complete(t, v2)
	for _, start := range []string{"fresh", "link", "legacy"} {
		kills := 0
		for n := 1; ; n++ {
			dir := filepath.Join(t.TempDir(), "views")
			startAs(t, start, dir, v1)
			out, err := child(dir, "v2", n).CombinedOutput()
			if err == nil {
				if oneOf(t, dir, map[string]map[string]string{"new": next}) == "" {
					t.Errorf("%s: a run that was not killed left %s", start, treeNames(snapshot(t, dir)))
				}
				break
			}
			if ws, ok := err.(*exec.ExitError); !ok || ws.Sys().(syscall.WaitStatus).Signal() != syscall.SIGKILL {
				t.Fatalf("%s step %d: the child failed: %v\n%s", start, n, err, out)
			}
			kills++
			want := map[string]map[string]string{"old": old, "new": next}
			if start == "fresh" {
				want["none"] = nil
			}
			if start == "legacy" {
				// Between the two renames that replace a real folder by the
				// link, dir does not exist; the old set is in the store.
				want["moving"] = nil
			}
			if oneOf(t, dir, want) == "" {
				t.Errorf("%s: killed at step %d, the folder holds %s", start, n, treeNames(snapshot(t, dir)))
			}
			if _, err := Write(dir, v2); err != nil {
				t.Fatalf("%s: the run after a kill at step %d: %v", start, n, err)
			}
			if snap := snapshot(t, dir); !sameTree(snap, next) {
				t.Errorf("%s: the run after a kill at step %d left %s", start, n, treeNames(snap))
			}
			if st := storeNames(t, dir); len(st) != 2 {
				t.Errorf("%s: the run after a kill at step %d left %v in the store", start, n, st)
			}
			if n > 100 {
				t.Fatal("the child never completes")
			}
		}
		t.Logf("%s: killed at %d points, each left one complete set", start, kills)
		if kills < 12 {
			t.Errorf("%s: killed at %d points only", start, kills)
		}
	}
}

// Several runs on one folder at once, half writing each version: every
// run waits its turn and succeeds, and the folder ends with one complete
// set and a clean store.
func TestConcurrentRunsTakeTurns(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := filepath.Join(t.TempDir(), "views")
	var wg sync.WaitGroup
	errs := make([]string, 8)
	for i := range errs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			if out, err := child(dir, []string{"v1", "v2"}[i%2], 0).CombinedOutput(); err != nil {
				errs[i] = fmt.Sprintf("run %d: %v\n%s", i, err, out)
			}
		}()
	}
	wg.Wait()
	if e := strings.Join(errs, ""); e != "" {
		t.Error(e)
	}
	if oneOf(t, dir, map[string]map[string]string{"v1": complete(t, v1), "v2": complete(t, v2)}) == "" {
		t.Errorf("the folder holds %s", treeNames(snapshot(t, dir)))
	}
	if st := storeNames(t, dir); len(st) != 2 {
		t.Errorf("the store holds %v", st)
	}
}
