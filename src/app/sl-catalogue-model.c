/* sl-catalogue-model.c: the Catalogue's list model: the star ids in display
 * order, and rows read a page at a time into a small cache, with the
 * shown columns only.
 *
 * Contents:
 *   the columns in SQL ..... the choice inputs.c makes, as SQL joins; the
 *                            page query built from the shown columns
 *   the order .............. query_order: the star ids sorted in SQL
 *   pages .................. load_page, get_page, the LRU cache, check_state
 *   GListModel ............. get_item_type, get_n_items, get_item
 *   the project ............ set_project, set_list, set_columns, reload, sort
 *                            (and async), find
 */
#include "sl-catalogue-model.h"

#include <glib/gi18n.h>
#include <math.h>
#include <string.h>

#include "derivation.h"
#include "inputs.h"
#include "sl-error.h"

/* ------------------------------------------------------------------ */
/* The columns in SQL                                                 */

/* The measurements row the project's policy takes for the group led by
 * LEAD (inputs.h, sl_input_order_sql; for a mean, the most precise row,
 * which the mean falls back to), joined as "m_LEAD", once for all the
 * shown columns of the group. */
static void
append_input_join (GString *sql, const SlCombinePolicy *policy, SlField lead)
{
  const char *name = sl_field_info (lead)->name;
  g_autofree char *order = sl_input_order_sql (policy, lead);

  g_assert (sl_field_info (lead)->error != SL_FIELD_NONE);
  g_string_append_printf (sql, " LEFT JOIN measurements m_%s ON m_%s.id ="
                               " (SELECT m.id FROM measurements m WHERE m.star_id = s.id AND m.%s IS NOT NULL"
                               " ORDER BY %s LIMIT 1)",
                          name, name, name, order);
}

#define JOIN_DERIVED " LEFT JOIN derived d ON d.star_id = s.id"

/* The spectral type is the later source's. */
#define SPTYPE_SQL                                                                        \
  "(SELECT m.sptype FROM measurements m WHERE m.star_id = s.id AND m.sptype IS NOT NULL" \
  " ORDER BY m.source_id DESC LIMIT 1)"

/* Whether COLUMN is an input chosen with its group's measurements row
 * (the spectral type is chosen on its own). */
static gboolean
is_grouped_input (SlCatalogueColumn column)
{
  SlField field = sl_catalogue_column_info (column)->field;

  return field != SL_FIELD_NONE && field != SL_FIELD_SPTYPE;
}

/* What the SQL of a page or an order needs joined to stars s. */
typedef struct {
  gboolean leads[SL_N_FIELDS];   /* the input groups, by lead field */
  gboolean derived;
} Joins;

static void
joins_add (Joins *joins, SlCatalogueColumn column)
{
  const SlCatalogueColumnInfo *info = sl_catalogue_column_info (column);

  if (is_grouped_input (column))
    joins->leads[sl_input_group_lead (info->field)] = TRUE;
  else if (info->quantity != SL_Q_NONE || info->kind == SL_CATALOGUE_KIND_FLAGS)
    joins->derived = TRUE;
}

static void
append_joins (GString *sql, const SlCombinePolicy *policy, const Joins *joins)
{
  for (SlField f = 0; f < SL_N_FIELDS; f++)
    if (joins->leads[f])
      append_input_join (sql, policy, f);
  if (joins->derived)
    g_string_append (sql, JOIN_DERIVED);
}

/* The join alias of the row of FIELD's group: "m_parallax". */
static char *
row_alias (SlField field)
{
  return g_strdup_printf ("m_%s", sl_field_info (sl_input_group_lead (field))->name);
}

/* The SQL of COLUMN's value (its sort key). */
static char *
column_key_sql (const SlCombinePolicy *policy, SlCatalogueColumn column)
{
  const SlCatalogueColumnInfo *info = sl_catalogue_column_info (column);

  if (is_grouped_input (column))
    {
      g_autofree char *row = row_alias (info->field);

      return sl_input_value_sql (policy, info->field, row, "s.id");
    }
  if (info->field == SL_FIELD_SPTYPE)
    return g_strdup (SPTYPE_SQL);
  if (info->quantity != SL_Q_NONE)
    return g_strdup_printf ("d.%s", sl_quantity_info (info->quantity)->name);
  if (info->kind == SL_CATALOGUE_KIND_FLAGS)
    return g_strdup ("d.flags");
  return g_strdup ("s.designation");
}

/* How a page's result columns fill a shown column. */
typedef enum {
  FETCH_TEXT,          /* text */
  FETCH_VALUE,         /* a measured value without an error */
  FETCH_VALUE_ERROR,   /* a measured value, its error: interval value -/+ error */
  FETCH_INTERVAL,      /* a derived value, lo, hi */
  FETCH_FLAGS,         /* has a derived row, stale, flags */
} FetchKind;

