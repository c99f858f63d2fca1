/* fw-axis.c: axis mapping, Heckbert's nice numbers, tick sets and tick drawing. */
#include "fw-config.h"

#include "fw-axis.h"

#include <math.h>
#include <string.h>

#include <glib/gi18n.h>

/* ---- mapping ---- */

static const char *const scale_names[] = { "linear", "log", "mel", "bands" };

const char *
fw_axis_scale_name (FwAxisScale scale)
{
  g_return_val_if_fail ((unsigned) scale < G_N_ELEMENTS (scale_names), "linear");
  return scale_names[scale];
}

gboolean
fw_axis_scale_from_name (const char *name, FwAxisScale *out)
{
  /* "bands" is internal (mel-band matrices); users choose among the first three. */
  for (unsigned i = 0; i < 3; i++)
    if (g_strcmp0 (name, scale_names[i]) == 0)
      {
        *out = (FwAxisScale) i;
        return TRUE;
      }
  return FALSE;
}

static double
bands_forward (const FwAxis *axis, double hz)
{
  const double *c = axis->band_hz;
  size_t n = axis->n_bands, lo, hi;

  if (n == 1)
    return hz - c[0];
  if (hz <= c[0])
    return (hz - c[0]) / (c[1] - c[0]);
  if (hz >= c[n - 1])
    return (double) (n - 1) + (hz - c[n - 1]) / (c[n - 1] - c[n - 2]);
  lo = 0;
  hi = n - 1;
  while (hi - lo > 1)
    {
      size_t mid = (lo + hi) / 2;
      if (c[mid] <= hz)
        lo = mid;
      else
        hi = mid;
    }
  return (double) lo + (hz - c[lo]) / (c[hi] - c[lo]);
}

static double
bands_inverse (const FwAxis *axis, double index)
{
  const double *c = axis->band_hz;
  size_t n = axis->n_bands, k;
  double f;

  if (n == 1)
    return c[0] + index;
  if (index <= 0)
    return c[0] + index * (c[1] - c[0]);
  if (index >= (double) (n - 1))
    return c[n - 1] + (index - (double) (n - 1)) * (c[n - 1] - c[n - 2]);
  k = (size_t) floor (index);
  f = index - (double) k;
  return c[k] + f * (c[k + 1] - c[k]);
}

double
fw_axis_forward (const FwAxis *axis, double value)
{
  switch (axis->scale)
    {
    case FW_AXIS_LOG:
      return value > 0 ? log10 (value) : -HUGE_VAL;
    case FW_AXIS_MEL:
      return fw_hz_to_mel (axis->mel_scale, value);
    case FW_AXIS_BANDS:
      return bands_forward (axis, value);
    case FW_AXIS_LINEAR:
    default:
      return value;
    }
}

double
fw_axis_inverse (const FwAxis *axis, double u)
{
  switch (axis->scale)
    {
    case FW_AXIS_LOG:
      return pow (10.0, u);
    case FW_AXIS_MEL:
      return fw_mel_to_hz (axis->mel_scale, u);
    case FW_AXIS_BANDS:
      return bands_inverse (axis, u);
    case FW_AXIS_LINEAR:
    default:
      return u;
    }
}

static void
axis_setup (FwAxis *axis, FwAxisScale scale, FwMelScale mel, double v0, double v1, double p0,
            double p1)
{
  memset (axis, 0, sizeof *axis);
  axis->scale = scale;
  axis->mel_scale = mel;
  axis->v0 = v0;
  axis->v1 = v1;
  axis->p0 = p0;
  axis->p1 = p1;
  axis->u0 = fw_axis_forward (axis, v0);
  axis->u1 = fw_axis_forward (axis, v1);
}

void
fw_axis_init (FwAxis *axis, FwAxisScale scale, double v0, double v1, double p0, double p1)
{
  g_return_if_fail (axis != NULL);
  g_return_if_fail (scale != FW_AXIS_BANDS);
  if (scale == FW_AXIS_LOG)
    {
      g_return_if_fail (v0 > 0 && v1 > 0);
    }
  axis_setup (axis, scale, FW_MEL_SCALE_SLANEY, v0, v1, p0, p1);
}

