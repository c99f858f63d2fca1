/* fw-feature-file.c: NPY and CSV import of feature matrices (see fw-feature-file.h).
 *
 * NPY layout (numpy's "NEP 1" format description): the magic "\x93NUMPY", one byte major and
 * one byte minor version, a little-endian header length (2 bytes for 1.0, 4 bytes for 2.0 and
 * 3.0), then that many bytes of a Python dict literal with the keys 'descr', 'fortran_order'
 * and 'shape', padded with spaces and ended by a newline; the raw array data follows.
 */
#include "fw-config.h"

#include "fw-feature-file.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

G_DEFINE_QUARK (fw-feature-file-error-quark, fw_feature_file_error)

void
fw_feature_file_options_init (FwFeatureFileOptions *options)
{
  memset (options, 0, sizeof *options);
  options->axes = FW_FEATURE_AXES_FRAMES_BINS;
  options->time_column = FW_FEATURE_TIME_COLUMN_AUTO;
}

const char *
fw_feature_axes_name (FwFeatureAxes axes)
{
  return axes == FW_FEATURE_AXES_BINS_FRAMES ? "bins-frames" : "frames-bins";
}

gboolean
fw_feature_axes_from_name (const char *name, FwFeatureAxes *out)
{
  if (g_strcmp0 (name, "frames-bins") == 0)
    *out = FW_FEATURE_AXES_FRAMES_BINS;
  else if (g_strcmp0 (name, "bins-frames") == 0)
    *out = FW_FEATURE_AXES_BINS_FRAMES;
  else
    return FALSE;
  return TRUE;
}

static gboolean
parse_number (const char *s, double *out)
{
  char *end = NULL;
  double v;

  if (s == NULL || *s == '\0')
    return FALSE;
  v = g_ascii_strtod (s, &end);
  if (end == s || *end != '\0')
    return FALSE;
  *out = v;
  return TRUE;
}

gboolean
fw_feature_file_options_parse (const char *text, FwFeatureFileOptions *options, GError **error)
{
  g_auto (GStrv) items = NULL;

  fw_feature_file_options_init (options);
  if (text == NULL)
    return TRUE;
  items = g_strsplit_set (text, "; \t\n", -1);
  for (char **it = items; *it; it++)
    {
      const char *eq;
      g_autofree char *key = NULL;
      const char *value;
      double v;

      if (**it == '\0')
        continue;
      eq = strchr (*it, '=');
      if (eq == NULL)
        {
          g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                       _("Import option '%s' is not of the form key=value"), *it);
          return FALSE;
        }
      key = g_strndup (*it, eq - *it);
      value = eq + 1;
      if (strcmp (key, "axes") == 0)
        {
          if (!fw_feature_axes_from_name (value, &options->axes))
            {
              g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                           _("Import option axes=%s: expected frames-bins or bins-frames"),
                           value);
              return FALSE;
            }
        }
      else if (strcmp (key, "hop") == 0 || strcmp (key, "sample_rate") == 0)
        {
          if (!parse_number (value, &v) || !isfinite (v) || v < 0)
            {
              g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                           _("Import option %s=%s: expected a number >= 0 (0 = unknown)"),
                           key, value);
              return FALSE;
            }
          if (key[0] == 'h')
            options->hop_length = v;
          else
            options->sample_rate = v;
        }
      else if (strcmp (key, "origin") == 0)
        {
          if (!parse_number (value, &v) || !isfinite (v))
            {
              g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                           _("Import option origin=%s: expected a time in seconds"), value);
              return FALSE;
            }
          options->time_origin = v;
        }
      else if (strcmp (key, "time_column") == 0)
        {
          if (strcmp (value, "auto") == 0)
            options->time_column = FW_FEATURE_TIME_COLUMN_AUTO;
          else if (strcmp (value, "yes") == 0)
            options->time_column = FW_FEATURE_TIME_COLUMN_YES;
          else if (strcmp (value, "no") == 0)
            options->time_column = FW_FEATURE_TIME_COLUMN_NO;
          else
            {
              g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                           _("Import option time_column=%s: expected auto, yes or no"), value);
              return FALSE;
            }
        }
      else
        {
          g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                       _("Unknown import option '%s' (known: axes, hop, sample_rate, origin, "
                         "time_column)"),
                       key);
          return FALSE;
        }
    }
  return TRUE;
}

