/* fw-project-file.c: the project file, a text format of our own (read with GKeyFile).
 *
 *   # comments start with '#'
 *   [framewise-project]
 *   format=1                      format version (required, first thing checked)
 *   title=Hive sounds             free text
 *   cache_budget=1073741824       bytes for computed features
 *
 *   [clip 1]                      one group per clip, in list order
 *   path=audio/hive-03.flac       relative to the project file's folder when the clip lies
 *                                 inside it, absolute otherwise
 *   label=calm-colony             class label (may be empty)
 *   channel=params                params | mix | 1, 2, ... (overrides the set's `channel`)
 *   notes=free text, \n for new lines
 *
 *   [parameter-set 1]             one group per set; `name` plus the canonical parameter keys
 *   name=long-window              (fw-params.h) in canonical order and text form
 *   sample_rate=16000
 *   ...
 *
 *   [comparison 1]                a saved comparison; operands a and b
 *   name=...
 *   stage=mel-db
 *   a=clip                        clip | file
 *   a_clip=hive-03.flac           clip path (kind clip) or feature file path (kind file)
 *   a_param_set=long-window       kind clip only
 *   a_options=                    kind file: the compare code's options text
 *   b=...
 *
 *   [end]                         required last line: a file without it was cut short
 *
 * Reading is strict so that nothing is ever half-loaded or silently dropped: every line must
 * be blank, a comment, a group header or key=value; groups and keys are known and appear once;
 * values have the right type. Errors read "FILE:LINE: [group] key: what is wrong". The whole
 * project is built in a new FwProject that is returned only when everything succeeded.
 *
 * Versions: a file with a higher format than FW_PROJECT_FORMAT_VERSION is refused with a
 * message saying so; an older format would be upgraded in memory by the steps in `upgrades`
 * (none exist yet: format 1 is the first).
 *
 * Saving writes the whole text with g_file_replace_contents(), which writes a temporary file
 * in the same folder and renames it over the old one (atomic: a crash leaves either the old or
 * the new file), and keeps the previous file as PATH~.
 */
#include "fw-config.h"

#include <errno.h>
#include <string.h>

#include <glib/gi18n.h>
#include <glib/gstdio.h>

#include "fw-project-private.h"
#include "fw-project.h"

#define GROUP_HEADER "framewise-project"
#define GROUP_END "end"
#define PREFIX_CLIP "clip "
#define PREFIX_SET "parameter-set "
#define PREFIX_CMP "comparison "

static const char *const header_keys[] = { "format", "title", "cache_budget", NULL };
static const char *const clip_keys[] = { "path", "label", "channel", "notes", NULL };
static const char *const cmp_keys[] = {
  "name", "stage",
  "a", "a_clip", "a_param_set", "a_options",
  "b", "b_clip", "b_param_set", "b_options",
  NULL
};

/* ---------------------------------------------------------------------------------------- */
/* Reading context: the parsed text plus line numbers for every group and key.              */

typedef struct
{
  const char *display;       /* file name for messages */
  GKeyFile *kf;
  GHashTable *group_lines;   /* group -> line (GINT_TO_POINTER) */
  GHashTable *key_lines;     /* "group\nkey" -> line */
  GPtrArray *groups;         /* group names in file order */
  int last_line;
  char *base_dir;            /* for relative clip paths */
} Reader;

static void
reader_clear (Reader *r)
{
  g_clear_pointer (&r->kf, g_key_file_unref);
  g_clear_pointer (&r->group_lines, g_hash_table_unref);
  g_clear_pointer (&r->key_lines, g_hash_table_unref);
  g_clear_pointer (&r->groups, g_ptr_array_unref);
  g_clear_pointer (&r->base_dir, g_free);
}

static int
group_line (Reader *r, const char *group)
{
  return GPOINTER_TO_INT (g_hash_table_lookup (r->group_lines, group));
}

static int
key_line (Reader *r, const char *group, const char *key)
{
  g_autofree char *k = g_strconcat (group, "\n", key, NULL);
  int line = GPOINTER_TO_INT (g_hash_table_lookup (r->key_lines, k));

  return line > 0 ? line : group_line (r, group);
}

static void
set_error_at (GError **error, FwProjectError code, Reader *r, int line, const char *format, ...)
  G_GNUC_PRINTF (5, 6);

static void
set_error_at (GError **error, FwProjectError code, Reader *r, int line, const char *format, ...)
{
  g_autofree char *msg = NULL;
  va_list ap;

  va_start (ap, format);
  msg = g_strdup_vprintf (format, ap);
  va_end (ap);
  if (line > 0)
    g_set_error (error, FW_PROJECT_ERROR, code, "%s:%d: %s", r->display, line, msg);
  else
    g_set_error (error, FW_PROJECT_ERROR, code, "%s: %s", r->display, msg);
}

