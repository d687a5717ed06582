"""The ``measure`` command: read a result (or an events file) through a simulated IEC 60270 measuring chain and
write the readings as a measured-style events file."""

from __future__ import annotations

import argparse

from pdvoid.faces.cli import options
from pdvoid.faces.cli.output import SAFETY, emit

capacitance = options.quantity("capacitance")


def _gate(text: str) -> tuple[float, float]:
    if ":" not in text:
        raise argparse.ArgumentTypeError(f"a gate is START:STOP in degrees, e.g. 170deg:190deg; got {text!r}")
    a, b = text.split(":", 1)
    return options.angle(a), options.angle(b)


def _cmd_measure(ns: argparse.Namespace) -> int:
    from pdvoid.analysis.measured import measure
    from pdvoid.faces.cli.analysis import _load_events
    from pdvoid.inputs.measurement import Instrument, TestCircuit
    from pdvoid.io import write_events

    source = _load_events(ns.file, ns.cycles, ns.frequency)
    circuit = TestCircuit(test_object_capacitance=ns.test_object_capacitance,
                          coupling_capacitance=ns.coupling_capacitance, stray_capacitance=ns.stray_capacitance,
                          arrangement=ns.arrangement.replace("-", "_"), calibrator_charge=ns.calibrator_charge)
    band = ({"centre": ns.centre, "bandwidth": ns.bandwidth} if ns.centre is not None or ns.bandwidth is not None
            else {"f_low": ns.f_low, "f_high": ns.f_high})
    instrument = Instrument(kind=ns.instrument, **band, threshold=ns.threshold, noise=ns.noise,
                            gating=tuple(ns.gate), phase_resolution_deg=ns.phase_resolution)
    ev = measure(source, circuit, instrument, calibrate=not ns.uncalibrated, seed=ns.seed)
    rec = ev.extra["instrument"]
    metadata = {
        "threshold": f"{ev.extra['threshold']!r} C",
        "measured_by": "simulated IEC 60270 measuring chain (pdvoid measure)",
        "source": ns.file,
        "calibrated": "true" if rec["calibrated"] else "false",
        "circuit.test_object_capacitance": f"{circuit.test_object_capacitance!r} F",
        "circuit.coupling_capacitance": f"{circuit.coupling_capacitance!r} F",
        "circuit.stray_capacitance": f"{circuit.stray_capacitance!r} F",
        "circuit.arrangement": circuit.arrangement,
        "circuit.calibrator_charge": f"{circuit.calibrator_charge!r} C",
        "instrument.kind": instrument.kind,
        "instrument.f_low": f"{instrument.f_low!r} Hz",
        "instrument.f_high": f"{instrument.f_high!r} Hz",
        "instrument.calibration_factor": repr(rec["calibration_factor"]),
        "instrument.reading_polarity": repr(rec["reading_polarity"]),
        "instrument.transfer_ratio": repr(rec["transfer_ratio"]),
        "instrument.noise": f"{instrument.noise!r} C",
        "instrument.phase_resolution": f"{instrument.phase_resolution_deg!r} deg",
        "seed": ns.seed,
    }
    comments = ["Readings of a SIMULATED IEC 60270 instrument (not a measurement), made by pdvoid measure.",
                *circuit.describe(), *instrument.describe()]
    out = write_events(ev, ns.output, columns=("cycle", "phase", "charge"), units={"charge": "pC"},
                       formats={"cycle": "%d", "phase": "%.4f", "charge": "%.4f"}, metadata=metadata,
                       comments=comments)
    doc = {"file": ns.file, "output": str(out), "input pulses": rec["input pulses"], "readings": ev.count,
           "noise peaks": rec["noise peaks"], "calibration factor [-]": rec["calibration_factor"],
           "reading polarity [-]": rec["reading_polarity"],
           "charge transfer ratio [-]": rec["transfer_ratio"], "peak detector hold [s]": rec["hold"],
           "assumptions": circuit.describe() + instrument.describe(), "safety": SAFETY}
    lines = [f"{ns.file}: {rec['input pulses']} pulses -> {ev.count} readings written to {out}",
             f"  charge transfer ratio {rec['transfer_ratio']:.4g}, calibration factor "
             f"{rec['calibration_factor']:.4g} (calibrator charge / its reading), noise peaks {rec['noise peaks']}",
             *(["  the band-pass turns a positive pulse's largest half-wave negative; readings are referred to it, "
                "so a positive discharge reads positive"] if rec["reading_polarity"] < 0 else []),
             *("  " + s for s in circuit.describe() + instrument.describe())]
    emit(doc, ns.json, lines)
    return 0


def register(sub: argparse._SubParsersAction[argparse.ArgumentParser]) -> None:
    """Add the ``measure`` command to the sub-parsers ``sub``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The sub-parsers of the main parser (from ``ArgumentParser.add_subparsers``).
    """
    p = sub.add_parser("measure", help="read a result (.npz) or events file through a simulated IEC 60270 test "
                       "circuit and instrument, and write the readings as an events file")
    p.add_argument("file")
    p.add_argument("-o", "--output", required=True, help="events file to write (.csv)")
    p.add_argument("--cycles", type=options.integer(1), default=None,
                   help="observed cycles, for event files without time (a count, e.g. 500)")
    p.add_argument("--frequency", type=options.frequency, default=None,
                   help="supply frequency for event files, e.g. 50Hz")
    p.add_argument("--test-object-capacitance", type=capacitance, required=True, help="C_a, e.g. 100pF")
    p.add_argument("--coupling-capacitance", type=capacitance, required=True, help="C_k, e.g. 1nF")
    p.add_argument("--stray-capacitance", type=options.quantity("capacitance", allow_zero=True), default=0.0,
                   help="C_s, e.g. 20pF (default 0)")
    p.add_argument("--arrangement", choices=("coupling-capacitor", "test-object"), default="coupling-capacitor",
                   help="where the measuring impedance sits (default: in series with the coupling capacitor)")
    p.add_argument("--calibrator-charge", type=options.charge, default=100e-12,
                   help="charge of the calibrator, e.g. 100pC (default)")
    p.add_argument("--instrument", choices=("wideband", "narrowband"), default="wideband")
    p.add_argument("--f-low", type=options.frequency, default=None, help="lower limit frequency, e.g. 100kHz")
    p.add_argument("--f-high", type=options.frequency, default=None, help="upper limit frequency, e.g. 500kHz")
    p.add_argument("--centre", type=options.frequency, default=None, help="mid-band frequency, e.g. 100kHz")
    p.add_argument("--bandwidth", type=options.frequency, default=None, help="bandwidth, e.g. 9kHz")
    p.add_argument("--threshold", type=options.charge, default=0.0, help="smallest reading kept, e.g. 10pC")
    p.add_argument("--noise", type=options.charge, default=0.0, help="white noise, RMS as read, e.g. 2pC")
    p.add_argument("--phase-resolution", type=options.angle, default=0.0, help="phase bin width, e.g. 1deg")
    p.add_argument("--gate", type=_gate, action="append", default=[],
                   help="phase window not recorded, START:STOP, e.g. 170deg:190deg (repeatable)")
    p.add_argument("--uncalibrated", action="store_true", help="write the readings before calibration")
    p.add_argument("--seed", type=options.integer(0, 2**32 - 1), default=0, help="seed of the noise (default 0)")
    p.add_argument("--json", action="store_true")
    p.set_defaults(func=_cmd_measure)
