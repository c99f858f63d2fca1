/* fw-project.c: the document: clips, named parameter sets, saved comparisons, settings.
 *
 * Every change to the document goes through one place (project_changed), which marks the
 * project dirty and emits "changed". The project watches its clips and parameter sets
 * (label, notes, channel, path; name, params) so edits made directly on them count too.
 * Renaming a set or relinking a clip updates the saved comparisons that refer to them, so
 * nothing is left pointing at an old name. The file format lives in fw-project-file.c.
 */
#include "fw-config.h"

#include <glib/gi18n.h>

#include "fw-feature-cache.h"
#include "fw-project-private.h"
#include "fw-project.h"

G_DEFINE_QUARK (fw-project-error-quark, fw_project_error)

/* ---------------------------------------------------------------------------------------- */
/* FwComparison                                                                             */

typedef struct
{
  FwOperandKind kind;
  char *clip;
  char *param_set;
  char *options;
} Operand;

struct _FwComparison
{
  GObject parent_instance;

  char *name;
  char *stage;
  Operand operand[2];
};

G_DEFINE_FINAL_TYPE (FwComparison, fw_comparison, G_TYPE_OBJECT)

enum {
  CMP_PROP_0,
  CMP_PROP_NAME,
  CMP_PROP_STAGE,
  CMP_N_PROPS
};

enum {
  CMP_CHANGED,
  CMP_N_SIGNALS
};

static GParamSpec *cmp_properties[CMP_N_PROPS];
static guint cmp_signals[CMP_N_SIGNALS];

static void
operand_clear (Operand *op)
{
  g_clear_pointer (&op->clip, g_free);
  g_clear_pointer (&op->param_set, g_free);
  g_clear_pointer (&op->options, g_free);
}

static void
fw_comparison_finalize (GObject *object)
{
  FwComparison *self = FW_COMPARISON (object);

  g_clear_pointer (&self->name, g_free);
  g_clear_pointer (&self->stage, g_free);
  operand_clear (&self->operand[0]);
  operand_clear (&self->operand[1]);

  G_OBJECT_CLASS (fw_comparison_parent_class)->finalize (object);
}

