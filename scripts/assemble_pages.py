#!/usr/bin/env python3
"""Assembles the site's pages: each www/*.html holds one calculator's own content under a
first-line header comment, and gets the shared head, navigation and foot from
www/_parts/. The navigation lists every page, in the order its header gives.

Usage: scripts/assemble_pages.py SRC_DIR OUT_DIR

A page starts with a header such as
    <!-- page: sync; title: Synchronizer MTBF; nav: Synchronizer; order: 1 -->
"""
import html
import pathlib
import re
import sys

HEADER = re.compile(r"^<!--(.*?)-->\n", re.S)
KEYS = ("page", "title", "nav", "order")


def read_page(path):
    text = path.read_text(encoding="utf-8")
    m = HEADER.match(text)
    if not m:
        sys.exit(f"assemble: {path}: the first line must be the page header comment")
    meta = {}
    for part in m.group(1).split(";"):
        key, _, value = part.partition(":")
        meta[key.strip()] = value.strip()
    missing = [k for k in KEYS if not meta.get(k)]
    if missing:
        sys.exit(f"assemble: {path}: header lacks {', '.join(missing)}")
    return meta, text[m.end():]


def action_row(part, spec):
    """The action buttons: `spec` is the demo button's label, then `; ID=LABEL` for each
    further demo (a button with data-demo=ID)."""
    demo, *more = [p.strip() for p in spec.split(";")]
    extra = "".join(
        f'        <button type="button" data-demo="{html.escape(i)}">{html.escape(label)}</button>\n'
        for i, _, label in (m.partition("=") for m in more)
    )
    return part.replace("{{demo}}", html.escape(demo)).replace("{{more}}", extra)


def main(src, out):
    src, out = pathlib.Path(src), pathlib.Path(out)
    head = (src / "_parts" / "head.html").read_text(encoding="utf-8")
    foot = (src / "_parts" / "foot.html").read_text(encoding="utf-8")
    actions = (src / "_parts" / "actions.html").read_text(encoding="utf-8")
    pages = sorted(
        (read_page(p) + (p.name,) for p in src.glob("*.html")),
        key=lambda t: int(t[0]["order"]),
    )
    for meta, body, name in pages:
        current = ' aria-current="page"'
        nav = "\n".join(
            f'    <a href="{other}"{current if other == name else ""}>'
            f"{html.escape(m['nav'])}</a>"
            for m, _, other in pages
        )
        fill = {"title": html.escape(meta["title"]), "page": meta["page"], "nav": nav}
        page = re.sub(r"\{\{(\w+)\}\}", lambda k: fill[k.group(1)], head)
        # {{example:NAME}} is the demo file examples/NAME, escaped for HTML.
        body = re.sub(
            r"\{\{example:([\w.-]+)\}\}",
            lambda k: html.escape((src.parent / "examples" / k.group(1)).read_text(encoding="utf-8")),
            body,
        )
        # {{actions:DEMO LABEL; id=LABEL ...}} is the shared row of action buttons (copy
        # link, demo, undo, report), with the page's demo label and any more demos.
        body = re.sub(r"\{\{actions:([^}]+)\}\}\n", lambda k: action_row(actions, k.group(1)), body)
        page += body + re.sub(r"\{\{(\w+)\}\}", lambda k: fill[k.group(1)], foot)
        (out / name).write_text(page, encoding="utf-8")


if __name__ == "__main__":
    if len(sys.argv) != 3:
        sys.exit(__doc__)
    main(sys.argv[1], sys.argv[2])
