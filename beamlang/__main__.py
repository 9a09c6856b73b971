"""`python -m beamlang` -> the command line."""

import sys

from beamlang.cli import main

sys.exit(main())
