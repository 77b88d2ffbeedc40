/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * leftover.c - a fixed registry of temporary paths and worker processes, and the signal handler
 * that cleans them up; everything the handler touches is async-signal-safe.
 */
#define _GNU_SOURCE /* syscall */
#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <signal.h>
#include <stdatomic.h>
#include <string.h>
#include <sys/syscall.h>
#include <sys/wait.h>
#include <unistd.h>

#include "schrot/leftover.h"

#define SCH_LEFTOVER_PATHS 64
#define SCH_LEFTOVER_PIDS 64

/*
 * A slot is live (state 2) only after its contents are complete, so the handler never reads a
 * half-written path; the tool is single-threaded, so only the handler can interrupt a writer.
 */
struct leftover_path {
	volatile sig_atomic_t state; /* 0 free, 1 being written, 2 live */
	bool is_dir;
	char path[PATH_MAX];
};

static struct leftover_path paths[SCH_LEFTOVER_PATHS];
static volatile pid_t pids[SCH_LEFTOVER_PIDS];

void sch_leftover_add_path(const char *path, bool is_dir)
{
	size_t n = path ? strlen(path) : 0;

	if (n == 0 || n >= PATH_MAX)
		return;
	for (size_t i = 0; i < SCH_LEFTOVER_PATHS; i++) {
		if (paths[i].state != 0)
			continue;
		paths[i].state = 1;
		memcpy(paths[i].path, path, n + 1);
		paths[i].is_dir = is_dir;
		atomic_signal_fence(memory_order_seq_cst); /* the path is complete before the handler may read it */
		paths[i].state = 2;
		return;
	}
}

void sch_leftover_drop_path(const char *path)
{
	if (!path)
		return;
	for (size_t i = 0; i < SCH_LEFTOVER_PATHS; i++)
		if (paths[i].state == 2 && strcmp(paths[i].path, path) == 0) {
			paths[i].state = 0;
			return;
		}
}

void sch_leftover_add_pid(pid_t pid)
{
	for (size_t i = 0; i < SCH_LEFTOVER_PIDS && pid > 0; i++)
		if (pids[i] == 0) {
			pids[i] = pid;
			return;
		}
}

void sch_leftover_drop_pid(pid_t pid)
{
	for (size_t i = 0; i < SCH_LEFTOVER_PIDS && pid > 0; i++)
		if (pids[i] == pid)
			pids[i] = 0;
}

/*
 * Removes the directory name (relative to at) with its entries, depth levels of subdirectories
 * deep, through the raw getdents64 call (readdir is not async-signal-safe).
 */
static void remove_dir_at(int at, const char *name, int depth)
{
	char buf[4096];
	int fd = openat(at, name, O_RDONLY | O_DIRECTORY | O_CLOEXEC | O_NOFOLLOW);

	if (fd < 0)
		return;
	for (;;) {
		long n = syscall(SYS_getdents64, fd, buf, sizeof(buf));

		if (n <= 0)
			break;
		for (long off = 0; off < n;) {
			/* struct linux_dirent64: d_ino 8, d_off 8, d_reclen 2, d_type 1, d_name */
			unsigned short reclen;
			const char *entry = buf + off + 19;

			memcpy(&reclen, buf + off + 16, sizeof(reclen));
			if (reclen == 0)
				break;
			if (strcmp(entry, ".") != 0 && strcmp(entry, "..") != 0 && unlinkat(fd, entry, 0) != 0 &&
			    errno == EISDIR && depth > 0)
				remove_dir_at(fd, entry, depth - 1);
			off += reclen;
		}
	}
	close(fd);
	unlinkat(at, name, AT_REMOVEDIR);
}

static void remove_slot(size_t i)
{
	if (paths[i].is_dir)
		remove_dir_at(AT_FDCWD, paths[i].path, 1);
	else
		unlink(paths[i].path);
}

void sch_leftover_remove_now(const char *path)
{
	for (size_t i = 0; path && i < SCH_LEFTOVER_PATHS; i++)
		if (paths[i].state == 2 && strcmp(paths[i].path, path) == 0) {
			remove_slot(i);
			paths[i].state = 0;
			return;
		}
}

static void on_fatal_signal(int sig)
{
	for (size_t i = 0; i < SCH_LEFTOVER_PIDS; i++) {
		pid_t pid = pids[i];

		if (pid <= 0)
			continue;
		kill(pid, SIGKILL);
		while (waitpid(pid, NULL, 0) < 0 && errno == EINTR)
			;
	}
	for (size_t i = 0; i < SCH_LEFTOVER_PATHS; i++) {
		if (paths[i].state == 2)
			remove_slot(i);
	}
	_exit(128 + sig);
}

void sch_leftover_install(void)
{
	static const int sigs[] = { SIGINT, SIGTERM, SIGHUP };
	struct sigaction sa;

	memset(&sa, 0, sizeof(sa));
	sa.sa_handler = on_fatal_signal;
	sigfillset(&sa.sa_mask); /* the handler runs to its end without a second signal cutting in */
	for (size_t i = 0; i < sizeof(sigs) / sizeof(sigs[0]); i++) {
		struct sigaction old;

		/* a signal ignored by whoever started us (nohup) stays ignored */
		if (sigaction(sigs[i], NULL, &old) == 0 && old.sa_handler == SIG_IGN)
			continue;
		sigaction(sigs[i], &sa, NULL);
	}
}

void sch_leftover_hold(sigset_t *old)
{
	sigset_t fatal;

	sigemptyset(&fatal);
	sigaddset(&fatal, SIGINT);
	sigaddset(&fatal, SIGTERM);
	sigaddset(&fatal, SIGHUP);
	sigprocmask(SIG_BLOCK, &fatal, old);
}

void sch_leftover_release(const sigset_t *old)
{
	sigprocmask(SIG_SETMASK, old, NULL);
}

void sch_leftover_forget_in_child(void)
{
	static const int sigs[] = { SIGINT, SIGTERM, SIGHUP };

	for (size_t i = 0; i < sizeof(sigs) / sizeof(sigs[0]); i++) {
		struct sigaction old;

		if (sigaction(sigs[i], NULL, &old) == 0 && old.sa_handler == on_fatal_signal)
			signal(sigs[i], SIG_DFL);
	}
	for (size_t i = 0; i < SCH_LEFTOVER_PATHS; i++)
		paths[i].state = 0;
	for (size_t i = 0; i < SCH_LEFTOVER_PIDS; i++)
		pids[i] = 0;
}
