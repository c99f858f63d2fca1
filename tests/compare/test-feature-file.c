/* test-feature-file.c: NPY and CSV import (fw-feature-file.c).
 *
 * NPY files written by numpy itself (np.save / np.lib.format.write_array, Debian's
 * /usr/bin/python3) in float32 and float64, little and big endian, C and Fortran order,
 * format versions 1.0 and 2.0; skipped with a message when numpy is missing. Malformed files
 * are made here byte by byte. The array values are v[r, c] = r * 1000 + c + 0.25, exact in
 * float32 for the sizes used, so every read value is checked exactly. */
#include "fw-config.h"

#include <glib/gstdio.h>

#include "fw-feature-file.h"
#include "fw-feature.h"
#include "fw-test-compare.h"

static char *tmp_dir;

static char *
tmp_path (const char *name)
{
  return g_build_filename (tmp_dir, name, NULL);
}

static double
expected (size_t r, size_t c)
{
  return (double) r * 1000.0 + (double) c + 0.25;
}

/* Checks m (frames x bins) against the stored array (rows x cols) read with `axes`. */
static void
check_values (const FwMatrix *m, size_t rows, size_t cols, FwFeatureAxes axes)
{
  if (axes == FW_FEATURE_AXES_FRAMES_BINS)
    {
      g_assert_cmpuint (m->n_frames, ==, rows);
      g_assert_cmpuint (m->n_bins, ==, cols);
      for (size_t r = 0; r < rows; r++)
        for (size_t c = 0; c < cols; c++)
          g_assert_cmpfloat (m->data[r * cols + c], ==, (float) expected (r, c));
    }
  else
    {
      g_assert_cmpuint (m->n_frames, ==, cols);
      g_assert_cmpuint (m->n_bins, ==, rows);
      for (size_t r = 0; r < rows; r++)
        for (size_t c = 0; c < cols; c++)
          g_assert_cmpfloat (m->data[c * rows + r], ==, (float) expected (r, c));
    }
}