void
fw_axis_init_mel (FwAxis *axis, FwMelScale mel_scale, double v0, double v1, double p0,
                  double p1)
{
  g_return_if_fail (axis != NULL);
  axis_setup (axis, FW_AXIS_MEL, mel_scale, v0, v1, p0, p1);
}

void
fw_axis_init_bands (FwAxis *axis, const double *band_hz, size_t n_bands, double i0, double i1,
                    double p0, double p1)
{
  g_return_if_fail (axis != NULL);
  g_return_if_fail (band_hz != NULL && n_bands >= 1);

  memset (axis, 0, sizeof *axis);
  axis->scale = FW_AXIS_BANDS;
  axis->band_hz = band_hz;
  axis->n_bands = n_bands;
  axis->p0 = p0;
  axis->p1 = p1;
  axis->u0 = i0;
  axis->u1 = i1;
  axis->v0 = bands_inverse (axis, i0);
  axis->v1 = bands_inverse (axis, i1);
}

double
fw_axis_value_to_pixel (const FwAxis *axis, double value)
{
  double u = fw_axis_forward (axis, value);

  if (axis->u1 == axis->u0)
    return axis->p0;
  return axis->p0 + (u - axis->u0) / (axis->u1 - axis->u0) * (axis->p1 - axis->p0);
}

double
fw_axis_pixel_to_value (const FwAxis *axis, double pixel)
{
  double u;

  if (axis->p1 == axis->p0)
    return axis->v0;
  u = axis->u0 + (pixel - axis->p0) / (axis->p1 - axis->p0) * (axis->u1 - axis->u0);
  return fw_axis_inverse (axis, u);
}

/* ---- Heckbert (Graphics Gems 1990, "Nice numbers for graph labels") ---- */

double
fw_nice_number (double x, bool round)
{
  double e, f, nf;

  g_return_val_if_fail (x > 0 && isfinite (x), 1.0);

  e = floor (log10 (x));
  f = x / pow (10.0, e); /* 1 <= f < 10 */
  if (round)
    nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
  else
    nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
  return nf * pow (10.0, e);
}

void
fw_nice_loose_labels (double min, double max, int n_ticks, FwNiceLabels *out)
{
  double range, d;

  g_return_if_fail (out != NULL);
  memset (out, 0, sizeof *out);
  if (n_ticks < 2)
    n_ticks = 2;
  if (max < min)
    {
      double t = min;
      min = max;
      max = t;
    }
  if (max == min)
    {
      /* Heckbert's method needs a range; widen a degenerate one symmetrically. */
      double w = min != 0 ? fabs (min) * 0.1 : 1.0;
      min -= w;
      max += w;
    }
  range = fw_nice_number (max - min, false);
  d = fw_nice_number (range / (n_ticks - 1), true);
  out->step = d;
  out->graph_min = floor (min / d) * d;
  out->graph_max = ceil (max / d) * d;
  out->n_frac = (int) MAX (-floor (log10 (d)), 0.0);
  out->n_ticks = (int) floor ((out->graph_max - out->graph_min) / d + 0.5) + 1;
}

/* ---- formatting ---- */

static void
replace_minus (char *buf, size_t size)
{
  /* U+2212 MINUS SIGN instead of a hyphen, for typeset-quality labels. */
  size_t len = strlen (buf);

  if (len > 0 && buf[0] == '-' && len + 3 < size)
    {
      memmove (buf + 3, buf + 1, len);
      buf[0] = (char) 0xE2;
      buf[1] = (char) 0x88;
      buf[2] = (char) 0x92;
    }
}

static void
format_number (double v, int n_frac, char *buf, size_t size)
{
  if (n_frac < 0)
    n_frac = 0;
  if (n_frac > 9)
    n_frac = 9;
  g_snprintf (buf, size, "%.*f", n_frac, v);
  /* "-0", "-0.0": print as zero */
  if (buf[0] == '-')
    {
      gboolean all_zero = TRUE;
      for (const char *p = buf + 1; *p; p++)
        if (*p >= '1' && *p <= '9')
          all_zero = FALSE;
      if (all_zero)
        memmove (buf, buf + 1, strlen (buf));
    }
  replace_minus (buf, size);
}

