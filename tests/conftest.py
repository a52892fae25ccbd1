# SPDX-License-Identifier: MIT
"""Test configuration: property-based tests are repeatable on CI (derandomised)."""
from __future__ import annotations

import os

from hypothesis import settings

settings.register_profile("ci", derandomize=True, database=None, print_blob=True)
if os.environ.get("CI"):
    settings.load_profile("ci")