static gboolean
str_in (const char *s, const char *const *list)
{
  for (guint i = 0; list[i] != NULL; i++)
    if (g_str_equal (s, list[i]))
      return TRUE;
  return FALSE;
}

/* Line-level scan: syntax, duplicate groups, duplicate keys. Records line numbers.
 * On a syntax error, *syntax_error is set but scanning goes on far enough to read the
 * header's format line (a newer format is reported before anything else). */
static void
scan_lines (Reader *r, const char *text, gsize length, GError **syntax_error,
            int *format_line_value, gboolean *have_format)
{
  const char *p = text;
  const char *end = text + length;
  int line = 0;
  g_autofree char *group = NULL;

  *have_format = FALSE;
  while (p < end)
    {
      const char *nl = memchr (p, '\n', (gsize) (end - p));
      const char *line_end = nl != NULL ? nl : end;
      g_autofree char *raw = g_strndup (p, (gsize) (line_end - p));
      char *s;

      line++;
      p = nl != NULL ? nl + 1 : end;
      r->last_line = line;

      s = g_strstrip (raw);
      if (*syntax_error != NULL)
        {
          /* After an error keep looking only for the header's format line. */
          if (group != NULL && g_str_equal (group, GROUP_HEADER) && g_str_has_prefix (s, "format"))
            {
              char *eq = strchr (s, '=');
              if (eq != NULL)
                {
                  char *endp = NULL;
                  gint64 v = g_ascii_strtoll (g_strstrip (eq + 1), &endp, 10);
                  if (endp != NULL && *endp == '\0' && !*have_format)
                    {
                      *have_format = TRUE;
                      *format_line_value = (int) CLAMP (v, G_MININT, G_MAXINT);
                    }
                }
            }
          if (*s == '[' && s[strlen (s) - 1] == ']')
            {
              g_free (group);
              group = g_strndup (s + 1, strlen (s) - 2);
            }
          continue;
        }

      if (*s == '\0' || *s == '#')
        continue;
      if (!g_utf8_validate (s, -1, NULL))
        {
          set_error_at (syntax_error, FW_PROJECT_ERROR_PARSE, r, line,
                        _("the line is not valid UTF-8 text"));
          continue;
        }
      if (*s == '[')
        {
          gsize n = strlen (s);

          if (n < 3 || s[n - 1] != ']')
            {
              set_error_at (syntax_error, FW_PROJECT_ERROR_PARSE, r, line,
                            _("“%s” is not a group header (expected “[name]”): is the file cut short?"),
                            s);
              continue;
            }
          g_free (group);
          group = g_strndup (s + 1, n - 2);
          if (strpbrk (group, "[]") != NULL)
            {
              set_error_at (syntax_error, FW_PROJECT_ERROR_PARSE, r, line,
                            _("“%s” is not a group header"), s);
              continue;
            }
          if (g_hash_table_contains (r->group_lines, group))
            {
              set_error_at (syntax_error, FW_PROJECT_ERROR_INVALID, r, line,
                            _("group [%s] appears twice (first on line %d)"), group,
                            group_line (r, group));
              continue;
            }
          g_hash_table_insert (r->group_lines, g_strdup (group), GINT_TO_POINTER (line));
          g_ptr_array_add (r->groups, g_strdup (group));
          continue;
        }
      {
        char *eq = strchr (s, '=');
        g_autofree char *key = NULL;
        g_autofree char *k = NULL;

        if (eq == NULL)
          {
            set_error_at (syntax_error, FW_PROJECT_ERROR_PARSE, r, line,
                          _("“%s” is neither a group header nor key=value: is the file cut short?"),
                          s);
            continue;
          }
        key = g_strndup (s, (gsize) (eq - s));
        g_strstrip (key);
        if (*key == '\0')
          {
            set_error_at (syntax_error, FW_PROJECT_ERROR_PARSE, r, line,
                          _("a value without a key"));
            continue;
          }
        if (group == NULL)
          {
            set_error_at (syntax_error, FW_PROJECT_ERROR_PARSE, r, line,
                          _("key “%s” comes before any group header"), key);
            continue;
          }
        if (g_str_equal (group, GROUP_HEADER) && g_str_equal (key, "format") && !*have_format)
          {
            char *endp = NULL;
            const char *v = g_strstrip (eq + 1);
            gint64 value = g_ascii_strtoll (v, &endp, 10);

            if (*v != '\0' && endp != NULL && *endp == '\0')
              {
                *have_format = TRUE;
                *format_line_value = (int) CLAMP (value, G_MININT, G_MAXINT);
              }
          }
        k = g_strconcat (group, "\n", key, NULL);
        if (g_hash_table_contains (r->key_lines, k))
          {
            set_error_at (syntax_error, FW_PROJECT_ERROR_INVALID, r, line,
                          _("[%s] key “%s” appears twice (first on line %d)"), group, key,
                          GPOINTER_TO_INT (g_hash_table_lookup (r->key_lines, k)));
            continue;
          }
        g_hash_table_insert (r->key_lines, g_steal_pointer (&k), GINT_TO_POINTER (line));
      }
    }
}

