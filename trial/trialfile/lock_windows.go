//go:build windows

package trialfile

import (
	"errors"
	"os"
	"syscall"
	"unsafe"
)

// removeWhileLocked: Windows refuses to remove a file another process has
// open, so the lock file is removed after it is unlocked (see unlockFile).
const removeWhileLocked = false

var (
	kernel32         = syscall.NewLazyDLL("kernel32.dll")
	procLockFileEx   = kernel32.NewProc("LockFileEx")
	procUnlockFileEx = kernel32.NewProc("UnlockFileEx")
)

const (
	lockfileExclusiveLock   = 0x2
	lockfileFailImmediately = 0x1
	errorLockViolation      = syscall.Errno(33)
	errorIOPending          = syscall.Errno(997)
	stillActive             = 259
	processQueryLimitedInfo = 0x1000
)

// tryLock locks the first byte range of f exclusively without waiting;
// false when another holder has it.
func tryLock(f *os.File) (bool, error) {
	var ol syscall.Overlapped
	r, _, err := procLockFileEx.Call(f.Fd(), lockfileExclusiveLock|lockfileFailImmediately, 0, 1, 0, uintptr(unsafe.Pointer(&ol)))
	if r != 0 {
		return true, nil
	}
	if errors.Is(err, errorLockViolation) || errors.Is(err, errorIOPending) {
		return false, nil
	}
	return false, err
}

func releaseLock(f *os.File) error {
	var ol syscall.Overlapped
	r, _, err := procUnlockFileEx.Call(f.Fd(), 0, 1, 0, uintptr(unsafe.Pointer(&ol)))
	if r == 0 {
		return err
	}
	return nil
}

// beingRemoved reports whether opening the lock file failed only because
// its last holder is removing it (access denied on a file that exists).
func beingRemoved(name string, err error) bool {
	if !errors.Is(err, os.ErrPermission) {
		return false
	}
	_, serr := os.Stat(name)
	return serr == nil || !errors.Is(serr, os.ErrNotExist)
}

// processAlive reports whether a process with this id runs on this machine.
func processAlive(pid int) bool {
	if pid <= 0 {
		return false
	}
	h, err := syscall.OpenProcess(processQueryLimitedInfo, false, uint32(pid))
	if err != nil {
		// Access denied means the process exists but belongs to another user.
		return errors.Is(err, syscall.ERROR_ACCESS_DENIED)
	}
	defer syscall.CloseHandle(h)
	var code uint32
	if err := syscall.GetExitCodeProcess(h, &code); err != nil {
		return true
	}
	return code == stillActive
}
