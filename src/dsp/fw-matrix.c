/* fw-matrix.c: reference-counted feature matrices. */
#include "fw-matrix.h"

#include <stdatomic.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* The public struct stores the count as a plain int so the header stays simple C; every
 * access goes through this atomic view of the same object (same size and alignment). */
static inline _Atomic int *
ref_count_atomic (FwMatrix *m)
{
  _Static_assert (sizeof (_Atomic int) == sizeof (int), "atomic int must have the size of int");
  return (_Atomic int *) &m->ref_count;
}

static void
matrix_free_storage (FwMatrix *m)
{
  free (m->data);
  free (m->frame_times);
  free (m->bin_value);
  free (m->bin_low);
  free (m->bin_high);
  free (m);
}

FwMatrix *
fw_matrix_new (size_t n_frames, size_t n_bins)
{
  FwMatrix *m;
  size_t cells;

  if (n_bins != 0 && n_frames > SIZE_MAX / sizeof (float) / n_bins)
    return NULL;
  cells = n_frames * n_bins;

  m = calloc (1, sizeof *m);
  if (m == NULL)
    return NULL;
  /* calloc(0) may return NULL; always ask for at least one element. */
  m->data = calloc (cells ? cells : 1, sizeof (float));
  m->frame_times = calloc (n_frames ? n_frames : 1, sizeof (double));
  m->bin_value = calloc (n_bins ? n_bins : 1, sizeof (double));
  m->bin_low = calloc (n_bins ? n_bins : 1, sizeof (double));
  m->bin_high = calloc (n_bins ? n_bins : 1, sizeof (double));
  if (!m->data || !m->frame_times || !m->bin_value || !m->bin_low || !m->bin_high)
    {
      matrix_free_storage (m);
      return NULL;
    }
  m->n_frames = n_frames;
  m->n_bins = n_bins;
  m->bin_kind = FW_BIN_AXIS_SCALAR;
  m->stage = -1;
  atomic_init (ref_count_atomic (m), 1);
  return m;
}

FwMatrix *
fw_matrix_ref (FwMatrix *m)
{
  if (m != NULL)
    atomic_fetch_add_explicit (ref_count_atomic (m), 1, memory_order_relaxed);
  return m;
}

void
fw_matrix_unref (FwMatrix *m)
{
  if (m == NULL)
    return;
  if (atomic_fetch_sub_explicit (ref_count_atomic (m), 1, memory_order_acq_rel) == 1)
    matrix_free_storage (m);
}

FwMatrix *
fw_matrix_copy (const FwMatrix *m)
{
  FwMatrix *c;

  if (m == NULL)
    return NULL;
  c = fw_matrix_new (m->n_frames, m->n_bins);
  if (c == NULL)
    return NULL;
  memcpy (c->data, m->data, m->n_frames * m->n_bins * sizeof (float));
  memcpy (c->frame_times, m->frame_times, m->n_frames * sizeof (double));
  memcpy (c->bin_value, m->bin_value, m->n_bins * sizeof (double));
  memcpy (c->bin_low, m->bin_low, m->n_bins * sizeof (double));
  memcpy (c->bin_high, m->bin_high, m->n_bins * sizeof (double));
  c->bin_kind = m->bin_kind;
  c->sample_rate = m->sample_rate;
  c->hop_seconds = m->hop_seconds;
  c->stage = m->stage;
  return c;
}

size_t
fw_matrix_bytes (const FwMatrix *m)
{
  if (m == NULL)
    return 0;
  return sizeof *m + m->n_frames * m->n_bins * sizeof (float)
         + m->n_frames * sizeof (double) + 3 * m->n_bins * sizeof (double);
}