/* ---------------------------------------------------------------------------------------- */
/* Typed values                                                                             */

static char *
get_string (Reader *r, const char *group, const char *key, gboolean required, GError **error)
{
  g_autoptr (GError) local = NULL;
  char *value;

  if (!g_key_file_has_key (r->kf, group, key, NULL))
    {
      if (required)
        set_error_at (error, FW_PROJECT_ERROR_INVALID, r, group_line (r, group),
                      _("[%s] lacks the required key “%s”"), group, key);
      return required ? NULL : g_strdup ("");
    }
  value = g_key_file_get_string (r->kf, group, key, &local);
  if (value == NULL)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, key),
                    _("[%s] key “%s”: %s"), group, key, local->message);
      return NULL;
    }
  return value;
}

static gboolean
get_int64 (Reader *r, const char *group, const char *key, gint64 min, gint64 *out,
           GError **error)
{
  g_autofree char *raw = g_key_file_get_value (r->kf, group, key, NULL);
  char *endp = NULL;
  gint64 v;

  if (raw == NULL)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, group_line (r, group),
                    _("[%s] lacks the required key “%s”"), group, key);
      return FALSE;
    }
  g_strstrip (raw);
  errno = 0;
  v = g_ascii_strtoll (raw, &endp, 10);
  if (*raw == '\0' || endp == NULL || *endp != '\0' || errno != 0 || v < min)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, key),
                    _("[%s] key “%s”: “%s” is not a whole number >= %lld"),
                    group, key, raw, (long long) min);
      return FALSE;
    }
  *out = v;
  return TRUE;
}

static gboolean
check_keys (Reader *r, const char *group, const char *const *allowed, GError **error)
{
  g_auto (GStrv) keys = g_key_file_get_keys (r->kf, group, NULL, NULL);

  for (guint i = 0; keys != NULL && keys[i] != NULL; i++)
    if (!str_in (keys[i], allowed))
      {
        g_autofree char *list = g_strjoinv (", ", (char **) allowed);

        set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, keys[i]),
                      _("[%s] has an unknown key “%s” (known keys: %s)"), group, keys[i], list);
        return FALSE;
      }
  return TRUE;
}

static char *
resolve_path (Reader *r, const char *stored)
{
  if (g_path_is_absolute (stored))
    return g_canonicalize_filename (stored, NULL);
  return g_canonicalize_filename (stored, r->base_dir);
}

/* "params" | "mix" | 1, 2, ... */
static gboolean
parse_channel (const char *text, int *out)
{
  char *endp = NULL;
  gint64 v;

  if (g_str_equal (text, "params"))
    {
      *out = FW_CLIP_CHANNEL_FROM_PARAMS;
      return TRUE;
    }
  if (g_str_equal (text, "mix"))
    {
      *out = 0;
      return TRUE;
    }
  v = g_ascii_strtoll (text, &endp, 10);
  if (*text == '\0' || endp == NULL || *endp != '\0' || v < 1 || v > 4096)
    return FALSE;
  *out = (int) v;
  return TRUE;
}

static char *
format_channel (int channel)
{
  if (channel == FW_CLIP_CHANNEL_FROM_PARAMS)
    return g_strdup ("params");
  if (channel == 0)
    return g_strdup ("mix");
  return g_strdup_printf ("%d", channel);
}

/* ---------------------------------------------------------------------------------------- */
/* Groups                                                                                   */

static gboolean
read_header (Reader *r, FwProject *project, GError **error)
{
  g_autofree char *title = NULL;
  gint64 budget = (gint64) FW_PROJECT_DEFAULT_CACHE_BUDGET;

  if (!check_keys (r, GROUP_HEADER, header_keys, error))
    return FALSE;
  title = get_string (r, GROUP_HEADER, "title", FALSE, error);
  if (title == NULL)
    return FALSE;
  if (g_key_file_has_key (r->kf, GROUP_HEADER, "cache_budget", NULL)
      && !get_int64 (r, GROUP_HEADER, "cache_budget", 0, &budget, error))
    return FALSE;
  fw_project_set_title (project, title);
  fw_project_set_cache_budget (project, (guint64) budget);
  return TRUE;
}

