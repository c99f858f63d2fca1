/* fw-test-window.h: helpers for the window tests (display, demo window, waiting, pixels). */
#pragma once

#include <gtk/gtk.h>

#include "fw-application.h"
#include "fw-window-private.h"

G_BEGIN_DECLS

/* Initialises GTK; FALSE (after g_test_skip-ready message) when no display can be had.
 * Points the state file at a fresh temporary directory so tests never touch the user's. */
gboolean fw_test_gtk_init (void);

/* A registered application (non-unique) and a presented window on the demo project, sized
 * width x height, already settled (everything computed and drawn). */
FwWindow *fw_test_demo_window (int width, int height);

/* Iterates the main loop until cond(data) or timeout seconds pass; returns cond's last value. */
gboolean fw_test_wait (gboolean (*cond) (gpointer data), gpointer data, double timeout);
/* Until the window is settled and has drawn twice. */
gboolean fw_test_wait_settled (FwWindow *win, double timeout);
/* Runs the main loop for a while (lets frames be drawn). */
void fw_test_spin (double seconds);

/* Pixels of a texture as 0xAARRGGBB (premultiplied) words, row-major; caller frees. */
guint32 *fw_test_texture_pixels (GdkTexture *texture, int *width, int *height);
/* Number of distinct colours inside a rectangle of the pixels (clipped). */
guint fw_test_distinct_colours (const guint32 *pixels, int width, int height,
                                const graphene_rect_t *rect);
/* Bounds of a widget in window coordinates. */
gboolean fw_test_widget_bounds (GtkWidget *widget, GtkWidget *window, graphene_rect_t *out);

/* A fresh temporary directory (removed by the caller with fw_test_rm_rf). */
char *fw_test_tmpdir (void);
void fw_test_rm_rf (const char *path);

G_END_DECLS
