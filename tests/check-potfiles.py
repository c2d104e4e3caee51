#!/usr/bin/python3
"""TAP: po/POTFILES lists exactly the source files with translatable strings.

A file that marks strings with _(), N_() or ngettext but is missing from
po/POTFILES would never reach the translators; a listed file that no longer
exists breaks the .pot update.
"""
import os
import re
import sys

MARKED = re.compile(r'(?<![A-Za-z0-9_])(?:_|N_|C_|NC_|ngettext|g_dngettext)\s*\(\s*"')


def main():
    top = os.environ["STARLEDGER_SOURCE_DIR"]
    with open(os.path.join(top, "po", "POTFILES"), encoding="utf-8") as f:
        listed = {line.strip() for line in f if line.strip() and not line.startswith("#")}
    marked = set()
    for root, _dirs, files in os.walk(os.path.join(top, "src")):
        for name in files:
            if name.endswith((".c", ".ui")):
                path = os.path.join(root, name)
                with open(path, encoding="utf-8") as f:
                    if MARKED.search(f.read()):
                        marked.add(os.path.relpath(path, top))
    checks = []
    for path in sorted(marked):
        checks.append((path in listed, f"{path} has marked strings and is in po/POTFILES"))
    for path in sorted(listed):
        checks.append((os.path.exists(os.path.join(top, path)), f"{path} in po/POTFILES exists"))
    print(f"1..{len(checks)}")
    failed = 0
    for number, (ok, text) in enumerate(checks, 1):
        print(f"{'ok' if ok else 'not ok'} {number} - {text}")
        failed += not ok
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