typedef struct {
  SlCatalogueColumn column;
  FetchKind         kind;
  int               first;   /* its first result column */
} Fetch;

/* The page query for the SHOWN columns: s.id, s.designation, then each
 * shown column's result columns (recorded in FETCH, *N_FETCH set), for the
 * ids bound as ?1 ... ?PAGE_ROWS, in id order.  Hidden columns cost
 * nothing: neither joined nor read. */
static char *
page_sql (const SlCombinePolicy *policy, const SlCatalogueColumn *shown, guint n_shown, Fetch *fetch,
          guint *n_fetch)
{
  g_autoptr (GString) sql = g_string_new ("SELECT s.id, s.designation");
  Joins joins = { { 0 }, FALSE };
  int next = 2;

  *n_fetch = 0;
  for (guint i = 0; i < n_shown; i++)
    {
      SlCatalogueColumn column = shown[i];
      const SlCatalogueColumnInfo *info = sl_catalogue_column_info (column);
      g_autofree char *key = column_key_sql (policy, column);
      Fetch *f = &fetch[*n_fetch];

      if (column == SL_CATALOGUE_COLUMN_DESIGNATION)
        continue;   /* always read: the selection is kept by name */
      f->column = column;
      f->first = next;
      joins_add (&joins, column);
      if (info->kind == SL_CATALOGUE_KIND_FLAGS)
        {
          f->kind = FETCH_FLAGS;
          g_string_append (sql, ", d.star_id IS NOT NULL, d.stale, d.flags");
          next += 3;
        }
      else if (info->kind == SL_CATALOGUE_KIND_TEXT)
        {
          f->kind = FETCH_TEXT;
          g_string_append_printf (sql, ", %s", key);
          next += 1;
        }
      else if (info->quantity != SL_Q_NONE)
        {
          f->kind = FETCH_INTERVAL;
          g_string_append_printf (sql, ", %s, %s_lo, %s_hi", key, key, key);
          next += 3;
        }
      else if (sl_field_info (info->field)->error != SL_FIELD_NONE && info->kind == SL_CATALOGUE_KIND_NUMBER)
        {
          /* RA and Dec have errors too, in mas on the sky: a table in
           * sexagesimal degrees shows the position alone. */
          g_autofree char *row = row_alias (info->field);
          g_autofree char *error = sl_input_value_sql (policy, sl_field_info (info->field)->error, row, "s.id");

          f->kind = FETCH_VALUE_ERROR;
          g_string_append_printf (sql, ", %s, %s", key, error);
          next += 2;
        }
      else
        {
          f->kind = FETCH_VALUE;
          g_string_append_printf (sql, ", %s", key);
          next += 1;
        }
      (*n_fetch)++;
    }
  g_string_append (sql, " FROM stars s");
  append_joins (sql, policy, &joins);
  g_string_append (sql, " WHERE s.id IN (");
  for (guint i = 1; i <= SL_CATALOGUE_MODEL_PAGE_ROWS; i++)
    g_string_append_printf (sql, "%s?%u", i > 1 ? ", " : "", i);
  g_string_append (sql, ") ORDER BY s.id");
  return g_string_free (g_steal_pointer (&sql), FALSE);
}

/* ------------------------------------------------------------------ */
/* The order                                                          */

/* The members of the list named by parameter ?1 (lists.c's tables). */
#define LIST_MEMBERS_SQL "SELECT m.star_id FROM list_members m JOIN lists l ON l.id = m.list_id WHERE l.name = ?1"

/* With IN_LIST, only the stars of the list bound to ?1. */
static char *
order_sql (const SlCombinePolicy *policy, SlCatalogueColumn column, gboolean descending, gboolean in_list)
{
  const char *where = in_list ? " WHERE s.id IN (" LIST_MEMBERS_SQL ")" : "";
  g_autoptr (GString) joins = g_string_new (NULL);
  g_autofree char *key = NULL;
  Joins needed = { { 0 }, FALSE };

  if (column == SL_CATALOGUE_COLUMN_NONE)
    return g_strdup_printf ("SELECT s.id FROM stars s%s ORDER BY s.id", where);
  key = column_key_sql (policy, column);
  joins_add (&needed, column);
  append_joins (joins, policy, &needed);
  return g_strdup_printf ("SELECT s.id FROM stars s%s%s ORDER BY %s %s NULLS LAST, s.id", joins->str, where, key,
                          descending ? "DESC" : "ASC");
}

static int
interrupt_if_cancelled (void *cancellable)
{
  return g_cancellable_is_cancelled (cancellable);
}

