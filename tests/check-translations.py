#!/usr/bin/python3
"""TAP: every language in po/LINGUAS translates every message of today's code.

The catalogue template is extracted afresh from the files po/POTFILES lists,
with the keywords and flags of meson's 'glib' gettext preset (what
`ninja starledger-pot` uses), into a temporary directory: the committed
po/LANG.po files are merged against it as `msgmerge` would update them.  A
message added to the code and not yet translated shows up as untranslated
(or fuzzy, when it resembles an old one), and the language fails until its
translator catches up.  `msgfmt --check` proves that every c-format
directive, plural form and header survives; the checks below it catch what
msgfmt cannot: a lost keyboard mnemonic, a dropped ellipsis on an item that
opens a dialog, lost Pango markup.

Usage: check-translations.py XGETTEXT MSGMERGE MSGFMT
"""
import os
import re
import subprocess
import sys
import tempfile

sys.dont_write_bytecode = True
sys.path.insert(0, os.path.join(os.path.dirname(__file__), "reference"))
import starledger_tap as tap_lib  # noqa: E402

# meson's i18n module, preset 'glib' (mesonbuild/modules/i18n.py, PRESET_ARGS).
GLIB_PRESET = [
    "--from-code=UTF-8", "--add-comments",
    "--keyword=_", "--keyword=N_", "--keyword=C_:1c,2", "--keyword=NC_:1c,2",
    "--keyword=g_dcgettext:2", "--keyword=g_dngettext:2,3", "--keyword=g_dpgettext2:2c,3",
    "--flag=N_:1:pass-c-format", "--flag=C_:2:pass-c-format", "--flag=NC_:2:pass-c-format",
    "--flag=g_dngettext:2:pass-c-format", "--flag=g_strdup_printf:1:c-format",
    "--flag=g_string_printf:2:c-format", "--flag=g_string_append_printf:2:c-format",
    "--flag=g_error_new:3:c-format", "--flag=g_set_error:4:c-format",
    "--flag=g_markup_printf_escaped:1:c-format", "--flag=g_log:3:c-format",
    "--flag=g_print:1:c-format", "--flag=g_printerr:1:c-format", "--flag=g_printf:1:c-format",
    "--flag=g_fprintf:2:c-format", "--flag=g_sprintf:2:c-format", "--flag=g_snprintf:3:c-format",
]

STATISTICS = re.compile(r"(\d+) translated messages?(?:, (\d+) fuzzy translations?)?"
                        r"(?:, (\d+) untranslated messages?)?")
WORD = re.compile(r"^[^\W\d_]?[^\W\d_A-Z]+…?$")
MARKUP = re.compile(r"</?[a-z]+>")


def unquote(segments):
    text = "".join(segments)
    out, i = [], 0
    escapes = {"n": "\n", "t": "\t", '"': '"', "\\": "\\"}
    while i < len(text):
        if text[i] == "\\" and i + 1 < len(text):
            out.append(escapes.get(text[i + 1], text[i + 1]))
            i += 2
        else:
            out.append(text[i])
            i += 1
    return "".join(out)


def read_po(path):
    """The entries of a .po file: dicts of msgctxt, msgid, msgid_plural,
    msgstr[N] (strings), and 'flags' (a set); obsolete entries left out."""
    entries, current, field = [], None, None

    def close():
        if current is not None and "msgid" in current:
            entries.append({k: (unquote(v) if isinstance(v, list) else v) for k, v in current.items()})

    with open(path, encoding="utf-8") as f:
        for line in f:
            line = line.rstrip("\n")
            if not line.strip():
                close()
                current, field = None, None
                continue
            if line.startswith("#~"):
                continue
            if current is None:
                current = {"flags": set()}
            if line.startswith("#,"):
                current["flags"].update(flag.strip() for flag in line[2:].split(","))
            elif line.startswith("#"):
                continue
            elif line.startswith('"'):
                current[field].append(line[1:-1])
            else:
                field, _, rest = line.partition(" ")
                if field == "msgstr":
                    field = "msgstr[0]"
                current[field] = [rest.strip()[1:-1]]
    close()
    return entries


