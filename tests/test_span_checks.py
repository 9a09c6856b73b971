"""Each span and each overhang is checked against its own deflection limit (`limit deflection CASE span/N`)."""

import json
from fractions import Fraction as F

from beamlang.cli import main
from engine_helpers import member_text

W, EI = F(5000), F(200 * 10**9) * F(8, 10**5)  # 5 kN/m; E 200 GPa x I 8e7 mm^4 (member_text's section)


def _checks(tmp_path, monkeypatch, capsys, length, supports, loads, limit):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.beam").write_text(member_text(length, supports, {"a": loads}, extra=[limit]), encoding="utf-8")
    assert main(["check", "--json", "m.beam"]) == 0
    return json.loads(capsys.readouterr().out)[0]["checks"]


def test_three_equal_spans_each_against_its_own_span(tmp_path, monkeypatch, capsys):
    # [AISC] Steel Construction Manual, 15th ed., Table 3-23, case 35 (three equal spans, uniform load;
    # from memory): largest deflection 0.0069 w l^4 / (E I) at 0.446 l from each end support.
    # The middle span, with support moments -w l^2 / 10 (same case), deflects at its centre
    # 5 w l^4 / (384 E I) - (w l^2 / 10) l^2 / (8 E I) = w l^4 / (1920 E I) (superposition; statics).
    l = F(2)
    checks = _checks(tmp_path, monkeypatch, capsys, "6 m",
                     ["pin at 0 m", "roller at 2 m", "roller at 4 m", "roller at span"],
                     ["uniform 5 kN/m down"], "limit deflection a span/360")
    assert [c["place"] for c in checks] == ["span 1", "span 2", "span 3"]
    assert [(c["from_m"], c["to_m"]) for c in checks] == [(0, 2), (2, 4), (4, 6)]
    assert all(c["allowed"] == float(l / 360) for c in checks)
    end = float(W * l**4 / EI)
    assert round(checks[0]["actual"] / end, 4) == 0.0069 and round(checks[2]["actual"] / end, 4) == 0.0069
    assert round(checks[0]["x_m"] / 2, 3) == 0.446 and round((6 - checks[2]["x_m"]) / 2, 3) == 0.446
    assert checks[1]["actual"] == float(W * l**4 / (1920 * EI)) and checks[1]["x_m"] == 3


def test_an_overhang_is_checked_as_a_cantilever(tmp_path, monkeypatch, capsys):
    # [AISC] Table 3-23, case 24 (overhang of length a beyond a span L, uniform load on the overhang only;
    # from memory): tip deflection w a^3 (4 L + 3 a) / (24 E I). The overhang's allowed value takes
    # twice its length as the span of a span/N rule (common practice, no source).
    L, a = F(4), F(1)
    checks = _checks(tmp_path, monkeypatch, capsys, "5 m", ["pin at 0 m", "roller at 4 m"],
                     ["uniform 5 kN/m down from 4 m to span"], "limit deflection a span/360")
    tip = next(c for c in checks if c["region"] != "span")
    assert tip["actual"] == float(W * a**3 * (4 * L + 3 * a) / (24 * EI)) and tip["x_m"] == 5
    assert tip["allowed"] == float(2 * a / 360)
    assert [c["place"] for c in checks if c["region"] == "span"] == ["span 1"]