static gboolean
read_clip (Reader *r, const char *group, FwProject *project, GError **error)
{
  g_autofree char *stored = NULL;
  g_autofree char *path = NULL;
  g_autofree char *label = NULL;
  g_autofree char *notes = NULL;
  g_autofree char *channel_text = NULL;
  g_autoptr (FwClip) clip = NULL;
  int channel = FW_CLIP_CHANNEL_FROM_PARAMS;
  FwClip *other;

  if (!check_keys (r, group, clip_keys, error))
    return FALSE;
  if ((stored = get_string (r, group, "path", TRUE, error)) == NULL)
    return FALSE;
  if (*stored == '\0')
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, "path"),
                    _("[%s] key “path” is empty"), group);
      return FALSE;
    }
  if ((label = get_string (r, group, "label", FALSE, error)) == NULL
      || (notes = get_string (r, group, "notes", FALSE, error)) == NULL)
    return FALSE;
  if (g_key_file_has_key (r->kf, group, "channel", NULL))
    {
      channel_text = g_key_file_get_value (r->kf, group, "channel", NULL);
      g_strstrip (channel_text);
      if (!parse_channel (channel_text, &channel))
        {
          set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, "channel"),
                        _("[%s] key “channel”: “%s” is not allowed (use params, mix or a "
                          "channel number from 1)"), group, channel_text);
          return FALSE;
        }
    }

  path = resolve_path (r, stored);
  other = fw_project_find_clip (project, path);
  if (other != NULL && g_strcmp0 (fw_clip_get_path (other), path) == 0)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, "path"),
                    _("[%s] “%s” is already in the project"), group, stored);
      return FALSE;
    }

  clip = fw_clip_new (path);   /* a missing file stays, flagged "missing" */
  fw_clip_set_label (clip, label);
  fw_clip_set_notes (clip, notes);
  fw_clip_set_channel (clip, channel);
  fw_project_add_clip (project, clip);
  return TRUE;
}

static gboolean
read_param_set (Reader *r, const char *group, FwProject *project, GError **error)
{
  g_auto (GStrv) keys = g_key_file_get_keys (r->kf, group, NULL, NULL);
  g_autoptr (GString) text = g_string_new ("[" FW_PARAMS_GROUP "]\n");
  g_autoptr (GError) local = NULL;
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwParamSet) set = NULL;
  g_autofree char *name = NULL;
  FwParamSet *other;

  if ((name = get_string (r, group, "name", TRUE, error)) == NULL)
    return FALSE;
  if (*name == '\0')
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, "name"),
                    _("[%s] key “name” is empty"), group);
      return FALSE;
    }
  other = fw_project_find_param_set (project, name);
  if (other != NULL)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, "name"),
                    _("[%s] a parameter set named “%s” already exists in this file"),
                    group, name);
      return FALSE;
    }

  for (guint i = 0; keys != NULL && keys[i] != NULL; i++)
    {
      g_autofree char *value = NULL;

      if (g_str_equal (keys[i], "name"))
        continue;
      if (!fw_params_is_key (keys[i]))
        {
          g_autofree char *list = g_strjoinv (", ", (char **) fw_params_keys ());

          set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, keys[i]),
                        _("[%s] has an unknown key “%s” (known keys: name, %s)"), group,
                        keys[i], list);
          return FALSE;
        }
      value = g_key_file_get_value (r->kf, group, keys[i], NULL);
      g_string_append_printf (text, "%s=%s\n", keys[i], value);
    }

  params = fw_params_new_from_text (text->str, (gssize) text->len, &local);
  if (params == NULL)
    {
      /* Find the key responsible, to name its line: try each key on its own. */
      g_autoptr (FwParams) base = fw_params_new_default ();

      for (guint i = 0; keys != NULL && keys[i] != NULL; i++)
        {
          g_autofree char *value = NULL;
          g_autoptr (GError) one = NULL;
          g_autoptr (FwParams) probe = NULL;

          if (g_str_equal (keys[i], "name"))
            continue;
          value = g_key_file_get_value (r->kf, group, keys[i], NULL);
          g_strstrip (value);
          probe = fw_params_with (base, keys[i], value, &one);
          if (probe == NULL && one != NULL
              && (g_error_matches (one, FW_PARAMS_ERROR, FW_PARAMS_ERROR_BAD_VALUE)
                  || g_error_matches (one, FW_PARAMS_ERROR, FW_PARAMS_ERROR_UNKNOWN_KEY)))
            {
              set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, keys[i]),
                            _("[%s] (“%s”): %s"), group, name, one->message);
              return FALSE;
            }
        }
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, group_line (r, group),
                    _("[%s] (“%s”): %s"), group, name, local->message);
      return FALSE;
    }

  set = fw_param_set_new (name, params);
  if (!fw_project_add_param_set (project, set, &local))
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, group_line (r, group), "[%s] %s",
                    group, local->message);
      return FALSE;
    }
  return TRUE;
}

