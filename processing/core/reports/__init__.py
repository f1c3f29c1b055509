# SPDX-License-Identifier: GPL-2.0-or-later
"""Self-contained HTML reports of each tool."""
