"""Command line: arguments -> the stage functions; exit codes 0 ok, 1 check failed, 2 input error, 3 internal error,
4 the file system refused (a read-only or full disk, a path under a file, a folder where a file goes)."""

from __future__ import annotations

import argparse
import errno
import sys
import traceback
from pathlib import Path

from beamlang import __version__
from beamlang.errors import BeamError, visible

EXIT_OK, EXIT_FAIL, EXIT_INPUT, EXIT_INTERNAL, EXIT_FILES = 0, 1, 2, 3, 4


def main(argv: list[str] | None = None) -> int:
    parser = _parser()
    args = parser.parse_args(argv)
    if not getattr(args, "command", None):
        parser.print_help(sys.stderr)
        return EXIT_INPUT
    try:
        return args.run(args)
    except BeamError as exc:
        print(exc.render(), file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        return 130
    except OSError as exc:  # the disk or the folders, not our bug and not the input's
        if args.debug:
            traceback.print_exc()
        print(file_problem(exc), file=sys.stderr)
        return EXIT_FILES
    except Exception:  # our own bug: never dress it up as the user's mistake
        if args.debug:
            traceback.print_exc()
        else:
            kind = sys.exc_info()[0].__name__
            print(f"beamlang: internal error ({kind}); please report it with the input file "
                  "(run again with --debug to see the traceback)", file=sys.stderr)
        return EXIT_INTERNAL


_WHY = {getattr(errno, name): why for name, why in (
    ("ENOSPC", "no space left on the device"), ("EROFS", "the file system is read-only"),
    ("EACCES", "permission denied"), ("EPERM", "permission denied"),
    ("ENOTDIR", "a part of the path is a file, not a folder"), ("EISDIR", "it is a folder, not a file"),
    ("EEXIST", "a file of that name is in the way"), ("EDQUOT", "the disk quota is used up"),
    ("ENAMETOOLONG", "the name is too long"), ("EIO", "the disk reported an input/output error"),
    ("ENOENT", "a folder on the way does not exist")) if hasattr(errno, name)}


def file_problem(exc: OSError) -> str:
    """`beamlang: cannot write out/B-3: no space left on the device (ENOSPC)`: what failed, where and why."""
    why = _WHY.get(exc.errno, exc.strerror or str(exc))
    code = f" ({errno.errorcode[exc.errno]})" if exc.errno in errno.errorcode else ""
    where = f" {visible(str(exc.filename))}" if exc.filename is not None else ""
    return f"beamlang: file-system error on{where}: {why}{code}"


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="beamlang", description="Exact beam deflection and stress checks from .beam files.")
    p.add_argument("--version", action="version", version=f"beamlang {__version__}")
    p.add_argument("--debug", action="store_true", help="show a traceback on an internal error")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

    fmt = sub.add_parser("fmt", help="rewrite .beam files in the canonical layout")
    fmt.add_argument("paths", nargs="+", metavar="FILES|DIRS")
    fmt.add_argument("--check", action="store_true", help="change nothing; exit 1 listing files that would change")
    fmt.set_defaults(run=_run_fmt)
    build = sub.add_parser("build", help="write the calc package of each member (Markdown, HTML, SVG, JSON)")
    build.add_argument("paths", nargs="+", metavar="FILES|DIRS")
    build.add_argument("-o", "--out", default="out", help="output folder (default: out)")
    build.add_argument("--jobs", type=int, default=1, help="members built in parallel (default 1)")
    build.add_argument("--since", metavar="REV", help="add a 'Changes since REV' section computed by the diff")
    build.add_argument("--paper", choices=("a4", "letter"),
                       help="sheet size of the PDFs for members without a `paper` line (default: A4, US letter "
                            "for US members)")
    build.add_argument("--force", action="store_true", help="rebuild every package, even those that are current")
    build.set_defaults(run=_run_build)
    watch = sub.add_parser("watch", help="rebuild the packages of changed members on save")
    watch.add_argument("paths", nargs="+", metavar="FILES|DIRS")
    watch.add_argument("-o", "--out", default="out", help="output folder (default: out)")
    watch.set_defaults(run=_run_watch)
    check = sub.add_parser("check", help="solve members and run their checks; exit 1 if any check fails")
    check.add_argument("paths", nargs="+", metavar="FILES|DIRS")
    check.add_argument("--json", action="store_true", help="print results.json objects (a list) instead of tables")
    check.add_argument("--junit", metavar="FILE", help="also write JUnit XML: one test case per member check")
    size = sub.add_parser("size", help="the lightest section of a catalogue that passes every check")
    size.add_argument("member", metavar="MEMBER.beam")
    size.add_argument("--catalogue", metavar="FILE.csv",
                      help="CSV with a header name,section (see beamlang/catalogues/); default: the member's "
                           "`catalogue` line")
    size.add_argument("--write", action="store_true", help="write the chosen section into the member file")
    size.set_defaults(run=_run_size)
    diff = sub.add_parser("diff", help="what a revision changed: inputs, results and check status")
    diff.add_argument("sides", nargs="*", metavar="OLD NEW | PATHS",
                      help="two files (either may be REV:path), or with --rev the paths to compare")
    diff.add_argument("--rev", help="compare every .beam file under PATHS between REV and the working tree")
    diff.add_argument("--format", choices=("text", "markdown", "json"), default="text")
    diff.add_argument("--fail-on", choices=("regression",), help="exit 1 when any check fails or gets worse")
    diff.add_argument("--threshold", type=float, default=0.05,
                      help="flag a check whose ratio moves by more than this fraction (default 0.05)")
    diff.set_defaults(run=_run_diff)
    lsp = sub.add_parser("lsp", help="serve editors by the Language Server Protocol over stdio")
    lsp.set_defaults(run=_run_lsp)
    check.set_defaults(run=_run_check)
    for sp in sub.choices.values():
        sp.add_argument("--debug", action="store_true", default=argparse.SUPPRESS, help=argparse.SUPPRESS)
    return p


