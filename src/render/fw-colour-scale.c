/* fw-colour-scale.c: colour scales designed in CIELAB, and automatic value ranges.
 *
 * Colour conversions (used only to build the tables):
 *   CIELAB -> XYZ: CIE 15:2004 (CIE 1976 L*a*b*), reference white D65 X = 0.95047,
 *   Y = 1, Z = 1.08883; XYZ -> linear sRGB with the IEC 61966-2-1 matrix; sRGB transfer function
 *   of IEC 61966-2-1 (12.92 c below 0.0031308, 1.055 c^(1/2.4) - 0.055 above).
 */
#include "fw-config.h"

#include "fw-colour-scale.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include <glib/gi18n.h>

#include "fw-render-error.h"

typedef struct {
  double l0, l1;        /* lightness at the ends (sequential) or ends/centre (diverging) */
  double h0, h1;        /* hue angle in degrees at t = 0 and t = 1 (sequential), or negative
                         * and positive side (diverging) */
  double c0, c1, bump;  /* chroma: c0 + (c1 - c0) t + bump sin(pi t) (sequential);
                         * c1 * |s|^0.8 (diverging, s = 2t - 1) */
} Design;

struct _FwColourScale {
  const char *name;
  const char *description;
  FwColourScaleKind kind;
  Design design;
  uint8_t lut[FW_COLOUR_SCALE_SIZE * 3];
};

static FwColourScale scales[] = {
  { "kiln", N_("dark umber through brick and amber to pale cream"),
    FW_COLOUR_SCALE_SEQUENTIAL, { 8.0, 97.0, 20.0, 92.0, 25.0, 40.0, 45.0 }, { 0 } },
  { "tidewater", N_("deep navy through teal to pale aqua"),
    FW_COLOUR_SCALE_SEQUENTIAL, { 10.0, 97.0, 285.0, 190.0, 30.0, 14.0, 22.0 }, { 0 } },
  { "lichen", N_("dark spruce through moss to pale straw"),
    FW_COLOUR_SCALE_SEQUENTIAL, { 10.0, 96.0, 160.0, 95.0, 16.0, 30.0, 35.0 }, { 0 } },
  { "graphite", N_("greyscale from near black to near white"),
    FW_COLOUR_SCALE_SEQUENTIAL, { 5.0, 98.0, 0.0, 0.0, 0.0, 0.0, 0.0 }, { 0 } },
  { "seesaw", N_("diverging: blue below zero, neutral grey at zero, rust above"),
    FW_COLOUR_SCALE_DIVERGING, { 36.0, 96.0, 285.0, 45.0, 0.0, 50.0, 0.0 }, { 0 } },
};

/* ---- colour science ---- */

static const double white_x = 0.95047, white_y = 1.0, white_z = 1.08883;

static double
lab_finv (double t)
{
  const double d = 6.0 / 29.0;
  return t > d ? t * t * t : 3.0 * d * d * (t - 4.0 / 29.0);
}

static double
lab_f (double t)
{
  const double d = 6.0 / 29.0;
  return t > d * d * d ? cbrt (t) : t / (3.0 * d * d) + 4.0 / 29.0;
}

/* Lab -> linear sRGB (may be out of [0, 1]). */
static void
lab_to_linear_rgb (double l, double a, double b, double rgb[3])
{
  double fy = (l + 16.0) / 116.0;
  double fx = fy + a / 500.0;
  double fz = fy - b / 200.0;
  double x = white_x * lab_finv (fx);
  double y = white_y * lab_finv (fy);
  double z = white_z * lab_finv (fz);

  rgb[0] = 3.2406 * x - 1.5372 * y - 0.4986 * z;
  rgb[1] = -0.9689 * x + 1.8758 * y + 0.0415 * z;
  rgb[2] = 0.0557 * x - 0.2040 * y + 1.0570 * z;
}

static double
srgb_encode (double c)
{
  if (c <= 0.0031308)
    return 12.92 * c;
  return 1.055 * pow (c, 1.0 / 2.4) - 0.055;
}

static double
srgb_decode (double v)
{
  if (v <= 0.04045)
    return v / 12.92;
  return pow ((v + 0.055) / 1.055, 2.4);
}

static void
rgb8_to_lab (const uint8_t c[3], double lab[3])
{
  double r = srgb_decode (c[0] / 255.0), g = srgb_decode (c[1] / 255.0),
         b = srgb_decode (c[2] / 255.0);
  /* inverse of the IEC 61966-2-1 matrix */
  double x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  double y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  double z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  double fx = lab_f (x / white_x), fy = lab_f (y / white_y), fz = lab_f (z / white_z);

  lab[0] = 116.0 * fy - 16.0;
  lab[1] = 500.0 * (fx - fy);
  lab[2] = 200.0 * (fy - fz);
}

