"""Redraw latency of the workbench after each control change, the former drawing (new figures on each update)
against the persistent figures updated in place, measured side by side in one run; then a big run's drawing
time and how fast Stop ends a long run.

The workbench is driven in Python without a browser: a control widget's value is set (which runs the panel's
own callback, as a browser change does), the background worker runs and redraws, and the latency is
``Workbench.last_latency``: from the change to the redrawn panel (the 0.05 s quiet time, the simulation, the
summary and the three views), as the status line sees it. The two workbenches take turns on every change, so
both see the same machine load.

Targets (issue 17): redraw ≤ 0.3 s median at 200 cycles; 10⁶ cycles drawn in ≤ 2 s; Stop ends a run within
0.5 s, drawing included.

Run: python benchmarks/workbench_redraw.py [--repeats N] [--no-big] [--no-big-before] (about 2 min)
"""

from __future__ import annotations

import argparse
import os
import statistics
import time

from pdvoid.faces.workbench import Workbench

#: the control changes: (control, values taken in turn); each value is a change from the one before
CHANGES: dict[str, tuple[object, ...]] = {
    "diameter_mm": (1.6, 1.7, 1.5),
    "height_mm": (1.4, 1.6, 1.5),
    "gas": ("nitrogen", "air"),
    "pressure_kPa": (90.0, 110.0, 101.325),
    "material": ("epoxy_cast", "epoxy_silica_filled"),
    "permittivity": (4.0, 4.4, 4.2),
    "thickness_mm": (5.5, 6.5, 6.0),
    "voltage_kV": (17.0, 19.0, 18.0),
    "frequency_Hz": (60.0, 50.0),
    "model": ("memory", "network", "field"),
    "residual_ratio": (0.2, 0.3, 0.25),
    "ionization_rate": (3e9, 1e9),
    "surface_rate_same": (2e4, 1e4),
    "surface_rate_reversed": (5e3, 3e3),
    "surface_decay_time_ms": (10.0, 20.0),
    "field_assisted": (True, False),
    "lag_free": (True, False),
    "seed": ("2", "3", "1"),
    "test_voltage_kV": (15.0, 18.0),
}


def _change(wb: Workbench, name: str, value: object) -> float:
    wb.widgets[name].value = value
    if not wb.wait(120.0):
        raise RuntimeError(f"no redraw within 120 s after {name} = {value!r}")
    return float(wb.last_latency)


def redraw_table(repeats: int) -> None:
    wbs = {"before (new figures)": Workbench(drawing="new figures"), "after (in place)": Workbench()}
    for name, values in CHANGES.items():  # warm-up, not measured: compiles each model's kernel once
        for value in values:
            for wb in wbs.values():
                _change(wb, name, value)
    rows: dict[str, dict[str, list[float]]] = {k: {} for k in CHANGES}
    for _ in range(repeats):
        for name, values in CHANGES.items():
            for value in values:
                for label, wb in wbs.items():
                    rows[name].setdefault(label, []).append(_change(wb, name, value))
    labels = list(wbs)
    print(f"\nredraw after a control change, 200 cycles, {os.cpu_count()} cores; median / max [s] "
          f"({repeats} x each value)")
    print(f"{'control':24s}" + "".join(f"{lab:>26s}" for lab in labels) + f"{'ratio of medians':>18s}")
    every: dict[str, list[float]] = {lab: [] for lab in labels}
    for name, by in rows.items():
        cells = []
        for lab in labels:
            every[lab] += by[lab]
            cells.append(f"{statistics.median(by[lab]):12.3f} / {max(by[lab]):6.3f}      ")
        ratio = statistics.median(by[labels[0]]) / statistics.median(by[labels[1]])
        print(f"{name:24s}" + "".join(f"{c:>26s}" for c in cells) + f"{ratio:17.2f}x")
    cells = [f"{statistics.median(every[lab]):12.3f} / {max(every[lab]):6.3f}      " for lab in labels]
    ratio = statistics.median(every[labels[0]]) / statistics.median(every[labels[1]])
    print(f"{'all changes':24s}" + "".join(f"{c:>26s}" for c in cells) + f"{ratio:17.2f}x")
    for wb in wbs.values():
        wb.close()


def _drawn_seconds(wb: Workbench) -> str:
    text = wb.panel.status.value
    return text.rpartition("drawn in ")[2].partition(" s")[0]


def _big(wb: Workbench, cycles: str) -> tuple[float, str]:
    t0 = time.perf_counter()
    wb.widgets["cycles"].value = cycles
    wb.wait(600.0)
    return time.perf_counter() - t0, _drawn_seconds(wb)


def big_runs(before: bool) -> None:
    if before:
        # the former path: every event kept (no histogram mode) and new figures on each update
        import pdvoid.faces.workbench.session as session_module

        saved = session_module.HISTOGRAM_FROM_CYCLES
        session_module.HISTOGRAM_FROM_CYCLES = 10**9
        try:
            wb = Workbench(drawing="new figures")
            total, drawn = _big(wb, "1000000")
            wb.close()
        finally:
            session_module.HISTOGRAM_FROM_CYCLES = saved
        print(f"\nbefore: 1000000 cycles, every event kept, new figures: change to redrawn panel {total:6.2f} s, of "
              f"which drawing {drawn} s")
    print("\nafter: big runs (histogram mode, in place drawing)")
    wb = Workbench()
    for cycles in ("100000", "1000000"):
        total, drawn = _big(wb, cycles)
        print(f"  {int(cycles):>9d} cycles: change to redrawn panel {total:6.2f} s, of which drawing {drawn} s")
    for cycles, after in (("2000000", 0.5), ("10000000", 2.0)):
        wb.widgets["cycles"].value = cycles
        time.sleep(after)
        t0 = time.perf_counter()
        wb.panel.stop.click()
        wb.wait(600.0)
        dt = time.perf_counter() - t0
        ran = wb.outcome.result.cycles if wb.outcome is not None and wb.outcome.result is not None else 0
        print(f"  Stop {after:g} s into a {int(cycles):>9d}-cycle run: idle with the partial result drawn after "
              f"{dt:5.2f} s ({ran} cycles run; {wb.panel.status.value.count('stopped after')} 'stopped' status)")
    wb.close()


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeats", type=int, default=2,
                        help="passes over every control (default 2; 0 leaves the table out)")
    parser.add_argument("--no-big", action="store_true", help="leave out the big runs and Stop")
    parser.add_argument("--no-big-before", action="store_true",
                        help="leave out the former path's 10^6-cycle run (about 20 s)")
    args = parser.parse_args()
    if args.repeats > 0:
        redraw_table(args.repeats)
    if not args.no_big:
        big_runs(before=not args.no_big_before)


if __name__ == "__main__":
    main()
