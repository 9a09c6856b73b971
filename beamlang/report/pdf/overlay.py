"""Overlay: the members' own PDFs + the set's frame PDF (its contents sheets, then one page per member sheet that
carries only that sheet's set number) -> the calc set's PDF bytes, through pikepdf (qpdf); and the drawing of such
frame pages over sheets, which a member typeset in parts also uses for its sheet numbers (`parts.py`).

Every member sheet is copied whole, its content streams and resources untouched, so its text, figures and fonts are
those its own PDF has; its frame page is drawn over it as a form XObject: the sheet's contents become `q`, its own
streams, `Q /BlSetNumber Do` (two small streams that every sheet shares). Saved with an ID made from the content
and with the frame's document information (title, and the members' date, never the clock), so the same members give
the same bytes."""

from __future__ import annotations

import io
from collections.abc import Callable
from contextlib import ExitStack
from pathlib import Path

NUMBER = "/BlSetNumber"  # the frame page's form XObject, in each member sheet's resources


def _form(page):
    """A frame page as a form XObject: its one content stream, as compressed, given the page's box and resources."""
    import pikepdf
    form = page.Contents
    if not isinstance(form, pikepdf.Stream):
        return pikepdf.Page(page).as_form_xobject()
    form.Type, form.Subtype = pikepdf.Name.XObject, pikepdf.Name.Form
    form.BBox, form.Resources = page.MediaBox, page.Resources
    return form


def _version(text: str) -> tuple[int, ...]:
    return tuple(int(part) for part in text.split("."))


def drawn_over(out, frame, first: int, name: str) -> None:
    """The pages of the open PDF `frame` from its `first` on, drawn in turn over the sheets of `out` as the form
    XObject `name`: each sheet's contents become `q`, its own streams, `Q name Do` (two small streams that every
    sheet shares)."""
    import pikepdf
    push, draw = out.make_stream(b"q\n"), out.make_stream(f"\nQ {name} Do\n".encode("ascii"))
    # the frame pages as form XObjects, copied in one call (one copy of the fonts they share)
    forms = out.copy_foreign(frame.make_indirect(pikepdf.Array([_form(page.obj) for page in frame.pages[first:]])))
    for sheet, form in zip(out.pages, forms):
        page = sheet.obj
        own = page.Contents
        page.Contents = pikepdf.Array([push, *(own if isinstance(own, pikepdf.Array) else [own]), draw])
        # the sheet's own resources and XObjects (sheets may share them), with its number added
        resources = pikepdf.Dictionary(page.Resources)
        resources.XObject = pikepdf.Dictionary(resources.get(pikepdf.Name.XObject, {}))
        resources.XObject[name] = form
        page.Resources = resources


def laid_over(frame: Callable[[], bytes], members: list[Path]) -> bytes:
    """The frame's contents sheets, then every sheet of each member PDF in turn with the frame's next page drawn over
    it. The members' sheets are copied first, while the frame may still be typeset (`frame()` waits for it)."""
    import pikepdf
    with ExitStack() as stack:  # qpdf reads a copied stream's data from its source when the result is written
        out = stack.enter_context(pikepdf.new())
        versions = []
        for path in members:
            own = stack.enter_context(pikepdf.open(path))
            out.pages.extend(own.pages)
            versions.append(own.pdf_version)
        numbers = stack.enter_context(pikepdf.open(io.BytesIO(frame())))
        contents = len(numbers.pages) - len(out.pages)
        if contents < 1:
            raise ValueError(f"the frame has {len(numbers.pages)} pages for {len(out.pages)} member sheets")
        drawn_over(out, numbers, contents, NUMBER)
        for k, page in enumerate(numbers.pages[:contents]):
            out.pages.insert(k, page)
        out.docinfo = out.copy_foreign(numbers.docinfo)
        buffer = io.BytesIO()
        out.save(buffer, deterministic_id=True, min_version=max(versions, key=_version))
        return buffer.getvalue()
