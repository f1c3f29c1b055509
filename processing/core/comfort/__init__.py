# SPDX-License-Identifier: GPL-2.0-or-later
"""How motion feels and when it is unsafe: MSI, ISO 2631-1, seakeeping criteria, comfort classes, IMO MSC.1/Circ.1228 guidance."""