/* The star ids in the order asked for; only LIST's unless it is NULL. */
static GArray *
query_order (SlProject *project, SlCatalogueColumn column, gboolean descending, const char *list,
             GCancellable *cancellable, GError **error)
{
  sqlite3 *db = sl_project_db (project);
  g_autofree char *sql = NULL;
  g_autoptr (GArray) ids = NULL;
  SlCombinePolicy policy;
  sqlite3_stmt *stmt;
  gint64 count = 0;
  int rc;

  /* One read transaction: the count and the order see one snapshot. */
  if (!sl_project_exec (project, "BEGIN", error))
    return NULL;
  if (!sl_combine_policy_read (project, &policy, error))
    {
      sl_project_rollback (project);
      return NULL;
    }
  sql = order_sql (&policy, column, descending, list != NULL);
  /* Counted first so that the array is allocated once. */
  stmt = sl_project_prepare (project, list ? "SELECT count(*) FROM (" LIST_MEMBERS_SQL ")"
                                            : "SELECT count(*) FROM stars", error);
  if (stmt != NULL)
    {
      if (list)
        sqlite3_bind_text (stmt, 1, list, -1, SQLITE_STATIC);
      if (sqlite3_step (stmt) == SQLITE_ROW)
        count = sqlite3_column_int64 (stmt, 0);
      sqlite3_finalize (stmt);
      stmt = sl_project_prepare (project, sql, error);
      if (stmt != NULL && list)
        sqlite3_bind_text (stmt, 1, list, -1, SQLITE_STATIC);
    }
  if (stmt == NULL)
    {
      sl_project_rollback (project);
      return NULL;
    }
  ids = g_array_sized_new (FALSE, FALSE, sizeof (gint64), (guint) count);
  if (cancellable)
    sqlite3_progress_handler (db, 10000, interrupt_if_cancelled, cancellable);
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);

      g_array_append_val (ids, id);
    }
  if (cancellable)
    sqlite3_progress_handler (db, 0, NULL, NULL);
  if (rc != SQLITE_DONE)
    {
      if (rc == SQLITE_INTERRUPT)
        g_set_error_literal (error, G_IO_ERROR, G_IO_ERROR_CANCELLED, "cancelled");
      else
        sl_project_set_db_error (project, error, sl_project_path (project));
      g_clear_pointer (&ids, g_array_unref);
    }
  sqlite3_finalize (stmt);
  sl_project_rollback (project);
  return g_steal_pointer (&ids);
}

/* The model's connection: read-only, with a modest page cache. */
static SlProject *
open_reader (const char *path, GError **error)
{
  g_autoptr (SlProject) project = sl_project_open (path, error);

  if (project == NULL || !sl_project_exec (project, "PRAGMA query_only = ON; PRAGMA cache_size = -8192", error))
    return NULL;
  return g_steal_pointer (&project);
}

/* ------------------------------------------------------------------ */
/* The model                                                          */

typedef struct {
  guint            index;    /* rows at positions index * PAGE_ROWS ... */
  guint            n_rows;
  guint64          used;     /* access tick, for dropping the least recently used */
  SlCatalogueRow **rows;     /* n_rows, owned */
} Page;

struct _SlCatalogueModel {
  GObject           parent_instance;

  char             *path;          /* the project, or NULL */
  SlProject        *project;       /* our read-only connection to it */
  sqlite3_stmt     *page_stmt;     /* a page's shown columns (page_sql) */
  SlCombinePolicy   policy;        /* the project's, which page_stmt follows */
  sqlite3_stmt     *designation_stmt;  /* id -> designation */
  sqlite3_stmt     *id_stmt;       /* designation -> id */

  SlCatalogueColumn shown[SL_CATALOGUE_N_COLUMNS];  /* the columns read, in the table's order */
  guint             n_shown;
  Fetch             fetch[SL_CATALOGUE_N_COLUMNS];  /* where page_stmt has them */
  guint             n_fetch;
  guint             pages_read;    /* page queries run, for tests */

  GArray           *ids;           /* gint64 star ids in display order; NULL without a project */
  SlCatalogueColumn sort_column;
  gboolean          descending;
  char             *list;          /* only this target list's stars; NULL: every star */
  guint             generation;    /* bumped whenever ids may change: stale async orders are dropped */

  Page              pages[SL_CATALOGUE_MODEL_MAX_PAGES];
  guint             n_pages;
  guint64           tick;
  gboolean          warned;        /* a page failed to load; said once */
};

static void sl_catalogue_model_list_model_init (GListModelInterface *iface);