/* Decimals needed to print v exactly when v has one significant digit (c x 10^k). */
static int
decimals_for_single_digit (double v)
{
  double a = fabs (v);
  if (a == 0)
    return 0;
  return (int) MAX (0.0, -floor (log10 (a) + 1e-9));
}

FwTimeUnit
fw_time_unit_for_span (double t0, double t1)
{
  double span = fabs (t1 - t0);

  if (span >= 120.0)
    return FW_TIME_MIN_S;
  if (span < 1.0 && MAX (fabs (t0), fabs (t1)) < 10.0)
    return FW_TIME_MS;
  return FW_TIME_S;
}

void
fw_time_format (double t, FwTimeUnit unit, int n_frac, char *buf, size_t size)
{
  switch (unit)
    {
    case FW_TIME_MS:
      format_number (t * 1000.0, n_frac, buf, size);
      break;
    case FW_TIME_MIN_S:
      {
        gboolean neg = t < 0;
        double a = fabs (t);
        double scale = pow (10.0, n_frac > 0 ? n_frac : 0);
        double r = floor (a * scale + 0.5) / scale;
        long total = (long) floor (r);
        double frac = r - (double) total;
        long h = total / 3600, m = (total / 60) % 60, s = total % 60;
        char sec[16];

        if (n_frac > 0)
          g_snprintf (sec, sizeof sec, "%0*.*f", 3 + n_frac, n_frac, (double) s + frac);
        else
          g_snprintf (sec, sizeof sec, "%02ld", s);
        if (h > 0)
          g_snprintf (buf, size, "%s%ld:%02ld:%s", neg ? "-" : "", h, m, sec);
        else
          g_snprintf (buf, size, "%s%ld:%s", neg ? "-" : "", m, sec);
        replace_minus (buf, size);
      }
      break;
    case FW_TIME_S:
    default:
      format_number (t, n_frac, buf, size);
      break;
    }
}

const char *
fw_time_unit_axis_title (FwTimeUnit unit)
{
  switch (unit)
    {
    case FW_TIME_MS:
      return _("Time (ms)");
    case FW_TIME_MIN_S:
      return _("Time (min:s)");
    case FW_TIME_S:
    default:
      return _("Time (s)");
    }
}

void
fw_ticks_format (FwTicks *ticks, FwTickStyle style, double span_lo, double span_hi)
{
  double maxabs = 0;

  for (size_t i = 0; i < ticks->n; i++)
    maxabs = MAX (maxabs, fabs (ticks->ticks[i].value));

  switch (style)
    {
    case FW_TICK_INTEGER:
      ticks->unit[0] = '\0';
      for (size_t i = 0; i < ticks->n; i++)
        format_number (ticks->ticks[i].value, 0, ticks->ticks[i].label, FW_TICK_LABEL_MAX);
      break;

    case FW_TICK_FREQUENCY:
      {
        gboolean khz = maxabs >= 1000.0;
        double div = khz ? 1000.0 : 1.0;
        g_strlcpy (ticks->unit, khz ? "kHz" : "Hz", sizeof ticks->unit);
        for (size_t i = 0; i < ticks->n; i++)
          {
            double v = ticks->ticks[i].value / div;
            int nf = ticks->step > 0
                       ? (int) MAX (0.0, -floor (log10 (ticks->step / div) + 1e-9))
                       : decimals_for_single_digit (v);
            format_number (v, nf, ticks->ticks[i].label, FW_TICK_LABEL_MAX);
          }
      }
      break;

    case FW_TICK_TIME:
      {
        FwTimeUnit unit = fw_time_unit_for_span (span_lo, span_hi);
        int nf;

        if (unit == FW_TIME_MS)
          nf = ticks->step > 0 ? (int) MAX (0.0, -floor (log10 (ticks->step * 1000) + 1e-9)) : 0;
        else
          nf = ticks->step > 0 ? (int) MAX (0.0, -floor (log10 (ticks->step) + 1e-9)) : 0;
        if (unit == FW_TIME_MIN_S)
          nf = ticks->step >= 1.0 ? 0 : nf;
        g_strlcpy (ticks->unit, unit == FW_TIME_MS ? "ms" : unit == FW_TIME_S ? "s" : "min:s",
                   sizeof ticks->unit);
        for (size_t i = 0; i < ticks->n; i++)
          fw_time_format (ticks->ticks[i].value, unit, nf, ticks->ticks[i].label,
                          FW_TICK_LABEL_MAX);
      }
      break;

    case FW_TICK_NUMBER:
    default:
      ticks->unit[0] = '\0';
      for (size_t i = 0; i < ticks->n; i++)
        {
          int nf = ticks->step > 0 ? ticks->n_frac
                                   : decimals_for_single_digit (ticks->ticks[i].value);
          format_number (ticks->ticks[i].value, nf, ticks->ticks[i].label, FW_TICK_LABEL_MAX);
        }
      break;
    }
}

