import sys

from certify.cli import main

sys.exit(main())
