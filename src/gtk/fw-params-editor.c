/* fw-params-editor.c: grouped parameter fields with units, live facts and validation. */
#include "fw-config.h"

#include "fw-params-editor.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-analysis.h"
#include "fw-mel.h"
#include "fw-window.h"

typedef enum { FIELD_ENTRY, FIELD_DURATION, FIELD_CHOICE, FIELD_SWITCH } FieldKind;

typedef struct {
  const char *key;
  const char *group;  /* N_() */
  const char *label;  /* N_() */
  FieldKind kind;
  const char *unit;   /* N_() or NULL */
  const char *hint;   /* N_() or NULL: shown in the tooltip */
} FieldSpec;

static const FieldSpec field_specs[] = {
  { "sample_rate", N_("Framing"), N_("Sample rate"), FIELD_ENTRY, N_("Hz"),
    N_("0 analyses each file at its own rate; any other rate resamples (high quality) and "
       "says so.") },
  { "channel", N_("Framing"), N_("Channel"), FIELD_ENTRY, NULL,
    N_("“mix” averages the channels; 1, 2, … takes one channel.") },
  { "pre_emphasis", N_("Framing"), N_("Pre-emphasis"), FIELD_ENTRY, NULL,
    N_("The a in y[n] = x[n] − a·x[n−1]; 0 turns it off.") },
  { "hop_length", N_("Framing"), N_("Hop"), FIELD_DURATION, NULL,
    N_("Distance between the starts of successive frames.") },
  { "centered", N_("Framing"), N_("Centred frames"), FIELD_SWITCH, NULL,
    N_("Pads half an FFT length at both ends, so frame t is centred at t × hop.") },
  { "padding", N_("Framing"), N_("Padding"), FIELD_CHOICE, NULL,
    N_("What fills the padding of centred frames.") },
  { "window_length", N_("Window"), N_("Length"), FIELD_DURATION, NULL,
    N_("Samples under the window; a window shorter than the FFT sits centred in the frame.") },
  { "window", N_("Window"), N_("Shape"), FIELD_CHOICE, NULL, NULL },
  { "window_symmetry", N_("Window"), N_("Symmetry"), FIELD_CHOICE, NULL,
    N_("Periodic divides by N (for spectral analysis), symmetric by N − 1.") },
  { "fft_length", N_("Spectrum"), N_("FFT length"), FIELD_ENTRY, N_("samples"),
    N_("At least the window length; longer pads with zeros.") },
  { "spectrum", N_("Spectrum"), N_("Values"), FIELD_CHOICE, NULL,
    N_("Power |X|² or magnitude |X| of the unscaled DFT.") },
  { "mel_bands", N_("Mel"), N_("Bands"), FIELD_ENTRY, NULL, NULL },
  { "mel_scale", N_("Mel"), N_("Scale"), FIELD_CHOICE, NULL,
    N_("HTK: 2595·log10(1 + f/700). Slaney: linear below 1 kHz, logarithmic above.") },
  { "fmin", N_("Mel"), N_("Lowest frequency"), FIELD_ENTRY, N_("Hz"), NULL },
  { "fmax", N_("Mel"), N_("Highest frequency"), FIELD_ENTRY, N_("Hz"),
    N_("0 means half the sample rate (Nyquist).") },
  { "mel_weights", N_("Mel"), N_("Filter weights"), FIELD_CHOICE, NULL,
    N_("Area: each triangle scaled to equal area. Unit: each triangle peaks at 1.") },
  { "db_reference", N_("Log"), N_("dB reference"), FIELD_ENTRY, NULL,
    N_("A positive number, or “max” for the maximum of each clip's matrix.") },
  { "db_floor", N_("Log"), N_("Floor"), FIELD_ENTRY, NULL,
    N_("Values below the floor are raised to it before the logarithm.") },
  { "dynamic_range", N_("Log"), N_("Dynamic range"), FIELD_ENTRY, N_("dB"),
    N_("Clamps values more than this far below the maximum; 0 turns it off.") },
  { "cepstral_count", N_("Cepstrum"), N_("Coefficients"), FIELD_ENTRY, NULL,
    N_("Number of coefficients kept, c0 included.") },
  { "dct_norm", N_("Cepstrum"), N_("DCT scaling"), FIELD_CHOICE, NULL,
    N_("Ortho: orthonormal DCT-II. None: the unnormalised sum 2·Σ.") },
  { "lifter", N_("Cepstrum"), N_("Lifter"), FIELD_ENTRY, NULL,
    N_("L > 0 multiplies c_n by 1 + (L/2)·sin(πn/L); 0 turns it off.") },
  { "delta_width", N_("Deltas"), N_("Width"), FIELD_ENTRY, N_("frames each side"),
    N_("N in the regression d_t = Σ k (c_{t+k} − c_{t−k}) / (2 Σ k²).") },
};

typedef struct {
  const FieldSpec *spec;
  GtkWidget *widget;         /* GtkEntry, GtkDropDown or GtkSwitch */
  GtkWidget *unit_choice;    /* FIELD_DURATION: samples / ms */
  GtkWidget *message;        /* error text under the field */
  GtkWidget *note;           /* FIELD_DURATION: the exact count */
  char *message_text;
} Field;

static const char *fact_ids[] = { "rate", "window", "hop", "fps", "bin", "enbw", "sidelobe",
                                  "mel", "frames", "size", "hash" };

struct _FwParamsEditor {
  GtkWidget parent_instance;

  /* template */
  GtkWidget *scrolled;
  GtkLabel *title_label;
  GtkLabel *status_label;
  GtkBox *fields_box;
  GtkGrid *facts_grid;
  GtkBox *messages_box;
  GtkLabel *edges_label;
  GtkWidget *content_box;
  GtkWidget *empty_label;

