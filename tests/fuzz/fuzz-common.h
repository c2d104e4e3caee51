/* fuzz-common.h: what the fuzz targets share: a scratch directory, GLib
 * warnings and criticals made fatal (a failed precondition is a bug the
 * fuzzer should report), and the input as a C string. */
#pragma once

#include <glib.h>
#include <glib/gstdio.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

int LLVMFuzzerTestOneInput (const uint8_t *data, size_t size);
int LLVMFuzzerInitialize (int *argc, char ***argv);

static char *fuzz_dir;

/* At exit: the scratch directory and what the target left in it. */
static inline void
fuzz_cleanup (void)
{
  GDir *dir = g_dir_open (fuzz_dir, 0, NULL);
  const char *name;

  while (dir && (name = g_dir_read_name (dir)))
    {
      g_autofree char *path = g_build_filename (fuzz_dir, name, NULL);

      g_unlink (path);
    }
  if (dir)
    g_dir_close (dir);
  g_rmdir (fuzz_dir);
  g_clear_pointer (&fuzz_dir, g_free);
}

static inline void
fuzz_init (void)
{
  g_log_set_always_fatal (G_LOG_LEVEL_CRITICAL | G_LOG_LEVEL_WARNING);
  g_setenv ("USER", "fuzz", TRUE);
  fuzz_dir = g_dir_make_tmp ("starledger-fuzz-XXXXXX", NULL);
  g_assert_nonnull (fuzz_dir);
  atexit (fuzz_cleanup);
}

/* The bytes with a terminating NUL (inputs may hold NULs: the parsers see
 * the text up to the first). */
static inline char *
fuzz_string (const uint8_t *data, size_t size)
{
  char *text = g_malloc (size + 1);

  memcpy (text, data, size);
  text[size] = '\0';
  return text;
}

static inline void
fuzz_write_file (const char *path, const uint8_t *data, size_t size)
{
  g_autoptr (GError) error = NULL;

  if (!g_file_set_contents (path, (const char *) data, (gssize) size, &error))
    g_error ("%s", error->message);
}

static inline void
fuzz_remove_project (const char *path)
{
  g_autofree char *wal = g_strconcat (path, "-wal", NULL);
  g_autofree char *shm = g_strconcat (path, "-shm", NULL);

  g_unlink (path);
  g_unlink (wal);
  g_unlink (shm);
}