static gboolean
in_gamut (const double rgb[3])
{
  const double eps = 1e-9;
  return rgb[0] >= -eps && rgb[0] <= 1 + eps && rgb[1] >= -eps && rgb[1] <= 1 + eps
         && rgb[2] >= -eps && rgb[2] <= 1 + eps;
}

/* LCh -> sRGB with the chroma reduced (L* and hue kept) until the colour fits the gamut. */
static void
lch_to_srgb_clipped (double l, double c, double h_deg, double out[3], double lab_out[3])
{
  double h = h_deg * G_PI / 180.0;
  double rgb[3];
  double lo = 0.0, hi = c;

  lab_to_linear_rgb (l, c * cos (h), c * sin (h), rgb);
  if (!in_gamut (rgb))
    {
      for (int i = 0; i < 50; i++)
        {
          double mid = (lo + hi) / 2;
          lab_to_linear_rgb (l, mid * cos (h), mid * sin (h), rgb);
          if (in_gamut (rgb))
            lo = mid;
          else
            hi = mid;
        }
      c = lo;
      lab_to_linear_rgb (l, c * cos (h), c * sin (h), rgb);
    }
  for (int k = 0; k < 3; k++)
    out[k] = srgb_encode (CLAMP (rgb[k], 0.0, 1.0));
  lab_out[0] = l;
  lab_out[1] = c * cos (h);
  lab_out[2] = c * sin (h);
}

static double
lab_distance2 (const double a[3], const double b[3])
{
  double d0 = a[0] - b[0], d1 = a[1] - b[1], d2 = a[2] - b[2];
  return d0 * d0 + d1 * d1 + d2 * d2;
}

/* Among 8-bit colours within +-2 code values of c, the one closest (CIELAB distance) to target
 * whose L* exceeds min_l; keeps c when none qualifies. */
static void
nudge_above (uint8_t c[3], const double target[3], double min_l)
{
  uint8_t best[3] = { c[0], c[1], c[2] };
  double best_d = HUGE_VAL;

  for (int dr = -2; dr <= 2; dr++)
    for (int dg = -2; dg <= 2; dg++)
      for (int db = -2; db <= 2; db++)
        {
          int r = c[0] + dr, g = c[1] + dg, b = c[2] + db;
          uint8_t cand[3];
          double lab[3], d;
          if (r < 0 || r > 255 || g < 0 || g > 255 || b < 0 || b > 255)
            continue;
          cand[0] = (uint8_t) r;
          cand[1] = (uint8_t) g;
          cand[2] = (uint8_t) b;
          rgb8_to_lab (cand, lab);
          if (lab[0] <= min_l)
            continue;
          d = lab_distance2 (lab, target);
          if (d < best_d)
            {
              best_d = d;
              memcpy (best, cand, 3);
            }
        }
  memcpy (c, best, 3);
}

/* Largest chroma at (L*, hue) inside the sRGB gamut. */
static double
max_chroma (double l, double h_deg)
{
  double h = h_deg * G_PI / 180.0, lo = 0.0, hi = 160.0, rgb[3];

  for (int i = 0; i < 40; i++)
    {
      double mid = (lo + hi) / 2;
      lab_to_linear_rgb (l, mid * cos (h), mid * sin (h), rgb);
      if (in_gamut (rgb))
        lo = mid;
      else
        hi = mid;
    }
  return lo;
}

