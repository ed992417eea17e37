"""`python -m docgen.cli`: the same as the `docgen` command."""

import sys

from .dispatch import main

sys.exit(main())
