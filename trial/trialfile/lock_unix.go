//go:build unix

package trialfile

import (
	"errors"
	"os"
	"syscall"
)

// removeWhileLocked: on Unix the lock file is removed before it is
// unlocked (see unlockFile).
const removeWhileLocked = true

// tryLock takes an exclusive flock on f without waiting; false when
// another holder has it.
func tryLock(f *os.File) (bool, error) {
	for {
		err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB)
		switch {
		case err == nil:
			return true, nil
		case errors.Is(err, syscall.EWOULDBLOCK):
			return false, nil
		case errors.Is(err, syscall.EINTR):
			continue
		default:
			return false, err
		}
	}
}

func releaseLock(f *os.File) error {
	return syscall.Flock(int(f.Fd()), syscall.LOCK_UN)
}

// beingRemoved: on Unix a lock file can always be created or opened unless
// the folder forbids it.
func beingRemoved(string, error) bool { return false }

// processAlive reports whether a process with this id runs on this machine.
func processAlive(pid int) bool {
	if pid <= 0 {
		return false
	}
	err := syscall.Kill(pid, 0)
	return err == nil || errors.Is(err, syscall.EPERM)
}
