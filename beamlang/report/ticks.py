"""Axis ticks: round tick steps, their labels with a shared number of decimals, and data limits with margins."""

from __future__ import annotations

import math


def nice_ticks(lo: float, hi: float, least: int) -> tuple[list[float], float]:
    """Ticks in [lo, hi] at the largest step of 1, 2, 2.5 or 5 times a power of ten that gives at least
    `least` of them."""
    k = math.floor(math.log10(hi - lo))
    for step in sorted((m * 10.0**e for e in range(k - 3, k + 2) for m in (1, 2, 2.5, 5)), reverse=True):
        first, last = math.ceil(lo / step - 1e-9), math.floor(hi / step + 1e-9)
        if last - first + 1 >= least:
            return [k * step for k in range(first, last + 1)], step
    return [lo, hi], hi - lo  # pragma: no cover - a range of less than a thousandth of its own size


def tick_labels(values: list[float], step: float) -> tuple[list[str], int]:
    """Labels with as many decimals as the step needs, and a power of ten taken out when the numbers are
    very large or small (the axis label then says x10^k)."""
    big = max((abs(v) for v in values), default=0.0)
    exp = math.floor(math.log10(big)) if big and (big >= 1e5 or big < 1e-3) else 0
    scaled = step / 10.0**exp
    decimals = max(0, -math.floor(math.log10(scaled) + 1e-9))
    if abs(scaled * 10**decimals - round(scaled * 10**decimals)) > 1e-6:  # a step of 2.5 x 10^k
        decimals += 1
    out = []
    for v in values:
        s = f"{v / 10.0**exp:.{decimals}f}"
        out.append(s.lstrip("-") if float(s) == 0 else s.replace("-", "\u2212"))
    return out, exp


def limits(lo: float | None, hi: float | None, margin: float = 0.05) -> tuple[float, float]:
    """Data extent plus a margin on each side; a flat extent is opened up around its value."""
    if lo is None or hi is None:
        return 0.0, 1.0
    if hi - lo <= 1e-12 * max(abs(lo), abs(hi), 1e-300):
        d = abs(lo) * 0.1 or 1.0
        return lo - d, hi + d
    d = (hi - lo) * margin
    return lo - d, hi + d
