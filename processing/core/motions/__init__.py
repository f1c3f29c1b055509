# SPDX-License-Identifier: GPL-2.0-or-later
"""Vessel motion models (strip theory in ``strip/``)."""
from __future__ import annotations
