#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Referral through the transfer on a transimpedance stage of our own (1 MOhm feedback, pole at
1 kHz, a 1 nA photocurrent, a band far past the bandwidth): the transfer's mid-band value, -3 dB
point and noise-equivalent bandwidth against the single-pole closed form, and SNR, input-referred
rms and NEP against a hand calculation at the output (shared/CHECK-VALUES.md row IDs in brackets)."""
import math
from schrot_check import run, close, true, finish, Q, K

RF = 1e6            # feedback resistor, ohm
FC = 1e3            # its pole with CF, Hz
PI = 3.14159265358979
I_PH = 1e-9         # the photocurrent, A (also the signal)
T = 300.15          # the simulator's default 27 C
R0 = 0.5            # responsivity, A/W
A_OL = 1e9          # the amplifier's gain: ideal to 1e-9

TIA = f"""transimpedance stage of our own: 1 MOhm feedback, pole at 1 kHz, 1 nA photocurrent
iph 0 inv dc 1n
rf inv out 1meg
cf inv out {{1/(2*{PI}*1meg*1k)}}
e1 out 0 0 inv {A_OL:g}
.noise v(out) iph dec 100 1 1meg 1
.end
"""


def h2(f):
    """|H|^2 of the single pole: RF^2 / (1 + (f/FC)^2), V^2/A^2."""
    return RF * RF / (1 + (f / FC) ** 2)


def pole_integral(f1, f2):
    """Integral of |H|^2 over [f1, f2]: RF^2 FC (atan(f2/FC) - atan(f1/FC)) (the arctan form of K9)."""
    return RF * RF * FC * (math.atan(f2 / FC) - math.atan(f1 / FC))


# The input-referred density is white: the feedback resistor's 4kT/RF (Johnson 1928, Nyquist 1928)
# and the photocurrent's 2qI (Schottky), both at the inverting node, both carried by |H| like the
# signal (Kumar & Deen, Fiber Optic Communications (Wiley, 2014), eq. (5.72), row P1).
S_IN = 4 * K * T / RF + 2 * Q * I_PH

# 1. The band 1 Hz - 1 MHz, 1000 x past the bandwidth.
rc, data, out, err = run(TIA, "report", "--signal", "1n", "--responsivity", str(R0), "--spot", "10")
if data:
    t = data["transfer"]
    ref = t["ref_hz"]
    mid = math.sqrt(h2(ref))
    true("reference frequency: the band's peak |H|, at its low end for a low-pass stage", ref == 1.0, repr(ref))
    true("transfer unit V/A for a current input", t["unit"] == "V/A")
    # [K9] single pole: |H| = RF / sqrt(1 + (f/fc)^2); -3 dB where |H|^2 = mid^2 / 2
    close("[K9] mid-band transimpedance RF/sqrt(1+(f/fc)^2) at the reference", t["mid_band"], mid, 1e-6)
    close("[K9] -3 dB point fc*sqrt(1 + 2 (ref/fc)^2)", t["f_high_hz"], FC * math.sqrt(1 + 2 * (ref / FC) ** 2), 1e-4)
    true("no lower -3 dB point inside the simulated range", t["f_low_hz"] is None)
    # [K9] Sobering, "Equivalent Noise Bandwidth", Technote 1, eqs. (1)-(3): ENBW = (1/|H0|^2) int |H|^2 df;
    # over the finite band the arctan form, pi/2 fc over an infinite one
    enbw = pole_integral(1, 1e6) / mid ** 2
    close("[K9] ENBW over 1 Hz-1 MHz, fc (atan(f2/fc) - atan(f1/fc)) RF^2/mid^2", t["enbw_hz"], enbw, 1e-4)
    close("[K9] ENBW near pi/2 fc (single pole, band far past fc)", t["enbw_hz"], PI / 2 * FC, 2e-3)
    # output noise: S_IN |H|^2 integrated over the band
    p_out = S_IN * pole_integral(1, 1e6)
    close("[K6] output rms sqrt(S_in int |H|^2 df) = 5.15 uV", data["total"]["output_rms_v"], math.sqrt(p_out), 1e-4)
    # band input-referred rms = output rms / mid-band transfer
    close("input-referred rms = output rms / |H(ref)| = 5.15 pA", data["total"]["input_rms"],
          math.sqrt(p_out) / mid, 1e-4)
    # [P1] SNR at the output: (signal x |H|)^2 / output noise power over the band (Kumar & Deen section 5.5)
    snr = (I_PH * mid) ** 2 / p_out
    close("[P1] SNR at the output (1 mV of signal against 5.15 uV rms) = 3.77e4", data["snr"]["ratio"], snr, 2e-4)
    close("[P1] SNR in dB = 45.8", data["snr"]["db"], 10 * math.log10(snr), 1e-5)
    close("output signal = signal x mid-band transfer", data["snr"]["output_signal_v"], I_PH * mid, 1e-6)
    # [P1] NEP = i_n / sqrt(B) / R0 with B the noise-equivalent bandwidth: white input noise gives sqrt(S_in)/R0
    close("[P1] band NEP = input rms / sqrt(ENBW) / R0 = sqrt(S_in)/R0", data["total"]["nep_band_w_per_rthz"],
          math.sqrt(S_IN) / R0, 1e-4)
    close("[P1] spot NEP at 10 Hz = sqrt(S_in)/R0", data["spot"][0]["nep_w_per_rthz"], math.sqrt(S_IN) / R0, 1e-5)
    true("the band past the -3 dB point is warned about", "-3 dB point" in err and "warning" in err, err)

# 2. A band inside the bandwidth: no warning, ENBW close to the band's width.
rc, data, out, err = run(TIA, "report", "--band", "1:100")
if data:
    mid = data["transfer"]["mid_band"]
    close("[K9] ENBW over 1-100 Hz (arctan form)", data["transfer"]["enbw_hz"], pole_integral(1, 100) / mid ** 2, 1e-5)
    true("no warning for a band inside the bandwidth", "-3 dB point" not in err, err)

# 3. A signal at 10 kHz: the transfer there carries it and refers the noise.
rc, data, out, err = run(TIA, "report", "--signal", "1n", "--signal-freq", "10k")
if data:
    t = data["transfer"]
    close("reference at the signal's frequency", t["ref_hz"], 1e4, 1e-12)
    close("[K9] |H(10 kHz)| = RF/sqrt(101)", t["mid_band"], RF / math.sqrt(101), 1e-4)
    p_out = S_IN * pole_integral(1, 1e6)
    close("[P1] SNR at 10 kHz = (I |H(10k)|)^2 / output power", data["snr"]["ratio"], (I_PH * RF) ** 2 / 101 / p_out, 2e-4)
    close("input-referred rms = output rms / |H(10 kHz)|", data["total"]["input_rms"],
          math.sqrt(p_out) * math.sqrt(101) / RF, 2e-4)
run(TIA, "report", "--signal", "1n", "--signal-freq", "10meg", expect_rc=2)

# 4. A voltage input through an RC low pass (1 kOhm, 159.15 nF: fc = 1 kHz): V/V, unity mid-band.
rc, data, out, err = run("""RC low pass driven by a voltage
vin in 0 dc 0 ac 1
r1 in out 1k
c1 out 0 {1/(2*3.14159265358979*1k*1k)}
.noise v(out) vin dec 100 1 100k 1
.end
""", "report", "--band", "1:100k")
if data:
    t = data["transfer"]
    true("transfer unit V/V for a voltage input", t["unit"] == "V/V")
    close("[K9] mid-band 1/sqrt(1+(1/1000)^2) V/V", t["mid_band"], 1 / math.sqrt(1 + 1e-6), 1e-7)
    close("[K9] -3 dB at 1 kHz", t["f_high_hz"], FC * math.sqrt(1 + 2e-6), 1e-4)
    close("[K9] ENBW over 1 Hz-100 kHz (arctan form)", t["enbw_hz"],
          FC * (math.atan(100) - math.atan(1e-3)) * (1 + 1e-6), 1e-4)

# 5. An APD (terminal current 1 uA = M I_p, M = 100, k = 0.02) into a noiseless load: NEP divides the
# input-referred current by R0 M, R0 the unity-gain responsivity. [A3/A7] McIntyre, IEEE Trans.
# Electron Devices ED-13(1), 164 (1966): F = 3.9502; density 2qIMF = (11.250705 pA/rtHz)^2; the
# multiplied responsivity M R0 as the NEP divisor: Kumar & Deen section 5.5 with R = M R0 (from memory).
APD = """an avalanche photodiode's terminal current into a noiseless load
iapd 0 a dc 1u
dapd a 0 dmod
.model dmod d is=1f
rl a 0 1k noisy=0
.noise v(a) iapd dec 10 1 1meg 1
.end
"""
rc, data, out, err = run(APD, "report", "--avalanche", "iapd=100:0.02", "--responsivity", "0.5", "--spot", "1k",
                         "--no-junction-correction")
if data:
    # the diode across the source adds its own 2q|I_D| (no forward current to speak of: 1 fA scale)
    close("[A7] APD spot NEP = 11.250705 pA/rtHz / (0.5 A/W x 100)", data["spot"][0]["nep_w_per_rthz"],
          11.250705e-12 / 50, 1e-5)
    close("input carrier's gain in the result", data.get("input_gain_m"), 100, 0)
    notes = " ".join(data["notes"])
    true("[A3] the notes state M, k and F(M) of the rule", "M = 100" in notes and "k = 0.02" in notes and
         "F(M) = 3.95" in notes, notes)
    true("the notes say the netlist current is the multiplied terminal current", "multiplied terminal current" in notes)
rc, data, out, err = run(APD, "report", "--avalanche", "dapd=100:0.02", expect_rc=2)
true("a gain rule naming the APD's diode is refused, naming the source across it",
     "names the diode 'dapd'" in err and "--avalanche 'iapd=100:0.02'" in err, err)
rc, data, out, err = run(APD.replace("iapd", "itun"), "report", "--fano", "itun=0.5")
if data:
    true("the notes state the Fano factor of the rule", "Fano factor F = 0.5" in " ".join(data["notes"]), data["notes"])
finish()
