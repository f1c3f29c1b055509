# SPDX-License-Identifier: GPL-2.0-or-later
"""One passage: route geodesy and timing -> the sea at each sample -> motions, dose and classes."""
