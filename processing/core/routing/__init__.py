# SPDX-License-Identifier: GPL-2.0-or-later
"""Which way to go: comfort-optimal tracks around barriers, shoals and weather.

A lattice of lateral offsets around the reference track (:mod:`.lattice`), the legal edges
(:mod:`.barriers`, :mod:`.legality`), the sea's cost of every edge at every candidate start
time evaluated in bulk by the passage steps (:mod:`.edge_costs`), a time-dependent bi-criteria
label-setting search giving the time-vs-exposure front (:mod:`.search`), the smoothing rule
(:mod:`.smooth`) and the whole job (:mod:`.engine`).
"""