def _each(paths: list[str]):
    """Load every file, collecting input errors so that all are reported; yields the good ones."""
    from beamlang.language.frontend import expand, load, without_colliding_marks
    files = expand(paths)
    if not files:
        print("beamlang: no .beam files found in " + " ".join(paths), file=sys.stderr)
    errors: list[BeamError] = []
    loaded = []
    for path in files:
        try:
            loaded.append(load(path))
        except BeamError as exc:
            errors.append(exc)
    loaded, collision = without_colliding_marks(loaded)
    if collision is not None:
        errors.append(collision)
    return loaded, errors, bool(files)


def _report(errors: list[BeamError]) -> None:
    for exc in errors:
        print(exc.render(), file=sys.stderr)


def _run_fmt(args: argparse.Namespace) -> int:
    from beamlang.language.fmt import format_document
    from beamlang.tools.files import write_text_atomically
    loaded, errors, found = _each(args.paths)
    _report(errors)
    changed = []
    for item in loaded:
        text = format_document(item.document)
        if text != item.source.text:
            changed.append(item)
            if not args.check:
                write_text_atomically(item.path, text)
    for item in changed:
        verb = "would reformat" if args.check else "reformatted"
        print(f"{verb} {item.source.name}", file=sys.stderr)
    if errors or not found:
        return EXIT_INPUT
    return EXIT_FAIL if (args.check and changed) else EXIT_OK


def _run_build(args: argparse.Namespace) -> int:
    loaded, errors, found = _each(args.paths)
    _report(errors)
    out = Path(args.out)
    jobs = max(1, args.jobs)
    settings = (args.since, args.paper, args.force)
    keys = [_key(item, args.paper) for item in loaded]
    # up-to-date packages need no worker (never with --since, whose section depends on the repository, nor --force)
    fresh = [None if (args.since or args.force) else _fresh(item, out, key) for item, (key, _) in zip(loaded, keys)]
    items = [item for item, done in zip(loaded, fresh) if done is None]
    known = [key for key, done in zip(keys, fresh) if done is None]

    def in_order(built):
        built = iter(built)
        for done in fresh:
            yield done if done is not None else next(built)

    calls = [(item, key, out, settings) for item, key in zip(items, known)]
    # several stale members are built in worker processes, even with --jobs 1, so that each worker can be replaced
    # after MEMBERS_PER_WORKER of them (the typesetter's caches are never emptied); a single one is built here
    from beamlang.tools.workers import in_workers
    built = in_workers(_build_one, calls, jobs) if len(items) > 1 else (_build_one(*call) for call in calls)
    outcomes = _progress(in_order(built), len(loaded))
    if any(Path(p).is_dir() for p in args.paths) and outcomes and not errors:
        from beamlang.report.package import folder_name
        from beamlang.report.pdf.calcset import write_set
        for path in write_set(out, [folder_name(item.member.mark) for item in loaded], args.paper or "a4"):
            print(f"wrote {path.as_posix()}", file=sys.stderr)
    if errors or not found:
        return EXIT_INPUT
    return EXIT_OK if all(p == t for _, p, t, _b in outcomes) else EXIT_FAIL