  Field fields[G_N_ELEMENTS (field_specs)];
  GHashTable *fact_labels;   /* id -> GtkLabel */

  FwParamSet *set;
  FwParams *params;          /* the applied value shown */
  FwParams *candidate;       /* what the fields say now, if they parse */
  FwClip *clip;
  double clip_rate;          /* the clip's file facts, read in a worker thread */
  gint64 clip_frames;
  gboolean have_clip_info;
  GCancellable *info_cancellable;
  gboolean info_pending;
  gulong set_notify_id;
  gboolean loading;
  gboolean candidate_checked_ok;

  /* figures of merit are costly for long windows: keep the last */
  FwWindowKind merit_kind;
  FwWindowSymmetry merit_sym;
  size_t merit_n;
  FwWindowMerit merit;
  gboolean merit_ok;
};

G_DEFINE_FINAL_TYPE (FwParamsEditor, fw_params_editor, GTK_TYPE_WIDGET)

static void recompute (FwParamsEditor *self);

static Field *
find_field (FwParamsEditor *self, const char *key)
{
  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    if (strcmp (field_specs[i].key, key) == 0)
      return &self->fields[i];
  return NULL;
}

static GtkStringList *
choices_for (const char *key)
{
  GtkStringList *list = gtk_string_list_new (NULL);

  if (strcmp (key, "window") == 0)
    for (int i = 0; i < FW_N_WINDOWS; i++)
      gtk_string_list_append (list, fw_window_kind_name ((FwWindowKind) i));
  else if (strcmp (key, "window_symmetry") == 0)
    {
      gtk_string_list_append (list, fw_window_symmetry_name (FW_WINDOW_PERIODIC));
      gtk_string_list_append (list, fw_window_symmetry_name (FW_WINDOW_SYMMETRIC));
    }
  else if (strcmp (key, "padding") == 0)
    {
      gtk_string_list_append (list, fw_padding_name (FW_PADDING_ZEROS));
      gtk_string_list_append (list, fw_padding_name (FW_PADDING_REFLECT));
      gtk_string_list_append (list, fw_padding_name (FW_PADDING_EDGE));
    }
  else if (strcmp (key, "spectrum") == 0)
    {
      gtk_string_list_append (list, fw_spectrum_kind_name (FW_SPECTRUM_POWER));
      gtk_string_list_append (list, fw_spectrum_kind_name (FW_SPECTRUM_MAGNITUDE));
    }
  else if (strcmp (key, "mel_scale") == 0)
    {
      gtk_string_list_append (list, fw_mel_scale_name (FW_MEL_SCALE_SLANEY));
      gtk_string_list_append (list, fw_mel_scale_name (FW_MEL_SCALE_HTK));
    }
  else if (strcmp (key, "mel_weights") == 0)
    {
      gtk_string_list_append (list, fw_mel_weights_name (FW_MEL_WEIGHTS_AREA));
      gtk_string_list_append (list, fw_mel_weights_name (FW_MEL_WEIGHTS_UNIT));
    }
  else if (strcmp (key, "dct_norm") == 0)
    {
      gtk_string_list_append (list, fw_dct_norm_name (FW_DCT_NORM_ORTHO));
      gtk_string_list_append (list, fw_dct_norm_name (FW_DCT_NORM_NONE));
    }
  return list;
}

/* The analysis rate and length the facts use: the set's rate or the clip's. */
static double
analysis_rate (FwParamsEditor *self, FwParams *params, double *file_rate, gsize *n_samples)
{
  int sr = fw_params_get_sample_rate (params);
  double rate;

  *file_rate = 0;
  *n_samples = 0;
  if (self->clip != NULL && self->have_clip_info)
    {
      *file_rate = self->clip_rate;
      rate = sr > 0 ? sr : self->clip_rate;
      *n_samples = (gsize) llround ((double) self->clip_frames * rate / self->clip_rate);
      return rate;
    }
  return sr > 0 ? sr : 22050.0;
}

static double
parse_decimal (const char *text, gboolean *ok)
{
  g_autofree char *copy = g_strstrip (g_strdup (text));
  char *end = NULL;
  double v;

  /* Accept the user's decimal comma as well as a point. */
  g_strdelimit (copy, ",", '.');
  v = g_ascii_strtod (copy, &end);
  *ok = end != copy && *end == '\0' && isfinite (v);
  return v;
}

static gboolean
duration_in_ms (Field *f)
{
  return f->unit_choice != NULL &&
         gtk_drop_down_get_selected (GTK_DROP_DOWN (f->unit_choice)) == 1;
}

/* The key's text value as the field says now; NULL + message when it cannot be read. */
static char *
field_value (FwParamsEditor *self, Field *f, double rate, char **message)
{
  const char *text;

  *message = NULL;
  switch (f->spec->kind)
    {
    case FIELD_SWITCH:
      return g_strdup (gtk_switch_get_active (GTK_SWITCH (f->widget)) ? "true" : "false");
    case FIELD_CHOICE:
      {
        GObject *item = gtk_drop_down_get_selected_item (GTK_DROP_DOWN (f->widget));
        return item != NULL ? g_strdup (gtk_string_object_get_string (GTK_STRING_OBJECT (item)))
                            : NULL;
      }
    case FIELD_DURATION:
      if (duration_in_ms (f))
        {
          gboolean ok;
          double ms;

          text = gtk_editable_get_text (GTK_EDITABLE (f->widget));
          ms = parse_decimal (text, &ok);
          if (!ok)
            {
              *message = g_strdup_printf (_("%s: “%s” is not a number of milliseconds"),
                                          f->spec->key, text);
              return NULL;
            }
          return g_strdup_printf ("%.0f", round (ms * rate / 1000.0));
        }
      G_GNUC_FALLTHROUGH;
    case FIELD_ENTRY:
    default:
      {
        g_autofree char *copy = g_strstrip (g_strdup (gtk_editable_get_text (GTK_EDITABLE (f->widget))));
        gboolean ok;

        /* "0,97" from a German keyboard means 0.97 */
        if (strchr (copy, ',') != NULL && strchr (copy, '.') == NULL)
          {
            parse_decimal (copy, &ok);
            if (ok)
              g_strdelimit (copy, ",", '.');
          }
        return g_steal_pointer (&copy);
      }
    }
}

