"""Margins of flat delaminations (diameter/height from 10:1 to 1000:1): no floating-point edge at the smallest void
the search tries."""

from __future__ import annotations

import math
import warnings

import pytest

import pdvoid


@pytest.mark.parametrize("ratio", [10, 30, 100, 300, 1000])
def test_largest_pd_free_void_of_flat_delaminations(demo, ratio):
    # the answer of the flatter ones is a void about 19 µm tall, near the Paschen minimum: the search says so once,
    # as a ValidityWarning and in LargestVoid.notes (pdvoid.coefficients.limits.warn_near_paschen_minimum)
    sc = demo.replace(**{"void.shape": "cylinder", "void.diameter": 3e-3, "void.height": 3e-3 / ratio})
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", pdvoid.ValidityWarning)
        lv = pdvoid.largest_pd_free_void(sc, 18e3)
    assert [str(w.message) for w in caught] == list(lv.notes)
    near = 0.7599 / 3.0 <= 101325.0 * lv.height <= 3.0 * 0.7599  # a factor 3 around the air minimum (hvc_paschen)
    assert any("Paschen minimum" in n for n in lv.notes) == near
    assert lv.height / lv.diameter == pytest.approx(1.0 / ratio, rel=1e-9)
    if lv.limited_by == "":
        assert lv.inception_voltage == pytest.approx(18e3, rel=1e-9)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", pdvoid.ValidityWarning)  # the same notes again, checked above
        dm = pdvoid.design_margin(sc, 10e3)
    assert dm.test_voltage == pytest.approx(10e3 * math.sqrt(3.0))  # √3·U0, common practice
    assert 0.0 < dm.largest_void_diameter < 0.5 * sc.insulation.thickness * ratio


def test_margin_command_on_a_1000_to_1_delamination(demo, tmp_path, capsys):
    from pdvoid.faces.cli import main

    path = tmp_path / "flat.toml"
    demo.replace(**{"void.shape": "cylinder", "void.diameter": 3e-3, "void.height": 3e-6}).to_file(path)
    assert main(["margin", str(path), "--test-voltage", "18kV", "--nominal-voltage", "10kV"]) == 0
    assert "SAFETY" in capsys.readouterr().out


@pytest.mark.slow
@pytest.mark.parametrize("ratio", [10, 1000])
def test_report_command_on_flat_delaminations(demo, tmp_path, capsys, ratio):
    from pdvoid.faces.cli import main

    path = tmp_path / f"flat{ratio}.toml"
    demo.replace(**{"void.shape": "cylinder", "void.diameter": 3e-3, "void.height": 3e-3 / ratio}).to_file(path)
    out = tmp_path / f"flat{ratio}.pdf"
    assert main(["report", str(path), "--test-voltage", "18kV", "--out", str(out), "--cycles", "50"]) == 0
    assert out.stat().st_size > 10_000 and "safety" in capsys.readouterr().out.lower()
