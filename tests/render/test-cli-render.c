/* test-cli-render.c: framewise-cli render and figure-recipe, run as a program ($FW_CLI).
 *
 * The clip is a WAV written here (libsndfile) into a temporary directory: 2 s of a 440 Hz tone
 * with a harmonic at 16 kHz sampling.
 */
#include "fw-config.h"

#include <math.h>
#include <string.h>

#include <glib.h>

#include "fw-test-render.h"
#include <glib/gstdio.h>
#include <sndfile.h>

#include "fw-param-set.h"
#include "fw-project.h"

static const char *cli;
static char *dir;
static char *wav;

typedef struct {
  int status;
  char *out;
  char *err;
} Run;

static void
run_clear (Run *r)
{
  g_free (r->out);
  g_free (r->err);
}

/* Runs framewise-cli with NULL-terminated arguments; returns the exit status. */
static int
run (Run *r, ...)
{
  GPtrArray *argv = g_ptr_array_new ();
  g_autoptr (GError) error = NULL;
  va_list ap;
  const char *a;
  int wait = 0;

  memset (r, 0, sizeof *r);
  g_ptr_array_add (argv, (gpointer) cli);
  va_start (ap, r);
  while ((a = va_arg (ap, const char *)) != NULL)
    g_ptr_array_add (argv, (gpointer) a);
  va_end (ap);
  g_ptr_array_add (argv, NULL);
  g_assert_true (g_spawn_sync (dir, (char **) argv->pdata, NULL, G_SPAWN_DEFAULT, NULL, NULL,
                               &r->out, &r->err, &wait, &error));
  g_assert_no_error (error);
  g_ptr_array_free (argv, TRUE);
  r->status = WIFEXITED (wait) ? WEXITSTATUS (wait) : -1;
  return r->status;
}

static void
write_wav (const char *path)
{
  SF_INFO info = { 0 };
  SNDFILE *f;
  short buf[32000];

  info.samplerate = 16000;
  info.channels = 1;
  info.format = SF_FORMAT_WAV | SF_FORMAT_PCM_16;
  for (int i = 0; i < 32000; i++)
    buf[i] = (short) lround (12000.0 * sin (2 * G_PI * 440.0 * i / 16000.0)
                             + 4000.0 * sin (2 * G_PI * 880.0 * i / 16000.0));
  f = sf_open (path, SFM_WRITE, &info);
  g_assert_nonnull (f);
  g_assert_cmpint (sf_write_short (f, buf, 32000), ==, 32000);
  sf_close (f);
}

static guint32
be32 (const guint8 *p)
{
  return ((guint32) p[0] << 24) | ((guint32) p[1] << 16) | ((guint32) p[2] << 8) | p[3];
}

static void
test_list_and_methods (void)
{
  Run r;

  g_assert_cmpint (run (&r, "render", "--list-colour-scales", NULL), ==, 0);
  for (const char *const *n = (const char *const[]) { "kiln", "tidewater", "lichen", "graphite",
                                                     "seesaw", NULL };
       *n; n++)
    g_assert_nonnull (strstr (r.out, *n));
  run_clear (&r);

  g_assert_cmpint (run (&r, "render", wav, "--set", "sample_rate=16000", "--methods", NULL), ==, 0);
  g_assert_nonnull (strstr (r.out, "16000 Hz"));
  run_clear (&r);
}

static void
test_svg_and_recipe (void)
{
  Run r, p1, p2;
  g_autofree char *hash_line = NULL;
  g_autofree char *recipe_file = g_build_filename (dir, "recipe.txt", NULL);
  g_autofree char *svg = g_build_filename (dir, "fig.svg", NULL);
  g_autofree char *svg_text = NULL;

  g_assert_cmpint (run (&r, "render", wav, "--set", "sample_rate=16000", "--set",
                        "window_length=1024", "--rows", "waveform,db,mel-db,mfcc", "-o", "fig.svg",
                        NULL),
                   ==, 0);
  g_assert_nonnull (strstr (r.out, "fig.svg"));
  run_clear (&r);
  g_assert_true (g_file_get_contents (svg, &svg_text, NULL, NULL));
  g_assert_nonnull (strstr (svg_text, "width=\"85mm\""));

  /* the recipe read back is a parameter file with the same canonical text and hash */
  g_assert_cmpint (run (&r, "figure-recipe", "fig.svg", NULL), ==, 0);
  g_assert_nonnull (strstr (r.out, "# rows: waveform, db, mel-db, mfcc"));
  g_assert_nonnull (strstr (r.out, "[framewise-parameters]"));
  g_assert_true (g_file_set_contents (recipe_file, r.out, -1, NULL));
  g_assert_cmpint (run (&p1, "params", "--params", "recipe.txt", NULL), ==, 0);
  g_assert_cmpint (run (&p2, "params", "--set", "sample_rate=16000", "--set", "window_length=1024",
                        NULL),
                   ==, 0);
  g_assert_cmpstr (p1.out, ==, p2.out);
  hash_line = g_strdup (strstr (p2.out, "hash: ") + strlen ("hash: "));
  *strchr (hash_line, '\n') = '\0';
  g_assert_nonnull (strstr (r.out, hash_line));
  run_clear (&r);
  run_clear (&p1);
  run_clear (&p2);
}

