/* fuzz-numbers.c: the number, sexagesimal and column-mapping parsers on
 * any text.  Differential: whenever sl_parse_number accepts a text, its
 * double must be bit for bit the one strtod (correctly rounded, C locale)
 * gives for the same text, whichever path (Clinger's exact fast path or
 * strtod) it took. */
#include <locale.h>
#include <math.h>
#include <stdlib.h>

#include "fuzz-common.h"
#include "import.h"
#include "units.h"

int
LLVMFuzzerInitialize (int *argc, char ***argv)
{
  setlocale (LC_ALL, "C");
  fuzz_init ();
  return 0;
}

static void
check_number (const char *text)
{
  const char *reason = NULL;
  double ours, theirs;

  if (!sl_parse_number (text, &ours, &reason))
    {
      g_assert_nonnull (reason);
      return;
    }
  g_assert_true (isfinite (ours));
  theirs = strtod (text, NULL);
  if (memcmp (&ours, &theirs, sizeof ours) != 0)
    g_error ("'%s': %.17g, strtod %.17g", text, ours, theirs);
}

static void
check_sexagesimal (const char *text, gboolean hours)
{
  const char *reason = NULL;
  double value;

  if (sl_parse_sexagesimal (text, hours, &value, &reason))
    {
      g_autofree char *again = sl_format_sexagesimal (hours ? value * 15.0 : value, hours, 3);

      g_assert_true (isfinite (value));
      g_assert_nonnull (again);
    }
  else
    g_assert_nonnull (reason);
}

int
LLVMFuzzerTestOneInput (const uint8_t *data, size_t size)
{
  g_autofree char *text = fuzz_string (data, size);
  g_autoptr (GError) error = NULL;
  SlColumnMap map;

  check_number (text);
  check_sexagesimal (text, TRUE);
  check_sexagesimal (text, FALSE);
  if (sl_column_map_parse (text, &map, &error))
    sl_column_map_clear (&map);
  else
    g_assert_nonnull (error);
  return 0;
}
