# SPDX-License-Identifier: GPL-2.0-or-later
"""Vessel motions: transfer functions, spectral response, response tables."""
