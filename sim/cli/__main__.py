"""``python -m sim.cli``: the same as the ``brinebolt`` command."""

import sys

from sim.cli.app import main

sys.exit(main())