static gboolean
read_operand (Reader *r, const char *group, FwComparison *cmp, guint side, GError **error)
{
  const char *letter = side == 0 ? "a" : "b";
  g_autofree char *kind_key = g_strdup (letter);
  g_autofree char *clip_key = g_strconcat (letter, "_clip", NULL);
  g_autofree char *set_key = g_strconcat (letter, "_param_set", NULL);
  g_autofree char *opt_key = g_strconcat (letter, "_options", NULL);
  g_autofree char *kind_text = NULL;
  g_autofree char *clip = NULL;
  g_autofree char *set = NULL;
  g_autofree char *options = NULL;
  g_autofree char *resolved = NULL;
  FwOperandKind kind;

  if ((kind_text = get_string (r, group, kind_key, TRUE, error)) == NULL)
    return FALSE;
  if (g_str_equal (kind_text, "clip"))
    kind = FW_OPERAND_CLIP;
  else if (g_str_equal (kind_text, "file"))
    kind = FW_OPERAND_FILE;
  else
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, kind_key),
                    _("[%s] key “%s”: “%s” is not allowed (use clip or file)"), group,
                    kind_key, kind_text);
      return FALSE;
    }
  if ((clip = get_string (r, group, clip_key, TRUE, error)) == NULL
      || (set = get_string (r, group, set_key, FALSE, error)) == NULL
      || (options = get_string (r, group, opt_key, FALSE, error)) == NULL)
    return FALSE;
  if (*clip == '\0')
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, clip_key),
                    _("[%s] key “%s” is empty"), group, clip_key);
      return FALSE;
    }
  if (kind == FW_OPERAND_CLIP && *set == '\0')
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, group_line (r, group),
                    _("[%s] operand %s is a clip but has no “%s”"), group, letter, set_key);
      return FALSE;
    }
  resolved = resolve_path (r, clip);
  fw_comparison_set_operand (cmp, side, kind, resolved, set, options);
  return TRUE;
}

static gboolean
read_comparison (Reader *r, const char *group, FwProject *project, GError **error)
{
  g_autofree char *name = NULL;
  g_autofree char *stage = NULL;
  g_autoptr (FwComparison) cmp = NULL;
  FwStage parsed;

  if (!check_keys (r, group, cmp_keys, error))
    return FALSE;
  if ((name = get_string (r, group, "name", FALSE, error)) == NULL
      || (stage = get_string (r, group, "stage", TRUE, error)) == NULL)
    return FALSE;
  if (!fw_stage_from_name (stage, &parsed))
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, r, key_line (r, group, "stage"),
                    _("[%s] key “stage”: “%s” is not a stage name"), group, stage);
      return FALSE;
    }
  cmp = fw_comparison_new (name, stage);
  if (!read_operand (r, group, cmp, 0, error) || !read_operand (r, group, cmp, 1, error))
    return FALSE;
  fw_project_add_comparison (project, cmp);
  return TRUE;
}

/* Upgrade steps: upgrades[v] turns a format-v key file into format v+1 in memory.
 * Format 1 is the first format, so there are none yet; a future format 2 adds
 * `upgrade_1_to_2` here and bumps FW_PROJECT_FORMAT_VERSION. */
typedef gboolean (*UpgradeFunc) (Reader *r, GError **error);
static const UpgradeFunc upgrades[FW_PROJECT_FORMAT_VERSION + 1] = { NULL };

