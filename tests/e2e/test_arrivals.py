#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot arrivals against outside results: Poisson counts (shared/CHECK-VALUES.md N1, N2) and
Campbell's theorem for shot noise into R||C (S. O. Rice, "Mathematical analysis of random noise",
Bell Syst. Tech. J. 23, 1944; the cumulants kappa_n = lambda * integral of h^n are the theorem, the
R||C values are derived below), and the report's band rms (K6).

Every run uses a fixed seed (1, the default), so each check is a fixed number; the tolerances are
several standard errors of the statistic for the number of windows, written next to each check.
The realisation draws each arrival as a triangular pulse two source steps wide, and the simulator
integrates it in steps of that size: for a single pole of time constant tau this lowers the output
variance by about 1 % (computed for the pulse) to 2 % (measured over seeds) at step = tau/50, which
the variance tolerances allow for."""
import math
from schrot_check import run, close, true, finish, Q


def rc_deck(i, r, c, title="shot noise of a current into R||C", extra=""):
    return f"""{title}
iph 0 out dc {i!r}
r1 out 0 {r!r} noisy=0
c1 out 0 {c!r}
{extra}.noise v(out) iph dec 50 1 1g 1
.end
"""


def campbell(i, r, c, m=1.0, f=1.0):
    """Cumulants of the R||C output for Poisson primaries at I/(qM) with gain mean M, mean square M^2 F:
    kappa_n = lambda * E[G^n] * integral of (q/C e^(-t/RC))^n dt = lambda E[G^n] (q/C)^n RC / n (Campbell)."""
    lam, tau = i / (Q * m), r * c
    mean = i * r
    var = lam * m * m * f * (Q / c) ** 2 * tau / 2      # = q I R M F / (2C)
    return lam, tau, mean, var


# --- a photon-starved receiver: 2000 electrons/s into 1 GOhm || 1 pF (tau = 1 ms, lambda*tau = 2) ---
# Invented demo values. Windows of 2 ms hold N = 4 electrons on average.
I_LOW = 2000 * Q
lam, tau, mean, var = campbell(I_LOW, 1e9, 1e-12)
N = 10000
rc_, data, out, err = run(rc_deck(I_LOW, 1e9, 1e-12, "photon-starved receiver, 2000 electrons per second"),
                          "arrivals", "--window", "2m", "--windows", str(N), "--step", "20u", "--settle", "10m",
                          "--seed", "1")
if data:
    rho = math.exp(-2e-3 / tau)  # correlation of samples one window apart
    sd_mean = math.sqrt(var * (1 + rho) / (1 - rho) / N)
    # Campbell: mean I*R; variance q*I*R/(2C) (K6's closed form, here at 0.32 fA)
    close("[Campbell] output mean = I*R (tol 5 standard errors)", data["output_mean_v"], mean, 5 * sd_mean / mean)
    # sd of the sample variance: sqrt((2 + excess kurtosis)/N) relative, excess kurtosis 1/(lambda tau), inflated
    # by (1 + rho^2)/(1 - rho^2) for correlated samples; the source's two-step pulse lowers the variance by 0.9 %
    rel_var = math.sqrt((2 + 1 / (lam * tau)) / N * (1 + rho ** 2) / (1 - rho ** 2))
    close("[Campbell] output variance = qIR/(2C) (tol 5 standard errors + 2 %)", data["output_std_v"] ** 2, var,
          5 * rel_var + 0.02)
    # third cumulant lambda (q/C)^3 tau/3 gives skewness (2 sqrt 2 / 3) / sqrt(lambda tau) = 2/3 here; the
    # sd of the sample skewness is taken as sqrt(15/N) (2.5 times the Gaussian sqrt(6/N): heavy tail, correlation)
    skew = (2 * math.sqrt(2) / 3) / math.sqrt(lam * tau)
    close("[Campbell] output skewness (2 sqrt2/3)/sqrt(lambda tau)", data["output_skewness"], skew,
          4 * math.sqrt(15 / N) / skew)
    true("[Campbell] a Gaussian would have skewness 0: the low-count output is visibly skewed",
         data["output_skewness"] > 0.4)
    c = data["counts"][0]
    true("[N] one carrier 'iph', counted over every window", c["carrier"] == "iph" and c["windows"] == N)
    # N1: mean = variance = N = 4; N2: P(0) = e^-4 = 0.018315638888734179 (GSL)
    close("[N1] count mean = N = 4", c["mean_count"], 4.0, 5 * math.sqrt(4 / N) / 4)
    close("[N1] count variance = N = 4", c["var_count"], 4.0, 5 * math.sqrt((4 + 2 * 16) / N) / 4)
    close("[N2] P(0) = e^-4", c["p_zero"], 0.018315638888734179,
          5 * math.sqrt(0.0183 * (1 - 0.0183) / N) / 0.0183)
    close("[N2] reported Poisson P(0) key", c["p_zero_poisson"], 0.018315638888734179, 1e-9)
    # N5: the normal approximation's P(0) at N = 4 is 0.040059 (118.7 % too large); the report shows it beside
    close("[N5] Gaussian P(0) beside it is Phi((0.5 - N)/sqrt N)", c["p_zero_gaussian"], 0.0400591568638171, 0.05)
    h = data["output_histogram"]
    true("[hist] output histogram holds every window", sum(h["windows"]) == N)
    hc = c["histogram"]
    true("[hist] count histogram holds every window, Poisson beside it",
         sum(hc["windows"]) == N and len(hc["poisson_windows"]) == len(hc["windows"]))

# Same seed, same numbers: a rerun gives the identical document.
rc2, data2, out2, err2 = run(rc_deck(I_LOW, 1e9, 1e-12, "photon-starved receiver, 2000 electrons per second"),
                             "arrivals", "--window", "2m", "--windows", str(N), "--step", "20u", "--settle", "10m",
                             "--seed", "1")
if data and data2:
    true("[seed] the same seed reproduces the run exactly",
         data2["output_std_v"] == data["output_std_v"] and data2["counts"][0]["p_zero"] == data["counts"][0]["p_zero"])

# --- N = 1 per window: P(0) = e^-1 = 0.36787944117144233 (CHECK-VALUES N2, GSL) ---
N1 = 20000
rc_, data, out, err = run(rc_deck(I_LOW, 1e9, 1e-12, "one electron per window"), "arrivals", "--window", "0.5m",
                          "--windows", str(N1), "--step", "0.5m", "--seed", "1")
if data:
    c = data["counts"][0]
    p0 = math.exp(-1)
    close("[N2] P(0) = e^-1 at N = 1", c["p_zero"], p0, 5 * math.sqrt(p0 * (1 - p0) / N1) / p0)
    close("[N1] count mean = variance = 1 (mean)", c["mean_count"], 1.0, 5 * math.sqrt(1 / N1))
    close("[N1] count mean = variance = 1 (variance)", c["var_count"], 1.0, 5 * math.sqrt(3 / N1))
    close("[N5] Gaussian P(0) at N = 1 is 0.30854 (16 % low)", c["p_zero_gaussian"], 0.30853753872598694, 0.05)

# --- high rate: 1 uA into 1 MOhm || 1 pF. The output variance agrees with report's band rms (K6: 283.03504 uV) ---
deck = rc_deck(1e-6, 1e6, 1e-12).replace("dec 50 1 1g", "dec 50 1.5915494309 159154943091")
rc_, rep, out, err = run(deck, "report")
NH = 10000
rc_, data, out, err = run(deck, "arrivals", "--window", "2u", "--windows", str(NH), "--step", "20n", "--settle", "10u",
                          "--seed", "1")
if rep and data:
    lam, tau, mean, var = campbell(1e-6, 1e6, 1e-12)
    close("[K6] report's band rms = sqrt(qIR/(2C))", rep["total"]["output_rms_v"], 283.03504e-6, 2e-4)
    rho = math.exp(-2.0)
    rel_sd = 0.5 * math.sqrt(2 / NH * (1 + rho ** 2) / (1 - rho ** 2))  # of the sample std
    close("[K6] arrivals output std = report's band rms (tol 4 standard errors + 1 %)", data["output_std_v"],
          rep["total"]["output_rms_v"], 4 * rel_sd + 0.01)
    close("[K6] arrivals output mean = I*R = 1 V", data["output_mean_v"], 1.0, 1e-3)
    true("[K6] 12500 electrons per window: the output is nearly Gaussian (|skewness| < 0.1)",
         abs(data["output_skewness"]) < 0.1)

# --- avalanche: gain 10, k = 0.02, F = 2.062 (CHECK-VALUES A3); output variance qIRMF/(2C) ---
NA = 5000
rc_, data, out, err = run(rc_deck(1e-9, 1e6, 1e-12, "range-finder APD at gain 10 (invented values)"), "arrivals",
                          "--window", "2u", "--windows", str(NA), "--step", "20n", "--settle", "10u",
                          "--avalanche", "iph=10:0.02", "--seed", "1")
if data:
    lam, tau, mean, var = campbell(1e-9, 1e6, 1e-12, 10, 2.062)
    rho = math.exp(-2.0)
    rel = math.sqrt((2 + 1 / (lam * tau)) / NA * (1 + rho ** 2) / (1 - rho ** 2))
    close("[A3] avalanche output variance = qIRMF/(2C) (tol 5 standard errors + 2 %)", data["output_std_v"] ** 2, var,
          5 * rel + 0.02)
    c = data["counts"][0]
    true("[A3] avalanche process and F = 2.062 reported", c["process"] == "avalanche" and abs(c["excess_factor"] - 2.062) < 1e-9)
    # primaries per window N = I T/(qM) = 1.248; electrons per window mean N M, variance N M^2 F
    n_p = 1e-9 * 2e-6 / (Q * 10)
    close("[A3] primaries per window = I T/(q M)", c["mean_count"], n_p, 5 * math.sqrt(n_p / NA) / n_p)
    close("[A3] electron variance per window = N M^2 F", c["var_electrons"], n_p * 100 * 2.062, 0.15)

# --- carriers inside subcircuits: each instance its own process, on its own nodes ---
rc_, data, out, err = run("""two-channel sensor with a photodiode cell two levels down (invented values)
.subckt diode a b params: i=1f
iph a b dc {i}
.ends
.subckt cell k params: ip=1f
xd 0 kk diode i={ip}
rs kk k 1 noisy=0
.ends
xa out cell ip=3.2e-16
xb out2 cell ip=6.4e-16
ra out 0 1g noisy=0
ca out 0 1p
rb out2 0 1g noisy=0
cb out2 0 1p
.end
""", "arrivals", "--output", "v(out)", "--window", "2m", "--windows", "2000", "--step", "50u", "--settle", "5m",
                          "--seed", "1")
if data:
    names = {c["carrier"]: c for c in data["counts"]}
    true("[sub] both nested carriers realised", set(names) == {"xa.xd.iph", "xb.xd.iph"}, repr(list(names)))
    if set(names) == {"xa.xd.iph", "xb.xd.iph"}:
        for name, i in (("xa.xd.iph", 3.2e-16), ("xb.xd.iph", 6.4e-16)):
            n = i * 2e-3 / Q
            close(f"[sub] {name} counts N = I T/q", names[name]["mean_count"], n, 5 * math.sqrt(n / 2000) / n)
        # output mean I R of xa alone (xb drives another node): Campbell's mean
        close("[sub] v(out) mean = I_xa * R (xa's source sits on its own internal node)", data["output_mean_v"],
              3.2e-16 * 1e9, 5 * math.sqrt(campbell(3.2e-16, 1e9, 1e-12)[3] * 1.3 / 2000) / 3.2e-7)

# --- the histogram plot (cairo): an SVG and a PNG are written ---
import os, tempfile
pd = tempfile.mkdtemp(prefix="schrot-e2e-plot-")
for ext, magic in (("svg", b"<?xml"), ("png", b"\x89PNG")):
    target = os.path.join(pd, "hist." + ext)
    rc_, data, out, err = run(rc_deck(I_LOW, 1e9, 1e-12), "arrivals", "--window", "2m", "--windows", "500", "--plot", target)
    ok = os.path.exists(target) and open(target, "rb").read(5).startswith(magic)
    true(f"[plot] --plot writes a {ext} histogram", ok)

# --- bad usage: exit 2 with a message ---
rc_, data, out, err = run(rc_deck(1e-12, 1e9, 1e-12), "arrivals", "--windows", "10", expect_rc=2)
true("[usage] --window is required", "needs --window" in err, err)
rc_, data, out, err = run(rc_deck(1e-12, 1e9, 1e-12), "arrivals", "--window", "1m", expect_rc=2)
true("[usage] one of --duration and --windows", "exactly one of --duration" in err, err)
# the run loads code models for its own sources; the netlist's own code-model instances stay refused
rc_, data, out, err = run(rc_deck(1e-12, 1e9, 1e-12, extra='a9 %id([0 out]) m9\n.model m9 filesource (file="/etc/hostname")\n'),
                          "arrivals", "--window", "1m", "--windows", "10", expect_rc=2)
# (the deck reader lets the data file through as an absolute path; arrivals refuses the instance)
true("[safety] a netlist's own code-model instance is refused", "code-model instance 'a9'" in err, err)
finish()
