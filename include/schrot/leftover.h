/* SPDX-License-Identifier: BSD-3-Clause */
/* leftover.h - what a fatal signal must not leave behind: temporary files, data directories, worker processes. */
#ifndef SCH_LEFTOVER_H
#define SCH_LEFTOVER_H

#include <signal.h>
#include <stdbool.h>
#include <sys/types.h>

/*
 * Registers path for removal if SIGINT, SIGTERM or SIGHUP ends the tool: a file is unlinked, a
 * directory (is_dir) loses its entries (one level) and is removed. The registry has fixed room;
 * a path that does not fit (too long, registry full) is simply not guarded: this never fails the
 * caller. The path is copied.
 */
void sch_leftover_add_path(const char *path, bool is_dir);

/* Forgets path again (after it was removed or renamed into place). No-op when it is not registered. */
void sch_leftover_drop_path(const char *path);

/* Removes a registered path now, as a signal would (a directory with its entries, two levels), and forgets it. */
void sch_leftover_remove_now(const char *path);

/* Registers a worker process: a fatal signal kills and reaps it before removing paths. */
void sch_leftover_add_pid(pid_t pid);

/* Forgets a worker process (after it was reaped). No-op when it is not registered. */
void sch_leftover_drop_pid(pid_t pid);

/*
 * Installs the handlers for SIGINT, SIGTERM and SIGHUP: they kill and reap the registered workers,
 * remove the registered paths and end the process with status 128 + the signal's number. Only
 * async-signal-safe calls run in the handler. Call once, from main.
 */
void sch_leftover_install(void);

/*
 * Holds SIGINT, SIGTERM and SIGHUP back (saving the mask in *old) while a temporary path or a
 * worker is created and registered, so that no signal falls between the two; release restores
 * the mask, and a signal that came meanwhile is handled then. These can't fail.
 */
void sch_leftover_hold(sigset_t *old);
void sch_leftover_release(const sigset_t *old);

/* In a forked child: the signals get their default actions again and the registry is emptied. */
void sch_leftover_forget_in_child(void);

#endif
