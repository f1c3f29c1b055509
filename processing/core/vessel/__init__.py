# SPDX-License-Identifier: GPL-2.0-or-later
"""The vessel: versioned profiles (JSON), stations on board, user RAO tables."""
