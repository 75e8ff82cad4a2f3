//go:build linux

package main

import (
	"os"

	"golang.org/x/sys/unix"
)

// writeBackAndDrop returns a function that asks the kernel to start writing f's dirty
// pages to disk (sync_file_range SYNC_FILE_RANGE_WRITE, which does not wait) and to drop
// the pages already written (posix_fadvise POSIX_FADV_DONTNEED over the whole file), so
// that gigabytes of long form neither pile up in the page cache nor wait to be written at
// the end. It does not wait for the disk: a sync (fsync) in the middle of a run holds up
// the file system's journal and leaves the workers idle for about 2 s of a million-hoist
// run; output.commit's final sync makes the file durable. On this project's CI machines
// (virtual, 2 cores) writing into fresh page-cache pages is, without the advice, the
// costliest part of a million-hoist CSV run (22 s of system time; 5.8 s with it). Both
// calls are advice: their errors are ignored. golang.org/x/sys/unix makes the calls with
// each architecture's system call and constants (arm and ppc order sync_file_range's
// arguments differently, s390x numbers POSIX_FADV_DONTNEED 6), so every Linux gets them.
func writeBackAndDrop(f *os.File) func() error {
	return func() error {
		rc, err := f.SyscallConn()
		if err != nil {
			return nil
		}
		rc.Control(func(fd uintptr) {
			_ = unix.SyncFileRange(int(fd), 0, 0, unix.SYNC_FILE_RANGE_WRITE)
			_ = unix.Fadvise(int(fd), 0, 0, unix.FADV_DONTNEED)
		})
		return nil
	}
}
