"""``python -m app``: the same as the ``pumpsketch`` command."""

import sys

from app.cli import main

sys.exit(main())
