/* fw-diff.c: alignment, difference measures and the offset/lag/residual explanation.
 * See fw-diff.h for the definitions. */
#include "fw-diff.h"

#include <float.h>
#include <math.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

void
fw_diff_options_init (FwDiffOptions *options)
{
  memset (options, 0, sizeof *options);
  options->value_kind = FW_DIFF_VALUES_PLAIN;
  options->max_lag = FW_DIFF_DEFAULT_MAX_LAG;
  options->time_reference = -1;
  options->bin_reference = -1;
  options->log_range_db = FW_DIFF_DEFAULT_LOG_RANGE_DB;
}

/* ---- time and bin axes ------------------------------------------------------------------ */

static double
hop_of (const FwMatrix *m)
{
  if (m->hop_seconds > 0 && isfinite (m->hop_seconds))
    return m->hop_seconds;
  if (m->n_frames < 2)
    return 0;
  return (m->frame_times[m->n_frames - 1] - m->frame_times[0]) / (double) (m->n_frames - 1);
}

static bool
times_valid (const FwMatrix *m)
{
  if (m->frame_times == NULL)
    return false;
  for (size_t t = 0; t < m->n_frames; t++)
    {
      if (!isfinite (m->frame_times[t]))
        return false;
      if (t > 0 && !(m->frame_times[t] > m->frame_times[t - 1]))
        return false;
    }
  return true;
}

static double
time_tolerance (const FwMatrix *a, const FwMatrix *b)
{
  double ha = hop_of (a), hb = hop_of (b);
  double h = ha > 0 && hb > 0 ? fmin (ha, hb) : fmax (ha, hb);

  return h > 0 ? 1e-6 * h : 1e-9;
}

bool
fw_diff_time_overlap (const FwMatrix *a, const FwMatrix *b, double *start, double *end)
{
  double tol, s, e;

  if (a == NULL || b == NULL || a->n_frames == 0 || b->n_frames == 0
      || a->frame_times == NULL || b->frame_times == NULL)
    return false;
  tol = time_tolerance (a, b);
  s = fmax (a->frame_times[0], b->frame_times[0]);
  e = fmin (a->frame_times[a->n_frames - 1], b->frame_times[b->n_frames - 1]);
  if (s > e + tol)
    return false;
  if (start)
    *start = s;
  if (end)
    *end = fmax (s, e);
  return true;
}

/* Where one output coordinate samples a side: index j and weight w of index j + 1. */
typedef struct {
  size_t j;
  double w;
} Tap;

/* Brackets x in the increasing array v[0..n-1] (x inside [v0 - tol, v[n-1] + tol]). */
static Tap
bracket (const double *v, size_t n, double x, double tol, size_t *hint)
{
  Tap tap = { 0, 0.0 };
  size_t j = *hint;

  if (n == 1 || x <= v[0] + tol)
    {
      tap.j = 0;
      return tap;
    }
  if (x >= v[n - 1] - tol)
    {
      tap.j = n - 1;
      *hint = n - 1;
      return tap;
    }
  if (j >= n - 1 || v[j] > x)
    j = 0;
  while (j + 1 < n && v[j + 1] <= x)
    j++;
  *hint = j;
  tap.j = j;
  if (fabs (x - v[j]) <= tol)
    return tap;
  if (fabs (v[j + 1] - x) <= tol)
    {
      tap.j = j + 1;
      return tap;
    }
  tap.w = (x - v[j]) / (v[j + 1] - v[j]);
  return tap;
}

static bool
is_spectral (FwBinAxisKind kind)
{
  return kind == FW_BIN_AXIS_HZ || kind == FW_BIN_AXIS_MEL_BAND;
}

static bool
same_bins (const FwMatrix *a, const FwMatrix *b)
{
  if (a->n_bins != b->n_bins || a->bin_kind != b->bin_kind)
    return false;
  if (a->bin_value == NULL || b->bin_value == NULL)
    return a->bin_value == b->bin_value;
  for (size_t k = 0; k < a->n_bins; k++)
    {
      double va = a->bin_value[k], vb = b->bin_value[k];
      if (fabs (va - vb) > 1e-9 * fmax (1.0, fmax (fabs (va), fabs (vb))))
        return false;
    }
  return true;
}

