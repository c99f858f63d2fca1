/* fw-feature-file.h: importing feature matrices written by other programs (NPY and CSV).
 *
 * NPY: format versions 1.0, 2.0 and 3.0; dtypes float32 and float64 in either byte order
 * ('<f4', '>f4', '<f8', '>f8', '=' for native); C or Fortran order; 1-D or 2-D (leading
 * dimensions of size 1, as from a batch axis, are dropped). CSV: comma, tab or semicolon
 * separated numbers, an optional header row (detected: a first row that is not all
 * numbers), an optional leading time column in seconds, '#' comment lines.
 *
 * The file's array is (rows, columns); the user declares which axis holds frames
 * (FW_FEATURE_AXES_FRAMES_BINS: rows are frames, as Framewise writes them). Frame times come
 * from a time column, or from hop_length / sample_rate (+ time_origin, the centre time of
 * frame 0), or are unknown: then the file is on "the same grid as the other side" and the
 * comparison code gives it the other side's frame times (fw_feature_file_adopt_grid).
 * Values must be finite: NaN or infinite values are an error that says how many and where.
 * The imported matrix has stage -1 and a coefficient-index bin axis (the file carries no
 * bin frequencies); fw_feature_file_adopt_grid can give it the other side's bin axis.
 */
#pragma once

#include <gio/gio.h>

#include "fw-matrix.h"

G_BEGIN_DECLS

#define FW_FEATURE_FILE_ERROR (fw_feature_file_error_quark ())
GQuark fw_feature_file_error_quark (void);

typedef enum {
  FW_FEATURE_FILE_ERROR_IO,          /* missing or unreadable (names the file and cause) */
  FW_FEATURE_FILE_ERROR_FORMAT,      /* malformed NPY header / CSV text: names what and where */
  FW_FEATURE_FILE_ERROR_UNSUPPORTED, /* a valid file Framewise does not read (dtype, 3-D) */
  FW_FEATURE_FILE_ERROR_NON_FINITE,  /* NaN or infinite values: how many, the first where */
  FW_FEATURE_FILE_ERROR_OPTIONS,     /* bad import options (names the option and value) */
} FwFeatureFileError;

typedef enum {
  FW_FEATURE_AXES_FRAMES_BINS, /* rows are frames (Framewise's own NPY/CSV) */
  FW_FEATURE_AXES_BINS_FRAMES, /* rows are bins: the array is transposed on import */
} FwFeatureAxes;

typedef enum {
  FW_FEATURE_TIME_COLUMN_AUTO, /* a header whose first name starts with "time" (or is "t") */
  FW_FEATURE_TIME_COLUMN_YES,
  FW_FEATURE_TIME_COLUMN_NO,
} FwFeatureTimeColumn;

typedef struct {
  FwFeatureAxes axes;
  double hop_length;          /* samples; 0 = unknown */
  double sample_rate;         /* Hz; 0 = unknown. Both known: frame t at origin + t*hop/rate */
  double time_origin;         /* centre of frame 0 in seconds (0 for centred framing) */
  FwFeatureTimeColumn time_column;  /* CSV only */
} FwFeatureFileOptions;

void fw_feature_file_options_init (FwFeatureFileOptions *options);
/* Text form for saved comparisons: "axes=bins-frames;hop=512;sample_rate=22050;origin=0;
 * time_column=auto" (any subset, ';' or blanks between items). Errors name the item. */
gboolean fw_feature_file_options_parse (const char *text, FwFeatureFileOptions *options,
                                        GError **error);
char *fw_feature_file_options_to_string (const FwFeatureFileOptions *options);
/* "frames-bins" / "bins-frames" */
const char *fw_feature_axes_name (FwFeatureAxes axes);
gboolean fw_feature_axes_from_name (const char *name, FwFeatureAxes *out);

typedef struct {
  FwMatrix *matrix;       /* frames x bins after the declared axis order */
  char *path;
  char *format;           /* "NPY 1.0" / "CSV" */
  char *dtype;            /* "<f4", "<f8", ... for NPY; "text" for CSV */
  gboolean fortran_order;
  gsize file_rows;        /* the array as stored (rows, columns; 1-D: n, 1) */
  gsize file_cols;
  gboolean has_times;     /* frame times are known (time column or hop + rate) */
  gboolean has_header;    /* CSV */
  gboolean has_time_column;
  char **column_names;    /* CSV header names of the value columns, or NULL */
} FwFeatureFile;

void fw_feature_file_free (FwFeatureFile *file);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (FwFeatureFile, fw_feature_file_free)

/* Reads by extension: .npy as NPY, anything else as CSV. options may be NULL (defaults). */
FwFeatureFile *fw_feature_file_read (const char *path, const FwFeatureFileOptions *options,
                                     GError **error);
FwFeatureFile *fw_feature_file_read_npy (const char *path, const FwFeatureFileOptions *options,
                                         GError **error);
FwFeatureFile *fw_feature_file_read_csv (const char *path, const FwFeatureFileOptions *options,
                                         GError **error);
/* Parsers over bytes in memory; `name` is used in messages. */
FwFeatureFile *fw_feature_file_parse_npy (const char *name, const guint8 *data, gsize length,
                                          const FwFeatureFileOptions *options, GError **error);
FwFeatureFile *fw_feature_file_parse_csv (const char *name, const char *text, gsize length,
                                          const FwFeatureFileOptions *options, GError **error);

/* Gives an imported matrix the other side's grid where the file says nothing:
 * without known times, frame t gets `other`'s frame time t (extended past its end with its
 * hop) and its hop; when the bin counts agree, the other side's bin axis. Returns a new
 * matrix (reference 1). adopted_times / adopted_bins (may be NULL) say what was taken. */
FwMatrix *fw_feature_file_adopt_grid (const FwFeatureFile *file, const FwMatrix *other,
                                      gboolean *adopted_times, gboolean *adopted_bins);

G_END_DECLS
