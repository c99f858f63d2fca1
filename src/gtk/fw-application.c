/* fw-application.c: command line, windows, light/dark preference, about dialog. */
#include "fw-config.h"

#include "fw-application.h"

#include <glib/gi18n.h>

#include "fw-recent.h"
#include "fw-window.h"

/* From the compiled GResource (fw-resources.c); referencing it keeps the bundle linked. */
GResource *fw_get_resource (void);

struct _FwApplication {
  GtkApplication parent_instance;
};

G_DEFINE_FINAL_TYPE (FwApplication, fw_application, GTK_TYPE_APPLICATION)

static const GOptionEntry option_entries[] = {
  { "demo", 'd', 0, G_OPTION_ARG_NONE, NULL,
    N_("Open the built-in demo project (an apiary's hive recordings)"), NULL },
  { "screenshot", 0, 0, G_OPTION_ARG_FILENAME, NULL,
    N_("Wait until every plot is computed and drawn, write a PNG of the window and quit"),
    N_("FILE.png") },
  { "size", 0, 0, G_OPTION_ARG_STRING, NULL,
    N_("Window size in pixels, e.g. 1400x900"), N_("WxH") },
  { "compare", 0, 0, G_OPTION_ARG_STRING_ARRAY, NULL,
    N_("Open the compare view: give it twice for sides A and B (each CLIP@SET, a clip and a "
       "parameter set of the project, or for B a .npy/.csv feature file), or once with the "
       "name or number of a comparison saved in the project"),
    N_("CLIP@SET|FILE|NAME") },
  { "compare-stage", 0, 0, G_OPTION_ARG_STRING, NULL,
    N_("Stage compared by --compare with two sides: db (default), mel-db, mfcc, delta, "
       "delta2, power, mel"), N_("STAGE") },
  { "version", 0, 0, G_OPTION_ARG_NONE, NULL, N_("Print the version and quit"), NULL },
  { G_OPTION_REMAINING, 0, 0, G_OPTION_ARG_FILENAME_ARRAY, NULL, NULL,
    NULL },
  { NULL }
};

gboolean
fw_application_is_dark (void)
{
  GtkSettings *settings = gtk_settings_get_default ();
  gboolean prefer_dark = FALSE;
  g_autofree char *theme = NULL;

  if (settings == NULL)
    return FALSE;
  g_object_get (settings, "gtk-application-prefer-dark-theme", &prefer_dark,
                "gtk-theme-name", &theme, NULL);
  return prefer_dark || (theme != NULL && g_str_has_suffix (theme, "-dark"));
}

/* Follow the desktop's colour-scheme preference where GNOME's settings schema is installed
 * (no portal here): "prefer-dark" turns on GTK's dark variant. */
static void
on_color_scheme_changed (GSettings *desktop, const char *key, gpointer user_data)
{
  g_autofree char *scheme = g_settings_get_string (desktop, "color-scheme");

  g_object_set (gtk_settings_get_default (), "gtk-application-prefer-dark-theme",
                g_strcmp0 (scheme, "prefer-dark") == 0, NULL);
}

static void
follow_system_colour_scheme (FwApplication *self)
{
  GSettingsSchemaSource *source = g_settings_schema_source_get_default ();
  g_autoptr (GSettingsSchema) schema = NULL;
  GSettings *desktop;

  if (source == NULL)
    return;
  schema = g_settings_schema_source_lookup (source, "org.gnome.desktop.interface", TRUE);
  if (schema == NULL || !g_settings_schema_has_key (schema, "color-scheme"))
    return;
  desktop = g_settings_new ("org.gnome.desktop.interface");
  g_signal_connect (desktop, "changed::color-scheme", G_CALLBACK (on_color_scheme_changed),
                    NULL);
  on_color_scheme_changed (desktop, "color-scheme", NULL);
  /* Lives as long as the application. */
  g_object_set_data_full (G_OBJECT (self), "fw-desktop-settings", desktop, g_object_unref);
}