static void
test_png_and_pdf (void)
{
  Run r;
  g_autofree char *png = g_build_filename (dir, "fig.png", NULL);
  g_autofree char *data = NULL;
  gsize len;

  g_assert_cmpint (run (&r, "render", wav, "--set", "sample_rate=16000", "--rows", "db,delta",
                        "--width-mm", "85", "--height-mm", "60", "--dpi", "200", "--colour-scale",
                        "lichen", "--range", "locked", "--freq-scale", "log", "--start", "0.5",
                        "--end", "1.5", "-o", "fig.png", NULL),
                   ==, 0);
  run_clear (&r);
  g_assert_true (g_file_get_contents (png, &data, &len, NULL));
  /* round(85 / 25.4 * 200) = round(669.29) = 669; round(60 / 25.4 * 200) = round(472.44) = 472 */
  g_assert_cmpuint (be32 ((const guint8 *) data + 16), ==, 669);
  g_assert_cmpuint (be32 ((const guint8 *) data + 20), ==, 472);

  g_assert_cmpint (run (&r, "figure-recipe", "--raw", "fig.png", NULL), ==, 0);
  g_assert_nonnull (strstr (r.out, "start=0.5\n"));
  g_assert_nonnull (strstr (r.out, "end=1.5\n"));
  g_assert_nonnull (strstr (r.out, "frequency_scale=log\n"));
  g_assert_nonnull (strstr (r.out, "colour_scales=lichen;seesaw\n"));
  run_clear (&r);

  g_assert_cmpint (run (&r, "render", wav, "--set", "sample_rate=16000", "--width-mm", "double",
                        "--spectrum", "whole", "--title", "Tone", "-o", "fig.pdf", NULL),
                   ==, 0);
  g_assert_nonnull (strstr (r.out, "175 x"));
  run_clear (&r);
  g_assert_cmpint (run (&r, "figure-recipe", "fig.pdf", NULL), ==, 0);
  g_assert_nonnull (strstr (r.out, "[framewise-parameters]"));
  run_clear (&r);
}

static void
test_project_mode (void)
{
  g_autoptr (FwProject) project = fw_project_new ();
  g_autoptr (FwClip) clip = fw_clip_new (wav);
  g_autoptr (FwParams) base = fw_params_new_default ();
  g_autoptr (FwParams) params = NULL;
  g_autoptr (FwParamSet) set = NULL;
  g_autoptr (GError) error = NULL;
  g_autofree char *path = g_build_filename (dir, "test.fwproj", NULL);
  Run r;

  params = fw_params_with (base, "sample_rate", "16000", &error);
  g_assert_no_error (error);
  set = fw_param_set_new ("narrow-band", params);
  fw_clip_set_label (clip, "tone");
  fw_project_add_clip (project, clip);
  g_assert_true (fw_project_add_param_set (project, set, &error));
  g_assert_true (fw_project_save (project, path, &error));
  g_assert_no_error (error);

  g_assert_cmpint (run (&r, "render", "--project", "test.fwproj", "--clip", "1", "--params",
                        "narrow-band", "-o", "proj.svg", NULL),
                   ==, 0);
  run_clear (&r);
  g_assert_cmpint (run (&r, "figure-recipe", "proj.svg", NULL), ==, 0);
  g_assert_nonnull (strstr (r.out, "# parameter_set: narrow-band"));
  g_assert_nonnull (strstr (r.out, fw_params_get_hash (params)));
  run_clear (&r);

  g_assert_cmpint (run (&r, "render", "--project", "test.fwproj", "--clip", "1", "--params",
                        "wide-band", "-o", "proj.svg", NULL),
                   ==, 2);
  g_assert_nonnull (strstr (r.err, "wide-band"));
  g_assert_nonnull (strstr (r.err, "narrow-band"));
  run_clear (&r);
  g_assert_cmpint (run (&r, "render", "--project", "test.fwproj", "--clip", "7", "--params",
                        "narrow-band", "-o", "proj.svg", NULL),
                   ==, 2);
  g_assert_nonnull (strstr (r.err, "--clip 7"));
  run_clear (&r);
}