static bool
bins_increasing (const FwMatrix *m)
{
  if (m->bin_value == NULL)
    return false;
  for (size_t k = 0; k < m->n_bins; k++)
    if (!isfinite (m->bin_value[k]) || (k > 0 && !(m->bin_value[k] > m->bin_value[k - 1])))
      return false;
  return true;
}

static double
value_at (const FwMatrix *m, Tap ft, Tap bt)
{
  const float *r0 = m->data + ft.j * m->n_bins;
  double v0 = r0[bt.j];

  if (bt.w > 0)
    v0 = (1.0 - bt.w) * v0 + bt.w * r0[bt.j + 1];
  if (ft.w > 0)
    {
      const float *r1 = r0 + m->n_bins;
      double v1 = r1[bt.j];
      if (bt.w > 0)
        v1 = (1.0 - bt.w) * v1 + bt.w * r1[bt.j + 1];
      v0 = (1.0 - ft.w) * v0 + ft.w * v1;
    }
  return v0;
}

FwDspStatus
fw_diff_align (const FwMatrix *a, const FwMatrix *b, const FwDiffOptions *options,
               FwDiffAlignment *al, FwMatrix **a_out, FwMatrix **b_out)
{
  FwDiffOptions defaults;
  const FwMatrix *side[2] = { a, b };
  const FwMatrix *tr, *to, *br, *bo;
  Tap *ftap[2] = { NULL, NULL }, *btap[2] = { NULL, NULL };
  size_t n = 0, m = 0, *fidx = NULL, *bidx = NULL;
  double tol, start, end;
  FwMatrix *out[2] = { NULL, NULL };
  FwDspStatus status = FW_DSP_ERROR_INVALID_ARGUMENT;

  if (options == NULL)
    {
      fw_diff_options_init (&defaults);
      options = &defaults;
    }
  if (a == NULL || b == NULL || al == NULL || a_out == NULL || b_out == NULL)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  *a_out = *b_out = NULL;
  memset (al, 0, sizeof *al);
  if (a->n_frames == 0 || b->n_frames == 0 || a->n_bins == 0 || b->n_bins == 0
      || a->data == NULL || b->data == NULL || !times_valid (a) || !times_valid (b))
    return FW_DSP_ERROR_INVALID_ARGUMENT;

  al->a_frames = a->n_frames;
  al->a_bins = a->n_bins;
  al->b_frames = b->n_frames;
  al->b_bins = b->n_bins;
  al->a_hop = hop_of (a);
  al->b_hop = hop_of (b);
  al->a_start = a->frame_times[0];
  al->a_end = a->frame_times[a->n_frames - 1];
  al->b_start = b->frame_times[0];
  al->b_end = b->frame_times[b->n_frames - 1];

  if (!fw_diff_time_overlap (a, b, &start, &end))
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  tol = time_tolerance (a, b);

  /* ---- time ---- */
  if (options->time_reference == 0 || options->time_reference == 1)
    al->time_reference = options->time_reference;
  else
    al->time_reference = al->b_hop > al->a_hop * (1.0 + 1e-9) ? 1 : 0;
  tr = side[al->time_reference];
  to = side[1 - al->time_reference];

  fidx = malloc (sizeof *fidx * tr->n_frames);
  ftap[0] = malloc (sizeof (Tap) * tr->n_frames);
  ftap[1] = malloc (sizeof (Tap) * tr->n_frames);
  if (!fidx || !ftap[0] || !ftap[1])
    {
      status = FW_DSP_ERROR_NO_MEMORY;
      goto out;
    }
  {
    double hr = hop_of (tr), ho = hop_of (to);
    bool by_index = false;
    long shift = 0; /* other frame = reference frame - shift... computed below */

    /* Equal hops with origins a whole number of frames apart: match by index. */
    if ((hr == 0 && ho == 0) || (hr > 0 && fabs (hr - ho) <= 1e-9 * hr))
      {
        double q = hr > 0 ? (to->frame_times[0] - tr->frame_times[0]) / hr : 0.0;
        long k = lround (q);
        if (fabs (q - (double) k) <= 1e-6)
          {
            /* reference frame i <-> other frame i - k */
            by_index = true;
            for (size_t i = 0; i < tr->n_frames && by_index; i++)
              {
                long j = (long) i - k;
                if (j >= 0 && (size_t) j < to->n_frames
                    && fabs (tr->frame_times[i] - to->frame_times[j]) > tol)
                  by_index = false;
              }
            shift = k;
          }
      }

    size_t hint = 0;
    for (size_t i = 0; i < tr->n_frames; i++)
      {
        double t = tr->frame_times[i];
        Tap tap;
        if (by_index)
          {
            long j = (long) i - shift;
            if (j < 0 || (size_t) j >= to->n_frames)
              continue;
            tap.j = (size_t) j;
            tap.w = 0;
          }
        else
          {
            if (t < start - tol || t > end + tol)
              continue;
            tap = bracket (to->frame_times, to->n_frames, t, tol, &hint);
          }
        fidx[n] = i;
        ftap[al->time_reference][n] = (Tap) { i, 0.0 };
        ftap[1 - al->time_reference][n] = tap;
        if (tap.w > 0)
          al->time_resampled = true;
        n++;
      }
    if (n == 0)
      goto out;
    if (!al->time_resampled && !by_index)
      {
        /* every reference time fell on an other-side frame: still an index match */
        shift = (long) fidx[0] - (long) ftap[1 - al->time_reference][0].j;
      }
    if (!al->time_resampled)
      al->index_shift = al->time_reference == 0 ? -shift : shift;
    al->start = tr->frame_times[fidx[0]];
    al->end = tr->frame_times[fidx[n - 1]];
    for (int s = 0; s < 2; s++)
      {
        size_t unused = 0;
        for (size_t t = 0; t < side[s]->n_frames; t++)
          if (side[s]->frame_times[t] < al->start - tol || side[s]->frame_times[t] > al->end + tol)
            unused++;
        if (s == 0)
          al->a_unused_frames = unused;
        else
          al->b_unused_frames = unused;
      }
  }

  /* ---- bins ---- */
  if (options->bin_reference == 0 || options->bin_reference == 1)
    al->bin_reference = options->bin_reference;
  else
    al->bin_reference = b->n_bins < a->n_bins ? 1 : 0;
  br = side[al->bin_reference];
  bo = side[1 - al->bin_reference];
  bidx = malloc (sizeof *bidx * br->n_bins);
  btap[0] = malloc (sizeof (Tap) * (a->n_bins > b->n_bins ? a->n_bins : b->n_bins));
  btap[1] = malloc (sizeof (Tap) * (a->n_bins > b->n_bins ? a->n_bins : b->n_bins));
  if (!bidx || !btap[0] || !btap[1])
    {
      status = FW_DSP_ERROR_NO_MEMORY;
      goto out;
    }
  if (same_bins (a, b))
    al->bin_mapping = FW_DIFF_BINS_SAME;
  else if (is_spectral (a->bin_kind) && is_spectral (b->bin_kind) && bins_increasing (a)
           && bins_increasing (b))
    al->bin_mapping = FW_DIFF_BINS_HZ;
  else if (a->bin_kind == b->bin_kind)
    al->bin_mapping = FW_DIFF_BINS_COMMON;
  else
    al->bin_mapping = FW_DIFF_BINS_BY_INDEX;

  if (al->bin_mapping == FW_DIFF_BINS_HZ)
    {
      const double *vr = br->bin_value, *vo = bo->bin_value;
      double lo = fmax (vr[0], vo[0]);
      double hi = fmin (vr[br->n_bins - 1], vo[bo->n_bins - 1]);
      double ftol = 1e-9 * fmax (1.0, fabs (hi));
      size_t hint = 0;

      for (size_t k = 0; k < br->n_bins; k++)
        {
          if (vr[k] < lo - ftol || vr[k] > hi + ftol)
            continue;
          bidx[m] = k;
          btap[al->bin_reference][m] = (Tap) { k, 0.0 };
          btap[1 - al->bin_reference][m] = bracket (vo, bo->n_bins, vr[k], ftol, &hint);
          m++;
        }
      if (m == 0)
        goto out;
      al->freq_low = vr[bidx[0]];
      al->freq_high = vr[bidx[m - 1]];
      {
        size_t unused_o = 0;
        for (size_t k = 0; k < bo->n_bins; k++)
          if (vo[k] < al->freq_low - ftol || vo[k] > al->freq_high + ftol)
            unused_o++;
        if (al->bin_reference == 0)
          {
            al->a_unused_bins = a->n_bins - m;
            al->b_unused_bins = unused_o;
          }
        else
          {
            al->b_unused_bins = b->n_bins - m;
            al->a_unused_bins = unused_o;
          }
      }
    }
  else
    {
      m = a->n_bins < b->n_bins ? a->n_bins : b->n_bins;
      for (size_t k = 0; k < m; k++)
        {
          bidx[k] = k;
          btap[0][k] = btap[1][k] = (Tap) { k, 0.0 };
        }
      al->a_unused_bins = a->n_bins - m;
      al->b_unused_bins = b->n_bins - m;
      if (is_spectral (br->bin_kind) && br->bin_value)
        {
          al->freq_low = br->bin_value[0];
          al->freq_high = br->bin_value[m - 1];
        }
    }

  /* ---- resample ---- */
  for (int s = 0; s < 2; s++)
    {
      FwMatrix *o = fw_matrix_new (n, m);
      if (o == NULL)
        {
          status = FW_DSP_ERROR_NO_MEMORY;
          goto out;
        }
      out[s] = o;
      for (size_t t = 0; t < n; t++)
        {
          float *row = o->data + t * m;
          for (size_t k = 0; k < m; k++)
            row[k] = (float) value_at (side[s], ftap[s][t], btap[s][k]);
          if (o->frame_times)
            o->frame_times[t] = tr->frame_times[fidx[t]];
        }
      for (size_t k = 0; k < m; k++)
        {
          size_t q = bidx[k];
          if (o->bin_value)
            o->bin_value[k] = br->bin_value ? br->bin_value[q] : (double) q;
          if (o->bin_low)
            o->bin_low[k] = br->bin_low ? br->bin_low[q] : (o->bin_value ? o->bin_value[k] : 0);
          if (o->bin_high)
            o->bin_high[k] = br->bin_high ? br->bin_high[q] : (o->bin_value ? o->bin_value[k] : 0);
        }
      o->bin_kind = al->bin_mapping == FW_DIFF_BINS_BY_INDEX ? side[s]->bin_kind : br->bin_kind;
      o->sample_rate = tr->sample_rate;
      o->hop_seconds = hop_of (tr);
      o->stage = side[s]->stage;
    }
  *a_out = out[0];
  *b_out = out[1];
  out[0] = out[1] = NULL;
  status = FW_DSP_OK;

out:
  for (int s = 0; s < 2; s++)
    {
      if (out[s])
        fw_matrix_unref (out[s]);
      free (ftap[s]);
      free (btap[s]);
    }
  free (fidx);
  free (bidx);
  return status;
}