static void
test_numpy_written (void)
{
  static const char *const dtypes[] = { "<f4", "<f8", ">f4", ">f8" };
  g_autofree char *script = NULL;

  if (!fw_cmp_have_numpy ())
    {
      g_test_skip ("/usr/bin/python3 with numpy is not available: NPY files written by numpy "
                   "are not tested");
      return;
    }
  /* numpy writes: every dtype x order, a version 2.0 file, a 1-D array, a batch axis, and
   * two arrays Framewise refuses (integers, 3-D) */
  script = g_strdup (
    "import numpy as np, os, sys\n"
    "d = sys.argv[1]\n"
    "r, c = np.meshgrid(np.arange(7), np.arange(5), indexing='ij')\n"
    "v = r * 1000.0 + c + 0.25\n"
    "for dt in ['<f4', '<f8', '>f4', '>f8']:\n"
    "    for order in 'CF':\n"
    "        a = np.array(v, dtype=dt, order=order)\n"
    "        name = 'v_%s_%s.npy' % (dt.replace('<', 'le').replace('>', 'be'), order)\n"
    "        np.save(os.path.join(d, name), a)\n"
    "with open(os.path.join(d, 'v2.npy'), 'wb') as f:\n"
    "    np.lib.format.write_array(f, np.asarray(v, dtype='<f4'), version=(2, 0))\n"
    "np.save(os.path.join(d, 'one.npy'), np.asarray(v[:, 0], dtype='<f8'))\n"
    "np.save(os.path.join(d, 'batch.npy'), np.asarray(v, dtype='<f4')[None, :, :])\n"
    "np.save(os.path.join(d, 'ints.npy'), np.arange(6, dtype='<i8').reshape(2, 3))\n"
    "np.save(os.path.join(d, 'cube.npy'), np.zeros((2, 3, 4), dtype='<f4'))\n");
  {
    const char *args[] = { "-c", script, tmp_dir, NULL };
    fw_cmp_run_python (args);
  }

  for (gsize i = 0; i < G_N_ELEMENTS (dtypes); i++)
    for (int o = 0; o < 2; o++)
      for (int axes = 0; axes < 2; axes++)
        {
          g_autofree char *dt = g_strdup (dtypes[i]);
          g_autofree char *name = NULL, *path = NULL;
          g_autoptr (FwFeatureFile) f = NULL;
          g_autoptr (GError) error = NULL;
          FwFeatureFileOptions opt;

          dt[0] = dt[0] == '<' ? 'l' : 'b';
          name = g_strdup_printf ("v_%ce%s_%c.npy", dt[0], dt + 1, o ? 'F' : 'C');
          path = tmp_path (name);
          fw_feature_file_options_init (&opt);
          opt.axes = axes ? FW_FEATURE_AXES_BINS_FRAMES : FW_FEATURE_AXES_FRAMES_BINS;
          f = fw_feature_file_read (path, &opt, &error);
          g_assert_no_error (error);
          g_assert_cmpstr (f->dtype, ==, dtypes[i]);
          g_assert_cmpint (f->fortran_order, ==, o);
          g_assert_cmpstr (f->format, ==, "NPY 1.0");
          check_values (f->matrix, 7, 5, opt.axes);
          g_assert_false (f->has_times);
        }

  {
    g_autofree char *path = tmp_path ("v2.npy");
    g_autoptr (GError) error = NULL;
    g_autoptr (FwFeatureFile) f = fw_feature_file_read (path, NULL, &error);
    g_assert_no_error (error);
    g_assert_cmpstr (f->format, ==, "NPY 2.0");
    check_values (f->matrix, 7, 5, FW_FEATURE_AXES_FRAMES_BINS);
  }
  {
    /* 1-D: n frames of one value */
    g_autofree char *path = tmp_path ("one.npy");
    g_autoptr (GError) error = NULL;
    g_autoptr (FwFeatureFile) f = fw_feature_file_read (path, NULL, &error);
    g_assert_no_error (error);
    check_values (f->matrix, 7, 1, FW_FEATURE_AXES_FRAMES_BINS);
    g_assert_cmpint (f->matrix->bin_kind, ==, FW_BIN_AXIS_SCALAR);
  }
  {
    /* (1, 7, 5): the batch axis of size 1 is dropped */
    g_autofree char *path = tmp_path ("batch.npy");
    g_autoptr (GError) error = NULL;
    g_autoptr (FwFeatureFile) f = fw_feature_file_read (path, NULL, &error);
    g_assert_no_error (error);
    check_values (f->matrix, 7, 5, FW_FEATURE_AXES_FRAMES_BINS);
  }
  {
    g_autofree char *path = tmp_path ("ints.npy");
    g_autoptr (GError) error = NULL;
    g_autoptr (FwFeatureFile) f = fw_feature_file_read (path, NULL, &error);
    g_assert_null (f);
    g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED);
    fw_cmp_assert_contains (error->message, "ints.npy");
    fw_cmp_assert_contains (error->message, "'<i8'");
  }
  {
    g_autofree char *path = tmp_path ("cube.npy");
    g_autoptr (GError) error = NULL;
    g_autoptr (FwFeatureFile) f = fw_feature_file_read (path, NULL, &error);
    g_assert_null (f);
    g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_UNSUPPORTED);
    fw_cmp_assert_contains (error->message, "cube.npy");
    fw_cmp_assert_contains (error->message, "(2, 3, 4)");
  }
}

/* An NPY 1.0 file made here: header dict text + raw data bytes. */
static GBytes *
make_npy (const char *dict, const void *data, gsize n)
{
  GByteArray *b = g_byte_array_new ();
  static const guint8 magic[] = { 0x93, 'N', 'U', 'M', 'P', 'Y', 1, 0 };
  gsize hl = strlen (dict) + 1;
  guint8 len[2];
  gsize pad = (64 - (10 + hl) % 64) % 64;

  hl += pad;
  len[0] = hl & 0xff;
  len[1] = (hl >> 8) & 0xff;
  g_byte_array_append (b, magic, sizeof magic);
  g_byte_array_append (b, len, 2);
  g_byte_array_append (b, (const guint8 *) dict, strlen (dict));
  for (gsize i = 0; i < pad; i++)
    g_byte_array_append (b, (const guint8 *) " ", 1);
  g_byte_array_append (b, (const guint8 *) "\n", 1);
  g_byte_array_append (b, data, n);
  return g_byte_array_free_to_bytes (b);
}

static void
expect_npy_error (GBytes *bytes, int code, const char *fragment)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwFeatureFile) f = NULL;
  gsize n;
  const guint8 *d = g_bytes_get_data (bytes, &n);

  f = fw_feature_file_parse_npy ("hive-dump.npy", d, n, NULL, &error);
  g_assert_null (f);
  g_assert_error (error, FW_FEATURE_FILE_ERROR, code);
  fw_cmp_assert_contains (error->message, "hive-dump.npy");
  fw_cmp_assert_contains (error->message, fragment);
  g_bytes_unref (bytes);
}

