# SPDX-License-Identifier: MIT
"""``python -m workbook_builder`` runs the swaytune command line."""
import sys

from .launch import main

if __name__ == "__main__":
    sys.exit(main())
