"""Sweep throughput, serial versus every local core, and the per-task overhead of the parallel backends.

Run:  python benchmarks/sweep_bench.py [--points 40] [--cycles 20000] [--tasks 1000] [--no-dask]

Prints, in one run: the sweep throughput serially and on all local cores (warm worker pool; the cold start is
shown too), their ratio (target >= 1.8 on 2 cores), and the overhead per trivial task for local processes
(loky) and a Dask LocalCluster on loopback (raw client.map and pdvoid's chunked parallel_map).
A benchmark, not a test: times depend on the machine and its load.
"""

from __future__ import annotations

import argparse
import json
import os
import time

import numpy as np

from pdvoid.inputs.demo import demo_scenario
from pdvoid.sweeps import local_workers, parallel_map, sweep


def _grid(points: int) -> dict:
    """About ``points`` grid points over void diameter x applied voltage (all above inception)."""
    n_rms = 4
    n_dia = max(1, round(points / n_rms))
    return {
        "void.diameter": np.linspace(1.0e-3, 2.0e-3, n_dia).tolist(),
        "supply.rms": np.linspace(14e3, 20e3, n_rms).tolist(),
    }


def _timed(fn):
    t = time.perf_counter()
    out = fn()
    return out, time.perf_counter() - t


def sweep_throughput(points: int, cycles: int) -> dict:
    sc = demo_scenario()
    grid = _grid(points)
    n = int(np.prod([len(v) for v in grid.values()]))
    # warm this process (numba cache load) so the serial run measures simulation only
    sweep(sc, {"supply.rms": [18e3]}, cycles=10, seed=0, workers=1, progress=False)
    serial, t_serial = _timed(lambda: sweep(sc, grid, cycles=cycles, seed=1, workers=1, progress=False))
    cores = local_workers()
    _, t_cold = _timed(lambda: sweep(sc, grid, cycles=cycles, seed=1, workers=cores, progress=False))
    local, t_warm = _timed(lambda: sweep(sc, grid, cycles=cycles, seed=1, workers=cores, progress=False))
    same = bool(serial.identical(local))
    events = float(serial["discharges_per_cycle"].sum()) * cycles
    return {
        "points": n,
        "cycles_per_point": cycles,
        "events": int(events),
        "cores": cores,
        "serial_s": t_serial,
        "local_cold_s": t_cold,
        "local_warm_s": t_warm,
        "serial_points_per_s": n / t_serial,
        "local_points_per_s": n / t_warm,
        "speedup": t_serial / t_warm,
        "identical": same,
    }


def _busy(n: int) -> int:
    """Pure-Python CPU work (no numba, no I/O): the calibration task."""
    return sum(i * i for i in range(n))


def machine_ratio(tasks: int = 40, n: int = 400_000) -> float:
    """Speed-up of all local cores over one for plain CPU work: what this machine, under its current load, can
    give at best (about 2.0 on an idle 2-core machine)."""
    cores = local_workers()
    parallel_map(_busy, [1000] * cores, workers=cores)  # warm
    _, t1 = _timed(lambda: parallel_map(_busy, [n] * tasks, workers=1))
    _, tn = _timed(lambda: parallel_map(_busy, [n] * tasks, workers=cores))
    return t1 / tn


def task_overhead(tasks: int, dask: bool) -> dict:
    items = list(range(tasks))
    out: dict = {"tasks": tasks}
    parallel_map(abs, items, workers=local_workers())  # warm the pool
    _, t = _timed(lambda: parallel_map(abs, items, workers=local_workers()))
    out["loky_parallel_map_us"] = t / tasks * 1e6
    if not dask:
        return out
    from distributed import Client, LocalCluster

    t0 = time.perf_counter()
    with (
        LocalCluster(
            n_workers=min(2, local_workers()),
            threads_per_worker=1,
            processes=True,
            dashboard_address=None,
            host="127.0.0.1",
        ) as cluster,
        Client(cluster) as client,
    ):
        out["dask_cluster_start_s"] = time.perf_counter() - t0
        client.gather(client.map(abs, range(50), pure=False))  # warm
        _, t = _timed(lambda: client.gather(client.map(abs, items, pure=False)))
        out["dask_client_map_us"] = t / tasks * 1e6
        parallel_map(abs, items[:50], client=client)  # warm: workers import pdvoid
        _, t = _timed(lambda: parallel_map(abs, items, client=client))
        out["dask_parallel_map_us"] = t / tasks * 1e6
    return out


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--points", type=int, default=40, help="sweep points (default 40)")
    ap.add_argument("--cycles", type=int, default=20000, help="AC cycles per point (default 20000)")
    ap.add_argument(
        "--tasks", type=int, default=1000, help="trivial tasks for the overhead test (default 1000)"
    )
    ap.add_argument("--no-dask", action="store_true", help="skip the Dask LocalCluster measurement")
    ap.add_argument("--json", action="store_true", help="print JSON")
    ns = ap.parse_args(argv)
    load = os.getloadavg()[0] if hasattr(os, "getloadavg") else float("nan")
    tp = sweep_throughput(ns.points, ns.cycles)
    tp["machine_ratio"] = machine_ratio()
    ov = task_overhead(ns.tasks, not ns.no_dask)
    if ns.json:
        print(json.dumps({"throughput": tp, "overhead": ov}, indent=2))
        return 0
    print(
        f"sweep benchmark: {tp['points']} points x {tp['cycles_per_point']} cycles ({tp['events']} events), "
        f"{tp['cores']} cores, load average {load:.2f} at the start"
    )
    rows = [
        ("serial (workers=1)", f"{tp['serial_s']:.2f} s", f"{tp['serial_points_per_s']:.1f} points/s"),
        (
            f"local processes, {tp['cores']} workers, warm",
            f"{tp['local_warm_s']:.2f} s",
            f"{tp['local_points_per_s']:.1f} points/s",
        ),
        (f"local processes, {tp['cores']} workers, cold start", f"{tp['local_cold_s']:.2f} s", ""),
        (
            "speed-up, warm (target >= 1.8 on 2 cores)",
            f"{tp['speedup']:.2f} x",
            "identical results" if tp["identical"] else "RESULTS DIFFER",
        ),
        ("same cores on plain CPU work (the ceiling now)", f"{tp['machine_ratio']:.2f} x",
         "below ~1.9: other processes share the cores"),
        ("", "", ""),
        (f"overhead per trivial task ({ov['tasks']} tasks)", "", ""),
        ("  local processes, parallel_map (chunked)", f"{ov['loky_parallel_map_us']:.0f} us", ""),
    ]
    if "dask_client_map_us" in ov:
        rows += [
            (
                "  Dask LocalCluster, client.map (one task each)",
                f"{ov['dask_client_map_us']:.0f} us",
                f"cluster start {ov['dask_cluster_start_s']:.2f} s",
            ),
            ("  Dask LocalCluster, parallel_map (chunked)", f"{ov['dask_parallel_map_us']:.0f} us", ""),
        ]
    for a, b, c in rows:
        print(f"  {a:<50s} {b:>10s}  {c}")
    return 0 if tp["identical"] else 1


if __name__ == "__main__":
    raise SystemExit(main())
