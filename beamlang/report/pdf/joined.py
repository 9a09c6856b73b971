"""Joined: the PDFs Typst wrote for a member's parts (`parts.py`) + the frame of its sheet numbers -> one PDF, through
pikepdf (qpdf), as tagged and navigable as a PDF of one compile.

The first part's PDF is the base (its catalogue, document information, language and metadata); each later part's
sheets are appended with their content untouched, and what refers to sheets across the document is joined:
- the structure tree (the tags a screen reader or a PDF/UA check reads): the later parts' top elements become
  children of the first part's Document element; their parent-tree keys (each sheet's /StructParents and the number
  tree that maps it to its elements) are moved past the keys before them; their element IDs (table cells' /ID, and
  the /Headers that name them) get the prefix "p<k>." so that no two parts' IDs meet; the role maps are merged;
- the outline (bookmarks): rebuilt from every part's outline entries in order, at their headings' levels (from the
  parts' sources), each nested under the last entry of a lower level before it, as Typst nests them, every entry
  with children closed, as Typst writes them;
- the metadata's page count.
Then every sheet gets its number from the frame (`overlay.drawn_over`), and the result is saved with an ID made from
the content, so the same parts give the same bytes."""

from __future__ import annotations

import io
import re
from contextlib import ExitStack

SHEET = "/BlSheetNumber"  # the frame page's form XObject in each sheet's resources
_PAGES = re.compile(rb"/Type/Pages/Count (\d+)")
_NPAGES = re.compile(rb"<xmpTPg:NPages>\d+</xmpTPg:NPages>")


def sheet_count(pdf: bytes) -> int:
    """The number of sheets of a PDF: read from the one page-tree node of a PDF Typst wrote, else by pikepdf."""
    found = _PAGES.findall(pdf)
    if len(found) == 1:
        return int(found[0])
    import pikepdf
    with pikepdf.open(io.BytesIO(pdf)) as opened:
        return len(opened.pages)


def _headings(pdf, levels: list[int]) -> list[tuple[int, str, object]]:
    """(level, title, destination) of every outline entry of a Typst PDF, in order; `levels`: its headings' levels,
    in order (from the part's source, whose headings the outline lists)."""
    entries, todo = [], [pdf.Root.Outlines.First] if "/Outlines" in pdf.Root and "/First" in pdf.Root.Outlines else []
    while todo:
        item = todo.pop()
        entries.append((str(item.Title), item.Dest))
        todo.extend(x for x in (item.get("/Next"), item.get("/First")) if x is not None)
    if len(entries) != len(levels):
        raise ValueError(f"a part's outline has {len(entries)} entries for its {len(levels)} headings")
    return [(level, title, dest) for level, (title, dest) in zip(levels, entries)]


def _outline(out, headings: list[tuple[int, str, object]]):
    """The outline of `headings` in `out`: each under the last heading of a lower level before it."""
    import pikepdf
    root = {"item": out.make_indirect(pikepdf.Dictionary(Type=pikepdf.Name.Outlines)), "level": 0, "kids": []}
    path = [root]
    for level, title, dest in headings:
        while path[-1]["level"] >= level:
            path.pop()
        node = {"item": out.make_indirect(pikepdf.Dictionary(Title=pikepdf.String(title), Dest=dest)),
                "level": level, "kids": []}
        path[-1]["kids"].append(node)
        path.append(node)
    todo = [root]
    while todo:
        node = todo.pop()
        kids = [k["item"] for k in node["kids"]]
        if kids:
            node["item"].First, node["item"].Last = kids[0], kids[-1]
            node["item"].Count = len(kids) if node is root else -len(kids)  # closed, as Typst writes them
        for a, b in zip(kids, kids[1:]):
            a.Next, b.Prev = b, a
        for kid in kids:
            kid.Parent = node["item"]
        todo.extend(node["kids"])
    return root["item"]


def _prefix_ids(pdf, prefix: str) -> None:
    """Every structure element ID of a part (its elements are indirect objects), every /Headers entry that names
    one and the keys of its ID tree, prefixed."""
    import pikepdf
    for element in pdf.objects:
        if not isinstance(element, pikepdf.Dictionary) or "/S" not in element:
            continue
        if "/ID" in element:
            element.ID = pikepdf.String(prefix + str(element.ID))
        attributes = element.get("/A")
        for a in (attributes if isinstance(attributes, pikepdf.Array) else [attributes]):
            if isinstance(a, pikepdf.Dictionary) and "/Headers" in a and len(a.Headers):
                a.Headers = pikepdf.Array([pikepdf.String(prefix + str(h)) for h in a.Headers])
    tree = pdf.Root.StructTreeRoot
    if "/IDTree" in tree:
        names = _flat(tree.IDTree, "/Names")
        tree.IDTree.Names = pikepdf.Array([pikepdf.String(prefix + str(v)) if i % 2 == 0 else v
                                           for i, v in enumerate(names)])