static void
build_lut (FwColourScale *s)
{
  const Design *d = &s->design;
  const int n = FW_COLOUR_SCALE_SIZE;
  double targets[FW_COLOUR_SCALE_SIZE][3];
  double L[FW_COLOUR_SCALE_SIZE], H[FW_COLOUR_SCALE_SIZE], C[FW_COLOUR_SCALE_SIZE];
  double cap[FW_COLOUR_SCALE_SIZE], smooth[FW_COLOUR_SCALE_SIZE];

  /* 1. The designed path in L*, C*, h. */
  for (int i = 0; i < n; i++)
    {
      double t = (double) i / (n - 1);
      if (s->kind == FW_COLOUR_SCALE_SEQUENTIAL)
        {
          L[i] = d->l0 + (d->l1 - d->l0) * t;
          C[i] = d->c0 + (d->c1 - d->c0) * t + d->bump * sin (G_PI * t);
          H[i] = d->h0 + (d->h1 - d->h0) * t;
          cap[i] = max_chroma (L[i], H[i]);
        }
      else
        {
          double sgn = 2.0 * t - 1.0, a = fabs (sgn);
          /* L* falls linearly from the neutral centre to both ends: equal at +-s */
          L[i] = d->l1 - (d->l1 - d->l0) * a;
          C[i] = d->c1 * pow (a, 0.8);
          H[i] = sgn < 0 ? d->h0 : d->h1;
          /* the same chroma on both sides: the smaller of the two gamut limits */
          cap[i] = MIN (max_chroma (L[i], d->h0), max_chroma (L[i], d->h1));
        }
    }

  /* 2. Sequential scales: keep chroma under 90 % of the gamut limit and smooth it, so that
   *    gamut corners do not show as bands; L* and hue are untouched. The diverging scale's
   *    design stays inside the gamut except at the extremes, where it is simply limited. */
  if (s->kind == FW_COLOUR_SCALE_SEQUENTIAL)
    {
      const int half = 12;
      for (int i = 0; i < n; i++)
        smooth[i] = MIN (C[i], 0.9 * cap[i]);
      for (int i = 0; i < n; i++)
        {
          double sum = 0;
          int cnt = 0;
          for (int j = MAX (0, i - half); j <= MIN (n - 1, i + half); j++)
            {
              sum += MIN (C[j], 0.9 * cap[j]);
              cnt++;
            }
          smooth[i] = sum / cnt;
        }
      for (int i = 0; i < n; i++)
        C[i] = MIN (smooth[i], cap[i]);
    }
  else
    for (int i = 0; i < n; i++)
      C[i] = MIN (C[i], cap[i]);

  /* 3. To 8-bit sRGB. */
  for (int i = 0; i < n; i++)
    {
      double rgb[3];
      lch_to_srgb_clipped (L[i], C[i], H[i], rgb, targets[i]);
      for (int k = 0; k < 3; k++)
        s->lut[3 * i + k] = (uint8_t) CLAMP ((int) floor (rgb[k] * 255.0 + 0.5), 0, 255);
    }

  if (s->kind == FW_COLOUR_SCALE_SEQUENTIAL)
    {
      /* Rounding to 8 bits may break strict monotonicity where L* steps are small; nudge. */
      double prev_l = -HUGE_VAL;
      for (int i = 0; i < FW_COLOUR_SCALE_SIZE; i++)
        {
          double lab[3];
          rgb8_to_lab (&s->lut[3 * i], lab);
          if (lab[0] <= prev_l + 0.02)
            {
              nudge_above (&s->lut[3 * i], targets[i], prev_l + 0.02);
              rgb8_to_lab (&s->lut[3 * i], lab);
            }
          prev_l = lab[0];
        }
    }
  else
    {
      /* The negative half rises in L* strictly towards the centre; each positive entry then
       * takes the 8-bit colour near its target whose L* best matches its mirror entry while
       * still falling strictly away from the centre. */
      double prev_l = -HUGE_VAL;
      for (int i = 0; i < n / 2; i++)
        {
          double lab[3];
          rgb8_to_lab (&s->lut[3 * i], lab);
          if (lab[0] <= prev_l + 0.02)
            {
              nudge_above (&s->lut[3 * i], targets[i], prev_l + 0.02);
              rgb8_to_lab (&s->lut[3 * i], lab);
            }
          prev_l = lab[0];
        }
      prev_l = -HUGE_VAL;
      for (int j = n - 1; j >= n / 2; j--)
        {
          double mirror[3], want[3];
          rgb8_to_lab (&s->lut[3 * (n - 1 - j)], mirror);
          memcpy (want, targets[j], sizeof want);
          want[0] = mirror[0];
          nudge_above (&s->lut[3 * j], want, prev_l + 0.02);
          {
            double lab[3];
            rgb8_to_lab (&s->lut[3 * j], lab);
            prev_l = lab[0];
          }
        }
    }
}

static void
ensure_tables (void)
{
  static gsize done = 0;

  if (g_once_init_enter (&done))
    {
      for (size_t i = 0; i < G_N_ELEMENTS (scales); i++)
        build_lut (&scales[i]);
      g_once_init_leave (&done, 1);
    }
}

const FwColourScale *
fw_colour_scale_get (const char *name)
{
  ensure_tables ();
  for (size_t i = 0; i < G_N_ELEMENTS (scales); i++)
    if (g_strcmp0 (name, scales[i].name) == 0)
      return &scales[i];
  return NULL;
}