static void
fw_comparison_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  FwComparison *self = FW_COMPARISON (object);

  switch (prop_id)
    {
    case CMP_PROP_NAME:
      g_value_set_string (value, self->name);
      break;
    case CMP_PROP_STAGE:
      g_value_set_string (value, self->stage);
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_comparison_set_property (GObject *object, guint prop_id, const GValue *value,
                            GParamSpec *pspec)
{
  FwComparison *self = FW_COMPARISON (object);

  switch (prop_id)
    {
    case CMP_PROP_NAME:
      g_free (self->name);
      self->name = g_value_dup_string (value);
      break;
    case CMP_PROP_STAGE:
      g_free (self->stage);
      self->stage = g_value_dup_string (value);
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_comparison_class_init (FwComparisonClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->finalize = fw_comparison_finalize;
  object_class->get_property = fw_comparison_get_property;
  object_class->set_property = fw_comparison_set_property;

  cmp_properties[CMP_PROP_NAME] =
    g_param_spec_string ("name", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_CONSTRUCT_ONLY | G_PARAM_STATIC_STRINGS);
  cmp_properties[CMP_PROP_STAGE] =
    g_param_spec_string ("stage", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_CONSTRUCT_ONLY | G_PARAM_STATIC_STRINGS);
  g_object_class_install_properties (object_class, CMP_N_PROPS, cmp_properties);

  /* Emitted when an operand changes. */
  cmp_signals[CMP_CHANGED] =
    g_signal_new ("changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 0);
}

static void
fw_comparison_init (FwComparison *self)
{
  for (guint i = 0; i < 2; i++)
    {
      self->operand[i].kind = FW_OPERAND_CLIP;
      self->operand[i].clip = g_strdup ("");
      self->operand[i].param_set = g_strdup ("");
      self->operand[i].options = g_strdup ("");
    }
}

FwComparison *
fw_comparison_new (const char *name, const char *stage)
{
  g_return_val_if_fail (name != NULL, NULL);
  g_return_val_if_fail (stage != NULL, NULL);

  return g_object_new (FW_TYPE_COMPARISON, "name", name, "stage", stage, NULL);
}

const char *
fw_comparison_get_name (FwComparison *self)
{
  g_return_val_if_fail (FW_IS_COMPARISON (self), NULL);
  return self->name;
}

const char *
fw_comparison_get_stage (FwComparison *self)
{
  g_return_val_if_fail (FW_IS_COMPARISON (self), NULL);
  return self->stage;
}

static gboolean
replace_string (char **slot, const char *value)
{
  if (value == NULL)
    value = "";
  if (g_strcmp0 (*slot, value) == 0)
    return FALSE;
  g_free (*slot);
  *slot = g_strdup (value);
  return TRUE;
}

void
fw_comparison_set_operand (FwComparison *self, guint side, FwOperandKind kind,
                           const char *clip, const char *param_set, const char *options)
{
  Operand *op;
  gboolean changed = FALSE;

  g_return_if_fail (FW_IS_COMPARISON (self));
  g_return_if_fail (side < 2);
  g_return_if_fail (kind == FW_OPERAND_CLIP || kind == FW_OPERAND_FILE);

  op = &self->operand[side];
  if (op->kind != kind)
    {
      op->kind = kind;
      changed = TRUE;
    }
  changed |= replace_string (&op->clip, clip);
  changed |= replace_string (&op->param_set, param_set);
  changed |= replace_string (&op->options, options);
  if (changed)
    g_signal_emit (self, cmp_signals[CMP_CHANGED], 0);
}

FwOperandKind
fw_comparison_get_kind (FwComparison *self, guint side)
{
  g_return_val_if_fail (FW_IS_COMPARISON (self), FW_OPERAND_CLIP);
  g_return_val_if_fail (side < 2, FW_OPERAND_CLIP);
  return self->operand[side].kind;
}

const char *
fw_comparison_get_clip (FwComparison *self, guint side)
{
  g_return_val_if_fail (FW_IS_COMPARISON (self), NULL);
  g_return_val_if_fail (side < 2, NULL);
  return self->operand[side].clip;
}

const char *
fw_comparison_get_param_set (FwComparison *self, guint side)
{
  g_return_val_if_fail (FW_IS_COMPARISON (self), NULL);
  g_return_val_if_fail (side < 2, NULL);
  return self->operand[side].param_set;
}

const char *
fw_comparison_get_options (FwComparison *self, guint side)
{
  g_return_val_if_fail (FW_IS_COMPARISON (self), NULL);
  g_return_val_if_fail (side < 2, NULL);
  return self->operand[side].options;
}

/* ---------------------------------------------------------------------------------------- */
/* FwProject                                                                                */

struct _FwProject
{
  GObject parent_instance;

  GListStore *clips;
  GListStore *param_sets;
  GListStore *comparisons;

  char *path;
  char *title;
  guint64 cache_budget;
  gboolean dirty;

  /* What we last saw of each clip / set, to follow renames and relinks. */
  GHashTable *clip_paths;   /* FwClip* -> char* */
  GHashTable *set_names;    /* FwParamSet* -> char* */
  GHashTable *set_hashes;   /* FwParamSet* -> char* */

  FwFeatureCache *cache;
};

G_DEFINE_FINAL_TYPE (FwProject, fw_project, G_TYPE_OBJECT)

enum {
  PROP_0,
  PROP_PATH,
  PROP_DIRTY,
  PROP_CACHE_BUDGET,
  PROP_TITLE,
  N_PROPS
};

enum {
  CHANGED,
  N_SIGNALS
};

static GParamSpec *properties[N_PROPS];
static guint signals[N_SIGNALS];

static void
project_changed (FwProject *self)
{
  if (!self->dirty)
    {
      self->dirty = TRUE;
      g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_DIRTY]);
    }
  g_signal_emit (self, signals[CHANGED], 0);
}

static gboolean
store_find (GListStore *store, gpointer item, guint *position)
{
  return g_list_store_find (store, item, position);
}

static void
fw_project_dispose (GObject *object)
{
  FwProject *self = FW_PROJECT (object);
  guint n;

  n = g_list_model_get_n_items (G_LIST_MODEL (self->clips));
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (G_LIST_MODEL (self->clips), i);
      g_signal_handlers_disconnect_by_data (clip, self);
    }
  n = g_list_model_get_n_items (G_LIST_MODEL (self->param_sets));
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (G_LIST_MODEL (self->param_sets), i);
      g_signal_handlers_disconnect_by_data (set, self);
    }
  n = g_list_model_get_n_items (G_LIST_MODEL (self->comparisons));
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (G_LIST_MODEL (self->comparisons), i);
      g_signal_handlers_disconnect_by_data (cmp, self);
    }

  g_clear_object (&self->cache);
  if (self->clips != NULL)
    g_list_store_remove_all (self->clips);
  if (self->param_sets != NULL)
    g_list_store_remove_all (self->param_sets);
  if (self->comparisons != NULL)
    g_list_store_remove_all (self->comparisons);
  g_hash_table_remove_all (self->clip_paths);
  g_hash_table_remove_all (self->set_names);
  g_hash_table_remove_all (self->set_hashes);

  G_OBJECT_CLASS (fw_project_parent_class)->dispose (object);
}

