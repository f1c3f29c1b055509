# SPDX-License-Identifier: GPL-2.0-or-later
"""When to leave: departures x speeds x forecast sources on the response tables."""
