#!/usr/bin/env python3
"""Time the exact steady-state solver of ``partpick verify`` against brute-force integration.

In one run, on an invented 24 V / 0.8 A, 400 kHz stage (the field-logger scenario's figures):

1. one regulated steady-state solve at vin_min and full load (best of several runs);
2. a 10 × 10 sweep (Vin × load, iout_min to iout), every point regulated;
3. the brute-force alternative for the same point: scipy.integrate.solve_ivp stepping the
   switched circuit period after period, with event detection of the diode current reaching
   zero, until the state repeats to 1e-9 (started from the ideal averaged estimate, which
   favours the brute force over a start from rest).

Goals (issue 6): the steady-state solve at least 100× faster than the brute force, and the
100-point regulated sweep under 1 s on the 2-core build machine.

Usage: .venv/bin/python scripts/bench_verify.py
"""

from __future__ import annotations

import statistics
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

from partpick.design.spec import Spec
from partpick.verify.blas import single_blas_thread
from partpick.verify.stage import Stage
from partpick.verify.steady_state import steady_state
from partpick.verify.sweep import OperatingPoint, verify_design

SPEC = Spec(
    vin_min_v=6.0,
    vin_max_v=8.4,
    vout_v=24.0,
    iout_a=0.8,
    fsw_hz=400e3,
    vout_ripple_v=0.12,
    iout_min_a=0.05,
)
STAGE = Stage(
    inductance_h=15e-6,
    dcr_ohm=0.0165,
    rds_on_ohm=0.0065,
    hot_factor=1.5,
    diode_vf_v=0.47,
    cout_f=4.8e-6,
    esr_ohm=0.004,
    output_count=3,
    fsw_hz=400e3,
    qgd_c=2.5e-9,
    coss_f=200e-12,
)


def time_single_solve(repeats: int = 30) -> tuple[float, float]:
    """Return (best seconds, duty) of one regulated solve at vin_min, full load."""
    load_ohm = SPEC.vout_v / SPEC.iout_a
    times, duty = [], 0.0
    for _ in range(repeats):
        start = time.perf_counter()
        duty = steady_state(STAGE, SPEC.vin_min_v, load_ohm, vout_v=SPEC.vout_v).duty
        times.append(time.perf_counter() - start)
    return min(times), duty


def time_sweep(repeats: int = 3) -> tuple[float, float, int, int]:
    """Return (median wall s, median CPU s, points, DCM points) of the 10 × 10 sweep."""
    vins = np.linspace(SPEC.vin_min_v, SPEC.vin_max_v, 10)
    loads = np.linspace(SPEC.iout_min_a, SPEC.iout_a, 10)
    points = [OperatingPoint(float(v), float(i)) for v in vins for i in loads]
    times, cpu, result = [], [], None
    for _ in range(repeats):
        start, start_cpu = time.perf_counter(), time.process_time()
        result = verify_design(SPEC, STAGE, points)
        times.append(time.perf_counter() - start)
        cpu.append(time.process_time() - start_cpu)
    dcm = sum(p.state.mode == "dcm" for p in result.points)
    return statistics.median(times), statistics.median(cpu), len(result.points), dcm


def _laws(vin_v: float, load_ohm: float):
    s = STAGE
    cap, esr = s.cout_f * s.output_count, s.esr_ohm / s.output_count
    r_on = s.rds_on_ohm * s.hot_factor

    def on(_t, x):
        return [
            (vin_v - (s.dcr_ohm + r_on) * x[0]) / s.inductance_h,
            -x[1] / (load_ohm + esr) / cap,
        ]

    def off(_t, x):
        vo = (x[1] + esr * x[0]) / (1.0 + esr / load_ohm)
        drop = s.diode_vf_v + s.diode_rd_ohm * x[0]
        return [
            (vin_v - s.dcr_ohm * x[0] - drop - vo) / s.inductance_h,
            (x[0] - vo / load_ohm) / cap,
        ]

    def idle(_t, x):
        return [0.0, -x[1] / (load_ohm + esr) / cap]

    return on, off, idle


def _zero_current(_t, x):
    return x[0]


_zero_current.terminal = True
_zero_current.direction = -1.0


def time_brute_force(duty: float) -> tuple[float, int]:
    """Return (seconds, periods) for solve_ivp to reach the periodic state at ``duty``."""
    vin_v, load_ohm = SPEC.vin_min_v, SPEC.vout_v / SPEC.iout_a
    on, off, idle = _laws(vin_v, load_ohm)
    period = 1.0 / STAGE.fsw_hz
    t_on = duty * period
    options = {"method": "DOP853", "rtol": 1e-10, "atol": 1e-12}
    v_guess = vin_v / (1.0 - duty)
    x = np.array([v_guess / load_ohm / (1.0 - duty), v_guess])
    start = time.perf_counter()
    for periods in range(1, 200_000):  # the caller holds one BLAS thread, as the solver does
        first = solve_ivp(on, (0.0, t_on), x, **options)
        second = solve_ivp(off, (t_on, period), first.y[:, -1], events=_zero_current, **options)
        x_end = second.y[:, -1]
        if second.status == 1:
            rest = solve_ivp(idle, (second.t[-1], period), [0.0, x_end[1]], **options)
            x_end = rest.y[:, -1]
        change = np.abs(x_end - x)
        x = x_end
        if change[1] < 1e-9 * abs(x[1]) and change[0] < 1e-9 * (abs(x[0]) + 1e-3):
            return time.perf_counter() - start, periods
    raise RuntimeError("the brute-force run never settled")


def main() -> int:
    single_s, duty = time_single_solve()
    sweep_s, sweep_cpu_s, count, dcm = time_sweep()
    with single_blas_thread():
        brute_s, periods = time_brute_force(duty)
    ratio = brute_s / single_s
    print(f"one regulated steady-state solve (vin_min, full load): {single_s * 1e3:8.2f} ms")
    print(
        f"10 x 10 regulated sweep ({count} points, {dcm} in DCM):   {sweep_s * 1e3:8.1f} ms "
        f"wall, {sweep_cpu_s * 1e3:.1f} ms CPU"
    )
    print(f"brute-force solve_ivp to steady state ({periods} periods):  {brute_s * 1e3:8.1f} ms")
    print(f"ratio brute force / steady state: {ratio:,.0f}x (goal >= 100x)")
    print(f"sweep goal < 1 s: {'met' if sweep_s < 1.0 else 'NOT met'}")
    return 0 if ratio >= 100 and sweep_s < 1.0 else 1


if __name__ == "__main__":
    sys.exit(main())
