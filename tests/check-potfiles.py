#!/usr/bin/python3
"""TAP: po/POTFILES lists exactly the source files with translatable strings.

A file that marks strings with _(), N_() or ngettext but is missing from
po/POTFILES would never reach the translators; a listed file that no longer
exists breaks the .pot update.
"""
import os
import re
import sys

# The TAP printer is shared with the reference checks; no bytecode cache
# is written into the source tree.
sys.dont_write_bytecode = True
sys.path.insert(0, os.path.join(os.path.dirname(__file__), "reference"))
import starledger_tap as tap_lib  # noqa: E402

MARKED = re.compile(r'(?<![A-Za-z0-9_])(?:_|N_|C_|NC_|ngettext|g_dngettext)\s*\(\s*"')


def main():
    top = tap_lib.required_env("STARLEDGER_SOURCE_DIR")
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
    tap = tap_lib.Tap()
    for path in sorted(marked):
        tap.check(path in listed, f"{path} has marked strings and is in po/POTFILES")
    for path in sorted(listed):
        tap.check(os.path.exists(os.path.join(top, path)), f"{path} in po/POTFILES exists")
    tap.finish()


if __name__ == "__main__":
    main()