char *
fw_feature_file_options_to_string (const FwFeatureFileOptions *o)
{
  char hop[G_ASCII_DTOSTR_BUF_SIZE], sr[G_ASCII_DTOSTR_BUF_SIZE], origin[G_ASCII_DTOSTR_BUF_SIZE];
  static const char *const tc[] = { "auto", "yes", "no" };

  g_ascii_dtostr (hop, sizeof hop, o->hop_length);
  g_ascii_dtostr (sr, sizeof sr, o->sample_rate);
  g_ascii_dtostr (origin, sizeof origin, o->time_origin);
  return g_strdup_printf ("axes=%s;hop=%s;sample_rate=%s;origin=%s;time_column=%s",
                          fw_feature_axes_name (o->axes), hop, sr, origin,
                          tc[o->time_column <= FW_FEATURE_TIME_COLUMN_NO ? o->time_column : 0]);
}

void
fw_feature_file_free (FwFeatureFile *file)
{
  if (file == NULL)
    return;
  if (file->matrix)
    fw_matrix_unref (file->matrix);
  g_free (file->path);
  g_free (file->format);
  g_free (file->dtype);
  g_strfreev (file->column_names);
  g_free (file);
}

/* ---- shared: build the matrix from a row-major (rows x cols) double array --------------- */

static FwFeatureFile *
finish_matrix (const char *name, const FwFeatureFileOptions *opt, const double *values,
               gsize rows, gsize cols, const double *times, FwFeatureFile *file, GError **error)
{
  gsize n_frames, n_bins, bad = 0, bad_frame = 0, bad_bin = 0;
  FwMatrix *m;
  gboolean transpose = opt->axes == FW_FEATURE_AXES_BINS_FRAMES;

  n_frames = transpose ? cols : rows;
  n_bins = transpose ? rows : cols;
  for (gsize r = 0; r < rows; r++)
    for (gsize c = 0; c < cols; c++)
      {
        double v = values[r * cols + c];
        if (!isfinite (v) || !isfinite ((float) v))
          {
            if (bad == 0)
              {
                bad_frame = transpose ? c : r;
                bad_bin = transpose ? r : c;
              }
            bad++;
          }
      }
  if (bad > 0)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_NON_FINITE,
                   g_dngettext (GETTEXT_PACKAGE,
                                "%s: %zu value is NaN, infinite or beyond the "
                                "float32 range, at frame %zu, bin %zu",
                                "%s: %zu values are NaN, infinite or beyond the "
                                "float32 range; the first at frame %zu, bin %zu",
                                bad),
                   name, bad, bad_frame, bad_bin);
      fw_feature_file_free (file);
      return NULL;
    }
  m = fw_matrix_new (n_frames, n_bins);
  if (m == NULL)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED,
                   _("%s: not enough memory for a %zu x %zu matrix"),
                   name, n_frames, n_bins);
      fw_feature_file_free (file);
      return NULL;
    }
  for (gsize t = 0; t < n_frames; t++)
    for (gsize k = 0; k < n_bins; k++)
      m->data[t * n_bins + k] = (float) (transpose ? values[k * cols + t] : values[t * cols + k]);
  for (gsize k = 0; k < n_bins; k++)
    {
      if (m->bin_value)
        m->bin_value[k] = (double) k;
      if (m->bin_low)
        m->bin_low[k] = (double) k;
      if (m->bin_high)
        m->bin_high[k] = (double) k;
    }
  m->bin_kind = n_bins == 1 ? FW_BIN_AXIS_SCALAR : FW_BIN_AXIS_COEFFICIENT;
  m->stage = -1;
  if (times)
    {
      for (gsize t = 0; t < n_frames; t++)
        m->frame_times[t] = times[t];
      m->hop_seconds = n_frames > 1 ? (times[n_frames - 1] - times[0]) / (double) (n_frames - 1)
                                    : 0.0;
      m->sample_rate = opt->sample_rate;
      file->has_times = TRUE;
    }
  else if (opt->hop_length > 0 && opt->sample_rate > 0)
    {
      m->hop_seconds = opt->hop_length / opt->sample_rate;
      m->sample_rate = opt->sample_rate;
      for (gsize t = 0; t < n_frames; t++)
        m->frame_times[t] = opt->time_origin + (double) t * m->hop_seconds;
      file->has_times = TRUE;
    }
  else
    {
      /* placeholder grid (index); the comparison adopts the other side's times */
      m->hop_seconds = 0;
      m->sample_rate = 0;
      for (gsize t = 0; t < n_frames; t++)
        m->frame_times[t] = (double) t;
      file->has_times = FALSE;
    }
  file->matrix = m;
  return file;
}