static void
fw_project_finalize (GObject *object)
{
  FwProject *self = FW_PROJECT (object);

  g_clear_object (&self->clips);
  g_clear_object (&self->param_sets);
  g_clear_object (&self->comparisons);
  g_clear_pointer (&self->clip_paths, g_hash_table_unref);
  g_clear_pointer (&self->set_names, g_hash_table_unref);
  g_clear_pointer (&self->set_hashes, g_hash_table_unref);
  g_clear_pointer (&self->path, g_free);
  g_clear_pointer (&self->title, g_free);

  G_OBJECT_CLASS (fw_project_parent_class)->finalize (object);
}

static void
fw_project_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  FwProject *self = FW_PROJECT (object);

  switch (prop_id)
    {
    case PROP_PATH:
      g_value_set_string (value, self->path);
      break;
    case PROP_DIRTY:
      g_value_set_boolean (value, self->dirty);
      break;
    case PROP_CACHE_BUDGET:
      g_value_set_uint64 (value, self->cache_budget);
      break;
    case PROP_TITLE:
      g_value_set_string (value, self->title);
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_project_set_property (GObject *object, guint prop_id, const GValue *value,
                         GParamSpec *pspec)
{
  FwProject *self = FW_PROJECT (object);

  switch (prop_id)
    {
    case PROP_CACHE_BUDGET:
      fw_project_set_cache_budget (self, g_value_get_uint64 (value));
      break;
    case PROP_TITLE:
      fw_project_set_title (self, g_value_get_string (value));
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_project_class_init (FwProjectClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->dispose = fw_project_dispose;
  object_class->finalize = fw_project_finalize;
  object_class->get_property = fw_project_get_property;
  object_class->set_property = fw_project_set_property;

  properties[PROP_PATH] =
    g_param_spec_string ("path", NULL, NULL, NULL,
                         G_PARAM_READABLE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_DIRTY] =
    g_param_spec_boolean ("dirty", NULL, NULL, FALSE,
                          G_PARAM_READABLE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_CACHE_BUDGET] =
    g_param_spec_uint64 ("cache-budget", NULL, NULL, 0, G_MAXUINT64,
                         FW_PROJECT_DEFAULT_CACHE_BUDGET,
                         G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_TITLE] =
    g_param_spec_string ("title", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  g_object_class_install_properties (object_class, N_PROPS, properties);

  /* Any change to the document (clips, labels, sets, parameters, comparisons, settings). */
  signals[CHANGED] =
    g_signal_new ("changed", G_TYPE_FROM_CLASS (klass), G_SIGNAL_RUN_LAST, 0, NULL, NULL,
                  NULL, G_TYPE_NONE, 0);
}

static void
fw_project_init (FwProject *self)
{
  self->clips = g_list_store_new (FW_TYPE_CLIP);
  self->param_sets = g_list_store_new (FW_TYPE_PARAM_SET);
  self->comparisons = g_list_store_new (FW_TYPE_COMPARISON);
  self->clip_paths = g_hash_table_new_full (NULL, NULL, NULL, g_free);
  self->set_names = g_hash_table_new_full (NULL, NULL, NULL, g_free);
  self->set_hashes = g_hash_table_new_full (NULL, NULL, NULL, g_free);
  self->title = g_strdup ("");
  self->cache_budget = FW_PROJECT_DEFAULT_CACHE_BUDGET;
}

FwProject *
fw_project_new (void)
{
  return g_object_new (FW_TYPE_PROJECT, NULL);
}

GListModel *
fw_project_get_clips (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  return G_LIST_MODEL (self->clips);
}

GListModel *
fw_project_get_param_sets (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  return G_LIST_MODEL (self->param_sets);
}

GListModel *
fw_project_get_comparisons (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  return G_LIST_MODEL (self->comparisons);
}

/* Rewrites comparison operands that name `old` (a clip path or a set name) to `new`. */
static void
rewrite_comparisons (FwProject *self, gboolean clip_field, const char *old, const char *new)
{
  guint n = g_list_model_get_n_items (G_LIST_MODEL (self->comparisons));

  if (old == NULL || new == NULL || g_strcmp0 (old, new) == 0)
    return;
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwComparison) cmp = g_list_model_get_item (G_LIST_MODEL (self->comparisons), i);

      for (guint side = 0; side < 2; side++)
        {
          if (fw_comparison_get_kind (cmp, side) != FW_OPERAND_CLIP)
            continue;
          if (clip_field && g_strcmp0 (fw_comparison_get_clip (cmp, side), old) == 0)
            fw_comparison_set_operand (cmp, side, FW_OPERAND_CLIP, new,
                                       fw_comparison_get_param_set (cmp, side),
                                       fw_comparison_get_options (cmp, side));
          else if (!clip_field && g_strcmp0 (fw_comparison_get_param_set (cmp, side), old) == 0)
            fw_comparison_set_operand (cmp, side, FW_OPERAND_CLIP,
                                       fw_comparison_get_clip (cmp, side), new,
                                       fw_comparison_get_options (cmp, side));
        }
    }
}

static void
on_clip_notify (FwClip *clip, GParamSpec *pspec, FwProject *self)
{
  const char *name = g_param_spec_get_name (pspec);

  if (g_str_equal (name, "path"))
    {
      const char *old = g_hash_table_lookup (self->clip_paths, clip);
      g_autofree char *old_copy = g_strdup (old);

      g_hash_table_insert (self->clip_paths, clip, g_strdup (fw_clip_get_path (clip)));
      rewrite_comparisons (self, TRUE, old_copy, fw_clip_get_path (clip));
      if (self->cache != NULL)
        fw_feature_cache_invalidate_clip (self->cache, clip);
      project_changed (self);
    }
  else if (g_str_equal (name, "label") || g_str_equal (name, "notes")
           || g_str_equal (name, "channel"))
    {
      project_changed (self);
    }
  /* "missing" and "display-name" describe the file, not the document. */
}

/* TRUE when some set of the project other than `except` has this parameter hash. */
static gboolean
hash_in_use (FwProject *self, const char *hash, FwParamSet *except)
{
  guint n = g_list_model_get_n_items (G_LIST_MODEL (self->param_sets));

  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (G_LIST_MODEL (self->param_sets), i);

      if (set != except && g_str_equal (fw_params_get_hash (fw_param_set_get_params (set)), hash))
        return TRUE;
    }
  return FALSE;
}

static void
on_param_set_notify (FwParamSet *set, GParamSpec *pspec, FwProject *self)
{
  const char *name = g_param_spec_get_name (pspec);

  if (g_str_equal (name, "name"))
    {
      g_autofree char *old = g_strdup (g_hash_table_lookup (self->set_names, set));

      g_hash_table_insert (self->set_names, set, g_strdup (fw_param_set_get_name (set)));
      rewrite_comparisons (self, FALSE, old, fw_param_set_get_name (set));
      project_changed (self);
    }
  else if (g_str_equal (name, "params"))
    {
      g_autofree char *old = g_strdup (g_hash_table_lookup (self->set_hashes, set));
      const char *hash = fw_params_get_hash (fw_param_set_get_params (set));

      g_hash_table_insert (self->set_hashes, set, g_strdup (hash));
      /* A change of parameters stops only the work that depends on the old value; other
       * sets' jobs keep running, and finished entries stay for the LRU to age out. */
      if (self->cache != NULL && old != NULL && !hash_in_use (self, old, NULL))
        fw_feature_cache_cancel_params (self->cache, old);
      project_changed (self);
    }
}

static void
on_comparison_changed (FwComparison *cmp, FwProject *self)
{
  project_changed (self);
}

void
fw_project_add_clip (FwProject *self, FwClip *clip)
{
  g_return_if_fail (FW_IS_PROJECT (self));
  g_return_if_fail (FW_IS_CLIP (clip));

  if (store_find (self->clips, clip, NULL))
    return;
  g_hash_table_insert (self->clip_paths, clip, g_strdup (fw_clip_get_path (clip)));
  g_signal_connect_object (clip, "notify", G_CALLBACK (on_clip_notify), self, 0);
  g_list_store_append (self->clips, clip);
  project_changed (self);
}

void
fw_project_remove_clip (FwProject *self, FwClip *clip)
{
  guint position;

  g_return_if_fail (FW_IS_PROJECT (self));
  g_return_if_fail (FW_IS_CLIP (clip));

  if (!store_find (self->clips, clip, &position))
    return;
  g_signal_handlers_disconnect_by_data (clip, self);
  g_hash_table_remove (self->clip_paths, clip);
  if (self->cache != NULL)
    fw_feature_cache_invalidate_clip (self->cache, clip);
  g_list_store_remove (self->clips, position);
  project_changed (self);
}

FwClip *
fw_project_find_clip (FwProject *self, const char *path_or_name)
{
  g_autofree char *absolute = NULL;
  GListModel *model;
  guint n;

  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  g_return_val_if_fail (path_or_name != NULL, NULL);

  model = G_LIST_MODEL (self->clips);
  n = g_list_model_get_n_items (model);
  absolute = g_canonicalize_filename (path_or_name, NULL);

  /* Exact path first, then the display name (basename). */
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (model, i);

      if (g_strcmp0 (fw_clip_get_path (clip), path_or_name) == 0
          || g_strcmp0 (fw_clip_get_path (clip), absolute) == 0)
        return clip;
    }
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwClip) clip = g_list_model_get_item (model, i);

      if (g_strcmp0 (fw_clip_get_display_name (clip), path_or_name) == 0)
        return clip;
    }
  return NULL;
}

