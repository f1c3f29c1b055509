# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithm ``seawaycomfort:describeseastate``: what a forecast file holds."""
from __future__ import annotations

import html
import os
from dataclasses import dataclass
from typing import Any, Dict, List, Optional

from qgis.core import (
    QgsProcessingException,
    QgsProcessingOutputString,
    QgsProcessingParameterFile,
    QgsProcessingParameterFileDestination,
)

from ..core.flags import CAUTION
from ..core.validation import show
from . import common
from .base import Run, SeawayAlgorithm

INPUT = "INPUT"
OUTPUT_REPORT = "OUTPUT_REPORT"
DESCRIPTION = "DESCRIPTION"


def inventory_html(title: str, text: str) -> str:
    """A small self-contained HTML page around the inventory text (escaped)."""
    return (
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
        f"<title>{html.escape(title)}</title>\n</head>\n<body>\n"
        f"<h1>{html.escape(title)}</h1>\n<pre>{html.escape(text)}</pre>\n"
        f"<p><strong>Caution.</strong> {html.escape(CAUTION)}</p>\n</body>\n</html>\n"
    )


def summary_lines(inv: Any) -> str:
    """Two opening lines: which combined-sea quantities and which partitions the file holds."""
    from ..core.seastate.variables import COMBINED, PARTITIONS

    names = [v.canonical for v in inv.variables if getattr(v, "used", True)]
    combined = [c for c in COMBINED if c in names]
    parts = [p for p in PARTITIONS if any(n.startswith(p + "_") for n in names)]
    return (
        f"Combined sea: {', '.join(combined) if combined else 'none (built from the partitions)'}\n"
        f"Partitions: {', '.join(parts) if parts else 'none'}\n"
        f"Ensemble: {getattr(inv, 'members_text', '') or 'none (one deterministic forecast)'}\n\n"
    )


@dataclass(frozen=True)
class DescribeJob:
    """The file to describe (also the one input no output may overwrite)."""

    path: str

    @property
    def inputs(self) -> List[Any]:
        return [("INPUT file", self.path)]


class DescribeSeaStateAlgorithm(SeawayAlgorithm):
    """Lists the sea-state variables a file holds and how they were recognised."""

    OUTPUT_FILES = (OUTPUT_REPORT,)

    def name(self) -> str:
        return "describeseastate"

    def displayName(self) -> str:  # noqa: N802
        return self.tr("Describe a sea-state file")

    def shortHelpString(self) -> str:  # noqa: N802
        return self.tr(
            "<p>Opens a GRIB2, NetCDF-CF or GeoTIFF sea-state file the way the passage algorithms "
            "do and lists what it finds: each variable the plugin can use (significant wave height, "
            "peak or mean periods, direction, wind-sea and swell partitions), how it was recognised "
            "(CF standard name, GRIB2 parameter code, name), its units and any conversion, the grid "
            "(size, extent, resolution, CRS), the time range and step, and anything ignored.</p>"
            "<p>Use it to check a file before a passage run. The text goes to the log, to the "
            "DESCRIPTION output and, if asked, to an HTML or text file.</p>"
            f"<p><b>Caution</b>: {CAUTION}</p>"
        )

    def initAlgorithm(self, config: Optional[Dict[str, Any]] = None) -> None:  # noqa: N802
        self.addParameter(QgsProcessingParameterFile(
            INPUT, self.tr("Sea-state file"), QgsProcessingParameterFile.Behavior.File,
        ))
        self.addParameter(QgsProcessingParameterFileDestination(
            OUTPUT_REPORT, self.tr("Description file"),
            self.tr("HTML files (*.html);;Text files (*.txt)"), optional=True,
        ))
        self.addOutput(QgsProcessingOutputString(DESCRIPTION, self.tr("Description")))

    # hooks of the run skeleton (:meth:`.base.SeawayAlgorithm.processAlgorithm`) ---------------
    def read_settings(self, run: Run) -> DescribeJob:
        path = self.parameterAsFile(run.parameters, INPUT, run.context)
        if not path or not os.path.isfile(path):
            raise QgsProcessingException(f"INPUT {show(path)} is not an existing file: choose a forecast file")
        return DescribeJob(path)

    def compute(self, run: Run, job: DescribeJob) -> str:
        from ..core.seastate import describe_file

        with common.input_error(f"INPUT {show(job.path)}: "):
            try:
                inv = describe_file(job.path)
            except RuntimeError as exc:
                raise QgsProcessingException(f"INPUT {show(job.path)} could not be read: {exc}") from exc
        text = summary_lines(inv) + inv.as_text().rstrip() + "\n"
        if CAUTION not in text:
            text += "\nCAUTION: " + CAUTION + "\n"
        return text

    def write_report(self, run: Run, job: DescribeJob, text: str) -> Dict[str, Any]:
        for line in text.splitlines():
            run.feedback.pushInfo(line)
        out: Dict[str, Any] = {DESCRIPTION: text}
        dest = run.file_output(OUTPUT_REPORT)
        if dest:
            body = text if dest.lower().endswith(".txt") else inventory_html(
                f"Sea-state file: {os.path.basename(job.path)}", text)
            try:
                with open(dest, "w", encoding="utf-8") as fh:
                    fh.write(body)
            except OSError as exc:
                raise QgsProcessingException(f"OUTPUT_REPORT {show(dest)} could not be written: {exc}") from exc
            out[OUTPUT_REPORT] = dest
        return out
