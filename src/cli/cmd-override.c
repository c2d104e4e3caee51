/* cmd-override.c: starledger-cli override PROJECT ID QUANTITY VALUE [--lo X --hi Y] --reason TEXT
 *                 starledger-cli override PROJECT ID QUANTITY --clear [--reason TEXT] */
#include <float.h>
#include <glib/gi18n.h>
#include <math.h>
#include <stdio.h>

#include "cli.h"
#include "derivation.h"
#include "units.h"

int
sl_cli_override (int argc, char **argv)
{
  g_autofree char *lo_text = NULL;
  g_autofree char *hi_text = NULL;
  g_autofree char *reason = NULL;
  gboolean clear = FALSE;
  const GOptionEntry entries[] = {
    /* xgettext:no-c-format */
    { "lo", 0, 0, G_OPTION_ARG_STRING, &lo_text, N_("Lower bound of the value's 68% interval"), N_("X") },
    /* xgettext:no-c-format */
    { "hi", 0, 0, G_OPTION_ARG_STRING, &hi_text, N_("Upper bound of the value's 68% interval"), N_("Y") },
    { "reason", 0, 0, G_OPTION_ARG_STRING, &reason, N_("Why (required to set a value)"), N_("TEXT") },
    { "clear", 0, 0, G_OPTION_ARG_NONE, &clear, N_("Remove the hand-set value"), NULL },
    { NULL }
  };
  g_autoptr (GOptionContext) context =
    sl_cli_context_new ("override", _("PROJECT ID QUANTITY [VALUE]"),
                        _("Set a derived value by hand, or clear it."),
                        _("A hand-set value (a spectroscopic temperature from the literature, say) replaces "
                          "the derived one; the values derived from it follow it at the next 'derive'. "
                          "Who, when and why are recorded, and 'explain' shows them."),
                        entries);
  g_autoptr (SlProject) project = NULL;
  g_autoptr (GError) error = NULL;
  SlQuantity quantity;
  double value, lo, hi;
  const char *problem;

  /* CLEAR is only known once the options are parsed: at least 3 here. */
  if (!sl_cli_parse (context, "override", &argc, &argv, -3))
    return SL_EXIT_USAGE;
  if (argc - 1 != (clear ? 3 : 4))
    return sl_cli_usage_error ("override", argc - 1 < 4 ? _("missing arguments") : _("too many arguments"));
  if (!sl_quantity_from_name (argv[3], &quantity) || sl_quantity_info (quantity)->is_text)
    return sl_cli_usage_error ("override", _("%s is not a derived number (see 'export --help')"), argv[3]);
  if (!clear)
    {
      if (!sl_parse_number (argv[4], &value, &problem))
        return sl_cli_usage_error ("override", "%s: %s", argv[4], _(problem));
      lo = hi = NAN;   /* not given */
      if (!sl_cli_parse_number_option (lo_text, &lo, -DBL_MAX, DBL_MAX)
          || !sl_cli_parse_number_option (hi_text, &hi, -DBL_MAX, DBL_MAX))
        return sl_cli_usage_error ("override", _("--lo and --hi take numbers"));
      if (reason == NULL || *reason == '\0')
        return sl_cli_usage_error ("override", _("--reason is required: say why the value is set by hand"));
    }

  project = sl_cli_open_project (argv[1]);
  if (project == NULL)
    return SL_EXIT_FAILURE;
  if (clear ? !sl_override_clear (project, argv[2], quantity, reason, &error)
            : !sl_override_set (project, argv[2], quantity, value, lo, hi, reason, &error))
    return sl_cli_fail (error);
  printf (clear ? _("cleared the hand-set %s of %s; run 'derive' to update what follows from it\n")
                : _("set %s of %s by hand; run 'derive' to update what follows from it\n"),
          argv[3], argv[2]);
  return SL_EXIT_OK;
}