FwParamSet *
fw_project_find_param_set (FwProject *self, const char *name)
{
  GListModel *model;
  guint n;

  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  g_return_val_if_fail (name != NULL, NULL);

  model = G_LIST_MODEL (self->param_sets);
  n = g_list_model_get_n_items (model);
  for (guint i = 0; i < n; i++)
    {
      g_autoptr (FwParamSet) set = g_list_model_get_item (model, i);

      if (g_strcmp0 (fw_param_set_get_name (set), name) == 0)
        return set;
    }
  return NULL;
}

gboolean
fw_project_add_param_set (FwProject *self, FwParamSet *set, GError **error)
{
  const char *name;

  g_return_val_if_fail (FW_IS_PROJECT (self), FALSE);
  g_return_val_if_fail (FW_IS_PARAM_SET (set), FALSE);
  g_return_val_if_fail (error == NULL || *error == NULL, FALSE);

  name = fw_param_set_get_name (set);
  if (store_find (self->param_sets, set, NULL))
    return TRUE;
  if (name == NULL || *name == '\0')
    {
      g_set_error_literal (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_INVALID,
                           _("A parameter set needs a name"));
      return FALSE;
    }
  if (fw_project_find_param_set (self, name) != NULL)
    {
      g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_DUPLICATE,
                   _("The project already has a parameter set named “%s”"), name);
      return FALSE;
    }

  g_hash_table_insert (self->set_names, set, g_strdup (name));
  g_hash_table_insert (self->set_hashes, set,
                       g_strdup (fw_params_get_hash (fw_param_set_get_params (set))));
  g_signal_connect_object (set, "notify", G_CALLBACK (on_param_set_notify), self, 0);
  g_list_store_append (self->param_sets, set);
  project_changed (self);
  return TRUE;
}