/* ---- measures ---------------------------------------------------------------------------- */

static double
linear_floor (FwDiffValueKind kind, double amax, double range_db)
{
  double f = kind == FW_DIFF_VALUES_POWER ? pow (10.0, -range_db / 10.0)
                                          : pow (10.0, -range_db / 20.0);
  double floor = amax * f;
  return floor > 0 && isfinite (floor) ? floor : DBL_MIN;
}

static double
db_factor_of (FwDiffValueKind kind)
{
  return kind == FW_DIFF_VALUES_POWER ? 10.0 : kind == FW_DIFF_VALUES_AMPLITUDE ? 20.0 : 0.0;
}

static FwMatrix *
matrix_like (const FwMatrix *src)
{
  FwMatrix *m = fw_matrix_copy (src);
  if (m)
    {
      memset (m->data, 0, sizeof (float) * m->n_frames * m->n_bins);
      m->stage = -1;
    }
  return m;
}

void
fw_diff_result_free (FwDiffResult *r)
{
  if (r == NULL)
    return;
  if (r->a)
    fw_matrix_unref (r->a);
  if (r->b)
    fw_matrix_unref (r->b);
  if (r->diff)
    fw_matrix_unref (r->diff);
  if (r->ratio_db)
    fw_matrix_unref (r->ratio_db);
  if (r->relative)
    fw_matrix_unref (r->relative);
  if (r->residual)
    fw_matrix_unref (r->residual);
  free (r->bin_mean);
  free (r->bin_rms);
  free (r->bin_max_abs);
  free (r->frame_mean);
  free (r->frame_rms);
  free (r->frame_max_abs);
  free (r->expl.lag_rms);
  free (r->expl.bin_offset);
  free (r->expl.bin_scale);
  free (r);
}