const FwColourScale *const *
fw_colour_scale_list (size_t *n)
{
  static const FwColourScale *list[G_N_ELEMENTS (scales) + 1];
  static gsize done = 0;

  ensure_tables ();
  if (g_once_init_enter (&done))
    {
      for (size_t i = 0; i < G_N_ELEMENTS (scales); i++)
        list[i] = &scales[i];
      list[G_N_ELEMENTS (scales)] = NULL;
      g_once_init_leave (&done, 1);
    }
  if (n)
    *n = G_N_ELEMENTS (scales);
  return list;
}

const FwColourScale *
fw_colour_scale_default (FwColourScaleKind kind)
{
  return fw_colour_scale_get (kind == FW_COLOUR_SCALE_DIVERGING ? "seesaw" : "kiln");
}

char *
fw_colour_scale_names (void)
{
  GString *s = g_string_new (NULL);
  for (size_t i = 0; i < G_N_ELEMENTS (scales); i++)
    g_string_append_printf (s, "%s%s", i ? ", " : "", scales[i].name);
  return g_string_free (s, FALSE);
}

const char *
fw_colour_scale_get_name (const FwColourScale *scale)
{
  return scale->name;
}

const char *
fw_colour_scale_get_description (const FwColourScale *scale)
{
  return _(scale->description);
}

FwColourScaleKind
fw_colour_scale_get_kind (const FwColourScale *scale)
{
  return scale->kind;
}

const uint8_t *
fw_colour_scale_get_lut (const FwColourScale *scale)
{
  ensure_tables ();
  return scale->lut;
}

void
fw_colour_scale_rgb (const FwColourScale *scale, double t, double *r, double *g, double *b)
{
  const uint8_t *lut = fw_colour_scale_get_lut (scale);
  int i;

  if (!(t > 0))
    t = 0;
  if (t > 1)
    t = 1;
  i = (int) (t * (FW_COLOUR_SCALE_SIZE - 1) + 0.5);
  *r = lut[3 * i] / 255.0;
  *g = lut[3 * i + 1] / 255.0;
  *b = lut[3 * i + 2] / 255.0;
}

cairo_pattern_t *
fw_colour_scale_gradient (const FwColourScale *scale, double x0, double y0, double x1,
                          double y1)
{
  const uint8_t *lut = fw_colour_scale_get_lut (scale);
  cairo_pattern_t *p = cairo_pattern_create_linear (x0, y0, x1, y1);

  /* 86 stops (every third entry): piecewise-linear sRGB between table entries that differ by
   * well under one just-noticeable step; small in SVG and PDF. */
  for (int i = 0; i < FW_COLOUR_SCALE_SIZE; i += 3)
    cairo_pattern_add_color_stop_rgb (p, (double) i / (FW_COLOUR_SCALE_SIZE - 1),
                                      lut[3 * i] / 255.0, lut[3 * i + 1] / 255.0,
                                      lut[3 * i + 2] / 255.0);
  return p;
}

/* ---- value ranges ---- */

FwRangeRule
fw_range_rule_for_stage (FwStage stage)
{
  switch (stage)
    {
    case FW_STAGE_DB:
    case FW_STAGE_MEL_DB:
      return FW_RANGE_RULE_DB;
    case FW_STAGE_MFCC:
      return FW_RANGE_RULE_CEPSTRAL;
    case FW_STAGE_DELTA:
    case FW_STAGE_DELTA2:
      return FW_RANGE_RULE_SYMMETRIC;
    default:
      return FW_RANGE_RULE_PERCENTILE;
    }
}

FwColourScaleKind
fw_colour_scale_kind_for_stage (FwStage stage)
{
  FwRangeRule rule = fw_range_rule_for_stage (stage);
  return rule == FW_RANGE_RULE_SYMMETRIC || rule == FW_RANGE_RULE_CEPSTRAL
           ? FW_COLOUR_SCALE_DIVERGING
           : FW_COLOUR_SCALE_SEQUENTIAL;
}

static int
float_cmp (const void *a, const void *b)
{
  float x = *(const float *) a, y = *(const float *) b;
  return x < y ? -1 : x > y ? 1 : 0;
}

static double
sorted_percentile (const float *v, size_t n, double q)
{
  double pos = q * (double) (n - 1);
  size_t i = (size_t) floor (pos);
  double f = pos - (double) i;
  if (i + 1 >= n)
    return v[n - 1];
  return v[i] + f * (v[i + 1] - v[i]);
}