static void
test_npy_malformed (void)
{
  float v[6] = { 1, 2, 3, 4, 5, 6 };
  float bad[6] = { 1, 2, NAN, 4, INFINITY, 6 };

  /* a well-formed file made here reads back (the generator itself is right) */
  {
    g_autoptr (GBytes) ok = make_npy ("{'descr': '<f4', 'fortran_order': False, 'shape': (2, 3), }",
                                      v, sizeof v);
    g_autoptr (GError) error = NULL;
    gsize n;
    const guint8 *d = g_bytes_get_data (ok, &n);
    g_autoptr (FwFeatureFile) f = fw_feature_file_parse_npy ("ok.npy", d, n, NULL, &error);
    g_assert_no_error (error);
    g_assert_cmpuint (f->matrix->n_frames, ==, 2);
    g_assert_cmpfloat (f->matrix->data[5], ==, 6.0f);
  }
  expect_npy_error (g_bytes_new_static ("PK\3\4 not an npy file", 21), FW_FEATURE_FILE_ERROR_FORMAT,
                    "not an NPY file");
  /* data shorter than the shape needs */
  expect_npy_error (make_npy ("{'descr': '<f4', 'fortran_order': False, 'shape': (2, 3), }", v, 16),
                    FW_FEATURE_FILE_ERROR_FORMAT, "truncated");
  expect_npy_error (make_npy ("{'descr': '<i4', 'fortran_order': False, 'shape': (2, 3), }", v,
                              sizeof v),
                    FW_FEATURE_FILE_ERROR_UNSUPPORTED, "'<i4'");
  expect_npy_error (make_npy ("{'descr': '<f4', 'fortran_order': Maybe, 'shape': (2, 3), }", v,
                              sizeof v),
                    FW_FEATURE_FILE_ERROR_FORMAT, "malformed NPY header");
  expect_npy_error (make_npy ("{'descr': '<f4', 'shape': (2, 3), }", v, sizeof v),
                    FW_FEATURE_FILE_ERROR_FORMAT, "fortran_order");
  expect_npy_error (make_npy ("{'descr': '<f4', 'fortran_order': False, 'shape': (0, 3), }", v, 0),
                    FW_FEATURE_FILE_ERROR_FORMAT, "empty");
  expect_npy_error (make_npy ("{'descr': '<f4', 'fortran_order': False, 'shape': (2, 3), }", bad,
                              sizeof bad),
                    FW_FEATURE_FILE_ERROR_NON_FINITE, "2 values");
  {
    /* a header length beyond the file */
    guint8 raw[12] = { 0x93, 'N', 'U', 'M', 'P', 'Y', 1, 0, 0xff, 0x7f, '{', '}' };
    expect_npy_error (g_bytes_new (raw, sizeof raw), FW_FEATURE_FILE_ERROR_FORMAT, "truncated");
  }
  {
    guint8 raw[12] = { 0x93, 'N', 'U', 'M', 'P', 'Y', 9, 0, 2, 0, '{', '}' };
    expect_npy_error (g_bytes_new (raw, sizeof raw), FW_FEATURE_FILE_ERROR_UNSUPPORTED, "9.0");
  }
  /* missing file: names the file */
  {
    g_autoptr (GError) error = NULL;
    g_autofree char *path = tmp_path ("no-such-dump.npy");
    g_autoptr (FwFeatureFile) f = fw_feature_file_read (path, NULL, &error);
    g_assert_null (f);
    g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_IO);
    fw_cmp_assert_contains (error->message, "no-such-dump.npy");
  }
}

static FwFeatureFile *
csv (const char *text, const FwFeatureFileOptions *opt, GError **error)
{
  return fw_feature_file_parse_csv ("hive.csv", text, strlen (text), opt, error);
}