def _progress(outcomes, n: int) -> list[tuple[str, int, int, bool]]:
    """One line per member as it is done; on a terminal each line is numbered, so the count shows the progress."""
    done = []
    tty = sys.stderr.isatty()
    for i, (folder, passed, total, rebuilt) in enumerate(outcomes, start=1):
        prefix = f"[{i}/{n}] " if tty else ""
        verb = "built" if rebuilt else "up to date"
        print(f"{prefix}{verb} {folder} ({passed} of {total} checks pass)", file=sys.stderr, flush=True)
        done.append((folder, passed, total, rebuilt))
    return done


def _key(item, paper) -> tuple[str, str | None]:
    """(the build key of a member's package, its PDF's fallback date): what an up-to-date package recorded."""
    from beamlang.language.frontend import recorded_name
    from beamlang.report.package import build_key
    from beamlang.report.pdf import Options
    from beamlang.tools.history import commits, fallback_date
    date = None if dict(item.member.fields).get("date") else fallback_date(item.path)
    options = Options(paper=paper, fallback_date=date)
    return build_key(item.source.text, repr((recorded_name(item), options, commits(item.path)))), date


def _fresh(item, out: Path, key: str) -> tuple[str, int, int, bool] | None:
    """The outcome of a package whose record shows the same key (its hidden leftovers tidied), else None."""
    from beamlang.report.package import folder_name, tidy, up_to_date
    record = up_to_date(out, item.member.mark, key)
    if record is None:
        return None
    tidy(out / folder_name(item.member.mark))
    return (out / folder_name(item.member.mark)).as_posix(), record["passed"], record["checks"], False


def _build_one(item, known: tuple[str, str | None], out: Path, settings: tuple) -> tuple[str, int, int, bool]:
    """One member's package (runs in a worker process with --jobs); `known` is its `_key`."""
    from beamlang.pipeline import analyse_loaded
    from beamlang.report.package import write_package
    from beamlang.report.pdf import Options
    from beamlang.tools.history import revisions
    since, paper, _force = settings
    key, date = known
    a = analyse_loaded(item)
    rows, previous = revisions(item, a)
    options = Options(paper=paper, fallback_date=date, revisions=rows)
    folder = write_package(a, out, _changes_since(since, item, a) if since else (), options, key, previous)
    return folder.as_posix(), sum(c.passed for c in a.checks), len(a.checks), True


def _changes_since(rev: str, item, a) -> list[str]:
    """The 'Changes since REV' section of a package: the diff of this member's file against REV."""
    from beamlang.tools import diffout
    from beamlang.tools.diff import Invalid, diff_members
    from beamlang.tools.gitsource import files_at
    from beamlang.report.tex import md
    name = item.path.as_posix()
    old = _side(f"{rev}:{name}") if name in files_at(rev, [name]) else None
    d = diff_members(name, old, a)
    body = diffout.markdown([d]).split("\n", 2)[2] if old else "The file did not exist at this revision.\n"
    if isinstance(old, Invalid):
        body = "The file had input errors at this revision; every check is shown as new.\n\n" + body
    return [f"## Changes since {md(rev)}", "", body.rstrip("\n") or "No change.", ""]


def _run_watch(args: argparse.Namespace) -> int:
    from beamlang.tools.watch import watch_loop
    watch_loop(args.paths, Path(args.out))
    return EXIT_OK


def _run_check(args: argparse.Namespace) -> int:
    import json

    from beamlang.pipeline import analyse_loaded
    loaded, errors, found = _each(args.paths)
    _report(errors)
    analyses = [analyse_loaded(item) for item in loaded]
    if args.junit:
        from beamlang.tools.junit import junit_xml
        from beamlang.tools.files import write_text_atomically
        write_text_atomically(args.junit, junit_xml(analyses, errors))
    if args.json:
        from beamlang.report.jsonout import member_json
        print(json.dumps([member_json(a) for a in analyses], indent=2))
    else:
        from beamlang.report.table import member_table
        print(visible("\n".join(member_table(a) for a in analyses)), end="")
    if errors or not found:
        return EXIT_INPUT
    return EXIT_OK if all(a.passed for a in analyses) else EXIT_FAIL