static FwFeatureFile *
new_file (const char *name, const char *format)
{
  FwFeatureFile *file = g_new0 (FwFeatureFile, 1);
  file->path = g_strdup (name);
  file->format = g_strdup (format);
  return file;
}

/* ---- NPY --------------------------------------------------------------------------------- */

typedef struct {
  const char *p, *end;
} Cursor;

static void
skip_space (Cursor *c)
{
  while (c->p < c->end && (*c->p == ' ' || *c->p == '\t' || *c->p == '\n' || *c->p == '\r'))
    c->p++;
}

static char *
parse_pystring (Cursor *c)
{
  char q;
  const char *start;

  skip_space (c);
  if (c->p >= c->end || (*c->p != '\'' && *c->p != '"'))
    return NULL;
  q = *c->p++;
  start = c->p;
  while (c->p < c->end && *c->p != q)
    c->p++;
  if (c->p >= c->end)
    return NULL;
  return g_strndup (start, c->p++ - start);
}

static gboolean
expect_char (Cursor *c, char ch)
{
  skip_space (c);
  if (c->p < c->end && *c->p == ch)
    {
      c->p++;
      return TRUE;
    }
  return FALSE;
}

static gboolean
parse_npy_header (const char *name, const char *text, gsize len, char **descr,
                  gboolean *fortran, GArray *shape, GError **error)
{
  Cursor c = { text, text + len };
  gboolean have_descr = FALSE, have_fortran = FALSE, have_shape = FALSE;

  if (!expect_char (&c, '{'))
    goto bad;
  for (;;)
    {
      g_autofree char *key = NULL;

      skip_space (&c);
      if (expect_char (&c, '}'))
        break;
      key = parse_pystring (&c);
      if (key == NULL || !expect_char (&c, ':'))
        goto bad;
      skip_space (&c);
      if (strcmp (key, "descr") == 0)
        {
          *descr = parse_pystring (&c);
          if (*descr == NULL)
            {
              g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED,
                           _("%s: the NPY dtype is a structured type; Framewise reads plain "
                             "float32 or float64 arrays"),
                           name);
              return FALSE;
            }
          have_descr = TRUE;
        }
      else if (strcmp (key, "fortran_order") == 0)
        {
          if ((gsize) (c.end - c.p) >= 4 && strncmp (c.p, "True", 4) == 0)
            {
              *fortran = TRUE;
              c.p += 4;
            }
          else if ((gsize) (c.end - c.p) >= 5 && strncmp (c.p, "False", 5) == 0)
            {
              *fortran = FALSE;
              c.p += 5;
            }
          else
            goto bad;
          have_fortran = TRUE;
        }
      else if (strcmp (key, "shape") == 0)
        {
          if (!expect_char (&c, '('))
            goto bad;
          for (;;)
            {
              guint64 v;
              char *endp = NULL;

              skip_space (&c);
              if (expect_char (&c, ')'))
                break;
              if (c.p >= c.end || !g_ascii_isdigit (*c.p))
                goto bad;
              v = g_ascii_strtoull (c.p, &endp, 10);
              if (endp == c.p)
                goto bad;
              c.p = endp;
              /* numpy may write "3L" on very old versions */
              if (c.p < c.end && *c.p == 'L')
                c.p++;
              g_array_append_val (shape, v);
              skip_space (&c);
              if (expect_char (&c, ')'))
                break;
              if (!expect_char (&c, ','))
                goto bad;
            }
          have_shape = TRUE;
        }
      else
        goto bad;
      skip_space (&c);
      if (expect_char (&c, '}'))
        break;
      if (!expect_char (&c, ','))
        goto bad;
    }
  if (!have_descr || !have_fortran || !have_shape)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: the NPY header lacks '%s'"), name,
                   !have_descr ? "descr" : !have_fortran ? "fortran_order" : "shape");
      return FALSE;
    }
  return TRUE;

bad:
  {
    g_autofree char *shown = g_strndup (text, MIN (len, 120));
    g_strchomp (shown);
    g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                 _("%s: malformed NPY header near offset %d: %s"), name,
                 (int) (c.p - text), shown);
  }
  return FALSE;
}