def check_language(tap, top, lang, pot, work, msgmerge, msgfmt):
    po = os.path.join(top, "po", lang + ".po")
    if not tap.check(os.path.exists(po), f"{lang}: po/{lang}.po exists"):
        return
    merged = os.path.join(work, lang + ".po")
    result = subprocess.run([msgmerge, "--quiet", "-o", merged, po, pot],
                            capture_output=True, text=True)
    if not tap.check(result.returncode == 0, f"{lang}: msgmerge against the current template",
                     result.stderr.splitlines()):
        return
    result = subprocess.run([msgfmt, "--check", "--statistics", "-o", os.devnull, merged],
                            capture_output=True, text=True)
    tap.check(result.returncode == 0, f"{lang}: msgfmt --check (formats, plurals, header)",
              result.stderr.splitlines())
    match = STATISTICS.search(result.stderr)
    translated = int(match.group(1)) if match else 0
    fuzzy = int(match.group(2) or 0) if match else -1
    untranslated = int(match.group(3) or 0) if match else -1
    tap.check(fuzzy == 0 and untranslated == 0 and translated > 0,
              f"{lang}: every message translated, none fuzzy ({result.stderr.strip()})")

    entries = [e for e in read_po(merged) if e["msgid"]]
    lost = []
    for entry in entries:
        sources = [entry["msgid"], entry.get("msgid_plural", entry["msgid"])]
        for key in sorted(k for k in entry if k.startswith("msgstr[")):
            text, source = entry[key], sources[min(int(key[7:-1]), 1)]
            if not text or "fuzzy" in entry["flags"]:
                continue
            if is_menu_label(source) and not is_menu_label(text):
                lost.append(f"mnemonic: {source!r} -> {text!r}")
            if source.endswith("…") and not text.endswith("…"):
                lost.append(f"ellipsis: {source!r} -> {text!r}")
            if sorted(MARKUP.findall(source)) != sorted(MARKUP.findall(text)):
                lost.append(f"markup: {source!r} -> {text!r}")
    tap.check(not lost, f"{lang}: mnemonics, ellipses and markup kept in {len(entries)} messages", lost)


def is_menu_label(text):
    """A short label with a keyboard mnemonic ("_Open", "C_heck", "Ed_it
    Star…"): one underscore, inside a plain word; not an identifier
    (parallax_err, R_V), which has no place in a label this short anyway."""
    if text.count("_") != 1 or len(text) > 40 or "\n" in text:
        return False
    word = next(w for w in text.split() if "_" in w)
    return not word.endswith("_") and bool(WORD.match(word.replace("_", "")))


def main():
    if len(sys.argv) != 4:
        sys.exit("usage: check-translations.py XGETTEXT MSGMERGE MSGFMT")
    xgettext, msgmerge, msgfmt = sys.argv[1:]
    top = tap_lib.required_env("STARLEDGER_SOURCE_DIR")
    with open(os.path.join(top, "po", "LINGUAS"), encoding="utf-8") as f:
        languages = [w for line in f if not line.startswith("#") for w in line.split()]
    tap = tap_lib.Tap()
    tap.check(bool(languages), f"po/LINGUAS names languages: {' '.join(languages)}")
    with tempfile.TemporaryDirectory(prefix="starledger-po-") as work:
        pot = os.path.join(work, "starledger.pot")
        result = subprocess.run([xgettext, "--package-name=starledger", "-D", top,
                                 "-f", os.path.join(top, "po", "POTFILES"), "-o", pot] + GLIB_PRESET,
                                capture_output=True, text=True)
        # A msgid cut short by a GLib format macro ("%" G_GINT64_FORMAT)
        # can never be looked up: xgettext warns that it ends mid-directive.
        cut = [line for line in result.stderr.splitlines() if "middle of a directive" in line]
        tap.check(result.returncode == 0 and not cut,
                  "the template extracts from po/POTFILES without messages cut short",
                  result.stderr.splitlines())
        if result.returncode == 0:
            n_messages = sum(1 for e in read_po(pot) if e["msgid"])
            tap.check(n_messages > 0, f"the template holds {n_messages} messages")
            for lang in languages:
                check_language(tap, top, lang, pot, work, msgmerge, msgfmt)
    tap.finish()


if __name__ == "__main__":
    main()