static void
set_field_message (Field *f, const char *message)
{
  g_free (f->message_text);
  f->message_text = g_strdup (message);
  gtk_label_set_text (GTK_LABEL (f->message), message != NULL ? message : "");
  gtk_widget_set_visible (f->message, message != NULL);
  if (message != NULL)
    gtk_widget_add_css_class (f->widget, "error");
  else
    gtk_widget_remove_css_class (f->widget, "error");
}

/* Shows a key's value from params in its field (without treating it as an edit). */
static void
show_value (FwParamsEditor *self, Field *f, FwParams *params, double rate)
{
  g_autofree char *value = fw_params_get_value (params, f->spec->key);

  if (value == NULL)
    return;
  switch (f->spec->kind)
    {
    case FIELD_SWITCH:
      gtk_switch_set_active (GTK_SWITCH (f->widget), g_strcmp0 (value, "true") == 0);
      break;
    case FIELD_CHOICE:
      {
        GListModel *model = gtk_drop_down_get_model (GTK_DROP_DOWN (f->widget));
        for (guint i = 0; i < g_list_model_get_n_items (model); i++)
          if (g_strcmp0 (gtk_string_list_get_string (GTK_STRING_LIST (model), i), value) == 0)
            gtk_drop_down_set_selected (GTK_DROP_DOWN (f->widget), i);
        break;
      }
    case FIELD_DURATION:
      if (duration_in_ms (f))
        {
          g_autofree char *ms = g_strdup_printf ("%.6g", g_ascii_strtod (value, NULL) * 1000.0 / rate);
          gtk_editable_set_text (GTK_EDITABLE (f->widget), ms);
          break;
        }
      G_GNUC_FALLTHROUGH;
    case FIELD_ENTRY:
    default:
      gtk_editable_set_text (GTK_EDITABLE (f->widget), value);
      break;
    }
}

static void
load_fields (FwParamsEditor *self)
{
  double file_rate;
  gsize n;
  double rate;

  if (self->params == NULL)
    return;
  rate = analysis_rate (self, self->params, &file_rate, &n);
  self->loading = TRUE;
  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    {
      show_value (self, &self->fields[i], self->params, rate);
      set_field_message (&self->fields[i], NULL);
    }
  self->loading = FALSE;
  recompute (self);
}

static void
set_fact (FwParamsEditor *self, const char *id, const char *text)
{
  GtkLabel *label = g_hash_table_lookup (self->fact_labels, id);

  if (label != NULL)
    gtk_label_set_text (label, text != NULL ? text : "—");
}

static void
add_message (FwParamsEditor *self, const char *icon, const char *css, const char *text)
{
  GtkWidget *box = gtk_box_new (GTK_ORIENTATION_HORIZONTAL, 6);
  GtkWidget *image = gtk_image_new_from_icon_name (icon);
  GtkWidget *label = gtk_label_new (text);

  gtk_widget_set_valign (image, GTK_ALIGN_START);
  gtk_label_set_wrap (GTK_LABEL (label), TRUE);
  gtk_label_set_wrap_mode (GTK_LABEL (label), PANGO_WRAP_WORD_CHAR);
  gtk_label_set_xalign (GTK_LABEL (label), 0);
  gtk_label_set_selectable (GTK_LABEL (label), TRUE);
  gtk_widget_set_hexpand (label, TRUE);
  gtk_widget_add_css_class (box, css);
  gtk_box_append (GTK_BOX (box), image);
  gtk_box_append (GTK_BOX (box), label);
  gtk_box_append (self->messages_box, box);
}

static void
clear_messages (FwParamsEditor *self)
{
  GtkWidget *child;

  while ((child = gtk_widget_get_first_child (GTK_WIDGET (self->messages_box))) != NULL)
    gtk_box_remove (self->messages_box, child);
}

static const FwWindowMerit *
window_merit (FwParamsEditor *self, const FwAnalysisConfig *cfg)
{
  if (!self->merit_ok || self->merit_kind != cfg->window || self->merit_sym != cfg->window_symmetry ||
      self->merit_n != cfg->window_length)
    {
      self->merit_kind = cfg->window;
      self->merit_sym = cfg->window_symmetry;
      self->merit_n = cfg->window_length;
      self->merit_ok = fw_window_merit (cfg->window, cfg->window_symmetry, cfg->window_length,
                                        &self->merit) == FW_DSP_OK;
    }
  return self->merit_ok ? &self->merit : NULL;
}