FwFeatureFile *
fw_feature_file_parse_npy (const char *name, const guint8 *data, gsize length,
                           const FwFeatureFileOptions *options, GError **error)
{
  static const guint8 magic[6] = { 0x93, 'N', 'U', 'M', 'P', 'Y' };
  FwFeatureFileOptions defaults;
  guint major, minor;
  gsize header_len, offset, n_values, rows, cols, itemsize;
  g_autofree char *descr = NULL;
  gboolean fortran = FALSE, big_endian;
  g_autoptr (GArray) shape = g_array_new (FALSE, FALSE, sizeof (guint64));
  g_autofree double *values = NULL;
  g_autofree char *format = NULL;
  FwFeatureFile *file;

  if (options == NULL)
    {
      fw_feature_file_options_init (&defaults);
      options = &defaults;
    }
  if (length < 10 || memcmp (data, magic, 6) != 0)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: not an NPY file (it does not start with the NPY magic bytes)"), name);
      return NULL;
    }
  major = data[6];
  minor = data[7];
  if (major == 1)
    {
      header_len = data[8] | ((gsize) data[9] << 8);
      offset = 10;
    }
  else if (major == 2 || major == 3)
    {
      if (length < 12)
        {
          g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                       _("%s: NPY file truncated inside its header"), name);
          return NULL;
        }
      header_len = data[8] | ((gsize) data[9] << 8) | ((gsize) data[10] << 16)
                   | ((gsize) data[11] << 24);
      offset = 12;
    }
  else
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED,
                   _("%s: NPY format version %u.%u is not supported (1.0, 2.0 and 3.0 are)"),
                   name, major, minor);
      return NULL;
    }
  if (header_len > length - offset)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: NPY file truncated: the header says %zu bytes, the file has %zu "
                     "after the preamble"),
                   name, header_len, length - offset);
      return NULL;
    }
  if (!parse_npy_header (name, (const char *) data + offset, header_len, &descr, &fortran,
                         shape, error))
    return NULL;
  offset += header_len;

  if (strlen (descr) != 3 || (descr[0] != '<' && descr[0] != '>' && descr[0] != '=')
      || descr[1] != 'f' || (descr[2] != '4' && descr[2] != '8'))
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED,
                   _("%s: NPY dtype '%s' is not supported; Framewise reads float32 ('<f4', "
                     "'>f4') and float64 ('<f8', '>f8') arrays"),
                   name, descr);
      return NULL;
    }
  itemsize = descr[2] == '4' ? 4 : 8;
  big_endian = descr[0] == '>' || (descr[0] == '=' && G_BYTE_ORDER == G_BIG_ENDIAN);

  /* drop leading dimensions of size 1 beyond two */
  while (shape->len > 2 && g_array_index (shape, guint64, 0) == 1)
    g_array_remove_index (shape, 0);
  if (shape->len == 0 || shape->len > 2)
    {
      GString *s = g_string_new ("(");
      for (guint i = 0; i < shape->len; i++)
        g_string_append_printf (s, "%s%" G_GUINT64_FORMAT, i ? ", " : "",
                                g_array_index (shape, guint64, i));
      g_string_append (s, ")");
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED,
                   _("%s: the array has shape %s; Framewise reads 1-D or 2-D arrays (leading "
                     "dimensions of size 1 are dropped)"),
                   name, s->str);
      g_string_free (s, TRUE);
      return NULL;
    }
  rows = (gsize) g_array_index (shape, guint64, 0);
  cols = shape->len == 2 ? (gsize) g_array_index (shape, guint64, 1) : 1;
  if (rows == 0 || cols == 0)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: the array is empty (shape %zu x %zu)"),
                   name, rows, cols);
      return NULL;
    }
  if (rows > G_MAXSIZE / cols / 8)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: the array shape is too large"), name);
      return NULL;
    }
  n_values = rows * cols;
  if (length - offset < n_values * itemsize)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: NPY file truncated: shape %zu x %zu of %s needs %zu data bytes, "
                     "the file has %zu"),
                   name, rows, cols, descr, n_values * itemsize, length - offset);
      return NULL;
    }

  values = g_new (double, n_values);
  for (gsize i = 0; i < n_values; i++)
    {
      const guint8 *p = data + offset + i * itemsize;
      gsize r, c, dst;
      double v;

      if (itemsize == 4)
        {
          guint32 u;
          float f;
          memcpy (&u, p, 4);
          u = big_endian ? GUINT32_FROM_BE (u) : GUINT32_FROM_LE (u);
          memcpy (&f, &u, 4);
          v = f;
        }
      else
        {
          guint64 u;
          memcpy (&u, p, 8);
          u = big_endian ? GUINT64_FROM_BE (u) : GUINT64_FROM_LE (u);
          memcpy (&v, &u, 8);
        }
      /* element i in storage order -> (r, c) */
      if (fortran)
        {
          c = i / rows;
          r = i % rows;
        }
      else
        {
          r = i / cols;
          c = i % cols;
        }
      dst = r * cols + c;
      values[dst] = v;
    }

  format = g_strdup_printf ("NPY %u.%u", major, minor);
  file = new_file (name, format);
  file->dtype = g_strdup (descr);
  file->fortran_order = fortran;
  file->file_rows = rows;
  file->file_cols = cols;
  return finish_matrix (name, options, values, rows, cols, NULL, file, error);
}

