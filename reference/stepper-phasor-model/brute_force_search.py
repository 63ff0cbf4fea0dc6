"""Independent pull-out torque values for reference/stepper-phasor-model/pull-out-torque.json.

Brute-force search over the driver's phase-voltage phasor V_s = m·exp(j·delta) (0 <= m <= V, delta the angle to
the back-EMF): current from the circuit I = (V_s - E)/Z with complex numbers, feasible when |I| <= I_p, torque
k_t·Re(I). A 400 x 1440 grid, then five zooms of 80 x 80 around the best point. Built from the circuit equation
only, not from the closed form of docs/models/motor-torque.md. Run with python3 (no packages needed).
"""
import cmath
import json
import math
import sys


def pull_out(hold_nm, rated_a, r_ohm, l_mh, step_deg, supply_v, rms_a, rev_s):
    kt = hold_nm / (math.sqrt(2) * rated_a)
    ip = math.sqrt(2) * min(rms_a, rated_a)
    w = 2 * math.pi * rev_s
    e = kt * w
    z = complex(r_ohm, (90 / step_deg) * w * l_mh / 1000)
    best, bm, bd = -1e300, 0.0, 0.0
    m_lo, m_hi, d_lo, d_hi = 0.0, supply_v, -math.pi, math.pi
    for nm, nd in [(400, 1440)] + [(80, 80)] * 5:
        for i in range(nm + 1):
            m = min(supply_v, m_lo + (m_hi - m_lo) * i / nm)
            for k in range(nd + 1):
                d = d_lo + (d_hi - d_lo) * k / nd
                cur = (cmath.rect(m, d) - e) / z
                if abs(cur) <= ip and cur.real > best:
                    best, bm, bd = cur.real, m, d
        sm, sd = (m_hi - m_lo) / nm, (d_hi - d_lo) / nd
        m_lo, m_hi, d_lo, d_hi = max(0.0, bm - 2 * sm), min(supply_v, bm + 2 * sm), bd - 2 * sd, bd + 2 * sd
    return max(0.0, kt * best)


if __name__ == "__main__":
    args = json.loads(sys.argv[1])
    print(pull_out(**args))