gboolean
fw_value_range_auto (const FwMatrix *m, FwRangeRule rule, double t0, double t1,
                     FwValueRange *out)
{
  size_t f0 = 0, f1, count = 0, stride;
  float *sample = NULL;
  size_t n_sample = 0;
  double vmin = HUGE_VAL, vmax = -HUGE_VAL;
  const size_t max_sample = (size_t) 1 << 20;

  g_return_val_if_fail (m != NULL && out != NULL, FALSE);

  f1 = m->n_frames;
  if (t1 > t0 && m->frame_times != NULL)
    {
      while (f0 < m->n_frames && m->frame_times[f0] < t0)
        f0++;
      f1 = f0;
      while (f1 < m->n_frames && m->frame_times[f1] <= t1)
        f1++;
      if (f1 == f0)
        {
          /* a range narrower than a frame: use the frame(s) nearest its middle */
          double mid = (t0 + t1) / 2;
          size_t best = 0;
          for (size_t t = 0; t < m->n_frames; t++)
            if (fabs (m->frame_times[t] - mid) < fabs (m->frame_times[best] - mid))
              best = t;
          f0 = best;
          f1 = MIN (best + 1, m->n_frames);
        }
    }
  count = (f1 - f0) * m->n_bins;
  if (count == 0)
    return FALSE;

  stride = count > max_sample ? (count + max_sample - 1) / max_sample : 1;
  sample = g_new (float, count / stride + 1);
  for (size_t i = 0; i < count; i++)
    {
      float v = m->data[f0 * m->n_bins + i];
      if (!isfinite (v))
        continue;
      if (rule == FW_RANGE_RULE_CEPSTRAL && m->n_bins > 1 && i % m->n_bins == 0)
        continue; /* c0 */
      vmin = MIN (vmin, v);
      vmax = MAX (vmax, v);
      if (i % stride == 0)
        sample[n_sample++] = rule == FW_RANGE_RULE_SYMMETRIC || rule == FW_RANGE_RULE_CEPSTRAL
                               ? fabsf (v)
                               : v;
    }
  if (n_sample == 0)
    {
      g_free (sample);
      return FALSE;
    }

  switch (rule)
    {
    case FW_RANGE_RULE_DB:
      qsort (sample, n_sample, sizeof (float), float_cmp);
      out->hi = vmax;
      out->lo = MAX (vmax - FW_RANGE_DB_SPAN, sorted_percentile (sample, n_sample, 0.01));
      break;
    case FW_RANGE_RULE_SYMMETRIC:
    case FW_RANGE_RULE_CEPSTRAL:
      {
        double a;
        qsort (sample, n_sample, sizeof (float), float_cmp);
        a = sorted_percentile (sample, n_sample, 0.99);
        if (!(a > 0))
          a = MAX (fabs (vmin), fabs (vmax));
        if (!(a > 0))
          a = 1.0;
        out->lo = -a;
        out->hi = a;
      }
      break;
    case FW_RANGE_RULE_PERCENTILE:
    default:
      qsort (sample, n_sample, sizeof (float), float_cmp);
      out->lo = sorted_percentile (sample, n_sample, 0.01);
      out->hi = sorted_percentile (sample, n_sample, 0.99);
      break;
    }
  g_free (sample);

  if (!(out->hi > out->lo))
    {
      double w = fabs (out->hi) > 0 ? fabs (out->hi) * 0.01 : 1.0;
      out->lo -= w;
      out->hi += w;
    }
  return TRUE;
}

void
fw_value_range_union (FwValueRange *acc, const FwValueRange *r)
{
  acc->lo = MIN (acc->lo, r->lo);
  acc->hi = MAX (acc->hi, r->hi);
}

gboolean
fw_value_range_parse (const char *text, FwValueRange *out, GError **error)
{
  const char *colon;
  char *end = NULL;
  g_autofree char *first = NULL;
  double lo, hi;

  colon = text ? strchr (text, ':') : NULL;
  if (colon == NULL)
    goto bad;
  first = g_strndup (text, (gsize) (colon - text));
  lo = g_ascii_strtod (first, &end);
  if (end == first || *end != '\0' || !isfinite (lo))
    goto bad;
  hi = g_ascii_strtod (colon + 1, &end);
  if (end == colon + 1 || *end != '\0' || !isfinite (hi))
    goto bad;
  if (!(hi > lo))
    {
      g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
                   _("Range \"%s\": MIN must be smaller than MAX"), text);
      return FALSE;
    }
  out->lo = lo;
  out->hi = hi;
  return TRUE;

bad:
  g_set_error (error, FW_RENDER_ERROR, FW_RENDER_ERROR_INVALID,
               _("Range \"%s\": expected MIN:MAX with two numbers, e.g. -80:0"),
               text ? text : "");
  return FALSE;
}
