#!/usr/bin/env python3
"""readme-methods.py CLI README [--update]: the README's Methods section is
`starledger-cli methods --markdown`, between the lines
<!-- methods: begin --> and <!-- methods: end -->.  Without --update, exits 1
(with a diff) if they differ, so the section cannot drift from the module
registry; with --update, rewrites the section."""

import difflib
import os
import subprocess
import sys

BEGIN = "<!-- methods: begin (build-aux/readme-methods.py writes this part) -->\n"
END = "<!-- methods: end -->\n"


def main():
    cli, readme = sys.argv[1], sys.argv[2]
    update = "--update" in sys.argv[3:]
    env = dict(os.environ, LC_ALL="C.UTF-8", LANGUAGE="", LANG="C.UTF-8")
    generated = subprocess.run([cli, "methods", "--markdown"], capture_output=True, text=True, env=env,
                               check=True).stdout
    with open(readme, encoding="utf-8") as f:
        text = f.read()
    start, end = text.find(BEGIN), text.find(END)
    if start < 0 or end < start:
        print(f"readme-methods: {readme} has no methods markers", file=sys.stderr)
        return 1
    current = text[start + len(BEGIN):end]
    if current == generated:
        print("ok 1 - README's Methods section is what 'starledger-cli methods --markdown' prints\n1..1")
        return 0
    if update:
        with open(readme, "w", encoding="utf-8") as f:
            f.write(text[:start + len(BEGIN)] + generated + text[end:])
        print(f"readme-methods: updated {readme}")
        return 0
    sys.stdout.writelines(difflib.unified_diff(current.splitlines(True), generated.splitlines(True),
                                               "README.md", "starledger-cli methods --markdown"))
    print("not ok 1 - README's Methods section differs; run build-aux/readme-methods.py "
          "_build/src/cli/starledger-cli README.md --update\n1..1")
    return 1


sys.exit(main())