static void
update_facts (FwParamsEditor *self, FwParams *params, double rate, double file_rate,
              gsize n_samples)
{
  FwAnalysisConfig cfg;
  const FwWindowMerit *merit;
  g_autofree char *text = NULL;
  FwDspStatus status = FW_DSP_OK;
  FwMelBank *bank;
  size_t frames = 0;
  size_t n_bins;

  fw_params_fill_config (params, rate, &cfg);
  n_bins = cfg.fft_length / 2 + 1;

  if (file_rate > 0 && fabs (file_rate - rate) > 0.5)
    text = g_strdup_printf (_("%.0f Hz (resampled from the file's %.0f Hz)"), rate, file_rate);
  else if (file_rate > 0)
    text = g_strdup_printf (_("%.0f Hz (the file's rate)"), rate);
  else
    text = g_strdup_printf (_("%.0f Hz (no clip selected: assumed)"), rate);
  set_fact (self, "rate", text);
  g_free (text);

  text = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu sample = %.2f ms",
                                       "%zu samples = %.2f ms", cfg.window_length),
                          cfg.window_length, 1000.0 * cfg.window_length / rate);
  set_fact (self, "window", text);
  g_free (text);
  text = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu sample = %.2f ms (%.0f %% overlap)",
                                       "%zu samples = %.2f ms (%.0f %% overlap)", cfg.hop_length),
                          cfg.hop_length, 1000.0 * cfg.hop_length / rate,
                          cfg.hop_length < cfg.window_length
                            ? 100.0 * (1.0 - (double) cfg.hop_length / cfg.window_length) : 0.0);
  set_fact (self, "hop", text);
  g_free (text);
  text = g_strdup_printf (_("%.2f frames per second"), rate / cfg.hop_length);
  set_fact (self, "fps", text);
  g_free (text);
  text = g_strdup_printf (_("%.3f Hz per bin (%zu bins)"), rate / cfg.fft_length, n_bins);
  set_fact (self, "bin", text);
  g_free (text);

  merit = window_merit (self, &cfg);
  if (merit != NULL)
    {
      text = g_strdup_printf (_("%.3f bins = %.2f Hz"), merit->enbw_bins,
                              merit->enbw_bins * rate / cfg.window_length);
      set_fact (self, "enbw", text);
      g_free (text);
      text = g_strdup_printf (_("%.1f dB (scalloping loss %.2f dB)"), merit->highest_sidelobe_db,
                              merit->scalloping_loss_db);
      set_fact (self, "sidelobe", text);
      g_clear_pointer (&text, g_free);
    }
  else
    {
      set_fact (self, "enbw", NULL);
      set_fact (self, "sidelobe", NULL);
    }

  bank = fw_mel_bank_new (cfg.mel_scale, cfg.mel_weights, cfg.mel_bands, cfg.fmin, cfg.fmax,
                          rate, cfg.fft_length, &status);
  if (bank != NULL)
    {
      const double *edges = fw_mel_bank_edges_hz (bank);
      size_t n_edges = fw_mel_bank_n_bands (bank) + 2;
      GString *s = g_string_new (NULL);

      text = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu band, %.0f–%.0f Hz (%s)",
                                           "%zu bands, %.0f–%.0f Hz (%s)", cfg.mel_bands),
                              cfg.mel_bands, cfg.fmin, cfg.fmax, fw_mel_scale_name (cfg.mel_scale));
      set_fact (self, "mel", text);
      g_clear_pointer (&text, g_free);
      for (size_t i = 0; i < n_edges; i++)
        g_string_append_printf (s, i == 0 ? "%.1f" : " · %.1f", edges[i]);
      gtk_label_set_text (self->edges_label, s->str);
      g_string_free (s, TRUE);
      fw_mel_bank_free (bank);
    }
  else
    {
      set_fact (self, "mel", fw_dsp_status_describe (status));
      gtk_label_set_text (self->edges_label, "—");
    }

  if (n_samples > 0)
    {
      frames = fw_frame_count (n_samples, cfg.fft_length, cfg.hop_length, cfg.centered);
      text = g_strdup_printf (g_dngettext (GETTEXT_PACKAGE, "%zu frame over %.2f s",
                                           "%zu frames over %.2f s", frames),
                              frames, n_samples / rate);
      set_fact (self, "frames", text);
      g_clear_pointer (&text, g_free);
      {
        g_autofree char *spec_size = g_format_size ((guint64) frames * n_bins * sizeof (float));
        g_autofree char *mel_size = g_format_size ((guint64) frames * cfg.mel_bands * sizeof (float));
        g_autofree char *mfcc_size = g_format_size ((guint64) frames * cfg.cepstral_count * sizeof (float));
        text = g_strdup_printf (_("spectrum %zu × %zu (%s), mel %zu × %zu (%s), MFCC %zu × %zu (%s); "
                                  "float32, frames × bins"),
                                frames, n_bins, spec_size, frames, cfg.mel_bands, mel_size,
                                frames, cfg.cepstral_count, mfcc_size);
        set_fact (self, "size", text);
        g_clear_pointer (&text, g_free);
      }
    }
  else
    {
      text = g_strdup_printf (_("spectrum %zu bins, mel %zu bands, MFCC %zu coefficients per frame"),
                              n_bins, cfg.mel_bands, cfg.cepstral_count);
      set_fact (self, "frames", _("no clip selected"));
      set_fact (self, "size", text);
      g_clear_pointer (&text, g_free);
    }
  set_fact (self, "hash", fw_params_get_hash (params));
}

/* The field a check message is about: the first key it names, preferring edited keys. */
static Field *
field_named_in (FwParamsEditor *self, const char *message)
{
  Field *best = NULL;

  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    {
      const char *key = field_specs[i].key;
      const char *at = strstr (message, key);

      while (at != NULL)
        {
          char after = at[strlen (key)];
          gboolean word_start = at == message || !(g_ascii_isalnum (at[-1]) || at[-1] == '_');
          if (word_start && !(g_ascii_isalnum (after) || after == '_'))
            break;
          at = strstr (at + 1, key);
        }
      if (at != NULL && (best == NULL || at < strstr (message, best->spec->key)))
        best = &self->fields[i];
    }
  return best;
}

