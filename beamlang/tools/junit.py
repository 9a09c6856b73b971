"""JUnit XML: analyses and input errors -> one test case per member check (failures and errors as JUnit means them)."""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET

from beamlang.analysis.display import CHECK_QUANTITY, show
from beamlang.errors import BeamError
from beamlang.pipeline import Analysis


def junit_xml(analyses: list[Analysis], errors: list[BeamError]) -> str:
    root = ET.Element("testsuites", name="beamlang")
    totals = {"tests": 0, "failures": 0, "errors": 0}
    for a in analyses:
        m = a.loaded.member
        suite = ET.SubElement(root, "testsuite", name=m.mark, file=a.loaded.source.name)
        failures = 0
        u = a.units
        for c in a.checks:
            case = ET.SubElement(suite, "testcase", classname=m.mark, name=c.label)
            if not c.passed:
                failures += 1
                q = CHECK_QUANTITY[c.unit]
                ET.SubElement(case, "failure", message=(f"actual {show(c.actual, u, q)}, allowed {show(c.allowed, u, q)}, "
                                                        f"ratio {c.ratio:.3f}"), type="check failed")
        suite.set("tests", str(len(a.checks)))
        suite.set("failures", str(failures))
        suite.set("errors", "0")
        totals["tests"] += len(a.checks)
        totals["failures"] += failures
    for exc in errors:
        name = exc.diagnostics[0].span.file if exc.diagnostics else "input"
        suite = ET.SubElement(root, "testsuite", name=name, tests="1", failures="0", errors="1")
        case = ET.SubElement(suite, "testcase", classname=name, name="input")
        ET.SubElement(case, "error", message=exc.diagnostics[0].message if exc.diagnostics else "input error",
                      type="input error").text = exc.render()
        totals["tests"] += 1
        totals["errors"] += 1
    for key, value in totals.items():
        root.set(key, str(value))
    for element in root.iter():
        element.text = _xml_legal(element.text)
        for key, value in element.attrib.items():
            element.set(key, _xml_legal(value))
    ET.indent(root)
    return '<?xml version="1.0" encoding="utf-8"?>\n' + ET.tostring(root, encoding="unicode") + "\n"


_ILLEGAL = re.compile("[^\t\n\r\u0020-\ud7ff\ue000-\ufffd\U00010000-\U0010ffff]")


def _xml_legal(text: str | None) -> str | None:
    """XML 1.0 allows no C0 control but tab, LF and CR, no surrogate and neither U+FFFE nor U+FFFF: each is
    written as U+FFFD, so that one odd character cannot make the whole file unreadable to a CI server."""
    return _ILLEGAL.sub("\ufffd", text) if text else text