G_DEFINE_FINAL_TYPE_WITH_CODE (SlCatalogueModel, sl_catalogue_model, G_TYPE_OBJECT,
                               G_IMPLEMENT_INTERFACE (G_TYPE_LIST_MODEL, sl_catalogue_model_list_model_init))

static guint
n_stars (SlCatalogueModel *self)
{
  return self->ids ? self->ids->len : 0;
}

static gint64
id_at (SlCatalogueModel *self, guint position)
{
  return g_array_index (self->ids, gint64, position);
}

/* The invariants of the cache: at most MAX_PAGES distinct pages, each
 * holding the rows of the ids at its positions. */
static void
check_state (SlCatalogueModel *self)
{
  guint n = n_stars (self);

  g_assert (self->n_pages <= SL_CATALOGUE_MODEL_MAX_PAGES);
  g_assert (self->project != NULL || (self->ids == NULL && self->n_pages == 0));
  for (guint p = 0; p < self->n_pages; p++)
    {
      const Page *page = &self->pages[p];
      guint first = page->index * SL_CATALOGUE_MODEL_PAGE_ROWS;

      g_assert (first < n);
      g_assert (page->n_rows == MIN (SL_CATALOGUE_MODEL_PAGE_ROWS, n - first));
      for (guint q = 0; q < p; q++)
        g_assert (self->pages[q].index != page->index);
      for (guint r = 0; r < page->n_rows; r++)
        g_assert (sl_catalogue_row_get_star_id (page->rows[r]) == id_at (self, first + r));
    }
}

static void
page_clear (Page *page)
{
  for (guint r = 0; r < page->n_rows; r++)
    g_object_unref (page->rows[r]);
  g_clear_pointer (&page->rows, g_free);
  page->n_rows = 0;
}

static void
drop_pages (SlCatalogueModel *self)
{
  for (guint p = 0; p < self->n_pages; p++)
    page_clear (&self->pages[p]);
  self->n_pages = 0;
}

/* Fills ROW's shown columns from the page query's current result row. */
static void
fill_row (SlCatalogueModel *self, SlCatalogueRow *row, sqlite3_stmt *stmt)
{
  sl_catalogue_row_set_text (row, SL_CATALOGUE_COLUMN_DESIGNATION, (const char *) sqlite3_column_text (stmt, 1));
  for (guint i = 0; i < self->n_fetch; i++)
    {
      const Fetch *f = &self->fetch[i];
      double value = sl_column_double_or_nan (stmt, f->first), error;

      switch (f->kind)
        {
        case FETCH_TEXT:
          sl_catalogue_row_set_text (row, f->column, (const char *) sqlite3_column_text (stmt, f->first));
          break;
        case FETCH_VALUE:
          sl_catalogue_row_set_number (row, f->column, value, NAN, NAN);
          break;
        case FETCH_VALUE_ERROR:
          error = sl_column_double_or_nan (stmt, f->first + 1);
          sl_catalogue_row_set_number (row, f->column, value, value - error, value + error);
          break;
        case FETCH_INTERVAL:
          sl_catalogue_row_set_number (row, f->column, value, sl_column_double_or_nan (stmt, f->first + 1),
                                       sl_column_double_or_nan (stmt, f->first + 2));
          break;
        case FETCH_FLAGS:
        default:
          if (sqlite3_column_int (stmt, f->first))
            sl_catalogue_row_set_flags (row, (guint32) sqlite3_column_int64 (stmt, f->first + 2),
                                        sqlite3_column_int (stmt, f->first + 1));
          break;
        }
    }
}

typedef struct {
  gint64 id;
  guint  slot;
} IdSlot;

static int
compare_id_slots (gconstpointer a, gconstpointer b)
{
  gint64 x = ((const IdSlot *) a)->id, y = ((const IdSlot *) b)->id;

  return x < y ? -1 : x > y;
}

/* Runs STMT (bound to the page's ids, results in id order) and hands each
 * result row to FILL with the page row of its id: a merge of two sorted
 * lists. */
static gboolean
read_page_rows (SlCatalogueModel *self, sqlite3_stmt *stmt, const IdSlot *by_id, guint n, Page *page,
                GError **error)
{
  guint next = 0;
  int rc;

  for (guint i = 0; i < SL_CATALOGUE_MODEL_PAGE_ROWS; i++)
    {
      if (i < n)
        sqlite3_bind_int64 (stmt, (int) i + 1, by_id[i].id);
      else
        sqlite3_bind_null (stmt, (int) i + 1);
    }
  while ((rc = sqlite3_step (stmt)) == SQLITE_ROW)
    {
      gint64 id = sqlite3_column_int64 (stmt, 0);

      while (next < n && by_id[next].id < id)
        next++;
      if (next == n || by_id[next].id != id)
        continue;
      fill_row (self, page->rows[by_id[next].slot], stmt);
    }
  sqlite3_reset (stmt);   /* ends the read: the writer's checkpoints may proceed */
  if (rc != SQLITE_DONE)
    {
      sl_project_set_db_error (self->project, error, sl_project_path (self->project));
      return FALSE;
    }
  return TRUE;
}

