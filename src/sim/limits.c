/* SPDX-License-Identifier: BSD-3-Clause */
/*
 * limits.c - a worker process's limits: the CPU, memory and file-size budget, no core file, death
 * with the tool, and crashes told as what they are (out of memory or a signal).
 */
#include <errno.h>
#include <fcntl.h>
#include <signal.h>
#include <stdbool.h>
#include <stdlib.h>
#include <string.h>
#include <sys/mman.h>
#include <sys/resource.h>
#include <sys/types.h>
#include <unistd.h>
#ifdef __linux__
#include <sys/prctl.h>
#endif

#include "schrot/leftover.h"
#include "sim_int.h"

/*
 * AddressSanitizer reserves terabytes of shadow memory at start, which RLIMIT_DATA counts: in such
 * a build the budget is counted from what the worker already has when it starts.
 */
#if defined(__SANITIZE_ADDRESS__)
#define SCH_SIM_BUDGET_ON_TOP 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
#define SCH_SIM_BUDGET_ON_TOP 1
#endif
#endif
#ifndef SCH_SIM_BUDGET_ON_TOP
#define SCH_SIM_BUDGET_ON_TOP 0
#endif

/* The process's data size (VmData) in bytes, 0 when unknown. */
static double data_size_now(void)
{
	char buf[4096];
	const char *p;
	ssize_t n;
	int fd = open("/proc/self/status", O_RDONLY | O_CLOEXEC);

	if (fd < 0)
		return 0;
	n = read(fd, buf, sizeof(buf) - 1);
	close(fd);
	if (n <= 0)
		return 0;
	buf[n] = '\0';
	p = strstr(buf, "VmData:");
	return p ? 1024.0 * strtod(p + 7, NULL) : 0;
}

/* ---- the workers' budget --------------------------------------------------------------- */

static struct sch_sim_budget sch_budget = { SCH_SIM_DEFAULT_CPU_S, SCH_SIM_DEFAULT_MEM_MIB };

void sch_sim_set_budget(const struct sch_sim_budget *b)
{
	if (b && b->cpu_s > 0)
		sch_budget.cpu_s = b->cpu_s;
	if (b && b->mem_mib > 0)
		sch_budget.mem_mib = b->mem_mib;
}

struct sch_sim_budget sch_sim_get_budget(void)
{
	return sch_budget;
}

static void set_limit(int resource, double soft, double hard)
{
	struct rlimit rl;

	if (getrlimit(resource, &rl) != 0)
		return;
	/* never above what we were given: an unprivileged process cannot raise its hard limit */
	if (rl.rlim_max == RLIM_INFINITY || (double)rl.rlim_max > hard)
		rl.rlim_max = (rlim_t)hard;
	rl.rlim_cur = (double)rl.rlim_max < soft ? rl.rlim_max : (rlim_t)soft;
	setrlimit(resource, &rl);
}

/*
 * A library that does not check an allocation crashes on the NULL it got. errno still says
 * ENOMEM then (nothing since has failed), or the budget has no room left, so the crash is told
 * as what it is: out of memory.
 * Anything else stays the crash it was.
 */
static void worker_on_crash(int sig)
{
	void *probe;

	if (errno == ENOMEM)
		_exit(SCH_WORKER_EXIT_NOMEM);
	/* or the budget is nearly spent: a quarter MiB more is not to be had */
	probe = mmap(NULL, 1 << 18, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
	if (probe == MAP_FAILED)
		_exit(SCH_WORKER_EXIT_NOMEM);
	signal(sig, SIG_DFL);
	raise(sig);
}

/* In the worker: SIGINT, SIGTERM and SIGHUP as the tool got them (default, or ignored under nohup). */
static bool worker_ignores[3];
static const int worker_stop_signals[3] = { SIGINT, SIGTERM, SIGHUP };

void sch_sim_catch_crashes(void)
{
	/*
	 * The library's start-up catches SIGINT to interrupt an analysis, which would end a run early
	 * with a result that looks whole: a worker dies of these signals instead, or ignores them
	 * as the tool does.
	 */
	for (size_t i = 0; i < 3; i++)
		signal(worker_stop_signals[i], worker_ignores[i] ? SIG_IGN : SIG_DFL);
	static char alt_stack[64 * 1024]; /* a stack overflow leaves no room on the ordinary one */
	stack_t ss = { .ss_sp = alt_stack, .ss_size = sizeof(alt_stack) };
	struct sigaction sa;

	memset(&sa, 0, sizeof(sa));
	sa.sa_handler = worker_on_crash;
	sa.sa_flags = SA_ONSTACK | SA_RESETHAND;
	if (sigaltstack(&ss, NULL) != 0)
		return;
	sigaction(SIGSEGV, &sa, NULL);
	sigaction(SIGBUS, &sa, NULL);
}

/*
 * In the child: the budget, no core file (a crash must not drop 10 MB into the user's working
 * directory), and death with the tool. The CPU soft limit sends SIGXCPU; the hard one, a little
 * later, SIGKILL, should the library catch the first.
 */
void sch_sim_worker_process_setup(pid_t parent)
{
	double mem = sch_budget.mem_mib * 1048576.0;

#ifdef __linux__
	prctl(PR_SET_PDEATHSIG, SIGKILL);
#endif
	if (getppid() != parent)
		_exit(3); /* the tool died before the line above took effect */
	for (size_t i = 0; i < 3; i++) {
		struct sigaction sa;

		worker_ignores[i] = sigaction(worker_stop_signals[i], NULL, &sa) == 0 && sa.sa_handler == SIG_IGN;
	}
	sch_leftover_forget_in_child();
	/* the tool's own crash handlers (a sanitizer's, a fuzzer's) are not the worker's business */
	signal(SIGPIPE, SIG_DFL);
	signal(SIGABRT, SIG_DFL);
	signal(SIGILL, SIG_DFL);
	signal(SIGFPE, SIG_DFL);
	set_limit(RLIMIT_CORE, 0, 0);
	set_limit(RLIMIT_CPU, sch_budget.cpu_s, sch_budget.cpu_s + 5);
	if (SCH_SIM_BUDGET_ON_TOP)
		set_limit(RLIMIT_DATA, data_size_now() + mem, data_size_now() + mem);
	else
		set_limit(RLIMIT_DATA, mem, mem);
	set_limit(RLIMIT_FSIZE, mem, mem);
	sch_sim_catch_crashes();
}