def _flat(tree, key: str) -> list:
    """The pairs of a number or name tree of one node (Typst writes them flat)."""
    if "/Kids" in tree:
        raise ValueError("a part's structure tree has a number or name tree of more than one node")
    return list(tree.get(key, []))


def joined(parts: list[bytes], levels: list[list[int]], frame: bytes) -> bytes:
    """One PDF of the parts' sheets in order, with the frame's pages (one per sheet) drawn over them; `levels`: each
    part's heading levels in order."""
    import pikepdf

    from beamlang.report.pdf.overlay import drawn_over
    with ExitStack() as stack:  # qpdf reads a copied stream's data from its source when the result is written
        out = stack.enter_context(pikepdf.open(io.BytesIO(parts[0])))
        tree = out.Root.StructTreeRoot
        document = tree.K[0]
        nums = _flat(tree.ParentTree, "/Nums")
        names = _flat(tree.IDTree, "/Names") if "/IDTree" in tree else []
        roles = dict(tree.get("/RoleMap", {}).items())
        headings = _headings(out, levels[0])
        for k, data in enumerate(parts[1:], start=1):
            part = stack.enter_context(pikepdf.open(io.BytesIO(data)))
            own = part.Root.StructTreeRoot
            _prefix_ids(part, f"p{k}.")
            offset = int(tree.ParentTreeNextKey)
            first = len(out.pages)
            out.pages.extend(part.pages)
            for page in out.pages[first:]:
                if "/StructParents" in page.obj:
                    page.obj.StructParents = int(page.obj.StructParents) + offset
                for annotation in page.obj.get("/Annots", []):
                    if "/StructParent" in annotation:
                        annotation.StructParent = int(annotation.StructParent) + offset
            kids = own.K[0].K
            for kid in kids:
                if isinstance(kid, pikepdf.Dictionary):
                    del kid["/P"]  # so that copying a top element does not copy the part's tree root
            for kid in out.copy_foreign(part.make_indirect(kids)):
                if isinstance(kid, pikepdf.Dictionary):
                    kid.P = document
                document.K.append(kid)
            pairs = out.copy_foreign(part.make_indirect(pikepdf.Array(_flat(own.ParentTree, "/Nums"))))
            nums += [offset + int(v) if i % 2 == 0 else v for i, v in enumerate(pairs)]
            names += list(out.copy_foreign(part.make_indirect(pikepdf.Array(_flat(own.IDTree, "/Names"))))) \
                if "/IDTree" in own else []
            roles.update(own.get("/RoleMap", {}).items())
            tree.ParentTreeNextKey = offset + int(own.ParentTreeNextKey)
            headings += [(level, title, out.copy_foreign(part.make_indirect(dest))) for level, title, dest in _headings(part, levels[k])]
        tree.ParentTree = out.make_indirect(pikepdf.Dictionary(Nums=pikepdf.Array(nums)))
        pairs = sorted(zip(names[::2], names[1::2]), key=lambda p: bytes(p[0]))
        tree.IDTree = out.make_indirect(pikepdf.Dictionary(Names=pikepdf.Array([x for p in pairs for x in p])))
        tree.RoleMap = pikepdf.Dictionary(roles)
        out.Root.Outlines = _outline(out, headings)
        if "/Metadata" in out.Root:
            count = f"<xmpTPg:NPages>{len(out.pages)}</xmpTPg:NPages>".encode("ascii")
            out.Root.Metadata.write(_NPAGES.sub(count, out.Root.Metadata.read_bytes()))
        numbers = stack.enter_context(pikepdf.open(io.BytesIO(frame)))
        if len(numbers.pages) != len(out.pages):
            raise ValueError(f"the frame has {len(numbers.pages)} pages for {len(out.pages)} sheets")
        drawn_over(out, numbers, 0, SHEET)
        buffer = io.BytesIO()
        out.save(buffer, deterministic_id=True)
        return buffer.getvalue()