/* Fills PAGE with page INDEX: one query for the shown columns.  On an
 * error the rows stay empty (said once). */
static void
load_page (SlCatalogueModel *self, Page *page, guint index)
{
  guint first = index * SL_CATALOGUE_MODEL_PAGE_ROWS;
  IdSlot by_id[SL_CATALOGUE_MODEL_PAGE_ROWS];
  g_autoptr (GError) error = NULL;

  page->index = index;
  page->n_rows = MIN (SL_CATALOGUE_MODEL_PAGE_ROWS, n_stars (self) - first);
  page->rows = g_new (SlCatalogueRow *, page->n_rows);
  for (guint r = 0; r < page->n_rows; r++)
    {
      page->rows[r] = sl_catalogue_row_new (id_at (self, first + r));
      by_id[r].id = id_at (self, first + r);
      by_id[r].slot = r;
    }
  qsort (by_id, page->n_rows, sizeof by_id[0], compare_id_slots);

  self->pages_read++;
  if (!read_page_rows (self, self->page_stmt, by_id, page->n_rows, page, &error) && !self->warned)
    {
      g_warning ("the Catalogue cannot read rows: %s", error->message);
      self->warned = TRUE;
    }
}

/* The cached page INDEX, loaded (in place of the least recently used
 * one when the cache is full) if it is not cached. */
static Page *
get_page (SlCatalogueModel *self, guint index)
{
  Page *page = NULL;

  for (guint p = 0; p < self->n_pages; p++)
    if (self->pages[p].index == index)
      {
        page = &self->pages[p];
        break;
      }
  if (page == NULL)
    {
      if (self->n_pages < SL_CATALOGUE_MODEL_MAX_PAGES)
        page = &self->pages[self->n_pages++];
      else
        {
          page = &self->pages[0];
          for (guint p = 1; p < self->n_pages; p++)
            if (self->pages[p].used < page->used)
              page = &self->pages[p];
          page_clear (page);
        }
      load_page (self, page, index);
      check_state (self);
    }
  page->used = ++self->tick;
  return page;
}

/* Shows IDS (taken) instead of the current order, announced as every row
 * removed and then every row added: in one signal, GTK 4.8's list item
 * manager would look for the rows it tracks (focus, anchor) among all the
 * added items by identity, and so read every page of a million stars. */
static void
replace_ids (SlCatalogueModel *self, GArray *ids)
{
  guint old_n = n_stars (self), new_n = ids ? ids->len : 0;

  drop_pages (self);
  g_clear_pointer (&self->ids, g_array_unref);
  check_state (self);
  if (old_n > 0)
    g_list_model_items_changed (G_LIST_MODEL (self), 0, old_n, 0);
  self->ids = ids;
  check_state (self);
  if (new_n > 0)
    g_list_model_items_changed (G_LIST_MODEL (self), 0, 0, new_n);
}

/* ------------------------------------------------------------------ */
/* GListModel                                                         */

static GType
sl_catalogue_model_get_item_type (GListModel *list)
{
  return SL_TYPE_CATALOGUE_ROW;
}

static guint
sl_catalogue_model_get_n_items (GListModel *list)
{
  return n_stars (SL_CATALOGUE_MODEL (list));
}

static gpointer
sl_catalogue_model_get_item (GListModel *list, guint position)
{
  SlCatalogueModel *self = SL_CATALOGUE_MODEL (list);
  Page *page;

  if (position >= n_stars (self))
    return NULL;
  page = get_page (self, position / SL_CATALOGUE_MODEL_PAGE_ROWS);
  return g_object_ref (page->rows[position % SL_CATALOGUE_MODEL_PAGE_ROWS]);
}

static void
sl_catalogue_model_list_model_init (GListModelInterface *iface)
{
  iface->get_item_type = sl_catalogue_model_get_item_type;
  iface->get_n_items = sl_catalogue_model_get_n_items;
  iface->get_item = sl_catalogue_model_get_item;
}

/* ------------------------------------------------------------------ */
/* The project                                                        */

static void
close_project (SlCatalogueModel *self)
{
  g_clear_pointer (&self->page_stmt, sqlite3_finalize);
  g_clear_pointer (&self->designation_stmt, sqlite3_finalize);
  g_clear_pointer (&self->id_stmt, sqlite3_finalize);
  g_clear_pointer (&self->project, sl_project_close);
  g_clear_pointer (&self->path, g_free);
  self->warned = FALSE;
}

