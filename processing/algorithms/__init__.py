# SPDX-License-Identifier: GPL-2.0-or-later
"""Processing algorithms of Seaway Comfort: one module per algorithm.

ALGORITHM_CLASSES is the single list the provider loads.
"""
from __future__ import annotations

from typing import Tuple

ALGORITHM_CLASSES: Tuple[type, ...] = ()
