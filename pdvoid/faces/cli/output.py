"""What every command prints: the safety note, strict JSON, and numbers with their units."""

from __future__ import annotations

import json
import math

import numpy as np

__all__ = ["SAFETY", "json_safe", "emit", "fmt"]

SAFETY = (
    "SAFETY: high voltage can kill. These results are engineering estimates from idealised models. Test and "
    "acceptance levels come from the applicable standards; local codes and licensed practice prevail."
)


def json_safe(obj):
    """JSON-safe: NaN/inf → None, numpy → Python."""
    if isinstance(obj, dict):
        return {str(k): json_safe(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [json_safe(v) for v in obj]
    if isinstance(obj, np.ndarray):
        return json_safe(obj.tolist())
    if isinstance(obj, (np.floating, float)):
        x = float(obj)
        return x if math.isfinite(x) else None
    if isinstance(obj, np.integer):
        return int(obj)
    return obj


def emit(doc: dict, as_json: bool, text_lines: list[str]) -> None:
    if as_json:
        print(json.dumps(json_safe(doc), indent=2))
    else:
        print("\n".join(text_lines))
        print(SAFETY)


def fmt(value: float, unit: str, scale: float = 1.0, digits: int = 4) -> str:
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "n/a"
    return f"{value / scale:.{digits}g} {unit}"