static void
action_quit (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  GtkApplication *app = GTK_APPLICATION (user_data);
  GList *windows = g_list_copy (gtk_application_get_windows (app));

  /* Closing asks about unsaved changes window by window. */
  for (GList *l = windows; l != NULL; l = l->next)
    gtk_window_close (GTK_WINDOW (l->data));
  g_list_free (windows);
}

static void
action_about (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  GtkApplication *app = GTK_APPLICATION (user_data);
  GtkWindow *parent = gtk_application_get_active_window (app);
  const char *authors[] = { _("The Framewise developers"), NULL };

  gtk_show_about_dialog (parent,
                         "program-name", "Framewise",
                         "logo-icon-name", FW_APP_ID,
                         "version", FW_VERSION,
                         "comments", _("Look at audio features frame by frame: compare "
                                       "parameter sets and clips on one time axis, see why "
                                       "numbers differ, export figures for papers."),
                         "license-type", GTK_LICENSE_GPL_3_0,
                         "authors", authors,
                         "translator-credits", _("translator-credits"),
                         NULL);
}

static void
action_new_window (GSimpleAction *action, GVariant *param, gpointer user_data)
{
  FwWindow *win = fw_window_new (FW_APPLICATION (user_data));

  fw_window_open_demo (win);
  gtk_window_present (GTK_WINDOW (win));
}

static const GActionEntry app_actions[] = {
  { "quit", action_quit },
  { "about", action_about },
  { "new-window", action_new_window },
};

static void
fw_application_startup (GApplication *app)
{
  static const struct { const char *action; const char *accels[3]; } accels[] = {
    { "app.quit", { "<Control>q", NULL } },
    { "app.new-window", { "<Control><Shift>n", NULL } },
    { "win.open", { "<Control>o", NULL } },
    { "win.save", { "<Control>s", NULL } },
    { "win.save-as", { "<Control><Shift>s", NULL } },
    { "win.add-clips", { "<Control>i", NULL } },
    { "win.export-figure", { "<Control>e", NULL } },
    { "win.compare-new", { "<Control>k", NULL } },
    { "win.zoom-in", { "<Control>plus", "<Control>equal", NULL } },
    { "win.zoom-out", { "<Control>minus", NULL } },
    { "win.zoom-fit", { "<Control>0", NULL } },
    { "win.toggle-sidebar", { "F9", NULL } },
    { "win.cancel-work", { "<Control>period", NULL } },
    { "win.clear-selection", { "<Shift>Escape", NULL } },
    { "win.show-help-overlay", { "<Control>question", "<Control>F1", NULL } },
    { "window.close", { "<Control>w", NULL } },
  };

  G_APPLICATION_CLASS (fw_application_parent_class)->startup (app);

  g_action_map_add_action_entries (G_ACTION_MAP (app), app_actions, G_N_ELEMENTS (app_actions),
                                   app);
  for (guint i = 0; i < G_N_ELEMENTS (accels); i++)
    gtk_application_set_accels_for_action (GTK_APPLICATION (app), accels[i].action,
                                           accels[i].accels);

  gtk_window_set_default_icon_name (FW_APP_ID);
  follow_system_colour_scheme (FW_APPLICATION (app));

  /* GtkApplication finds icons, menus and the shortcuts window under the resource base
   * path by itself; the style sheet is ours to load. */
  if (gdk_display_get_default () != NULL)
    {
      g_autoptr (GtkCssProvider) css = gtk_css_provider_new ();

      gtk_css_provider_load_from_resource (css, "/org/framewise/Workbench/style.css");
      gtk_style_context_add_provider_for_display (gdk_display_get_default (),
                                                  GTK_STYLE_PROVIDER (css),
                                                  GTK_STYLE_PROVIDER_PRIORITY_APPLICATION);
    }
}