/* Prepares the page query for the shown columns. */
static gboolean
prepare_page (SlCatalogueModel *self, GError **error)
{
  g_autofree char *sql = NULL;
  sqlite3_stmt *stmt;

  if (!sl_combine_policy_read (self->project, &self->policy, error))
    return FALSE;
  sql = page_sql (&self->policy, self->shown, self->n_shown, self->fetch, &self->n_fetch);
  stmt = sl_project_prepare (self->project, sql, error);
  if (stmt == NULL)
    return FALSE;
  g_clear_pointer (&self->page_stmt, sqlite3_finalize);
  self->page_stmt = stmt;
  return TRUE;
}

static gboolean
open_project (SlCatalogueModel *self, const char *path, GError **error)
{
  self->project = open_reader (path, error);
  if (self->project == NULL)
    return FALSE;
  self->path = g_strdup (path);
  if (prepare_page (self, error))
    self->designation_stmt = sl_project_prepare (self->project, "SELECT designation FROM stars WHERE id = ?", error);
  if (self->designation_stmt)
    self->id_stmt = sl_project_prepare (self->project, "SELECT id FROM stars WHERE designation = ?", error);
  return self->id_stmt != NULL;
}

gboolean
sl_catalogue_model_set_project (SlCatalogueModel *self, const char *path, GError **error)
{
  g_autoptr (GArray) ids = NULL;

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), FALSE);

  self->generation++;
  drop_pages (self);
  close_project (self);
  if (path != NULL)
    {
      if (open_project (self, path, error))
        ids = query_order (self->project, self->sort_column, self->descending, self->list, NULL, error);
      if (ids == NULL)
        close_project (self);
    }
  replace_ids (self, g_steal_pointer (&ids));
  return path == NULL || self->project != NULL;
}

void
sl_catalogue_model_set_list (SlCatalogueModel *self, const char *list)
{
  char *copy = g_strdup (list);

  g_return_if_fail (SL_IS_CATALOGUE_MODEL (self));

  g_free (self->list);
  self->list = copy;
}

const char *
sl_catalogue_model_get_list (SlCatalogueModel *self)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), NULL);
  return self->list;
}

const char *
sl_catalogue_model_get_path (SlCatalogueModel *self)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), NULL);
  return self->path;
}

gboolean
sl_catalogue_model_set_columns (SlCatalogueModel *self, const SlCatalogueColumn *columns, guint n_columns,
                                GError **error)
{
  SlCatalogueColumn old[SL_CATALOGUE_N_COLUMNS];
  guint old_n = self->n_shown, n = 0;
  gboolean seen[SL_CATALOGUE_N_COLUMNS] = { FALSE };

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), FALSE);
  g_return_val_if_fail (columns != NULL || n_columns == 0, FALSE);

  memcpy (old, self->shown, sizeof old);
  for (guint i = 0; i < n_columns; i++)
    {
      g_return_val_if_fail (columns[i] < SL_CATALOGUE_N_COLUMNS, FALSE);
      if (!seen[columns[i]])
        self->shown[n++] = columns[i];
      seen[columns[i]] = TRUE;
    }
  self->n_shown = n;
  if (self->project == NULL)
    return TRUE;
  if (!prepare_page (self, error))
    {
      memcpy (self->shown, old, sizeof old);
      self->n_shown = old_n;
      prepare_page (self, NULL);
      return FALSE;
    }
  /* The rows held lack the new columns: the same order again, read anew. */
  if (self->ids)
    replace_ids (self, g_array_ref (self->ids));
  return TRUE;
}

const SlCatalogueColumn *
sl_catalogue_model_get_columns (SlCatalogueModel *self, guint *n_columns)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), NULL);

  if (n_columns)
    *n_columns = self->n_shown;
  return self->shown;
}

guint
sl_catalogue_model_get_pages_read (SlCatalogueModel *self)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), 0);
  return self->pages_read;
}

char *
sl_catalogue_model_get_page_sql (SlCatalogueModel *self)
{
  Fetch fetch[SL_CATALOGUE_N_COLUMNS];
  guint n_fetch;

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), NULL);
  return page_sql (&self->policy, self->shown, self->n_shown, fetch, &n_fetch);
}

gboolean
sl_catalogue_model_sort (SlCatalogueModel *self, SlCatalogueColumn column, gboolean descending, GError **error)
{
  GArray *ids;

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), FALSE);
  g_return_val_if_fail (column <= SL_CATALOGUE_COLUMN_NONE, FALSE);

  self->generation++;
  self->sort_column = column;
  self->descending = descending;
  if (self->project == NULL)
    return TRUE;
  ids = query_order (self->project, column, descending, self->list, NULL, error);
  if (ids == NULL)
    return FALSE;
  replace_ids (self, ids);
  return TRUE;
}