static void
test_csv (void)
{
  g_autoptr (GError) error = NULL;
  g_autoptr (FwFeatureFile) f = NULL;
  FwFeatureFileOptions opt;

  /* header + time column (as framewise-cli features writes it) */
  f = csv ("time_s,c0,c1,c2\n0,1.5,2,3\n0.01,4,5,6e-1\r\n0.02,-7,8,9\n\n", NULL, &error);
  g_assert_no_error (error);
  g_assert_true (f->has_header);
  g_assert_true (f->has_time_column);
  g_assert_true (f->has_times);
  g_assert_cmpuint (f->matrix->n_frames, ==, 3);
  g_assert_cmpuint (f->matrix->n_bins, ==, 3);
  g_assert_cmpfloat (f->matrix->data[0], ==, 1.5f);
  g_assert_cmpfloat (f->matrix->data[5], ==, 0.6f);
  g_assert_cmpfloat (f->matrix->data[6], ==, -7.0f);
  g_assert_cmpfloat (f->matrix->frame_times[2], ==, 0.02);
  g_assert_cmpfloat_with_epsilon (f->matrix->hop_seconds, 0.01, 1e-15);
  g_assert_cmpstr (f->column_names[1], ==, "c1");
  g_clear_pointer (&f, fw_feature_file_free);

  /* no header, tab separated, comments, bins x frames declared: transposed */
  fw_feature_file_options_init (&opt);
  opt.axes = FW_FEATURE_AXES_BINS_FRAMES;
  opt.hop_length = 256;
  opt.sample_rate = 16000;
  f = csv ("# two bins, three frames\n1\t2\t3\n4\t5\t6\n", &opt, &error);
  g_assert_no_error (error);
  g_assert_false (f->has_header);
  g_assert_cmpuint (f->matrix->n_frames, ==, 3);
  g_assert_cmpuint (f->matrix->n_bins, ==, 2);
  g_assert_cmpfloat (f->matrix->data[0 * 2 + 1], ==, 4.0f);  /* frame 0, bin 1 */
  g_assert_cmpfloat (f->matrix->data[2 * 2 + 0], ==, 3.0f);  /* frame 2, bin 0 */
  g_assert_cmpfloat_with_epsilon (f->matrix->frame_times[2], 2 * 256.0 / 16000.0, 1e-15);
  g_clear_pointer (&f, fw_feature_file_free);

  /* the time column forced on without a header */
  fw_feature_file_options_init (&opt);
  opt.time_column = FW_FEATURE_TIME_COLUMN_YES;
  f = csv ("0.5;1;2\n0.6;3;4\n", &opt, &error);
  g_assert_no_error (error);
  g_assert_cmpuint (f->matrix->n_bins, ==, 2);
  g_assert_cmpfloat (f->matrix->frame_times[1], ==, 0.6);
  g_clear_pointer (&f, fw_feature_file_free);

  /* errors name the file, the line and the cause */
  f = csv ("a,b\n1,2\n3\n", NULL, &error);
  g_assert_null (f);
  g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT);
  fw_cmp_assert_contains (error->message, "hive.csv: line 3 has 1 fields");
  g_clear_error (&error);
  f = csv ("1,2\n3,buzz\n", NULL, &error);
  g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT);
  fw_cmp_assert_contains (error->message, "line 2, column 2: 'buzz' is not a number");
  g_clear_error (&error);
  f = csv ("1,2\n3,nan\n", NULL, &error);
  g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_NON_FINITE);
  fw_cmp_assert_contains (error->message, "frame 1, bin 1");
  g_clear_error (&error);
  f = csv ("# nothing\n\n", NULL, &error);
  g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT);
  fw_cmp_assert_contains (error->message, "hive.csv: no rows");
  g_clear_error (&error);
  f = csv ("time,x\n0.2,1\n0.1,2\n", NULL, &error);
  g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_FORMAT);
  fw_cmp_assert_contains (error->message, "time column must increase");
  g_clear_error (&error);
  g_assert_null (f);
}

static void
test_roundtrip_with_writer (void)
{
  /* Framewise's own writer (fw_feature_write) -> reader, NPY and CSV */
  FwMatrix *m = fw_matrix_new (4, 3);
  g_autofree char *npy = tmp_path ("own.npy"), *csvp = tmp_path ("own.csv");
  g_autoptr (GError) error = NULL;
  g_autoptr (FwFeatureFile) a = NULL;
  g_autoptr (FwFeatureFile) b = NULL;

  for (size_t t = 0; t < 4; t++)
    {
      m->frame_times[t] = 0.5 * (double) t;
      for (size_t k = 0; k < 3; k++)
        m->data[t * 3 + k] = (float) expected (t, k) / 3.0f;
    }
  m->bin_kind = FW_BIN_AXIS_COEFFICIENT;
  for (size_t k = 0; k < 3; k++)
    m->bin_value[k] = (double) k;
  g_assert_true (fw_feature_write (m, npy, &error));
  g_assert_no_error (error);
  g_assert_true (fw_feature_write (m, csvp, &error));
  g_assert_no_error (error);
  a = fw_feature_file_read (npy, NULL, &error);
  g_assert_no_error (error);
  b = fw_feature_file_read (csvp, NULL, &error);
  g_assert_no_error (error);
  g_assert_true (b->has_time_column);
  for (size_t i = 0; i < 12; i++)
    {
      g_assert_cmpfloat (a->matrix->data[i], ==, m->data[i]);
      g_assert_cmpfloat (b->matrix->data[i], ==, m->data[i]); /* %.9g round-trips float32 */
    }
  g_assert_cmpfloat (b->matrix->frame_times[3], ==, 1.5);
  fw_matrix_unref (m);
}

