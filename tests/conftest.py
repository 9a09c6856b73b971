import sys
from pathlib import Path

from hypothesis import settings

sys.path.insert(0, str(Path(__file__).resolve().parent))

# Generated inputs are the same on every run (CI included), so a result is reproducible; run
# `python tests/fuzz/mutate.py N SEED` or change this profile to explore further.
settings.register_profile("beamlang", derandomize=True, database=None)
settings.load_profile("beamlang")