def _run_size(args: argparse.Namespace) -> int:
    from beamlang.language.frontend import load
    from beamlang.analysis.display import convert
    from beamlang.tools.size import catalogue_named, catalogue_of, designation_of, read_catalogue, section_line
    from beamlang.tools.size import shown, try_all, with_section
    item = load(Path(args.member))
    catalogue = catalogue_named(args.catalogue) if args.catalogue else catalogue_of(item)
    rows = read_catalogue(catalogue)
    trials = try_all(item, rows, shown(catalogue))
    passing = [t for t in trials if t.passed]
    us, density = item.member.units == "us", item.member.material.density
    weight_unit = ("lbf/ft" if us else "N/m") if density else ("in^2" if us else "mm^2")  # as engineers list them
    unit = weight_unit if density else f"{weight_unit} (area: no density given)"
    print(f"{item.member.mark}: {len(trials)} sections tried from {shown(catalogue)}, {len(passing)} pass; "
          f"lightest first (weight in {unit})")
    for t in trials:
        mark = "->" if passing and t is passing[0] else "  "
        if t.problem:
            print(f"  {mark} {t.name:<16} not tried: {t.problem}")
            continue
        weight = f"{float(convert(t.weight, weight_unit)):.4g}" if t.weight is not None else "-"
        ratio = f"{t.ratio:.3f} ({t.governing})" if t.ratio is not None else "no checks"
        print(f"  {mark} {t.name:<16} {weight:>10}  {'PASS' if t.passed else 'FAIL'}  governing ratio {ratio}")
    if not passing:
        print("no section of the catalogue passes every check")
        return EXIT_FAIL
    best = passing[0]
    runners = ", ".join(f"{t.name} ({t.ratio:.3f})" for t in passing[1:4])
    print(f"lightest passing: {best.name}" + (f"; next: {runners}" if runners else ""))
    if args.write:
        others = tuple(name for _, name, _ in rows) + ((designation_of(item) or ""),)
        text = with_section(item, best.section, best.name, others)
        from beamlang.tools.files import write_text_atomically
        write_text_atomically(args.member, text)
        print(f"wrote `{section_line(item, text)}` into {item.source.name}")
    return EXIT_OK


def _run_diff(args: argparse.Namespace) -> int:
    import os

    from beamlang.tools import diffout
    from beamlang.tools.diff import diff_members
    pairs = _diff_pairs(args)
    diffs = [diff_members(name, old, new, args.threshold) for name, old, new in pairs]
    if args.format == "json":
        print(diffout.as_json(diffs), end="")
    elif args.format == "markdown":
        print(diffout.markdown(diffs), end="")
    else:
        colour = sys.stdout.isatty() and "NO_COLOR" not in os.environ
        print(diffout.text(diffs, colour) if colour else visible(diffout.text(diffs, colour)), end="")
    if args.fail_on == "regression" and any(d.regression for d in diffs):
        return EXIT_FAIL
    return EXIT_OK


def _run_lsp(args: argparse.Namespace) -> int:
    try:
        from beamlang.tools.lsp.server import run
    except ImportError as exc:
        if (exc.name or "").split(".")[0] not in ("pygls", "lsprotocol", "cattrs", "attrs"):
            raise  # our own bug, not a missing optional dependency
        print(f"beamlang lsp needs pygls 2 and lsprotocol: pip install 'beamlang[lsp]' ({exc})", file=sys.stderr)
        return EXIT_INPUT
    return run()


def _diff_pairs(args: argparse.Namespace) -> list:
    """[(name, old analysis or None, new analysis or None)] for the two forms of `diff`."""
    from beamlang.language.frontend import expand
    from beamlang.tools.gitsource import files_at
    if args.rev:
        old_files = set(files_at(args.rev, args.sides))
        new_files = {p.as_posix() for p in expand(args.sides or ["."])}
        names = sorted(old_files | new_files)
        return [(n, _side(f"{args.rev}:{n}") if n in old_files else None, _side(n) if n in new_files else None)
                for n in names]
    if len(args.sides) != 2:
        raise BeamError([_usage("diff takes OLD and NEW (each a file or REV:path), or --rev REV [PATHS]")])
    old, new = args.sides
    return [(new if old.split(":")[-1] == new.split(":")[-1] else f"{old} -> {new}", _side(old), _side(new))]


def _side(arg: str):
    """A file, or REV:path read through git; analysed, or `Invalid` with its input errors (a revision under review
    may fix them: the diff goes on). A file that cannot be read at all is still an error."""
    from beamlang.language.frontend import from_source
    from beamlang.tools.diff import Invalid
    from beamlang.tools.gitsource import read_revision
    from beamlang.language.parse import read_source
    from beamlang.pipeline import analyse_loaded
    if ":" in arg and not Path(arg).exists():
        rev, _, path = arg.partition(":")
        source = read_revision(rev, path)
    else:
        source = read_source(arg)
    try:
        loaded = from_source(source, Path(source.name))
    except BeamError as exc:
        return Invalid(exc)
    return analyse_loaded(loaded)


def _usage(message: str):
    from beamlang.errors import Diagnostic
    from beamlang.source import Span
    return Diagnostic(Span("beamlang", 1, 1, 2), message)


if __name__ == "__main__":
    sys.exit(main())