static void
test_options_and_adopt (void)
{
  FwFeatureFileOptions o, back;
  g_autofree char *text = NULL;
  g_autoptr (GError) error = NULL;
  float v[6] = { 1, 2, 3, 4, 5, 6 };
  g_autoptr (GBytes) bytes = NULL;
  g_autoptr (FwFeatureFile) f = NULL;
  FwMatrix *other, *adopted;
  gboolean times, bins;
  gsize n;
  const guint8 *d;

  fw_feature_file_options_init (&o);
  o.axes = FW_FEATURE_AXES_BINS_FRAMES;
  o.hop_length = 160;
  o.sample_rate = 16000;
  o.time_origin = 0.0125;
  text = fw_feature_file_options_to_string (&o);
  g_assert_true (fw_feature_file_options_parse (text, &back, &error));
  g_assert_no_error (error);
  g_assert_cmpint (back.axes, ==, o.axes);
  g_assert_cmpfloat (back.hop_length, ==, 160);
  g_assert_cmpfloat (back.sample_rate, ==, 16000);
  g_assert_cmpfloat (back.time_origin, ==, 0.0125);
  g_assert_false (fw_feature_file_options_parse ("axes=sideways", &back, &error));
  g_assert_error (error, FW_FEATURE_FILE_ERROR, FW_FEATURE_FILE_ERROR_OPTIONS);
  fw_cmp_assert_contains (error->message, "sideways");
  g_clear_error (&error);
  g_assert_false (fw_feature_file_options_parse ("colour=blue", &back, &error));
  fw_cmp_assert_contains (error->message, "colour");
  g_clear_error (&error);

  /* a file without times adopts the other side's frame times and (same count) bin axis */
  bytes = make_npy ("{'descr': '<f4', 'fortran_order': False, 'shape': (2, 3), }", v, sizeof v);
  d = g_bytes_get_data (bytes, &n);
  f = fw_feature_file_parse_npy ("x.npy", d, n, NULL, &error);
  g_assert_no_error (error);
  other = fw_matrix_new (5, 3);
  for (size_t t = 0; t < 5; t++)
    other->frame_times[t] = 0.1 + 0.02 * (double) t;
  for (size_t k = 0; k < 3; k++)
    other->bin_value[k] = 100.0 * (double) k;
  other->bin_kind = FW_BIN_AXIS_HZ;
  other->hop_seconds = 0.02;
  adopted = fw_feature_file_adopt_grid (f, other, &times, &bins);
  g_assert_true (times);
  g_assert_true (bins);
  g_assert_cmpfloat (adopted->frame_times[1], ==, other->frame_times[1]);
  g_assert_cmpfloat (adopted->bin_value[2], ==, 200.0);
  g_assert_cmpint (adopted->bin_kind, ==, FW_BIN_AXIS_HZ);
  fw_matrix_unref (adopted);
  fw_matrix_unref (other);
}

int
main (int argc, char **argv)
{
  int status;
  g_autoptr (GError) error = NULL;

  g_test_init (&argc, &argv, NULL);
  tmp_dir = g_dir_make_tmp ("fw-test-feature-file-XXXXXX", &error);
  g_assert_no_error (error);
  g_test_add_func ("/fw/compare/feature-file/npy-written-by-numpy", test_numpy_written);
  g_test_add_func ("/fw/compare/feature-file/npy-malformed", test_npy_malformed);
  g_test_add_func ("/fw/compare/feature-file/csv", test_csv);
  g_test_add_func ("/fw/compare/feature-file/roundtrip-with-writer", test_roundtrip_with_writer);
  g_test_add_func ("/fw/compare/feature-file/options-and-adopt", test_options_and_adopt);
  status = g_test_run ();
  {
    /* remove the folder and what the tests wrote */
    GDir *dir = g_dir_open (tmp_dir, 0, NULL);
    const char *name;
    while (dir && (name = g_dir_read_name (dir)))
      {
        g_autofree char *p = tmp_path (name);
        g_unlink (p);
      }
    if (dir)
      g_dir_close (dir);
    g_rmdir (tmp_dir);
  }
  g_free (tmp_dir);
  return status;
}