/* Reads every field into a candidate value, checks it and refreshes facts and messages. */
static void
recompute (FwParamsEditor *self)
{
  g_autoptr (FwParams) cand = NULL;
  g_autoptr (GPtrArray) warnings = g_ptr_array_new_with_free_func (g_free);
  g_autoptr (GError) check_error = NULL;
  double file_rate = 0, rate;
  gsize n_samples = 0;
  gboolean fields_ok = TRUE;
  gboolean changed = FALSE;

  g_clear_pointer (&self->candidate, fw_params_unref);
  self->candidate_checked_ok = FALSE;
  clear_messages (self);
  if (self->params == NULL)
    return;

  rate = analysis_rate (self, self->params, &file_rate, &n_samples);
  cand = fw_params_ref (self->params);
  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    {
      Field *f = &self->fields[i];
      g_autofree char *message = NULL;
      g_autofree char *value = field_value (self, f, rate, &message);
      g_autofree char *current = NULL;
      g_autoptr (GError) error = NULL;
      FwParams *next;

      if (value == NULL)
        {
          set_field_message (f, message);
          fields_ok = FALSE;
          continue;
        }
      current = fw_params_get_value (cand, f->spec->key);
      if (g_strcmp0 (current, value) == 0)
        {
          set_field_message (f, NULL);
          continue;
        }
      next = fw_params_with (cand, f->spec->key, value, &error);
      if (next == NULL)
        {
          set_field_message (f, error->message);
          fields_ok = FALSE;
          continue;
        }
      set_field_message (f, NULL);
      fw_params_unref (cand);
      cand = next;
      changed = TRUE;
      /* a new sample rate changes what "ms" means for window and hop */
      if (strcmp (f->spec->key, "sample_rate") == 0)
        rate = analysis_rate (self, cand, &file_rate, &n_samples);
    }

  /* Duration notes: the exact sample count and its duration. */
  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    {
      Field *f = &self->fields[i];
      g_autofree char *message = NULL;
      g_autofree char *value = NULL;
      g_autofree char *note = NULL;

      if (f->spec->kind != FIELD_DURATION)
        continue;
      value = field_value (self, f, rate, &message);
      if (value != NULL && f->message_text == NULL)
        {
          double samples = g_ascii_strtod (value, NULL);
          note = duration_in_ms (f)
            ? g_strdup_printf (_("= %.0f samples, exactly %.3f ms at %.0f Hz"), samples,
                               1000.0 * samples / rate, rate)
            : g_strdup_printf (_("= %.3f ms at %.0f Hz"), 1000.0 * samples / rate, rate);
        }
      gtk_label_set_text (GTK_LABEL (f->note), note != NULL ? note : "");
    }

  if (!fields_ok)
    {
      gtk_label_set_text (self->status_label,
                          _("Not applied: a field has a problem (shown in red). "
                            "The plots keep the last good settings."));
      gtk_widget_add_css_class (GTK_WIDGET (self->status_label), "error");
      update_facts (self, self->params, analysis_rate (self, self->params, &file_rate, &n_samples),
                    file_rate, n_samples);
      return;
    }

  update_facts (self, cand, rate, file_rate, n_samples);
  if (!fw_params_check (cand, rate, n_samples, warnings, &check_error))
    {
      Field *f = field_named_in (self, check_error->message);

      add_message (self, "dialog-error-symbolic", "error", check_error->message);
      if (f != NULL)
        set_field_message (f, check_error->message);
      gtk_label_set_text (self->status_label,
                          _("Not applied: these settings do not fit (see below). "
                            "The plots keep the last good settings."));
      gtk_widget_add_css_class (GTK_WIDGET (self->status_label), "error");
    }
  else
    {
      self->candidate_checked_ok = TRUE;
      gtk_widget_remove_css_class (GTK_WIDGET (self->status_label), "error");
      gtk_label_set_text (self->status_label,
                          changed ? _("Edited: press Enter or leave the field to apply.")
                                  : _("Edits apply when you press Enter, leave a field or "
                                      "change a choice."));
    }
  for (guint i = 0; i < warnings->len; i++)
    add_message (self, "dialog-warning-symbolic", "warning", g_ptr_array_index (warnings, i));
  self->candidate = g_steal_pointer (&cand);
}

gboolean
fw_params_editor_commit (FwParamsEditor *self)
{
  g_return_val_if_fail (FW_IS_PARAMS_EDITOR (self), FALSE);

  if (self->set == NULL)
    return FALSE;
  recompute (self);
  if (self->candidate == NULL || !self->candidate_checked_ok)
    return FALSE;
  if (fw_params_equal (self->candidate, self->params))
    return TRUE;
  g_clear_pointer (&self->params, fw_params_unref);
  self->params = fw_params_ref (self->candidate);
  /* Editing makes a new value; work in flight keeps the old one. */
  fw_param_set_set_params (self->set, self->candidate);
  gtk_label_set_text (self->status_label, _("Applied. Plots that depend on the change are "
                                            "being recomputed."));
  return TRUE;
}

static void
on_field_changed (FwParamsEditor *self)
{
  if (!self->loading)
    recompute (self);
}

static void
on_entry_activate (GtkEntry *entry, gpointer user_data)
{
  fw_params_editor_commit (FW_PARAMS_EDITOR (user_data));
}

static void
on_focus_leave (GtkEventControllerFocus *focus, gpointer user_data)
{
  FwParamsEditor *self = user_data;

  if (!self->loading)
    fw_params_editor_commit (self);
}

static void
on_choice_changed (GObject *object, GParamSpec *pspec, gpointer user_data)
{
  FwParamsEditor *self = user_data;

  if (!self->loading)
    fw_params_editor_commit (self);
}

