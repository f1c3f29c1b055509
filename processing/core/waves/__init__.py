# SPDX-License-Identifier: GPL-2.0-or-later
"""Wave physics: linear dispersion at finite depth, spectra and spreading, encounter geometry."""
