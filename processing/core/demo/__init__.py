# SPDX-License-Identifier: GPL-2.0-or-later
"""The invented demo scenario and the writers of test and demo data (NetCDF, GRIB2, GeoTIFF, hindcasts)."""