/* Switching samples <-> ms rewrites the entry in the new unit (the value stays). */
static void
on_unit_changed (GtkDropDown *dropdown, GParamSpec *pspec, gpointer user_data)
{
  FwParamsEditor *self = user_data;
  Field *f = g_object_get_data (G_OBJECT (dropdown), "fw-field");
  double file_rate, rate;
  gsize n;
  gboolean ok;
  double v;
  g_autofree char *text = NULL;

  if (self->loading || self->params == NULL)
    return;
  rate = analysis_rate (self, self->candidate != NULL ? self->candidate : self->params,
                        &file_rate, &n);
  v = parse_decimal (gtk_editable_get_text (GTK_EDITABLE (f->widget)), &ok);
  if (ok)
    {
      if (duration_in_ms (f))      /* was samples */
        text = g_strdup_printf ("%.6g", v * 1000.0 / rate);
      else
        text = g_strdup_printf ("%.0f", round (v * rate / 1000.0));
      self->loading = TRUE;
      gtk_editable_set_text (GTK_EDITABLE (f->widget), text);
      self->loading = FALSE;
    }
  recompute (self);
}

static void
on_set_params_changed (FwParamSet *set, GParamSpec *pspec, gpointer user_data)
{
  FwParamsEditor *self = user_data;
  FwParams *now = fw_param_set_get_params (set);

  if (self->params != NULL && now != NULL && fw_params_equal (now, self->params))
    return;
  g_clear_pointer (&self->params, fw_params_unref);
  self->params = now != NULL ? fw_params_ref (now) : NULL;
  load_fields (self);
}

static void
update_title (FwParamsEditor *self)
{
  g_autofree char *title = NULL;

  gtk_widget_set_visible (self->content_box, self->set != NULL);
  gtk_widget_set_visible (self->empty_label, self->set == NULL);
  if (self->set == NULL)
    return;
  title = g_strdup_printf (_("Parameter set “%s”"), fw_param_set_get_name (self->set));
  gtk_label_set_text (self->title_label, title);
}

static void
on_set_name_changed (FwParamSet *set, GParamSpec *pspec, gpointer user_data)
{
  update_title (FW_PARAMS_EDITOR (user_data));
}

void
fw_params_editor_set_param_set (FwParamsEditor *self, FwParamSet *set)
{
  g_return_if_fail (FW_IS_PARAMS_EDITOR (self));

  if (self->set == set)
    return;
  if (self->set != NULL)
    {
      g_signal_handlers_disconnect_by_data (self->set, self);
      self->set_notify_id = 0;
    }
  g_set_object (&self->set, set);
  g_clear_pointer (&self->params, fw_params_unref);
  if (set != NULL)
    {
      self->params = fw_params_ref (fw_param_set_get_params (set));
      g_signal_connect (set, "notify::params", G_CALLBACK (on_set_params_changed), self);
      g_signal_connect (set, "notify::name", G_CALLBACK (on_set_name_changed), self);
    }
  update_title (self);
  load_fields (self);
}

FwParamSet *
fw_params_editor_get_param_set (FwParamsEditor *self)
{
  g_return_val_if_fail (FW_IS_PARAMS_EDITOR (self), NULL);
  return self->set;
}

typedef struct {
  FwClip *clip;
  FwAudioInfo info;
  gboolean ok;
} InfoJob;

static void
info_job_free (InfoJob *job)
{
  g_object_unref (job->clip);
  fw_audio_info_clear (&job->info);
  g_free (job);
}

static void
info_thread (GTask *task, gpointer source, gpointer task_data, GCancellable *cancellable)
{
  InfoJob *job = task_data;

  job->ok = fw_clip_get_info (job->clip, &job->info, NULL);
  g_task_return_boolean (task, TRUE);
}

static void
on_info_read (GObject *source, GAsyncResult *result, gpointer user_data)
{
  FwParamsEditor *self = FW_PARAMS_EDITOR (source);
  InfoJob *job = g_task_get_task_data (G_TASK (result));

  if (g_task_had_error (G_TASK (result)) || job->clip != self->clip ||
      g_cancellable_is_cancelled (g_task_get_cancellable (G_TASK (result))))
    return;
  self->info_pending = FALSE;
  if (job->ok && job->info.sample_rate > 0)
    {
      self->clip_rate = job->info.sample_rate;
      self->clip_frames = job->info.frames;
      self->have_clip_info = TRUE;
    }
  load_fields (self);
}

void
fw_params_editor_set_clip (FwParamsEditor *self, FwClip *clip)
{
  g_return_if_fail (FW_IS_PARAMS_EDITOR (self));

  if (self->clip == clip)
    return;
  g_set_object (&self->clip, clip);
  self->have_clip_info = FALSE;
  self->info_pending = FALSE;
  if (self->info_cancellable != NULL)
    g_cancellable_cancel (self->info_cancellable);
  g_clear_object (&self->info_cancellable);
  if (clip != NULL && !fw_clip_get_missing (clip))
    {
      /* the facts need the clip's rate and length; a long file's first read takes a
       * moment, so it happens off the main thread */
      InfoJob *job = g_new0 (InfoJob, 1);
      g_autoptr (GTask) task = NULL;

      self->info_cancellable = g_cancellable_new ();
      self->info_pending = TRUE;
      task = g_task_new (self, self->info_cancellable, on_info_read, NULL);
      job->clip = g_object_ref (clip);
      g_task_set_source_tag (task, fw_params_editor_set_clip);
      g_task_set_task_data (task, job, (GDestroyNotify) info_job_free);
      g_task_run_in_thread (task, info_thread);
    }
  /* ms fields depend on the rate: show the applied values again in the new context */
  load_fields (self);
}

gboolean
fw_params_editor_is_busy (FwParamsEditor *self)
{
  g_return_val_if_fail (FW_IS_PARAMS_EDITOR (self), FALSE);
  return self->info_pending;
}