static gboolean
parse_size (const char *text, int *w, int *h)
{
  char *end = NULL;
  gint64 a, b;

  a = g_ascii_strtoll (text, &end, 10);
  if (end == text || (*end != 'x' && *end != 'X'))
    return FALSE;
  text = end + 1;
  b = g_ascii_strtoll (text, &end, 10);
  if (end == text || *end != '\0' || a < 200 || b < 150 || a > 16384 || b > 16384)
    return FALSE;
  *w = (int) a;
  *h = (int) b;
  return TRUE;
}

static gint
fw_application_handle_local_options (GApplication *app, GVariantDict *options)
{
  if (g_variant_dict_contains (options, "version"))
    {
      g_print ("framewise %s\n", FW_VERSION);
      return 0;
    }
  /* A screenshot run is its own short-lived process, never forwarded to a running one. */
  if (g_variant_dict_contains (options, "screenshot"))
    g_application_set_flags (app, g_application_get_flags (app) | G_APPLICATION_NON_UNIQUE);
  return -1;
}

typedef struct {
  GApplication *app;
  GApplicationCommandLine *cmdline;
} ShotData;

static void
screenshot_done (GObject *source, GAsyncResult *result, gpointer user_data)
{
  ShotData *data = user_data;
  g_autoptr (GError) error = NULL;

  if (!fw_window_screenshot_finish (FW_WINDOW (source), result, &error))
    {
      g_application_command_line_printerr (data->cmdline, "framewise: %s\n", error->message);
      g_application_command_line_set_exit_status (data->cmdline, 1);
    }
  else
    {
      g_application_command_line_set_exit_status (data->cmdline, 0);
    }
  /* The screenshot window has no unsaved work of the user's: close without asking. */
  fw_window_close_discarding (FW_WINDOW (source));
  g_application_release (data->app);
  g_object_unref (data->cmdline);
  g_free (data);
}

