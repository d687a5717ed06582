"""Synthetic "measured-looking" patterns: the simulator with hidden parameters plus measurement effects.

SYNTHETIC DATA ARE NOT MEASUREMENTS. They exist to demonstrate and test reading, comparing and fitting: the
parameters that produced them are known, so a fit can be checked against them.

:func:`synthetic_measurement` runs :func:`pdvoid.simulate` on a scenario changed by hidden parameters and then
applies three measurement effects (:func:`measurement_effects`), in this order (our own simple model of a
detector, not any instrument's):

1. additive charge noise: q_meas = q + sigma_i z_i with z_i standard normal and
   sigma_i = sqrt(noise^2 + (relative_noise |q|)^2) (a noise floor plus a proportional part);
2. detection threshold: events with |q_meas| < threshold are dropped (a detector does not record them; here
   dropping is the point, and the number dropped is recorded);
3. limited phase resolution: phases are replaced by the centre of their bin of width phase_resolution_deg
   (360 / width must be a whole number); times become (cycle + phase / 360) / frequency.

The noise uses its own generator, ``numpy.random.default_rng([seed, 1])``, so the same seed gives the same
data. Given a test circuit and an instrument (``circuit=``, ``instrument=``), :func:`synthetic_measurement` uses
the IEC 60270 forward model :func:`pdvoid.measure` instead (test circuit, band-pass instrument, calibration,
noise, threshold, phase resolution); the demo file is made that way, with :data:`DEMO_CIRCUIT` and
:data:`DEMO_INSTRUMENT`. The demo file ``pdvoid/inputs/examples/demo_measured.csv`` is written by
:func:`write_demo_measured`; regenerate it
with::

    python -m pdvoid.analysis.synthetic
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from pathlib import Path

import numpy as np

from pdvoid.analysis.measured import measure
from pdvoid.analysis.patterns import EventSource, _filled
from pdvoid.core.errors import InputError, check_int, check_nonnegative, check_range
from pdvoid.inputs.demo import demo_measured_path, demo_scenario_path
from pdvoid.inputs.measurement import Instrument, TestCircuit
from pdvoid.inputs.parameters import check_seed
from pdvoid.inputs.scenario import Scenario
from pdvoid.simulation.events import Events, as_events
from pdvoid.simulation.simulate import simulate

__all__ = [
    "SYNTHETIC_LABEL",
    "DEMO_HIDDEN",
    "DEMO_SETTINGS",
    "DEMO_CIRCUIT",
    "DEMO_INSTRUMENT",
    "synthetic_measurement",
    "measurement_effects",
    "hidden_parameters",
    "demo_measured_path",
    "demo_scenario_path",
    "write_demo_measured",
]

SYNTHETIC_LABEL = "synthetic measured-looking data (simulated)"
#: hidden parameters of the demo file: the demo scenario's void diameter (1.5 mm), residual ratio (0.25) and
#: surface emission rate for a repeated polarity (1e4 1/s), each changed a little. SI units.
DEMO_HIDDEN: dict[str, float] = {
    "void.diameter": 1.8e-3,
    "model.residual_ratio": 0.32,
    "model.surface_rate_same": 1.6e4,
}
#: settings of the demo file: cycles, seed and measurement effects (threshold [C], noise [C], relative noise
#: [-], phase resolution [deg])
DEMO_SETTINGS: dict[str, float] = {
    "cycles": 1000,
    "seed": 7,
    "threshold": 10e-12,
    "noise": 2e-12,
    "relative_noise": 0.03,
    "phase_resolution_deg": 1.0,
}

#: test circuit of the demo file (an invented laboratory set-up): a 100 pF test object, a 1 nF coupling capacitor
#: with the measuring impedance in series with it, 20 pF of stray capacitance, the default 100 pC calibrator
DEMO_CIRCUIT = TestCircuit(test_object_capacitance=100e-12, coupling_capacitance=1e-9, stray_capacitance=20e-12)
#: instrument of the demo file: wide band 100-500 kHz (the recommended IEC 60270 setting, from memory) with the
#: threshold, noise and phase resolution of :data:`DEMO_SETTINGS`
DEMO_INSTRUMENT = Instrument(kind="wideband", f_low=100e3, f_high=500e3, threshold=DEMO_SETTINGS["threshold"],
                             noise=DEMO_SETTINGS["noise"], phase_resolution_deg=DEMO_SETTINGS["phase_resolution_deg"])


def synthetic_measurement(
    scenario: Scenario,
    cycles: int = 1000,
    seed: int = 0,
    *,
    hidden: Mapping[str, float | str | bool] | None = None,
    threshold: float = 10e-12,
    noise: float = 2e-12,
    relative_noise: float = 0.0,
    phase_resolution_deg: float = 1.0,
    circuit: TestCircuit | None = None,
    instrument: Instrument | None = None,
) -> Events:
    """Simulated events with hidden parameters and measurement effects, labelled as synthetic.

    Parameters
    ----------
    scenario : Scenario
        the scenario before the hidden changes [-]
    cycles : int
        AC cycles to simulate, 1 ... 1e9 [-]
    seed : int
        seed of the simulation and of the noise, 0 ... 2**32 - 1 [-]
    hidden : Mapping[str, float or str or bool] or None
        dotted-path changes applied to ``scenario``, e.g. ``{"void.diameter": 1.8e-3}`` (SI) [-]
    threshold : float
        detection threshold [C], >= 0; events with |q_meas| < threshold are dropped
    noise : float
        standard deviation of the additive charge noise (noise floor) [C], >= 0
    relative_noise : float
        proportional part of the noise, a fraction of |q|, 0 ... 1 [-]
    phase_resolution_deg : float
        width of the phase bins [deg]; 360 / width must be whole; 0 for none
    circuit : TestCircuit or None
        with ``instrument``: pass the simulation through :func:`pdvoid.measure` (seeded with ``seed``) instead
        of the simple effects above, which are then ignored [-]
    instrument : Instrument or None
        the instrument of that forward model [-]

    Returns
    -------
    Events
        :class:`pdvoid.simulation.events.Events` labelled :data:`SYNTHETIC_LABEL`, with ``extra["synthetic"]`` recording
        the hidden parameters, seed, cycles and effects, and ``extra["threshold"]`` the threshold [C].
    """
    if not isinstance(scenario, Scenario):
        raise InputError(f"scenario must be a pdvoid.Scenario; got {type(scenario).__name__}")
    cycles = check_int("cycles", cycles, 1, 10**9)
    seed = check_seed(seed)
    effects = {
        "threshold": threshold,
        "noise": noise,
        "relative_noise": relative_noise,
        "phase_resolution_deg": phase_resolution_deg,
    }
    measurement_effects(
        Events(phase_deg=np.empty(0), charge=np.empty(0), frequency=50.0, cycles=1.0), seed, **effects
    )  # checks
    if (circuit is None) != (instrument is None):
        raise InputError("give both circuit and instrument (the IEC 60270 forward model) or neither")
    hidden = dict(hidden or {})
    sc = scenario.replace(**hidden) if hidden else scenario
    simulated = simulate(sc, cycles=cycles, seed=seed).events
    if circuit is not None and instrument is not None:
        ev = measure(simulated, circuit, instrument, seed=seed)
        applied = dict(ev.extra["instrument"])
    else:
        ev = measurement_effects(simulated, seed, **effects)
        applied = dict(ev.extra["measurement effects"])
    record = {
        "hidden": {k: (float(v) if isinstance(v, (int, float)) else v) for k, v in hidden.items()},
        "scenario": sc.name,
        "supply.rms": sc.supply.rms,
        "seed": seed,
        "cycles": cycles,
        **applied,
    }
    return Events(
        phase_deg=ev.phase_deg,
        charge=ev.charge,
        frequency=ev.frequency,
        cycles=ev.cycles,
        time=ev.time,
        cycle=ev.cycle,
        label=SYNTHETIC_LABEL,
        extra={"synthetic": record, "threshold": record["threshold"]},
    )


def measurement_effects(
    events: EventSource,
    seed: int = 0,
    *,
    threshold: float = 10e-12,
    noise: float = 2e-12,
    relative_noise: float = 0.0,
    phase_resolution_deg: float = 1.0,
) -> Events:
    """Apply the detector model of this module (noise, threshold, phase resolution) to events.

    Useful on its own as the forward model of a measurement: a fit can pass simulated events through the same
    effects before comparing them with measured ones.

    Parameters
    ----------
    events : Events or Result
        discharge events or a Result holding them [-]
    seed : int
        seed of the noise generator, ``numpy.random.default_rng([seed, 1])``, 0 ... 2**32 - 1 [-]
    threshold : float
        detection threshold [C], >= 0; events with |q_meas| < threshold are dropped
    noise : float
        standard deviation of the additive charge noise (noise floor) [C], >= 0
    relative_noise : float
        proportional part of the noise, a fraction of |q|, 0 ... 1 [-]
    phase_resolution_deg : float
        width of the phase bins [deg], 0 ... 360; 360 / width must be whole; 0 for none

    Returns
    -------
    Events
        :class:`pdvoid.Events` with phase, charge, cycle and time (no voltage or void fields), label of
        the input, and ``extra["measurement effects"]`` recording the settings and the number dropped.
    """
    ev = as_events(events)
    seed = check_seed(seed)
    thr = check_nonnegative("threshold", threshold, "C")
    sigma0 = check_nonnegative("noise", noise, "C")
    rel = check_range("relative_noise", relative_noise, 0.0, 1.0)
    res = check_range("phase_resolution_deg", phase_resolution_deg, 0.0, 360.0, unit="deg")
    nbins = 0
    if res > 0.0:
        nbins = round(360.0 / res)
        if not math.isclose(nbins * res, 360.0, rel_tol=1e-12):
            raise InputError(f"phase_resolution_deg must divide 360 deg into whole bins; got {res!r}")
    rng = np.random.default_rng([seed, 1])
    q = ev.charge
    sigma = np.sqrt(sigma0**2 + (rel * np.abs(q)) ** 2)
    q_meas = q + sigma * rng.standard_normal(q.size)
    keep = np.abs(q_meas) >= thr
    cycle = _filled(ev.cycle)[keep]
    phase = ev.phase_deg[keep]
    if nbins:
        phase = np.minimum((np.floor(phase / res) + 0.5) * res, np.nextafter(360.0, 0.0))
    time = (cycle + phase / 360.0) / ev.frequency
    record = {
        "threshold": thr,
        "noise": sigma0,
        "relative_noise": rel,
        "phase_resolution_deg": res,
        "simulated events": ev.count,
        "removed below threshold": int(ev.count - keep.sum()),
    }
    return Events(
        phase_deg=phase,
        charge=q_meas[keep],
        frequency=ev.frequency,
        cycles=ev.cycles,
        time=time,
        cycle=cycle,
        label=ev.label,
        extra={"measurement effects": record, "threshold": thr},
    )


def hidden_parameters(data: Events) -> dict[str, float]:
    """The hidden parameters of synthetic events, or of a synthetic file read with ``read_events``.

    Parameters
    ----------
    data : Events
        events from :func:`synthetic_measurement`, or events read from a file with
        ``# hidden.<name> = <value>`` lines [-]

    Returns
    -------
    dict[str, float]
        {dotted parameter name: value in SI units}.
    """
    extra = getattr(data, "extra", None)
    if not isinstance(data, Events) or not isinstance(extra, dict):
        raise InputError(f"hidden_parameters needs pdvoid Events; got {type(data).__name__}")
    if "synthetic" in extra:
        return dict(extra["synthetic"]["hidden"])
    meta = extra.get("metadata", {})
    out = {}
    for key, value in meta.items():
        if key.startswith("hidden."):
            try:
                out[key[len("hidden.") :]] = float(value)
            except ValueError:
                raise InputError(f"hidden parameter {key!r} is not a number: {value!r}") from None
    if not out:
        raise InputError("these events record no hidden parameters (not synthetic data?)")
    return out


def write_demo_measured(path: str | Path | None = None) -> Path:
    """Write the synthetic demo pattern (default: :func:`demo_measured_path`) from :data:`DEMO_HIDDEN` and
    :data:`DEMO_SETTINGS`, with comment lines that say it is synthetic and list the hidden parameters.

    Parameters
    ----------
    path : str or Path or None
        file to write; None for the packaged ``pdvoid/inputs/examples/demo_measured.csv`` [-]

    Returns
    -------
    Path
        the path written.
    """
    from pdvoid.io import write_events  # imported here: a plain analysis never loads the file writers

    s = DEMO_SETTINGS
    scenario = Scenario.from_file(demo_scenario_path())
    ev = synthetic_measurement(
        scenario,
        int(s["cycles"]),
        int(s["seed"]),
        hidden=DEMO_HIDDEN,
        circuit=DEMO_CIRCUIT,
        instrument=DEMO_INSTRUMENT,
    )
    rec = ev.extra["synthetic"]
    comments = [
        "SYNTHETIC DATA - NOT A MEASUREMENT.",
        "Produced by pdvoid's simulator (pdvoid.analysis.synthetic.synthetic_measurement) from the",
        "demo scenario pdvoid/inputs/examples/demo.toml at its test voltage, with the hidden parameters listed",
        "below (keys 'hidden.<parameter>', SI units), then read through a simulated IEC 60270 measuring",
        "chain (pdvoid.measure): test circuit (keys 'circuit.*'), wide-band instrument 100-500 kHz with a",
        "peak detector, calibration with a 100 pC calibrator, white noise, a detection threshold and a",
        "limited phase resolution (phases at bin centres).",
        "Regenerate with: python -m pdvoid.analysis.synthetic",
    ]
    metadata = {
        "threshold": f"{rec['threshold']!r} C",
        "synthetic": "true",
        "synthetic.seed": rec["seed"],
        "synthetic.scenario": "pdvoid/inputs/examples/demo.toml",
        "synthetic.supply.rms": f"{rec['supply.rms']!r} V",
    }
    metadata.update({f"hidden.{k}": repr(v) for k, v in rec["hidden"].items()})
    c = DEMO_CIRCUIT
    metadata.update(
        {
            "circuit.test_object_capacitance": f"{c.test_object_capacitance!r} F",
            "circuit.coupling_capacitance": f"{c.coupling_capacitance!r} F",
            "circuit.stray_capacitance": f"{c.stray_capacitance!r} F",
            "circuit.arrangement": c.arrangement,
            "circuit.calibrator_charge": f"{c.calibrator_charge!r} C",
            "instrument.kind": rec["kind"],
            "instrument.f_low": f"{rec['f_low']!r} Hz",
            "instrument.f_high": f"{rec['f_high']!r} Hz",
            "instrument.calibration_factor": repr(rec["calibration_factor"]),
            "effect.noise": f"{rec['noise']!r} C",
            "effect.phase_resolution": f"{rec['phase_resolution_deg']!r} deg",
            "effect.simulated_events": rec["input pulses"],
            "effect.noise_peaks": rec["noise peaks"],
            "effect.reported": rec["reported"],
        }
    )
    out = Path(path) if path is not None else demo_measured_path()
    out.parent.mkdir(parents=True, exist_ok=True)
    return write_events(
        ev,
        out,
        columns=("cycle", "phase", "charge"),
        units={"charge": "pC"},
        formats={"cycle": "%d", "phase": "%.2f", "charge": "%.3f"},
        metadata=metadata,
        comments=comments,
    )


if __name__ == "__main__":  # pragma: no cover - the regeneration command
    print(write_demo_measured())
