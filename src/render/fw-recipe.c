/* fw-recipe.c: the provenance recipe of exported figures (see fw-recipe.h). */
#include "fw-config.h"

#include "fw-recipe.h"

#include <string.h>

#include <glib/gi18n.h>

#include "fw-render-error.h"

FwRecipe *
fw_recipe_new (void)
{
  return g_new0 (FwRecipe, 1);
}

void
fw_recipe_free (FwRecipe *r)
{
  if (r == NULL)
    return;
  g_free (r->generator);
  g_free (r->clip);
  g_free (r->param_set);
  g_free (r->params_text);
  g_free (r->params_hash);
  g_strfreev (r->rows);
  g_free (r->frequency_scale);
  g_strfreev (r->colour_scales);
  g_free (r->spectrum);
  g_free (r);
}

static void
set_double (GKeyFile *kf, const char *key, double v)
{
  char buf[G_ASCII_DTOSTR_BUF_SIZE];
  g_key_file_set_value (kf, FW_RECIPE_GROUP, key, g_ascii_dtostr (buf, sizeof buf, v));
}

static void
set_list (GKeyFile *kf, const char *key, char **list)
{
  g_autofree char *joined = g_strjoinv (";", list ? list : (char *[]) { NULL });
  g_key_file_set_string (kf, FW_RECIPE_GROUP, key, joined);
}

char *
fw_recipe_to_text (const FwRecipe *r)
{
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_autofree char *head = NULL;
  GString *out;

  g_key_file_set_integer (kf, FW_RECIPE_GROUP, "format", FW_RECIPE_FORMAT);
  g_key_file_set_string (kf, FW_RECIPE_GROUP, "generator", r->generator ? r->generator : "");
  g_key_file_set_string (kf, FW_RECIPE_GROUP, "clip", r->clip ? r->clip : "");
  if (r->param_set)
    g_key_file_set_string (kf, FW_RECIPE_GROUP, "parameter_set", r->param_set);
  g_key_file_set_string (kf, FW_RECIPE_GROUP, "parameters_hash",
                         r->params_hash ? r->params_hash : "");
  set_double (kf, "analysis_rate", r->analysis_rate);
  set_list (kf, "rows", r->rows);
  set_double (kf, "start", r->start);
  set_double (kf, "end", r->end);
  g_key_file_set_string (kf, FW_RECIPE_GROUP, "frequency_scale",
                         r->frequency_scale ? r->frequency_scale : "linear");
  set_list (kf, "colour_scales", r->colour_scales);
  g_key_file_set_string (kf, FW_RECIPE_GROUP, "spectrum", r->spectrum ? r->spectrum : "none");

  head = g_key_file_to_data (kf, NULL, NULL);
  out = g_string_new (head);
  if (out->len > 0 && out->str[out->len - 1] != '\n')
    g_string_append_c (out, '\n');
  g_string_append_c (out, '\n');
  if (r->params_text)
    g_string_append (out, r->params_text);
  return g_string_free (out, FALSE);
}

static gboolean
get_double (GKeyFile *kf, const char *key, double *out, GError **error)
{
  g_autofree char *v = g_key_file_get_value (kf, FW_RECIPE_GROUP, key, NULL);
  char *end = NULL;

  if (v == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: key \"%s\" is missing"), key);
      return FALSE;
    }
  *out = g_ascii_strtod (v, &end);
  if (end == v || *end != '\0')
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: key \"%s\" has value \"%s\", expected a number"), key, v);
      return FALSE;
    }
  return TRUE;
}

static char **
get_list (GKeyFile *kf, const char *key)
{
  g_autofree char *v = g_key_file_get_string (kf, FW_RECIPE_GROUP, key, NULL);
  if (v == NULL || *v == '\0')
    return g_new0 (char *, 1);
  return g_strsplit (v, ";", -1);
}

FwRecipe *
fw_recipe_parse (const char *text, gssize length, GError **error)
{
  g_autoptr (FwRecipe) r = fw_recipe_new ();
  g_autoptr (GKeyFile) kf = g_key_file_new ();
  g_autofree char *copy = NULL;
  g_autoptr (GError) local = NULL;
  const char *params;
  static const char marker[] = "[" FW_PARAMS_GROUP "]";
  int format;

  if (text == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE, _("Recipe: empty"));
      return NULL;
    }
  copy = length < 0 ? g_strdup (text) : g_strndup (text, (gsize) length);

  /* the parameter group starts at a line "[framewise-parameters]" and runs to the end */
  params = NULL;
  for (const char *p = copy; (p = strstr (p, marker)) != NULL; p += 1)
    if (p == copy || p[-1] == '\n')
      {
        params = p;
        break;
      }
  if (params == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: no [%s] group"), FW_PARAMS_GROUP);
      return NULL;
    }
  r->params_text = g_strdup (params);

  if (!g_key_file_load_from_data (kf, copy, (gsize) (params - copy), G_KEY_FILE_NONE, &local))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE, _("Recipe: %s"),
                   local->message);
      return NULL;
    }
  if (!g_key_file_has_group (kf, FW_RECIPE_GROUP))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: no [%s] group"), FW_RECIPE_GROUP);
      return NULL;
    }
  format = g_key_file_get_integer (kf, FW_RECIPE_GROUP, "format", &local);
  if (local != NULL || format < 1)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: key \"format\" is missing or not a positive integer"));
      return NULL;
    }
  if (format > FW_RECIPE_FORMAT)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: format %d was written by a newer Framewise (this one reads %d)"),
                   format, FW_RECIPE_FORMAT);
      return NULL;
    }
  r->generator = g_key_file_get_string (kf, FW_RECIPE_GROUP, "generator", NULL);
  r->clip = g_key_file_get_string (kf, FW_RECIPE_GROUP, "clip", NULL);
  r->param_set = g_key_file_get_string (kf, FW_RECIPE_GROUP, "parameter_set", NULL);
  r->params_hash = g_key_file_get_string (kf, FW_RECIPE_GROUP, "parameters_hash", NULL);
  if (r->params_hash == NULL || *r->params_hash == '\0')
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: key \"%s\" is missing"), "parameters_hash");
      return NULL;
    }
  if (!get_double (kf, "analysis_rate", &r->analysis_rate, error)
      || !get_double (kf, "start", &r->start, error)
      || !get_double (kf, "end", &r->end, error))
    return NULL;
  r->rows = get_list (kf, "rows");
  r->colour_scales = get_list (kf, "colour_scales");
  r->frequency_scale = g_key_file_get_string (kf, FW_RECIPE_GROUP, "frequency_scale", NULL);
  r->spectrum = g_key_file_get_string (kf, FW_RECIPE_GROUP, "spectrum", NULL);
  return g_steal_pointer (&r);
}

FwParams *
fw_recipe_dup_params (const FwRecipe *recipe, GError **error)
{
  g_autoptr (GError) local = NULL;
  FwParams *params = fw_params_new_from_text (recipe->params_text, -1, &local);

  if (params == NULL)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: the embedded parameters do not parse: %s"), local->message);
      return NULL;
    }
  if (g_strcmp0 (fw_params_get_hash (params), recipe->params_hash) != 0)
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_BAD_RECIPE,
                   _("Recipe: the embedded parameters hash to %s, but the figure records %s"),
                   fw_params_get_hash (params), recipe->params_hash);
      fw_params_unref (params);
      return NULL;
    }
  return params;
}