/* ---- tick sets ---- */

static double
time_step_min_s (double span, int target)
{
  /* Steps that read well on a clock face: seconds, then minutes, then hours. */
  static const double steps[] = { 1, 2, 5, 10, 15, 20, 30, 60, 120, 300, 600, 900, 1200, 1800,
                                  3600, 7200, 10800, 21600, 43200 };
  double want = span / MAX (target - 1, 1);

  for (size_t i = 0; i < G_N_ELEMENTS (steps); i++)
    if (steps[i] >= want)
      return steps[i];
  return fw_nice_number (want / 3600.0, true) * 3600.0;
}

void
fw_ticks_linear (double lo, double hi, int target, FwTickStyle style, FwTicks *out)
{
  double d;
  double scale = 1.0; /* the Heckbert step is computed in display units (ms for ms labels) */
  long k0;

  g_return_if_fail (out != NULL);
  memset (out, 0, sizeof *out);
  if (!isfinite (lo) || !isfinite (hi))
    return;
  if (hi < lo)
    {
      double t = lo;
      lo = hi;
      hi = t;
    }
  if (target < 2)
    target = 2;
  if (hi == lo)
    {
      out->n = 1;
      out->ticks[0].value = lo;
      fw_ticks_format (out, style, lo, hi);
      return;
    }

  if (style == FW_TICK_TIME && fw_time_unit_for_span (lo, hi) == FW_TIME_MIN_S)
    {
      d = time_step_min_s (hi - lo, target);
    }
  else
    {
      FwNiceLabels nl;
      if (style == FW_TICK_TIME && fw_time_unit_for_span (lo, hi) == FW_TIME_MS)
        scale = 1000.0;
      fw_nice_loose_labels (lo * scale, hi * scale, target, &nl);
      d = nl.step / scale;
      out->n_frac = nl.n_frac;
      if (style == FW_TICK_INTEGER && d < 1.0)
        {
          d = 1.0;
          out->n_frac = 0;
        }
    }
  out->step = d;

  k0 = (long) floor (lo / d);
  for (long k = k0; out->n < FW_TICKS_MAX; k++)
    {
      double v = (double) k * d;
      if (v > hi + 1e-9 * d)
        break;
      if (v < lo - 1e-9 * d)
        continue;
      if (fabs (v) < 1e-9 * d)
        v = 0.0;
      out->ticks[out->n++].value = v;
    }
  fw_ticks_format (out, style, lo, hi);
}

typedef struct {
  double value;
  int level;
} Candidate;

static int
candidate_cmp (gconstpointer a, gconstpointer b)
{
  const Candidate *x = a, *y = b;
  if (x->level != y->level)
    return x->level - y->level;
  return x->value < y->value ? -1 : x->value > y->value ? 1 : 0;
}

static int
tick_cmp (gconstpointer a, gconstpointer b)
{
  const FwTick *x = a, *y = b;
  return x->value < y->value ? -1 : x->value > y->value ? 1 : 0;
}

