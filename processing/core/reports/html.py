# SPDX-License-Identifier: GPL-2.0-or-later
"""The HTML toolkit every report page is built from: escaping, numbers and times, tables, the
caution block, the verdict box, figures with their legends and the self-contained page shell.

Rules kept here once for all reports: every text from outside (file, source, vessel, leg and
route names, notes) goes through :func:`esc` (:func:`html.escape` with quotes); a page holds no
script and no external link; figures are inline SVG drawn by :mod:`.svg` (no plotting library
is imported); wide tables scroll sideways on a phone and wrap in print; the planning-aid
caution heads and closes every page (:func:`page`).
"""
from __future__ import annotations

import html
import math
from typing import Iterable, Mapping, Sequence, Tuple

import numpy as np

from ..flags import FLAG_CODES, FLAG_EXPLANATIONS

__all__ = ["PAGE_CSS", "esc", "fmt_num", "fmt_time_utc", "table", "swatch", "line_key", "legend", "figure",
           "verdict_box", "bullets", "flag_table", "caution_block", "page", "write_page"]

PAGE_CSS = """
body{font-family:sans-serif;margin:1.5em auto;padding:0 1em;color:#222;max-width:62em;line-height:1.35}
h1{font-size:1.5em}h2{font-size:1.2em;margin-top:1.6em;border-bottom:1px solid #d9dee2}h3{font-size:1.05em}
.scroll{overflow-x:auto;max-width:100%}
table{border-collapse:collapse;margin:.5em 0}
td,th{border:1px solid #bbb;padding:.2em .45em;font-size:.88em;text-align:left;vertical-align:top}
th{background:#eef2f4}
td.n{text-align:right;white-space:nowrap}
.caution{border:2px solid #c4572a;background:#fff4ec;padding:.6em .8em;margin:1em 0}
.verdict{border-left:.5em solid #2b5d7c;background:#eef6fa;padding:.6em .9em;margin:1em 0}
.verdict.over{border-left-color:#b4492a;background:#fdf1ec}
.verdict .head{font-size:1.15em;font-weight:bold;margin:0 0 .3em}
.verdict ul{margin:.2em 0;padding-left:1.2em}
.pick{border:2px solid #2b5d7c;background:#eef6fa;padding:.6em .8em;margin:1em 0}
figure{margin:.8em 0;break-inside:avoid}
svg.chart{display:block;width:100%;height:auto;max-width:48em}
figcaption{font-size:.85em;color:#444;margin-top:.3em}
.legend{font-size:.85em;margin:.3em 0}.legend span{display:inline-block;margin-right:1.1em}
.swatch{display:inline-block;width:1.1em;height:.9em;border:1px solid #555;vertical-align:middle;margin-right:.25em}
.key{display:inline-block;width:1.8em;height:0;border-top:3px solid #222;vertical-align:middle;margin-right:.25em}
.small{font-size:.8em;color:#555}
@media (max-width:40em){body{margin:.5em auto;padding:0 .5em}td,th{font-size:.78em;padding:.15em .3em}}
@media print{body{max-width:none;margin:0;font-size:10pt}.scroll{overflow:visible}
table{font-size:8pt;width:100%}td,th{padding:.1em .25em;word-break:break-word}
h2{break-after:avoid}tr{break-inside:avoid}}
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
    out = ['<div class="scroll"><table>', "<tr>" + "".join(f"<th>{esc(h)}</th>" for h in headers) + "</tr>"]
    for row in rows:
        out.append("<tr>" + "".join(f"<td>{c if i in raw_cols else esc(c)}</td>" for i, c in enumerate(row))
                   + "</tr>")
    out.append("</table></div>")
    return "\n".join(out)


def swatch(colour: str) -> str:
    """A small filled box of ``colour`` (for class legends and table cells)."""
    return f'<span class="swatch" style="background:{esc(colour)}"></span>'


def line_key(colour: str, dash: str = "") -> str:
    """A short line sample of ``colour`` (solid, or dashed when ``dash`` is given) for legends."""
    style = f"border-top-color:{esc(colour)}" + (";border-top-style:dashed" if dash else "")
    return f'<span class="key" style="{style}"></span>'


def legend(items: Sequence[Tuple[str, str]]) -> str:
    """A legend line: ``(key markup, label)`` pairs; labels are escaped, keys are markup built
    by :func:`swatch` or :func:`line_key`."""
    return '<div class="legend">' + "".join(f"<span>{k}{esc(lab)}</span>" for k, lab in items) + "</div>"


def figure(svg: str, caption: str, legend_html: str = "") -> str:
    """A figure: the inline SVG, its legend and its caption (escaped); "" without an SVG."""
    if not svg:
        return ""
    return f"<figure>{svg}{legend_html}<figcaption>{esc(caption)}</figcaption></figure>"


def verdict_box(headline: str, lines: Sequence[str], *, within: bool = True) -> str:
    """The verdict that opens a page: a headline and short lines (all escaped); ``within``
    False draws it in the warning colour."""
    cls = "verdict" if within else "verdict over"
    body = "<ul>" + "".join(f"<li>{esc(x)}</li>" for x in lines) + "</ul>" if lines else ""
    return f'<section class="{cls}" id="verdict"><p class="head">{esc(headline)}</p>{body}</section>'


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
