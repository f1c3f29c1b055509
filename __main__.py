# SPDX-License-Identifier: GPL-2.0-or-later
"""Command line: ``python -m seaway_comfort <command> ...`` (headless, for servers and demos).

Commands:
  demo       build the invented demo scenario and run the route-comfort algorithm on it
  seasonal   seasonal comfort climate along a route from years of hindcast
"""
from __future__ import annotations

import sys
from typing import List, Optional

COMMANDS = {
    "demo": "build the invented demo scenario and run the passage-comfort algorithm on it",
    "seasonal": "seasonal comfort climate along a route from years of hindcast (no QGIS needed)",
}


def main(argv: Optional[List[str]] = None) -> int:
    args = list(sys.argv[1:] if argv is None else argv)
    if not args or args[0] in {"-h", "--help"} or args[0] not in COMMANDS:
        print("usage: python -m seaway_comfort <command> [options]\n\ncommands:")
        for name, text in COMMANDS.items():
            print(f"  {name:<10} {text}")
        return 0 if args and args[0] in {"-h", "--help"} else 2
    command, rest = args[0], args[1:]
    if command == "demo":
        from .processing.demo_runner import main as demo_main

        return int(demo_main(rest))
    if command == "seasonal":
        from .processing.seasonal_cli import main as seasonal_main

        return int(seasonal_main(rest))
    return 2


if __name__ == "__main__":
    sys.exit(main())