static char *
read_all (const char *path, gsize *length, GError **error)
{
  char *contents = NULL;
  g_autoptr (GError) local = NULL;

  if (!g_file_get_contents (path, &contents, length, &local))
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_IO,
                   _("Cannot read feature file %s: %s"), path, local->message);
      return NULL;
    }
  return contents;
}

FwFeatureFile *
fw_feature_file_read_npy (const char *path, const FwFeatureFileOptions *options, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  contents = read_all (path, &length, error);
  if (contents == NULL)
    return NULL;
  return fw_feature_file_parse_npy (path, (const guint8 *) contents, length, options, error);
}

/* ---- CSV --------------------------------------------------------------------------------- */

static char **
split_fields (const char *line, char delim)
{
  char d[2] = { delim, 0 };
  char **fields = g_strsplit (line, d, -1);

  for (char **f = fields; *f; f++)
    {
      gsize n;
      g_strstrip (*f);
      n = strlen (*f);
      if (n >= 2 && (*f)[0] == '"' && (*f)[n - 1] == '"')
        {
          memmove (*f, *f + 1, n - 2);
          (*f)[n - 2] = '\0';
          g_strstrip (*f);
        }
    }
  return fields;
}

static gboolean
looks_like_time_name (const char *name)
{
  g_autofree char *low = g_ascii_strdown (name, -1);
  return g_str_has_prefix (low, "time") || strcmp (low, "t") == 0
         || strcmp (low, "seconds") == 0 || strcmp (low, "t_s") == 0;
}

FwFeatureFile *
fw_feature_file_parse_csv (const char *name, const char *text, gsize length,
                           const FwFeatureFileOptions *options, GError **error)
{
  FwFeatureFileOptions defaults;
  g_autofree char *copy = NULL;
  g_auto (GStrv) lines = NULL;
  g_autoptr (GArray) values = g_array_new (FALSE, FALSE, sizeof (double));
  g_autoptr (GArray) times = g_array_new (FALSE, FALSE, sizeof (double));
  g_auto (GStrv) header = NULL;
  gsize n_cols = 0, rows = 0, first_value_col = 0, header_line = 0;
  gboolean time_col = FALSE, decided = FALSE;
  char delim = ',';
  FwFeatureFile *file;

  if (options == NULL)
    {
      fw_feature_file_options_init (&defaults);
      options = &defaults;
    }
  if (memchr (text, '\0', length) != NULL)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   _("%s: not a CSV text file (it contains NUL bytes)"), name);
      return NULL;
    }
  copy = g_strndup (text, length);
  lines = g_strsplit (copy, "\n", -1);

  for (gsize li = 0; lines[li]; li++)
    {
      char *line = lines[li];
      g_auto (GStrv) fields = NULL;
      gsize nf;
      gboolean all_numbers = TRUE;

      g_strstrip (line);
      if (*line == '\0' || *line == '#')
        continue;
      if (!decided)
        {
          if (strchr (line, ','))
            delim = ',';
          else if (strchr (line, '\t'))
            delim = '\t';
          else if (strchr (line, ';'))
            delim = ';';
        }
      fields = split_fields (line, delim);
      nf = g_strv_length (fields);
      for (gsize f = 0; f < nf; f++)
        {
          double v;
          if (!parse_number (fields[f], &v))
            all_numbers = FALSE;
        }
      if (!decided)
        {
          decided = TRUE;
          n_cols = nf;
          if (!all_numbers)
            {
              header = g_steal_pointer (&fields);
              header_line = li + 1;
              if (options->time_column == FW_FEATURE_TIME_COLUMN_YES
                  || (options->time_column == FW_FEATURE_TIME_COLUMN_AUTO
                      && looks_like_time_name (header[0])))
                time_col = TRUE;
              continue;
            }
          time_col = options->time_column == FW_FEATURE_TIME_COLUMN_YES;
        }
      if (nf != n_cols)
        {
          g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                       _("%s: line %zu has %zu fields, the first row has %zu"),
                       name, li + 1, nf, n_cols);
          return NULL;
        }
      for (gsize f = 0; f < nf; f++)
        {
          double v;
          if (!parse_number (fields[f], &v))
            {
              g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                           _("%s: line %zu, column %zu: '%s' is not a number"),
                           name, li + 1, f + 1, fields[f]);
              return NULL;
            }
          if (time_col && f == 0)
            {
              if (!isfinite (v)
                  || (times->len > 0 && !(v > g_array_index (times, double, times->len - 1))))
                {
                  g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                               _("%s: line %zu: the time column must increase "
                                 "(found %s)"),
                               name, li + 1, fields[f]);
                  return NULL;
                }
              g_array_append_val (times, v);
            }
          else
            g_array_append_val (values, v);
        }
      rows++;
    }
  (void) header_line;
  first_value_col = time_col ? 1 : 0;
  if (rows == 0 || n_cols <= first_value_col)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT,
                   rows == 0 ? _("%s: no rows of numbers (an empty CSV file)")
                             : _("%s: only a time column, no feature values"),
                   name);
      return NULL;
    }
  if (time_col && options->axes == FW_FEATURE_AXES_BINS_FRAMES)
    {
      g_set_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS,
                   _("%s: a time column with rows as bins (axes=bins-frames) makes no sense; "
                     "declare frames-bins or no time column"),
                   name);
      return NULL;
    }

  file = new_file (name, "CSV");
  file->dtype = g_strdup ("text");
  file->file_rows = rows;
  file->file_cols = n_cols - first_value_col;
  file->has_header = header != NULL;
  file->has_time_column = time_col;
  if (header)
    {
      gsize nh = n_cols - first_value_col;
      file->column_names = g_new0 (char *, nh + 1);
      for (gsize i = 0; i < nh; i++)
        file->column_names[i] = g_strdup (header[i + first_value_col]);
    }
  return finish_matrix (name, options, (const double *) values->data, rows,
                        n_cols - first_value_col,
                        time_col ? (const double *) times->data : NULL, file, error);
}

