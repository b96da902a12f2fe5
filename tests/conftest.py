"""Test configuration: the shared KnotInfo loader on the path, and hypothesis settings."""

import os
import sys

from hypothesis import HealthCheck, settings

sys.path.insert(0, os.path.dirname(__file__))

# Machines here are shared and noisy: no per-example deadline (speed is measured by bench/
# scripts, never by tests). On CI the example database is not kept between runs.
settings.register_profile(
    "plait",
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow],
    database=None if os.environ.get("CI") else settings.default.database,
)
settings.load_profile("plait")
