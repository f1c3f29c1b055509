# SPDX-License-Identifier: GPL-2.0-or-later
"""The input-protection rules on plain files (no QGIS): real paths, links, files a profile names."""
from __future__ import annotations

import dataclasses
import os
from typing import Optional

from seaway_comfort.processing.protected_inputs import find_clash, profile_files, protect


@dataclasses.dataclass(frozen=True)
class _Profile:
    """Stands in for a vessel profile with a strip-theory sections file beside its RAO table."""

    name: str
    rao_table: Optional[str]
    hull_sections: Optional[str]
    description: str = "hull.csv"
    base_dir: Optional[str] = None


def test_links_and_named_files(tmp_path):
    for name in ("boat.json", "rao.csv", "hull.csv", "sea.nc"):
        (tmp_path / name).write_text(name)
    os.symlink(tmp_path / "sea.nc", tmp_path / "link.html")
    os.link(tmp_path / "hull.csv", tmp_path / "hard.html")
    prof = _Profile("b", "rao.csv", "hull.csv", base_dir=str(tmp_path))
    ins = protect([("SEA_STATE", str(tmp_path / "sea.nc"))]
                  + profile_files(str(tmp_path / "boat.json"), prof, None, stored_dirs=[tmp_path / "none"]))
    labels = sorted(p.label for p in ins)
    assert labels == ["SEA_STATE", "VESSEL profile", "vessel profile hull_sections", "vessel profile rao_table"]
    assert find_clash(str(tmp_path / "link.html"), ins).label == "SEA_STATE"
    assert find_clash(str(tmp_path / "hard.html"), ins).label == "vessel profile hull_sections"
    assert find_clash(str(tmp_path / "sub" / ".." / "rao.csv"), ins).label == "vessel profile rao_table"
    assert find_clash("ogr:dbname='%s' table=x" % (tmp_path / "boat.json"), ins) is not None
    assert find_clash(str(tmp_path / "new.html"), ins) is None
    assert find_clash(str(tmp_path / "description.html"), ins) is None