void
fw_ticks_candidates (const FwAxis *axis, double min_gap, bool dense, FwTickStyle style,
                     FwTicks *out)
{
  static const struct { double mult; int level; } mults[] = {
    { 1, 0 }, { 5, 1 }, { 2, 2 }, { 3, 3 }, { 4, 3 }, { 6, 3 }, { 7, 3 }, { 8, 3 }, { 9, 3 },
  };
  GArray *cands;
  double lo, hi, top_decade, low_decade;
  double plo, phi;

  g_return_if_fail (axis != NULL && out != NULL);
  memset (out, 0, sizeof *out);

  lo = MIN (axis->v0, axis->v1);
  hi = MAX (axis->v0, axis->v1);
  plo = MIN (axis->p0, axis->p1);
  phi = MAX (axis->p0, axis->p1);
  if (!(hi > 0) || !isfinite (lo) || !isfinite (hi))
    return;

  cands = g_array_new (FALSE, FALSE, sizeof (Candidate));
  if (lo <= 0 && axis->scale != FW_AXIS_LOG)
    {
      Candidate c = { 0.0, 0 };
      g_array_append_val (cands, c);
    }
  top_decade = floor (log10 (hi));
  low_decade = lo > 0 ? floor (log10 (lo)) : top_decade - 5;
  low_decade = MAX (low_decade, top_decade - 8);
  for (double e = low_decade; e <= top_decade; e += 1.0)
    for (size_t m = 0; m < G_N_ELEMENTS (mults); m++)
      {
        Candidate c;
        if (!dense && mults[m].level == 3)
          continue;
        c.value = mults[m].mult * pow (10.0, e);
        c.level = mults[m].level;
        if (c.value >= lo * (1 - 1e-12) && c.value <= hi * (1 + 1e-12))
          g_array_append_val (cands, c);
      }
  g_array_sort (cands, candidate_cmp);

  for (guint i = 0; i < cands->len && out->n < FW_TICKS_MAX; i++)
    {
      Candidate *c = &g_array_index (cands, Candidate, i);
      double p = fw_axis_value_to_pixel (axis, c->value);
      gboolean ok = isfinite (p) && p >= plo - 1e-6 && p <= phi + 1e-6;

      for (size_t j = 0; ok && j < out->n; j++)
        if (fabs (fw_axis_value_to_pixel (axis, out->ticks[j].value) - p) < min_gap)
          ok = FALSE;
      if (ok)
        out->ticks[out->n++].value = c->value;
    }
  g_array_free (cands, TRUE);
  qsort (out->ticks, out->n, sizeof (FwTick), tick_cmp);
  out->step = 0;
  out->n_frac = 0;
  fw_ticks_format (out, style, lo, hi);
}

/* ---- measuring and layout ---- */

void
fw_ticks_measure (cairo_t *cr, const FwTheme *theme, const FwTicks *ticks, bool horizontal,
                  double *out)
{
  PangoLayout *layout = fw_theme_layout (cr, theme, FW_TEXT_TICK, "");

  for (size_t i = 0; i < ticks->n; i++)
    {
      PangoRectangle ink, logical;
      pango_layout_set_text (layout, ticks->ticks[i].label, -1);
      pango_layout_get_extents (layout, &ink, &logical);
      /* along a horizontal axis labels sit side by side: their advance widths; stacked along a
       * vertical axis what must not touch is the ink (digits have no descenders) */
      out[i] = (double) (horizontal ? logical.width : ink.height) / PANGO_SCALE;
    }
  g_object_unref (layout);
}

void
fw_ticks_max_label_size (cairo_t *cr, const FwTheme *theme, const FwTicks *ticks,
                         double *width, double *height)
{
  double w[FW_TICKS_MAX], h[FW_TICKS_MAX];
  double mw = 0, mh = 0;

  fw_ticks_measure (cr, theme, ticks, TRUE, w);
  fw_ticks_measure (cr, theme, ticks, FALSE, h);
  for (size_t i = 0; i < ticks->n; i++)
    {
      mw = MAX (mw, w[i]);
      mh = MAX (mh, h[i]);
    }
  if (ticks->n == 0)
    fw_theme_text_size (cr, theme, FW_TEXT_TICK, "0", NULL, &mh);
  if (width)
    *width = mw;
  if (height)
    *height = mh;
}