GtkWidget *
fw_params_editor_get_field (FwParamsEditor *self, const char *key)
{
  Field *f;

  g_return_val_if_fail (FW_IS_PARAMS_EDITOR (self), NULL);
  f = find_field (self, key);
  return f != NULL ? f->widget : NULL;
}

const char *
fw_params_editor_get_field_message (FwParamsEditor *self, const char *key)
{
  Field *f;

  g_return_val_if_fail (FW_IS_PARAMS_EDITOR (self), NULL);
  f = find_field (self, key);
  return f != NULL ? f->message_text : NULL;
}

const char *
fw_params_editor_get_fact (FwParamsEditor *self, const char *id)
{
  GtkLabel *label;

  g_return_val_if_fail (FW_IS_PARAMS_EDITOR (self), NULL);
  label = g_hash_table_lookup (self->fact_labels, id);
  return label != NULL ? gtk_label_get_text (label) : NULL;
}

static GtkWidget *
make_heading (const char *text)
{
  GtkWidget *label = gtk_label_new (text);

  gtk_label_set_xalign (GTK_LABEL (label), 0);
  gtk_widget_add_css_class (label, "heading");
  gtk_widget_add_css_class (label, "fw-editor-heading");
  return label;
}

static void
build_fields (FwParamsEditor *self)
{
  const char *group = NULL;
  GtkGrid *grid = NULL;
  int row = 0;

  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    {
      const FieldSpec *spec = &field_specs[i];
      Field *f = &self->fields[i];
      GtkWidget *label;
      GtkWidget *unit = NULL;
      g_autofree char *tooltip = NULL;
      const char *allowed = fw_params_key_allowed (spec->key);

      f->spec = spec;
      if (group == NULL || strcmp (group, spec->group) != 0)
        {
          group = spec->group;
          gtk_box_append (self->fields_box, make_heading (_(group)));
          grid = GTK_GRID (gtk_grid_new ());
          gtk_grid_set_column_spacing (grid, 8);
          gtk_grid_set_row_spacing (grid, 2);
          gtk_box_append (self->fields_box, GTK_WIDGET (grid));
          row = 0;
        }

      label = gtk_label_new (_(spec->label));
      gtk_label_set_xalign (GTK_LABEL (label), 1);
      gtk_widget_set_size_request (label, 118, -1);
      gtk_label_set_wrap (GTK_LABEL (label), TRUE);
      gtk_label_set_justify (GTK_LABEL (label), GTK_JUSTIFY_RIGHT);

      switch (spec->kind)
        {
        case FIELD_SWITCH:
          f->widget = gtk_switch_new ();
          gtk_widget_set_halign (f->widget, GTK_ALIGN_START);
          g_signal_connect (f->widget, "notify::active", G_CALLBACK (on_choice_changed), self);
          break;
        case FIELD_CHOICE:
          {
            GtkStringList *list = choices_for (spec->key);
            f->widget = gtk_drop_down_new (G_LIST_MODEL (list), NULL);
            gtk_widget_set_hexpand (f->widget, TRUE);
            g_signal_connect (f->widget, "notify::selected", G_CALLBACK (on_choice_changed), self);
            break;
          }
        case FIELD_DURATION:
        case FIELD_ENTRY:
        default:
          {
            GtkEventController *focus = gtk_event_controller_focus_new ();
            f->widget = gtk_entry_new ();
            gtk_editable_set_width_chars (GTK_EDITABLE (f->widget), 8);
            gtk_widget_set_hexpand (f->widget, TRUE);
            g_signal_connect_swapped (f->widget, "changed", G_CALLBACK (on_field_changed), self);
            g_signal_connect (f->widget, "activate", G_CALLBACK (on_entry_activate), self);
            g_signal_connect (focus, "leave", G_CALLBACK (on_focus_leave), self);
            gtk_widget_add_controller (f->widget, focus);
            break;
          }
        }

      if (spec->kind == FIELD_DURATION)
        {
          const char *units[] = { _("samples"), _("ms"), NULL };
          f->unit_choice = gtk_drop_down_new_from_strings (units);
          g_object_set_data (G_OBJECT (f->unit_choice), "fw-field", f);
          g_signal_connect (f->unit_choice, "notify::selected", G_CALLBACK (on_unit_changed), self);
          gtk_widget_set_tooltip_text (f->unit_choice, _("Type the value in samples or in milliseconds"));
          unit = f->unit_choice;
        }
      else if (spec->unit != NULL)
        {
          unit = gtk_label_new (_(spec->unit));
          gtk_label_set_xalign (GTK_LABEL (unit), 0);
          gtk_widget_add_css_class (unit, "dim-label");
        }

      tooltip = g_strdup_printf ("%s%s%s\n%s: %s", spec->hint != NULL ? _(spec->hint) : "",
                                 spec->hint != NULL ? "\n" : "",
                                 allowed != NULL ? allowed : "", _("Key"), spec->key);
      gtk_widget_set_tooltip_text (f->widget, tooltip);
      gtk_widget_set_tooltip_text (label, tooltip);
      gtk_label_set_mnemonic_widget (GTK_LABEL (label), f->widget);
      gtk_accessible_update_property (GTK_ACCESSIBLE (f->widget),
                                      GTK_ACCESSIBLE_PROPERTY_DESCRIPTION, tooltip, -1);

      gtk_grid_attach (grid, label, 0, row, 1, 1);
      gtk_grid_attach (grid, f->widget, 1, row, unit != NULL ? 1 : 2, 1);
      if (unit != NULL)
        gtk_grid_attach (grid, unit, 2, row, 1, 1);
      row++;

      if (spec->kind == FIELD_DURATION)
        {
          f->note = gtk_label_new ("");
          gtk_label_set_xalign (GTK_LABEL (f->note), 0);
          gtk_widget_add_css_class (f->note, "dim-label");
          gtk_widget_add_css_class (f->note, "caption");
          gtk_grid_attach (grid, f->note, 1, row++, 2, 1);
        }
      f->message = gtk_label_new ("");
      gtk_label_set_xalign (GTK_LABEL (f->message), 0);
      gtk_label_set_wrap (GTK_LABEL (f->message), TRUE);
      gtk_label_set_wrap_mode (GTK_LABEL (f->message), PANGO_WRAP_WORD_CHAR);
      gtk_label_set_max_width_chars (GTK_LABEL (f->message), 30);
      gtk_widget_add_css_class (f->message, "error");
      gtk_widget_add_css_class (f->message, "caption");
      gtk_widget_set_visible (f->message, FALSE);
      gtk_grid_attach (grid, f->message, 1, row++, 2, 1);
    }
}