/* After the project changed: a new combination policy changes what the
 * input columns show, so the page query follows it. */
static gboolean
follow_policy (SlCatalogueModel *self, GError **error)
{
  SlCombinePolicy policy;

  if (self->project == NULL)
    return TRUE;
  if (!sl_combine_policy_read (self->project, &policy, error))
    return FALSE;
  if (sl_combine_policy_equal (&policy, &self->policy))
    return TRUE;
  drop_pages (self);
  return prepare_page (self, error);
}

gboolean
sl_catalogue_model_reload (SlCatalogueModel *self, GError **error)
{
  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), FALSE);
  if (!follow_policy (self, error))
    return FALSE;
  return sl_catalogue_model_sort (self, self->sort_column, self->descending, error);
}

void
sl_catalogue_model_get_sort (SlCatalogueModel *self, SlCatalogueColumn *column, gboolean *descending)
{
  g_return_if_fail (SL_IS_CATALOGUE_MODEL (self));

  if (column)
    *column = self->sort_column;
  if (descending)
    *descending = self->descending;
}

/* An order computed in a thread, on a connection of its own. */
typedef struct {
  char             *path;
  SlCatalogueColumn column;
  gboolean          descending;
  char             *list;
  guint             generation;   /* the model's when asked */
} OrderJob;

static void
order_job_free (gpointer data)
{
  OrderJob *job = data;

  g_free (job->path);
  g_free (job->list);
  g_free (job);
}

static void
order_thread (GTask *task, gpointer source, gpointer data, GCancellable *cancellable)
{
  OrderJob *job = data;
  GError *error = NULL;
  g_autoptr (SlProject) project = open_reader (job->path, &error);
  GArray *ids = project ? query_order (project, job->column, job->descending, job->list, cancellable, &error) : NULL;

  if (ids)
    g_task_return_pointer (task, ids, (GDestroyNotify) g_array_unref);
  else
    g_task_return_error (task, error);
}

/* Back on the main thread: swaps the order in unless something newer
 * came first, then completes the caller's task. */
static void
on_order_ready (GObject *source, GAsyncResult *result, gpointer user_data)
{
  SlCatalogueModel *self = SL_CATALOGUE_MODEL (source);
  g_autoptr (GTask) outer = user_data;
  OrderJob *job = g_task_get_task_data (G_TASK (result));
  GError *error = NULL;
  GArray *ids = g_task_propagate_pointer (G_TASK (result), &error);

  if (ids == NULL)
    {
      g_task_return_error (outer, error);
      return;
    }
  if (job->generation != self->generation)
    {
      g_array_unref (ids);
      g_task_return_new_error (outer, G_IO_ERROR, G_IO_ERROR_CANCELLED, "superseded");
      return;
    }
  replace_ids (self, ids);
  g_task_return_boolean (outer, TRUE);
}

static void
order_async (SlCatalogueModel *self, SlCatalogueColumn column, gboolean descending, GCancellable *cancellable,
             GAsyncReadyCallback callback, gpointer user_data)
{
  GTask *outer = g_task_new (self, cancellable, callback, user_data);
  g_autoptr (GTask) inner = NULL;
  OrderJob *job;

  g_task_set_source_tag (outer, order_async);
  self->generation++;
  self->sort_column = column;
  self->descending = descending;
  if (self->project == NULL)
    {
      g_task_return_boolean (outer, TRUE);
      g_object_unref (outer);
      return;
    }
  job = g_new0 (OrderJob, 1);
  job->path = g_strdup (self->path);
  job->column = column;
  job->descending = descending;
  job->list = g_strdup (self->list);
  job->generation = self->generation;
  inner = g_task_new (self, cancellable, on_order_ready, outer);
  g_task_set_task_data (inner, job, order_job_free);
  g_task_run_in_thread (inner, order_thread);
}

void
sl_catalogue_model_sort_async (SlCatalogueModel *self, SlCatalogueColumn column, gboolean descending,
                               GCancellable *cancellable, GAsyncReadyCallback callback, gpointer user_data)
{
  g_return_if_fail (SL_IS_CATALOGUE_MODEL (self));
  g_return_if_fail (column <= SL_CATALOGUE_COLUMN_NONE);

  order_async (self, column, descending, cancellable, callback, user_data);
}

void
sl_catalogue_model_reload_async (SlCatalogueModel *self, GCancellable *cancellable, GAsyncReadyCallback callback,
                                 gpointer user_data)
{
  g_autoptr (GError) error = NULL;

  g_return_if_fail (SL_IS_CATALOGUE_MODEL (self));

  if (!follow_policy (self, &error))
    {
      g_task_report_error (self, callback, user_data, order_async, g_steal_pointer (&error));
      return;
    }
  order_async (self, self->sort_column, self->descending, cancellable, callback, user_data);
}

