"""Load labels of a case or combination figure: a load -> its value in the unit it was written in, factored
where the combination's factor is not 1, named by its case on a combination's figure."""

from __future__ import annotations

from fractions import Fraction

from beamlang.analysis.display import convert, number
from beamlang.model import LineLoad, MomentLoad, PointLoad
from beamlang.pipeline import Analysis


class LoadLabels:
    """A load's label: its value in the unit it was written in, factored where a factor is not 1 (then the
    written value and its factor are shown too), named by its case on a combination's figure."""

    def __init__(self, a: Analysis, factors: dict[str, Fraction], u: dict):
        self.u, self.factors = u, factors
        self.factored = any(f != 1 for f in factors.values())
        self.combination = len(factors) > 1
        self.statements = {ln.number: st for ln, st in a.loaded.document.statements}
        written = [_unit_of(st, "intensity", "") for st in self.statements.values()]
        # self-weight is written without a unit: it is shown in the unit of the file's first line load
        self.line_unit = next((w for w in written if w), u["force"] + "/" + u["length"])

    def text(self, case: str, load) -> str:
        value, unit = self._value(load)
        f = self.factors[case]
        shown = f"{number(convert(value * f, unit))} {unit}"
        if f != 1:
            shown = f"{number(f)} x {number(convert(value, unit))} = {shown}"
        if isinstance(load, LineLoad) and load.w1 != load.w2:
            shown = (f"{number(convert(abs(load.w1) * f, unit))} to {number(convert(abs(load.w2) * f, unit))} {unit}"
                     + (f" ({number(f)} x the written values)" if f != 1 else ""))
        if isinstance(load, MomentLoad):
            shown += "\n" + ("counterclockwise" if load.moment > 0 else "clockwise")
        what = "self-weight " if getattr(load, "origin", None) == "self-weight" else ""
        return (f"{case}: " if self.combination else "") + what + shown

    def _value(self, load) -> tuple[Fraction, str]:
        """The load's magnitude in SI and the unit its statement wrote it in (the package's where none)."""
        st = self.statements.get(load.span.line)
        if isinstance(load, PointLoad):
            return abs(load.force), _unit_of(st, "force", self.u["force"])
        if isinstance(load, MomentLoad):
            return abs(load.moment), _unit_of(st, "moment", self.u["moment"])
        return abs(load.w1), _unit_of(st, "intensity", self.line_unit)


def _unit_of(st, field: str, default: str) -> str:
    """The unit a load statement wrote its value in (`uniform 15 plf` -> plf)."""
    for name in (field, "start_intensity"):
        q = getattr(st, name, None)
        if q is not None:
            return q.unit
    return default