static void
build_facts (FwParamsEditor *self)
{
  static const char *titles[] = {
    N_("Analysis rate"), N_("Window"), N_("Hop"), N_("Frame rate"), N_("Bin spacing"),
    N_("Noise bandwidth"), N_("Highest sidelobe"), N_("Mel bands"), N_("This clip"),
    N_("Feature size"), N_("Set hash"),
  };
  static const char *tips[] = {
    NULL, NULL, NULL, NULL, NULL,
    N_("Equivalent noise bandwidth of the window (Harris 1978)"),
    N_("Highest sidelobe of the window's spectrum relative to its main lobe"),
    NULL, NULL, NULL,
    N_("First 64 bits of SHA-256 of the canonical parameter text; embedded in exports"),
  };

  G_STATIC_ASSERT (G_N_ELEMENTS (titles) == G_N_ELEMENTS (fact_ids));
  for (guint i = 0; i < G_N_ELEMENTS (fact_ids); i++)
    {
      GtkWidget *name = gtk_label_new (_(titles[i]));
      GtkWidget *value = gtk_label_new ("—");

      gtk_label_set_xalign (GTK_LABEL (name), 1);
      gtk_label_set_yalign (GTK_LABEL (name), 0);
      gtk_widget_set_size_request (name, 118, -1);
      gtk_widget_add_css_class (name, "dim-label");
      gtk_label_set_xalign (GTK_LABEL (value), 0);
      gtk_label_set_wrap (GTK_LABEL (value), TRUE);
      gtk_label_set_wrap_mode (GTK_LABEL (value), PANGO_WRAP_WORD_CHAR);
      gtk_label_set_selectable (GTK_LABEL (value), TRUE);
      gtk_widget_set_hexpand (value, TRUE);
      gtk_widget_add_css_class (value, "fw-fact");
      if (tips[i] != NULL)
        {
          gtk_widget_set_tooltip_text (name, _(tips[i]));
          gtk_widget_set_tooltip_text (value, _(tips[i]));
        }
      gtk_grid_attach (self->facts_grid, name, 0, (int) i, 1, 1);
      gtk_grid_attach (self->facts_grid, value, 1, (int) i, 1, 1);
      g_hash_table_insert (self->fact_labels, (gpointer) fact_ids[i], value);
    }
}

static void
fw_params_editor_dispose (GObject *object)
{
  FwParamsEditor *self = FW_PARAMS_EDITOR (object);

  if (self->set != NULL)
    g_signal_handlers_disconnect_by_data (self->set, self);
  g_clear_object (&self->set);
  g_clear_object (&self->clip);
  if (self->info_cancellable != NULL)
    g_cancellable_cancel (self->info_cancellable);
  g_clear_object (&self->info_cancellable);
  g_clear_pointer (&self->params, fw_params_unref);
  g_clear_pointer (&self->candidate, fw_params_unref);
  gtk_widget_dispose_template (GTK_WIDGET (self), FW_TYPE_PARAMS_EDITOR);
  G_OBJECT_CLASS (fw_params_editor_parent_class)->dispose (object);
}

static void
fw_params_editor_finalize (GObject *object)
{
  FwParamsEditor *self = FW_PARAMS_EDITOR (object);

  for (guint i = 0; i < G_N_ELEMENTS (field_specs); i++)
    g_free (self->fields[i].message_text);
  g_hash_table_unref (self->fact_labels);
  G_OBJECT_CLASS (fw_params_editor_parent_class)->finalize (object);
}

static void
fw_params_editor_class_init (FwParamsEditorClass *klass)
{
  GObjectClass *object_class = G_OBJECT_CLASS (klass);
  GtkWidgetClass *widget_class = GTK_WIDGET_CLASS (klass);

  object_class->dispose = fw_params_editor_dispose;
  object_class->finalize = fw_params_editor_finalize;

  gtk_widget_class_set_template_from_resource (widget_class,
                                               "/org/framewise/Workbench/fw-params-editor.ui");
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, scrolled);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, title_label);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, status_label);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, fields_box);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, facts_grid);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, messages_box);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, edges_label);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, content_box);
  gtk_widget_class_bind_template_child (widget_class, FwParamsEditor, empty_label);

  gtk_widget_class_set_layout_manager_type (widget_class, GTK_TYPE_BIN_LAYOUT);
  gtk_widget_class_set_css_name (widget_class, "fwparamseditor");
}

static void
fw_params_editor_init (FwParamsEditor *self)
{
  self->fact_labels = g_hash_table_new (g_str_hash, g_str_equal);
  gtk_widget_init_template (GTK_WIDGET (self));
  build_fields (self);
  build_facts (self);
  update_title (self);
}

GtkWidget *
fw_params_editor_new (void)
{
  return g_object_new (FW_TYPE_PARAMS_EDITOR, NULL);
}