/* RMS left after removing per-bin means of L_b[t] - L_a[t - s], over the shifted overlap. */
static double
lag_cost (const double *la, const double *lb, size_t n, size_t m, int s, double *sum,
          double *sumsq, double *first)
{
  size_t t0 = s > 0 ? (size_t) s : 0;
  size_t t1 = s < 0 ? n - (size_t) (-s) : n;
  size_t cnt = t1 - t0;
  double acc = 0;

  for (size_t k = 0; k < m; k++)
    {
      sum[k] = sumsq[k] = 0;
      first[k] = lb[t0 * m + k] - la[(t0 - s) * m + k];
    }
  for (size_t t = t0; t < t1; t++)
    {
      const double *rb = lb + t * m, *ra = la + (t - s) * m;
      for (size_t k = 0; k < m; k++)
        {
          double d = rb[k] - ra[k] - first[k];
          sum[k] += d;
          sumsq[k] += d * d;
        }
    }
  for (size_t k = 0; k < m; k++)
    {
      double v = sumsq[k] - sum[k] * sum[k] / (double) cnt;
      acc += v > 0 ? v : 0;
    }
  return sqrt (acc / ((double) cnt * (double) m));
}

static FwDspStatus
explain (FwDiffResult *r, const FwDiffOptions *opt)
{
  FwDiffExplanation *e = &r->expl;
  size_t n = r->n_frames, m = r->n_bins, nm = n * m;
  double *la = NULL, *lb = NULL, *sum = NULL, *sumsq = NULL, *first = NULL;
  double scale_max = 0;
  int L;
  FwDspStatus status = FW_DSP_ERROR_NO_MEMORY;

  e->in_db = r->value_kind != FW_DIFF_VALUES_PLAIN;
  e->db_factor = db_factor_of (r->value_kind);
  la = malloc (sizeof (double) * nm);
  lb = malloc (sizeof (double) * nm);
  sum = malloc (sizeof (double) * m);
  sumsq = malloc (sizeof (double) * m);
  first = malloc (sizeof (double) * m);
  e->bin_offset = calloc (m, sizeof (double));
  if (!la || !lb || !sum || !sumsq || !first || !e->bin_offset)
    goto out;

  e->identical = true;
  for (size_t i = 0; i < nm; i++)
    {
      double va = r->a->data[i], vb = r->b->data[i];
      if (r->a->data[i] != r->b->data[i])
        e->identical = false;
      if (e->in_db)
        {
          va = e->db_factor * log10 (fmax (va, r->floor));
          vb = e->db_factor * log10 (fmax (vb, r->floor));
        }
      la[i] = va;
      lb[i] = vb;
      scale_max = fmax (scale_max, fmax (fabs (va), fabs (vb)));
    }
  {
    double acc = 0;
    for (size_t i = 0; i < nm; i++)
      acc += la[i] * la[i];
    e->value_rms = sqrt (acc / (double) nm);
  }
  /* float32 resolution of the data in decomposition units */
  e->precision = e->in_db ? e->db_factor * log10 (1.0 + 8.0 * FLT_EPSILON)
                          : 8.0 * FLT_EPSILON * scale_max;

  /* total, lag 0 */
  {
    double acc = 0, mx = 0;
    for (size_t i = 0; i < nm; i++)
      {
        double d = lb[i] - la[i];
        acc += d * d;
        mx = fmax (mx, fabs (d));
      }
    e->total_rms = sqrt (acc / (double) nm);
    e->total_max_abs = mx;
  }

  /* lag: least squares over shifts, after per-bin offsets */
  L = opt->max_lag > 0 ? opt->max_lag : 0;
  if (n < 3)
    L = 0;
  else if ((size_t) L > (n - 1) / 2)
    L = (int) ((n - 1) / 2);
  e->max_lag = L;
  e->lag_rms = malloc (sizeof (double) * (size_t) (2 * L + 1));
  if (!e->lag_rms)
    goto out;
  {
    int best = 0;
    for (int s = -L; s <= L; s++)
      e->lag_rms[s + L] = lag_cost (la, lb, n, m, s, sum, sumsq, first);
    for (int s = -L; s <= L; s++)
      if (e->lag_rms[s + L] < e->lag_rms[best + L])
        best = s;
    e->lag_frames = 0;
    if (best != 0 && e->lag_rms[best + L] < 0.5 * e->lag_rms[L])
      e->lag_frames = best;
  }

  /* offsets and residual at the chosen lag (two passes for accuracy) */
  {
    int s = e->lag_frames;
    size_t t0 = s > 0 ? (size_t) s : 0, t1 = s < 0 ? n - (size_t) (-s) : n;
    size_t cnt = t1 - t0;
    double total = 0, acc = 0, mx = 0;

    e->frames_used = cnt;
    for (size_t k = 0; k < m; k++)
      sum[k] = 0;
    for (size_t t = t0; t < t1; t++)
      for (size_t k = 0; k < m; k++)
        sum[k] += lb[t * m + k] - la[(t - s) * m + k];
    for (size_t k = 0; k < m; k++)
      {
        sum[k] /= (double) cnt;          /* per-bin mean */
        total += sum[k];
      }
    e->offset = total / (double) m;
    e->bin_offset_max_abs = 0;
    for (size_t k = 0; k < m; k++)
      {
        e->bin_offset[k] = sum[k] - e->offset;
        if (fabs (e->bin_offset[k]) > e->bin_offset_max_abs)
          {
            e->bin_offset_max_abs = fabs (e->bin_offset[k]);
            e->bin_offset_argmax = k;
          }
      }
    for (size_t t = t0; t < t1; t++)
      for (size_t k = 0; k < m; k++)
        {
          double res = lb[t * m + k] - la[(t - s) * m + k] - sum[k];
          r->residual->data[t * m + k] = (float) res;
          acc += res * res;
          if (fabs (res) > mx)
            {
              mx = fabs (res);
              e->residual_argmax_frame = t;
              e->residual_argmax_bin = k;
            }
        }
    e->residual_rms = sqrt (acc / ((double) cnt * (double) m));
    e->residual_max_abs = mx;

    e->has_lag = e->lag_frames != 0;
    e->has_offset = fabs (e->offset) > fmax (e->precision, 0.5 * e->residual_rms);
    e->has_bin_offset = e->bin_offset_max_abs > fmax (e->precision, e->residual_rms);

    /* per-bin factors, plain kinds */
    if (!e->in_db)
      {
        double sab = 0, saa = 0, acc2 = 0;
        bool any_not_one = false;

        e->bin_scale = malloc (sizeof (double) * m);
        if (!e->bin_scale)
          goto out;
        for (size_t k = 0; k < m; k++)
          {
            double ab = 0, aa = 0;
            for (size_t t = t0; t < t1; t++)
              {
                double va = la[(t - s) * m + k], vb = lb[t * m + k];
                ab += va * vb;
                aa += va * va;
              }
            e->bin_scale[k] = aa > 0 ? ab / aa : 1.0;
            if (fabs (e->bin_scale[k] - 1.0) > 1e-5)
              any_not_one = true;
            sab += ab;
            saa += aa;
            for (size_t t = t0; t < t1; t++)
              {
                double d = lb[t * m + k] - e->bin_scale[k] * la[(t - s) * m + k];
                acc2 += d * d;
              }
          }
        e->scale = saa > 0 ? sab / saa : 1.0;
        e->scale_residual_rms = sqrt (acc2 / ((double) cnt * (double) m));
        e->has_bin_scale = any_not_one && e->residual_rms > e->precision
                           && e->scale_residual_rms < 0.5 * e->residual_rms;
      }
  }
  status = FW_DSP_OK;

out:
  free (la);
  free (lb);
  free (sum);
  free (sumsq);
  free (first);
  return status;
}