static FwProject *
load_text (const char *data, gsize length, const char *path, GError **error)
{
  Reader r = { 0 };
  g_autoptr (GError) syntax = NULL;
  g_autoptr (GError) local = NULL;
  g_autoptr (FwProject) project = NULL;
  g_autofree char *display = NULL;
  int format = 0;
  gboolean have_format = FALSE;
  FwProject *result = NULL;

  display = path != NULL ? g_filename_display_name (path) : g_strdup (_("(project text)"));
  r.display = display;
  r.group_lines = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  r.key_lines = g_hash_table_new_full (g_str_hash, g_str_equal, g_free, NULL);
  r.groups = g_ptr_array_new_with_free_func (g_free);
  if (path != NULL)
    {
      g_autofree char *absolute = g_canonicalize_filename (path, NULL);
      r.base_dir = g_path_get_dirname (absolute);
    }
  else
    {
      r.base_dir = g_get_current_dir ();
    }

  if (length == 0)
    {
      set_error_at (error, FW_PROJECT_ERROR_PARSE, &r, 0, _("the file is empty"));
      goto out;
    }
  if (memchr (data, '\0', length) != NULL)
    {
      int line = 1;
      const char *nul = memchr (data, '\0', length);

      for (const char *q = data; q < nul; q++)
        line += *q == '\n';
      set_error_at (error, FW_PROJECT_ERROR_PARSE, &r, line,
                    _("the file contains a NUL byte: it is not a project file"));
      goto out;
    }

  scan_lines (&r, data, length, &syntax, &format, &have_format);

  /* The version decides before anything else: a newer file may use what we do not know. */
  if (have_format && format > FW_PROJECT_FORMAT_VERSION)
    {
      g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_NEWER_FORMAT,
                   _("%s was written by a newer Framewise (format %d; this build reads up to %d)"),
                   display, format, FW_PROJECT_FORMAT_VERSION);
      goto out;
    }
  if (syntax != NULL)
    {
      g_propagate_error (error, g_steal_pointer (&syntax));
      goto out;
    }
  if (r.groups->len == 0 || !g_str_equal (g_ptr_array_index (r.groups, 0), GROUP_HEADER))
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, &r, r.groups->len > 0
                    ? group_line (&r, g_ptr_array_index (r.groups, 0)) : 1,
                    _("not a Framewise project: the first group must be [%s]"), GROUP_HEADER);
      goto out;
    }
  if (!have_format)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, &r, group_line (&r, GROUP_HEADER),
                    _("[%s] lacks a valid “format” (a whole number)"), GROUP_HEADER);
      goto out;
    }
  if (format < 1)
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, &r, key_line (&r, GROUP_HEADER, "format"),
                    _("[%s] key “format”: %d is not a format version (1 to %d)"), GROUP_HEADER,
                    format, FW_PROJECT_FORMAT_VERSION);
      goto out;
    }
  if (g_hash_table_contains (r.group_lines, GROUP_END)
      && !g_str_equal (g_ptr_array_index (r.groups, r.groups->len - 1), GROUP_END))
    {
      set_error_at (error, FW_PROJECT_ERROR_INVALID, &r, group_line (&r, GROUP_END),
                    _("[%s] must be the last line of the file"), GROUP_END);
      goto out;
    }
  if (!g_str_equal (g_ptr_array_index (r.groups, r.groups->len - 1), GROUP_END))
    {
      set_error_at (error, FW_PROJECT_ERROR_PARSE, &r, r.last_line,
                    _("the file ends without its closing [%s] line: it was cut short or "
                      "damaged"), GROUP_END);
      goto out;
    }

  r.kf = g_key_file_new ();
  if (!g_key_file_load_from_data (r.kf, data, length, G_KEY_FILE_NONE, &local))
    {
      set_error_at (error, FW_PROJECT_ERROR_PARSE, &r, 0, "%s", local->message);
      goto out;
    }

  for (int v = format; v < FW_PROJECT_FORMAT_VERSION; v++)
    if (upgrades[v] != NULL && !upgrades[v] (&r, error))
      goto out;

  project = fw_project_new ();
  if (!read_header (&r, project, error))
    goto out;

  for (guint i = 1; i < r.groups->len; i++)
    {
      const char *group = g_ptr_array_index (r.groups, i);
      gboolean ok;

      if (g_str_equal (group, GROUP_END))
        {
          g_auto (GStrv) keys = g_key_file_get_keys (r.kf, group, NULL, NULL);

          if (i != r.groups->len - 1 || (keys != NULL && keys[0] != NULL))
            {
              set_error_at (error, FW_PROJECT_ERROR_INVALID, &r, group_line (&r, group),
                            _("[%s] must be the last line of the file"), GROUP_END);
              goto out;
            }
          continue;
        }
      if (g_str_has_prefix (group, PREFIX_CLIP))
        ok = read_clip (&r, group, project, error);
      else if (g_str_has_prefix (group, PREFIX_SET))
        ok = read_param_set (&r, group, project, error);
      else if (g_str_has_prefix (group, PREFIX_CMP))
        ok = read_comparison (&r, group, project, error);
      else
        {
          set_error_at (error, FW_PROJECT_ERROR_INVALID, &r, group_line (&r, group),
                        _("unknown group [%s] (known: [%s], [clip N], [parameter-set N], "
                          "[comparison N], [%s])"), group, GROUP_HEADER, GROUP_END);
          ok = FALSE;
        }
      if (!ok)
        goto out;
    }

  if (path != NULL)
    _fw_project_set_path (project, path);
  fw_project_mark_clean (project);
  result = g_steal_pointer (&project);

out:
  reader_clear (&r);
  return result;
}

FwProject *
fw_project_load_from_data (const char *data, gssize length, const char *path, GError **error)
{
  g_return_val_if_fail (data != NULL, NULL);
  g_return_val_if_fail (error == NULL || *error == NULL, NULL);

  return load_text (data, length < 0 ? strlen (data) : (gsize) length, path, error);
}

