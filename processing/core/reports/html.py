# SPDX-License-Identifier: GPL-2.0-or-later
"""The HTML toolkit every report page is built from: escaping, numbers and times, tables, the
caution block, inline PNG figures and the self-contained page shell.

Rules kept here once for all reports: every text from outside (file, source, vessel, leg and
route names, notes) goes through :func:`esc` (:func:`html.escape` with quotes); a page holds no
script and no external link; figures are drawn on a bare matplotlib ``Figure`` with its own Agg
canvas (pyplot and the host's backend are never touched) and embedded as base64 PNG, and a page
keeps every table when matplotlib cannot be imported; the planning-aid caution heads and closes
every page (:func:`page`).
"""
from __future__ import annotations

import base64
import html
import io
import math
from typing import Iterable, Mapping, Optional, Sequence

import numpy as np

from ..flags import FLAG_CODES, FLAG_EXPLANATIONS

__all__ = ["PAGE_CSS", "esc", "fmt_num", "fmt_time_utc", "table", "swatch", "bullets", "flag_table", "caution_block",
           "png_img", "new_figure", "figure_png", "page", "write_page"]

PAGE_CSS = """
body{font-family:sans-serif;margin:1.5em;color:#222;max-width:74em}
h1{font-size:1.5em}h2{font-size:1.2em;margin-top:1.6em}h3{font-size:1.05em}
table{border-collapse:collapse;margin:.5em 0}
td,th{border:1px solid #bbb;padding:.2em .5em;font-size:.9em;text-align:left}
th{background:#eef2f4}
.caution{border:2px solid #c4572a;background:#fff4ec;padding:.6em .8em;margin:1em 0}
.pick{border:2px solid #2b5d7c;background:#eef6fa;padding:.6em .8em;margin:1em 0}
.swatch{display:inline-block;width:1.1em;height:.9em;border:1px solid #555;vertical-align:middle}
.small{font-size:.8em;color:#555}
"""
"""One style sheet for all report pages (inline, no external resource)."""


def esc(value: object) -> str:
    """``str(value)`` escaped for HTML text and attribute values (quotes included)."""
    return html.escape(str(value), quote=True)


def fmt_num(value: object, digits: int = 2) -> str:
    """A number with ``digits`` decimals; "n/a" for NaN/inf; non-numbers as their text."""
    try:
        v = float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return str(value)
    if not math.isfinite(v):
        return "n/a"
    return f"{v:.{digits}f}"


def fmt_time_utc(t: object) -> str:
    """A time as "YYYY-MM-DD HH:MM UTC" (minutes); "n/a" for None or NaT."""
    if t is None:
        return "n/a"
    t64 = np.datetime64(t, "m")
    if np.isnat(t64):
        return "n/a"
    return str(t64).replace("T", " ") + " UTC"


def table(headers: Sequence[str], rows: Iterable[Sequence[str]], *, raw_cols: Sequence[int] = ()) -> str:
    """An HTML table; every cell is escaped except the columns in ``raw_cols`` (markup built by
    the caller from escaped parts, e.g. a :func:`swatch`)."""
    out = ["<table>", "<tr>" + "".join(f"<th>{esc(h)}</th>" for h in headers) + "</tr>"]
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{c if i in raw_cols else esc(c)}</td>" for i, c in enumerate(row))
                   + "</tr>")
    out.append("</table>")
    return "\n".join(out)


def swatch(colour: str) -> str:
    """A small filled box of ``colour`` (for class legends and table cells)."""
    return f'<span class="swatch" style="background:{esc(colour)}"></span>'


def bullets(items: Iterable[object]) -> str:
    """An unordered list of escaped items."""
    return "<ul>" + "".join(f"<li>{esc(i)}</li>" for i in items) + "</ul>"


def flag_table(counts: Mapping[str, int], what: str) -> str:
    """Flag code, how many ``what`` (samples, passages) carry it, and its meaning; "" without flags."""
    if not counts:
        return ""
    by_code = {code: flag for flag, code in FLAG_CODES.items()}
    return table(("Flag", what, "Meaning"), [(code, str(n), FLAG_EXPLANATIONS[by_code[code]]) for code, n in counts.items()])


def caution_block(text: str) -> str:
    """The boxed planning-aid caution."""
    return f'<div class="caution"><strong>Caution.</strong> {esc(text)}</div>'


def png_img(png: Optional[bytes], alt: str) -> str:
    """A paragraph holding ``png`` inline as a data URI; "" when there is no image."""
    if png is None:
        return ""
    return f'<p><img alt="{esc(alt)}" src="data:image/png;base64,{base64.b64encode(png).decode("ascii")}"></p>'


def new_figure(width_in: float, height_in: float, dpi: int = 90):  # type: ignore[no-untyped-def]
    """A matplotlib ``Figure`` on its own Agg canvas, or None when matplotlib cannot be imported."""
    try:
        from matplotlib.backends.backend_agg import FigureCanvasAgg
        from matplotlib.figure import Figure
    except Exception:  # noqa: BLE001 - any import problem means "no plots"
        return None
    fig = Figure(figsize=(width_in, height_in), dpi=dpi)
    FigureCanvasAgg(fig)  # Agg canvas attached to this figure only (no global backend switch)
    return fig


def figure_png(fig) -> bytes:  # type: ignore[no-untyped-def]
    """PNG bytes of a figure (tight layout)."""
    fig.tight_layout()
    buf = io.BytesIO()
    fig.savefig(buf, format="png")
    return buf.getvalue()


def page(title: str, body: Sequence[str], caution: str) -> str:
    """One self-contained HTML5 page: the title, the caution, ``body`` (markup), the caution again."""
    head = ["<!DOCTYPE html>", '<html lang="en">', "<head>", '<meta charset="utf-8">',
            f"<title>{esc(title)}</title>", f"<style>{PAGE_CSS}</style>", "</head>", "<body>",
            f"<h1>{esc(title)}</h1>", caution_block(caution)]
    foot = [caution_block(caution), '<p class="small">Made with Seaway Comfort.</p>', "</body>", "</html>"]
    return "\n".join(p for p in (*head, *body, *foot) if p) + "\n"


def write_page(path: str, text: str) -> str:
    """Write a rendered page to ``path`` (UTF-8) and return the path."""
    with open(path, "w", encoding="utf-8") as fh:
        fh.write(text)
    return path