FwFeatureFile *
fw_feature_file_read_csv (const char *path, const FwFeatureFileOptions *options, GError **error)
{
  g_autofree char *contents = NULL;
  gsize length = 0;

  contents = read_all (path, &length, error);
  if (contents == NULL)
    return NULL;
  return fw_feature_file_parse_csv (path, contents, length, options, error);
}

FwFeatureFile *
fw_feature_file_read (const char *path, const FwFeatureFileOptions *options, GError **error)
{
  g_autofree char *low = g_ascii_strdown (path, -1);

  if (g_str_has_suffix (low, ".npy"))
    return fw_feature_file_read_npy (path, options, error);
  return fw_feature_file_read_csv (path, options, error);
}

FwMatrix *
fw_feature_file_adopt_grid (const FwFeatureFile *file, const FwMatrix *other,
                            gboolean *adopted_times, gboolean *adopted_bins)
{
  FwMatrix *m = fw_matrix_copy (file->matrix);

  if (adopted_times)
    *adopted_times = FALSE;
  if (adopted_bins)
    *adopted_bins = FALSE;
  if (m == NULL || other == NULL)
    return m;
  if (!file->has_times && other->n_frames > 0)
    {
      double hop = other->hop_seconds;
      if (!(hop > 0) && other->n_frames > 1)
        hop = (other->frame_times[other->n_frames - 1] - other->frame_times[0])
              / (double) (other->n_frames - 1);
      if (!(hop > 0))
        hop = 1.0;
      for (gsize t = 0; t < m->n_frames; t++)
        m->frame_times[t] = t < other->n_frames
                              ? other->frame_times[t]
                              : other->frame_times[other->n_frames - 1]
                                  + (double) (t - other->n_frames + 1) * hop;
      m->hop_seconds = hop;
      m->sample_rate = other->sample_rate;
      if (adopted_times)
        *adopted_times = TRUE;
    }
  if (m->n_bins == other->n_bins)
    {
      for (gsize k = 0; k < m->n_bins; k++)
        {
          if (m->bin_value && other->bin_value)
            m->bin_value[k] = other->bin_value[k];
          if (m->bin_low && other->bin_low)
            m->bin_low[k] = other->bin_low[k];
          if (m->bin_high && other->bin_high)
            m->bin_high[k] = other->bin_high[k];
        }
      m->bin_kind = other->bin_kind;
      m->stage = other->stage;
      if (adopted_bins)
        *adopted_bins = TRUE;
    }
  return m;
}