gboolean
sl_catalogue_model_order_finish (SlCatalogueModel *self, GAsyncResult *result, GError **error)
{
  g_return_val_if_fail (g_task_is_valid (result, self), FALSE);
  g_return_val_if_fail (g_task_get_source_tag (G_TASK (result)) == order_async, FALSE);

  return g_task_propagate_boolean (G_TASK (result), error);
}

GArray *
sl_catalogue_model_find (SlCatalogueModel *self, const char *const *designations)
{
  g_autoptr (GHashTable) wanted = g_hash_table_new (g_int64_hash, g_int64_equal);
  g_autofree gint64 *found = NULL;
  GArray *positions = g_array_new (FALSE, FALSE, sizeof (guint));
  guint n_wanted = designations ? g_strv_length ((char **) designations) : 0, n_found = 0;

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), positions);

  if (self->project == NULL || n_wanted == 0)
    return positions;
  found = g_new (gint64, n_wanted);
  for (guint i = 0; i < n_wanted; i++)
    {
      sqlite3_bind_text (self->id_stmt, 1, designations[i], -1, SQLITE_STATIC);
      if (sqlite3_step (self->id_stmt) == SQLITE_ROW)
        {
          found[n_found] = sqlite3_column_int64 (self->id_stmt, 0);
          g_hash_table_add (wanted, &found[n_found++]);
        }
      sqlite3_reset (self->id_stmt);
    }
  sqlite3_clear_bindings (self->id_stmt);
  /* One pass over the order: a hash lookup a star. */
  for (guint p = 0; p < n_stars (self) && positions->len < g_hash_table_size (wanted); p++)
    {
      gint64 id = id_at (self, p);

      if (g_hash_table_contains (wanted, &id))
        g_array_append_val (positions, p);
    }
  return positions;
}

char **
sl_catalogue_model_get_designations (SlCatalogueModel *self, const guint *positions, guint n_positions)
{
  g_autoptr (GStrvBuilder) builder = g_strv_builder_new ();

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), NULL);

  for (guint i = 0; i < n_positions; i++)
    {
      guint position = positions[i], index = position / SL_CATALOGUE_MODEL_PAGE_ROWS;
      const char *designation = NULL;

      if (position >= n_stars (self))
        continue;
      for (guint p = 0; p < self->n_pages && designation == NULL; p++)
        if (self->pages[p].index == index)
          designation = sl_catalogue_row_get_designation (self->pages[p].rows[position % SL_CATALOGUE_MODEL_PAGE_ROWS]);
      if (designation)
        {
          g_strv_builder_add (builder, designation);
          continue;
        }
      sqlite3_bind_int64 (self->designation_stmt, 1, id_at (self, position));
      if (sqlite3_step (self->designation_stmt) == SQLITE_ROW)
        g_strv_builder_add (builder, (const char *) sqlite3_column_text (self->designation_stmt, 0));
      sqlite3_reset (self->designation_stmt);
    }
  return g_strv_builder_end (builder);
}

guint
sl_catalogue_model_get_cached_rows (SlCatalogueModel *self)
{
  guint rows = 0;

  g_return_val_if_fail (SL_IS_CATALOGUE_MODEL (self), 0);

  for (guint p = 0; p < self->n_pages; p++)
    rows += self->pages[p].n_rows;
  return rows;
}

/* ------------------------------------------------------------------ */
/* Construction                                                       */

static void
sl_catalogue_model_finalize (GObject *object)
{
  SlCatalogueModel *self = SL_CATALOGUE_MODEL (object);

  drop_pages (self);
  g_clear_pointer (&self->ids, g_array_unref);
  g_clear_pointer (&self->list, g_free);
  close_project (self);
  G_OBJECT_CLASS (sl_catalogue_model_parent_class)->finalize (object);
}

static void
sl_catalogue_model_class_init (SlCatalogueModelClass *klass)
{
  G_OBJECT_CLASS (klass)->finalize = sl_catalogue_model_finalize;
}

static void
sl_catalogue_model_init (SlCatalogueModel *self)
{
  const SlCatalogueColumn *usual = sl_catalogue_default_columns (&self->n_shown);

  memcpy (self->shown, usual, self->n_shown * sizeof *usual);
  self->sort_column = SL_CATALOGUE_COLUMN_NONE;
}

SlCatalogueModel *
sl_catalogue_model_new (void)
{
  return g_object_new (SL_TYPE_CATALOGUE_MODEL, NULL);
}
