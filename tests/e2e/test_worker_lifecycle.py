#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Workers and temporary files do not outlive schrot (issue 16, findings 5 and 6). SIGTERM, SIGINT and
SIGHUP during a long noise run end schrot with 128 + the signal's number, leave no worker process, no
temporary output (*.tmpXXXXXX) and no data directory (schrot-data-* in $TMPDIR), and keep the old
outputs byte-identical. Kills at random moments over whole runs (simulation and output writing) leave
nothing behind either. A crashing worker writes no core file even when the core limit would allow one,
a worker stuck after a failed allocation does not hang schrot, and a failed allocation in schrot
itself is reported. The contract is DESIGN.md section 6 and docs/security.md; no outside source."""
import os
import random
import resource
import shutil
import signal
import subprocess
import tempfile
import time

from schrot_check import SCHROT, true, finish

# A sanitizer build reserves more address space than the limits below allow (it may not even load
# its libraries under them), so those two checks only run on a plain build.
with open(SCHROT, "rb") as _f:
    SANITIZED = b"__asan_init" in _f.read()

# An RC ladder of our own with a long linear noise sweep: about 20 s of simulator work.
LADDER = ["long ladder", "iph 0 n0 dc 1n"]
for i in range(200):
    LADDER += ["r%d n%d n%d 1k" % (i, i, i + 1), "c%d n%d 0 1p" % (i, i + 1)]
LADDER += ["rl n200 0 1meg", ".noise v(n200) iph lin 90000 1 1meg", ".end", ""]
LONG = "\n".join(LADDER)

# A light probe of our own invention, quick to run, with every output file.
QUICK = """kill at random
iph 0 a dc 2n ac 1
d1 a 0 dpd
.model dpd d is=10f
rf a out 1meg
rl out 0 100meg
.noise v(out) iph dec 5000 1 100k
.end
"""
OUTPUTS = {"--json": "r.json", "--csv": "r.csv", "--spectrum": "s.csv", "--plot": "p.svg", "--html": "r.html"}


def children(pid):
    out = []
    try:
        for t in os.listdir("/proc/%d/task" % pid):
            with open("/proc/%d/task/%s/children" % (pid, t)) as f:
                out += [int(c) for c in f.read().split()]
    except OSError:
        pass
    return out


def alive(pid):
    """A process that exists and is not a zombie."""
    try:
        with open("/proc/%d/stat" % pid) as f:
            return f.read().rsplit(")", 1)[1].split()[0] != "Z"
    except OSError:
        return False


def leftovers(work, tmp):
    found = [n for n in os.listdir(work) if ".tmp" in n]
    found += [n for n in os.listdir(tmp)]
    return found


def setup(text):
    work = tempfile.mkdtemp(prefix="schrot-life-")
    tmp = os.path.join(work, "tmp")
    os.makedirs(tmp)
    with open(os.path.join(work, "in.cir"), "w") as f:
        f.write(text)
    old = {}
    for opt, name in OUTPUTS.items():
        old[name] = ("old %s\n" % name).encode()
        with open(os.path.join(work, name), "wb") as f:
            f.write(old[name])
    env = dict(os.environ, TMPDIR=tmp)
    return work, tmp, old, env


def outputs_args(work):
    args = []
    for opt, name in OUTPUTS.items():
        args += [opt, os.path.join(work, name)]
    return args


def old_intact(work, old):
    for name, data in old.items():
        with open(os.path.join(work, name), "rb") as f:
            if f.read() != data:
                return False
    return True


def signal_during_run(sig):
    work, tmp, old, env = setup(LONG)
    proc = subprocess.Popen([SCHROT, "report", "in.cir", "-q"] + outputs_args(work), cwd=work, env=env,
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    workers, deadline = [], time.time() + 60
    while time.time() < deadline and proc.poll() is None:
        workers = children(proc.pid)
        if workers and os.listdir(tmp):
            break
        time.sleep(0.05)
    time.sleep(0.5)
    running = proc.poll() is None
    proc.send_signal(sig)
    try:
        rc = proc.wait(timeout=30)
    except subprocess.TimeoutExpired:
        proc.kill()
        rc = proc.wait()
    proc.stderr.close()
    time.sleep(0.5)
    name = signal.Signals(sig).name
    true("[S] %s during a run: a worker and the data directory existed when it came" % name,
         running and workers and True, "running %s, workers %r" % (running, workers))
    true("[S] %s during a run: exit %d" % (name, 128 + sig), rc == 128 + sig, "got %r" % rc)
    survivors = [w for w in workers if alive(w)]
    for w in survivors:
        os.kill(w, signal.SIGKILL)
    true("[S] %s during a run: no worker survives" % name, not survivors, str(survivors))
    true("[S] %s during a run: no temporary file or data directory" % name, not leftovers(work, tmp),
         str(leftovers(work, tmp)))
    true("[S] %s during a run: old outputs intact" % name, old_intact(work, old))
    shutil.rmtree(work, ignore_errors=True)


def sigkill_during_run():
    """SIGKILL cannot be handled: the workers must still die with schrot (PR_SET_PDEATHSIG). The data
    directory may stay behind then (docs/security.md says so); it is removed here."""
    work, tmp, old, env = setup(LONG)
    proc = subprocess.Popen([SCHROT, "report", "in.cir", "-q"], cwd=work, env=env,
                            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    workers, deadline = [], time.time() + 60
    while time.time() < deadline and proc.poll() is None and not workers:
        workers = children(proc.pid)
        time.sleep(0.05)
    time.sleep(0.5)
    proc.kill()
    proc.wait()
    deadline = time.time() + 5
    while time.time() < deadline and [w for w in workers if alive(w)]:
        time.sleep(0.1)
    survivors = [w for w in workers if alive(w)]
    for w in survivors:
        os.kill(w, signal.SIGKILL)
    true("[S] SIGKILL during a run: a worker existed", bool(workers))
    true("[S] SIGKILL during a run: no worker survives schrot by more than 5 s", not survivors, str(survivors))
    shutil.rmtree(work, ignore_errors=True)


def contents(work):
    out = {}
    for name in OUTPUTS.values():
        with open(os.path.join(work, name), "rb") as f:
            out[name] = f.read()
    return out


def random_kills(n, seed):
    """Each kill leaves either every old output or every new one (the outputs are renamed as a batch).
    A signal before schrot's main has run kills it by the default action (exit -sig): nothing exists yet."""
    rng = random.Random(seed)
    work, tmp, old, env = setup(QUICK)
    t0 = time.time()
    subprocess.run([SCHROT, "report", "in.cir", "-q"] + outputs_args(work), cwd=work, env=env,
                   capture_output=True, timeout=120)
    full = time.time() - t0
    new = contents(work)
    bad = []
    for k in range(n):
        for name, data in old.items():
            with open(os.path.join(work, name), "wb") as f:
                f.write(data)
        sig = rng.choice([signal.SIGTERM, signal.SIGINT, signal.SIGHUP])
        proc = subprocess.Popen([SCHROT, "report", "in.cir", "-q"] + outputs_args(work), cwd=work, env=env,
                                stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        time.sleep(rng.uniform(0.0, 1.2 * full))
        workers = children(proc.pid)
        proc.send_signal(sig)
        rc = proc.wait(timeout=30)
        time.sleep(0.2)
        got = contents(work)
        if rc not in (0, 128 + sig, -sig):
            bad.append("kill %d: exit %r" % (k, rc))
        if got != old and got != new:
            bad.append("kill %d: a mix of old and new outputs" % k)
        if rc == 0 and got != new:
            bad.append("kill %d: exit 0 without the new outputs" % k)
        if leftovers(work, tmp):
            bad.append("kill %d: left %r" % (k, leftovers(work, tmp)))
            for n_ in os.listdir(tmp):
                shutil.rmtree(os.path.join(tmp, n_), ignore_errors=True)
        if [w for w in workers if alive(w)]:
            bad.append("kill %d: a worker survived" % k)
    true("[S] %d kills at random moments of a %.2f s run leave nothing behind" % (n, full), not bad, "; ".join(bad))
    shutil.rmtree(work, ignore_errors=True)


def no_core_file():
    work, tmp, old, env = setup("recursive function\n.func f(x) {f(x)+1}\niph 0 a dc 1n\nr1 a 0 {f(1)}\n"
                                ".noise v(a) iph dec 10 1 1k\n.end\n")

    def allow_cores():
        resource.setrlimit(resource.RLIMIT_CORE, (resource.RLIM_INFINITY, resource.RLIM_INFINITY))
    env["ASAN_OPTIONS"] = (env.get("ASAN_OPTIONS", "") + ":handle_segv=0").lstrip(":")
    proc = subprocess.run([SCHROT, "report", "in.cir"], cwd=work, env=env, capture_output=True, text=True,
                          timeout=120, preexec_fn=allow_cores)
    cores = [n for n in os.listdir(work) if n.startswith("core")]
    true("[S] crashing worker: exit 3", proc.returncode == 3, proc.stderr)
    true("[S] crashing worker: no core file in the working directory", not cores, str(cores))
    shutil.rmtree(work, ignore_errors=True)


def stuck_worker():
    """Under an inherited 40 MiB address-space limit the library deadlocks on a failed allocation."""
    lines = ["wide ladder", "iph 0 n0 dc 1n"]
    for i in range(20000):
        lines += ["r%d n%d n%d 1k" % (i, i, i + 1), "c%d n%d 0 1p" % (i, i + 1)]
    lines += ["rl n20000 0 1meg", ".noise v(n20000) iph dec 1 1 10", ".end", ""]
    work, tmp, old, env = setup("\n".join(lines))

    def limit():
        resource.setrlimit(resource.RLIMIT_AS, (40 << 20, 40 << 20))
    try:
        proc = subprocess.run([SCHROT, "carriers", "in.cir"], cwd=work, env=env, capture_output=True, text=True,
                              timeout=90, preexec_fn=limit)
        rc, err = proc.returncode, proc.stderr
    except subprocess.TimeoutExpired:
        rc, err = None, "no answer within 90 s"
    if SANITIZED or "Sanitizer" in err:
        print("skip worker out of address space: a sanitizer build cannot start under the limit")
        shutil.rmtree(work, ignore_errors=True)
        return
    true("[S] worker out of address space: exit 3 within 90 s", rc == 3, err)
    true("[S] worker out of address space: the cause is named",
         "out of memory" in err or "hung" in err, err)
    shutil.rmtree(work, ignore_errors=True)


def tool_out_of_memory():
    lines = ["million", "iph 0 n0 dc 1n"] + ["r%d n%d n%d 1k" % (i, i, i + 1) for i in range(1000000)]
    work, tmp, old, env = setup("\n".join(lines + ["rlast n1000000 0 1.2.3k", ".end", ""]))

    def limit():
        resource.setrlimit(resource.RLIMIT_AS, (100 << 20, 100 << 20))
    env["ASAN_OPTIONS"] = "detect_leaks=0"
    proc = subprocess.run([SCHROT, "carriers", "in.cir"], cwd=work, env=env, capture_output=True, text=True,
                          timeout=120, preexec_fn=limit)
    if SANITIZED or "Sanitizer" in proc.stderr:
        print("skip tool out of memory: a sanitizer build reserves more address space than the limit")
    else:
        true("[S] schrot out of memory: exit 2 with a message", proc.returncode == 2 and
             "error: out of memory" in proc.stderr, "%r %r" % (proc.returncode, proc.stderr[-300:]))
    shutil.rmtree(work, ignore_errors=True)


for s in (signal.SIGTERM, signal.SIGINT, signal.SIGHUP):
    signal_during_run(s)
sigkill_during_run()
random_kills(20, 16)
no_core_file()
stuck_worker()
tool_out_of_memory()
finish()
