"""The words of the language -> one place for the parser's messages, the highlighter and the editor server.

`grammar/beam.lark` is the authority; these tuples repeat its words for the tools that do not parse, and
`tests/test_lexer.py` checks them against the grammar's text."""

from __future__ import annotations

FIELDS = ("project", "job", "by", "checked", "date", "revision")
KEYWORDS = ("member", *FIELDS, "units", "span", "material", "section", "support", "hinge", "case", "point",
            "uniform", "linear", "moment", "self-weight", "settlement", "moving", "combine", "pattern", "limit", "check",
            "report", "note", "catalogue", "include")
SHAPES = ("properties", "rectangle", "round", "tube", "box", "I-shape")
SUPPORT_KINDS = ("fixed", "pin", "roller", "spring")
FORCE_DIRECTIONS = ("down", "up")
TURN_DIRECTIONS = ("clockwise", "counterclockwise")
SYSTEMS = ("si", "us")
CONNECTIVES = ("at", "from", "to", "and", "spaced", "over", "deflection", "slope", "supports", "stress", "x", "span",
               "allowable", "shear", "deformation", "frequency", "mass")
LOADS = ("point", "uniform", "linear", "moment", "self-weight", "settlement", "moving")
TARGETED = ("combine", "pattern", "limit", "check")  # statements that name cases or combinations

# keyword -> (the statement's form, what it means): the editor server's hover and completion text
FORMS: dict[str, tuple[str, str]] = {
    "member": ('member MARK "title"', "the member; MARK (letters, digits, `.`, `_`, `-`) names its output folder"),
    **{f: (f'{f} "text"', "a title-block field, taken from the file, never from the clock") for f in FIELDS},
    "units": ("units si | units us", "the report units; default from the unit of the span"),
    "span": ("span LENGTH", "the total length of the member"),
    "material": ("material [NAME] E STRESS [G STRESS] [yield STRESS | allowable bending STRESS] [shear STRESS] "
                 "[density DENSITY] [from POS to POS]",
                 "elastic modulus (required); the shear modulus (for shear deformation); a metal's yield strength, or "
                 "the allowable (design) bending stress of timber or aluminium with its allowable shear; shear "
                 "strength and density (optional)"),
    "section": ('section ["designation"] SHAPE DIMENSIONS [from POS to POS]',
                "the cross-section: properties, rectangle, round, tube, box or I-shape"),
    "support": ("support fixed|pin|roller at POS  or  support spring STIFFNESS at POS",
                "a support; `fixed` also stops rotation, `spring` is an elastic vertical support"),
    "hinge": ("hinge at POS", "an internal moment release: zero moment there, the slope may jump"),
    "case": ('case NAME ["title"]', "a load case; its loads follow on the indented lines below"),
    "point": ("point FORCE down|up at POS", "a concentrated force"),
    "uniform": ("uniform W [over WIDTH] down|up [from POS to POS]",
                "a uniform line load, the whole member unless a range is given; with `over`, W is a pressure "
                "gathered from the tributary width WIDTH"),
    "linear": ("linear W1 to W2 [over WIDTH] down|up from POS to POS",
               "a linearly varying line load; with `over`, pressures gathered from the tributary width WIDTH"),
    "moment": ("moment M clockwise|counterclockwise at POS", "a concentrated moment"),
    "self-weight": ("self-weight", "density x area x standard gravity (9.80665 m/s^2), down"),
    "settlement": ("settlement D down|up at POS", "a prescribed movement of the support at POS in this case"),
    "moving": ("moving F [and F ...] down|up [spaced S [and S ...]] [from POS to POS]",
               "a group of forces at fixed spacings travelling along the member"),
    "combine": ("combine NAME = [F] CASE + [F] CASE ...", "a factored sum of cases"),
    "pattern": ("pattern CASE", "pattern loading: the case applied span by span (each span and overhang loaded "
                "or not) in the worst arrangement for each effect"),
    "limit": ("limit deflection TARGET span/N | LENGTH  or  limit slope [TARGET] at supports ANGLE  or  "
              "limit frequency FREQUENCY mass [F] CASE + ...",
              "a deflection limit on a case or combination, a slope limit at the bearings, or the least "
              "fundamental frequency with the cases whose loads are the mass"),
    "check": ("check stress TARGET", "the elastic bending and shear stress check of a case or combination"),
    "report": ("report deflection at POS", "an extra point to report"),
    "note": ('note "text"', "an assumption carried into the calc package"),
    "catalogue": ('catalogue "FILE.csv"', "the sections `beamlang size` tries for this member"),
    "include": ("include shear deformation",
                "deflections add the shear part V / (kappa G A); needs G on the material line"),
}
