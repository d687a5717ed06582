"""collect_validity_notes: validity warnings become notes (in order, without repeats); other warnings pass."""

from __future__ import annotations

import warnings

import pytest

from pdvoid.core.validity import ValidityWarning, collect_validity_notes, warn_validity


def test_notes_collected_in_order_without_repeats_and_not_issued():
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # a validity warning escaping the block would fail here
        with collect_validity_notes() as notes:
            warn_validity("second-hand closed form")
            warn_validity("near the Paschen minimum")
            warn_validity("second-hand closed form")
    assert notes == ["second-hand closed form", "near the Paschen minimum"]


def test_other_warnings_are_issued_again():
    with pytest.warns(RuntimeWarning, match="not a validity note"), collect_validity_notes() as notes:
        warnings.warn("not a validity note", RuntimeWarning, stacklevel=1)
    assert notes == []
    assert issubclass(ValidityWarning, UserWarning)
