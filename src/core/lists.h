/* lists.h: named target lists: made from a condition (condition.h) or
 * by hand from a selection, with a priority, tags and notes per star.
 *
 * Every change is one transaction that also appends its ledger entry
 * (action "list").  A list name is non-empty UTF-8 without control
 * characters or blanks at either end.  The functions that take a list's
 * NAME fail with SL_ERROR_UNKNOWN_NAME, naming the lists there are, when
 * there is no such list.
 */
#pragma once

#include <glib.h>

#include "project.h"

G_BEGIN_DECLS

/* Makes list NAME of the derived stars that satisfy CONDITION (see
 * condition.h), with DESCRIPTION (may be NULL).  If NAME exists, REPLACE
 * makes it anew (stars that stay in it keep their priority, tags and
 * notes); otherwise that is an error.  Returns the number of stars in the
 * list, or -1. */
gint64   sl_list_create_from_condition (SlProject *project, const char *name, const char *condition,
                                        const char *description, gboolean replace, GError **error);

/* Makes list NAME of the stars that satisfy CONDITION (NULL: none) and
 * the stars named in DESIGNATIONS (NULL-terminated; NULL: none), say a
 * condition and a selection in the window, in one transaction with one
 * ledger entry.  An existing NAME or an unknown designation is an error
 * and changes nothing.  Returns the number of stars in the list, or -1. */
gint64   sl_list_create_with_stars (SlProject *project, const char *name, const char *condition,
                                    const char *const *designations, const char *description,
                                    GError **error);

/* How many stars satisfy CONDITION now, without making a list (a live
 * count while a condition is written); -1 with ERROR from the compiler. */
gint64   sl_list_count_matching (SlProject *project, const char *condition, GError **error);

/* Makes an empty list by hand; an existing NAME is an error. */
gboolean sl_list_create (SlProject *project, const char *name, const char *description,
                         GError **error);

/* Adds or removes the stars named in DESIGNATIONS (NULL-terminated), say
 * a selection in the window.  An unknown designation is an error and
 * changes nothing; a star already in the list (or, removing, not in it)
 * is passed over.  Returns how many were added or removed, or -1. */
gint64   sl_list_add_stars    (SlProject *project, const char *name, const char *const *designations,
                               GError **error);
gint64   sl_list_remove_stars (SlProject *project, const char *name, const char *const *designations,
                               GError **error);

/* Sets a member's priority (higher: observe sooner), tags and notes
 * (NULL: empty).  The star must be in the list. */
gboolean sl_list_set_member (SlProject *project, const char *name, const char *designation,
                             gint64 priority, const char *tags, const char *notes, GError **error);

gboolean sl_list_delete (SlProject *project, const char *name, GError **error);

/* The lists' names in alphabetical order (bytewise); NULL only on error. */
GStrv    sl_list_names (SlProject *project, GError **error);

/* The ids of the list's stars, ascending (gint64). */
GArray  *sl_list_star_ids (SlProject *project, const char *name, GError **error);

typedef struct {
  char   *name;
  char   *description;
  char   *condition;    /* NULL for a list made by hand */
  char   *created_by;
  char   *created_at;   /* ISO 8601 UTC */
  gint64  n_stars;
  gint64  n_stale;      /* members whose derived values are stale */
} SlListInfo;

/* Every list, by name, as SlListInfo pointers. */
GPtrArray *sl_list_infos (SlProject *project, GError **error);
void       sl_list_info_free (SlListInfo *info);

typedef struct {
  gint64  star_id;
  char   *designation;
  gint64  priority;
  char   *tags;
  char   *notes;
} SlListMember;

/* The list's members by priority (highest first), then designation, as
 * SlListMember pointers. */
GPtrArray *sl_list_members (SlProject *project, const char *name, GError **error);
void       sl_list_member_free (SlListMember *member);

G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlListInfo, sl_list_info_free)
G_DEFINE_AUTOPTR_CLEANUP_FUNC (SlListMember, sl_list_member_free)

G_END_DECLS