static int
fw_application_command_line (GApplication *app, GApplicationCommandLine *cmdline)
{
  GVariantDict *options = g_application_command_line_get_options_dict (cmdline);
  g_autofree char *screenshot = NULL;
  g_autofree char *size = NULL;
  g_autofree const char **rest = NULL;
  g_autofree const char **compare = NULL;
  g_autofree char *compare_stage = NULL;
  gboolean demo = g_variant_dict_contains (options, "demo");
  int width = 0, height = 0;
  FwWindow *win;
  g_autoptr (GPtrArray) files = g_ptr_array_new_with_free_func (g_object_unref);

  g_variant_dict_lookup (options, "screenshot", "^ay", &screenshot);
  g_variant_dict_lookup (options, "size", "s", &size);
  g_variant_dict_lookup (options, G_OPTION_REMAINING, "^a&ay", &rest);
  g_variant_dict_lookup (options, "compare", "^a&s", &compare);
  g_variant_dict_lookup (options, "compare-stage", "s", &compare_stage);
  if (compare != NULL && (compare[0] == NULL || (compare[1] != NULL && compare[2] != NULL)))
    {
      g_application_command_line_printerr (cmdline,
        _("framewise: --compare is given once (a saved comparison) or twice (sides A and B)\n"));
      return 2;
    }

  if (size != NULL && !parse_size (size, &width, &height))
    {
      g_application_command_line_printerr (cmdline,
        _("framewise: --size wants WIDTHxHEIGHT in pixels (at least 200x150), got “%s”\n"),
        size);
      return 2;
    }
  for (guint i = 0; rest != NULL && rest[i] != NULL; i++)
    g_ptr_array_add (files, g_application_command_line_create_file_for_arg (cmdline, rest[i]));

  win = fw_window_new (FW_APPLICATION (app));
  if (width > 0)
    gtk_window_set_default_size (GTK_WINDOW (win), width, height);

  if (files->len == 1 && fw_window_file_is_project (g_ptr_array_index (files, 0)))
    {
      g_autofree char *path = g_file_get_path (g_ptr_array_index (files, 0));
      if (!fw_window_open_project (win, path) && screenshot != NULL)
        {
          g_application_command_line_printerr (cmdline,
                                                _("framewise: could not open %s\n"), path);
          gtk_window_destroy (GTK_WINDOW (win));   /* never shown: nothing to ask */
          return 1;
        }
    }
  else if (files->len > 0)
    {
      fw_window_new_project_with_clips (win, (GFile **) files->pdata, files->len);
    }
  else if (demo)
    {
      fw_window_open_demo (win);
    }
  else
    {
      g_auto (GStrv) recent = fw_recent_list ();
      gboolean opened = FALSE;

      /* The last project, or the demo on first start (or when the last one is gone). */
      if (recent[0] != NULL && g_file_test (recent[0], G_FILE_TEST_EXISTS))
        opened = fw_window_open_project (win, recent[0]);
      if (!opened)
        fw_window_open_demo (win);
    }

  if (compare != NULL)
    {
      g_autoptr (GError) error = NULL;
      gboolean ok = compare[1] != NULL
                      ? fw_window_compare (win, compare[0], compare[1], compare_stage, &error)
                      : fw_window_open_comparison_by_name (win, compare[0], &error);
      if (!ok && error != NULL)
        {
          g_application_command_line_printerr (cmdline, "framewise: --compare: %s\n",
                                               error->message);
          if (screenshot != NULL)
            {
              gtk_window_destroy (GTK_WINDOW (win));
              return 2;
            }
          fw_window_show_error (win, error->message);
        }
    }

  gtk_window_present (GTK_WINDOW (win));

  if (screenshot != NULL)
    {
      ShotData *data = g_new0 (ShotData, 1);

      data->app = app;
      data->cmdline = g_object_ref (cmdline);
      g_application_hold (app);
      fw_window_screenshot_async (win, screenshot, width, height, NULL, screenshot_done, data);
    }
  return 0;
}

static void
fw_application_activate (GApplication *app)
{
  FwWindow *win = fw_window_new (FW_APPLICATION (app));

  fw_window_open_demo (win);
  gtk_window_present (GTK_WINDOW (win));
}

static void
fw_application_class_init (FwApplicationClass *klass)
{
  GApplicationClass *app_class = G_APPLICATION_CLASS (klass);

  app_class->startup = fw_application_startup;
  app_class->activate = fw_application_activate;
  app_class->command_line = fw_application_command_line;
  app_class->handle_local_options = fw_application_handle_local_options;
}

static void
fw_application_init (FwApplication *self)
{
  GOptionEntry entries[G_N_ELEMENTS (option_entries)];

  /* Translate the option descriptions at run time (the table holds N_() strings). */
  memcpy (entries, option_entries, sizeof entries);
  for (guint i = 0; i < G_N_ELEMENTS (entries); i++)
    {
      if (entries[i].description != NULL)
        entries[i].description = _(entries[i].description);
      if (entries[i].arg_description != NULL)
        entries[i].arg_description = _(entries[i].arg_description);
    }
  g_application_add_main_option_entries (G_APPLICATION (self), entries);
  g_application_set_option_context_parameter_string (G_APPLICATION (self),
                                                     _("[PROJECT.fwproj | CLIP...]"));
  g_application_set_option_context_summary (G_APPLICATION (self),
    _("Framewise: a workbench for audio features, frame by frame.\n"
      "Without arguments it opens the last project, or the demo on first start."));
  (void) fw_get_resource ();
}

FwApplication *
fw_application_new (void)
{
  return g_object_new (FW_TYPE_APPLICATION,
                       "application-id", FW_APP_ID,
                       "flags", G_APPLICATION_HANDLES_COMMAND_LINE,
                       "resource-base-path", "/org/framewise/Workbench",
                       NULL);
}