gboolean
fw_ticks_overlap (cairo_t *cr, const FwTheme *theme, const FwAxis *axis, const FwTicks *ticks,
                  bool horizontal, double min_gap)
{
  double ext[FW_TICKS_MAX];
  struct { double p, e; } pos[FW_TICKS_MAX];
  size_t n = ticks->n;

  fw_ticks_measure (cr, theme, ticks, horizontal, ext);
  for (size_t i = 0; i < n; i++)
    {
      pos[i].p = fw_axis_value_to_pixel (axis, ticks->ticks[i].value);
      pos[i].e = ext[i];
    }
  /* insertion sort by pixel position (axes may run either way) */
  for (size_t i = 1; i < n; i++)
    for (size_t j = i; j > 0 && pos[j].p < pos[j - 1].p; j--)
      {
        double tp = pos[j].p, te = pos[j].e;
        pos[j].p = pos[j - 1].p;
        pos[j].e = pos[j - 1].e;
        pos[j - 1].p = tp;
        pos[j - 1].e = te;
      }
  for (size_t i = 1; i < n; i++)
    if (pos[i].p - pos[i - 1].p - (pos[i].e + pos[i - 1].e) / 2 < min_gap)
      return TRUE;
  return FALSE;
}

double
fw_axis_label_gap (const FwTheme *theme, bool horizontal)
{
  return theme->font_size[FW_TEXT_TICK] * (horizontal ? 1.0 : 0.4);
}

/* Drops ticks whose centred label would reach more than `overhang` beyond the pixel range. */
static void
filter_overhang (cairo_t *cr, const FwTheme *theme, const FwAxis *axis, FwTicks *ticks,
                 bool horizontal, double overhang)
{
  double ext[FW_TICKS_MAX];
  double plo = MIN (axis->p0, axis->p1), phi = MAX (axis->p0, axis->p1);
  size_t k = 0;

  fw_ticks_measure (cr, theme, ticks, horizontal, ext);
  for (size_t i = 0; i < ticks->n; i++)
    {
      double p = fw_axis_value_to_pixel (axis, ticks->ticks[i].value);
      if (p - ext[i] / 2 < plo - overhang - 1e-9 || p + ext[i] / 2 > phi + overhang + 1e-9)
        continue;
      ticks->ticks[k++] = ticks->ticks[i];
    }
  ticks->n = k;
}

/* Keeps every other tick until labels stop overlapping (last resort for tiny axes). */
static void
thin_until_clear (cairo_t *cr, const FwTheme *theme, const FwAxis *axis, FwTicks *ticks,
                  bool horizontal, double gap)
{
  while (ticks->n > 1 && fw_ticks_overlap (cr, theme, axis, ticks, horizontal, gap))
    {
      size_t k = 0;
      for (size_t i = 0; i < ticks->n; i += 2)
        ticks->ticks[k++] = ticks->ticks[i];
      ticks->n = k;
      if (ticks->step > 0)
        ticks->step *= 2;
    }
}

void
fw_axis_choose_ticks (cairo_t *cr, const FwTheme *theme, const FwAxis *axis,
                      FwTickStyle style, bool horizontal, double overhang, FwTicks *out)
{
  double length = fabs (axis->p1 - axis->p0);
  double fs = theme->font_size[FW_TEXT_TICK];
  double gap = fw_axis_label_gap (theme, horizontal);
  double lo = MIN (axis->v0, axis->v1), hi = MAX (axis->v0, axis->v1);

  g_return_if_fail (out != NULL);
  memset (out, 0, sizeof *out);

  if (axis->scale == FW_AXIS_LINEAR)
    {
      /* Every Heckbert density from 2 to 12 ticks; keep the clear set (no overlapping labels)
       * whose count is nearest the comfortable count for this length (ties: fewer ticks). */
      double desired = length / (horizontal ? 5.0 * fs : 3.5 * fs) + 1.0;
      double best_score = HUGE_VAL;
      FwTicks cand;

      for (int target = 2; target <= 12; target++)
        {
          double score;
          fw_ticks_linear (lo, hi, target, style, &cand);
          filter_overhang (cr, theme, axis, &cand, horizontal, overhang);
          if (cand.n == 0 || fw_ticks_overlap (cr, theme, axis, &cand, horizontal, gap))
            continue;
          score = fabs ((double) cand.n - desired) + (cand.n < 2 ? 10.0 : 0.0);
          if (score < best_score - 1e-9
              || (fabs (score - best_score) <= 1e-9 && cand.n < out->n))
            {
              best_score = score;
              *out = cand;
            }
        }
      if (out->n == 0)
        {
          fw_ticks_linear (lo, hi, 2, style, out);
          filter_overhang (cr, theme, axis, out, horizontal, overhang);
        }
    }
  else
    {
      /* Start from the widest label a candidate could have, then widen until clear. */
      double min_gap, label_w, label_h;
      FwTicks probe;
      bool dense = length > (horizontal ? 40.0 : 16.0) * fs;

      fw_ticks_candidates (axis, 0.0, dense, style, &probe);
      fw_ticks_max_label_size (cr, theme, &probe, &label_w, &label_h);
      min_gap = (horizontal ? label_w : label_h) + gap;
      min_gap = MAX (min_gap, (horizontal ? 3.0 : 1.8) * fs);
      for (int attempt = 0; attempt < 8; attempt++)
        {
          fw_ticks_candidates (axis, min_gap, dense, style, out);
          filter_overhang (cr, theme, axis, out, horizontal, overhang);
          if (!fw_ticks_overlap (cr, theme, axis, out, horizontal, gap))
            break;
          min_gap *= 1.4;
        }
    }
  thin_until_clear (cr, theme, axis, out, horizontal, gap);
  fw_ticks_format (out, style, lo, hi);
}