FwProject *
fw_project_load (const char *path, GError **error)
{
  g_autofree char *contents = NULL;
  g_autoptr (GError) local = NULL;
  gsize length = 0;

  g_return_val_if_fail (path != NULL, NULL);
  g_return_val_if_fail (error == NULL || *error == NULL, NULL);

  if (!g_file_get_contents (path, &contents, &length, &local))
    {
      g_autofree char *display = g_filename_display_name (path);

      g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_IO,
                   _("Could not open the project %s: %s"), display, local->message);
      return NULL;
    }
  return load_text (contents, length, path, error);
}

/* ---------------------------------------------------------------------------------------- */
/* Writing                                                                                  */

/* Relative to base_dir when the file lies inside it, else absolute. */
static char *
store_path (const char *path, const char *base_dir)
{
  g_autofree char *prefix = NULL;

  if (base_dir == NULL || path == NULL)
    return g_strdup (path != NULL ? path : "");
  prefix = g_str_has_suffix (base_dir, G_DIR_SEPARATOR_S) ? g_strdup (base_dir)
                                                          : g_strconcat (base_dir, G_DIR_SEPARATOR_S, NULL);
  if (g_str_has_prefix (path, prefix) && path[strlen (prefix)] != '\0')
    return g_strdup (path + strlen (prefix));
  return g_strdup (path);
}

char *
fw_project_to_data (FwProject *self, const char *path)
{
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_autofree char *base_dir = NULL;
  g_autofree char *budget = NULL;
  GListModel *model;
  guint n;

  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);

  if (path != NULL)
    {
      g_autofree char *absolute = g_canonicalize_filename (path, NULL);
      base_dir = g_path_get_dirname (absolute);
    }

  g_key_file_set_integer (kf, GROUP_HEADER, "format", FW_PROJECT_FORMAT_VERSION);
  g_key_file_set_comment (kf, GROUP_HEADER, NULL,
                          " Framewise project: clips, class labels, parameter sets, comparisons.\n"
                          " Plain text; the format is described in src/model/fw-project-file.c.\n"
                          " The file must end with the [end] line.", NULL);
  g_key_file_set_string (kf, GROUP_HEADER, "title", fw_project_get_title (self));
  budget = g_strdup_printf ("%" G_GUINT64_FORMAT, fw_project_get_cache_budget (self));
  g_key_file_set_value (kf, GROUP_HEADER, "cache_budget", budget);

  model = fw_project_get_clips (self);
  n = g_list_model_get_n_items (model);
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (model, i);
      g_autofree char *group = g_strdup_printf (PREFIX_CLIP "%u", i + 1);
      g_autofree char *stored = store_path (fw_clip_get_path (clip), base_dir);
      g_autofree char *channel = format_channel (fw_clip_get_channel (clip));

      g_key_file_set_string (kf, group, "path", stored);
      g_key_file_set_string (kf, group, "label", fw_clip_get_label (clip));
      g_key_file_set_value (kf, group, "channel", channel);
      g_key_file_set_string (kf, group, "notes", fw_clip_get_notes (clip));
    }

  model = fw_project_get_param_sets (self);
  n = g_list_model_get_n_items (model);
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (model, i);
      g_autofree char *group = g_strdup_printf (PREFIX_SET "%u", i + 1);
      FwParams *params = fw_param_set_get_params (set);
      const char *const *keys = fw_params_keys ();

      g_key_file_set_string (kf, group, "name", fw_param_set_get_name (set));
      for (guint k = 0; keys[k] != NULL; k++)
        {
          g_autofree char *value = fw_params_get_value (params, keys[k]);
          g_key_file_set_value (kf, group, keys[k], value != NULL ? value : "");
        }
    }

  model = fw_project_get_comparisons (self);
  n = g_list_model_get_n_items (model);
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (model, i);
      g_autofree char *group = g_strdup_printf (PREFIX_CMP "%u", i + 1);

      g_key_file_set_string (kf, group, "name", fw_comparison_get_name (cmp));
      g_key_file_set_string (kf, group, "stage", fw_comparison_get_stage (cmp));
      for (guint side = 0; side < 2; side++)
        {
          const char *letter = side == 0 ? "a" : "b";
          g_autofree char *k_clip = g_strconcat (letter, "_clip", NULL);
          g_autofree char *k_set = g_strconcat (letter, "_param_set", NULL);
          g_autofree char *k_opt = g_strconcat (letter, "_options", NULL);
          g_autofree char *stored = store_path (fw_comparison_get_clip (cmp, side), base_dir);
          gboolean is_clip = fw_comparison_get_kind (cmp, side) == FW_OPERAND_CLIP;

          g_key_file_set_value (kf, group, letter, is_clip ? "clip" : "file");
          g_key_file_set_string (kf, group, k_clip, stored);
          g_key_file_set_string (kf, group, k_set, fw_comparison_get_param_set (cmp, side));
          g_key_file_set_string (kf, group, k_opt, fw_comparison_get_options (cmp, side));
        }
    }

  {
    g_autofree char *body = g_key_file_to_data (kf, NULL, NULL);
    GString *text = g_string_new (body);

    /* GKeyFile cannot write an empty group; the closing line is appended by hand. */
    if (text->len > 0 && text->str[text->len - 1] != '\n')
      g_string_append_c (text, '\n');
    if (text->len > 1 && text->str[text->len - 2] != '\n')
      g_string_append_c (text, '\n');
    g_string_append (text, "[" GROUP_END "]\n");
    return g_string_free (text, FALSE);
  }
}