void
fw_project_remove_param_set (FwProject *self, FwParamSet *set)
{
  guint position;
  g_autofree char *hash = NULL;

  g_return_if_fail (FW_IS_PROJECT (self));
  g_return_if_fail (FW_IS_PARAM_SET (set));

  if (!store_find (self->param_sets, set, &position))
    return;
  g_signal_handlers_disconnect_by_data (set, self);
  g_hash_table_remove (self->set_names, set);
  g_hash_table_remove (self->set_hashes, set);
  hash = g_strdup (fw_params_get_hash (fw_param_set_get_params (set)));
  g_list_store_remove (self->param_sets, position);
  if (self->cache != NULL && !hash_in_use (self, hash, NULL))
    fw_feature_cache_invalidate_params (self->cache, hash);
  project_changed (self);
}

gboolean
fw_project_rename_param_set (FwProject *self, FwParamSet *set, const char *name,
                             GError **error)
{
  FwParamSet *other;

  g_return_val_if_fail (FW_IS_PROJECT (self), FALSE);
  g_return_val_if_fail (FW_IS_PARAM_SET (set), FALSE);
  g_return_val_if_fail (name != NULL, FALSE);
  g_return_val_if_fail (error == NULL || *error == NULL, FALSE);

  if (*name == '\0')
    {
      g_set_error_literal (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_INVALID,
                           _("A parameter set needs a name"));
      return FALSE;
    }
  other = fw_project_find_param_set (self, name);
  if (other != NULL && other != set)
    {
      g_set_error (error, FW_PROJECT_ERROR, FW_PROJECT_ERROR_DUPLICATE,
                   _("The project already has a parameter set named “%s”"), name);
      return FALSE;
    }
  fw_param_set_set_name (set, name);   /* notify -> on_param_set_notify -> changed */
  return TRUE;
}