FwDspStatus
fw_diff_compute (const FwMatrix *a, const FwMatrix *b, const FwDiffOptions *options,
                 FwDiffResult **out)
{
  FwDiffOptions defaults;
  FwDiffResult *r;
  FwDspStatus status;
  size_t n, m;

  if (out == NULL)
    return FW_DSP_ERROR_INVALID_ARGUMENT;
  *out = NULL;
  if (options == NULL)
    {
      fw_diff_options_init (&defaults);
      options = &defaults;
    }
  r = calloc (1, sizeof *r);
  if (r == NULL)
    return FW_DSP_ERROR_NO_MEMORY;
  r->value_kind = options->value_kind;
  status = fw_diff_align (a, b, options, &r->align, &r->a, &r->b);
  if (status != FW_DSP_OK)
    {
      fw_diff_result_free (r);
      return status;
    }
  n = r->n_frames = r->a->n_frames;
  m = r->n_bins = r->a->n_bins;

  status = FW_DSP_ERROR_NO_MEMORY;
  r->diff = matrix_like (r->a);
  r->residual = matrix_like (r->a);
  r->bin_mean = calloc (m, sizeof (double));
  r->bin_rms = calloc (m, sizeof (double));
  r->bin_max_abs = calloc (m, sizeof (double));
  r->frame_mean = calloc (n, sizeof (double));
  r->frame_rms = calloc (n, sizeof (double));
  r->frame_max_abs = calloc (n, sizeof (double));
  if (!r->diff || !r->residual || !r->bin_mean || !r->bin_rms || !r->bin_max_abs
      || !r->frame_mean || !r->frame_rms || !r->frame_max_abs)
    goto fail;

  {
    double sum = 0, sumsq = 0, mx = -1, sa = 0, sb = 0, saa = 0, sbb = 0;
    double amax = 0, bmax = 0, ma, mb, cov = 0, va = 0, vb = 0;
    size_t nm = n * m;

    for (size_t t = 0; t < n; t++)
      for (size_t k = 0; k < m; k++)
        {
          size_t i = t * m + k;
          double xa = r->a->data[i], xb = r->b->data[i], d = xb - xa, ad = fabs (d);
          r->diff->data[i] = (float) d;
          sum += d;
          sumsq += d * d;
          if (ad > mx)
            {
              mx = ad;
              r->max_frame = t;
              r->max_bin = k;
            }
          r->bin_mean[k] += d;
          r->bin_rms[k] += d * d;
          r->bin_max_abs[k] = fmax (r->bin_max_abs[k], ad);
          r->frame_mean[t] += d;
          r->frame_rms[t] += d * d;
          r->frame_max_abs[t] = fmax (r->frame_max_abs[t], ad);
          sa += xa;
          sb += xb;
          saa += xa * xa;
          sbb += xb * xb;
          amax = fmax (amax, fabs (xa));
          bmax = fmax (bmax, fabs (xb));
        }
    for (size_t k = 0; k < m; k++)
      {
        r->bin_mean[k] /= (double) n;
        r->bin_rms[k] = sqrt (r->bin_rms[k] / (double) n);
      }
    for (size_t t = 0; t < n; t++)
      {
        r->frame_mean[t] /= (double) m;
        r->frame_rms[t] = sqrt (r->frame_rms[t] / (double) m);
      }
    r->max_abs_diff = mx;
    r->mean_diff = sum / (double) nm;
    r->rms_diff = sqrt (sumsq / (double) nm);
    r->a_rms = sqrt (saa / (double) nm);
    r->b_rms = sqrt (sbb / (double) nm);
    r->a_max_abs = amax;
    r->b_max_abs = bmax;

    /* correlation, two-pass */
    ma = sa / (double) nm;
    mb = sb / (double) nm;
    for (size_t i = 0; i < nm; i++)
      {
        double da = r->a->data[i] - ma, db = r->b->data[i] - mb;
        cov += da * db;
        va += da * da;
        vb += db * db;
      }
    r->correlation = va > 0 && vb > 0 ? cov / sqrt (va * vb) : NAN;

    if (r->value_kind != FW_DIFF_VALUES_PLAIN)
      {
        double f = db_factor_of (r->value_kind);
        r->floor = linear_floor (r->value_kind, fmax (amax, bmax), options->log_range_db);
        r->ratio_db = matrix_like (r->a);
        r->relative = matrix_like (r->a);
        if (!r->ratio_db || !r->relative)
          goto fail;
        for (size_t i = 0; i < nm; i++)
          {
            double xa = r->a->data[i], xb = r->b->data[i];
            r->ratio_db->data[i] = (float) (f * log10 (fmax (xb, r->floor) / fmax (xa, r->floor)));
            r->relative->data[i] = (float) ((xb - xa) / fmax (fabs (xa), r->floor));
          }
      }
  }

  status = explain (r, options);
  if (status != FW_DSP_OK)
    goto fail;
  *out = r;
  return FW_DSP_OK;

fail:
  fw_diff_result_free (r);
  return status;
}

