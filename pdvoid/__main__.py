"""``python -m pdvoid``: the same command as ``pdvoid``."""

import sys

from pdvoid.faces.cli.command import main

if __name__ == "__main__":
    sys.exit(main())