/* Duplicate names would make a file that does not load again: refuse to write it. */
static gboolean
check_unique_names (FwProject *self, const char *display, GError **error)
{
  GListModel *model = fw_project_get_param_sets (self);
  guint n = g_list_model_get_n_items (model);
  g_autoptr (GHashTable) seen = g_hash_table_new (g_str_hash, g_str_equal);

  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (model, i);
      const char *name = fw_param_set_get_name (set);

      if (name == NULL || *name == '\0' || !g_hash_table_add (seen, (gpointer) name))
        {
          g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_DUPLICATE,
                       _("Could not save %s: two parameter sets are named “%s”"), display,
                       name != NULL ? name : "");
          return FALSE;
        }
    }
  return TRUE;
}

gboolean
fw_project_save (FwProject *self, const char *path, GError **error)
{
  g_autofree char *absolute = NULL;
  g_autofree char *display = NULL;
  g_autofree char *text = NULL;
  g_autoptr (GFile) file = NULL;
  g_autoptr (GError) local = NULL;

  g_return_val_if_fail (FW_IS_PROJECT (self), FALSE);
  g_return_val_if_fail (path != NULL, FALSE);
  g_return_val_if_fail (error == NULL || *error == NULL, FALSE);

  absolute = g_canonicalize_filename (path, NULL);
  display = g_filename_display_name (absolute);
  if (!check_unique_names (self, display, error))
    return FALSE;

  text = fw_project_to_data (self, absolute);
  file = g_file_new_for_path (absolute);
  /* Temporary file + rename (atomic), and the old file kept as PATH~. */
  if (!g_file_replace_contents (file, text, strlen (text), NULL, TRUE, G_FILE_CREATE_NONE,
                                NULL, NULL, &local))
    {
      g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_IO,
                   _("Could not save the project to %s: %s"), display, local->message);
      return FALSE;
    }
  _fw_project_set_path (self, absolute);
  fw_project_mark_clean (self);
  return TRUE;
}

/* ---------------------------------------------------------------------------------------- */
/* The built-in demo                                                                        */

#define DEMO_FILE "demo.fwproj"

char *
fw_project_demo_path (void)
{
  g_autoptr (GPtrArray) candidates = g_ptr_array_new_with_free_func (g_free);
  const char *env = g_getenv ("FRAMEWISE_DATA_DIR");
  const char *const *system_dirs = g_get_system_data_dirs ();

  if (env != NULL && *env != '\0')
    {
      g_ptr_array_add (candidates, g_build_filename (env, "demo", DEMO_FILE, NULL));
      g_ptr_array_add (candidates, g_build_filename (env, DEMO_FILE, NULL));
    }
  g_ptr_array_add (candidates, g_build_filename (FW_SOURCE_DIR, "data", "demo", DEMO_FILE, NULL));
  {
    /* The install data dir is the parent of the locale dir (PREFIX/share/locale). */
    g_autofree char *datadir = g_path_get_dirname (FW_LOCALEDIR);
    g_ptr_array_add (candidates, g_build_filename (datadir, "framewise", "demo", DEMO_FILE, NULL));
  }
  for (guint i = 0; system_dirs[i] != NULL; i++)
    g_ptr_array_add (candidates, g_build_filename (system_dirs[i], "framewise", "demo",
                                                   DEMO_FILE, NULL));

  for (guint i = 0; i < candidates->len; i++)
    {
      const char *c = g_ptr_array_index (candidates, i);

      if (g_file_test (c, G_FILE_TEST_IS_REGULAR))
        return g_strdup (c);
    }
  return NULL;
}

FwProject *
fw_project_load_demo (GError **error)
{
  g_autofree char *path = fw_project_demo_path ();

  g_return_val_if_fail (error == NULL || *error == NULL, NULL);

  if (path == NULL)
    {
      g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_IO,
                   _("The built-in demo project (%s) was not found: set FRAMEWISE_DATA_DIR to "
                     "the folder that holds demo/%s, or reinstall Framewise"),
                   DEMO_FILE, DEMO_FILE);
      return NULL;
    }
  return fw_project_load (path, error);
}