char *
fw_project_unique_param_set_name (FwProject *self, const char *base)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  g_return_val_if_fail (base != NULL, NULL);

  if (*base != '\0' && fw_project_find_param_set (self, base) == NULL)
    return g_strdup (base);
  for (guint i = 2;; i++)
    {
      char *candidate = *base != '\0' ? g_strdup_printf ("%s %u", base, i)
                                      : g_strdup_printf ("%u", i);

      if (fw_project_find_param_set (self, candidate) == NULL)
        return candidate;
      g_free (candidate);
    }
}

void
fw_project_add_comparison (FwProject *self, FwComparison *cmp)
{
  g_return_if_fail (FW_IS_PROJECT (self));
  g_return_if_fail (FW_IS_COMPARISON (cmp));

  if (store_find (self->comparisons, cmp, NULL))
    return;
  g_signal_connect_object (cmp, "changed", G_CALLBACK (on_comparison_changed), self, 0);
  g_list_store_append (self->comparisons, cmp);
  project_changed (self);
}

void
fw_project_remove_comparison (FwProject *self, FwComparison *cmp)
{
  guint position;

  g_return_if_fail (FW_IS_PROJECT (self));
  g_return_if_fail (FW_IS_COMPARISON (cmp));

  if (!store_find (self->comparisons, cmp, &position))
    return;
  g_signal_handlers_disconnect_by_data (cmp, self);
  g_list_store_remove (self->comparisons, position);
  project_changed (self);
}

const char *
fw_project_get_path (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  return self->path;
}

void
_fw_project_set_path (FwProject *self, const char *path)
{
  g_autofree char *absolute = NULL;

  g_return_if_fail (FW_IS_PROJECT (self));

  if (path != NULL)
    absolute = g_canonicalize_filename (path, NULL);
  if (g_strcmp0 (self->path, absolute) == 0)
    return;
  g_free (self->path);
  self->path = g_steal_pointer (&absolute);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_PATH]);
}

gboolean
fw_project_get_dirty (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), FALSE);
  return self->dirty;
}

void
fw_project_mark_clean (FwProject *self)
{
  g_return_if_fail (FW_IS_PROJECT (self));

  if (!self->dirty)
    return;
  self->dirty = FALSE;
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_DIRTY]);
}

guint64
fw_project_get_cache_budget (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), 0);
  return self->cache_budget;
}

void
fw_project_set_cache_budget (FwProject *self, guint64 bytes)
{
  g_return_if_fail (FW_IS_PROJECT (self));

  if (self->cache_budget == bytes)
    return;
  self->cache_budget = bytes;
  if (self->cache != NULL)
    fw_feature_cache_set_budget (self->cache, bytes);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_CACHE_BUDGET]);
  project_changed (self);
}

const char *
fw_project_get_title (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);
  return self->title;
}

void
fw_project_set_title (FwProject *self, const char *title)
{
  g_return_if_fail (FW_IS_PROJECT (self));

  if (title == NULL)
    title = "";
  if (g_strcmp0 (self->title, title) == 0)
    return;
  g_free (self->title);
  self->title = g_strdup (title);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_TITLE]);
  project_changed (self);
}

FwFeatureCache *
fw_project_get_feature_cache (FwProject *self)
{
  g_return_val_if_fail (FW_IS_PROJECT (self), NULL);

  if (self->cache == NULL)
    self->cache = fw_feature_cache_new (self->cache_budget, 0);
  return self->cache;
}
