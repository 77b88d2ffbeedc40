#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""No command execution, tried as an attacker would: every path of NGSPICE-NOTES.md section 5 (.control
blocks, '*#' lines, script titles, all of them inside .include and .lib files, spinit, .spiceinit in the
working and in the account's home directory), names and values from the netlist or the command line
that could reach a simulator command (backquotes, ';', '>'), and the deck schrot augment writes for
plain ngspice. Each case plants a command that would create a marker file and checks that the file
never appears. Also: includes of a FIFO and /dev/stdin do not block, and an .include or .lib of
/etc/passwd shows none of its text. The contract is DESIGN.md section 6; no outside source."""
import os
import pwd
import shutil
import subprocess
import tempfile

from schrot_check import SCHROT, true, finish

BASE = """{title}
iph 0 a dc 1n
d1 a 0 dpd
rf a 0 1meg
.model dpd d is=10f
{extra}
.noise v(a) iph dec 10 1 1k
.end
"""


def shell(marker):
    """A simulator command that creates marker: the thing that must never happen."""
    return "shell touch %s" % marker


def attempt(label, files, args=("carriers",), env=None, rc=(0,), markers=1, stdin=None, netlist="input.cir"):
    """Writes files (text with {m0}, {m1}, ... standing for marker paths) into a fresh directory, runs
    schrot there and checks the exit code and that no marker exists. Returns (rc, stdout, stderr)."""
    d = tempfile.mkdtemp(prefix="schrot-sec-")
    marks = [os.path.join(d, "pwned_%d" % i) for i in range(markers)]
    subs = {"m%d" % i: m for i, m in enumerate(marks)}
    subs.update({"s%d" % i: shell(m) for i, m in enumerate(marks)})
    for name, text in files.items():
        path = os.path.join(d, name)
        os.makedirs(os.path.dirname(path), exist_ok=True)
        with open(path, "w") as f:
            f.write(text.format(**subs))
    full_env = dict(os.environ)
    full_env.update(env or {})
    for k, v in list(full_env.items()):
        full_env[k] = v.replace("{dir}", d)
    cmd = [SCHROT, args[0], netlist] + [a.format(**subs) for a in args[1:]]
    try:
        proc = subprocess.run(cmd, cwd=d, env=full_env, capture_output=True, text=True, timeout=120,
                              stdin=stdin if stdin is not None else subprocess.DEVNULL)
        got_rc, out, err = proc.returncode, proc.stdout, proc.stderr
    except subprocess.TimeoutExpired:
        got_rc, out, err = None, "", "timed out"
    true("[S] %s: exit %s" % (label, "/".join(map(str, rc))), got_rc in rc, "got %r: %s" % (got_rc, err))
    true("[S] %s: no marker file" % label, not any(os.path.exists(m) for m in marks),
         str([m for m in marks if os.path.exists(m)]))
    shutil.rmtree(d, ignore_errors=True)
    return got_rc, out, err


def deck(extra="", title="security path"):
    return BASE.format(title=title, extra=extra)


# 1. .control blocks, in every spelling ngspice accepts (case-insensitive prefix, leading blanks)
attempt(".control block", {"input.cir": deck(".control\n{s0}\n.endc")})
attempt("indented upper-case .CONTROL", {"input.cir": deck("   .CONTROL\n{s0}\n.ENDC")})
attempt(".controlX prefix", {"input.cir": deck(".controlX\n{s0}\n.endc")})
attempt("pre_ command in .control", {"input.cir": deck(".control\npre_{s0}\n.endc")})
attempt(".control inside a .subckt", {"input.cir": deck(".subckt cell p\nr1 p 0 1k\n.control\n{s0}\n.endc\n.ends")})
attempt(".control with no .endc", {"input.cir": deck(".control\n{s0}")})
# 2. '*#' lines
attempt("'*#' line", {"input.cir": deck("*#{s0}")})
attempt("indented '*#' line", {"input.cir": deck("   *#  {s0}")})
# 3. script titles
# (the script's 'shell' line is read as an element the simulator then rejects: exit 3, nothing run)
attempt("'*ng_script' title", {"input.cir": deck("{s0}", title="*ng_script harmless looking title")}, rc=(3,))
attempt("'*NG_SCRIPT' title", {"input.cir": deck("{s0}", title="*NG_SCRIPT")}, rc=(3,))
attempt("'*ng_script' after a blank first line",
        {"input.cir": "\n*ng_script\n" + deck("{s0}").split("\n", 1)[1]}, rc=(3,))
# 3b. cards the simulator acts on by its own prefix rules (issue 16): a .title card copied over the
# title line, measurement cards with a measurement file, command-language variables, and options read
# when the next circuit is loaded; all caught by the reader's allow-list
attempt("'.title *ng_script' card", {"input.cir": deck(".title *ng_script\n{s0}")}, rc=(2,))
attempt("'.TITLEx *NG_SCRIPT' card in an .include", {"input.cir": deck(".include parts.inc"),
        "parts.inc": "r9 a 0 1g\n.TITLEx   *NG_SCRIPT\n{s0}\necho x `touch {m1}` y 1\n"}, rc=(2,), markers=2)
attempt(".options measoutfile with a '.meas(x)' card", {"input.cir": deck(
        ".options measoutfile={m0}\n.meas(x) noise pk max v(a)")}, args=("report",))
attempt("'.OPTX measoutfile' with '.Measure=y'", {"input.cir": deck(
        ".OPTX measoutfile={m0}\n.Measure=y op pk find v(a)")})
attempt("'.csparam' with a backquote", {"input.cir": deck(".csparam big=`touch {m0}`")}, args=("report",))
attempt("'.options addcontrol rawfile' over a sweep's reloads", {"input.cir": deck(
        ".options addcontrol rawfile={m0}")}, args=("sweep", "--vary", "iph=1n:2n:3"))
# 4. the same inside .include and .lib files, nested
attempt(".control in an .include file", {"input.cir": deck(".include parts.inc"),
                                          "parts.inc": "r9 a 0 10meg\n.control\n{s0}\n.endc\n"})
attempt("'*#' in a nested .include", {"input.cir": deck(".include sub/one.inc"),
                                      "sub/one.inc": ".include two.inc\n", "sub/two.inc": "*#{s0}\nr9 a 0 10meg\n"})
attempt("'*ng_script' as the first line of an .include", {"input.cir": deck(".include parts.inc"),
                                                          "parts.inc": "*ng_script\n{s0}\nr9 a 0 10meg\n"}, rc=(3,))
attempt(".control and '*#' in the wanted .lib section",
        {"input.cir": deck(".lib models.lib typ"),
         "models.lib": ".lib typ\n*#{s0}\n.control\n{s1}\n.endc\nr9 a 0 10meg\n.endl typ\n"}, markers=2)
attempt(".control in a .lib section nobody asked for",
        {"input.cir": deck(".lib models.lib typ"),
         "models.lib": ".lib fast\n.control\n{s0}\n.endc\n.endl fast\n.lib typ\nr9 a 0 10meg\n.endl typ\n"})
attempt(".include inside a .control block is never read",
        {"input.cir": deck(".control\n.include evil.inc\n.endc"), "evil.inc": "*#{s0}\n"})
attempt("carriage returns hiding a .control block in one line",
        {"input.cir": deck("r8 a 0 1g\r.control\r{s0}\r.endc")}, rc=(2,))
# 5. start-up scripts
attempt("spinit through SPICE_SCRIPTS", {"input.cir": deck(), "scripts/spinit": "{s0}\n"},
        env={"SPICE_SCRIPTS": "{dir}/scripts"})
attempt("spinit through SPICE_LIB_DIR", {"input.cir": deck(), "lib/scripts/spinit": "{s0}\n"},
        env={"SPICE_LIB_DIR": "{dir}/lib"})
attempt(".spiceinit in the working directory", {"input.cir": deck(), ".spiceinit": "{s0}\n"})
attempt(".spiceinit in $HOME", {"input.cir": deck(), "home/.spiceinit": "{s0}\n"}, env={"HOME": "{dir}/home"})
# The library reads the account's home from the password database, not $HOME. The planted file only
# fires for our own run (a script tests a variable set in schrot's environment alone; '$' itself would
# be expanded by the simulator), so plain ngspice runs of other tests at the same moment are
# unaffected; an existing file is never touched.
home = pwd.getpwuid(os.getuid()).pw_dir
home_init = os.path.join(home, ".spiceinit")
if os.path.isdir(home) and os.access(home, os.W_OK) and not os.path.lexists(home_init):
    probe = tempfile.mkdtemp(prefix="schrot-sec-home-")
    marker = os.path.join(probe, "pwned_home")
    try:
        with open(os.path.join(probe, "fire.sh"), "w") as f:
            f.write('test "$SCHROT_HOME_PROBE" = %s && touch %s\n' % (os.path.basename(probe), marker))
        with open(home_init, "w") as f:
            f.write("shell sh %s\n" % os.path.join(probe, "fire.sh"))
        attempt(".spiceinit in the account's home directory", {"input.cir": deck()},
                env={"SCHROT_HOME_PROBE": os.path.basename(probe), "HOME": "/nonexistent"})
        true("[S] ... and it was not run either", not os.path.exists(marker))
        # the probe itself works: plain ngspice does run that file
        if shutil.which("ngspice"):
            plain = os.path.join(probe, "plain.cir")
            with open(plain, "w") as f:
                f.write(deck())
            subprocess.run(["ngspice", "-b", plain], cwd=probe, capture_output=True, timeout=120,
                           env=dict(os.environ, SCHROT_HOME_PROBE=os.path.basename(probe)))
            true("[S] the home .spiceinit probe does fire for plain ngspice", os.path.exists(marker))
    finally:
        os.remove(home_init)
        shutil.rmtree(probe, ignore_errors=True)
else:
    print("skip the account's home .spiceinit: %s exists or the home is not writable" % home_init)

# 6. names and values from the netlist that could reach simulator commands or quantity reads (names hold
# no blanks, so the planted command redirects instead: `id>MARKER`)
HOSTILE = """hostile names
iin 0 a dc 0 ac 1
iph`id>{m0}`x 0 a dc 1n
d`id>{m1}` a 0 dpd
r$x>y a 0 1meg
.model dpd d is=10f
.subckt s`id>{m2}` p
ipd`id>{m3}` 0 p dc 1n
.ends
x`id>{m4}` a s`id>{m2}`
.noise v(a) iin dec 10 1 1k
.end
"""
attempt("backquoted element and instance names in a report (quantity reads)", {"input.cir": HOSTILE},
        args=("report",), markers=5)
attempt("backquoted names listed by carriers", {"input.cir": HOSTILE}, markers=5)
# augment's deck is plain (no .control block, no command built from a name): the hostile names only
# reach cards, which plain ngspice parses and never evaluates. Run it and look for the markers.
hostile_dir = tempfile.mkdtemp(prefix="schrot-sec-")
hostile_marks = [os.path.join(hostile_dir, "pwned_%d" % i) for i in range(5)]
with open(os.path.join(hostile_dir, "input.cir"), "w") as f:
    f.write(HOSTILE.format(**{"m%d" % i: m for i, m in enumerate(hostile_marks)}))
proc = subprocess.run([SCHROT, "augment", "input.cir", "-o", "aug.cir"], cwd=hostile_dir, capture_output=True,
                      text=True, timeout=120)
true("[S] backquoted instance names: augment writes a plain deck (no .control block)", proc.returncode == 0 and
     ".control" not in open(os.path.join(hostile_dir, "aug.cir")).read().lower(), proc.stderr)
if proc.returncode == 0:
    subprocess.run(["ngspice", "-b", "-r", "out.raw", "aug.cir"], cwd=hostile_dir, capture_output=True, timeout=120,
                   stdin=subprocess.DEVNULL)
true("[S] ... and plain ngspice running that deck creates no marker file",
     not any(os.path.exists(m) for m in hostile_marks), str([m for m in hostile_marks if os.path.exists(m)]))
shutil.rmtree(hostile_dir, ignore_errors=True)
attempt("a backquote in a .param value", {"input.cir": deck(".param p=`touch {m0}`\nrp a 0 {{p}}")}, rc=(2, 3))
attempt("a backquote in a .noise output", {"input.cir": deck().replace(".noise v(a)", ".noise v(a`touch {m0}`)")},
        args=("report",), rc=(2,))
attempt("';' and '>' in a .noise output", {"input.cir": deck().replace(".noise v(a)", ".noise v(a)>{m0};{s1}")},
        args=("report",), rc=(2,), markers=2)
attempt("--output with ';'", {"input.cir": deck().replace(".noise v(a) iph dec 10 1 1k", "")},
        args=("report", "--output", "v(a);{s0}", "--input", "iph", "--freq", "1:1k"), rc=(2,))
attempt("--output with a backquote", {"input.cir": deck().replace(".noise v(a) iph dec 10 1 1k", "")},
        args=("report", "--output", "v(`touch {m0}`)", "--input", "iph", "--freq", "1:1k"), rc=(2,))
attempt("--input with a backquote and ';'", {"input.cir": deck().replace(".noise v(a) iph dec 10 1 1k", "")},
        args=("report", "--output", "v(a)", "--input", "i`touch {m0}`;x", "--freq", "1:1k"), rc=(2,))
attempt("--vary with a backquote and ';'", {"input.cir": deck()},
        args=("sweep", "--vary", "iph`touch {m0}`;{s1}=1n:1u:3"), rc=(2,), markers=2)
attempt("a backquoted .param swept by --vary", {"input.cir": deck(".param lvl`touch {m0}`=1n")},
        args=("sweep", "--vary", "lvl`touch {m0}`=1n:1u:3"), rc=(2, 3))

# 7. files that are not netlists
d = tempfile.mkdtemp(prefix="schrot-sec-")
with open(os.path.join(d, "input.cir"), "w") as f:
    f.write(deck(".include pipe.inc"))
os.mkfifo(os.path.join(d, "pipe.inc"))
try:
    proc = subprocess.run([SCHROT, "carriers", "input.cir"], cwd=d, capture_output=True, text=True, timeout=30)
    true("[S] an .include of a FIFO fails at once (exit 2, not a hang)", proc.returncode == 2, proc.stderr)
except subprocess.TimeoutExpired:
    true("[S] an .include of a FIFO fails at once (exit 2, not a hang)", False, "timed out")
shutil.rmtree(d, ignore_errors=True)
attempt("an .include of /dev/stdin does not read the pipe", {"input.cir": deck(".include /dev/stdin")}, rc=(2,),
        stdin=subprocess.PIPE)
with open("/etc/passwd") as f:
    first = f.readline().strip()
secret = first.split(":")[0] + ":" + first.split(":")[1] if ":" in first else first
for label, extra in (("an .include of /etc/passwd", ".include /etc/passwd"),
                     ("a .lib of /etc/passwd", ".lib /etc/passwd root")):
    rc, out, err = attempt(label + " is exit 2", {"input.cir": deck(extra)}, args=("carriers", "-v"), rc=(2,))
    true("[S] %s shows none of the file's text" % label, secret not in out and secret not in err and
         "/bin/" not in err, err)
    true("[S] %s gives one line on stderr" % label, len(err.splitlines()) == 1, err)


# 8. code models that read a data file the netlist names: the file is checked like an include and
#    reaches the simulator only as an absolute path free of command characters
TABLE2D = ('apd a 0 %id(0 a) resp\n'
           '.model resp table2d (offset=0.0 gain=1.0 order=2 file="{name}")\n')
TABLE = "* invented\n2\n2\n0 1\n0 1\n0 1e-9\n0 1e-9\n"
for label, name in (("a backquote", "t`touch pwned_0`.table"), ("a ';' and a shell word", "t;shell touch pwned_0.table"),
                    ("a '$' variable", "t$HOME.table"), ("a '>' redirection", "t>pwned_0.table")):
    attempt("a code model's data file named with %s" % label,
            {"input.cir": deck(TABLE2D.format(name=name)), name: TABLE}, rc=(2,))
attempt("a code model's data file that is a device", {"input.cir": deck(TABLE2D.format(name="/dev/zero"))}, rc=(2,))
attempt("a code model's data file holding simulator commands",
        {"input.cir": deck(TABLE2D.format(name="cmds.table")), "cmds.table": ".control\n{s0}\n.endc\n*#{s0}\n"},
        rc=(0, 2, 3))  # read as (bad) numbers by the model, or refused: never run as commands
d = tempfile.mkdtemp(prefix="schrot-sec-")
with open(os.path.join(d, "input.cir"), "w") as f:
    f.write(deck(TABLE2D.format(name="pipe.table")))
os.mkfifo(os.path.join(d, "pipe.table"))
try:
    proc = subprocess.run([SCHROT, "carriers", "input.cir"], cwd=d, capture_output=True, text=True, timeout=30)
    true("[S] a code model's data file that is a FIFO fails at once (exit 2, not a hang)", proc.returncode == 2,
         proc.stderr)
except subprocess.TimeoutExpired:
    true("[S] a code model's data file that is a FIFO fails at once (exit 2, not a hang)", False, "timed out")
shutil.rmtree(d, ignore_errors=True)
attempt("a d_process code model", {"input.cir": deck('.model p d_process (process_file="/bin/sh")')}, rc=(2,))
attempt("a d_cosim code model", {"input.cir": deck('.model c d_cosim simulation="./x.so"')}, rc=(2,))

finish()
