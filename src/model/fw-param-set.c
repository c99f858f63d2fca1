/* fw-param-set.c: a named parameter set of a project (a name plus an immutable FwParams).
 *
 * The FwParams value is never modified: editing replaces it, so work in flight that holds
 * the old value keeps a valid, unchanged set. Name uniqueness is the project's business
 * (fw_project_rename_param_set); this object only stores and notifies.
 */
#include "fw-config.h"

#include "fw-param-set.h"

struct _FwParamSet
{
  GObject parent_instance;

  char *name;
  FwParams *params;
};

G_DEFINE_FINAL_TYPE (FwParamSet, fw_param_set, G_TYPE_OBJECT)

enum {
  PROP_0,
  PROP_NAME,
  PROP_PARAMS,
  N_PROPS
};

static GParamSpec *properties[N_PROPS];

static void
fw_param_set_finalize (GObject *object)
{
  FwParamSet *self = FW_PARAM_SET (object);

  g_clear_pointer (&self->name, g_free);
  g_clear_pointer (&self->params, fw_params_unref);

  G_OBJECT_CLASS (fw_param_set_parent_class)->finalize (object);
}

static void
fw_param_set_get_property (GObject *object, guint prop_id, GValue *value, GParamSpec *pspec)
{
  FwParamSet *self = FW_PARAM_SET (object);

  switch (prop_id)
    {
    case PROP_NAME:
      g_value_set_string (value, self->name);
      break;
    case PROP_PARAMS:
      g_value_set_boxed (value, self->params);
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_param_set_set_property (GObject *object, guint prop_id, const GValue *value,
                           GParamSpec *pspec)
{
  FwParamSet *self = FW_PARAM_SET (object);

  switch (prop_id)
    {
    case PROP_NAME:
      fw_param_set_set_name (self, g_value_get_string (value));
      break;
    case PROP_PARAMS:
      {
        FwParams *params = g_value_get_boxed (value);
        if (params != NULL)
          fw_param_set_set_params (self, params);
      }
      break;
    default:
      G_OBJECT_WARN_INVALID_PROPERTY_ID (object, prop_id, pspec);
    }
}

static void
fw_param_set_class_init (FwParamSetClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);

  object_class->finalize = fw_param_set_finalize;
  object_class->get_property = fw_param_set_get_property;
  object_class->set_property = fw_param_set_set_property;

  properties[PROP_NAME] =
    g_param_spec_string ("name", NULL, NULL, NULL,
                         G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);
  properties[PROP_PARAMS] =
    g_param_spec_boxed ("params", NULL, NULL, FW_TYPE_PARAMS,
                        G_PARAM_READWRITE | G_PARAM_EXPLICIT_NOTIFY | G_PARAM_STATIC_STRINGS);

  g_object_class_install_properties (object_class, N_PROPS, properties);
}

static void
fw_param_set_init (FwParamSet *self)
{
  self->name = g_strdup ("");
}

FwParamSet *
fw_param_set_new (const char *name, FwParams *params)
{
  FwParamSet *self;

  g_return_val_if_fail (name != NULL, NULL);

  self = g_object_new (FW_TYPE_PARAM_SET, "name", name, NULL);
  if (params != NULL)
    self->params = fw_params_ref (params);
  else
    self->params = fw_params_new_default ();
  return self;
}

const char *
fw_param_set_get_name (FwParamSet *self)
{
  g_return_val_if_fail (FW_IS_PARAM_SET (self), NULL);
  return self->name;
}

void
fw_param_set_set_name (FwParamSet *self, const char *name)
{
  g_return_if_fail (FW_IS_PARAM_SET (self));

  if (name == NULL)
    name = "";
  if (g_strcmp0 (self->name, name) == 0)
    return;
  g_free (self->name);
  self->name = g_strdup (name);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_NAME]);
}

FwParams *
fw_param_set_get_params (FwParamSet *self)
{
  g_return_val_if_fail (FW_IS_PARAM_SET (self), NULL);
  return self->params;
}

void
fw_param_set_set_params (FwParamSet *self, FwParams *params)
{
  g_return_if_fail (FW_IS_PARAM_SET (self));
  g_return_if_fail (params != NULL);

  if (self->params == params)
    return;
  if (self->params != NULL && fw_params_equal (self->params, params))
    return;
  g_clear_pointer (&self->params, fw_params_unref);
  self->params = fw_params_ref (params);
  g_object_notify_by_pspec (G_OBJECT (self), properties[PROP_PARAMS]);
}

FwParamSet *
fw_param_set_duplicate (FwParamSet *self, const char *new_name)
{
  g_return_val_if_fail (FW_IS_PARAM_SET (self), NULL);
  g_return_val_if_fail (new_name != NULL, NULL);

  return fw_param_set_new (new_name, self->params);
}