static void
test_errors (void)
{
  static const struct {
    const char *args[12];
    const char *expect[2];   /* substrings of the message */
  } cases[] = {
    { { "render", "CLIP", "--colour-scale", "rainbow", "-o", "x.svg" }, { "--colour-scale", "rainbow" } },
    { { "render", "missing.wav", "-o", "x.svg" }, { "missing.wav", NULL } },
    { { "render", "CLIP", "-o", "x.tiff" }, { "x.tiff", ".svg" } },
    { { "render", "CLIP", "--range", "5:1", "-o", "x.svg" }, { "--range", "5:1" } },
    { { "render", "CLIP", "--set", "sample_rate=16000", "--start", "99", "-o", "x.svg" }, { "--start", "99" } },
    { { "render", "CLIP", "--set", "sample_rate=16000", "--rows", "waveform,bogus", "-o", "x.svg" }, { "bogus", NULL } },
    { { "render", "CLIP", "--set", "sample_rate=16000", "--width-mm", "wide", "-o", "x.svg" }, { "--width-mm", "wide" } },
    { { "render", "CLIP", "--set", "sample_rate=16000", "--height-mm", "15", "-o", "x.svg" }, { "Height 15 mm", NULL } },
    { { "render", "CLIP", "--font", "Sans 200", "-o", "x.svg" }, { "--font", "200" } },
    { { "render", "CLIP", "--set", "bogus_key=1", "-o", "x.svg" }, { "bogus_key", NULL } },
    { { "render", "CLIP" }, { "-o OUT", NULL } },
    { { "figure-recipe", "CLIP" }, { "not an SVG, PDF or PNG", NULL } },
    { { "figure-recipe", "nothing-here.svg" }, { "nothing-here.svg", NULL } },
  };

  for (size_t i = 0; i < G_N_ELEMENTS (cases); i++)
    {
      GPtrArray *argv = g_ptr_array_new ();
      g_autoptr (GError) error = NULL;
      g_autofree char *out = NULL, *err = NULL;
      int wait;

      g_ptr_array_add (argv, (gpointer) cli);
      for (size_t k = 0; k < G_N_ELEMENTS (cases[i].args) && cases[i].args[k]; k++)
        g_ptr_array_add (argv, (gpointer) (strcmp (cases[i].args[k], "CLIP") == 0
                                             ? wav : cases[i].args[k]));
      g_ptr_array_add (argv, NULL);
      g_assert_true (g_spawn_sync (dir, (char **) argv->pdata, NULL, G_SPAWN_DEFAULT, NULL, NULL,
                                   &out, &err, &wait, &error));
      g_ptr_array_free (argv, TRUE);
      /* bad input: exit status 2 and a message naming what was wrong */
      if (!WIFEXITED (wait) || WEXITSTATUS (wait) != 2)
        g_error ("case %zu: exit status %d, stderr: %s", i, WEXITSTATUS (wait), err);
      for (size_t k = 0; k < 2; k++)
        if (cases[i].expect[k] && strstr (err, cases[i].expect[k]) == NULL)
          g_error ("case %zu: \"%s\" missing from the message: %s", i, cases[i].expect[k], err);
    }
}

int
main (int argc, char **argv)
{
  g_autoptr (GError) error = NULL;
  int status;

  g_test_init (&argc, &argv, NULL);
  cli = g_getenv ("FW_CLI");
  if (cli == NULL || !g_file_test (cli, G_FILE_TEST_IS_EXECUTABLE))
    {
      g_printerr ("FW_CLI must name the built framewise-cli\n");
      return 1;
    }
  dir = g_dir_make_tmp ("fw-cli-render-XXXXXX", &error);
  g_assert_no_error (error);
  wav = g_build_filename (dir, "tone.wav", NULL);
  write_wav (wav);

  g_test_add_func ("/fw/render/cli/list-and-methods", test_list_and_methods);
  g_test_add_func ("/fw/render/cli/svg-and-recipe", test_svg_and_recipe);
  g_test_add_func ("/fw/render/cli/png-and-pdf", test_png_and_pdf);
  g_test_add_func ("/fw/render/cli/project-mode", test_project_mode);
  g_test_add_func ("/fw/render/cli/errors", test_errors);
  status = g_test_run ();

  {
    GDir *d = g_dir_open (dir, 0, NULL);
    const char *name;
    while (d && (name = g_dir_read_name (d)))
      {
        g_autofree char *p = g_build_filename (dir, name, NULL);
        g_unlink (p);
      }
    if (d)
      g_dir_close (d);
    g_rmdir (dir);
  }
  g_free (wav);
  g_free (dir);
  return status;
}
