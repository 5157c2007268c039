import sys

from certify.verifier.cli import main

sys.exit(main())
