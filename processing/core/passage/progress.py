# SPDX-License-Identifier: GPL-2.0-or-later
"""Progress and cancel for the passage steps and the sweep built on them.

Core functions take ``progress(fraction) -> bool`` (False = stop). A :class:`Span` maps a
part's own fraction 0..1 onto [lo, hi] of its caller's progress, so steps nest; ``check``
raises :class:`PassageCancelled` once a stop was asked for.
"""
from __future__ import annotations

from typing import Callable, Optional

__all__ = ["Progress", "PassageCancelled", "Span"]

Progress = Callable[[float], bool]


class PassageCancelled(Exception):
    """The progress callback asked to stop (returned False)."""


class Span:
    """Map a part's own fraction 0..1 onto [lo, hi] of the caller's progress; remember a stop.

    ``what`` names the job in the :class:`PassageCancelled` message.
    """

    def __init__(self, progress: Optional[Progress], lo: float = 0.0, hi: float = 1.0,
                 what: str = "passage computation") -> None:
        self.progress, self.lo, self.hi, self.what = progress, lo, hi, what
        self.cancelled = False

    def __call__(self, fraction: float) -> bool:
        if self.progress is None:
            return True
        f = self.lo + (self.hi - self.lo) * min(max(float(fraction), 0.0), 1.0)
        if self.progress(f) is False:
            self.cancelled = True
            return False
        return True

    def part(self, lo: float, hi: float) -> "Span":
        """The sub-span [lo, hi] of this span's own 0..1 (same job name)."""
        return Span(self, lo, hi, self.what)

    def check(self, fraction: float) -> None:
        """Report ``fraction``; raise :class:`PassageCancelled` when a stop was asked for."""
        if not self(fraction) or self.cancelled:
            raise PassageCancelled(f"{self.what} cancelled")