FwDspStatus
fw_diff_distance (const FwMatrix *a, const FwMatrix *b, const FwDiffOptions *options,
                  double *rms, double *max_abs, double *b_rms, double *affine_fraction,
                  size_t *n_frames, size_t *n_bins)
{
  FwDiffAlignment al;
  FwMatrix *aa = NULL, *bb = NULL;
  FwDspStatus status;
  size_t n, m;

  status = fw_diff_align (a, b, options, &al, &aa, &bb);
  if (status != FW_DSP_OK)
    return status;
  n = aa->n_frames;
  m = aa->n_bins;
  if (n_frames)
    *n_frames = n;
  if (n_bins)
    *n_bins = m;
  if (rms || max_abs || b_rms)
    {
      double acc = 0, mx = 0, bacc = 0;
      for (size_t i = 0; i < n * m; i++)
        {
          double d = (double) bb->data[i] - aa->data[i];
          acc += d * d;
          mx = fmax (mx, fabs (d));
          bacc += (double) bb->data[i] * bb->data[i];
        }
      if (rms)
        *rms = sqrt (acc / (double) (n * m));
      if (max_abs)
        *max_abs = mx;
      if (b_rms)
        *b_rms = sqrt (bacc / (double) (n * m));
    }
  if (affine_fraction)
    {
      double left = 0, var_b_total = 0;
      for (size_t k = 0; k < m; k++)
        {
          double ma = 0, mb = 0, sab = 0, saa = 0, sbb = 0;
          for (size_t t = 0; t < n; t++)
            {
              ma += aa->data[t * m + k];
              mb += bb->data[t * m + k];
            }
          ma /= (double) n;
          mb /= (double) n;
          for (size_t t = 0; t < n; t++)
            {
              double da = aa->data[t * m + k] - ma, db = bb->data[t * m + k] - mb;
              sab += da * db;
              saa += da * da;
              sbb += db * db;
            }
          var_b_total += sbb;
          if (saa > 0)
            {
              double v = sbb - sab * sab / saa;
              left += v > 0 ? v : 0;
            }
          else
            left += sbb;
        }
      *affine_fraction = var_b_total > 0 ? sqrt (left / var_b_total) : (left > 0 ? 1.0 : 0.0);
    }
  fw_matrix_unref (aa);
  fw_matrix_unref (bb);
  return FW_DSP_OK;
}
