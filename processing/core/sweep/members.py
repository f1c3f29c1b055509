# SPDX-License-Identifier: GPL-2.0-or-later
"""A departure sweep through an ensemble: the members' per-departure figures made into one.

Per departure, over the members with any result on the passage:

* ``prob_taxing_pct`` = 100 * #(members reaching comfort class >= 3, "taxing" or worse, at any
  sample of the passage) / #(members with any result); NaN when no member has a result;
* every other figure (worst MSI and where, hours per class, dose, per-sample classes) is that
  of the *median member by worst MSI*: the member ranking ceil(k/2)-th by worst MSI among the k
  members with a worst MSI (:func:`..passage.ensemble.median_member_index`), so the
  ``lowest_prob_taxing`` ranking breaks ties by the median MSI;
* flags: raised in any member; samples without results: the most of any member.
"""
from __future__ import annotations

from typing import Dict, List, Sequence

import numpy as np
from numpy.typing import NDArray

from ..passage.ensemble import TAXING_CLASS, median_member_index

__all__ = ["prob_taxing_pct", "combine_member_blocks"]


def prob_taxing_pct(cls: NDArray[np.integer]) -> NDArray[np.float64]:
    """(D,) 100 when a passage ((D, n) classes, -1 not computed) reaches class >= 3, else 0;
    NaN for a passage without any result (one member: a probability of 0 or 100 %)."""
    any_ok = (cls >= 0).any(axis=1)
    return np.where(any_ok, 100.0 * (cls >= TAXING_CLASS).any(axis=1), np.nan)


def combine_member_blocks(blocks: Sequence[Dict[str, NDArray]]) -> Dict[str, NDArray]:
    """One set of per-departure figures from the members' (module docstring)."""
    worst = np.stack([b["worst_msi_pct"] for b in blocks])  # (M, D)
    pick = median_member_index(worst, np.isfinite(worst))
    pick = np.where(pick >= 0, pick, 0)
    d = np.arange(worst.shape[1])
    out: Dict[str, NDArray] = {}
    for key in blocks[0]:
        stacked = np.stack([b[key] for b in blocks])
        out[key] = stacked[pick, d]
    out["flags"] = np.bitwise_or.reduce(np.stack([b["flags"] for b in blocks]), axis=0)
    out["n_missing"] = np.stack([b["n_missing"] for b in blocks]).max(axis=0)
    cls = np.stack([b["comfort_class"] for b in blocks])  # (M, D, n)
    has = (cls >= 0).any(axis=2)
    hit = (cls >= TAXING_CLASS).any(axis=2) & has
    k = has.sum(axis=0)
    with np.errstate(invalid="ignore", divide="ignore"):
        out["prob_taxing_pct"] = np.where(k > 0, 100.0 * hit.sum(axis=0) / k, np.nan)
    return out


def member_ids(src: object) -> List[int]:
    """The member labels of a source ([] when deterministic)."""
    return list(getattr(src, "members", ()) or ())