void
fw_axis_draw (cairo_t *cr, const FwTheme *theme, const FwAxis *axis, const FwTicks *ticks,
              FwEdge edge, double edge_pos, bool labels)
{
  double plo = MIN (axis->p0, axis->p1) - 1e-6, phi = MAX (axis->p0, axis->p1) + 1e-6;
  double tl = theme->tick_length;

  cairo_save (cr);
  fw_theme_set_source (cr, &theme->foreground);
  cairo_set_line_width (cr, theme->line_width);
  cairo_set_line_cap (cr, CAIRO_LINE_CAP_BUTT);
  for (size_t i = 0; i < ticks->n; i++)
    {
      double p = fw_axis_value_to_pixel (axis, ticks->ticks[i].value);
      if (!isfinite (p) || p < plo || p > phi)
        continue;
      switch (edge)
        {
        case FW_EDGE_LEFT:
          cairo_move_to (cr, edge_pos, p);
          cairo_line_to (cr, edge_pos - tl, p);
          break;
        case FW_EDGE_RIGHT:
          cairo_move_to (cr, edge_pos, p);
          cairo_line_to (cr, edge_pos + tl, p);
          break;
        case FW_EDGE_BOTTOM:
          cairo_move_to (cr, p, edge_pos);
          cairo_line_to (cr, p, edge_pos + tl);
          break;
        case FW_EDGE_TOP:
          cairo_move_to (cr, p, edge_pos);
          cairo_line_to (cr, p, edge_pos - tl);
          break;
        }
    }
  cairo_stroke (cr);

  if (labels)
    for (size_t i = 0; i < ticks->n; i++)
      {
        double p = fw_axis_value_to_pixel (axis, ticks->ticks[i].value);
        const char *text = ticks->ticks[i].label;
        if (!isfinite (p) || p < plo || p > phi)
          continue;
        switch (edge)
          {
          case FW_EDGE_LEFT:
            fw_theme_draw_text (cr, theme, FW_TEXT_TICK, text, edge_pos - tl - theme->pad, p,
                                FW_ALIGN_END, FW_ALIGN_CENTER, false);
            break;
          case FW_EDGE_RIGHT:
            fw_theme_draw_text (cr, theme, FW_TEXT_TICK, text, edge_pos + tl + theme->pad, p,
                                FW_ALIGN_START, FW_ALIGN_CENTER, false);
            break;
          case FW_EDGE_BOTTOM:
            fw_theme_draw_text (cr, theme, FW_TEXT_TICK, text, p, edge_pos + tl + theme->pad,
                                FW_ALIGN_CENTER, FW_ALIGN_START, false);
            break;
          case FW_EDGE_TOP:
            fw_theme_draw_text (cr, theme, FW_TEXT_TICK, text, p, edge_pos - tl - theme->pad,
                                FW_ALIGN_CENTER, FW_ALIGN_END, false);
            break;
          }
      }
  cairo_restore (cr);
}
