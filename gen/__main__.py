"""``python -m gen`` runs the pitchline command line."""

import sys

from gen.cli import main

if __name__ == "__main__":
    sys.exit(main())
