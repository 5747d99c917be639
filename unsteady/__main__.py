"""``python -m unsteady``: the command line."""

import sys

from .apps.cli import main

sys.exit(main())
